"""Field models: published check values and physical identities.

Each check names its source beside it. Sources: physics.md = ../shared/reference/physics.md
(the project's reference sheet, which cites the papers).
"""
import warnings

import numpy as np
import pytest
from scipy.constants import mu_0
from scipy.integrate import quad
from scipy.special import ellipkm1, elliprf, elliprj

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import (
    FAR_FIELD_RADII,
    block_field,
    block_on_axis_field,
    cylinder_field,
    cylinder_on_axis_field,
    dipole_field,
    field_of_bodies,
    field_of_body,
    sphere_field,
)
from planner.physics.fields.elliptic import complete_elliptic_integrals

TILT = rotation_from_axis([0.3, -0.5, 0.8])


def bodies():
    """One body of each shape, rotated, off-centre, with a tilted polarization."""
    centre = [0.01, -0.02, 0.005]
    J = np.array([0.4, -0.7, 0.9])
    return [
        MagnetBody("cylinder", centre, TILT, J, diameter=0.02, height=0.012),
        MagnetBody("ring", centre, TILT, J, diameter=0.02, inner_diameter=0.008, height=0.01),
        MagnetBody("block", centre, TILT, J, size=[0.02, 0.01, 0.015]),
        MagnetBody("sphere", centre, TILT, J, diameter=0.015),
    ]


def outside_points(body, count, rng, low=1.05, high=4.0):
    """Random points at low..high bounding radii from the centre (outside the body)."""
    direction = rng.normal(size=(count, 3))
    direction /= np.linalg.norm(direction, axis=1)[:, None]
    radius = rng.uniform(low, high, count) * body.bounding_radius
    return body.center + direction * radius[:, None]


@pytest.fixture(autouse=True)
def warnings_are_errors():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        yield


# --- published check values ---------------------------------------------------------


@pytest.mark.parametrize("half_height, rho, z, expected", [
    (1.0, 1.0, 2.0, (0.0556, 0.0669)),  # physics.md, Derby & Olbert check value
    (2.0, 2.0, 3.0, (0.0412, 0.0181)),  # physics.md, Derby & Olbert check value
])
def test_cylinder_check_values(half_height, rho, z, expected):
    # units of J = 1 T and of the radius = 1 m
    B = cylinder_field([[rho, 0.0, z]], 2.0, 2 * half_height, [0.0, 0.0, 1.0])[0]
    assert B[0] == pytest.approx(expected[0], abs=5e-5)
    assert B[2] == pytest.approx(expected[1], abs=5e-5)
    assert B[1] == 0.0  # symmetry: no azimuthal field for axial magnetization


def test_cuboid_check_value():
    # physics.md check value: unit cube (half-side 0.5), J = (0,0,1) T, point (1,1,1)
    B = block_field([[1.0, 1.0, 1.0]], [1.0, 1.0, 1.0], [0.0, 0.0, 1.0])[0]
    assert B == pytest.approx([0.01561, 0.01561, 0.0], abs=5e-6)


def test_cylinder_on_axis_closed_form_matches_3d():
    # Camacho & Sosa, Rev. Mex. Fis. E 59, 8-17 (2013): on-axis formula vs full 3-D field
    diameter, height, J = 0.02, 0.015, 1.3
    distance = np.array([0.0, 1e-4, 0.003, 0.01, 0.05, 0.3])
    points = np.column_stack([np.zeros(6), np.zeros(6), height / 2 + distance])
    B = cylinder_field(points, diameter, height, [0.0, 0.0, J])
    on_axis = cylinder_on_axis_field(distance, diameter, height, J)
    np.testing.assert_allclose(B[:, 2], on_axis, rtol=1e-10)
    np.testing.assert_allclose(B[:, :2], 0.0, atol=1e-15)
    # face centre: (J/2) L / sqrt(L^2 + R^2), printed in the same paper
    assert on_axis[0] == pytest.approx(J / 2 * height / np.hypot(height, diameter / 2), rel=1e-12)


def test_block_on_axis_closed_form_matches_3d():
    # Camacho & Sosa (2013) / physics.md block on-axis formula vs full 3-D field
    width, depth, length, J = 0.02, 0.01, 0.005, 1.2
    distance = np.array([0.0, 1e-4, 0.002, 0.01, 0.04, 0.2])
    points = np.column_stack([np.zeros(6), np.zeros(6), length / 2 + distance])
    B = block_field(points, [width, depth, length], [0.0, 0.0, J])
    np.testing.assert_allclose(B[:, 2], block_on_axis_field(distance, width, depth, length, J),
                               rtol=1e-10)


def test_bulirsch_matches_carlson():
    # independent computation: C = c R_F(0,kc^2,1) + ((s - p c)/3) R_J(0,kc^2,1,p)
    # (physics.md; Carlson's integrals from scipy.special)
    rng = np.random.default_rng(1)
    kc = np.concatenate([rng.uniform(0, 1, 500), 10 ** rng.uniform(-10, 0, 500), [1.0, 2.5]])
    p = np.concatenate([10 ** rng.uniform(-10, 1, 1000), [1.0, 0.3]])
    c, s = rng.normal(size=kc.size), rng.normal(size=kc.size)
    [[value]] = complete_elliptic_integrals(kc, [(p, [(c, s)])])
    rf, rj = elliprf(0, kc**2, 1), elliprj(0, kc**2, 1, p)
    scale = np.abs(c) * rf + np.abs(s - p * c) / 3 * rj
    assert np.max(np.abs(value - (c * rf + (s - p * c) / 3 * rj)) / scale) < 1e-11


def test_bulirsch_with_p_one_and_complete_first_kind():
    # independent computation: for p = 1, C = c R_F(0,kc^2,1) + ((s - c)/3) R_J(0,kc^2,1,1)
    # (physics.md), and K(k) with k^2 = 1 - kc^2 from scipy.special.ellipkm1 (Cephes)
    rng = np.random.default_rng(2)
    kc = np.concatenate([rng.uniform(0, 1, 300), 10 ** rng.uniform(-10, 0, 300), [1.0]])
    c, s = rng.normal(size=kc.size), rng.normal(size=kc.size)
    [[value, second]], complete_k = complete_elliptic_integrals(
        kc, [(1.0, [(c, s), (1.0, -1.0)])], first_kind=True)
    rf, rj = elliprf(0, kc**2, 1), elliprj(0, kc**2, 1, 1.0)
    scale = np.abs(c) * rf + np.abs(s - c) / 3 * rj
    assert np.max(np.abs(value - (c * rf + (s - c) / 3 * rj)) / scale) < 1e-11
    assert np.max(np.abs(second - (rf - 2 / 3 * rj)) / (rf + 2 / 3 * rj)) < 1e-11
    np.testing.assert_allclose(complete_k, ellipkm1(kc**2), rtol=1e-13)


@pytest.mark.parametrize("accuracy", [1e-7, 1e-5, 1e-3])
def test_bulirsch_with_reduced_accuracy_stays_within_it(accuracy):
    # independent computation: Carlson's R_F and R_J from scipy.special, as above. Each kc
    # is evaluated on its own (the step count follows the smallest kc of a call), over the
    # whole range of kc and p; the error is measured on the scale C(kc, p, |c|, |s|).
    rng = np.random.default_rng(6)
    shortened = 0
    for kc0 in np.concatenate([np.linspace(0.002, 1.0, 60), 10 ** np.linspace(-8, -3, 12)]):
        kc = np.full(40, kc0)
        p = 10 ** rng.uniform(-8, 1, 40)
        c, s = rng.normal(size=40), rng.normal(size=40)
        [[value]] = complete_elliptic_integrals(kc, [(p, [(c, s)])], accuracy=accuracy)
        rf, rj = elliprf(0, kc**2, 1), elliprj(0, kc**2, 1, p)
        scale = np.abs(c) * rf + np.abs(s - p * c) / 3 * rj
        assert np.max(np.abs(value - (c * rf + (s - p * c) / 3 * rj)) / scale) <= accuracy
        [[full]] = complete_elliptic_integrals(kc, [(p, [(c, s)])])
        shortened += not np.array_equal(value, full)
    assert shortened > 10  # the iteration did stop early for many kc


def test_cylinder_field_with_reduced_accuracy():
    # independent computation: the same closed form at double precision (itself checked
    # against Derby & Olbert's values and the surface-charge integral above). Points one at
    # a time, so that each takes only the steps its own kc needs; a thin disc, where the two
    # faces' terms cancel most, and a long rod; the docstring states up to 20x accuracy.
    rng = np.random.default_rng(7)
    accuracy = 1e-7
    for diameter, height in ((10e-3, 0.5e-3), (2e-3, 20e-3)):
        reach = np.hypot(diameter / 2, height / 2)
        points = rng.normal(size=(300, 3))
        points *= reach * rng.uniform(0.2, 4.0, (300, 1)) / np.linalg.norm(points, axis=1)[:, None]
        outside = (np.hypot(points[:, 0], points[:, 1]) > diameter / 2) | (np.abs(points[:, 2]) > height / 2)
        for J in ([0.0, 0.0, 1.2], [1.2, 0.0, 0.0]):
            for point in points[outside]:
                exact = cylinder_field(point[None], diameter, height, J)
                reduced = cylinder_field(point[None], diameter, height, J, accuracy=accuracy)
                assert np.linalg.norm(reduced - exact) <= 20 * accuracy * np.linalg.norm(exact)


def test_diametral_cylinder_matches_surface_charge_integral():
    # independent computation suggested in physics.md: surface charge J cos(phi')/mu0 on the
    # curved face; the z' integral is done in closed form, the phi' integral by quadrature.
    radius, half, J = 0.01, 0.008, 1.1
    for point in ([0.013, 0.004, 0.002], [0.002, -0.003, 0.012], [-0.02, 0.01, -0.015]):
        x, y, z = point

        def component(phi, axis):
            px, py = radius * np.cos(phi), radius * np.sin(phi)
            across2 = (x - px) ** 2 + (y - py) ** 2
            # integral over z' of (r - r')/|r - r'|^3
            upper, lower = z + half, z - half  # zeta = z - z' runs lower..upper
            if axis == 2:
                value = 1 / np.sqrt(across2 + lower**2) - 1 / np.sqrt(across2 + upper**2)
            else:
                value = (upper / np.sqrt(across2 + upper**2)
                         - lower / np.sqrt(across2 + lower**2)) / across2
                value *= (x - px) if axis == 0 else (y - py)
            return np.cos(phi) * radius * value

        expected = [J / (4 * np.pi) * quad(component, 0, 2 * np.pi, args=(axis,),
                                           epsabs=1e-13, epsrel=1e-12, limit=200)[0]
                    for axis in range(3)]
        B = cylinder_field([point], 2 * radius, 2 * half, [J, 0.0, 0.0])[0]
        np.testing.assert_allclose(B, expected, rtol=1e-8, atol=1e-12)


# --- identities ------------------------------------------------------------------------


@pytest.mark.parametrize("index", range(4))
def test_divergence_and_curl_vanish_outside(index):
    # Maxwell's equations: div B = 0 everywhere, curl B = 0 outside the magnet
    body = bodies()[index]
    points = outside_points(body, 60, np.random.default_rng(index), low=1.2)
    step = 1e-5 * body.bounding_radius
    jacobian = np.empty((len(points), 3, 3))
    for axis in range(3):
        shift = np.zeros(3)
        shift[axis] = step
        jacobian[:, :, axis] = (field_of_body(body, points + shift)
                                - field_of_body(body, points - shift)) / (2 * step)
    scale = np.linalg.norm(jacobian, axis=(1, 2))
    divergence = np.trace(jacobian, axis1=1, axis2=2)
    curl = jacobian - np.transpose(jacobian, (0, 2, 1))
    assert np.max(np.abs(divergence) / scale) < 1e-6
    assert np.max(np.linalg.norm(curl, axis=(1, 2)) / scale) < 1e-6


def test_divergence_vanishes_inside_the_cylinder():
    # div B = 0 also inside; curl B = 0 there too (no free currents); diametral part included
    points = np.random.default_rng(5).uniform(-0.6, 0.6, (40, 3)) * [0.01, 0.01, 0.006]
    J = [0.8, 0.3, 0.5]
    step = 1e-8
    jacobian = np.empty((len(points), 3, 3))
    for axis in range(3):
        shift = np.zeros(3)
        shift[axis] = step
        jacobian[:, :, axis] = (cylinder_field(points + shift, 0.02, 0.012, J)
                                - cylinder_field(points - shift, 0.02, 0.012, J)) / (2 * step)
    scale = np.linalg.norm(jacobian, axis=(1, 2))
    assert np.max(np.abs(np.trace(jacobian, axis1=1, axis2=2)) / scale) < 1e-5
    curl = jacobian - np.transpose(jacobian, (0, 2, 1))
    assert np.max(np.linalg.norm(curl, axis=(1, 2)) / scale) < 1e-5


def test_superposition_of_bodies_and_of_polarization():
    # linearity of magnetostatics: fields add; B is linear in J
    rng = np.random.default_rng(2)
    several = bodies()
    points = rng.uniform(-0.08, 0.08, (300, 3))
    total = field_of_bodies(several, points)
    np.testing.assert_allclose(total, sum(field_of_body(b, points) for b in several),
                               rtol=1e-13, atol=1e-16)
    for shape_body in several:
        parts = [MagnetBody(shape_body.shape, shape_body.center, shape_body.rotation, J,
                            shape_body.diameter, shape_body.height,
                            shape_body.inner_diameter, shape_body.size)
                 for J in ([0.4, 0, 0], [0, -0.7, 0], [0, 0, 0.9])]
        np.testing.assert_allclose(field_of_bodies(parts, points),
                                   field_of_body(shape_body, points), rtol=1e-10, atol=1e-14)


def test_ring_is_outer_cylinder_minus_bore():
    # superposition (physics.md): ring = cylinder(outer) - cylinder(inner), also in the bore
    ring = bodies()[1]
    outer = MagnetBody("cylinder", ring.center, ring.rotation, ring.polarization,
                       diameter=ring.diameter, height=ring.height)
    bore = MagnetBody("cylinder", ring.center, ring.rotation, -ring.polarization,
                      diameter=ring.inner_diameter, height=ring.height)
    points = np.vstack([outside_points(ring, 200, np.random.default_rng(3)),
                        ring.center + ring.rotation @ [0.001, 0.001, 0.002]])
    np.testing.assert_allclose(field_of_body(ring, points), field_of_bodies([outer, bore], points),
                               rtol=1e-12, atol=1e-15)


@pytest.mark.parametrize("index", range(4))
def test_rotating_body_and_points_together(index):
    # isotropy of space: rotating the whole arrangement rotates B and keeps |B|
    body = bodies()[index]
    points = outside_points(body, 200, np.random.default_rng(10 + index), low=0.3)
    turn = rotation_from_axis([-0.2, 0.9, 0.4]) @ rotation_from_axis([1.0, 0.2, 0.1]).T
    turned = MagnetBody(body.shape, turn @ body.center, turn @ body.rotation,
                        turn @ body.polarization, body.diameter, body.height,
                        body.inner_diameter, body.size)
    B = field_of_body(body, points)
    B_turned = field_of_body(turned, points @ turn.T)
    np.testing.assert_allclose(np.linalg.norm(B_turned, axis=1), np.linalg.norm(B, axis=1),
                               rtol=1e-9)
    np.testing.assert_allclose(B_turned, B @ turn.T, rtol=1e-9, atol=1e-12)


@pytest.mark.parametrize("index", range(4))
def test_scaling_all_lengths_keeps_b(index):
    # B of a uniformly magnetized body depends only on ratios of lengths (dimensional analysis)
    body = bodies()[index]
    points = outside_points(body, 200, np.random.default_rng(20 + index), low=0.3)
    k = 37.5
    scaled = MagnetBody(body.shape, k * body.center, body.rotation, body.polarization,
                        k * body.diameter, k * body.height, k * body.inner_diameter,
                        k * body.size)
    np.testing.assert_allclose(field_of_body(scaled, k * points), field_of_body(body, points),
                               rtol=1e-9, atol=1e-13)


@pytest.mark.parametrize("index", range(4))
@pytest.mark.parametrize("sizes", [10.0, 30.0, 1e3, 1e5])
def test_far_field_tends_to_dipole(index, sizes):
    # physics.md: beyond ~10 body sizes every body is a dipole m = J V / mu0 within 1%
    body = bodies()[index]
    points = outside_points(body, 100, np.random.default_rng(30 + index), low=1.0, high=1.0001)
    points = body.center + (points - body.center) * sizes * 2  # 2 bounding radii = one size
    B = field_of_body(body, points)
    dipole = dipole_field(points, body.polarization * body.volume / mu_0, body.center)
    error = np.linalg.norm(B - dipole, axis=1) / np.linalg.norm(dipole, axis=1)
    assert np.max(error) < 0.01
    # and the remainder falls as (size/distance)^2 (the octupole), no cancellation noise
    assert np.max(error) < 2.0 / sizes**2


def test_switch_to_far_field_is_seamless():
    # the closed form and the multipole expansion agree where one hands over to the other
    for body in bodies()[:3]:
        direction = np.array([0.36, -0.48, 0.8])
        r = FAR_FIELD_RADII * body.bounding_radius
        inner = field_of_body(body, body.center + direction * r * (1 - 1e-9))
        outer = field_of_body(body, body.center + direction * r * (1 + 1e-9))
        np.testing.assert_allclose(inner, outer, rtol=2e-8)


def test_sphere_inside_and_outside():
    # Jackson, Classical Electrodynamics, sec. 5.10: B = 2J/3 inside, dipole outside
    J = np.array([0.2, -1.1, 0.6])
    inside = np.random.default_rng(4).uniform(-0.004, 0.004, (50, 3))
    np.testing.assert_allclose(sphere_field(inside, 0.015, J), np.tile(2 * J / 3, (50, 1)),
                               rtol=1e-14)
    body = MagnetBody("sphere", [0.01, 0, 0], TILT, J, diameter=0.015)
    outside = outside_points(body, 50, np.random.default_rng(5))
    np.testing.assert_allclose(field_of_body(body, outside),
                               dipole_field(outside, J * body.volume / mu_0, body.center),
                               rtol=1e-12)


def test_result_does_not_depend_on_how_points_are_batched():
    # identity: each point's field depends on that point alone, so a large call (processed in
    # blocks, with near, far-field and edge points mixed in one block) must give exactly the
    # per-point values, whatever the order of the points
    from planner.physics.fields.chunking import BLOCK_POINTS

    rng = np.random.default_rng(41)
    for body in bodies()[:3]:
        near = outside_points(body, BLOCK_POINTS + 500, rng, low=0.2, high=3.0)
        far = outside_points(body, 300, rng, low=1.2 * FAR_FIELD_RADII, high=2 * FAR_FIELD_RADII)
        points = np.vstack([near, far])
        order = rng.permutation(len(points))
        together = field_of_body(body, points)
        np.testing.assert_allclose(field_of_body(body, points[order]), together[order],
                                   rtol=1e-13, atol=1e-18)
        for index in rng.choice(len(points), 40, replace=False):
            np.testing.assert_allclose(field_of_body(body, points[index]), together[index],
                                       rtol=1e-13, atol=1e-18)


def test_round_off_across_the_axis_is_dropped_but_real_components_are_kept():
    # isotropy: a cylinder whose axis is built from its own J is an axial magnet turned
    # round, B = R B_axial(R^T (p - c)); superposition: a real transverse part of 1e-9 |J|
    # adds exactly the field of that part (it must not be mistaken for round-off)
    J = 1.3 * np.array([0.3, -0.5, 0.8]) / np.linalg.norm([0.3, -0.5, 0.8])
    turn = rotation_from_axis(J)
    centre = np.array([0.002, -0.001, 0.003])
    body = MagnetBody("cylinder", centre, turn, J, diameter=0.02, height=0.01)
    points = outside_points(body, 300, np.random.default_rng(50), low=0.2)
    local = (points - centre) @ turn
    expected = cylinder_field(local, 0.02, 0.01, [0.0, 0.0, 1.3]) @ turn.T
    np.testing.assert_allclose(field_of_body(body, points), expected, rtol=1e-12, atol=1e-16)
    shapes = ((cylinder_field, (0.02, 0.01)), (block_field, ([0.02, 0.01, 0.03],)))
    for field_function, size in shapes:
        small = np.array([1e-9 * 1.3, 0.0, 1.3])
        difference = (field_function(local, *size, small)
                      - field_function(local, *size, [0.0, 0.0, 1.3]))
        np.testing.assert_allclose(difference, field_function(local, *size, [1e-9 * 1.3, 0, 0]),
                                   rtol=1e-4, atol=1e-15)  # 1e-15 T: round-off of B ~ 0.1 T


def test_legendre_k_and_e_match_published_values_and_cephes():
    # Abramowitz & Stegun Table 17.1: K(1/2) = 1.8540746773, E(1/2) = 1.3506438810; and
    # scipy.special.ellipk / ellipe (Cephes, test-only here) over the whole range of m,
    # up to m = 1 - 1e-12, where kc is given directly
    from scipy.special import ellipe, ellipk

    from planner.physics.fields.elliptic import legendre_k_and_e

    K, E = legendre_k_and_e(np.sqrt(0.5))
    assert float(K) == pytest.approx(1.8540746773, abs=1e-10)
    assert float(E) == pytest.approx(1.3506438810, abs=1e-10)
    m = np.concatenate([np.linspace(0.0, 0.999, 500), 1.0 - np.logspace(-12, -3, 50)])
    K, E = legendre_k_and_e(np.sqrt(1.0 - m))
    np.testing.assert_allclose(K, ellipk(m), rtol=1e-13)
    np.testing.assert_allclose(E, ellipe(m), rtol=1e-13)
    K, E = legendre_k_and_e(0.0)
    assert np.isinf(K) and E == 1.0


def test_carlson_rd_matches_its_identities_and_scipy():
    # DLMF 19.20.2: R_D(x, x, x) = x^(-3/2); 19.20.1 with the lemniscate constant:
    # R_D(0, 2, 1) = 3 Gamma(3/4)^2 / sqrt(2 pi) (= 1.7972103521...); and scipy.special.elliprd
    # (test-only) at random arguments over six decades
    from math import gamma, pi, sqrt

    from scipy.special import elliprd

    from planner.physics.fields.elliptic import carlson_rd

    assert carlson_rd(4.0, 4.0, 4.0) == pytest.approx(4.0 ** -1.5, rel=1e-15)
    assert carlson_rd(0.0, 2.0, 1.0) == pytest.approx(3 * gamma(0.75) ** 2 / sqrt(2 * pi), rel=1e-14)
    rng = np.random.default_rng(4)
    for x, y, z in rng.random((300, 3)) * 10.0 ** rng.uniform(-3, 3, (300, 3)):
        assert carlson_rd(x, y, z) == pytest.approx(elliprd(x, y, z), rel=1e-14)
