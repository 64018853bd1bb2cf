"""Handling and projectile figures: inverse checks, monotonicity and independent formulas.

Sources named beside each check: physical identities (work-energy, momentum), the
point-dipole field (physics reference sheet, sec. 1), Osborn's prolate-spheroid
demagnetizing factor (Phys. Rev. 67, 351 (1945)), Schenck (J. Magn. Reson. Imaging 12,
2-19 (2000)) for the 0.045 T/m steel figure and the force laws, and inverse checks (the
force at a reported distance equals the level it was asked for).
"""
import numpy as np
import pytest
from scipy.constants import g, mu_0

from planner.physics.bodies import MagnetBody
from planner.physics.forces import coaxial_cylinders_axial_force, interaction_energy, place_at_gap
from planner.physics.handling import (DEFAULT_FINGER_GAP, IRON_SATURATION_MAGNETIZATION,
                                      STEEL_DENSITY, attraction_to_steel, bench_friction_force,
                                      demagnetizing_factor, flip_torque, gradient_distance,
                                      impact_speed, lift_distance, pair_attraction, pair_handling,
                                      projectile_attraction, pull_off_distance, released_energy,
                                      snap_distance, steel_rod, steel_sphere, surface_point)

SOURCE = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.3], diameter=10e-3, height=10e-3)
TARGET = MagnetBody("cylinder", [0, 0, 0.05], np.eye(3), [0, 0, 1.3], diameter=10e-3, height=10e-3)
DOWN = np.array([0.0, 0.0, -1.0])
MASS = 7500 * SOURCE.volume  # NdFeB density, physics.md sec. 7


def exact_attraction(gap):
    # Vokoun et al. (2009) coaxial force, attraction positive
    return -coaxial_cylinders_axial_force(5e-3, 0, 10e-3, 1.3, 5e-3, 0, 10e-3, 1.3, 10e-3 + gap)


def test_snap_distance_inverse_check_and_monotone():
    attraction = pair_attraction(TARGET, SOURCE, DOWN)
    levels = [0.01, 0.05, 0.2, 1.0, 5.0]
    distances = [snap_distance(attraction, level, 0.2) for level in levels]
    # monotone: a stronger resisting force gives a shorter snap distance
    assert all(a > b for a, b in zip(distances, distances[1:]))
    for level, distance in zip(levels, distances):
        # inverse check: the attraction at the reported gap is the resisting force
        assert exact_attraction(distance) == pytest.approx(level, rel=5e-3)


def test_pair_attraction_remembers_gaps(monkeypatch):
    # the two snap searches (bench, hand) share their gaps: each gap is integrated once;
    # values against the exact Vokoun force
    from planner.physics.handling import pinch
    calls = []
    original = pinch.force_between

    def counting(*args, **kwargs):
        calls.append(1)
        return original(*args, **kwargs)
    monkeypatch.setattr(pinch, "force_between", counting)
    attraction = pair_attraction(TARGET, SOURCE, DOWN)
    values = [attraction(gap) for gap in (0.0, 1e-3, 0.0, 1e-3)]
    assert len(calls) == 2
    assert values[0] == values[2] == pytest.approx(exact_attraction(0.0), rel=1e-9)


def test_snap_distance_of_a_known_law():
    # independent closed form: attraction k/(g + a)^4 equals F at g = (k/F)^(1/4) - a
    k, a, level = 2e-8, 5e-3, 0.3
    expected = (k / level) ** 0.25 - a
    assert snap_distance(lambda gap: k / (gap + a) ** 4, level, 0.01) == pytest.approx(expected, abs=2e-9)  # root tolerance 1 nm
    assert snap_distance(lambda gap: k / (gap + a) ** 4, 1e6, 0.01) == 0.0  # never reached


def test_vectorized_search_matches_closed_form_in_one_scan_call():
    # independent closed form as above; a vectorized function is called once for the whole
    # scan (plus single points for the bracket) and refined by batches of 32 points, each
    # narrowing the bracket 33 times: a 49-point scan ratio of 1.2 to 1 nm takes at most 6
    from planner.physics.handling.search import largest_exceeding
    k, a, level = 2e-8, 5e-3, 0.3
    calls = []

    def law(gaps):
        calls.append(np.size(gaps))
        return k / (np.asarray(gaps) + a) ** 4
    found = largest_exceeding(law, level, 0.01, vectorized=True)
    assert found == pytest.approx((k / level) ** 0.25 - a, abs=2e-9)  # root tolerance 1 nm
    assert calls.count(49) == 1 and max(calls) == 49  # 48 samples and the start, in one call
    assert 1 <= sum(size == 32 for size in calls) <= 6


def test_bench_friction_is_coulomb_friction():
    # Coulomb's law mu m g with standard gravity (scipy.constants.g = 9.80665 m/s^2)
    assert bench_friction_force(0.2, 0.4) == pytest.approx(0.4 * 0.2 * 9.80665, rel=1e-12)


def test_released_energy_equals_energy_difference():
    # work-energy identity: integral of the attraction = U(far) - U(near)
    attraction = pair_attraction(TARGET, SOURCE, DOWN)
    far, near = 0.03, DEFAULT_FINGER_GAP

    def energy(gap):
        return interaction_energy(place_at_gap(TARGET, SOURCE, DOWN, gap), SOURCE, rtol=1e-9)
    assert released_energy(attraction, far, near) == pytest.approx(energy(far) - energy(near), rel=1e-5)
    assert released_energy(attraction, near, far) == 0.0


def test_impact_speed_from_energy_and_momentum():
    # two free bodies from rest: m1 v1 = m2 v2 and W = (m1 v1^2 + m2 v2^2)/2 -> v1 + v2
    m1, m2, work = 0.03, 0.05, 0.2
    v1 = np.sqrt(2 * work * m2 / (m1 * (m1 + m2)))
    v2 = m1 * v1 / m2
    assert impact_speed(work, m1, m2) == pytest.approx(v1 + v2, rel=1e-12)
    assert impact_speed(work, m1) == pytest.approx(np.sqrt(2 * work / m1), rel=1e-12)


def test_pair_handling_figures_are_consistent():
    figures = pair_handling(TARGET, SOURCE, DOWN, MASS, MASS)
    # inverse check: friction mu m g reached at the snap distance (Vokoun force)
    assert figures.resisting_force == pytest.approx(0.3 * MASS * g)
    assert exact_attraction(figures.snap_distance) == pytest.approx(figures.resisting_force, rel=5e-3)
    assert figures.clamp_force == pytest.approx(exact_attraction(DEFAULT_FINGER_GAP), rel=1e-9)
    work = released_energy(exact_attraction, figures.snap_distance, DEFAULT_FINGER_GAP)
    assert figures.released_energy == pytest.approx(work, rel=1e-4)
    assert figures.impact_speed == pytest.approx(np.sqrt(2 * work / (MASS / 2)), rel=1e-4)


def test_flip_torque_of_dipoles_is_m2_b1():
    # two spheres (exact dipole fields outside): the largest torque on the second is
    # m2 |B1| = m2 mu0 m1 / (2 pi d^3) on the axis (physics.md sec. 1), at a right angle
    a = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=4e-3)
    b = MagnetBody("sphere", [0, 0, 0.02], np.eye(3), [0, 0, -1.2], diameter=4e-3)
    gap = 0.02
    result = flip_torque(b, a, DOWN, gap)
    d = gap + 4e-3
    expected = np.linalg.norm(b.moment) * mu_0 * np.linalg.norm(a.moment) / (2 * np.pi * d**3)
    assert result.torque == pytest.approx(expected, rel=5e-3)
    assert np.sin(result.angle) ** 2 == pytest.approx(1.0, abs=1e-2)


def test_attraction_to_steel_inverse_and_image_bound():
    # method of images: a magnet at gap g from steel feels its twin at gap 2 g (Vokoun)
    attraction = attraction_to_steel(SOURCE, [0, 0, -0.02], [0, 0, 1])
    expected = -coaxial_cylinders_axial_force(5e-3, 0, 10e-3, 1.3, 5e-3, 0, 10e-3, 1.3, 10e-3 + 2e-3)
    assert attraction(1e-3) == pytest.approx(expected, rel=1e-9)
    distance = snap_distance(attraction, 2.0, 0.05)
    assert attraction(distance) == pytest.approx(2.0, rel=5e-3)  # inverse check


def test_demagnetizing_factors():
    # identities: N = 1/3 for a sphere; the three factors add up to 1 (Osborn 1945)
    assert demagnetizing_factor(1, 1, 1) == pytest.approx(1 / 3, rel=1e-12)
    a, b, c = 3.0, 1.0, 0.4
    total = demagnetizing_factor(a, b, c) + demagnetizing_factor(b, c, a) + demagnetizing_factor(c, a, b)
    assert total == pytest.approx(1.0, rel=1e-12)
    # Osborn (1945), prolate spheroid, aspect m: N = (m/sqrt(m^2-1) ln(m + sqrt(m^2-1)) - 1)/(m^2-1)
    m = 5.0
    osborn = (m / np.sqrt(m**2 - 1) * np.log(m + np.sqrt(m**2 - 1)) - 1) / (m**2 - 1)
    assert demagnetizing_factor(m, 1, 1) == pytest.approx(osborn, rel=1e-10)


def test_unsaturated_sphere_pull_in_a_dipole_field():
    # Schenck (2000): F = (3 V / mu0) B |dB/ds|; on the axis of a dipole B = mu0 m / (2 pi s^3),
    # so F = (3 V / mu0) (mu0 m / 2 pi)^2 3 / s^7 (independent closed form)
    magnet = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=5e-3)
    ball = steel_sphere(2e-3)
    s = np.array([0.03, 0.05])
    force = projectile_attraction(magnet, [0, 0, 0], [0, 0, 1], s, ball)
    m = np.linalg.norm(magnet.moment)
    expected = 3 * ball.volume / mu_0 * (mu_0 * m / (2 * np.pi)) ** 2 * 3 / s**7
    assert np.all(3 * (mu_0 * m / (2 * np.pi * s**3)) / mu_0 < IRON_SATURATION_MAGNETIZATION)  # unsaturated
    assert np.allclose(force, expected, rtol=1e-5)


def test_saturated_rod_pull_is_ms_v_gradient():
    # Schenck (2000): a saturated item feels Ms V d|B|/ds; dipole axis d|B|/ds = 3 B / s
    magnet = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=20e-3)
    rod = steel_rod(0.1, 3e-3)
    s = 0.011
    m = np.linalg.norm(magnet.moment)
    B = mu_0 * m / (2 * np.pi * s**3)
    assert rod.effective_susceptibility * B / mu_0 > rod.saturation_magnetization  # saturated
    force = projectile_attraction(magnet, [0, 0, 0], [0, 0, 1], s, rod)[0]
    assert force == pytest.approx(rod.saturation_magnetization * rod.volume * 3 * B / s, rel=1e-5)


def test_projectile_distances_inverse_and_monotone():
    origin = surface_point(SOURCE, [0, 0, 1])
    assert np.allclose(origin, [0, 0, 5e-3])
    rod = steel_rod(0.1, 5e-3)
    lift = lift_distance(SOURCE, origin, [0, 0, 1], rod)
    frictions = [0.2, 0.5, 0.9]
    slides = [pull_off_distance(SOURCE, origin, [0, 0, 1], rod, static_friction=mu) for mu in frictions]
    # monotone in the resisting force; sliding off (mu < 1) reaches further than lifting
    assert slides[0] > slides[1] > slides[2] > lift > 0
    weight = rod.mass * g
    # inverse checks: the pull at the reported distances equals mu m g and m g
    for mu, distance in zip(frictions, slides):
        pull = projectile_attraction(SOURCE, origin, [0, 0, 1], distance, rod)[0]
        assert pull == pytest.approx(mu * weight, rel=5e-3)
    assert projectile_attraction(SOURCE, origin, [0, 0, 1], lift, rod)[0] == pytest.approx(weight, rel=5e-3)


def test_gradient_distance_default_threshold():
    # Schenck (2000): rho g / Ms for steel is about 0.045 T/m
    threshold = STEEL_DENSITY * g / IRON_SATURATION_MAGNETIZATION
    assert threshold == pytest.approx(0.045, rel=0.01)
    origin = surface_point(SOURCE, [0, 0, 1])
    distance = gradient_distance(SOURCE, origin, [0, 0, 1])
    # inverse check with a saturated item (pull / (Ms V) = -d|B|/ds)
    rod = steel_rod(0.2, 1e-3)
    pull = projectile_attraction(SOURCE, origin, [0, 0, 1], distance, rod)[0]
    assert pull / (rod.saturation_magnetization * rod.volume) == pytest.approx(threshold, rel=5e-3)
    assert gradient_distance(SOURCE, origin, [0, 0, 1], threshold=1.0) < distance


def test_pair_pressure_is_the_clamp_force_over_the_smaller_pole_face():
    # identity: pressure = force / area, the area being the smaller of the two pole faces
    # (pi (5 mm)^2 for the 10 mm disc against a 20 mm one); a magnet on steel uses its own
    from planner.calculations.handling import pair_figures
    from tests.hazards import setup_from

    magnets = ("  - {id: small, shape: cylinder, diameter: 10 mm, height: 5 mm, grade: N42, at: [0 mm, 0 mm, 2.5 mm], magnetization: +z}\n"
               "  - {id: large, shape: cylinder, diameter: 20 mm, height: 5 mm, grade: N42, at: [80 mm, 0 mm, 2.5 mm], magnetization: +z}\n")
    join = "activities:\n  - {id: join, kind: bring_together, magnet: small, other: large}\n"
    (figures,) = pair_figures(setup_from(join, magnets=magnets))
    assert figures.pressure_at_finger_gap_Pa == pytest.approx(figures.force_at_finger_gap_N / (np.pi * 5e-3**2),
                                                              rel=1e-12)
