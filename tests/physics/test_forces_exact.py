"""Exact force formulas against independent computations and the general quadrature.

Sources named beside each check:
- Vokoun, Beleggia, Heller & Sittner, J. Magn. Magn. Mater. 321, 3758-3763 (2009), eq. for
  coaxial cylinders (Bessel integral, evaluated here directly with scipy.integrate.quad);
- Akoun & Yonnet, IEEE Trans. Magn. 20(5), 1962-1964 (1984);
- Weber-Schafheitlin integral (Watson, Theory of Bessel Functions, 1944, sec. 13.42);
- the point-dipole force 3 mu0 m1 m2 / (2 pi d^4) (physics reference sheet, sec. 2).
"""
import time

import numpy as np
import pytest
from scipy.constants import mu_0
from scipy.integrate import quad
from scipy.special import j1

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.forces import (bessel_pair_integral, coaxial_cylinders_axial_force,
                                    force_and_torque, force_and_torque_by_charges,
                                    force_between, parallel_cuboids_force)


def cylinder(z, diameter, height, J, inner=0.0, rotation=None):
    shape = "ring" if inner else "cylinder"
    R = np.eye(3) if rotation is None else rotation
    return MagnetBody(shape, R @ [0, 0, z], R, R @ [0, 0, J], diameter=diameter, height=height,
                      inner_diameter=inner)


@pytest.mark.parametrize("a, b, z", [(1.0, 0.5, 0.3), (2.0, 1.0, 0.3), (1.0, 1.0, 0.2), (1.0, 1.0, 5.0)])
def test_bessel_integral_matches_direct_quadrature(a, b, z):
    # independent computation: the integral of J1(ka) J1(kb) exp(-kz)/k done by scipy quad
    direct = quad(lambda k: j1(k * a) * j1(k * b) * np.exp(-k * z) / k, 0, np.inf, limit=4000)[0]
    assert bessel_pair_integral(a, b, z) == pytest.approx(direct, rel=1e-8)


@pytest.mark.parametrize("a, b", [(1.0, 1.0), (1.0, 0.5), (0.3, 2.0)])
def test_bessel_integral_at_contact_weber_schafheitlin(a, b):
    # Weber-Schafheitlin (Watson 1944, 13.42): integral J1(ak) J1(bk) dk/k = min/max / 2
    assert bessel_pair_integral(a, b, 0.0) == pytest.approx(min(a, b) / max(a, b) / 2, rel=1e-10)


def vokoun_direct(R1, L1, J1, R2, L2, J2, d):
    """Vokoun et al. (2009) Bessel integral, integrated directly (independent check)."""
    M1, M2 = J1 / mu_0, J2 / mu_0
    # sinh(kL1/2) sinh(kL2/2) exp(-kd) written without overflow
    f = lambda k: (j1(k * R1) * j1(k * R2) * -np.expm1(-k * L1) * -np.expm1(-k * L2) / 4
                   * np.exp(-k * (d - (L1 + L2) / 2)) / k)
    return -4 * np.pi * mu_0 * M1 * M2 * R1 * R2 * quad(f, 0, np.inf, limit=4000)[0]


@pytest.mark.parametrize("gap", [0.5e-3, 2e-3, 10e-3])
def test_coaxial_force_matches_vokoun_bessel_integral(gap):
    R1, L1, R2, L2 = 5e-3, 4e-3, 4e-3, 6e-3
    d = (L1 + L2) / 2 + gap
    exact = coaxial_cylinders_axial_force(R1, 0, L1, 1.2, R2, 0, L2, 1.3, d)
    assert exact == pytest.approx(vokoun_direct(R1, L1, 1.2, R2, L2, 1.3, d), rel=1e-6)


def test_coaxial_far_field_is_dipole_force():
    # physics.md sec. 2: far field F = 3 mu0 m1 m2 / (2 pi d^4) (attractive for aligned)
    R, L, d = 2e-3, 3e-3, 0.4
    m = 1.2 * np.pi * R**2 * L / mu_0
    force = coaxial_cylinders_axial_force(R, 0, L, 1.2, R, 0, L, 1.2, d)
    assert force == pytest.approx(-3 * mu_0 * m * m / (2 * np.pi * d**4), rel=1e-3)


@pytest.mark.parametrize("gap", [0.0, 1e-4, 1e-3, 5e-3])
@pytest.mark.parametrize("inner", [0.0, 3e-3])
def test_coaxial_closed_form_equals_general_quadrature(gap, inner):
    # independent computation: the surface-charge quadrature over the exact source field
    source = cylinder(0.0, 10e-3, 5e-3, 1.2)
    target = cylinder(5e-3 + gap, 8e-3, 4e-3 / 2 * 2, -1.1, inner=inner)
    target = MagnetBody(target.shape, [0, 0, 2.5e-3 + 2e-3 + gap], np.eye(3), [0, 0, -1.1],
                        diameter=8e-3, height=4e-3, inner_diameter=inner)
    exact = force_between(target, source)
    general, _ = force_and_torque_by_charges(target, source)
    assert np.linalg.norm(general - exact) <= 1e-3 * np.linalg.norm(exact)


def test_coaxial_fast_path_used_for_tilted_common_axis():
    # a tilted common axis is still coaxial; the dispatcher must take the exact form
    R = rotation_from_axis([1.0, 2.0, 0.5])
    source, target = cylinder(0.0, 6e-3, 3e-3, 1.3, rotation=R), cylinder(5e-3, 6e-3, 3e-3, 1.3, rotation=R)
    start = time.perf_counter()
    force, torque = force_and_torque(target, source)
    elapsed = time.perf_counter() - start
    expected = coaxial_cylinders_axial_force(3e-3, 0, 3e-3, 1.3, 3e-3, 0, 3e-3, 1.3, 5e-3)
    assert np.allclose(force, expected * R[:, 2], rtol=1e-12)
    assert np.all(torque == 0.0)
    assert elapsed < 0.05  # generous bound for a loaded machine; the benchmark measures ~0.05 ms


OFFSETS = [[0, 0, 5.0e-3],            # coaxial, at contact
           [0, 0, 6.0e-3],            # coaxial, 1 mm gap
           [3e-3, 2e-3, 6e-3],        # offset
           [3e-3, 2e-3, -5.0e-3],     # offset, below, at contact
           [12e-3, 1e-3, 2e-3]]       # side by side


@pytest.mark.parametrize("offset", OFFSETS)
def test_akoun_yonnet_equals_general_quadrature(offset):
    # Akoun & Yonnet (1984) closed form vs the independent surface-charge quadrature
    size_1, size_2 = np.array([10e-3, 6e-3, 5e-3]), np.array([8e-3, 6e-3, 5e-3])
    source = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=size_1)
    target = MagnetBody("block", offset, np.eye(3), [0, 0, -1.0], size=size_2)
    exact = parallel_cuboids_force(size_1, 1.2, size_2, -1.0, offset)
    general, _ = force_and_torque_by_charges(target, source)
    assert np.linalg.norm(general - exact) <= 1e-3 * np.linalg.norm(exact)


def test_akoun_yonnet_contact_limit_is_continuous():
    # the atan term's contact limit (pi/2) sign(uv): force at contact equals the limit of
    # the force at vanishing gap (continuity of the physical force)
    size = np.array([10e-3, 10e-3, 5e-3])
    at_contact = parallel_cuboids_force(size, 1.2, size, 1.2, [1e-3, 0, 5e-3])
    near_contact = parallel_cuboids_force(size, 1.2, size, 1.2, [1e-3, 0, 5e-3 + 1e-12])
    assert np.allclose(at_contact, near_contact, rtol=1e-6)
    below = parallel_cuboids_force(size, 1.2, size, 1.2, [1e-3, 0, -5e-3])
    assert np.allclose(below * [1, 1, -1], at_contact, rtol=1e-9)  # mirror z -> -z


def test_akoun_yonnet_far_field_is_dipole_force():
    # physics.md sec. 2: coaxial dipoles, F = 3 mu0 m1 m2 / (2 pi d^4)
    size, d = np.array([2e-3, 3e-3, 4e-3]), 0.3
    m = 1.1 * np.prod(size) / mu_0
    force = parallel_cuboids_force(size, 1.1, size, 1.1, [0, 0, d])
    assert force[2] == pytest.approx(-3 * mu_0 * m * m / (2 * np.pi * d**4), rel=1e-3)


def test_dispatcher_handles_rotated_and_permuted_blocks():
    # the same physical pair described with a rotated frame and swapped edges gives the
    # same force (rotational invariance), by the closed form
    size = np.array([10e-3, 6e-3, 4e-3])
    source = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=size)
    target = MagnetBody("block", [2e-3, 1e-3, 6e-3], np.eye(3), [0, 0, 1.2], size=size)
    reference = force_between(target, source)
    turn = rotation_from_axis([1, 1, 1])
    swap = np.array([[0, 1, 0], [-1, 0, 0], [0, 0, 1.0]])  # edges x, y exchanged
    source_r = MagnetBody("block", [0, 0, 0], turn, turn @ [0, 0, 1.2], size=size)
    target_r = MagnetBody("block", turn @ target.center, turn @ swap, turn @ [0, 0, 1.2],
                          size=size[[1, 0, 2]])
    assert np.allclose(force_between(target_r, source_r), turn @ reference, rtol=1e-9, atol=1e-12)


def test_fast_paths_are_fast():
    # target of the brief: under 2 ms per force (median of repeats, generous factor for CI)
    size = np.array([10e-3, 6e-3, 4e-3])
    blocks = (MagnetBody("block", [2e-3, 1e-3, 6e-3], np.eye(3), [0, 0, 1.2], size=size),
              MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.2], size=size))
    cylinders = (cylinder(6e-3, 8e-3, 4e-3, 1.2), cylinder(0.0, 10e-3, 5e-3, 1.2))
    for pair in (blocks, cylinders):
        times = []
        for _ in range(20):
            start = time.perf_counter()
            force_between(*pair)
            times.append(time.perf_counter() - start)
        assert np.median(times) < 4e-3
