"""General charge-model forces, torques, energies and the image method.

Each check names its source: physical identities (Newton's third law, balance of angular
momentum, F = -grad U, the exterior field of a uniformly magnetized sphere is a dipole's),
the point-dipole force and torque (physics reference sheet, sec. 1-2), and magpylib's meshed
force (test-only reference library, magpylib.getFT).
"""
from dataclasses import replace

import numpy as np
import pytest
from scipy.constants import mu_0

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import field_of_body
from planner.physics.forces import (coaxial_cylinders_axial_force, energy_between, force_and_torque, force_between,
                                    place_at_gap,
                                    force_and_torque_by_charges, interaction_energy,
                                    mirror_in_plane, plate_saturation_check,
                                    steel_surface_force_and_torque)
from tests.physics.references import magpylib_source, plain_reference

TILT = rotation_from_axis([1.0, 0.3, 1.0])
PAIRS = {
    "block-tilted cylinder": (
        MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=[10e-3, 6e-3, 5e-3]),
        MagnetBody("cylinder", [2e-3, 1e-3, 8e-3], TILT, 1.1 * TILT[:, 0], diameter=6e-3, height=4e-3)),
    "ring-sphere": (
        MagnetBody("ring", [0, 0, 0], np.eye(3), [0.3, 0, 1.2], diameter=12e-3, inner_diameter=5e-3, height=4e-3),
        MagnetBody("sphere", [3e-3, -2e-3, 9e-3], np.eye(3), [0.5, 0.2, -1.0], diameter=6e-3)),
    "diametral cylinder-block": (
        MagnetBody("cylinder", [0, 0, 0], TILT, 1.3 * TILT[:, 1], diameter=8e-3, height=10e-3),
        MagnetBody("block", [11e-3, 0, 2e-3], TILT, [0.2, 1.0, 0.4], size=[4e-3, 5e-3, 6e-3])),
}


@pytest.mark.parametrize("name", PAIRS)
def test_newton_third_law_and_angular_momentum(name):
    # physical identities: F12 = -F21; T1 + T2 + (c2 - c1) x F2 = 0 (torques about centres)
    a, b = PAIRS[name]
    force_b, torque_b = force_and_torque_by_charges(b, a, rtol=1e-5)
    force_a, torque_a = force_and_torque_by_charges(a, b, rtol=1e-5)
    scale = np.linalg.norm(force_b)
    assert np.linalg.norm(force_a + force_b) <= 1e-4 * scale
    lever = b.bounding_radius + a.bounding_radius
    balance = torque_a + torque_b + np.cross(b.center - a.center, force_b)
    assert np.linalg.norm(balance) <= 1e-4 * scale * lever


@pytest.mark.parametrize("name", PAIRS)
def test_force_is_minus_gradient_of_energy(name):
    # physical identity F = -grad U, central differences of the energy (step 20 um)
    source, target = PAIRS[name]
    force, _ = force_and_torque_by_charges(target, source, rtol=1e-6)
    step = 2e-5
    gradient = []
    for axis in np.eye(3):
        up = interaction_energy(replace(target, center=target.center + step * axis), source, rtol=1e-8)
        down = interaction_energy(replace(target, center=target.center - step * axis), source, rtol=1e-8)
        gradient.append((up - down) / (2 * step))
    assert np.linalg.norm(force + np.array(gradient)) <= 1e-3 * np.linalg.norm(force)


def test_energy_is_symmetric():
    # physical identity: U(a in field of b) = U(b in field of a)
    a, b = PAIRS["block-tilted cylinder"]
    assert interaction_energy(a, b, rtol=1e-8) == pytest.approx(interaction_energy(b, a, rtol=1e-8), rel=1e-6)


def dipole_field(moment, offset):
    # physics.md sec. 1: B = mu0/(4 pi) (3 r (m.r) - m r^2) / r^5
    r = np.linalg.norm(offset)
    return mu_0 / (4 * np.pi) * (3 * offset * (moment @ offset) - moment * r**2) / r**5


def test_coaxial_dipoles_far_apart():
    # physics.md sec. 2: F -> 3 mu0 m1 m2 / (2 pi d^4) for coaxial dipoles (general quadrature)
    d = 0.15
    a = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=[5e-3, 4e-3, 3e-3])
    b = MagnetBody("cylinder", [0, 0, d], TILT, [0, 0, 1.0], diameter=4e-3, height=4e-3)
    force, torque = force_and_torque_by_charges(b, a)
    m1, m2 = np.linalg.norm(a.moment), np.linalg.norm(b.moment)
    assert force[2] == pytest.approx(-3 * mu_0 * m1 * m2 / (2 * np.pi * d**4), rel=2e-3)
    assert np.linalg.norm(force[:2]) <= 1e-3 * abs(force[2])


def test_torque_far_away_is_m_cross_b():
    # physics.md sec. 1: far from the source B is the dipole field; torque -> m x B
    a = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=5e-3, height=5e-3)
    b = MagnetBody("block", [0.1, 0.02, 0.05], TILT, 1.0 * TILT[:, 0], size=[3e-3, 3e-3, 4e-3])
    _, torque = force_and_torque_by_charges(b, a)
    expected = np.cross(b.moment, dipole_field(a.moment, b.center - a.center))
    assert np.linalg.norm(torque - expected) <= 5e-3 * np.linalg.norm(expected)


def test_sphere_target_feels_the_point_dipole_force():
    # identity: a uniformly magnetized sphere's outside field is exactly a dipole's, so by
    # Newton's third law the force on it equals the force on a point dipole at its centre,
    # F = grad(m . B), here by central differences of the exact source field
    source = PAIRS["block-tilted cylinder"][0]
    sphere = MagnetBody("sphere", [3e-3, 2e-3, 9e-3], np.eye(3), [0.4, -0.3, 1.1], diameter=6e-3)
    force, _ = force_and_torque_by_charges(sphere, source, rtol=1e-6)
    step, gradient = 1e-6, []
    for axis in np.eye(3):
        up = sphere.moment @ field_of_body(source, sphere.center + step * axis)
        down = sphere.moment @ field_of_body(source, sphere.center - step * axis)
        gradient.append((up - down) / (2 * step))
    assert np.linalg.norm(force - gradient) <= 1e-4 * np.linalg.norm(force)


SPHERE_CASES = {  # (sphere, other body, gap between them [m])
    "sphere on a tilted block, touching": (
        MagnetBody("sphere", [0, 0, 0.03], np.eye(3), [0.4, -0.3, 1.1], diameter=6e-3),
        PAIRS["block-tilted cylinder"][0], 0.0),
    "sphere beside a diametral cylinder": (
        MagnetBody("sphere", [0.02, 0.0, 0.0], rotation_from_axis([0.2, 0.9, 0.1]), [0.0, 1.3, 0.2], diameter=5e-3),
        PAIRS["diametral cylinder-block"][0], 2e-3),
    "sphere in front of a ring": (
        MagnetBody("sphere", [0.0, 0.004, 0.02], np.eye(3), [0.0, 0.0, -1.2], diameter=5e-3),
        PAIRS["ring-sphere"][0], 1e-3),
}


@pytest.mark.parametrize("name", SPHERE_CASES)
def test_sphere_fast_path_matches_the_charge_quadrature_both_ways(name):
    # independent computation: the surface-charge quadrature at rtol 1e-7 over the sphere,
    # against the point-dipole identity (mean-value property) the dispatcher uses; and the
    # other body's share by the same identity, against its own quadrature
    sphere, other, gap = SPHERE_CASES[name]
    toward = other.center - sphere.center
    sphere = place_at_gap(sphere, other, toward / np.linalg.norm(toward), gap)
    for target, source in ((sphere, other), (other, sphere)):
        fast_force, fast_torque = force_and_torque(target, source)
        force, torque = force_and_torque_by_charges(target, source, rtol=1e-7)
        assert np.linalg.norm(fast_force - force) <= 1e-6 * np.linalg.norm(force)
        assert np.linalg.norm(fast_torque - torque) <= 1e-6 * (np.linalg.norm(torque)
                                                               + np.linalg.norm(force) * target.bounding_radius)
        assert np.allclose(force_between(target, source), fast_force, rtol=0, atol=0)


def test_two_spheres_feel_the_point_dipole_force_and_energy():
    # Jackson (1999) eq. 5.56 and sec. 5.7: two uniformly magnetized spheres interact
    # exactly as point dipoles, U = -m1 . B2(c1), F = (3 mu0 / 4 pi r^4)[(m1.r)m2 + (m2.r)m1
    # + (m1.m2)r - 5 (m1.r)(m2.r) r] with r the unit vector from 2 to 1
    a = MagnetBody("sphere", [0.0, 0.0, 0.0], np.eye(3), [0.3, 0.0, 1.2], diameter=8e-3)
    b = MagnetBody("sphere", [0.005, -0.002, 0.009], np.eye(3), [-0.5, 0.4, 0.9], diameter=6e-3)
    m1, m2 = b.moment, a.moment
    offset = b.center - a.center
    r = np.linalg.norm(offset)
    u = offset / r
    expected = 3 * mu_0 / (4 * np.pi * r**4) * ((m1 @ u) * m2 + (m2 @ u) * m1 + (m1 @ m2) * u
                                                - 5 * (m1 @ u) * (m2 @ u) * u)
    force, _ = force_and_torque(b, a)
    assert np.linalg.norm(force - expected) <= 1e-8 * np.linalg.norm(expected)
    dipole_energy = mu_0 / (4 * np.pi * r**3) * ((m1 @ m2) - 3 * (m1 @ u) * (m2 @ u))
    assert energy_between(b, a) == pytest.approx(dipole_energy, rel=1e-10)
    # and the volume integral of -M . B over the sphere, done independently
    assert energy_between(b, a) == pytest.approx(interaction_energy(b, a, rtol=1e-9), rel=1e-7)


magpylib_cases = {
    "coaxial 2 mm": (MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=10e-3, height=5e-3),
                     MagnetBody("cylinder", [0, 0, 7.5e-3], np.eye(3), [0, 0, 1.2], diameter=10e-3, height=5e-3)),
    "offset tilted 3 mm": (
        MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=[10e-3, 6e-3, 5e-3]),
        MagnetBody("block", [3e-3, 1e-3, 2.5e-3 + 3e-3 + 3.5e-3],
                   TILT, 1.1 * TILT[:, 2], size=[4e-3, 5e-3, 6e-3])),
}


@pytest.mark.parametrize("name", magpylib_cases)
def test_against_magpylib_meshed_force(name):
    # test-only reference library: magpylib.getFT with a fine mesh of the target, gaps >= 2 mm
    magpy = pytest.importorskip("magpylib")
    source, target = magpylib_cases[name]
    mesh = (48, 12, 12) if target.shape == "cylinder" else (14, 14, 16)
    force_ref, torque_ref = magpy.getFT(magpylib_source(source, magpy), magpylib_source(target, magpy),
                                        meshing=mesh, eps=1e-8)
    force, torque = force_and_torque_by_charges(target, source)
    assert np.linalg.norm(force - force_ref) <= 5e-3 * np.linalg.norm(force_ref)
    scale = np.linalg.norm(force_ref) * target.bounding_radius + np.linalg.norm(torque_ref)
    assert np.linalg.norm(torque - torque_ref) <= 5e-3 * scale


def test_image_method_equals_explicit_mirror_magnet():
    # the method of images (Jackson 1999, sec. 5.12): the steel's force equals the force of
    # a mirror magnet built here by hand at -z with J_z kept and J_x reversed
    magnet = MagnetBody("cylinder", [1e-3, 0, 4e-3], TILT, [0.4, 0.1, 1.1], diameter=6e-3, height=4e-3)
    mirror = np.diag([1.0, 1.0, -1.0])
    by_hand = MagnetBody("cylinder", [1e-3, 0, -4e-3], mirror @ TILT @ np.diag([-1.0, 1, 1]),
                         [-0.4, -0.1, 1.1], diameter=6e-3, height=4e-3)
    force, torque = steel_surface_force_and_torque(magnet, [0, 0, 0], [0, 0, 1])
    force_hand, torque_hand = force_and_torque_by_charges(magnet, by_hand)
    assert np.allclose(force, force_hand, rtol=1e-3, atol=1e-4 * np.linalg.norm(force_hand))
    assert np.allclose(torque, torque_hand, rtol=1e-3, atol=1e-4 * np.linalg.norm(torque_hand))
    assert force[2] < 0  # steel always attracts


def test_image_force_is_twin_magnet_at_double_gap():
    # method of images + Vokoun et al. (2009): an axial cylinder at gap g from steel feels
    # the exact coaxial force of its twin at gap 2 g
    g, D, L = 1e-3, 10e-3, 5e-3
    magnet = MagnetBody("cylinder", [0, 0, g + L / 2], np.eye(3), [0, 0, 1.3], diameter=D, height=L)
    image = mirror_in_plane(magnet, [0, 0, 0], [0, 0, 1])
    assert np.allclose(image.center, [0, 0, -(g + L / 2)]) and np.allclose(image.polarization, [0, 0, 1.3])
    force, _ = steel_surface_force_and_torque(magnet, [0, 0, 0], [0, 0, 1])
    twin = coaxial_cylinders_axial_force(D / 2, 0, L, 1.3, D / 2, 0, L, 1.3, 2 * g + L)
    assert force[2] == pytest.approx(twin, rel=1e-9)


def test_plate_saturation_flux_and_flag():
    # independent computation: magnet + image on the plate = one cylinder of twice the
    # length; the flux into the plate is the flux through that cylinder's mid-plane disc,
    # integrated here with a polar Gauss rule over magpylib's field (test-only library)
    magpy = pytest.importorskip("magpylib")
    D, L, J = 10e-3, 5e-3, 1.3
    magnet = MagnetBody("cylinder", [0, 0, L / 2], np.eye(3), [0, 0, J], diameter=D, height=L)
    doubled = magpy.magnet.Cylinder(dimension=(D, 2 * L), polarization=(0, 0, J))
    x, w = np.polynomial.legendre.leggauss(40)
    r = (x + 1) / 2 * (D / 2) * 0.999999
    Bz = doubled.getB(np.c_[r, 0 * r, 0 * r])[:, 2]
    flux = np.sum(w * (D / 4) * Bz * 2 * np.pi * r)
    thick = plate_saturation_check(magnet, [0, 0, 0], [0, 0, 1], thickness=5e-3)
    assert thick.flux == pytest.approx(flux, rel=2e-3)
    assert not thick.saturates
    # flux / (perimeter pi D * thickness) against 2.0 T: the flag turns at that thickness
    assert thick.thickness_to_carry_flux == pytest.approx(flux / (2.0 * np.pi * D), rel=2e-3)
    thin = plate_saturation_check(magnet, [0, 0, 0], [0, 0, 1], thickness=0.5 * thick.thickness_to_carry_flux)
    assert thin.saturates and thin.plate_flux_density == pytest.approx(4.0, rel=1e-9)


def doubled_cross_section_flux(magpy_body, half_x, half_y, inner_radius=None, outer_radius=None):
    """Flux of B_z through the mid-plane section of a magpylib body, by a 60-point Gauss rule."""
    x, w = np.polynomial.legendre.leggauss(60)
    if outer_radius is None:  # rectangle |x| < half_x, |y| < half_y
        X, Y = np.meshgrid(x * half_x, x * half_y, indexing="ij")
        weights = np.outer(w, w).ravel() * half_x * half_y
        points = np.c_[X.ravel(), Y.ravel(), 0 * X.ravel()]
    else:  # annulus inner < r < outer, Gauss in r and in the angle
        r = inner_radius + (x + 1) / 2 * (outer_radius - inner_radius)
        phi = (x + 1) * np.pi
        R, P = np.meshgrid(r, phi, indexing="ij")
        weights = (np.outer(w, w) * R).ravel() * (outer_radius - inner_radius) / 2 * np.pi
        points = np.c_[(R * np.cos(P)).ravel(), (R * np.sin(P)).ravel(), 0 * R.ravel()]
    return float(magpy_body.getB(points)[:, 2] @ weights)


@pytest.mark.parametrize("shape", ["block", "ring"])
def test_plate_flux_of_magnets_standing_on_steel(shape):
    # independent computation, as above: magnet + image = one body of twice the length whose
    # mid-plane section is the footprint; at contact B_n > 0 exactly on the footprint (the
    # face charge gives +J/2, the far face pulls the other way, and the return field outside
    # is negative), so the flux into the plate is the section flux of the doubled body in
    # magpylib's field (test-only library). The 50 mm cube was 5 % high and the ring took
    # ~10 s before the box edges followed the footprint.
    magpy = pytest.importorskip("magpylib")
    import time
    if shape == "block":
        a, J = 50e-3, 1.35
        magnet = MagnetBody("block", [0, 0, a / 2], np.eye(3), [0, 0, J], size=[a, a, a])
        doubled = magpy.magnet.Cuboid(dimension=(a, a, 2 * a), polarization=(0, 0, J))
        expected = doubled_cross_section_flux(doubled, a / 2 * (1 - 1e-9), a / 2 * (1 - 1e-9))
    else:
        D, d, L, J = 70e-3, 32e-3, 10e-3, 0.4
        magnet = MagnetBody("ring", [0, 0, L / 2], np.eye(3), [0, 0, J], diameter=D, inner_diameter=d, height=L)
        doubled = magpy.magnet.CylinderSegment(dimension=(d / 2, D / 2, 2 * L, 0, 360), polarization=(0, 0, J))
        expected = doubled_cross_section_flux(doubled, 0, 0, d / 2 * (1 + 1e-9), D / 2 * (1 - 1e-9))
    start = time.perf_counter()
    check = plate_saturation_check(magnet, [0, 0, 0], [0, 0, 1], thickness=1e-3)
    elapsed = time.perf_counter() - start
    assert check.flux == pytest.approx(expected, rel=1e-4)
    assert elapsed < 2.0  # generous for a loaded machine; about 0.02 s here


def test_dispatcher_agrees_with_quadrature_off_the_fast_paths():
    # the dispatcher must fall back to the quadrature for a tilted pair (same numbers)
    source, target = PAIRS["block-tilted cylinder"]
    f1, t1 = force_and_torque(target, source)
    f2, t2 = force_and_torque_by_charges(target, source)
    assert np.allclose(f1, f2) and np.allclose(t1, t2)


CUBE = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.35], size=[50e-3] * 3)
SMALL_TILT = rotation_from_axis([0.2, 0.1, 1.0])


def test_large_target_integrated_over_the_small_source_agrees_with_direct_quadrature():
    # independent computation: the same force and torque integrated directly over the
    # cube's faces (rtol 1e-6), for a tilted, offset disc 0.5 mm above the cube; the
    # dispatcher integrates over the disc and turns the result round by Newton's third law
    # and the balance of angular momentum
    disc = MagnetBody("cylinder", [6e-3, 3e-3, 0.1], SMALL_TILT, 1.3 * SMALL_TILT[:, 2],
                      diameter=20e-3, height=5e-3)
    disc = place_at_gap(disc, CUBE, [0, 0, -1], 0.5e-3)
    force, torque = force_and_torque(CUBE, disc)
    force_ref, torque_ref = force_and_torque_by_charges(CUBE, disc, rtol=1e-6)
    assert np.linalg.norm(force - force_ref) <= 1e-3 * np.linalg.norm(force_ref)
    scale = np.linalg.norm(force_ref) * CUBE.bounding_radius + np.linalg.norm(torque_ref)
    assert np.linalg.norm(torque - torque_ref) <= 1e-3 * scale
    assert np.linalg.norm(torque_ref) > 0.05 * scale  # the torque is not trivially small


def test_cube_on_a_small_disc_at_contact_is_fast():
    # Newton's third law (physical identity) against the force on the disc integrated over
    # the disc at tight tolerance; integrating over the cube's face, across the disc's rim,
    # took ~50 s at contact
    import time
    disc = place_at_gap(MagnetBody("cylinder", [0, 0, 0.1], np.eye(3), [0, 0, 1.3], diameter=20e-3,
                                   height=5e-3), CUBE, [0, 0, -1], 0.0)
    start = time.perf_counter()
    force, torque = force_and_torque(CUBE, disc)
    elapsed = time.perf_counter() - start
    on_disc, _ = force_and_torque_by_charges(disc, CUBE, rtol=1e-7)
    assert np.linalg.norm(force + on_disc) <= 1e-3 * np.linalg.norm(on_disc)
    assert np.linalg.norm(torque) <= 1e-6 * np.linalg.norm(force) * CUBE.bounding_radius  # coaxial
    assert elapsed < 2.0  # about 0.01 s here


def test_energy_between_a_large_and_a_small_cylinder_gives_the_exact_force():
    # F = -dU/dgap (physical identity) against Vokoun et al. (2009) for coaxial cylinders:
    # central differences (step 5 um) of the energy of a wide disc near a small one, the
    # energy integrated over the small one's volume
    big = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=40e-3, height=10e-3)
    small = MagnetBody("cylinder", [0, 0, 0.1], np.eye(3), [0, 0, 1.3], diameter=8e-3, height=4e-3)
    gap, step = 0.3e-3, 5e-6

    def energy(g):
        return energy_between(big, place_at_gap(small, big, [0, 0, -1], g), rtol=1e-9)
    slope = (energy(gap + step) - energy(gap - step)) / (2 * step)
    exact = coaxial_cylinders_axial_force(20e-3, 0, 10e-3, 1.2, 4e-3, 0, 4e-3, 1.3, 7e-3 + gap)
    assert slope == pytest.approx(-exact, rel=1e-4)  # attraction = dU/dgap = -F_axial


@pytest.mark.parametrize("name", PAIRS)
def test_force_and_torque_turn_with_the_pair(name):
    # rotational invariance (physical identity): turning both bodies about the origin by Q
    # turns force and torque by Q; the quadrature nodes are kept in each body's own frame
    a, b = PAIRS[name]
    turn = rotation_from_axis([0.3, -1.0, 0.6])

    def turned(body):
        return MagnetBody(body.shape, turn @ body.center, turn @ body.rotation, turn @ body.polarization,
                          diameter=body.diameter, height=body.height,
                          inner_diameter=body.inner_diameter, size=body.size)
    force, torque = force_and_torque_by_charges(b, a, rtol=1e-6)
    force_t, torque_t = force_and_torque_by_charges(turned(b), turned(a), rtol=1e-6)
    scale = np.linalg.norm(force)
    assert np.linalg.norm(force_t - turn @ force) <= 1e-5 * scale
    assert np.linalg.norm(torque_t - turn @ torque) <= 1e-5 * (scale * b.bounding_radius + np.linalg.norm(torque))


# --- accuracy of the estimate at the default rtol, against tight references ----------------

SOURCE_CYLINDER = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=10e-3, height=5e-3)
TILT_30 = rotation_from_axis([0.5, 0, np.sqrt(3) / 2])
RING = MagnetBody("ring", [0, 0, 0], np.eye(3), [0.3, 0, 1.2], diameter=12e-3, inner_diameter=5e-3, height=4e-3)
BLOCK = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=[10e-3, 6e-3, 5e-3])
ACCURACY_CASES = {  # (source, target before placing, gap along -z or toward the source [m])
    "coaxial 1 mm": (SOURCE_CYLINDER, MagnetBody("cylinder", [0, 0, .02], np.eye(3), [0, 0, 1.2],
                                                 diameter=8e-3, height=4e-3), 1e-3),
    "offset 1 mm": (SOURCE_CYLINDER, MagnetBody("cylinder", [3e-3, 1e-3, .02], np.eye(3), [0, 0, 1.2],
                                                diameter=8e-3, height=4e-3), 1e-3),
    "offset 0.1 mm, rim over rim": (SOURCE_CYLINDER, MagnetBody("cylinder", [3e-3, 1e-3, .02], np.eye(3),
                                                                [0, 0, 1.2], diameter=8e-3, height=4e-3), 1e-4),
    "tilted at contact": (SOURCE_CYLINDER, MagnetBody("cylinder", [1e-3, 0, .02], TILT_30, 1.2 * TILT_30[:, 2],
                                                      diameter=8e-3, height=4e-3), 0.0),
    "tilted 20 mm": (SOURCE_CYLINDER, MagnetBody("cylinder", [1e-3, 0, .02], TILT_30, 1.2 * TILT_30[:, 2],
                                                 diameter=8e-3, height=4e-3), 20e-3),
    "tilted block on block 0.3 mm": (BLOCK, MagnetBody("block", [3e-3, 1e-3, .02], TILT, 1.1 * TILT[:, 2],
                                                       size=[4e-3, 5e-3, 6e-3]), 3e-4),
    "diametral cylinder on block 2 mm": (BLOCK, PAIRS["block-tilted cylinder"][1], 2e-3),
    "ring near a tilted block": (MagnetBody("block", [3e-3, 1e-3, .02], TILT, 1.1 * TILT[:, 2],
                                            size=[4e-3, 5e-3, 6e-3]), RING, 3e-4),
    "sphere above a ring": (RING, PAIRS["ring-sphere"][1], 2e-3),
}


@pytest.mark.parametrize("name", ACCURACY_CASES)
def test_default_tolerance_is_met(name):
    # independent computation: the plain adaptive quadrature at rtol 1e-8 (plain_reference);
    # the contract of force_and_torque_by_charges: |dF| + |dT|/R <= rtol (|F| + |T|/R)
    source, target, gap = ACCURACY_CASES[name]
    toward = source.center - target.center
    target = place_at_gap(target, source, toward / np.linalg.norm(toward), gap)
    force_ref, torque_ref = plain_reference(target, source)
    L = target.bounding_radius
    scale = np.linalg.norm(force_ref) + np.linalg.norm(torque_ref) / L
    for rtol in (1e-3, 1e-2):
        force, torque = force_and_torque_by_charges(target, source, rtol=rtol)
        error = np.linalg.norm(force - force_ref) + np.linalg.norm(torque - torque_ref) / L
        assert error <= rtol * scale


def test_well_separated_pair_needs_one_field_call():
    # the whole-face first pass: a pair 20 mm apart is done in one evaluation of the field,
    # and its result agrees with the Vokoun et al. (2009) closed form for coaxial cylinders
    target = place_at_gap(ACCURACY_CASES["coaxial 1 mm"][1], SOURCE_CYLINDER, [0, 0, -1], 20e-3)
    calls = []

    def counted(points):
        calls.append(len(points))
        return field_of_body(SOURCE_CYLINDER, points)
    force, _ = force_and_torque_by_charges(target, SOURCE_CYLINDER, field=counted)
    assert len(calls) == 1
    exact = coaxial_cylinders_axial_force(5e-3, 0, 5e-3, 1.3, 4e-3, 0, 4e-3, 1.2,
                                          target.center[2])
    assert force[2] == pytest.approx(exact, rel=1e-3)


def test_far_pair_through_the_multipole_series_equals_the_closed_form():
    # independent computation: the same first pass with the source's closed form (given as
    # the field function) and with the exterior multipole series the pair uses by default
    from planner.physics.forces.face_rules import _series_ratio

    source, start = SOURCE_CYLINDER, ACCURACY_CASES["coaxial 1 mm"][1]
    for turn in (np.eye(3), rotation_from_axis([0.5, 0.2, 1.0])):
        target = replace(start, rotation=turn, polarization=turn @ [0.3, 0.0, 1.1],
                         center=start.center + [4e-3, -2e-3, 0])
        target = place_at_gap(target, source, [0, 0, -1], 20e-3)
        assert _series_ratio(target, source, np.linalg.norm(target.center - source.center))
        series = np.concatenate(force_and_torque_by_charges(target, source))
        closed = np.concatenate(force_and_torque_by_charges(
            target, source, field=lambda points: field_of_body(source, points)))
        assert np.abs(series - closed).max() <= 1e-9 * np.abs(closed).max()


# --- the nested quadrature rules ------------------------------------------------------------

def test_nested_interval_rules_match_published_nodes_and_degrees():
    # Patterson (1968), Math. Comp. 22, 847, table of the 15-point rule (positive nodes on
    # [-1, 1], recalled from memory, 10 digits); exactness degrees 5, 11, 23 are the defining
    # property (mathematical identity: the Legendre polynomials P_k, k >= 1, integrate to 0)
    from planner.physics.forces.quadrature_rules import nested_interval_rule

    nodes, weights = nested_interval_rule(15)
    published = [0.0, 0.2233866864, 0.4342437493, 0.6211029467, 0.7745966692, 0.8884592328,
                 0.9604912687, 0.9938319632]
    assert np.allclose(2 * nodes[7:] - 1, published, atol=1e-10)
    legendre = np.polynomial.legendre.legvander(2 * nodes - 1, 24)
    for column, degree in enumerate((23, 11, 5)):
        integrals = weights[:, column] @ legendre
        assert integrals[0] == pytest.approx(1.0, abs=1e-14)
        assert np.allclose(integrals[1:degree + 1], 0.0, atol=1e-14)
        assert abs(integrals[degree + 1]) > 1e-3  # and not beyond
        assert np.all(weights[:, column] >= 0)


def test_extrapolated_estimate_covers_the_true_error():
    # closed-form integrals (mathematical identities): over one period,
    # integral_0^1 dx / (2 - cos 2 pi x) = 1/sqrt(3); on [0, 1], integral dx / (1 + 25 x^2)
    # = atan(5)/5 and integral exp(x) = e - 1
    from planner.physics.forces.quadrature_rules import (extrapolated_error,
                                                         nested_interval_rule, periodic_rule)
    cases = [(periodic_rule(m), lambda x: 1 / (2 - np.cos(2 * np.pi * x)), 1 / np.sqrt(3))
             for m in (8, 12, 16, 24)]
    cases += [(nested_interval_rule(n), lambda x: 1 / (1 + 25 * x**2), np.arctan(5) / 5)
              for n in (7, 15)]
    cases += [(nested_interval_rule(n), np.exp, np.e - 1) for n in (7, 15)]
    for (nodes, weights), function, exact in cases:
        full, once, twice = weights.T @ function(nodes)
        estimate = extrapolated_error(abs(full - once), abs(once - twice))
        assert abs(full - exact) <= estimate + 1e-15
        assert estimate <= abs(full - once) + 1e-15  # never more than the plain difference
