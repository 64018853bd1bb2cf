"""Quantity strings -> SI floats (planner.units).

Every expected value below is an exact SI definition, named beside the check:
- SI prefixes and base units: BIPM, The International System of Units, 9th ed. (2019), Tables 2, 7.
- 1 in = 25.4 mm and 1 lb = 0.45359237 kg exactly: the 1959 international yard and pound agreement
  (NIST SP 811 (2008), Appendix B.9).
- 1 G = 1e-4 T, 1 Oe = 1000/(4 pi) A/m: SI Brochure 8th ed. (2006), Table 9 (CGS-Gaussian units).
- 1 degree = pi/180 rad: SI Brochure 9th ed., Table 8.
- one revolution = 2 pi rad, so 1 rpm = 2 pi/60 rad/s and 1 rev/s = 2 pi rad/s: definition of the
  radian (SI Brochure 9th ed., 2.3.3).
- 0 degC = 273.15 K; t/degF = 1.8 t/degC + 32: SI Brochure 9th ed. 2.3.1; NIST SP 811 B.8.
- 100 %IACS = 58.0 MS/m: IEC 60028:1925 (International Annealed Copper Standard).
"""
from __future__ import annotations

import math

import pytest

from planner.units import KINDS, UnitError, to_si, vector_to_si

PI = math.pi

# (text, kind, exact SI value, source of the value)
SPELLINGS = [
    # lengths
    ("25 mm", "length", 25e-3, "SI prefix milli = 1e-3"),
    ("2.5 cm", "length", 2.5e-2, "SI prefix centi = 1e-2"),
    ("1.5 m", "length", 1.5, "SI base unit"),
    ("1 in", "length", 0.0254, "1 in = 25.4 mm exactly (1959 agreement)"),
    ("2 in", "length", 0.0508, "1 in = 25.4 mm exactly (1959 agreement)"),
    ("1 ft", "length", 0.3048, "1 ft = 12 in = 0.3048 m exactly (1959 agreement)"),
    ("1 km", "length", 1e3, "SI prefix kilo"),
    ("300 um", "length", 300e-6, "SI prefix micro"),
    # flux density
    ("1.32 T", "flux density", 1.32, "SI derived unit tesla"),
    ("0.5 mT", "flux density", 0.5e-3, "SI prefix milli"),
    ("5 G", "flux density", 5e-4, "1 G = 1e-4 T (SI Brochure 8th ed. Table 9)"),
    ("1 gauss", "flux density", 1e-4, "1 G = 1e-4 T"),
    ("12 kG", "flux density", 1.2, "1 kG = 1e3 G = 0.1 T"),
    ("1 kilogauss", "flux density", 0.1, "1 kG = 0.1 T"),
    ("5 mG", "flux density", 5e-7, "1 mG = 1e-3 G = 1e-7 T"),
    ("525 nT", "flux density", 525e-9, "SI prefix nano"),
    # field strength
    ("800 A/m", "field strength", 800.0, "SI derived unit"),
    ("4.8 kA/m", "field strength", 4800.0, "SI prefix kilo"),
    ("1 Oe", "field strength", 1000 / (4 * PI), "1 Oe = 1000/(4 pi) A/m (SI Brochure 8th ed. Table 9)"),
    ("300 oersted", "field strength", 300 * 1000 / (4 * PI), "1 Oe = 1000/(4 pi) A/m"),
    ("11 kOe", "field strength", 11e6 / (4 * PI), "1 kOe = 1e6/(4 pi) A/m"),
    # mass
    ("120 g", "mass", 0.120, "SI: 1 g = 1e-3 kg"),
    ("2 kg", "mass", 2.0, "SI base unit"),
    ("1 lb", "mass", 0.45359237, "1 lb = 0.45359237 kg exactly (1959 agreement)"),
    ("250 mg", "mass", 250e-6, "SI prefix milli on the gram"),
    # rotation speed: a revolution is 2 pi rad
    ("60 rpm", "rotation speed", 2 * PI, "1 rpm = 2 pi/60 rad/s"),
    ("1 rpm", "rotation speed", 2 * PI / 60, "1 rpm = 2 pi/60 rad/s"),
    ("120 rev/min", "rotation speed", 4 * PI, "1 rev/min = 2 pi/60 rad/s"),
    ("3 rev/s", "rotation speed", 6 * PI, "1 rev/s = 2 pi rad/s"),
    ("2 Hz", "rotation speed", 4 * PI, "a rotation at 1 Hz is one revolution per second = 2 pi rad/s"),
    ("5 rad/s", "rotation speed", 5.0, "SI coherent unit"),
    # frequency
    ("50 Hz", "frequency", 50.0, "1 Hz = 1/s"),
    ("2 kHz", "frequency", 2000.0, "SI prefix kilo"),
    # angles
    ("180 degree", "angle", PI, "1 degree = pi/180 rad"),
    ("30 deg", "angle", PI / 6, "1 degree = pi/180 rad"),
    ("90 degrees", "angle", PI / 2, "1 degree = pi/180 rad"),
    ("1.5 rad", "angle", 1.5, "SI coherent unit"),
    # others used by the setup file
    ("3 m/s", "speed", 3.0, "SI coherent unit"),
    ("36 km/h", "speed", 10.0, "1 km/h = 1000/3600 m/s"),
    ("5 ms", "time", 5e-3, "SI prefix milli"),
    ("100 uA", "current", 100e-6, "SI prefix micro"),
    ("12 V", "voltage", 12.0, "SI derived unit"),
    ("1 kohm", "resistance", 1000.0, "SI prefix kilo"),
    ("10 ohm", "resistance", 10.0, "SI derived unit"),
    ("58 MS/m", "conductivity", 58e6, "SI prefix mega on the siemens"),
    ("100 %IACS", "conductivity", 58e6, "100 %IACS = 58.0 MS/m (IEC 60028)"),
    ("61 %IACS", "conductivity", 0.61 * 58e6, "100 %IACS = 58.0 MS/m (IEC 60028)"),
    ("50 N", "force", 50.0, "SI derived unit"),
    ("300 N/cm^2", "pressure", 3e6, "1 N/cm^2 = 1e4 Pa"),
    ("0.5 J", "energy", 0.5, "SI derived unit"),
    ("2 W", "power", 2.0, "SI derived unit"),
    ("12 months", "duration", 365.25 * 86400, "12 months = 1 Julian year = 365.25 d (IAU)"),
]


@pytest.mark.parametrize("text, kind, expected, source", SPELLINGS, ids=[s[0] for s in SPELLINGS])
def test_every_supported_spelling_converts_to_its_si_definition(text, kind, expected, source):
    # The expected value is the exact SI definition named in `source`.
    assert to_si(text, kind) == pytest.approx(expected, rel=1e-12, abs=1e-300), source


@pytest.mark.parametrize("text, expected", [
    ("20 degC", 20.0),          # degC is the returned unit
    ("293.15 K", 20.0),         # 0 degC = 273.15 K (SI Brochure 9th ed. 2.3.1)
    ("0 K", -273.15),           # absolute zero
    ("212 degF", 100.0),        # t/degF = 1.8 t/degC + 32 (NIST SP 811 B.8)
    ("-40 degF", -40.0),        # the scales cross at -40 (same identity)
])
def test_temperatures_are_absolute_and_returned_in_celsius(text, expected):
    assert to_si(text, "temperature") == pytest.approx(expected, abs=1e-9)


def test_spacing_and_signs_are_read():
    # Same SI definitions as above; only the spelling of the number changes.
    assert to_si("25mm", "length") == pytest.approx(0.025)
    assert to_si("  -3.5e1 mm ", "length") == pytest.approx(-0.035)
    assert to_si(".5 T", "flux density") == pytest.approx(0.5)
    assert to_si("+2 in", "length") == pytest.approx(0.0508)  # 1 in = 25.4 mm


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_the_example_each_message_suggests_is_itself_valid(kind):
    # The error messages say "such as `<example>`": following the advice must work.
    value = to_si(KINDS[kind].example, kind)
    assert math.isfinite(value)


@pytest.mark.parametrize("kind", sorted(k for k in KINDS if k != "temperature"))
def test_a_bare_zero_is_allowed_for_every_kind_except_temperature(kind):
    # The setup-file rule of DESIGN.md: "a bare 0 is allowed".
    assert to_si(0, kind) == 0.0
    assert to_si(0.0, kind) == 0.0
    assert to_si("0", kind) == 0.0


def test_a_bare_zero_temperature_is_refused():
    # 0 could mean 0 degC, 0 K or 0 degF: it must carry its unit.
    with pytest.raises(UnitError, match="temperature"):
        to_si(0, "temperature")


# --- errors ----------------------------------------------------------------------------------

@pytest.mark.parametrize("text, kind, unit_kind", [
    ("10 T", "length", None),
    ("10 mm", "flux density", None),
    ("5 kg", "length", None),
    ("3 m/s", "rotation speed", None),
    ("30 mm", "angle", None),
    ("20 degC", "length", None),
    ("5 G", "length", "flux density"),
    ("2 Oe", "flux density", "field strength"),
    ("60 rpm", "frequency", "rotation speed"),
    ("80 %IACS", "resistance", "conductivity"),
])
def test_a_unit_of_the_wrong_dimension_is_refused_with_the_expected_kind(text, kind, unit_kind):
    with pytest.raises(UnitError) as caught:
        to_si(text, kind)
    message = str(caught.value)
    assert message.startswith(f"must be a {kind} such as `{KINDS[kind].example}`") or \
        message.startswith(f"must be an {kind} such as `{KINDS[kind].example}`")
    assert text in message
    if unit_kind:
        # Units that pint does not know the SI meaning of say what they measure.
        assert f"is a unit of {unit_kind}" in message


@pytest.mark.parametrize("value", [10, 2.5, -3, 1e-3])
def test_a_bare_number_is_refused_and_a_unit_suggested(value):
    with pytest.raises(UnitError) as caught:
        to_si(value, "length")
    message = str(caught.value)
    assert "bare number" in message
    assert f"`{value} mm`" in message  # the suggestion uses the kind's example unit


def test_a_number_in_quotes_without_unit_is_refused():
    with pytest.raises(UnitError, match="with no unit") as caught:
        to_si("25", "length")
    assert "`25 mm`" in str(caught.value)


@pytest.mark.parametrize("text", ["10 furlongz", "3 bananas", "5 mmm", "2 wombats"])
def test_an_unknown_unit_is_named(text):
    with pytest.raises(UnitError) as caught:
        to_si(text, "length")
    unit = text.split(" ", 1)[1]
    assert f"`{unit}` is not a unit benchplan knows" in str(caught.value)


@pytest.mark.parametrize("value", ["ten", "", "mm", "1e400 mm", "nan mm", "inf mm", None, True, False,
                                   [1, 2], {"value": 1}])
def test_values_that_are_not_quantities_are_refused(value):
    with pytest.raises(UnitError, match="must be a length such as `10 mm`"):
        to_si(value, "length")


def test_an_angle_needs_an_angle_unit():
    # A dimensionless ratio such as percent is not an angle.
    with pytest.raises(UnitError):
        to_si("30 percent", "angle")


# --- vectors ---------------------------------------------------------------------------------

def test_vector_as_a_list_of_quantities():
    # 1 in = 25.4 mm exactly (1959 agreement); the bare 0 is allowed.
    assert vector_to_si(["10 mm", 0, "1 in"], "length") == pytest.approx((0.010, 0.0, 0.0254))


def test_vector_as_text_with_one_unit_at_the_end_applies_it_to_all():
    assert vector_to_si("0, 5, 30 mm", "length") == pytest.approx((0.0, 0.005, 0.030))
    assert vector_to_si("[1, 2, 3 cm]", "length") == pytest.approx((0.01, 0.02, 0.03))


def test_vector_as_text_with_its_own_units():
    assert vector_to_si("1 m, 20 cm, 3 mm", "length") == pytest.approx((1.0, 0.2, 0.003))


@pytest.mark.parametrize("value, fragment", [
    (["1 mm", "2 mm"], "got 2 values"),
    (["1 mm", "2 mm", "3 mm", "4 mm"], "got 4 values"),
    ("1, 2 mm", "must be three length values"),
    (5, "must be three length values"),
])
def test_vector_of_the_wrong_length_is_refused(value, fragment):
    with pytest.raises(UnitError, match=fragment):
        vector_to_si(value, "length")


def test_vector_component_errors_name_the_component():
    with pytest.raises(UnitError, match=r"^component 2 must be a length .*bare number `5`"):
        vector_to_si(["1 mm", 5, "3 mm"], "length")
    with pytest.raises(UnitError, match=r"^component 3 .*`T` is not a unit of length"):
        vector_to_si(["1 mm", "5 mm", "3 T"], "length")


def test_vector_of_flux_densities_uses_the_gauss_definition():
    # 1 G = 1e-4 T (SI Brochure 8th ed. Table 9)
    assert vector_to_si(["1 G", "2 mT", 0], "flux density") == pytest.approx((1e-4, 2e-3, 0.0))
