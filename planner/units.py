"""Quantity strings -> SI floats, and SI floats -> text for people. The one place that knows about units.

Every physical value in a setup file is a string with its unit (``"25 mm"``, ``"1.32 T"``,
``"300 rpm"``). :func:`to_si` turns it into a float in SI base units for a named kind of
quantity, or raises :class:`UnitError` with a message a user can act on. Nothing else in
the project imports pint.

The other way, :func:`format_quantity` is the one formatter of values for people: SI prefix,
significant figures, and micro written ``u`` (terminal) or ``µ`` (PDF) as the caller chooses.
``hazards.findings.show`` (terminal, JSON) and ``reports.pdf.formatting.quantity`` (PDF) call it
with their own choice of prefixes per unit.

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
BIPM, The International System of Units (SI), 9th ed. (2019), for the base units and the prefixes (table 7).
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

import pint

from planner.physics.constants import mu_0  # the hazard rules convert A/m to T with it


__all__ = ["mu_0", "UnitError", "KINDS", "to_si", "is_quantity_text", "vector_to_si", "MICRO_ASCII", "MICRO_SIGN",
           "SI_PREFIXES", "FIELD_PREFIXES", "FIELD_LOWER_BOUNDS", "LENGTH_PREFIXES", "format_number",
           "format_quantity", "format_flux_density"]


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
    # pint parses its unit definitions on every start (0.2 s); with its cache folder (the
    # user's cache directory) later starts load them in 0.02 s. Without a usable cache folder
    # (read-only home and the like) the definitions are parsed as before.
    try:
        registry = pint.UnitRegistry(autoconvert_offset_to_baseunit=True, cache_folder=":auto:")
    except Exception:  # noqa: BLE001 - any failure of the cache only costs time
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


# --- SI floats -> text for people ------------------------------------------------------------

#: The two ways of writing the micro prefix: ASCII ``u`` for terminals that may not show the micro
#: sign, and U+00B5 MICRO SIGN for the PDF, whose fonts have it.
MICRO_ASCII, MICRO_SIGN = "u", "\u00b5"

#: The SI prefixes for powers of one thousand, symbol -> power of ten (BIPM SI Brochure, 9th ed.,
#: 2019, table 7). Micro is written ``u`` here; :func:`format_quantity` also accepts the micro sign
#: and the Greek letter mu, and writes the sign its caller asks for.
SI_PREFIXES = {"Y": 24, "Z": 21, "E": 18, "P": 15, "T": 12, "G": 9, "M": 6, "k": 3, "": 0,
               "m": -3, "u": -6, "n": -9, "p": -12, "f": -15, "a": -18, "z": -21, "y": -24}
_MICRO_SPELLINGS = ("u", MICRO_SIGN, "\u03bc")
#: The prefixes :func:`format_quantity` chooses from unless told otherwise.
DISPLAY_PREFIXES = ("G", "M", "k", "", "m", "u", "n", "p")
#: Flux densities for people, in the terminal and the PDF alike: T, mT from 0.1 mT (the unit the
#: thresholds of the trade are written in), uT from 0.1 uT, nT below.
FIELD_PREFIXES = ("", "m", "u", "n")
FIELD_LOWER_BOUNDS = {"m": 1e-4, "u": 1e-7}
#: Lengths for people: m, mm, um.
LENGTH_PREFIXES = ("", "m", "u")


def _round_significant(value: float, digits: int) -> float:
    """``value`` rounded to ``digits`` significant figures (correctly rounded, via its decimal text)."""
    return float(f"{value:.{digits - 1}e}")


def format_number(value: float, digits: int = 3) -> str:
    """A number for people: ``digits`` significant figures, no exponent from 1e-4 up to a million.

    Parameters
    ----------
    value : float
        Any real number.
    digits : int
        Significant figures kept (at least 1).

    Returns
    -------
    str
        Trailing zeros after the decimal marker are dropped; the integer part is split into groups
        of three digits by a space from 1 000 up (SI Brochure, 9th ed., 5.4.4); below 1e-4 and
        from 1e6 up the number is written with an exponent (``5e-05``, ``1.23e+06``); ``0`` for
        zero of either sign; ``inf``, ``-inf`` or ``nan`` for the values that are not finite.

    Examples
    --------
    >>> format_number(0.5), format_number(12.34), format_number(3621.7), format_number(-0.000123)
    ('0.5', '12.3', '3 620', '-0.000123')
    """
    if not math.isfinite(value):
        return f"{value}"
    if value == 0:
        return "0"
    rounded = _round_significant(value, digits)
    if not 1e-4 <= abs(rounded) < 1e6:
        return f"{rounded:.{digits}g}"
    exponent = int(f"{rounded:e}".split("e")[1])
    text = f"{abs(rounded):.{max(0, digits - 1 - exponent)}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    whole, dot, fraction = text.partition(".")
    if len(whole) > 3:
        whole = " ".join(whole[max(0, end - 3):end] for end in range(len(whole) % 3 or 3, len(whole) + 1, 3))
    return ("-" if rounded < 0 else "") + whole + dot + fraction


def format_quantity(value: float, unit: str, *, micro: str = MICRO_ASCII, digits: int = 3,
                    prefixes=DISPLAY_PREFIXES, lower_bounds=None) -> str:
    """A value with its unit for people, under the SI prefix that keeps the number short.

    Parameters
    ----------
    value : float
        The value in ``unit``.
    unit : str
        The unit symbol without a prefix (``"T"``, ``"m"``, ``"N/cm^2"``), or ``"kg"``: prefixes
        of mass go on the gram (SI Brochure 9th ed., 3), so ``prefixes`` are then gram prefixes
        (``("k", "")`` gives kg and g).
    micro : str
        How to write the micro prefix: :data:`MICRO_ASCII` (``u``, for terminals) or
        :data:`MICRO_SIGN` (``µ``, for the PDF).
    digits : int
        Significant figures shown.
    prefixes : sequence of str
        The prefix symbols that may be used (keys of :data:`SI_PREFIXES`; ``""`` for none;
        micro as ``u``, ``µ`` or ``μ``), in any order. ``("",)`` writes the unit as given.
    lower_bounds : mapping of str to float, optional
        For a prefix whose range should start elsewhere than at one of it, the smallest magnitude
        [in ``unit``] written with it, e.g. ``{"m": 1e-4}`` for mT from 0.1 mT up.

    Returns
    -------
    str
        The value rounded to ``digits`` significant figures first, then written with the largest
        allowed prefix whose lower bound it reaches (the smallest prefix if it reaches none), the
        number as :func:`format_number` writes it: ``1.5 uT``, ``12.3 mm``, ``-2 kV``. Zero is
        written with the unit as given (``0 T``); NaN and infinity as ``not available``.

    Raises
    ------
    ValueError
        For a prefix not in :data:`SI_PREFIXES`, or a micro spelling other than the three above.

    Notes
    -----
    A prefix stands for a power of ten (BIPM SI Brochure, 9th ed., 2019, table 7): with ``p``
    the prefix's power, a value ``x`` is written ``x / 10**p`` followed by the prefix and the
    unit. Rounding before the choice means that 0.99996 m is written ``1 m``, not ``1000 mm``.

    References
    ----------
    BIPM, The International System of Units (SI), 9th ed. (2019): table 7 (prefixes), section 3
    (prefixes with the kilogram), section 5.4.4 (writing numbers).

    Examples
    --------
    >>> format_quantity(1.5e-6, "T"), format_quantity(1.5e-6, "T", micro=MICRO_SIGN)
    ('1.5 uT', '1.5 µT')
    >>> format_quantity(0.0123, "m", prefixes=("", "m")), format_quantity(0.25, "kg", prefixes=("k", ""))
    ('12.3 mm', '250 g')
    """
    if micro not in _MICRO_SPELLINGS:
        raise ValueError(f"micro must be {MICRO_ASCII!r} or {MICRO_SIGN!r}; got {micro!r}")
    if not math.isfinite(value):
        return "not available"
    if value == 0:
        return f"0 {unit}".strip()
    base, factor = ("g", 1e3) if unit == "kg" else (unit, 1.0)
    choices = []
    for prefix in prefixes:
        prefix = "u" if prefix in _MICRO_SPELLINGS else prefix
        if prefix not in SI_PREFIXES:
            raise ValueError(f"{prefix!r} is not an SI prefix (BIPM SI Brochure, table 7)")
        power = SI_PREFIXES[prefix]
        bound = (lower_bounds or {}).get(prefix)
        choices.append((power, float(f"1e{power}") if bound is None else bound * factor, prefix))
    choices.sort(reverse=True)
    rounded = _round_significant(_round_significant(value, digits) * factor, digits)
    power, _, prefix = next((c for c in choices if abs(rounded) >= c[1]), choices[-1])
    symbol = (micro if prefix == "u" else prefix) + base
    return f"{format_number(rounded / float(f'1e{power}'), digits)} {symbol}".strip()


def format_flux_density(tesla: float, digits: int = 3) -> str:
    """A flux density for people, in T, mT, uT or nT, as the terminal and ``benchplan field`` show it.

    Parameters
    ----------
    tesla : float
        Flux density [T].
    digits : int
        Significant figures shown.

    Returns
    -------
    str
        :func:`format_quantity` with micro written ``u`` and the prefixes of
        :data:`FIELD_PREFIXES` (the PDF uses the same), zero as ``0 mT``; ``not available``
        for None, NaN or infinity.

    Examples
    --------
    >>> format_flux_density(5e-4), format_flux_density(1.32), format_flux_density(5.25e-7)
    ('0.5 mT', '1.32 T', '0.525 uT')
    """
    if tesla is None:
        return "not available"
    if tesla == 0:
        return "0 mT"
    return format_quantity(tesla, "T", digits=digits, prefixes=FIELD_PREFIXES, lower_bounds=FIELD_LOWER_BOUNDS)
