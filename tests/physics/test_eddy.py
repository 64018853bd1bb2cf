"""Tests of planner.physics.eddy. Each asserted number names its source beside it."""
from __future__ import annotations

import numpy as np
import pytest
from scipy.constants import g as gravity
from scipy.constants import mu_0
from scipy.integrate import dblquad, quad, solve_ivp

from planner.physics.eddy import (
    dipole_plate_drag,
    dipole_sheet_drag,
    dipole_tube_drag_constant,
    fall_distance,
    reitz_sheet_forces,
    sheet_characteristic_speed,
    sheet_damping,
    sheet_drag,
    thin_tube_drag_constant,
    tube_drag_constant,
    tube_fall,
)
from planner.physics.induction import AxialMagnet, radial_field

COPPER = 58.0e6      # IEC 60028, International Annealed Copper Standard [S/m]
ALUMINIUM = 37.7e6   # CRC Handbook of Chemistry and Physics, pure aluminium at 20 C [S/m]

# Iniguez et al., Eur. J. Phys. 25, 593-604 (2004): copper tube 1 m long, bore 6.5 mm,
# outer radius 7.5 mm; SmCo magnet 9.3 g, radius 6 mm, height 10 mm; fall time about 12.3 s.
INIGUEZ_TUBE = dict(tube_length=1.0, inner_radius=0.0065, outer_radius=0.0075)


def iniguez_magnet(remanence):
    return AxialMagnet("cylinder", 0.006, 0.0, 0.010, remanence)


def test_dipole_thick_wall_formula_by_direct_integration():
    # independent computation of the [M] formula of MacLatchy et al. (1993): k = 2 pi sigma
    # int int B_rho^2 rho dz drho with the dipole field, by scipy's dblquad
    moment, b, c = 0.7, 0.008, 0.011

    def integrand(z, rho):
        r = np.hypot(rho, z)
        return 2 * np.pi * COPPER * rho * (3 * mu_0 * moment * rho * z / (4 * np.pi * r**5)) ** 2

    expected = 2 * dblquad(integrand, b, c, 0, 1.0, epsabs=0, epsrel=1e-10)[0]
    assert dipole_tube_drag_constant(moment, b, c, COPPER) == pytest.approx(expected, rel=1e-7)


def test_thin_wall_is_limit_of_thick_wall():
    # identity: (1/b^3 - 1/(b+w)^3) = (3 w / b^4)(1 - 2 w/b + O(w/b)^2), so the thick form meets
    # the thin one as w -> 0
    for wall in (1e-3, 1e-4, 1e-5):
        ratio = dipole_tube_drag_constant(1.0, 0.01, 0.01 + wall, COPPER) / thin_tube_drag_constant(
            1.0, 0.01, wall, COPPER)
        assert ratio == pytest.approx(1 - 2 * wall / 0.01, abs=4 * (wall / 0.01) ** 2)


def test_finite_magnet_drag_tends_to_dipole_formula():
    # identity: a small magnet in a wide tube is a dipole; a sphere is a dipole exactly outside
    small = AxialMagnet("cylinder", 0.0005, 0.0, 0.001, 1.0)
    assert tube_drag_constant(small, 0.01, 0.012, COPPER) == pytest.approx(
        dipole_tube_drag_constant(small.moment, 0.01, 0.012, COPPER), rel=2e-3)
    sphere = AxialMagnet("sphere", 0.004, 0.0, 0.008, 1.2)
    assert tube_drag_constant(sphere, 0.006, 0.009, COPPER) == pytest.approx(
        dipole_tube_drag_constant(sphere.moment, 0.006, 0.009, COPPER), rel=1e-9)


def test_finite_magnet_drag_equals_brute_force_quadrature():
    # independent computation: scipy's adaptive dblquad over the same integrand
    magnet = iniguez_magnet(1.0)
    expected = dblquad(lambda z, rho: 4 * np.pi * COPPER * rho * radial_field(magnet, rho, z) ** 2,
                       0.0065, 0.0075, 0, 0.5, epsabs=0, epsrel=1e-9)[0]
    assert tube_drag_constant(magnet, 0.0065, 0.0075, COPPER) == pytest.approx(expected, rel=1e-7)


def test_iniguez_fall_time_within_band():
    # Iniguez et al. (2004): 12.3 s measured; band from conductivity 50-59 MS/m (copper alloys
    # and pure copper, CRC Handbook) and SmCo remanence 0.9-1.1 T (common grades)
    times = [tube_fall(iniguez_magnet(remanence), 0.0093, conductivity=sigma, **INIGUEZ_TUBE).fall_time
             for remanence in (0.9, 1.1) for sigma in (50e6, 59e6)]
    assert min(times) < 12.3 < max(times)
    assert max(times) / min(times) < 2.0   # the band is set by sigma and J^2 alone: 59*1.21/(50*0.81)


def test_copper_slows_more_than_aluminium():
    # fact of the trade (physics.md section 5): the better conductor brakes harder
    magnet = iniguez_magnet(1.0)
    copper = tube_fall(magnet, 0.0093, conductivity=COPPER, **INIGUEZ_TUBE)
    aluminium = tube_fall(magnet, 0.0093, conductivity=ALUMINIUM, **INIGUEZ_TUBE)
    assert copper.fall_time > aluminium.fall_time > copper.free_fall_time
    assert copper.terminal_speed == pytest.approx(aluminium.terminal_speed * ALUMINIUM / COPPER, rel=1e-12)


def test_non_magnetic_slug_falls_freely():
    # fact of the trade and kinematics: m = 0 gives t = sqrt(2 H / g)
    slug = tube_fall(iniguez_magnet(0.0), 0.0093, conductivity=COPPER, **INIGUEZ_TUBE)
    assert slug.drag_constant == 0.0
    assert slug.fall_time == pytest.approx(np.sqrt(2 * 1.0 / gravity), rel=1e-12)


def test_fall_with_entry_speed_matches_ode_solver():
    # independent computation: M dv/dt = M g - k v integrated by solve_ivp
    mass, k, entry = 0.02, 0.5, 1.2
    solution = solve_ivp(lambda t, y: [y[1], gravity - k / mass * y[1]], (0, 2.0), [0.0, entry],
                         rtol=1e-11, atol=1e-13, dense_output=True)
    t = np.linspace(0, 2.0, 7)
    assert fall_distance(t, mass, k, entry) == pytest.approx(solution.sol(t)[0], rel=1e-8, abs=1e-12)
    # identity: far into the fall the speed is M g / k
    assert (fall_distance(60.0, mass, k) - fall_distance(59.0, mass, k)) == pytest.approx(mass * gravity / k, rel=1e-9)


def test_fall_figures_are_consistent():
    # identities: v_t = M g / k, tau = M / k, clearance = b - R, exit speed not above terminal
    fall = tube_fall(iniguez_magnet(1.0), 0.0093, conductivity=COPPER, **INIGUEZ_TUBE)
    assert fall.terminal_speed == pytest.approx(0.0093 * gravity / fall.drag_constant, rel=1e-12)
    assert fall.time_constant == pytest.approx(0.0093 / fall.drag_constant, rel=1e-12)
    assert fall.radial_clearance == pytest.approx(0.0005, rel=1e-12)
    assert fall.exit_speed <= fall.terminal_speed and fall.low_speed_valid
    with pytest.raises(ValueError):
        tube_fall(iniguez_magnet(1.0), 0.0093, 1.0, 0.005, 0.006, COPPER)


def test_dipole_sheet_drag_by_direct_integration():
    # independent computation of the [D] thin-sheet formula: F = sigma d v int |dA/dx|^2 dx dy
    # with the dipole's A = mu0 m (-y, x, 0) / (4 pi r^3), differentiated by hand, over the plane
    moment, h, d, v = 0.5, 0.02, 1e-4, 0.3

    def dadx_squared(y, x):
        r2 = x * x + y * y + h * h
        ax = 3 * x * y / r2**2.5
        ay = 1 / r2**1.5 - 3 * x * x / r2**2.5
        return (mu_0 * moment / (4 * np.pi)) ** 2 * (ax * ax + ay * ay)

    plane = 4 * dblquad(dadx_squared, 0, 2.0, 0, 2.0, epsabs=0, epsrel=1e-10)[0]
    assert dipole_sheet_drag(moment, h, COPPER, d, v) == pytest.approx(COPPER * d * v * plane, rel=1e-6)


def test_finite_magnet_sheet_drag_tends_to_dipole_forms():
    # identity: a small magnet far above is a dipole (thin sheet and thick plate)
    small = AxialMagnet("cylinder", 0.0005, 0.0, 0.001, 1.0)
    assert sheet_drag(small, 0.05, COPPER, 0.02, 0.1) == pytest.approx(
        dipole_plate_drag(small.moment, 0.05, COPPER, 0.02, 0.1), rel=1e-3)
    # thin sheet: the plate form summed over a thin depth equals the thin-sheet formula to O(d/h)
    assert sheet_drag(small, 0.05, COPPER, 1e-5, 0.1) == pytest.approx(
        dipole_sheet_drag(small.moment, 0.05, COPPER, 1e-5, 0.1), rel=1e-3)


def test_sheet_drag_thick_plate_by_depth_integration():
    # independent computation: thin-sheet drag integrated over depth with scipy's quad
    moment, h, t = 0.8, 0.015, 0.01
    expected = quad(lambda s: dipole_sheet_drag(moment, h + s, COPPER, 1.0, 0.2), 0, t)[0]
    assert dipole_plate_drag(moment, h, COPPER, t, 0.2) == pytest.approx(expected, rel=1e-10)


def test_reitz_low_speed_limit_equals_derived_drag():
    # Reitz, J. Appl. Phys. 41, 2067 (1970) [M] against our independent low-speed derivation [D]
    moment, h, d = 0.5, 0.02, 1e-3
    w = sheet_characteristic_speed(COPPER, d)
    drag, lift = reitz_sheet_forces(moment, h, COPPER, d, 1e-3 * w)
    assert drag == pytest.approx(dipole_sheet_drag(moment, h, COPPER, d, 1e-3 * w), rel=1e-5)
    # identity: far above w the sheet acts as a perfect conductor, so the lift is the repulsion of
    # the mirror image, two coaxial dipoles 2h apart: F = 3 mu0 m^2 / (2 pi (2h)^4) (physics.md 2)
    lift_fast = reitz_sheet_forces(moment, h, COPPER, d, 1e5 * w)[1]
    assert lift_fast == pytest.approx(3 * mu_0 * moment**2 / (2 * np.pi * (2 * h) ** 4), rel=1e-4)
    # Reitz (1970): the drag rises, peaks at a speed of order w, then falls
    drags = [reitz_sheet_forces(moment, h, COPPER, d, s)[0] for s in w * np.array([0.3, 1.4, 6.0])]
    assert drags[1] > drags[0] and drags[1] > drags[2]


def test_pendulum_decay_time_by_integration():
    # independent computation: amplitude of m x'' + b x' + m w0^2 x = 0 falls by e in 2 m / b
    magnet = AxialMagnet("cylinder", 0.01, 0.0, 0.01, 1.3)
    damping = sheet_damping(magnet, 0.2, 0.012, ALUMINIUM, 0.004, 0.3)
    b, mass, omega = damping.damping_constant, 0.2, 2 * np.pi
    solution = solve_ivp(lambda t, y: [y[1], -b / mass * y[1] - omega**2 * y[0]], (0, damping.decay_time),
                         [1.0, -b / (2 * mass)], rtol=1e-10, atol=1e-12)
    envelope = np.hypot(solution.y[0, -1], (solution.y[1, -1] + b / (2 * mass) * solution.y[0, -1])
                        / np.sqrt(omega**2 - (b / (2 * mass)) ** 2))
    assert envelope == pytest.approx(np.exp(-1), rel=1e-6)


def test_sheet_speed_flag_just_below_and_above():
    # definition (this project): the low-speed model is flagged at v / w >= 0.1
    magnet = AxialMagnet("cylinder", 0.005, 0.0, 0.005, 1.3)
    w = sheet_characteristic_speed(COPPER, 0.002)
    assert sheet_damping(magnet, 0.1, 0.01, COPPER, 0.002, 0.099 * w).low_speed_valid
    assert not sheet_damping(magnet, 0.1, 0.01, COPPER, 0.002, 0.101 * w).low_speed_valid
