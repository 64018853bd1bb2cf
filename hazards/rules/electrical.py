"""Induction demonstrations: voltages against the hazardous-live limits, meters, stored energy, mains."""
from __future__ import annotations

from hazards.findings import ACTION, BLOCKING, NOTE, Finding, is_number, sentence, show, source_entry, \
    threshold_map, threshold_text
from hazards.rules.common import activities_of, items, missing_figure_of

CONCERN = "electrical"
DEFAULT_LIMITS = "IEC 61010-1 ed. 3"
_INDUCTION_KINDS = ("pass_through_coil", "crank_generator", "switch_off", "couple_coils")


def _voltage_set(setup) -> str:
    rules = getattr(setup, "site_rules", None)
    chosen = getattr(rules, "electrical_limits", None)
    return chosen if chosen in ("IEC 61010-1 ed. 3", "IEC 61010-1 ed. 2") else DEFAULT_LIMITS


_LABELS = {"peak_emf_V": "peak EMF", "emf_rms_V": "EMF (rms)", "switch_off_peak_V": "switch-off spike (peak)"}


def _label(key: str) -> str:
    return _LABELS.get(key, key.removesuffix("_V").replace("_", " "))


def _voltage_form(key: str) -> str:
    """Which limit a voltage figure is read against: rms, peak or dc (rms, the lowest, if unstated)."""
    lower = key.lower()
    if "rms" in lower:
        return "rms"
    if "peak" in lower or "spike" in lower or "amplitude" in lower:
        return "peak"
    if "dc" in lower.split("_"):
        return "dc"
    return "rms"


def electrical(setup, assessment, thresholds) -> list:
    """Findings for induction figures against the chosen IEC 61010-1 voltage set, and mains coils."""
    table = threshold_map(thresholds)
    chosen = _voltage_set(setup)
    edition = "ed3" if chosen.endswith("3") else "ed2"
    limits = {form: table[f"hazardous_live_{form}_{edition}"] for form in ("rms", "peak", "dc")}
    findings: list[Finding] = []
    figures = items(assessment, "induction")
    done = {f.activity_id for f in figures}
    for activity in activities_of(setup, *_INDUCTION_KINDS):
        if activity.id not in done:
            findings.append(missing_figure_of(
                CONCERN, "the electrical figures of {part}", activity.id,
                "Measure the voltage and current with a meter on a safe range before the demonstration.",
                severity=BLOCKING if activity.kind == "switch_off" else ACTION))
    for row in figures:
        values = row.values if isinstance(row.values, dict) else {}
        findings += _voltages(row, values, limits, chosen)
        findings += _meter(row, values)
        findings += _stored(row, values, table)
        remarks = [s for s in map(sentence, map(str, row.warnings)) if s]
        if remarks:
            findings.append(Finding(
                id=f"electrical.{row.activity_id}.remarks", severity=NOTE, concern=CONCERN,
                title=f"Remarks on `{row.activity_id}` from the calculation", why=" ".join(remarks)))
    findings += _mains(setup)
    return findings


def _voltages(row, values, limits, chosen) -> list:
    found = []
    for key, value in values.items():
        if not key.endswith("_V") or isinstance(value, bool):
            continue
        limit = limits[_voltage_form(key)]
        if is_number(value) and abs(value) < limit.value:
            continue
        if not isinstance(value, (int, float)):
            continue
        found.append(Finding(
            id=f"electrical.{row.activity_id}.{key}", severity=BLOCKING, concern=CONCERN,
            title=f"`{row.activity_id}`: {_label(key)} reaches hazardous-live voltage",
            figures=[(_label(key), show(value, "voltage")), (f"limit ({chosen})", threshold_text(limit))],
            why=("Touching the circuit at this voltage can give a shock; the limit is the one the site chose "
                 f"({chosen})." if is_number(value) else "The voltage could not be computed; it counts as hazardous."),
            cautions=["A coil's switch-off spike appears across the contacts that open, and across whoever holds them."],
            checklist=[f"Enclose or insulate every terminal of `{row.activity_id}`; nobody touches the circuit while it "
                       "runs.", "Fit a suppression diode or a neon lamp across the coil where the spike is not "
                       "the point of the demonstration."],
            sources=[source_entry(limit)]))
    return found


def _meter_ratio(values):
    """Peak current over the meter's full-scale current, from the figures; None when unknown."""
    ratio = values.get("peak_to_full_scale")
    peak, full = values.get("peak_current_A"), values.get("full_scale_A")
    if not is_number(ratio) and is_number(peak) and is_number(full) and full > 0:
        ratio = abs(peak) / full
    return ratio if is_number(ratio) else None


def _meter(row, values) -> list:
    ratio = _meter_ratio(values)
    peak, full = values.get("peak_current_A"), values.get("full_scale_A")
    if ratio is None or ratio <= 1.0:
        return []
    return [Finding(
        id=f"electrical.{row.activity_id}.meter", severity=ACTION, concern=CONCERN,
        title=f"`{row.activity_id}` drives the meter past full scale ({ratio:.3g} x)",
        figures=[("peak current", show(peak, "current")), ("meter full scale", show(full, "current")),
                 ("peak / full scale", f"{ratio:.3g}")],
        why="Past full scale the needle hits its stop and a sensitive meter can be damaged.",
        checklist=["Add series resistance, use a less sensitive range, or slow the magnet down.",
                   "Try it once privately before showing it."])]


def _stored(row, values, table) -> list:
    found = []
    for key, threshold_id, kind in (("stored_energy_J", "stored_energy", "energy"),
                                    ("stored_charge_C", "stored_charge", "charge")):
        value = values.get(key)
        limit = table[threshold_id]
        if not is_number(value) or value < limit.value:
            continue
        found.append(Finding(
            id=f"electrical.{row.activity_id}.{threshold_id}", severity=ACTION, concern=CONCERN,
            title=f"`{row.activity_id}`: {threshold_id.replace('_', ' ')} at or above the IEC 61010-1 figure",
            figures=[(key.replace("_", " "), show(value, kind)), ("reference", threshold_text(limit))],
            why=("The energy or charge released when the circuit opens can burn or shock; IEC 61010-1 ed. 2 gives "
                 "this figure for accessible parts and it is used here as a reference."),
            checklist=[f"Discharge or let `{row.activity_id}` decay before touching; switch it off through a "
                       "suppressed switch."],
            sources=[source_entry(limit)]))
    return found


def _mains(setup) -> list:
    rules = getattr(setup, "site_rules", None)
    persons = list(getattr(rules, "competent_persons", None) or [])
    found = []
    for coil in items(setup, "coils"):
        supply = getattr(coil, "connected_to", None)
        if getattr(supply, "kind", None) != "supply" or not getattr(supply, "mains", False):
            continue
        found.append(Finding(
            id=f"electrical.{coil.id}.mains", severity=ACTION if persons else BLOCKING, concern=CONCERN,
            # the part opens the title, so merged coils read "Each of `coil-01` to `coil-12` is a coil ..."
            title=f"`{coil.id}` is a coil powered from the mains",
            why="Mains-powered apparatus needs the site's electrical safety rules and a competent person, "
                "whatever the computed figures say (common practice).",
            checklist=["Have the apparatus inspected and approved under the site's electrical rules.",
                       "Name the competent person responsible for it in the site rules."
                       if not persons else "Confirm the named competent person has approved this apparatus."]))
    return found
