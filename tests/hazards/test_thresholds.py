"""The threshold table against reference/standards.md, and the site's overrides of it."""
import math

import pytest
from scipy.constants import mu_0

from hazards.findings import threshold_text
from hazards.thresholds import CONFIRM_NOTE, effective_thresholds, load_thresholds, parse_threshold_value
from planner.setup import SetupError, load_setup, site_rules_of
from planner.setup.model import SiteRules

ROWS = {row.id: row for row in load_thresholds()}


@pytest.mark.parametrize("threshold_id, value, source_word", [
    ("implant_keep_out", 0.5e-3, "ICNIRP"),              # ICNIRP 2009; Directive 2013/35/EU Annex II
    ("implant_mr_contour_2022", 0.9e-3, "60601-2-33"),   # IEC 60601-2-33 ed. 4 (2022)
    ("implant_test_level", 1e-3, "ISO 14117"),           # ISO 14117
    ("public_exposure", 0.4, "ICNIRP"),                  # ICNIRP 2009
    ("occupational_head_trunk", 2.0, "ICNIRP"),          # ICNIRP 2009
    ("occupational_limbs", 8.0, "ICNIRP"),               # ICNIRP 2009
    ("projectile_line", 3e-3, "2013/35/EU"),             # Directive 2013/35/EU Annex II
    ("cards", 1e-3, "Prudent Practices"),                # NRC Prudent Practices (2011) Table 7.1
    ("storage_media", 2e-3, "Prudent Practices"),        # same table
    ("instruments", 0.1e-3, "Prudent Practices"),        # same table
    ("hand_force_quasi_static", 140.0, "15066"),         # ISO/TS 15066 Annex A
    ("hand_force_transient", 280.0, "15066"),            # ISO/TS 15066 Annex A
    ("finger_pad_pressure", 300e4, "15066"),             # 300 N/cm^2 = 3e6 Pa, ISO/TS 15066 Annex A
    ("hand_energy_transient", 0.5, "15066"),             # derived from ISO/TS 15066 Annex A
    ("flux_index", 50e-8, "1262"),                       # 50 kG^2 mm^2 = 5e-7 T^2 m^2, 16 CFR 1262
    ("small_parts_cylinder_diameter", 31.7e-3, "1501.4"),  # 16 CFR 1501.4
    ("small_parts_cylinder_depth_shallow", 25.4e-3, "1501.4"),
    ("small_parts_cylinder_depth_deep", 57.1e-3, "1501.4"),
    ("children_age", 14, "1262"),
    ("shipping_regulated_2_1m", 0.525e-6, "953"),        # IATA DGR PI 953
    ("shipping_forbidden_4_6m", 0.525e-6, "953"),
    ("hazardous_live_rms_ed3", 33.0, "ed. 3"), ("hazardous_live_peak_ed3", 46.7, "ed. 3"),
    ("hazardous_live_dc_ed3", 70.0, "ed. 3"),            # IEC 61010-1 ed. 3 cl. 6.3.1
    ("hazardous_live_rms_ed2", 30.0, "ed. 2"), ("hazardous_live_peak_ed2", 42.4, "ed. 2"),
    ("hazardous_live_dc_ed2", 60.0, "ed. 2"),            # IEC 61010-1 ed. 2
    ("touch_current_rms", 0.5e-3, "61010"), ("touch_current_peak", 0.7e-3, "61010"),
    ("touch_current_dc", 2e-3, "61010"),
    ("stored_energy", 0.35, "ed. 2"), ("stored_charge", 45e-6, "ed. 2"),
])
def test_rows_match_the_standards_sheet(threshold_id, value, source_word):
    row = ROWS[threshold_id]
    assert row.value == pytest.approx(value, rel=1e-9)
    assert source_word in row.source


def test_field_strength_rows_convert_with_mu0():
    # ISO 764: 4 800 A/m; in air B = mu0 H = 6.03 mT; the table carries the rounded 6.0 mT.
    assert ROWS["watches"].value == pytest.approx(6.0e-3)
    assert parse_threshold_value("4800 A/m", "field") == pytest.approx(mu_0 * 4800)
    # IATA PI 953: 0.418 A/m is quoted as 0.525 uT (mu0 x 0.418 = 0.5253 uT).
    assert mu_0 * 0.418 == pytest.approx(ROWS["shipping_regulated_2_1m"].value, rel=2e-3)
    # Older limit 0.159 A/m -> mu0 H = 0.1998 uT.
    assert ROWS["shipping_older_2_1m"].value == pytest.approx(mu_0 * 0.159, rel=1e-9)
    # ISO 764:2020 enhanced class 16 000 A/m = 20.1 mT.
    assert ROWS["watches_enhanced"].value == pytest.approx(mu_0 * 16000, rel=2e-3)


def test_every_row_is_complete_and_memory_values_are_flagged():
    for row in load_thresholds():
        assert row.source and row.applies_to and row.confidence
        assert row.stricter in ("lower", "higher")
        assert math.isfinite(row.value) and row.value > 0
        if "M" in row.confidence.split("/"):
            assert row.note == CONFIRM_NOTE, row.id


def test_shipping_rows_carry_their_measuring_distance():
    # IATA PI 953: 2.1 m (7 ft) and 4.6 m (15 ft).
    assert ROWS["shipping_regulated_2_1m"].at_distance_m == pytest.approx(2.1)
    assert ROWS["shipping_forbidden_4_6m"].at_distance_m == pytest.approx(4.6)


def _rules(**thresholds):
    return SiteRules(thresholds={k: v for k, v in thresholds.items()})


def test_defaults_are_marked_default():
    rows = {t.id: t for t in effective_thresholds(SiteRules())}
    assert set(rows) == set(ROWS)
    assert all(t.origin == "default" and t.default_value == t.value for t in rows.values())


def test_stricter_site_value_is_used_without_a_reason():
    rows = {t.id: t for t in effective_thresholds(_rules(implant_keep_out={"value": "0.3 mT"}))}
    assert rows["implant_keep_out"].value == pytest.approx(0.3e-3)
    assert rows["implant_keep_out"].origin == "site"
    assert rows["implant_keep_out"].default_value == pytest.approx(0.5e-3)   # ICNIRP 2009 default kept


def test_stricter_for_a_higher_is_stricter_row():
    rows = {t.id: t for t in effective_thresholds(_rules(children_age={"value": "16 year"}))}
    assert rows["children_age"].value == 16


def test_looser_site_value_without_reason_is_refused():
    with pytest.raises(SetupError) as caught:
        effective_thresholds(_rules(implant_keep_out={"value": "0.6 mT"}))
    problem = caught.value.problems[0]
    assert problem.path == "site_rules.thresholds.implant_keep_out.value"
    assert "0.5 mT" in problem.message and "ICNIRP" in problem.message and "reason" in problem.message


def test_looser_for_a_higher_is_stricter_row_is_refused():
    with pytest.raises(SetupError):
        effective_thresholds(_rules(children_age={"value": "12 year"}))


def test_looser_site_value_with_reason_is_used_and_shown():
    reason = "High-coercivity access cards only (estates office)."
    rows = {t.id: t for t in effective_thresholds(_rules(cards={"value": "2 mT", "reason": reason}))}
    cards = rows["cards"]
    assert cards.value == pytest.approx(2e-3) and cards.origin == "site" and cards.reason == reason
    shown = threshold_text(cards)
    assert "2 mT" in shown and "default 1 mT" in shown and reason in shown


def test_unknown_id_lists_known_ids_with_a_guess():
    with pytest.raises(SetupError) as caught:
        effective_thresholds(_rules(card={"value": "1 mT"}))
    message = caught.value.problems[0].message
    assert "Did you mean `cards`" in message and "implant_keep_out" in message


def test_wrong_kind_of_unit_is_refused():
    with pytest.raises(SetupError) as caught:
        effective_thresholds(_rules(watches={"value": "3 N"}))
    assert caught.value.problems[0].path == "site_rules.thresholds.watches.value"


def test_all_problems_reported_together():
    with pytest.raises(SetupError) as caught:
        effective_thresholds(_rules(card={"value": "1 mT"}, watches={"value": "3 N"},
                                    implant_keep_out={"value": "1 mT"}))
    assert len(caught.value.problems) == 3


def test_example_setups_site_rules():
    # magnet-store: instruments stricter (0.05 mT), cards looser with a reason (2 mT).
    setup = load_setup("setups/magnet-store-beside-office.yaml")
    rows = {t.id: t for t in effective_thresholds(site_rules_of(setup))}
    assert rows["instruments"].value == pytest.approx(0.05e-3) and rows["instruments"].origin == "site"
    assert rows["cards"].value == pytest.approx(2e-3) and rows["cards"].reason
    for name in ("open-day-induction-bench", "teaching-lab-stations"):
        effective_thresholds(site_rules_of(load_setup(f"setups/{name}.yaml")))
