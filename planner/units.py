"""Quantity strings -> SI floats. The one place that knows about units.

Every physical value in a setup file is a string with its unit (``"25 mm"``, ``"1.32 T"``,
``"300 rpm"``). :func:`to_si` turns it into a float in SI base units for a named kind of
quantity, or raises :class:`UnitError` with a message a user can act on. Nothing else in
the project imports pint.

Conventions that pint alone would get wrong, handled here on purpose:

* gauss and oersted are taken as the SI-equivalent values 1 G = 1e-4 T and
  1 Oe = 1000/(4 pi) A/m (pint's own gauss belongs to the Gaussian system and has other
  dimensions);
* a rotation speed in ``Hz`` or ``rev/s`` means revolutions per second, so
  ``1 Hz`` -> 2 pi rad/s; ``rpm`` -> 2 pi / 60 rad/s (pint would treat 1 Hz as 1 rad/s);
* temperatures (``degC``, ``K``, ``degF``) are absolute and returned in degrees Celsius,
  the unit every datasheet's working temperature uses;
* conductivity may be given as a percentage of IACS, 100 %IACS = 58.0 MS/m (IEC 60028).

References
----------
IEC 60028:1925, International standard of resistance for copper (100 % IACS = 58.0 MS/m).
BIPM, The International System of Units (SI), 9th ed. (2019), for the base units.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

import pint

__all__ = ["UnitError", "KINDS", "to_si", "is_quantity_text", "format_si"]


class UnitError(ValueError):
    """A quantity string that cannot be read as the expected kind of quantity."""


@dataclass(frozen=True)
class Kind:
    """A kind of physical quantity: its SI unit, pint dimensionality and an example."""

    name: str
    si_unit: str
    dimensionality: str
    example: str


KINDS: dict[str, Kind] = {k.name: k for k in [
    Kind("length", "m", "[length]", "10 mm"),
    Kind("flux density", "T", "[mass] / [current] / [time] ** 2", "0.5 mT"),
    Kind("field strength", "A/m", "[current] / [length]", "800 A/m"),
    Kind("mass", "kg", "[mass]", "120 g"),
    Kind("speed", "m/s", "[length] / [time]", "3 m/s"),
    Kind("rotation speed", "rad/s", "1 / [time]", "120 rpm"),
    Kind("frequency", "Hz", "1 / [time]", "50 Hz"),
    Kind("time", "s", "[time]", "5 ms"),
    Kind("angle", "rad", "", "30 deg"),
    Kind("current", "A", "[current]", "2 A"),
    Kind("voltage", "V", "[length] ** 2 * [mass] / [current] / [time] ** 3", "6 V"),
    Kind("resistance", "ohm", "[length] ** 2 * [mass] / [current] ** 2 / [time] ** 3", "10 ohm"),
    Kind("conductivity", "S/m", "[current] ** 2 * [time] ** 3 / [length] ** 3 / [mass]", "58 MS/m"),
    Kind("force", "N", "[length] * [mass] / [time] ** 2", "50 N"),
    Kind("energy", "J", "[length] ** 2 * [mass] / [time] ** 2", "0.5 J"),
    Kind("power", "W", "[length] ** 2 * [mass] / [time] ** 3", "2 W"),
    Kind("pressure", "Pa", "[mass] / [length] / [time] ** 2", "300 N/cm^2"),
    Kind("temperature", "degC", "[temperature]", "20 degC"),
    Kind("duration", "s", "[time]", "12 months"),
]}

# Units whose SI meaning pint would get wrong or does not know: (factor to SI, SI unit kind).
_SPECIAL_UNITS = {
    "G": (1e-4, "flux density"), "gauss": (1e-4, "flux density"),
    "kG": (0.1, "flux density"), "kilogauss": (0.1, "flux density"),
    "mG": (1e-7, "flux density"),
    "Oe": (1000 / (4 * math.pi), "field strength"), "oersted": (1000 / (4 * math.pi), "field strength"),
    "kOe": (1e6 / (4 * math.pi), "field strength"),
    "rpm": (2 * math.pi / 60, "rotation speed"), "rev/min": (2 * math.pi / 60, "rotation speed"),
    "rev/s": (2 * math.pi, "rotation speed"), "rps": (2 * math.pi, "rotation speed"),
    "%IACS": (58.0e6 / 100, "conductivity"), "% IACS": (58.0e6 / 100, "conductivity"),
}
# In a rotation speed, Hz counts revolutions per second.
_ROTATION_AS_REVOLUTIONS = {"Hz": 1.0, "kHz": 1e3}

_NUMBER = r"[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?"
_QUANTITY = re.compile(rf"^\s*(?P<number>{_NUMBER})\s*(?P<unit>.*?)\s*$")


@lru_cache(maxsize=1)
def _registry() -> pint.UnitRegistry:
    registry = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    registry.define("kiloohm = 1000 * ohm = kohm")
    registry.define("megaohm = 1e6 * ohm = Mohm")
    registry.define("milliohm = 1e-3 * ohm = mohm")
    return registry


def is_quantity_text(value) -> bool:
    """True if ``value`` looks like ``"<number> <unit>"`` (the unit is not checked)."""
    return isinstance(value, str) and bool(_QUANTITY.match(value)) and bool(_QUANTITY.match(value)["unit"])


def to_si(value, kind: str) -> float:
    """Read a quantity string as ``kind`` and return its value in SI units.

    Parameters
    ----------
    value : str or number
        ``"25 mm"``, ``"1.32 T"``, ``"120 rpm"``... A bare ``0`` is accepted for every kind
        except temperature; any other bare number is refused so that a missing unit is never
        guessed.
    kind : str
        One of :data:`KINDS` (``"length"``, ``"flux density"``, ...).

    Returns
    -------
    float
        The value in the kind's SI unit (see ``KINDS[kind].si_unit``; temperature in degC).

    Raises
    ------
    UnitError
        With a one-line reason, e.g. ``must be a length such as `10 mm`; got `ten```.

    Examples
    --------
    >>> to_si("25 mm", "length")
    0.025
    >>> round(to_si("5 G", "flux density"), 6)
    0.0005
    >>> round(to_si("60 rpm", "rotation speed"), 4)
    6.2832
    """
    spec = KINDS[kind]
    expected = f"must be {_article(kind)} {kind} such as `{spec.example}`"
    if isinstance(value, bool) or value is None:
        raise UnitError(f"{expected}; got `{value}`")
    if isinstance(value, (int, float)):
        if value == 0 and kind != "temperature":
            return 0.0
        raise UnitError(f"{expected}; got the bare number `{value}` (add its unit, e.g. `{value} {spec.example.split()[1]}`)")
    if not isinstance(value, str):
        raise UnitError(f"{expected}; got {type(value).__name__} `{value}`")
    match = _QUANTITY.match(value)
    if not match:
        raise UnitError(f"{expected}; got `{value}`")
    number, unit = float(match["number"]), match["unit"]
    if not math.isfinite(number):
        raise UnitError(f"{expected}; got `{value}`")
    if not unit:
        if number == 0 and kind != "temperature":
            return 0.0
        raise UnitError(f"{expected}; got `{value}` with no unit (add one, e.g. `{value} {spec.example.split()[1]}`)")
    if unit in _SPECIAL_UNITS:
        factor, unit_kind = _SPECIAL_UNITS[unit]
        if unit_kind != kind:
            raise UnitError(f"{expected}; `{unit}` is a unit of {unit_kind}, got `{value}`")
        return number * factor
    if kind == "rotation speed" and unit in _ROTATION_AS_REVOLUTIONS:
        return number * _ROTATION_AS_REVOLUTIONS[unit] * 2 * math.pi
    return _convert_with_pint(number, unit, spec, expected, value)


def _convert_with_pint(number: float, unit: str, spec: Kind, expected: str, original: str) -> float:
    registry = _registry()
    try:
        parsed_unit = registry.Unit(unit.replace("^", "**").replace("·", "*").replace("Ω", "ohm"))
    except Exception:  # pint raises several unrelated types for unreadable units
        raise UnitError(f"{expected}; `{unit}` is not a unit benchplan knows (in `{original}`)") from None
    quantity = registry.Quantity(number, parsed_unit)
    if spec.name == "temperature":
        if quantity.dimensionality != registry.get_dimensionality("[temperature]"):
            raise UnitError(f"{expected}; got `{original}`")
        return float(quantity.to("degC").magnitude)
    if spec.name == "angle" and not quantity.dimensionless:
        raise UnitError(f"{expected}; got `{original}`")
    if spec.name == "angle" and str(parsed_unit) not in ("degree", "radian", "arcminute", "turn", "revolution"):
        raise UnitError(f"{expected}; got `{original}`")
    if spec.name != "angle" and quantity.dimensionality != registry.get_dimensionality(spec.dimensionality):
        raise UnitError(f"{expected}; `{unit}` is not a unit of {spec.name}, got `{original}`")
    return float(quantity.to(spec.si_unit).magnitude)


def _article(kind: str) -> str:
    return "an" if kind[0] in "aeiou" else "a"


def format_si(value: float, kind: str, digits: int = 3) -> str:
    """Format an SI value with a readable unit prefix for display: 0.0123 length -> ``12.3 mm``."""
    unit = KINDS[kind].si_unit
    if kind == "temperature":
        return f"{value:.{digits}g} degC"
    if value == 0 or not math.isfinite(value):
        return f"{value:g} {unit}"
    prefixes = [(1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "u"), (1e-9, "n")]
    if kind == "length":
        prefixes = [(1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "u")]
    for scale, prefix in prefixes:
        if abs(value) >= scale:
            return f"{value / scale:.{digits}g} {prefix}{unit}"
    scale, prefix = prefixes[-1]
    return f"{value / scale:.{digits}g} {prefix}{unit}"


def vector_to_si(value, kind: str) -> tuple[float, float, float]:
    """Read a 3-vector of quantities: ``["0 mm", 0, "30 mm"]`` or ``"0, 0, 30 mm"``.

    In the string form a unit written only after the last number applies to all three.

    >>> vector_to_si("0, 5, 30 mm", "length")
    (0.0, 0.005, 0.03)
    """
    if isinstance(value, str):
        text = value.strip().strip("[]()")
        parts = [p.strip() for p in text.split(",")]
        if len(parts) != 3:
            raise UnitError(f"must be three {kind} values such as `[0 mm, 0 mm, {KINDS[kind].example}]`; got `{value}`")
        last = _QUANTITY.match(parts[-1])
        common_unit = last["unit"] if last else ""
        filled = []
        for part in parts:
            m = _QUANTITY.match(part)
            if m and not m["unit"] and common_unit:
                part = f"{part} {common_unit}"
            filled.append(part)
        parts = filled
    elif isinstance(value, (list, tuple)):
        parts = list(value)
        if len(parts) != 3:
            raise UnitError(f"must be three {kind} values such as `[0 mm, 0 mm, {KINDS[kind].example}]`; got {len(parts)} values")
    else:
        raise UnitError(f"must be three {kind} values such as `[0 mm, 0 mm, {KINDS[kind].example}]`; got `{value}`")
    result = []
    for index, part in enumerate(parts):
        try:
            result.append(to_si(part, kind))
        except UnitError as error:
            raise UnitError(f"component {index + 1} {error}") from None
    return tuple(result)


def format_flux_density(tesla: float, digits: int = 3) -> str:
    """A flux density for people, in T, mT or uT: ``0.5 mT``, ``1.32 T``, ``0.525 uT``.

    mT from 0.1 mT up, the unit the thresholds of the trade are written in; ``not available``
    for NaN or infinity.

    >>> format_flux_density(5e-4), format_flux_density(1.32), format_flux_density(5.25e-7)
    ('0.5 mT', '1.32 T', '0.525 uT')
    """
    if tesla is None or not math.isfinite(tesla):
        return "not available"
    size = abs(tesla)
    if size >= 1.0:
        return f"{tesla:.{digits}g} T"
    if size >= 1e-4 or size == 0:
        return f"{tesla * 1e3:.{digits}g} mT"
    return f"{tesla * 1e6:.{digits}g} uT"
