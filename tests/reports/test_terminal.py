"""The terminal summary writes each unit-suffixed figure with its words and unit."""
from __future__ import annotations

import pytest

from reports.terminal import _value_text


@pytest.mark.parametrize("key, value, expected", [
    # SI Brochure (BIPM, 9th ed., 2019): derived units written as products and quotients of symbols
    ("conductivity_S_per_m", 5.8e7, ("conductivity", "5.8e+07 S/m")),
    ("drag_constant_N_s_per_m", 2.15, ("drag constant", "2.15 N s/m")),
    ("damping_constant_N_s_per_m", 0.194, ("damping constant", "0.194 N s/m")),  # not read as a length
    # prefixes (table 7): 6.14e-3 H = 6.14 mH, 2.06e-2 s = 20.6 ms, 0.155 W = 155 mW
    ("self_inductance_H", 6.14e-3, ("self inductance", "6.14 mH")),
    ("pulse_duration_s", 2.06e-2, ("pulse duration", "20.6 ms")),
    ("mean_power_W", 0.155, ("mean power", "155 mW")),
    ("coil_resistance_ohm", 8.82, ("coil resistance", "8.82 ohm")),
    ("speed_rpm", 180.0, ("speed", "180 rpm")),
    ("radial_clearance_m", 1.5e-3, ("radial clearance", "1.5 mm")),
    ("inductance_ratio", 0.00449, ("inductance ratio", "0.00449")),
    ("mains", False, ("mains", "no")),
    ("method", "closed form", ("method", "closed form")),
    ("peak_emf_V", float("nan"), ("peak emf", "not available")),
])
def test_unit_suffixed_keys_read_as_words_and_units(key, value, expected):
    assert _value_text(key, value) == expected
