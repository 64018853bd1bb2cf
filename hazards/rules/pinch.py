"""Fingers between magnets, or between a magnet and steel: clamp force, pinch energy, snap distances."""
from __future__ import annotations

from hazards.findings import ACTION, BLOCKING, Finding, approach_text, is_number, missing_figure, show, \
    none_if_zero, source_entry, threshold_map, threshold_text
from hazards.rules.common import activities_of, items

CONCERN = "pinch"


def _past(value, limit) -> bool:
    """At or above the limit; an unknown value counts as past it (safe side)."""
    return bool(value >= limit) if is_number(value) else True


def pinch(setup, assessment, thresholds) -> list:
    """Findings on clamp force and pinch energy, and the handling rules the snap distances call for."""
    table = threshold_map(thresholds)
    force_limit, energy_limit = table["hand_force_quasi_static"], table["hand_energy_transient"]
    pressure_limit = table["finger_pad_pressure"]
    pairs = items(assessment, "pairs")
    findings: list[Finding] = []
    if activities_of(setup, "bring_together") and not pairs:
        findings.append(missing_figure(CONCERN, "the forces between the magnets brought together",
                                       "Bring the parts together only with spacers and jigs until figures exist.",
                                       severity=BLOCKING))
    for pair in pairs:
        name = f"`{pair.magnet_id}` and `{pair.other_id}`"
        key = f"{pair.magnet_id}.{pair.other_id}"
        clamp, energy = pair.force_at_finger_gap_N, pair.pinch_energy_J
        bound = " (upper bound)" if pair.upper_bound else ""
        pressure = pair.pressure_at_finger_gap_Pa
        # the energy is exactly 0 where the parts jump together only once closer than a
        # finger (calculations.handling): nothing lands on it, said in words
        inside_gap = is_number(energy) and energy == 0.0
        nothing = "none: they snap together only inside the finger gap"
        over = [(force_limit, clamp, "force"), (energy_limit, energy, "energy"), (pressure_limit, pressure, "pressure")]
        passed = [(t, v, k) for t, v, k in over if (k != "pressure" or is_number(v)) and _past(v, t.value)]
        figures = [("clamp force at a finger gap of " + show(pair.finger_gap_m, "length"), show(clamp, "force") + bound),
                   (f"energy released onto the finger, approach {approach_text(pair.approach)}",
                    nothing if inside_gap else show(energy, "energy") + bound),
                   ("pressure over the smaller pole face (at least)", show(pressure, "pressure")),
                   ("force at contact", show(pair.force_at_contact_N, "force") + bound),
                   # the speed comes from the energy: an upper bound with it
                   ("impact speed", nothing if inside_gap else show(pair.impact_speed_m_per_s, "speed") + bound)]
        if passed:
            findings.append(Finding(
                id=f"pinch.{key}", severity=BLOCKING, concern=CONCERN,
                title=f"A finger caught between {name} is past the hand {', '.join(k for _, _, k in passed)} limit",
                figures=figures + [(f"hand {k} limit", threshold_text(t)) for t, _, k in passed],
                why=("Above these values contact with the hand is expected to be painful or injurious "
                     "(collaborative-robot body-region limits, the closest published data for the hand)."),
                cautions=["Never put fingers between the parts; keep them on the outside faces."],
                checklist=[f"Bring {name} together only in a jig or with a non-magnetic spacer at least "
                           f"{show(pair.finger_gap_m, 'length')} thick, never with fingers between them."],
                sources=[source_entry(t) for t, _, _ in passed]))
        snap = [d for d in (pair.snap_distance_bench_m, pair.snap_distance_hand_m) if is_number(d)]
        if not snap or max(snap) > 0:   # parts that never jump together need no separation rule
            findings.append(_handling(pair, name, key, figures, table))
    if pairs:
        findings += [_rules(pairs), _storage(pairs)]
    return findings


def _handling(pair, name, key, figures, table) -> Finding:
    snap = [d for d in (pair.snap_distance_bench_m, pair.snap_distance_hand_m) if is_number(d)]
    largest = show(max(snap), "length") if snap else "a distance to be found carefully"
    return Finding(
        id=f"pinch.handling.{key}", severity=ACTION, concern=CONCERN,
        title=f"Handling {name}: they snap together from {largest}",
        figures=[("snap distance sliding on the bench",
                  none_if_zero(pair.snap_distance_bench_m, show(pair.snap_distance_bench_m, "length"))),
                 ("snap distance held in the hand",
                  none_if_zero(pair.snap_distance_hand_m, show(pair.snap_distance_hand_m, "length")))] + figures,
        why="Inside the snap distance the attraction beats the hand's grip or the bench friction.",
        cautions=list(pair.warnings or []),
        checklist=[f"Keep {name} at least {largest} apart except when joining them on purpose."],
        sources=[source_entry(table["hand_force_quasi_static"]), source_entry(table["hand_energy_transient"])])


def _rules(pairs) -> Finding:
    checklist = ["Handle one magnet at a time; put the others away first.",
                 "Separate joined parts by sliding them apart sideways, not by pulling them straight off.",
                 "Keep non-magnetic spacers (wood, plastic) ready and between magnets in use."]
    cautions = []
    if any(p.both_brittle for p in pairs):
        checklist.append("Wear safety glasses: brittle magnets chip or shatter when they snap together.")
        cautions.append("NdFeB and ferrite are brittle; fragments fly at speed (common practice).")
    return Finding(
        id="pinch.handling-rules", severity=ACTION, concern=CONCERN,
        title="Handling rules for magnets that snap together",
        why="Most magnet injuries happen while joining or separating parts by hand.",
        cautions=cautions, checklist=checklist)


def _storage(pairs) -> Finding:
    snap = [d for p in pairs for d in (p.snap_distance_bench_m, p.snap_distance_hand_m) if is_number(d)]
    gap = show(max(snap), "length") if snap else "well"
    return Finding(
        id="pinch.storage", severity=ACTION, concern=CONCERN,
        title="Store the magnets on keepers, with spacers, apart from each other",
        figures=[("largest snap distance", gap)],
        why="Magnets stored loose find each other and steel; taking them apart again is where fingers get caught.",
        checklist=[f"Store each magnet on a steel keeper or in its own compartment, at least {gap} from the next.",
                   "Put spacers between stacked magnets."])
