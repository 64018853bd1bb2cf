"""Heat and demagnetization: activity temperatures against the grade's maximum working
temperature, and repelling arrangements against coercivity."""
from __future__ import annotations

from hazards.findings import ACTION, NOTE, Finding, is_number, show, show_field
from hazards.rules.common import activities_of, items, magnet_figures_by_id
from planner.units import mu_0

CONCERN = "temperature"


def _magnets_of(activity) -> list[str]:
    names = []
    for attribute in ("magnet", "other"):
        value = getattr(activity, attribute, None)
        if isinstance(value, str):
            names.append(value)
    names += [m for m in (getattr(activity, "magnets", None) or []) if isinstance(m, str)]
    return names


def temperature(setup, assessment, thresholds) -> list:
    """Findings for magnets heated past their grade's working temperature, and repelling pairs."""
    figures = magnet_figures_by_id(assessment)
    findings: list[Finding] = []
    for activity in activities_of(setup):
        heat = getattr(activity, "temperature", None)
        if not is_number(heat):
            continue
        for magnet_id in _magnets_of(activity):
            magnet = figures.get(magnet_id)
            if magnet is None:
                continue
            limit = magnet.max_working_temperature_C
            if is_number(limit) and heat <= limit:
                continue
            findings.append(Finding(
                id=f"temperature.{activity.id}.{magnet_id}", severity=ACTION, concern=CONCERN,
                title=f"`{activity.id}` heats `{magnet_id}` past its grade's working temperature",
                figures=[("activity temperature", show(heat, "temperature")),
                         (f"maximum working temperature ({magnet.material})", show(limit, "temperature"))],
                why=("Above its maximum working temperature the magnet loses strength for good; the figures "
                     "computed at room temperature no longer hold for it afterwards."
                     if is_number(limit) else "The grade's maximum working temperature is not known."),
                cautions=["Hot magnets and steel burn: handle with tongs and heat-resistant gloves."],
                checklist=[f"Mark `{magnet_id}` as heat-treated and keep it apart from the calibrated magnets.",
                           "Let it cool on a heat-proof surface, away from steel it could jump to."],
                sources=[("max_working_temperature", f"grade table of {magnet.material} "
                                                     "(GB/T 13560-2017 suffix scheme, trade values [S])")]))
    findings += _repelling(assessment, figures)
    return findings


def _repelling(assessment, figures) -> list:
    found = []
    for pair in items(assessment, "pairs"):
        if pair.other_kind != "magnet":
            continue
        for own, other in ((pair.magnet_id, pair.other_id), (pair.other_id, pair.magnet_id)):
            a, b = figures.get(own), figures.get(other)
            if a is None or b is None or not is_number(a.coercivity_min_A_per_m) or not is_number(b.pole_face_field_T):
                continue
            # Compare in the same unit: mu0 HcJ [T] against the other magnet's face field [T].
            if mu_0 * a.coercivity_min_A_per_m > b.pole_face_field_T:
                continue
            found.append(Finding(
                id=f"temperature.repel.{own}.{other}", severity=NOTE, concern=CONCERN,
                title=f"`{own}` may be partly demagnetized if pushed against `{other}` the repelling way",
                figures=[(f"coercivity of {own} (as mu0 HcJ)", show_field(mu_0 * a.coercivity_min_A_per_m)),
                         (f"field at the face of {other}", show_field(b.pole_face_field_T))],
                why="A field opposing the magnetization above the coercivity reverses part of the magnet.",
                checklist=[f"Bring `{own}` to `{other}` only the attracting way round; store them on keepers."]))
    return found
