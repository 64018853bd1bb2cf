"""Pinch, small magnets (flux index) and temperature rules, just above and below their thresholds."""
import math

import pytest
from scipy.constants import mu_0

from hazards.findings import ACTION, BLOCKING, NOTE
from hazards.rules import pinch, small_magnets, temperature
from hazards.thresholds import effective_thresholds
from planner.setup.model import SiteRules
from tests.hazards import assessment, ids, magnet, pair, setup_from

T = {t.id: t for t in effective_thresholds(SiteRules())}
ABOVE, BELOW = 1.001, 0.999
TWO = "  - {id: disc, shape: cylinder, diameter: 10 mm, height: 5 mm, grade: N42, at: [0 mm, 0 mm, 2.5 mm], magnetization: +z}\n" \
      "  - {id: disc2, shape: cylinder, diameter: 10 mm, height: 5 mm, grade: N42, at: [50 mm, 0 mm, 2.5 mm], magnetization: +z}\n"
JOIN = "activities:\n  - {id: join, kind: bring_together, magnet: disc, other: disc2}\n"


def _pinch(**figures):
    a = assessment(magnets=[magnet(), magnet("disc2")], pairs=[pair(**figures)])
    return ids(pinch(setup_from(JOIN, magnets=TWO), a, list(T.values())))


@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_clamp_force_against_the_hand_limit(factor, expected):
    # 140 N quasi-static, hands and fingers: ISO/TS 15066 Annex A.
    found = _pinch(force_at_finger_gap_N=T["hand_force_quasi_static"].value * factor)
    assert ("pinch.disc.disc2" in found) is expected
    if expected:
        assert found["pinch.disc.disc2"].severity == BLOCKING
        assert "force" in found["pinch.disc.disc2"].title


@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_pinch_energy_against_the_hand_limit(factor, expected):
    # ~0.5 J transient energy for the hand: derived from ISO/TS 15066 Annex A (280 N, 75 N/mm).
    found = _pinch(pinch_energy_J=T["hand_energy_transient"].value * factor)
    assert ("pinch.disc.disc2" in found) is expected


@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_pressure_over_the_pole_face(factor, expected):
    # 300 N/cm^2 finger pad: ISO/TS 15066 Annex A. Pressure = force / pole area; a 5 mm disc has
    # pi (2.5 mm)^2 = 1.96e-5 m^2.
    area = math.pi * 2.5e-3 ** 2
    force = T["finger_pad_pressure"].value * area * factor
    assert force < 140  # below the force limit, so only the pressure decides
    found = _pinch(force_at_finger_gap_N=force, pressure_at_finger_gap_Pa=force / area)
    assert ("pinch.disc.disc2" in found) is expected


def test_the_hand_energy_row_follows_from_the_force_and_stiffness():
    # Physical identity: energy stored at the transient force limit in a spring of 75 N/mm is
    # F^2 / (2 k) = 280^2 / (2 x 75 000) = 0.52 J, the ~0.5 J of the table.
    assert 280.0 ** 2 / (2 * 75e3) == pytest.approx(T["hand_energy_transient"].value, rel=0.05)


def test_handling_rules_from_snap_distances():
    found = _pinch(snap_distance_bench_m=0.045, snap_distance_hand_m=0.02)
    handling = found["pinch.handling.disc.disc2"]
    assert handling.severity == ACTION and "45 mm" in handling.title and "45 mm" in handling.checklist[0]
    text = " ".join(found["pinch.handling-rules"].checklist)
    for words in ("one magnet at a time", "sliding", "spacers"):
        assert words in text
    assert "pinch.storage" in found and "keeper" in " ".join(found["pinch.storage"].checklist)


@pytest.mark.parametrize("brittle, expected", [(True, True), (False, False)])
def test_eye_protection_when_brittle_magnets_can_collide(brittle, expected):
    handling = _pinch(both_brittle=brittle)["pinch.handling-rules"]
    assert any("safety glasses" in item for item in handling.checklist) is expected


def test_bring_together_without_pair_figures_is_reported():
    found = pinch(setup_from(JOIN, magnets=TWO), assessment(magnets=[magnet()]), list(T.values()))
    assert found and found[0].severity == BLOCKING and ".missing." in found[0].id


# --- small magnets ----------------------------------------------------------------------------

def disc_flux_index(remanence, diameter, height):
    """Flux index [kG^2 mm^2] of a disc by hand: face-centre field from the on-axis formula
    B = (Br/2) L / sqrt(L^2 + R^2) (Camacho & Sosa, Rev. Mex. Fis. E 59, 8-17 (2013)), squared in kG,
    times the pole area pi R^2 in mm^2 (ASTM F963 8.25)."""
    radius = diameter / 2
    face = remanence / 2 * height / math.sqrt(height ** 2 + radius ** 2)
    return (face * 10) ** 2 * math.pi * (radius * 1e3) ** 2


def sphere_flux_index(remanence, diameter):
    """Sphere: the pole field of a uniformly magnetized sphere is (2/3) Br (on-axis dipole field at r = R,
    Jackson, Classical Electrodynamics, 3rd ed., sec. 5.10); pole area = great circle (ASTM F963 8.25)."""
    radius = diameter / 2
    return (2 / 3 * remanence * 10) ** 2 * math.pi * (radius * 1e3) ** 2


CHILDREN = "audience: {groups: [students], youngest_age: 10}\n"


@pytest.mark.parametrize("diameter, height, hazardous", [
    (2.0e-3, 1.0e-3, True),    # N42 Br 1.32 T: 4.67 kG, 3.14 mm^2 -> 68.5 kG^2 mm^2
    (1.5e-3, 1.0e-3, False),   # 5.28 kG, 1.77 mm^2 -> 49.3 kG^2 mm^2, just below 50
])
def test_disc_flux_index_flips_at_50(diameter, height, hazardous):
    # 50 kG^2 mm^2: 16 CFR 1262 (2022), ASTM F963 4.38 / 8.25.
    index = disc_flux_index(1.32, diameter, height)
    assert (index >= 50) is hazardous
    a = assessment(magnets=[magnet(flux_index_kG2_mm2=index, fits_small_parts_cylinder=True)])
    assert ("small_magnets.disc" in ids(small_magnets(setup_from(audience=CHILDREN), a, list(T.values())))) is hazardous


@pytest.mark.parametrize("diameter, hazardous", [
    (1.0e-3, True),     # 8.8 kG, 0.785 mm^2 -> 60.8 kG^2 mm^2
    (0.9e-3, False),    # 8.8 kG, 0.636 mm^2 -> 49.3 kG^2 mm^2
])
def test_sphere_flux_index_flips_at_50(diameter, hazardous):
    index = sphere_flux_index(1.32, diameter)
    assert (index >= 50) is hazardous
    a = assessment(magnets=[magnet(shape="sphere", flux_index_kG2_mm2=index, fits_small_parts_cylinder=True)])
    found = ids(small_magnets(setup_from(audience=CHILDREN), a, list(T.values())))
    assert ("small_magnets.disc" in found) is hazardous
    if hazardous:
        assert found["small_magnets.disc"].severity == BLOCKING
        assert any("Count" in item for item in found["small_magnets.disc"].checklist)


def test_a_magnet_too_big_for_the_cylinder_is_not_a_small_magnet():
    a = assessment(magnets=[magnet(flux_index_kG2_mm2=5000.0, fits_small_parts_cylinder=False)])
    assert small_magnets(setup_from(audience=CHILDREN), a, list(T.values())) == []


@pytest.mark.parametrize("audience, severity", [
    ("audience: {groups: [students], youngest_age: 13}\n", BLOCKING),   # under 14: 16 CFR 1262
    ("audience: {groups: [students], youngest_age: 14}\n", NOTE),
    ("audience: {groups: [public]}\n", BLOCKING),                       # age unknown, public present
    ("audience: {groups: [staff]}\n", NOTE),
])
def test_children_decide_the_severity(audience, severity):
    a = assessment(magnets=[magnet(flux_index_kG2_mm2=700.0, fits_small_parts_cylinder=True)])
    assert ids(small_magnets(setup_from(audience=audience), a, list(T.values())))["small_magnets.disc"].severity == severity


def test_lead_flux_index_matches_the_hand_formula():
    assess = pytest.importorskip("planner.assess").assess
    from planner.setup import parse_setup
    setup = parse_setup("title: t\nmagnets:\n  - {id: d, shape: cylinder, diameter: 2 mm, height: 1 mm, "
                        "remanence: 1.32 T, at: [0 mm, 0 mm, 0.5 mm], magnetization: +z}\n")
    figures = assess(setup).magnets[0]
    assert figures.flux_index_kG2_mm2 == pytest.approx(disc_flux_index(1.32, 2e-3, 1e-3), rel=0.02)


# --- temperature -------------------------------------------------------------------------------

HEAT = "activities:\n  - {{id: heat, kind: bring_together, magnet: disc, other: disc2, temperature: {t} degC}}\n"


@pytest.mark.parametrize("temperature_C, expected", [(81, True), (79, False)])
def test_heated_past_the_working_temperature(temperature_C, expected):
    # N grade (no suffix): 80 degC maximum working temperature (GB/T 13560-2017 scheme, trade values).
    a = assessment(magnets=[magnet(max_working_temperature_C=80.0), magnet("disc2", max_working_temperature_C=80.0)])
    found = ids(temperature(setup_from(HEAT.format(t=temperature_C), magnets=TWO), a, list(T.values())))
    assert ("temperature.heat.disc" in found) is expected


@pytest.mark.parametrize("coercivity_factor, expected", [(BELOW, True), (ABOVE, False)])
def test_repelling_against_coercivity(coercivity_factor, expected):
    # mu0 HcJ compared with the other magnet's face field (both in tesla; B = mu0 H in air).
    face = 0.5
    weak = magnet("disc", coercivity_min_A_per_m=face / mu_0 * coercivity_factor, family="AlNiCo")
    strong = magnet("disc2", pole_face_field_T=face, coercivity_min_A_per_m=2e6)
    a = assessment(magnets=[weak, strong], pairs=[pair()])
    assert ("temperature.repel.disc.disc2" in ids(temperature(setup_from(), a, list(T.values())))) is expected


def test_parts_that_never_snap_get_no_separation_rule():
    assert "pinch.handling.disc.disc2" not in _pinch(snap_distance_bench_m=0.0, snap_distance_hand_m=0.0)


def test_no_pinch_energy_is_said_in_words_when_the_parts_jump_only_inside_the_finger_gap():
    # held in the hand they snap at 4 mm, inside a 10 mm finger gap: nothing lands on the finger
    # (the energy is zero by definition), and the figure says so and names the approach
    found = _pinch(approach="hand", snap_distance_hand_m=0.004, snap_distance_bench_m=0.06,
                   pinch_energy_J=0.0, impact_speed_m_per_s=0.0)
    figures = dict(found["pinch.handling.disc.disc2"].figures)
    assert figures["energy released onto the finger, approach held in the hand"].startswith("none")
    assert figures["impact speed"].startswith("none")
    sliding = dict(_pinch(approach="sliding_on_bench")["pinch.handling.disc.disc2"].figures)
    assert sliding["energy released onto the finger, approach sliding on the bench"] == "50 mJ"


def test_a_pair_that_never_jumps_together_says_none_not_zero():
    # snap distance 0: the attraction stays below the grip at every gap (physics: snap_distance);
    # the figure reads "none" rather than "0 m"
    figures = dict(_pinch(snap_distance_hand_m=0.0, snap_distance_bench_m=0.03)["pinch.handling.disc.disc2"].figures)
    assert figures["snap distance held in the hand"] == "none"
    assert figures["snap distance sliding on the bench"] == "30 mm"
