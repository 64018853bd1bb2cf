"""Material data (planner.materials and planner/data/materials.yaml) against their published sources.

Source for the magnet rows: /work/shared/reference/standards.md, section "Permanent-magnet materials"
(ASTM A1101 for sintered NdFeB; GB/T 13560-2017 for the suffixes; trade tables for Br by grade).
"""
from __future__ import annotations

import pytest

from planner import materials
from planner.units import to_si

GRADES = materials.grades()

# standards.md "Permanent-magnet materials": "Typical Br by grade number [S, trade tables]".
STANDARDS_MD_NDFEB_BR = {
    "N35": (1.17, 1.22), "N38": (1.22, 1.25), "N42": (1.28, 1.32), "N45": (1.32, 1.38),
    "N48": (1.38, 1.42), "N50": (1.40, 1.45), "N52": (1.43, 1.48),
}
# standards.md: suffix -> (HcJ min [kA/m], typical maximum working temperature [degC]) (GB/T 13560-2017).
STANDARDS_MD_SUFFIXES = {
    "": (955, 80), "M": (1114, 100), "H": (1353, 120), "SH": (1592, 150),
    "UH": (1990, 180), "EH": (2388, 200),
}
# standards.md: family -> Br range [T] that every grade of the family must lie in.
STANDARDS_MD_FAMILY_BR = {
    "NdFeB": (1.08, 1.55),   # ASTM A1101: 1.08-1.5 T; "no material above about 1.5 T"
    "SmCo": (0.8, 1.15),     # SmCo5 0.8-1.0 T, Sm2Co17 0.95-1.15 T
    "ferrite": (0.2, 0.46),  # hard ferrite 0.2-0.46 T
    "AlNiCo": (0.6, 1.35),   # AlNiCo 0.6-1.35 T
}


@pytest.mark.parametrize("name", sorted(GRADES))
def test_every_grade_has_an_ordered_remanence_range_below_the_physical_ceiling(name):
    grade = GRADES[name]
    # standards.md: "No permanent-magnet material has a remanence above about 1.5 T"; the code's
    # ceiling is 1.55 T.
    assert 0 < grade.remanence_min <= grade.remanence_max <= 1.55
    assert grade.remanence_max <= materials.MAX_PERMANENT_MAGNET_REMANENCE_T
    assert grade.remanence_min <= grade.remanence_nominal <= grade.remanence_max
    assert grade.coercivity_min > 0 and grade.density > 0
    assert grade.source.strip() and grade.confidence in ("V", "S", "M")


def test_the_remanence_ceiling_is_about_one_and_a_half_tesla():
    # standards.md: "No permanent-magnet material has a remanence above about 1.5 T".
    assert 1.5 <= materials.MAX_PERMANENT_MAGNET_REMANENCE_T <= 1.6


@pytest.mark.parametrize("base, expected", sorted(STANDARDS_MD_NDFEB_BR.items()))
def test_ndfeb_grade_rows_match_the_trade_ranges_of_standards_md(base, expected):
    # Source: standards.md "Permanent-magnet materials", typical Br by grade number (trade tables).
    low, high = expected
    variants = [g for n, g in GRADES.items() if n == base or (n.startswith(base) and not n[len(base)].isdigit())]
    assert variants, f"{base} is missing"
    for grade in variants:  # every suffix shares the base grade's remanence
        assert grade.family == "NdFeB"
        assert grade.remanence_min == pytest.approx(low, abs=1e-9), grade.name
        assert grade.remanence_max == pytest.approx(high, abs=1e-9), grade.name


@pytest.mark.parametrize("suffix, expected", sorted(STANDARDS_MD_SUFFIXES.items()))
def test_ndfeb_suffix_coercivity_and_temperature_match_gbt_13560(suffix, expected):
    # Source: standards.md "Permanent-magnet materials" (GB/T 13560-2017 suffix scheme).
    coercivity_kA_per_m, temperature = expected
    grade = GRADES[f"N42{suffix}"]
    assert grade.coercivity_min == pytest.approx(coercivity_kA_per_m * 1e3)
    assert grade.max_working_temperature == pytest.approx(temperature)


def test_ah_suffix_matches_gbt_13560():
    # Source: standards.md: AH 220-230 C, HcJ about 2 700 kA/m.
    grade = GRADES["N35AH"]
    assert 220 <= grade.max_working_temperature <= 230
    assert grade.coercivity_min == pytest.approx(2700e3, rel=0.02)


def test_n52_without_suffix_has_the_lower_coercivity():
    # Source: standards.md: N grades have HcJ >= 955 kA/m, "N52-N55 876".
    assert GRADES["N52"].coercivity_min == pytest.approx(876e3)
    assert GRADES["N50"].coercivity_min == pytest.approx(955e3)


@pytest.mark.parametrize("name", sorted(GRADES))
def test_every_grade_lies_in_its_family_range_from_standards_md(name):
    grade = GRADES[name]
    low, high = STANDARDS_MD_FAMILY_BR[grade.family]
    assert low <= grade.remanence_min and grade.remanence_max <= high


def test_samarium_cobalt_rows_match_standards_md():
    # Source: standards.md: SmCo5 Br 0.8-1.0 T, max ~250 C; Sm2Co17 Br 0.95-1.15 T, max 300-350 C.
    assert (GRADES["SmCo5"].remanence_min, GRADES["SmCo5"].remanence_max) == pytest.approx((0.8, 1.0))
    assert GRADES["SmCo5"].max_working_temperature == pytest.approx(250)
    assert (GRADES["Sm2Co17"].remanence_min, GRADES["Sm2Co17"].remanence_max) == pytest.approx((0.95, 1.15))
    assert 300 <= GRADES["Sm2Co17"].max_working_temperature <= 350


def test_alnico_coercivity_is_low_as_standards_md_says():
    # Source: standards.md: AlNiCo "low coercivity (40-150 kA/m), easily demagnetized".
    for grade in (g for g in GRADES.values() if g.family == "AlNiCo"):
        assert 40e3 <= grade.coercivity_min <= 150e3, grade.name


def test_ndfeb_temperature_coefficient_is_minus_0_12_percent_per_kelvin():
    # Source: standards.md: "Reversible coefficient of Br about -0.12 %/K".
    assert materials.ndfeb_temperature_coefficient() == pytest.approx(-0.0012)


def test_the_grade_list_covers_n35_to_n52_and_the_other_families():
    # DESIGN.md: "N35..N52 with suffixes, SmCo, ferrite, AlNiCo grades".
    for name in ("N35", "N42", "N42SH", "N52", "SmCo5", "Sm2Co17", "ferrite", "AlNiCo5"):
        assert name in GRADES


def test_grade_lookup_ignores_case_and_spaces_and_suggests_near_names():
    assert materials.find_grade("n42sh").name == "N42SH"
    assert materials.find_grade(" smco5 ").name == "SmCo5"
    assert materials.find_grade("N99") is None
    assert "N42SH" in materials.nearest_names("N42HS", GRADES)


# --- conductors ------------------------------------------------------------------------------

def test_copper_is_58_ms_per_m_which_is_100_percent_iacs():
    # Source: IEC 60028:1925: annealed copper at 20 C has resistivity 1/58 ohm mm^2/m, i.e.
    # 58.0 MS/m, and this is 100 % IACS by definition.
    copper = materials.find_conductor("copper")
    assert copper.conductivity == pytest.approx(58.0e6, rel=1e-12)
    assert copper.conductivity == pytest.approx(to_si("100 %IACS", "conductivity"), rel=1e-12)
    assert 1 / copper.conductivity == pytest.approx(1 / 58 * 1e-6, rel=1e-12)  # 1/58 ohm mm^2/m in ohm m
    assert "IEC 60028" in copper.source and copper.confidence == "V"


def test_pure_aluminium_conductivity_matches_the_handbook_resistivity():
    # Recalled from memory [M]: CRC Handbook, resistivity of Al at 293 K = 2.65e-8 ohm m.
    assert materials.find_conductor("aluminium").conductivity == pytest.approx(1 / 2.65e-8, rel=0.01)


def test_no_listed_conductor_beats_annealed_copper_and_each_has_a_source():
    # Physical fact: of ordinary engineering metals only silver conducts better than annealed copper
    # (CRC Handbook table of resistivities); alloys conduct less than their base metal.
    for conductor in materials.conductors().values():
        assert 0 < conductor.conductivity <= 58.0e6
        assert conductor.source.strip() and conductor.confidence in ("V", "S", "M")
    assert materials.find_conductor("aluminium-6061-T6").conductivity < materials.find_conductor("aluminium").conductivity


def test_american_spelling_of_aluminium_is_accepted():
    assert materials.find_conductor("Aluminum").name == "aluminium"


# --- steels ----------------------------------------------------------------------------------

def test_steel_saturation_does_not_exceed_that_of_pure_iron():
    # Recalled from memory [M]: Bozorth, Ferromagnetism (1951): pure iron saturates at about 2.15 T
    # at room temperature; carbon and alloying lower it (ferritic stainless near 1.5 T).
    for steel in materials.steels().values():
        assert 1.0 < steel.saturation <= 2.16, steel.name
    assert materials.find_steel("iron").saturation == pytest.approx(2.15, abs=0.02)
    assert materials.find_steel("LOW-CARBON-STEEL").name == "low-carbon-steel"
