"""Turning SI numbers and unit-suffixed keys into short, readable text for the report.

>>> quantity(0.0125, "m")
'12.5 mm'
>>> quantity(5e-4, "T")
'0.5 mT'
>>> key_label("peak_emf_V")
('peak emf', 'V')
>>> value_text("terminal_speed_m_per_s", 0.0123)
'0.0123 m/s'
"""
from __future__ import annotations

import math
from typing import Any

SIGNIFICANT = 3

# Units with their own choice of prefixes: (smallest magnitude shown this way, scale, symbol).
_PREFIXED = {
    "m": [(1.0, 1.0, "m"), (1e-3, 1e-3, "mm"), (0.0, 1e-6, "µm")],
    "T": [(1.0, 1.0, "T"), (1e-4, 1e-3, "mT"), (1e-7, 1e-6, "µT"), (0.0, 1e-9, "nT")],
}
_GENERAL_PREFIXES = [(1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "µ"), (1e-9, "n")]
_GENERAL_UNITS = {"V", "A", "W", "J", "N", "s", "H", "Wb", "Ω", "Hz", "Pa", "F", "C"}

# Key suffixes (after the last words of a snake_case name) and the unit they stand for.
_SUFFIXES = [
    ("_kG2_mm2", "kG²·mm²"), ("_m_per_s2", "m/s²"), ("_m_per_s", "m/s"), ("_rad_per_s", "rad/s"),
    ("_A_per_m", "A/m"), ("_S_per_m", "S/m"), ("_N_per_m", "N/m"), ("_A_m2", "A·m²"), ("_N_m", "N·m"),
    ("_kg_m2", "kg·m²"), ("_m2", "m²"), ("_m3", "m³"), ("_degC", "°C"), ("_rpm", "rpm"),
    ("_percent", "%"), ("_ohm", "Ω"), ("_Wb", "Wb"), ("_Hz", "Hz"), ("_kg", "kg"), ("_V", "V"),
    ("_A", "A"), ("_W", "W"), ("_J", "J"), ("_N", "N"), ("_T", "T"), ("_H", "H"), ("_F", "F"),
    ("_m", "m"), ("_s", "s"), ("_C", "C"),
]


def number(value: float, digits: int = SIGNIFICANT) -> str:
    """A number to `digits` significant figures without exponent for everyday sizes."""
    if value is None:
        return "-"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if not math.isfinite(value):
        return "not defined" if math.isnan(value) else ("no limit" if value > 0 else "-no limit")
    if value == 0:
        return "0"
    magnitude = abs(value)
    if 1e-4 <= magnitude < 1e6:
        decimals = max(0, digits - 1 - int(math.floor(math.log10(magnitude))))
        text = f"{value:.{decimals}f}"
        if "." in text:
            text = text.rstrip("0").rstrip(".")
        return text
    return f"{value:.{digits}g}"


def quantity(value: float | None, unit: str, digits: int = SIGNIFICANT) -> str:
    """An SI value with a sensible prefix: 0.0125 m -> '12.5 mm', 2e-5 T -> '20 µT'."""
    if value is None:
        return "-"
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return str(value)
    if not math.isfinite(value):
        return number(value)
    if unit == "Ω" or unit in _GENERAL_UNITS:
        choices = [(scale, scale, prefix + unit) for scale, prefix in _GENERAL_PREFIXES]
    else:
        choices = _PREFIXED.get(unit)
    if not choices or value == 0:
        return f"{number(value, digits)} {unit}".strip()
    magnitude = abs(value)
    _, scale, symbol = choices[-1]
    for smallest, candidate_scale, candidate_symbol in choices:
        if magnitude >= smallest * 0.9995:
            scale, symbol = candidate_scale, candidate_symbol
            break
    return f"{number(value / scale, digits)} {symbol}"


def key_label(key: str) -> tuple[str, str]:
    """A unit-suffixed key -> (plain words, unit symbol); ('', '') suffix gives unit ''."""
    for suffix, unit in _SUFFIXES:
        if key.endswith(suffix) and len(key) > len(suffix):
            words = key[: -len(suffix)].replace("_", " ")
            if unit == "C" and "temperature" in words:
                unit = "°C"
            return words, unit
    return key.replace("_", " "), ""


def value_text(key: str, value: Any) -> str:
    """The value of a unit-suffixed key as text with its unit."""
    _, unit = key_label(key)
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (int, float)):
        return quantity(float(value), unit) if unit else number(float(value))
    if isinstance(value, (list, tuple)):
        return ", ".join(value_text(key, item) for item in value)
    if value is None:
        return "-"
    return str(value)
