"""Loose steel that a magnet can pull or lift, and the 3 mT projectile line."""
from __future__ import annotations

from hazards.findings import ACTION, BLOCKING, NOTE, Finding, is_number, missing_figure, show, show_field, \
    source_entry, threshold_map, threshold_text
from hazards.rules.common import figures_by_value, items, largest_distance_per_magnet

CONCERN = "projectiles"


def _within(distance, reach, flagged) -> bool:
    if is_number(distance) and is_number(reach):
        return bool(distance <= reach) or bool(flagged)
    return True  # unknown figures count as within reach (safe side)


def projectiles(setup, assessment, thresholds) -> list:
    """Findings for steel items within pull or lift distance, and the 3 mT line around strong magnets."""
    table = threshold_map(thresholds)
    findings: list[Finding] = []
    figures = items(assessment, "projectiles")
    if items(setup, "loose_steel") and not figures:
        findings.append(missing_figure(CONCERN, "the pull and lift distances of the loose steel",
                                       "Move every loose steel item well away from the magnets before work starts."))
    weight = table["displacement_force_to_weight"]
    for row in figures:
        lifted = _within(row.distance_m, row.lift_distance_m, row.within_lift)
        pulled = _within(row.distance_m, row.pull_off_distance_m, row.within_pull)
        if not (lifted or pulled):
            continue
        how = "lifted and thrown" if lifted else "pulled across the bench"
        reach = row.lift_distance_m if lifted else row.pull_off_distance_m
        findings.append(Finding(
            id=f"projectiles.{row.item_id}.{row.magnet_id}", severity=BLOCKING, concern=CONCERN,
            title=f"`{row.item_id}` lies where `{row.magnet_id}` can pull it: it would be {how} to the magnet",
            figures=[("distance to the magnet", show(row.distance_m, "length")),
                     ("pulled along the bench within", show(row.pull_off_distance_m, "length")),
                     ("lifted against its weight within", show(row.lift_distance_m, "length")),
                     ("mass of the item", show(row.mass_kg, "mass"))],
            why=("Within these distances the magnetic force exceeds the item's weight (or its friction on the bench); "
                 "it then accelerates toward the magnet and can strike hands, eyes or the magnet."),
            cautions=["The magnet can shatter when struck; fragments are sharp."],
            checklist=[f"Move `{row.item_id}` to more than {show(reach, 'length')} from `{row.magnet_id}` "
                       "(or clear it from the bench) before work starts."],
            sources=[source_entry(weight)]))
    findings += _line(assessment, table)
    return findings


def _line(assessment, table) -> list:
    line, source_limit = table["projectile_line"], table["projectile_source_field"]
    strong = [m for m in items(assessment, "magnets")
              if not is_number(m.pole_face_field_T) or m.pole_face_field_T > source_limit.value]
    if not strong:
        return []
    distances = largest_distance_per_magnet(assessment, line.id)
    figures = figures_by_value(f"{line.id} ({show_field(line.value)}) from {{parts}}",
                               [(m.id, show(distances.get(m.id), "length")) for m in strong])
    numbers = [distances[m.id] for m in strong if is_number(distances.get(m.id))]
    largest = show(max(numbers), "length") if numbers else "a distance to be measured"
    return [Finding(
        id="projectiles.line", severity=ACTION, concern=CONCERN,
        title=f"Keep loose steel outside the projectile line, {largest} from the strongest magnets",
        figures=figures + [("projectile line", threshold_text(line)),
                           ("applies to sources above", threshold_text(source_limit))],
        why="Beyond this line loose steel is not a projectile risk; inside it, tools and fixings can fly to the magnet.",
        cautions=["Keys, pens, spectacle frames and jewellery contain steel too."],
        checklist=[f"Clear steel tools and parts from within {largest} of the magnets.",
                   "Use non-magnetic tools (brass, aluminium, plastic) at the bench."],
        sources=[source_entry(line), source_entry(source_limit)]),
    ] + ([] if numbers or not strong else [Finding(
        id="projectiles.line-missing", severity=NOTE, concern=CONCERN,
        title="The projectile-line distance was not computed", figures=[],
        why="Measure where the field falls to the projectile line.",
        sources=[source_entry(line)])])
