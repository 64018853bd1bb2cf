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

from planner.units import (FIELD_LOWER_BOUNDS, FIELD_PREFIXES, LENGTH_PREFIXES, MICRO_SIGN, format_number,
                           format_quantity)

SIGNIFICANT = 3

# Prefixes the report may put on a unit (symbols of SI Brochure table 7; micro as "u", written "µ").
# Masses in kg from 1 kg up, in g below (prefixes of mass go on the gram). Any other unit is
# written as it is.
_PREFIXES = {
    "m": LENGTH_PREFIXES,
    "T": FIELD_PREFIXES,
    "g": ("k", ""),
    "kg": ("k", ""),
}
# The field switches to the next smaller prefix at a tenth of the usual place: 0.1 mT, 0.1 µT
# (as in the terminal: planner.units).
_LOWER_BOUNDS = {"T": FIELD_LOWER_BOUNDS}
_GENERAL_PREFIXES = ("M", "k", "", "m", "u", "n")
_GENERAL_UNITS = {"V", "A", "W", "J", "N", "s", "H", "Wb", "Ω", "Hz", "Pa", "F", "C"}

# Unit symbols that may end a snake_case key, joined by "_" (product) or "_per_" (quotient).
_UNIT_TOKENS = {"V": "V", "A": "A", "W": "W", "J": "J", "N": "N", "T": "T", "m": "m", "s": "s", "kg": "kg",
                "g": "g", "ohm": "Ω", "Hz": "Hz", "H": "H", "Wb": "Wb", "S": "S", "C": "C", "F": "F", "Pa": "Pa",
                "m2": "m²", "m3": "m³", "mm2": "mm²", "kG2": "kG²", "s2": "s²", "rad": "rad", "degC": "°C",
                "percent": "%", "rpm": "rpm", "K": "K"}


def number(value: float, digits: int = SIGNIFICANT) -> str:
    """A number to `digits` significant figures, as :func:`planner.units.format_number` writes it.

    ``-`` for None, yes/no for booleans, ``no limit`` or ``not defined`` for infinity and NaN.
    """
    if value is None:
        return "-"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if not math.isfinite(value):
        return "not defined" if math.isnan(value) else ("no limit" if value > 0 else "-no limit")
    return format_number(float(value), digits)


def quantity(value: float | None, unit: str, digits: int = SIGNIFICANT) -> str:
    """An SI value with a sensible prefix: 0.0125 m -> '12.5 mm', 2e-5 T -> '20 µT'.

    A caller of :func:`planner.units.format_quantity` with the micro sign ``µ``; ``-`` for None,
    ``no limit`` or ``not defined`` for infinity and NaN (as :func:`number` writes them).
    """
    if value is None:
        return "-"
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return str(value)
    if not math.isfinite(value):
        return number(value)
    prefixes = _GENERAL_PREFIXES if unit in _GENERAL_UNITS else _PREFIXES.get(unit, ("",))
    return format_quantity(float(value), unit, micro=MICRO_SIGN, digits=digits, prefixes=prefixes,
                           lower_bounds=_LOWER_BOUNDS.get(unit))


def key_label(key: str) -> tuple[str, str]:
    """A unit-suffixed key -> (plain words, unit symbol), e.g. ``drag_N_s_per_m`` -> ('drag', 'N·s/m').

    Unit tokens are read from the end of the key (``per`` makes a quotient) until a word that is
    not a unit; a key without a unit gives ('words', '').
    """
    tokens = key.split("_")
    cut = len(tokens)
    while cut > 1 and (tokens[cut - 1] in _UNIT_TOKENS or tokens[cut - 1] == "per"):
        cut -= 1
    unit_tokens = tokens[cut:]
    if not [t for t in unit_tokens if t != "per"]:
        return key.replace("_", " "), ""
    words = " ".join(tokens[:cut])
    numerator, denominator, into = [], [], None
    for token in unit_tokens:
        if token == "per":
            into = denominator
            continue
        (into if into is not None else numerator).append(_UNIT_TOKENS[token])
    unit = "·".join(numerator) or "1"
    if denominator:
        unit += "/" + ("·".join(denominator) if len(denominator) == 1 else "(" + "·".join(denominator) + ")")
    if unit == "C" and "temperature" in words:
        unit = "°C"
    return words, unit


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
