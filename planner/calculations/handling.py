"""Handling figures for the setup: magnet pairs and magnets on steel, loose steel items.

Which pairs: every `bring_together` activity, plus magnets lying within ``NEARBY_GAP`` of each
other on the bench (they can jump together unasked) and magnets within ``NEARBY_GAP`` of a
steel surface. Resisting forces: the site's `bench_friction` and `hand_force`, else the
common-practice defaults of :mod:`planner.physics.handling`.

References
----------
Physics and definitions: ../shared/reference/physics.md sections 2 and 3; Vokoun et al. (2009);
Akoun & Yonnet (1984); Schenck, J. Magn. Reson. Imaging 12, 2-19 (2000); ASTM F2052.
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np

from planner import materials
from planner.assessment import PairFigures, ProjectileFigures
from planner.calculations.magnets import pole_area
from planner.physics.bodies import MagnetBody, rotation_about, rotation_from_axis
from planner.physics.constants import mu_0
from planner.physics.fields import field_of_bodies
from planner.physics.forces import extent_along, plate_saturation_check
from planner.physics.handling import (DEFAULT_FINGER_GAP, DEFAULT_HAND_FORCE, DEFAULT_STATIC_FRICTION,
                                      attraction_to_steel, bench_friction_force, flip_torque,
                                      gradient_distance, impact_speed, lift_distance, pair_attraction,
                                      pull_off_distance, released_energy, snap_distance, steel_plate,
                                      steel_rod, steel_sphere, surface_point)
from planner.setup import Setup, model, site_rules_of
from planner.setup.geometry import body_of, mass_of

#: Magnets (or a magnet and steel) closer than this gap are treated as a pair even without an
#: activity that brings them together [m]. Common practice: within a hand's reach on the bench.
NEARBY_GAP = 0.20
#: Families whose magnets are brittle and chip or shatter when they snap together (common practice).
BRITTLE_FAMILIES = {"NdFeB", "SmCo", "ferrite"}


def handling_parameters(setup: Setup) -> dict:
    """Bench friction, hand force and finger gap: the site's values, else common-practice defaults."""
    rules = site_rules_of(setup)
    return {
        "bench_friction": rules.bench_friction or DEFAULT_STATIC_FRICTION,
        "hand_force": rules.hand_force or DEFAULT_HAND_FORCE,
        "finger_gap": rules.finger_gap or DEFAULT_FINGER_GAP,
    }


def _surface_gap(a: MagnetBody, b: MagnetBody) -> float:
    between = b.center - a.center
    distance = float(np.linalg.norm(between))
    if distance == 0:
        return 0.0
    u = between / distance
    return distance - extent_along(a, u) - extent_along(b, -u)


def _brittle(magnet) -> bool:
    grade = materials.find_grade(magnet.grade) if magnet.grade else None
    return grade is None or grade.family in BRITTLE_FAMILIES


def pair_list(setup: Setup) -> list[tuple[str | None, str, str, str]]:
    """(activity id, magnet id, other id, approach) for every pair to assess."""
    pairs, seen = [], set()
    for activity in setup.activities:
        if activity.kind == "bring_together":
            pairs.append((activity.id, activity.magnet, activity.other, activity.by))
            seen.add(frozenset((activity.magnet, activity.other)))
    bodies = {m.id: body_of(m) for m in setup.magnets}
    ids = list(bodies)
    for i, first in enumerate(ids):
        for second in ids[i + 1:]:
            if frozenset((first, second)) not in seen and _surface_gap(bodies[first], bodies[second]) < NEARBY_GAP:
                pairs.append((None, first, second, "sliding_on_bench"))
                seen.add(frozenset((first, second)))
        for steel in setup.steel_surfaces:
            height = float((bodies[first].center - np.asarray(steel.at)) @ np.asarray(steel.normal))
            gap = height - extent_along(bodies[first], -np.asarray(steel.normal))
            if frozenset((first, steel.id)) not in seen and -1e-9 <= gap < NEARBY_GAP and \
                    _over_face(bodies[first], steel):
                pairs.append((None, first, steel.id, "hand"))
                seen.add(frozenset((first, steel.id)))
    return pairs


def _over_face(body: MagnetBody, steel) -> bool:
    """True if the magnet's centre lies over the steel face (or the face has no given size)."""
    if steel.size is None:
        return True
    normal = np.asarray(steel.normal)
    offset = body.center - np.asarray(steel.at)
    across = offset - (offset @ normal) * normal
    in_plane = [axis for axis in np.eye(3) if abs(axis @ normal) < 0.9]
    reach = [abs(across @ axis) for axis in in_plane[:2]]
    return all(r <= half + NEARBY_GAP for r, half in zip(reach, np.asarray(steel.size) / 2))


def _attracting_placement(target: MagnetBody, source: MagnetBody) -> tuple[MagnetBody, np.ndarray]:
    """The target turned to attract the source pole to pole, on the source's magnetization axis.

    Magnets that jump together end up in this arrangement whatever their start (a magnet
    brought up side by side or wrong way round turns over first): it gives the largest pull,
    so the pinch figures are the safe-side ones. Returns (target, approach direction).
    """
    p_source = source.polarization / np.linalg.norm(source.polarization)
    p_target = target.polarization / np.linalg.norm(target.polarization)
    axis = np.cross(p_target, p_source)
    sine, cosine = np.linalg.norm(axis), float(p_target @ p_source)
    if sine < 1e-12:
        turn = np.eye(3) if cosine > 0 else rotation_about(rotation_from_axis(p_source)[:, 0], np.pi)
    else:
        turn = rotation_about(axis, np.arctan2(sine, cosine))
    centre = source.center + p_source * 10 * (source.bounding_radius + target.bounding_radius)
    if source.shape == "ring":
        # Over a ring's bore its field turns back and pushes; the pull is strongest over the annulus.
        centre = centre + (source.diameter + source.inner_diameter) / 4 * source.rotation[:, 0]
    turned = replace(target, rotation=turn @ target.rotation, polarization=turn @ target.polarization,
                     center=centre)
    return turned, -p_source


def pair_figures(setup: Setup) -> list[PairFigures]:
    """Handling figures for every pair of :func:`pair_list`."""
    parameters = handling_parameters(setup)
    magnets = {m.id: m for m in setup.magnets}
    steels = {s.id: s for s in setup.steel_surfaces}
    results = []
    for activity_id, magnet_id, other_id, approach in pair_list(setup):
        if other_id in magnets and mass_of(magnets[other_id]) < mass_of(magnets[magnet_id]):
            magnet_id, other_id = other_id, magnet_id  # the lighter magnet is the one that moves
        if other_id in steels or other_id in magnets:
            results.append(_one_pair(activity_id, magnets[magnet_id], magnets.get(other_id), steels.get(other_id),
                                     approach, parameters))
    return results


def _one_pair(activity_id, magnet, other_magnet, steel, approach, parameters) -> PairFigures:
    body = body_of(magnet)
    mass = mass_of(magnet)
    finger_gap = parameters["finger_gap"]
    warnings: list[str] = []
    if other_magnet is not None:
        other = body_of(other_magnet)
        body, direction = _attracting_placement(body, other)
        attraction = pair_attraction(body, other, direction)
        other_mass = mass_of(other_magnet)
        limit = 20 * (body.bounding_radius + other.bounding_radius)
        torque = flip_torque(body, other, direction, finger_gap).torque
        brittle = _brittle(magnet) or _brittle(other_magnet)
        other_kind, upper_bound = "magnet", False
    else:
        normal = np.asarray(steel.normal)
        attraction = attraction_to_steel(body, np.asarray(steel.at), normal)
        other_mass = np.inf
        limit = 20 * body.bounding_radius
        torque = None
        brittle = _brittle(magnet)
        other_kind, upper_bound = "steel_surface", True
        steel_row = materials.find_steel(steel.steel)
        point = np.asarray(steel.at)
        at_contact = replace(body, center=body.center + ((point @ normal + extent_along(body, -normal))
                                                          - body.center @ normal) * normal)
        check = plate_saturation_check(at_contact, point, normal, steel.thickness, steel_row.saturation)
        if check.saturates:
            warnings.append(f"the {steel.thickness * 1e3:g} mm steel saturates under this magnet at contact "
                            f"(about {check.plate_flux_density:.1f} T against {check.saturation_flux_density:.1f} T); "
                            "the real pull is lower than the image-method figure")
    # the clamp force spread over the smaller pole face: the least pressure a finger pad
    # can feel between the parts (a smaller contact only raises it)
    pole_faces = [pole_area(body)] + ([pole_area(other)] if other_magnet is not None else [])
    bench = bench_friction_force(mass, parameters["bench_friction"])
    snap_bench = snap_distance(attraction, bench, limit)
    snap_hand = snap_distance(attraction, parameters["hand_force"], limit)
    start = snap_bench if approach == "sliding_on_bench" else snap_hand
    energy = released_energy(attraction, start, finger_gap) if start > finger_gap else 0.0
    clamp = float(attraction(finger_gap))
    return PairFigures(
        activity_id=activity_id, magnet_id=magnet.id,
        other_id=(other_magnet.id if other_magnet is not None else steel.id), other_kind=other_kind,
        approach=approach, force_at_contact_N=float(attraction(0.0)),
        force_at_finger_gap_N=clamp, finger_gap_m=finger_gap,
        pressure_at_finger_gap_Pa=clamp / min(pole_faces),
        snap_distance_bench_m=snap_bench, snap_distance_hand_m=snap_hand, pinch_energy_J=float(energy),
        impact_speed_m_per_s=impact_speed(energy, mass, other_mass), flip_torque_N_m=torque,
        both_brittle=brittle, upper_bound=upper_bound, warnings=warnings,
    )


def _steel_item(item):
    steel = materials.find_steel(item.steel)
    density, saturation = steel.density, steel.saturation / mu_0
    if isinstance(item, model.SteelRod):
        physical = steel_rod(item.length, item.diameter, density, saturation)
    elif isinstance(item, model.SteelBall):
        physical = steel_sphere(item.diameter, density, saturation)
    else:
        physical = steel_plate(item.length, item.width, item.thickness, density, saturation)
    if item.mass is not None:
        physical = type(physical)(physical.volume, item.mass, physical.effective_susceptibility,
                                  physical.saturation_magnetization)
    return physical


def projectile_figures(setup: Setup) -> list[ProjectileFigures]:
    """Pull-off and lift distances of every loose steel item toward every magnet."""
    bodies = [body_of(m) for m in setup.magnets]
    friction = handling_parameters(setup)["bench_friction"]
    results = []

    def total_field(points):
        return field_of_bodies(bodies, points)
    for item in setup.loose_steel:
        physical = _steel_item(item)
        for magnet, body in zip(setup.magnets, bodies):
            offset = np.asarray(item.at) - body.center
            if np.linalg.norm(offset) == 0:
                continue
            direction = offset / np.linalg.norm(offset)
            origin = surface_point(body, direction)
            distance = float(np.linalg.norm(np.asarray(item.at) - origin))
            limit = max(0.5, 40 * body.bounding_radius)
            pull = pull_off_distance(total_field, origin, direction, physical, friction, limit)
            lift = lift_distance(total_field, origin, direction, physical, limit)
            results.append(ProjectileFigures(
                item_id=item.id, magnet_id=magnet.id, distance_m=distance, pull_off_distance_m=pull,
                lift_distance_m=lift, mass_kg=physical.mass, within_pull=distance <= pull,
                within_lift=distance <= lift))
    return results


def steel_lift_gradient_distances(setup: Setup) -> dict[str, float]:
    """Per magnet: the distance from its pole face within which any elongated steel item can lift [m]."""
    bodies = [body_of(m) for m in setup.magnets]

    def total_field(points):
        return field_of_bodies(bodies, points)
    distances = {}
    for magnet, body in zip(setup.magnets, bodies):
        direction = body.polarization / np.linalg.norm(body.polarization)
        distances[magnet.id] = gradient_distance(total_field, surface_point(body, direction), direction,
                                                 search_limit=max(0.5, 40 * body.bounding_radius))
    return distances

