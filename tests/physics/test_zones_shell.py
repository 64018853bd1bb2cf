"""The proof of keep-out distances on a sphere and the cell's faces (planner.physics.zones.shell).

Checks against independent computations: brute-force sampling of the exact field of
planner.physics.fields, finite differences of it, and the weak maximum principle for the
subharmonic |B|^2 (Gilbarg and Trudinger, Elliptic Partial Differential Equations of Second
Order (2001), Theorem 3.1), which the proof rests on and which is checked here on the field
itself.
"""
from __future__ import annotations

import numpy as np
import pytest

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import field_of_bodies
from planner.physics.zones import shell
from planner.physics.zones.bounds import BodyTable, _ball_geometry, derivative_bounds, dipole_remainder
from planner.physics.zones.certify import _second_derivative_bound, local_model, patch_below
from planner.physics.zones.keep_out import farthest_start_radii, keep_out_radii
from planner.physics.zones.sampling import cone_of_triangle, icosahedron_triangles
from tests.physics.brute_force import farthest_found, in_own_cell

RNG = np.random.default_rng(20261202)


def bench():
    """Three magnets 6-9 cm apart: a strong disc, a block and a weak disc (N35 to N52)."""
    return [MagnetBody("cylinder", [0, 0, 0], rotation_from_axis([0.2, 0.1, 1.0]), [0.1, 0.2, 1.4],
                       diameter=0.02, height=0.01),
            MagnetBody("block", [0.07, 0.02, 0.0], rotation_from_axis([1.0, 0.3, 0.0]), [1.1, 0.3, 0.2],
                       size=[0.012, 0.01, 0.02]),
            MagnetBody("cylinder", [-0.03, 0.08, 0.01], np.eye(3), [0.0, 1.2, 0.0], diameter=0.008, height=0.004)]


def random_directions(count):
    unit = RNG.normal(size=(count, 3))
    return unit / np.linalg.norm(unit, axis=1)[:, None]


def directions_in_cap(axis, half_angle, count):
    """``count`` random unit vectors within ``half_angle`` [rad] of the unit ``axis``."""
    turn = random_directions(count)
    turn -= np.outer(turn @ axis, axis)
    turn /= np.linalg.norm(turn, axis=1)[:, None]
    angle = half_angle * np.sqrt(RNG.random((count, 1)))
    return np.cos(angle) * axis + np.sin(angle) * turn


def field_size(bodies, points):
    return np.linalg.norm(field_of_bodies(bodies, points), axis=1)


def test_field_magnitude_squared_is_subharmonic_between_the_magnets():
    # Identity behind the proof: each component of B is harmonic outside the magnets, so
    # the Laplacian of |B|^2 is 2 sum |grad B_k|^2 >= 0 (five-point differences per axis).
    bodies = bench()
    points = 0.15 * RNG.uniform(-1, 1, size=(400, 3))
    clear = np.all(np.linalg.norm(points[:, None] - np.array([b.center for b in bodies])[None], axis=2)
                   > 1.5 * np.array([b.bounding_radius for b in bodies]), axis=1)
    points = points[clear]
    h = 2e-4
    centre = field_size(bodies, points) ** 2
    laplacian = sum((field_size(bodies, points + h * e) ** 2 + field_size(bodies, points - h * e) ** 2 - 2 * centre)
                    / h**2 for e in np.eye(3))
    assert np.all(laplacian > -1e-6 * np.max(np.abs(laplacian)))


def test_largest_field_of_a_cell_region_lies_on_its_boundary():
    # Weak maximum principle (Gilbarg & Trudinger, Theorem 3.1) on the region the proof uses:
    # the cell of magnet 0 between R and S. Dense samples inside never exceed the largest
    # value sampled on its boundary: the sphere of radius R, the faces and the sphere of radius S.
    bodies = bench()
    centre, radius, outer = bodies[0].center, 0.035, 0.09
    inside = centre + random_directions(40000) * RNG.uniform(radius, outer, 40000)[:, None]
    inside = inside[in_own_cell(bodies, 0, inside)]
    boundary = [centre + r * random_directions(20000) for r in (radius, outer)]
    for other in bodies[1:]:  # points of the bisecting plane between R and S
        gap = other.center - centre
        normal = gap / np.linalg.norm(gap)
        spread = random_directions(20000) * RNG.uniform(0, outer, 20000)[:, None]
        spread -= np.outer(spread @ normal, normal)
        boundary.append(centre + 0.5 * gap + spread)
    boundary = np.vstack(boundary)
    distance = np.linalg.norm(boundary - centre, axis=1)
    boundary = boundary[in_own_cell(bodies, 0, boundary) & (distance >= radius * (1 - 1e-12))
                        & (distance <= outer * (1 + 1e-12))]
    assert field_size(bodies, inside).max() <= field_size(bodies, boundary).max()


@pytest.mark.parametrize("index, threshold", [(0, 1e-3), (1, 2e-3), (2, 1e-3), (0, 6e-3)])
def test_a_proven_shell_has_no_point_at_the_threshold(index, threshold):
    # Brute force: if prove_beyond says the cell between R and S is below the threshold,
    # 60 000 random points of it (and points on its faces) stay below in the exact field.
    bodies = bench()
    table = BodyTable(bodies)
    outer = float(farthest_start_radii(bodies, index, [threshold], table)[0])
    proven_at = None
    for radius in outer * np.geomspace(0.4, 1.0, 40):
        if not shell.source_free(table, index, radius):
            continue
        outcome = shell.prove_beyond(bodies, index, radius, outer, threshold, table)
        if outcome.proven:
            proven_at = radius
            break
        # what is reported as reaching the threshold does reach it (exact field)
        if len(outcome.witnesses):
            assert np.all(field_size(bodies, outcome.witnesses) >= threshold)
            assert np.all(in_own_cell(bodies, index, outcome.witnesses))
    assert proven_at is not None and proven_at < outer
    centre = bodies[index].center
    points = centre + random_directions(60000) * RNG.uniform(proven_at, outer, 60000)[:, None]
    points = points[in_own_cell(bodies, index, points)]
    assert field_size(bodies, points).max() < threshold


def test_caps_proven_with_the_own_dipole_hold_under_brute_force():
    # The cap bound on its own: caps of 4.5 degrees on a sphere 3.5 radii from a disc, with a
    # neighbour; the threshold is set so that about half of them are proven, some just. Random
    # points of every proven cap stay below it in the exact field.
    bodies = bench()[:2]
    table = BodyTable(bodies)
    centre, radius = bodies[0].center, 3.5 * bodies[0].bounding_radius
    axes, half_angles = cone_of_triangle(icosahedron_triangles(3))
    points = centre + radius * axes
    threshold = 1.05 * float(np.median(field_size(bodies, points)))
    cell = shell.Cell(table.centres, 0)
    inside = cell.excess(points) <= 0
    outcome_caps = []
    model = local_model(bodies, points[inside], 2e-3 * threshold, table)
    chord = 2 * radius * np.sin(half_angles[inside] / 2)
    _, second = derivative_bounds(model.geometry, chord, (1, 2), per_body=True)
    own = table.subset([0])
    rest = second[:, 1] + dipole_remainder(own, (radius - chord)[:, None], 2)[:, 0]
    holds = shell._dipole_cap_holds(model, table.vectors[0], radius, axes[inside], half_angles[inside], rest,
                                    threshold)
    assert 0.2 < holds.mean() < 0.9
    for axis, half in zip(axes[inside][holds], half_angles[inside][holds]):
        outcome_caps.append(field_size(bodies, centre + radius * directions_in_cap(axis, half, 300)).max())
    assert max(outcome_caps) < threshold


def test_largest_first_order_term_is_the_maximum_over_the_cap_angles():
    # max over 0 <= theta <= delta of -(1 - cos theta) a + sin theta b, against a dense grid of
    # theta (an independent computation), for a of either sign and caps up to 40 degrees.
    a = RNG.normal(size=400)
    b = np.abs(RNG.normal(size=400))
    delta = RNG.uniform(0.01, 0.7, 400)
    theta = delta[:, None] * np.linspace(0.0, 1.0, 20001)[None, :]
    dense = np.max(-(1 - np.cos(theta)) * a[:, None] + np.sin(theta) * b[:, None], axis=1)
    largest = shell._largest_first_order(a, b, delta)
    assert np.all(largest >= dense - 1e-12)
    assert np.allclose(largest, dense, rtol=0, atol=1e-8)


def test_cap_at_the_pole_of_a_dipole_is_proven_just_above_the_pole_field():
    # A uniformly magnetized sphere's outside field is exactly its dipole's (Jackson eq. 5.56
    # and section 5.10), strongest at the pole and falling away from it. A cap of 9 degrees
    # about the pole is proven at 4.5 % above the pole field: the bound keeps the fall
    # towards the rim (with |P.An| and |m| |d| in its place it would need 11 %).
    ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    table = BodyTable([ball])
    radius, half_angle = 0.05, np.radians(9.0)
    axis = np.array([[0.0, 0.0, 1.0]])
    pole = float(field_size([ball], radius * axis)[0])
    model = local_model([ball], radius * axis, 1e-6 * pole, table)
    for factor, expected in ((1.045, True), (1.02, False)):
        holds = shell._dipole_cap_holds(model, table.vectors[0], radius, axis, np.array([half_angle]),
                                        np.zeros(1), factor * pole)
        assert bool(holds[0]) is expected


def test_caps_near_a_disc_are_proven_with_its_rest_bounded_along_the_chords():
    # Taylor's remainder over a cap needs ||D^2 V|| only on the chords from the cap centre,
    # which keep at least R cos(delta / 2) from the magnet's centre; the disc's field beyond
    # its dipole falls as r^-5 and its bound steeply, so taking it there rather than at
    # R - rho (the ball about the centre) proves most 9-degree caps 2.5 bounding radii out at
    # 10 % above the sphere's largest field (about one in eight before). Random points of
    # the proven caps stay below the threshold in the exact field.
    disc = MagnetBody("cylinder", [0, 0, 0], rotation_from_axis([0.3, 0.2, 1.0]), [0.2, 0.3, 1.3],
                      diameter=0.02, height=0.01)
    table = BodyTable([disc])
    radius = 2.5 * disc.bounding_radius
    axes, half_angles = cone_of_triangle(icosahedron_triangles(2))
    threshold = 1.1 * float(field_size([disc], radius * random_directions(20000)).max())
    model = local_model([disc], radius * axes, 2e-3 * threshold, table)
    rest = dipole_remainder(table, (radius * np.cos(half_angles / 2))[:, None], 2)[:, 0]
    holds = shell._dipole_cap_holds(model, table.vectors[0], radius, axes, half_angles, rest, threshold)
    assert holds.mean() > 0.6
    for axis, half in zip(axes[holds], half_angles[holds]):
        assert field_size([disc], radius * directions_in_cap(axis, half, 200)).max() < threshold


def test_flat_patches_proven_hold_under_brute_force():
    # Flat patches of a bisecting plane (the faces of the proof), radius 4 mm, proven by the
    # general second-order bound at a threshold near their median field.
    bodies = bench()[:2]
    table = BodyTable(bodies)
    gap = bodies[1].center - bodies[0].center
    normal = gap / np.linalg.norm(gap)
    spread = random_directions(300) * RNG.uniform(0, 0.06, 300)[:, None]
    spread -= np.outer(spread @ normal, normal)
    points = bodies[0].center + 0.5 * gap + spread
    threshold = float(np.median(field_size(bodies, points)))
    reach = np.full(len(points), 4e-3)
    model = local_model(bodies, points, 2e-3 * threshold, table)
    holds = patch_below(model, np.tile(normal, (len(points), 1)), np.zeros(len(points)), reach, threshold)
    assert holds.sum() > 30
    for point in points[holds]:
        offset = random_directions(300) * 4e-3 * np.sqrt(RNG.random((300, 1)))
        offset -= np.outer(offset @ normal, normal)
        assert field_size(bodies, point + offset).max() < threshold


@pytest.mark.parametrize("shape", ["cylinder", "ring", "block", "cube"])
def test_derivatives_of_the_dipole_remainder_stay_within_their_bound(shape):
    # Independent check: the exact field minus the point dipole, and its finite differences
    # along random directions (a lower estimate of each norm), at 1.25 to 6 bounding radii
    # (the blocks' multipole series holds from 1.18).
    from planner.physics.fields.sphere import dipole_field
    from tests.physics.references import tilted_magnet

    body = tilted_magnet(shape)

    def remainder(at):
        return field_of_bodies([body], at) - dipole_field(at, body.moment, body.center)

    points = random_directions(300) * (body.bounding_radius * RNG.uniform(1.25, 6, 300))[:, None]
    h = 1e-3 * body.bounding_radius
    table = BodyTable([body])
    distance = np.linalg.norm(points, axis=1)[:, None]
    directions = random_directions(6)
    first = np.max([np.linalg.norm(remainder(points + h * e) - remainder(points - h * e), axis=1) / (2 * h)
                    for e in directions], axis=0)
    second = np.max([np.linalg.norm(remainder(points + h * e) + remainder(points - h * e) - 2 * remainder(points),
                                    axis=1) / h**2 for e in directions], axis=0)
    assert np.all(np.linalg.norm(remainder(points), axis=1) <= dipole_remainder(table, distance, 0)[:, 0])
    assert np.all(first <= dipole_remainder(table, distance - h, 1)[:, 0])
    assert np.all(second <= dipole_remainder(table, distance - 2 * h, 2)[:, 0])


def test_start_radii_from_the_grid_are_just_beyond_where_the_bound_meets_each_threshold():
    # Independent computation: plain bisection (60 halvings) of the same bound for each
    # threshold; the grid's answer is never below it and at most 0.05 % above.
    from planner.physics.zones import bounds

    bodies = bench()
    table = BodyTable(bodies)
    thresholds = np.array([0.1e-3, 0.5e-3, 3e-3, 0.4])
    half_gap = np.linalg.norm(table.centres - table.centres[0], axis=1) / 2

    def bound(r):
        distance = np.maximum(r, half_gap)
        return np.sum(2 * bounds.K * table.moments / distance**3 + bounds.dipole_remainder(table, distance, 0))

    for threshold, found in zip(thresholds, farthest_start_radii(bodies, 0, thresholds, table)):
        low, high = bodies[0].bounding_radius * 1.000001, 10.0
        if bound(low) < threshold:
            assert found <= low
            continue
        for _ in range(60):
            middle = 0.5 * (low + high)
            low, high = (middle, high) if bound(middle) >= threshold else (low, middle)
        assert high <= found <= high * 1.0005
        assert bound(found) < threshold


def test_source_free_only_where_no_other_magnet_enters_the_cell_beyond_the_radius():
    disc = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.02, height=0.005)
    stacked = MagnetBody("cylinder", [0, 0, 0.005], np.eye(3), [0, 0, 1.2], diameter=0.02, height=0.005)
    apart = MagnetBody("cylinder", [0.1, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.02, height=0.005)
    # a stacked neighbour reaches across the bisecting plane: only a radius that holds it whole will do
    table = BodyTable([disc, stacked])
    assert not shell.source_free(table, 0, 0.012)
    assert shell.source_free(table, 0, 0.005 + stacked.bounding_radius + 1e-3)
    assert shell.source_free(BodyTable([disc, apart]), 0, 0.012)
    assert not shell.source_free(BodyTable([disc, apart]), 0, 0.5 * disc.bounding_radius)


def test_subset_table_equals_a_table_of_the_subset():
    bodies = bench()
    whole, part = BodyTable(bodies), BodyTable([bodies[2], bodies[0]])
    picked = whole.subset([2, 0])
    for name in ("vectors", "moments", "centres", "reach", "square", "shift", "flat", "curved"):
        assert np.array_equal(getattr(picked, name), getattr(part, name))
    distance = np.array([[0.05, 0.07]])
    assert np.array_equal(dipole_remainder(picked, distance, 1), dipole_remainder(part, distance, 1))


def test_forward_difference_jacobian_is_within_its_stated_error():
    # Independent computation: central differences of the exact field with a 10x smaller
    # step (error of order 1e-8 relative here).
    bodies = bench()
    table = BodyTable(bodies)
    points = bodies[0].center + random_directions(100) * 0.03
    model = local_model(bodies, points, 1e-7, table)
    h = 1e-6
    exact = np.stack([(field_of_bodies(bodies, points + h * e) - field_of_bodies(bodies, points - h * e)) / (2 * h)
                      for e in np.eye(3)], axis=1)
    difference = np.linalg.norm(model.jacobian - exact, axis=(1, 2))
    assert np.all(difference <= model.jacobian_error + 1e-6 * np.linalg.norm(exact, axis=(1, 2)))


def test_one_body_second_derivative_bound_is_the_general_one_without_the_series():
    # The forward-difference truncation uses a written-out bound for the one differenced body;
    # it must equal the volume and surface forms of derivative_bounds (series form left out)
    # for that body's column, beside and away from each body of the bench.
    bodies = bench()
    table = BodyTable(bodies)
    for index, body in enumerate(bodies):
        points = body.center + random_directions(200) * body.bounding_radius * RNG.uniform(0.9, 6.0, (200, 1))
        spread = RNG.uniform(0.0, 0.3, 200) * body.bounding_radius
        geometry = _ball_geometry(bodies, points, table)
        general = derivative_bounds(geometry, spread, (2,), per_body=True, series_form=False)[0][:, index]
        written = _second_derivative_bound(table, index, geometry[0][:, index], geometry[1][:, index], spread)
        np.testing.assert_allclose(written, general, rtol=1e-12)


def test_weak_magnet_beside_a_strong_one_covers_the_field_along_their_face():
    # The strong disc's region reaches into the weak disc's cell along the plane between
    # them: the weak magnet's distance must cover it. Brute force on the plane and beside it.
    strong = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [1.45, 0, 0], diameter=0.025, height=0.012)
    weak = MagnetBody("cylinder", [0.05, 0, 0], np.eye(3), [0, 0, 0.4], diameter=0.006, height=0.003)
    bodies = [strong, weak]
    threshold = 3e-3
    found = keep_out_radii(bodies, 1, [threshold])[0]
    plane = np.array([0.025, 0, 0]) + random_directions(80000) * RNG.uniform(0, 0.2, 80000)[:, None]
    plane[:, 0] = 0.025 + RNG.uniform(0, 2e-3, 80000)  # on the plane and just inside the weak cell
    distance = np.linalg.norm(plane - weak.center, axis=1)
    beyond = plane[distance > found]
    assert field_size(bodies, beyond).max() < threshold


def test_child_indices_name_the_subdivided_triangles_and_cached_cones_match():
    # identity: the children found by index in the next level's tiling are the triangles
    # subdivide() makes of the same parents, and the cached caps are cone_of_triangle's
    from planner.physics.zones.sampling import (child_indices, cone_of_triangle, icosahedron_cones,
                                                icosahedron_triangles, subdivide)

    parents = np.array([0, 5, 77, 319])
    children = child_indices(parents, 2)
    assert np.array_equal(icosahedron_triangles(3)[children], subdivide(icosahedron_triangles(2)[parents]))
    axes, half_angles = cone_of_triangle(icosahedron_triangles(3)[children])
    assert np.array_equal(icosahedron_cones(3)[0][children], axes)
    assert np.array_equal(icosahedron_cones(3)[1][children], half_angles)


def scattered(seed):
    """Four magnets of mixed shapes, sizes and strengths (ferrite to N52) 6.5 cm apart."""
    rng = np.random.default_rng(seed)
    bodies = []
    for k in range(4):
        centre = np.array([0.065 * k, rng.uniform(-0.02, 0.02), rng.uniform(-0.01, 0.01)])
        direction = rng.normal(size=3)
        polarization = rng.uniform(0.4, 1.45) * direction / np.linalg.norm(direction)
        rotation = rotation_from_axis(rng.normal(size=3))
        if k % 2:
            bodies.append(MagnetBody("block", centre, rotation, polarization, size=rng.uniform(4e-3, 15e-3, 3)))
        else:
            bodies.append(MagnetBody("cylinder", centre, rotation, polarization, diameter=rng.uniform(5e-3, 20e-3),
                                     height=rng.uniform(3e-3, 10e-3)))
    return bodies


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_keep_out_of_scattered_magnets_is_never_short_in_any_cell(seed):
    # At 1 and 3 mT, brute force over each cell beyond the reported distance (random points
    # and points on the cell's faces) finds no point at the threshold in the exact total field.
    bodies = scattered(seed)
    thresholds = [1e-3, 3e-3]
    centres = np.array([b.center for b in bodies])
    for index in range(4):
        found = keep_out_radii(bodies, index, thresholds)
        for threshold, radius in zip(thresholds, found):
            points = centres[index] + random_directions(30000) * (radius * (1 + 0.6 * RNG.random(30000) ** 2))[:, None]
            for other in centres[np.arange(4) != index]:  # on the bisecting plane with each neighbour
                gap = other - centres[index]
                normal = gap / np.linalg.norm(gap)
                spread = random_directions(5000) * (radius * (1 + 0.6 * RNG.random(5000)))[:, None]
                spread -= np.outer(spread @ normal, normal)
                face = centres[index] + 0.5 * gap + spread
                points = np.vstack([points, face[np.linalg.norm(face - centres[index], axis=1) > radius]])
            points = points[in_own_cell(bodies, index, points)]
            assert field_size(bodies, points).max() < threshold


def test_keep_out_of_scattered_magnets_is_within_the_margin():
    # At most 5 % or 5 mm beyond a point that an independent brute-force search (shells,
    # then a local search with bisection, tests/physics/test_zones.py) finds at 1 mT.
    bodies = scattered(1)
    for index in range(4):
        found = keep_out_radii(bodies, index, [1e-3])[0]
        exact_low = farthest_found(bodies, index, 1e-3, 1.5 * found, RNG)
        assert exact_low <= found <= max(1.05 * exact_low, exact_low + 5e-3)


def test_clipped_caps_hold_the_part_of_each_cap_inside_the_face():
    # Brute force: points of random caps (1-25 degrees) on the inner side of random planes
    # u . v <= h lie within the returned cap; caps reported wholly beyond have no such point;
    # and caps the plane cuts near their edge shrink.
    # (a cell's faces lie at heights h = g / 2R > 0; negative ones must come back unchanged)
    count = 600
    axes, normals = random_directions(count), random_directions(count)
    axes *= np.sign(np.sum(axes * normals, axis=1))[:, None]
    half_angles = RNG.uniform(0.02, 0.45, count)
    heights = np.sum(axes * normals, axis=1) + RNG.uniform(-1.3, 1.3, count) * np.sin(half_angles)
    new_axes, new_half_angles, beyond = shell.clipped_caps(axes, half_angles, normals, heights)
    for k in range(count):
        # points of the cap: its centre, its rim and random points inside
        across = random_directions(3000)
        across -= np.outer(across @ axes[k], axes[k])
        across /= np.linalg.norm(across, axis=1)[:, None]
        angle = half_angles[k] * np.concatenate([np.ones(1000), np.sqrt(RNG.random(2000))])
        points = np.cos(angle)[:, None] * axes[k] + np.sin(angle)[:, None] * across
        inner = points @ normals[k] <= heights[k]
        if beyond[k]:
            assert not inner.any()
            continue
        seen = np.arccos(np.clip(points[inner] @ new_axes[k], -1.0, 1.0))
        assert np.all(seen <= new_half_angles[k] * (1 + 1e-9))  # the rim's rounding
    shrunk = new_half_angles < half_angles
    assert shrunk.sum() > count / 10
    assert np.all(new_half_angles <= half_angles)
    assert not np.any(shrunk & (heights < 0))


def test_dipole_jacobian_on_a_sphere_is_the_derivative_of_the_dipole_field():
    # The Jacobian of bounds.dipole_sums, which the field model uses for its dipoles and whose
    # closed form the cap bound's own-dipole term rests on, at c + R u. Independent
    # computation: central differences (step 1e-6 R) of the point-dipole field of
    # planner.physics.fields.sphere (Jackson eq. 5.56).
    from planner.physics.fields.sphere import dipole_field
    from planner.physics.zones.bounds import dipole_sums

    moment, radius = np.array([0.3, -1.1, 0.7]), 0.07
    axes = random_directions(20)
    jacobian = dipole_sums(radius * axes[:, None, :], np.full((len(axes), 1), 1.0 / radius), moment[None])[1]
    h = 1e-6 * radius
    for axis, ours in zip(axes, jacobian):
        point = radius * axis
        numeric = np.array([(dipole_field((point + h * e)[None], moment, np.zeros(3))
                             - dipole_field((point - h * e)[None], moment, np.zeros(3)))[0] / (2 * h)
                            for e in np.eye(3)])  # row j: dB/dx_j
        assert np.allclose(ours, numeric, rtol=1e-6, atol=1e-9 * np.abs(numeric).max())


def test_body_table_is_kept_for_the_same_bodies_and_rebuilt_for_others():
    # identity: bodies equal in value (as a worker receives them, rebuilt from a queue) get the
    # table already built; another set gets its own, equal to one built directly
    from planner.physics.zones.bounds import body_table

    first = body_table(bench())
    assert body_table(bench()) is first
    moved = bench()
    moved[0] = MagnetBody("cylinder", [0.001, 0, 0], moved[0].rotation, moved[0].polarization,
                          diameter=moved[0].diameter, height=moved[0].height)
    other = body_table(moved)
    assert other is not first
    assert np.array_equal(other.centres, BodyTable(moved).centres)
