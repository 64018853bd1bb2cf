"""SI values -> text for people (planner.units.format_quantity and format_number).

Every expected string follows from definitions, named beside each check:
- SI prefixes: BIPM, The International System of Units (SI), 9th ed. (2019), table 7
  (G = 1e9, M = 1e6, k = 1e3, m = 1e-3, micro = 1e-6 with the symbol µ, n = 1e-9, p = 1e-12, ...).
- Prefixes of mass are attached to the gram: SI Brochure 9th ed., section 3 (the kilogram).
- Digits may be split into groups of three by a space, never by a dot or comma: SI Brochure 9th ed.,
  section 5.4.4.
- Rounding to n significant figures keeps the n leading digits of the nearest number (common
  practice; e.g. NIST SP 811 (2008), appendix B.7).
"""
from __future__ import annotations

import math

import pytest

from planner.units import (MICRO_ASCII, MICRO_SIGN, SI_PREFIXES, format_flux_density, format_number,
                           format_quantity, to_si)

# SI Brochure 9th ed. (2019), table 7, the prefixes for powers of one thousand, written out from the table
# (micro as "u" in the project's table; its symbol is µ).
TABLE_7 = {"Y": 24, "Z": 21, "E": 18, "P": 15, "T": 12, "G": 9, "M": 6, "k": 3,
           "m": -3, "u": -6, "n": -9, "p": -12, "f": -15, "a": -18, "z": -21, "y": -24}


def test_the_prefix_table_is_table_7_of_the_si_brochure():
    assert {k: v for k, v in SI_PREFIXES.items() if k} == TABLE_7
    assert SI_PREFIXES[""] == 0  # no prefix: the unit itself


def test_micro_is_written_as_the_caller_asks():
    # 1.5e-6 T = 1.5 x 10^-6 T = 1.5 micro-tesla (table 7: micro = 1e-6, symbol µ)
    assert format_quantity(1.5e-6, "T") == "1.5 uT"
    assert format_quantity(1.5e-6, "T", micro=MICRO_ASCII) == "1.5 uT"
    assert format_quantity(1.5e-6, "T", micro=MICRO_SIGN) == "1.5 µT"
    assert MICRO_SIGN == "\u00b5"  # the MICRO SIGN code point, which the report's fonts carry


@pytest.mark.parametrize("scale, symbol", [
    (1e9, "G"), (1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "µ"), (1e-9, "n"), (1e-12, "p")])
def test_each_power_of_a_thousand_gets_its_prefix(scale, symbol):
    # 2 x (the prefix's power of ten) W is "2 <prefix>W" (table 7)
    assert format_quantity(2 * scale, "W", micro=MICRO_SIGN) == f"2 {symbol}W"
    # 999 x the power is still under the next prefix: "999 <prefix>W"
    assert format_quantity(999 * scale, "W", micro=MICRO_SIGN) == f"999 {symbol}W"


@pytest.mark.parametrize("value, digits, text", [
    (1.23456e-6, 3, "1.23 uT"),   # 1.23456 rounds to 1.23 at 3 significant figures
    (1.23456e-6, 4, "1.235 uT"),  # ... to 1.235 at 4
    (1.23456e-6, 2, "1.2 uT"),    # ... to 1.2 at 2
    (4.5678e-3, 3, "4.57 mT"),    # 4.5678 -> 4.57
    (98760.0, 3, "98.8 kT"),      # 98.76 kT -> 98.8
    (2.0e-6, 3, "2 uT"),          # trailing zeros after the decimal marker are not shown
    (9.9996e-4, 3, "1 mT"),       # 999.96 uT rounds to 1000 uT = 1 mT (milli = 1000 micro): the larger prefix
])
def test_values_are_rounded_to_significant_figures_before_the_prefix_is_chosen(value, digits, text):
    assert format_quantity(value, "T", digits=digits) == text


def test_rounding_up_to_the_next_prefix_writes_the_next_prefix():
    # 0.99996 m rounds to 1.00 m at 3 significant figures; 1 m = 1000 mm (milli = 1e-3)
    assert format_quantity(0.99996, "m", prefixes=("", "m")) == "1 m"
    assert format_quantity(0.99949, "m", prefixes=("", "m")) == "999 mm"


def test_zero_is_written_in_the_unit_as_given():
    assert format_quantity(0.0, "T") == "0 T"
    assert format_quantity(-0.0, "T") == "0 T"      # the sign of zero means nothing to a reader
    assert format_quantity(0.0, "kg", prefixes=("k", "")) == "0 kg"
    assert format_number(0.0) == "0"


@pytest.mark.parametrize("value, text", [
    (-1.5e-6, "-1.5 uT"),     # table 7: micro
    (-2500.0, "-2.5 kT"),     # kilo = 1e3
    (-0.000123, "-123 uT"),   # 1.23e-4 T = 123e-6 T
])
def test_negative_values_keep_their_sign(value, text):
    assert format_quantity(value, "T") == text


@pytest.mark.parametrize("value", [math.inf, -math.inf, math.nan])
def test_values_that_are_not_finite_are_not_available(value):
    assert format_quantity(value, "T") == "not available"
    assert format_quantity(value, "m", micro=MICRO_SIGN) == "not available"
    assert format_flux_density(value) == "not available"


def test_only_the_allowed_prefixes_are_used():
    # 0.0123 m = 12.3 mm (milli)
    assert format_quantity(0.0123, "m", prefixes=("", "m")) == "12.3 mm"
    assert format_quantity(2.5, "m", prefixes=("", "m")) == "2.5 m"
    # below the smallest allowed prefix, that prefix is used: 2.5e-7 m = 0.00025 mm
    assert format_quantity(2.5e-7, "m", prefixes=("", "m")) == "0.00025 mm"
    # above the largest one the digits are grouped in threes (5.4.4): 1534 m -> 1530 m at 3 figures
    assert format_quantity(1534.0, "m", prefixes=("", "m")) == "1 530 m"
    # with no prefix at all the unit is written as given
    assert format_quantity(0.0123, "m/s", prefixes=("",)) == "0.0123 m/s"
    # the default choice is the pure SI one: 5e-4 T = 500e-6 T
    assert format_quantity(5e-4, "T") == "500 uT"


def test_a_prefix_can_start_lower_than_one_of_it():
    # mT from 0.1 mT up: 5e-4 T = 0.5 mT (milli); 5e-5 T = 50 uT (micro)
    bounds = {"m": 1e-4}
    assert format_quantity(5e-4, "T", prefixes=("", "m", "u"), lower_bounds=bounds) == "0.5 mT"
    assert format_quantity(5e-5, "T", prefixes=("", "m", "u"), lower_bounds=bounds) == "50 uT"


def test_prefixes_of_mass_go_on_the_gram():
    # SI Brochure section 3: 0.25 kg = 250 g; 2 kg stays 2 kg; 1.5e-4 kg = 0.15 g = 150 mg
    assert format_quantity(0.25, "kg", prefixes=("k", "")) == "250 g"
    assert format_quantity(2.0, "kg", prefixes=("k", "")) == "2 kg"
    assert format_quantity(1.5e-4, "kg") == "150 mg"
    assert format_quantity(0.25, "kg", prefixes=("k",)) == "0.25 kg"


def test_micro_may_be_named_in_any_of_its_spellings():
    for spelling in ("u", "µ", "\u03bc"):
        assert format_quantity(3e-6, "A", prefixes=("", spelling)) == "3 uA"   # 3e-6 A = 3 micro-ampere


def test_unknown_prefixes_and_micro_signs_are_refused():
    with pytest.raises(ValueError, match="not an SI prefix"):
        format_quantity(1.0, "m", prefixes=("c",))   # centi is a prefix, but not a power of one thousand
    with pytest.raises(ValueError, match="micro must be"):
        format_quantity(1.0, "m", micro="mc")


@pytest.mark.parametrize("value, text", [
    (0.5, "0.5"), (12.34, "12.3"), (3621.7, "3 620"),     # 3 significant figures; groups of three (5.4.4)
    (123456.0, "123 000"), (-0.000123, "-0.000123"),
    (5e-5, "5e-05"), (1.234e6, "1.23e+06"),              # exponent below 1e-4 and from a million up
])
def test_format_number(value, text):
    assert format_number(value) == text


def test_flux_density_reads_in_the_units_of_the_trade():
    # 5e-4 T = 0.5 mT; 1.32 T; 5.25e-7 T = 0.525 uT (table 7)
    assert format_flux_density(5e-4) == "0.5 mT"
    assert format_flux_density(1.32) == "1.32 T"
    assert format_flux_density(5.25e-7) == "0.525 uT"
    assert format_flux_density(0.0) == "0 mT"
    assert format_flux_density(1.23456e-3, digits=4) == "1.235 mT"   # 4 significant figures


def test_formatted_values_read_back_through_to_si():
    # Formatting then reading back gives the value to the printed precision (3 digits), with either micro.
    for value in (0.0123, 4.56e-5, 789.0, 2.5e-7):
        for micro in (MICRO_ASCII, MICRO_SIGN):
            assert to_si(format_quantity(value, "m", micro=micro), "length") == pytest.approx(value, rel=5e-3)
