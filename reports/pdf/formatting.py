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

# Unit symbols that may end a snake_case key, joined by "_" (product) or "_per_" (quotient).
_UNIT_TOKENS = {"V": "V", "A": "A", "W": "W", "J": "J", "N": "N", "T": "T", "m": "m", "s": "s", "kg": "kg",
                "g": "g", "ohm": "Ω", "Hz": "Hz", "H": "H", "Wb": "Wb", "S": "S", "C": "C", "F": "F", "Pa": "Pa",
                "m2": "m²", "m3": "m³", "mm2": "mm²", "kG2": "kG²", "s2": "s²", "rad": "rad", "degC": "°C",
                "percent": "%", "rpm": "rpm", "K": "K"}


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
