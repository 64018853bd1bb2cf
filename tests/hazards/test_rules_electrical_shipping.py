"""Electrical and shipping rules just above and below their thresholds; a packaged set's field at
2.1 m computed independently as a sum of aligned dipoles."""
import math

import pytest
from scipy.constants import mu_0

from hazards.evaluate import evaluate
from hazards.findings import ACTION, BLOCKING, NOTE
from hazards.rules import electrical, shipping
from hazards.thresholds import effective_thresholds
from planner.assessment import InductionFigures
from planner.setup.model import SiteRules
from tests.hazards import assessment, ids, induction, magnet, package, setup_from

T = {t.id: t for t in effective_thresholds(SiteRules())}
ABOVE, BELOW = 1.001, 0.999
COIL = """
coils:
  - id: coil
    turns: 500
    inner_diameter: 16 mm
    length: 30 mm
    wire_diameter: 0.25 mm
    at: [0 m, 0 m, 5 cm]
{connection}
activities:
  - {{id: run, kind: pass_through_coil, magnet: disc, coil: coil, drop_height: 10 cm}}
{site}
"""
METER = "    connected_to: {kind: meter, full_scale_current: 100 uA, resistance: 1 kohm}"


def _electrical(values, site="", connection=METER):
    setup = setup_from(COIL.format(connection=connection, site=site))
    return ids(electrical(setup, assessment(magnets=[magnet()], induction=[induction(values)]), list(T.values())))


@pytest.mark.parametrize("key, limit_id", [
    ("peak_emf_V", "hazardous_live_peak_ed3"),          # 46.7 V peak, IEC 61010-1 ed. 3 cl. 6.3.1
    ("switch_off_peak_V", "hazardous_live_peak_ed3"),   # same limit for the switch-off spike
    ("emf_rms_V", "hazardous_live_rms_ed3"),            # 33 V rms, IEC 61010-1 ed. 3 cl. 6.3.1
])
@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_voltages_against_edition_3_by_default(key, limit_id, factor, expected):
    found = _electrical({key: T[limit_id].value * factor})
    assert (f"electrical.run.{key}" in found) is expected
    if expected:
        assert found[f"electrical.run.{key}"].severity == BLOCKING


@pytest.mark.parametrize("key, limit_id", [
    ("peak_emf_V", "hazardous_live_peak_ed2"),          # 42.4 V peak, IEC 61010-1 ed. 2
    ("emf_rms_V", "hazardous_live_rms_ed2"),            # 30 V rms, IEC 61010-1 ed. 2
])
@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_voltages_against_edition_2_when_the_site_chooses_it(key, limit_id, factor, expected):
    found = _electrical({key: T[limit_id].value * factor}, site="site_rules: {electrical_limits: IEC 61010-1 ed. 2}")
    assert (f"electrical.run.{key}" in found) is expected


def test_a_voltage_between_the_two_editions():
    # 45 V peak: above ed. 2 (42.4 V) and below ed. 3 (46.7 V).
    assert "electrical.run.peak_emf_V" not in _electrical({"peak_emf_V": 45.0})
    assert "electrical.run.peak_emf_V" in _electrical(
        {"peak_emf_V": 45.0}, site="site_rules: {electrical_limits: IEC 61010-1 ed. 2}")


@pytest.mark.parametrize("ratio, expected", [(1.001, True), (0.999, False)])
def test_meter_past_full_scale(ratio, expected):
    # Physical identity: the needle leaves the scale when peak current / full-scale current > 1.
    by_ratio = _electrical({"peak_to_full_scale": ratio})
    by_currents = _electrical({"peak_current_A": 100e-6 * ratio, "full_scale_A": 100e-6})
    assert ("electrical.run.meter" in by_ratio) is expected
    assert ("electrical.run.meter" in by_currents) is expected


@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_stored_energy(factor, expected):
    # 350 mJ: IEC 61010-1 ed. 2 stored-energy figure, used as a reference.
    assert ("electrical.run.stored_energy" in _electrical({"stored_energy_J": 0.35 * factor})) is expected


@pytest.mark.parametrize("factor, expected", [(ABOVE, True), (BELOW, False)])
def test_stored_charge(factor, expected):
    # 45 uC: IEC 61010-1 ed. 2.
    assert ("electrical.run.stored_charge" in _electrical({"stored_charge_C": 45e-6 * factor})) is expected


MAINS = "    connected_to: {kind: supply, current: 1 A, frequency: 50 Hz, voltage: 230 V, mains: true}"


@pytest.mark.parametrize("site, severity", [
    ("", BLOCKING),
    ("site_rules: {competent_persons: [{name: A. Example, role: electrical safety officer}]}", ACTION),
])
def test_mains_coils_need_a_competent_person(site, severity):
    # Common practice (standards.md, electrical): mains apparatus needs the site's rules and a competent person.
    found = _electrical({}, site=site, connection=MAINS)
    assert found["electrical.coil.mains"].severity == severity
    assert found["electrical.coil.mains"].title == "`coil` is a coil powered from the mains"


def test_identical_mains_coils_read_well_as_one_finding():
    coils = "\n".join(f"  - {{id: coil-{n:02d}, turns: 500, inner_diameter: 16 mm, length: 30 mm, wire_diameter: "
                      f"0.25 mm, at: [{n} m, 0 m, 5 cm], connected_to: {{kind: supply, current: 1 A, frequency: "
                      f"50 Hz, voltage: 230 V, mains: true}}}}" for n in range(1, 13))
    setup = setup_from(STATIONS.format(coils=coils, activities="  []"))
    found = [f for f in evaluate(setup, assessment(magnets=[magnet()]), list(T.values())) if f.id.endswith(".mains")]
    # Twelve findings that differ only in the coil are one; the title opens with the part, so
    # hazards.grouping writes "Each of ..." and keeps the verb singular (its docstring's rule).
    assert [f.title for f in found] == ["Each of `coil-01` to `coil-12` is a coil powered from the mains"]
    assert found[0].parts == [f"coil-{n:02d}" for n in range(1, 13)]


def test_missing_induction_figures_are_reported():
    setup = setup_from(COIL.format(connection=METER, site=""))
    found = electrical(setup, assessment(magnets=[magnet()]), list(T.values()))
    assert [f.id for f in found] == ["electrical.run.missing"]
    assert found[0].title == "Not checked: the electrical figures of `run` (not among the computed figures)"


STATIONS = """
coils:
{coils}
activities:
{activities}
"""


def test_the_same_gap_at_identical_stations_is_one_finding_naming_them_all():
    # Three identical stations, none with figures: three gaps that differ only in the activity.
    coils = "\n".join(f"  - {{id: coil-{n}, turns: 500, inner_diameter: 16 mm, length: 30 mm, wire_diameter: "
                      f"0.25 mm, at: [{n} m, 0 m, 5 cm], connected_to: {{kind: meter, full_scale_current: 100 uA, "
                      f"resistance: 1 kohm}}}}" for n in (1, 2, 3))
    activities = "\n".join(f"  - {{id: drop-{n}, kind: pass_through_coil, magnet: disc, coil: coil-{n}, "
                           f"drop_height: 10 cm}}" for n in (1, 2, 3))
    setup = setup_from(STATIONS.format(coils=coils, activities=activities))
    found = evaluate(setup, assessment(magnets=[magnet()]), list(T.values()))
    gaps = [f for f in found if f.title.startswith("Not checked: the electrical figures")]
    # Wording from hazards/grouping.py's rules: a run of three consecutive numbers is a range.
    assert [f.title for f in gaps] == ["Not checked: the electrical figures of `drop-1` to `drop-3` "
                                       "(not among the computed figures)"]
    assert gaps[0].parts == ["drop-1", "drop-2", "drop-3"]


def test_a_package_without_figures_is_named_between_backticks():
    setup = setup_from("activities:\n  - {id: send, kind: ship_package, magnets: [disc], "
                       "package_size: [10 cm, 10 cm, 10 cm]}\n")
    found = ids(shipping(setup, assessment(magnets=[magnet()]), list(T.values())))
    assert found["shipping.send.missing"].title == ("Not checked: the field around package `send` "
                                                    "(not among the computed figures)")
    assert found["shipping.send.missing"].severity == BLOCKING


# --- remarks of the calculation --------------------------------------------------------------------

def _remarks(warnings, values=None):
    """The electrical rule's findings for one drop through the metered coil with these remarks."""
    # peak current / full scale = 1.79 mA / 100 uA = 17.9 (arithmetic)
    values = {"peak_current_A": 1.79e-3, "full_scale_A": 1e-4, "peak_to_full_scale": 17.9} if values is None else values
    figures = InductionFigures(activity_id="run", kind="pass_through_coil", values=values, warnings=list(warnings))
    setup = setup_from(COIL.format(connection=METER, site=""))
    return ids(electrical(setup, assessment(magnets=[magnet()], induction=[figures]), list(T.values())))


def test_a_meter_past_full_scale_is_said_by_the_finding_not_by_a_remark():
    # The calculation writes no remark for it (planner/calculations/induction.py): the rule reads
    # the figure peak_to_full_scale, so no remark repeats the finding.
    found = _remarks([])
    assert "electrical.run.remarks" not in found
    assert found["electrical.run.meter"].figures[-1] == ("peak / full scale", "17.9")   # the finding says it


def test_every_remark_of_the_calculation_is_kept_as_written():
    # the rule no longer reads the remarks' words: a remark about the meter is kept like any other
    found = _remarks(["the meter would be driven to 30.0 times its full scale"])
    assert found["electrical.run.remarks"].why == "The meter would be driven to 30.0 times its full scale."
    # no ratio and no currents among the figures: no meter finding, so the remark is the only place it is said
    found = _remarks(["the meter would be driven to 17.9 times its full scale"], values={})
    assert "electrical.run.meter" not in found
    assert found["electrical.run.remarks"].why == "The meter would be driven to 17.9 times its full scale."


def test_each_remark_is_its_own_sentence():
    found = _remarks(["the block is modelled as a round magnet of the same volume and height",
                      "the speed is not small against 2/(mu0 sigma d): the low-speed drag overstates the braking"])
    # Written out by hand: capital letter, full stop (hazards.findings.sentence).
    assert found["electrical.run.remarks"].why == (
        "The block is modelled as a round magnet of the same volume and height. The speed is not small against "
        "2/(mu0 sigma d): the low-speed drag overstates the braking.")
    # a remark that opens with a symbol keeps its spelling; one that ends a sentence gets no second stop
    found = _remarks(["mu0 sigma d is large", "the coil is warm."], values={})
    assert found["electrical.run.remarks"].why == "mu0 sigma d is large. The coil is warm."


# --- shipping ---------------------------------------------------------------------------------

def aligned_dipoles_field(pieces, remanence, diameter, distance):
    """On-axis field [T] of `pieces` aligned spheres at `distance` [m]: moment of one sphere
    m = Br V / mu0, dipole field B = mu0 / (4 pi) 2 m / r^3 (Jackson, 3rd ed., eq. 5.56), summed."""
    volume = math.pi / 6 * diameter ** 3
    moment = remanence * volume / mu_0
    return mu_0 / (4 * math.pi) * 2 * pieces * moment / distance ** 3


def _pieces_at(limit, distance):
    one = aligned_dipoles_field(1, 1.32, 5e-3, distance)
    return limit / one


def _severity(at_2_1, at_4_6):
    return ids(shipping(setup_from(), assessment(magnets=[magnet()], shipping=[package(at_2_1, at_4_6)]),
                        list(T.values())))["shipping.send"].severity


def test_spheres_package_either_side_of_the_2_1_m_limit():
    # 5 mm N42 spheres (Br 1.32 T), package 10 cm deep: the nearest face is at 2.1 m, the centre 2.15 m.
    # 0.525 uT at 2.1 m: IATA DGR Packing Instruction 953.
    limit = T["shipping_regulated_2_1m"].value
    flip = _pieces_at(limit, 2.15)
    below, above = math.floor(flip * 0.98), math.ceil(flip * 1.02)
    assert 300 < flip < 500     # about 390 spheres of 5 mm
    field_below = aligned_dipoles_field(below, 1.32, 5e-3, 2.15)
    field_above = aligned_dipoles_field(above, 1.32, 5e-3, 2.15)
    assert _severity(field_below, field_below * (2.15 / 4.65) ** 3) == NOTE
    assert _severity(field_above, field_above * (2.15 / 4.65) ** 3) == ACTION


def test_package_forbidden_past_the_limit_at_4_6_m():
    # Same field limit at 4.6 m: IATA PI 953; 49 CFR 173.21(d).
    limit = T["shipping_forbidden_4_6m"].value
    for factor, severity in ((ABOVE, BLOCKING), (BELOW, ACTION)):
        pieces = _pieces_at(limit, 4.65) * factor
        at_4_6 = aligned_dipoles_field(pieces, 1.32, 5e-3, 4.65)
        assert _severity(aligned_dipoles_field(pieces, 1.32, 5e-3, 2.15), at_4_6) == severity


def test_older_limit_noted_and_edition_named():
    # 0.159 A/m (0.200 uT) older IATA limit; 0.3 uT lies between it and 0.525 uT.
    found = ids(shipping(setup_from(), assessment(shipping=[package(0.3e-6, 0.03e-6)]), list(T.values())))
    finding = found["shipping.send"]
    assert finding.severity == NOTE and "older" in finding.title
    assert any("Packing Instruction 953" in value for _, value in finding.figures)
    assert "check the current one" in finding.why


def test_lead_shipping_field_within_dipole_bounds():
    from tests.conftest import assessed_example

    _, assessment = assessed_example("magnet-store-beside-office")
    package_figures = next(p for p in assessment.shipping if p.activity_id == "send-spheres")
    # 200 spheres of 5 mm N42 in a 20 x 15 x 10 cm box: the centre is 2.1 m to 2.1 m + half the diagonal
    # (0.135 m) from the measuring point; the field lies between the dipole sums at those distances
    # (grade N42 upper Br 1.32 T; allow 5 % for the remanence spread).
    nearest = aligned_dipoles_field(200, 1.32, 5e-3, 2.1 + 0.135)
    farthest = aligned_dipoles_field(200, 1.32, 5e-3, 2.1)
    assert nearest * 0.95 <= package_figures.field_at_2_1_m_T <= farthest * 1.05
