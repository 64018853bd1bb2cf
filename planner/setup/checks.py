"""Checks that need the whole validated setup: references, materials, physical sense, geometry.

Each check returns problems; all of them are collected and reported together.
"""
from __future__ import annotations

import numpy as np

from planner import materials
from planner.physics.bodies import inside, sample_points, surface_extent_across
from planner.setup import model
from planner.setup.geometry import body_of
from planner.setup.loading import LineIndex, Problem, format_path


def _ndfeb_summary() -> str:
    return "N35 to N55 with suffixes M, H, SH, UH, EH, AH (e.g. N42, N42SH)"


def all_problems(setup: model.Setup, index: LineIndex, positions: dict | None = None,
                 ignore_ids: frozenset = frozenset()) -> list[Problem]:
    """Every cross-check problem in ``setup``.

    ``positions`` maps a group name to the original list positions of its items, for a
    setup salvaged from a file whose invalid items were left out; references to the
    left-out ``ignore_ids`` are not reported again.
    """
    problems: list[Problem] = []
    positions = positions or {}

    def add(loc: tuple, message: str) -> None:
        if len(loc) >= 2 and loc[0] in positions:
            loc = (loc[0], positions[loc[0]][loc[1]]) + tuple(loc[2:])
        problems.append(Problem(format_path(loc), message, index.line(loc)))

    _check_ids(setup, add)
    _check_magnets(setup, add)
    _check_materials(setup, add)
    _check_coils(setup, add)
    _check_references(setup, add, ignore_ids)
    if not problems:
        _check_overlaps(setup, add)
        _check_clearances(setup, add)
    return problems


def _check_ids(setup, add) -> None:
    seen: dict[str, tuple] = {}
    for group_name in ("magnets", "steel_surfaces", "loose_steel", "conductors", "coils", "activities", "zones"):
        for position, part in enumerate(getattr(setup, group_name)):
            loc = (group_name, position, "id")
            if part.id in seen:
                add(loc, f"`{part.id}` is already used by `{format_path(seen[part.id][:2])}`; ids must be unique")
            else:
                seen[part.id] = loc


def unknown_grade_message(name: str) -> str:
    """The message for a grade name that is not in the table, with the closest names."""
    close = materials.nearest_names(name, materials.grades())
    hint = f"; did you mean {', '.join(f'`{c}`' for c in close)}?" if close else "."
    others = ", ".join(n for n in materials.grades() if not n.startswith("N"))
    return f"`{name}` is not a known grade{hint} Known: {_ndfeb_summary()}; {others}"


def grade_problems_of_left_out(items: list, positions: list, index: LineIndex) -> list[Problem]:
    """Unknown grades of magnets left out of the cross checks for other problems.

    So that one file run shows a magnet's bad grade together with its other problems.
    """
    problems = []
    for position in positions:
        item = items[position]
        grade = item.get("grade") if isinstance(item, dict) else None
        if isinstance(grade, str) and materials.find_grade(grade) is None:
            loc = ("magnets", position, "grade")
            problems.append(Problem(format_path(loc), unknown_grade_message(grade), index.line(loc)))
    return problems


def _check_magnets(setup, add) -> None:
    limit = materials.MAX_PERMANENT_MAGNET_REMANENCE_T
    for position, magnet in enumerate(setup.magnets):
        loc = ("magnets", position)
        if magnet.grade is None and magnet.remanence is None:
            add(loc, "needs a `grade` (e.g. N42) or a `remanence` (e.g. `1.3 T`)")
        if magnet.grade is not None and materials.find_grade(magnet.grade) is None:
            add(loc + ("grade",), unknown_grade_message(magnet.grade))
        if magnet.remanence is not None and magnet.remanence > limit:
            add(loc + ("remanence",),
                f"is {magnet.remanence:g} T, but no permanent-magnet material has a remanence above about 1.5 T "
                "(sintered NdFeB, the strongest, tops out near 1.5 T; ASTM A1101). A field of several tesla needs "
                "an electromagnet or a superconducting magnet; check the value and its unit")
        if isinstance(magnet, model.Ring) and magnet.inner_diameter >= magnet.diameter:
            add(loc + ("inner_diameter",),
                f"must be smaller than `diameter` ({magnet.inner_diameter * 1e3:g} mm is not below {magnet.diameter * 1e3:g} mm)")


def _check_materials(setup, add) -> None:
    for position, steel in enumerate(setup.steel_surfaces):
        _check_steel_name(steel.steel, ("steel_surfaces", position, "steel"), add)
    for position, item in enumerate(setup.loose_steel):
        _check_steel_name(item.steel, ("loose_steel", position, "steel"), add)
    for position, part in enumerate(setup.conductors):
        loc = ("conductors", position)
        if part.material is None and part.conductivity is None:
            add(loc, "needs a `material` (e.g. copper) or a `conductivity` (e.g. `58 MS/m`)")
        elif part.material is not None and materials.find_conductor(part.material) is None:
            names = list(materials.conductors())
            close = materials.nearest_names(part.material, names)
            hint = f"; did you mean `{close[0]}`?" if close else "."
            add(loc + ("material",), f"`{part.material}` is not a known conductor{hint} Known: {', '.join(names)}")
        if isinstance(part, model.Tube) and part.inner_diameter >= part.outer_diameter:
            add(loc + ("inner_diameter",), "must be smaller than `outer_diameter`")


def _check_steel_name(name, loc, add) -> None:
    if materials.find_steel(name) is None:
        names = list(materials.steels())
        close = materials.nearest_names(name, names)
        hint = f"; did you mean `{close[0]}`?" if close else "."
        add(loc, f"`{name}` is not a known steel{hint} Known: {', '.join(names)}")


def _check_coils(setup, add) -> None:
    for position, coil in enumerate(setup.coils):
        loc = ("coils", position)
        if coil.outer_diameter is not None and coil.outer_diameter <= coil.inner_diameter:
            add(loc + ("outer_diameter",), "must be larger than `inner_diameter`")
        if coil.wire_diameter is None and coil.resistance is None:
            add(loc, "needs a `wire_diameter` (e.g. `0.3 mm`) or a measured `resistance` (e.g. `12 ohm`)")
        if coil.outer_diameter is None and coil.wire_diameter is None:
            add(loc, "needs an `outer_diameter` or a `wire_diameter` to know the winding's size")
        meter = coil.connected_to
        if isinstance(meter, model.MeterInput) and meter.full_scale_current is None and meter.full_scale_voltage is None:
            add(loc + ("connected_to",), "a meter needs `full_scale_current` or `full_scale_voltage`")


_REFERENCES = {
    # activity kind -> [(field, allowed groups)]
    "pass_through_coil": [("magnet", ("magnets",)), ("coil", ("coils",))],
    "drop_through_tube": [("magnet", ("magnets",)), ("tube", ("tubes",))],
    "swing_over_sheet": [("magnet", ("magnets",)), ("sheet", ("sheets",))],
    "crank_generator": [("coil", ("coils",))],
    "bring_together": [("magnet", ("magnets",)), ("other", ("magnets", "steel_surfaces", "loose_steel"))],
    "couple_coils": [("primary", ("coils",)), ("secondary", ("coils",))],
    "switch_off": [("coil", ("coils",))],
}
_GROUP_WORDS = {"magnets": "magnet", "coils": "coil", "tubes": "tube", "sheets": "sheet",
                "steel_surfaces": "steel surface", "loose_steel": "loose steel item"}


def _groups(setup) -> dict[str, dict]:
    return {
        "magnets": {m.id: m for m in setup.magnets},
        "coils": {c.id: c for c in setup.coils},
        "tubes": {c.id: c for c in setup.conductors if isinstance(c, model.Tube)},
        "sheets": {c.id: c for c in setup.conductors if isinstance(c, model.Sheet)},
        "steel_surfaces": {s.id: s for s in setup.steel_surfaces},
        "loose_steel": {s.id: s for s in setup.loose_steel},
    }


def _check_references(setup, add, ignore_ids=frozenset()) -> None:
    groups = _groups(setup)
    groups["left out"] = {missing: None for missing in ignore_ids}
    for position, activity in enumerate(setup.activities):
        loc = ("activities", position)
        for field_name, allowed in _REFERENCES.get(activity.kind, []):
            _check_one_reference(getattr(activity, field_name), loc + (field_name,), allowed, groups, add)
        if activity.kind == "ship_package":
            for item_position, magnet_id in enumerate(activity.magnets):
                _check_one_reference(magnet_id, loc + ("magnets", item_position), ("magnets",), groups, add)
        if activity.kind == "pass_through_coil" and (activity.speed is None) == (activity.drop_height is None):
            add(loc, "needs exactly one of `speed` (e.g. `1 m/s`) or `drop_height` (e.g. `30 cm`)")
        if activity.kind == "couple_coils" and activity.primary == activity.secondary:
            add(loc + ("secondary",), "must be a different coil from `primary`")
        if activity.kind == "bring_together" and activity.magnet == activity.other:
            add(loc + ("other",), "must be a different part from `magnet`")
        if activity.kind == "switch_off":
            coil = groups["coils"].get(activity.coil)
            if coil is not None and not isinstance(coil.connected_to, model.Supply):
                add(loc + ("coil",), f"coil `{activity.coil}` has no `connected_to` supply to switch off")


def _check_one_reference(value, loc, allowed, groups, add) -> None:
    if any(value in groups[group] for group in allowed) or value in groups.get("left out", {}):
        # Known, or an item left out because it had its own problems.
        return
    words = " or ".join(_GROUP_WORDS[group] for group in allowed)
    known = sorted(i for group in allowed for i in groups[group])
    listed = f"; known: {', '.join(f'`{k}`' for k in known)}" if known else f"; no valid {words} is defined in this file"
    elsewhere = next((g for g, parts in groups.items() if value in parts and g in _GROUP_WORDS), None)
    if elsewhere:
        listed = f"; `{value}` is a {_GROUP_WORDS[elsewhere]}" + listed
    add(loc, f"refers to `{value}`, which is not a {words} in this file{listed}")


def _check_overlaps(setup, add) -> None:
    bodies = [body_of(m) for m in setup.magnets]
    for first in range(len(bodies)):
        for second in range(first + 1, len(bodies)):
            a, b = bodies[first], bodies[second]
            if np.linalg.norm(a.center - b.center) >= a.bounding_radius + b.bounding_radius:
                continue
            margin = 1e-6 * max(a.bounding_radius, b.bounding_radius)
            if inside(b, sample_points(a, 25), margin).any() or inside(a, sample_points(b, 25), margin).any():
                add(("magnets", second, "at"),
                    f"puts `{setup.magnets[second].id}` inside `{setup.magnets[first].id}`; two magnets cannot "
                    "overlap (describe a stack as one taller magnet, or move one)")


def _check_clearances(setup, add) -> None:
    groups = _groups(setup)
    for position, activity in enumerate(setup.activities):
        if activity.kind == "pass_through_coil" and activity.offset == 0:
            magnet, coil = groups["magnets"].get(activity.magnet), groups["coils"].get(activity.coil)
            if magnet is None or coil is None:  # left out of a salvaged setup for its own problems
                continue
            needed = 2 * surface_extent_across(body_of(magnet), coil.axis)
            if needed >= coil.inner_diameter:
                add(("activities", position, "coil"),
                    f"`{magnet.id}` needs a bore of at least {needed * 1e3:.1f} mm to pass through `{coil.id}`, "
                    f"whose inner diameter is {coil.inner_diameter * 1e3:.1f} mm; use a larger coil or pass it by "
                    "with an `offset`")
        if activity.kind == "drop_through_tube":
            magnet, tube = groups["magnets"].get(activity.magnet), groups["tubes"].get(activity.tube)
            if magnet is None or tube is None:
                continue
            needed = 2 * surface_extent_across(body_of(magnet), tube.axis)
            if needed >= tube.inner_diameter:
                add(("activities", position, "tube"),
                    f"`{magnet.id}` needs a bore of at least {needed * 1e3:.1f} mm to fall through `{tube.id}`, "
                    f"whose inner diameter is {tube.inner_diameter * 1e3:.1f} mm")
