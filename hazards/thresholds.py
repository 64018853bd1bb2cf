"""The threshold table (``thresholds.yaml``) and the site's overrides of it.

Every threshold is a data row with its source and confidence. A site may override any row in
``site_rules.thresholds``: a stricter value is used as given; a looser one only with a written
reason, which is kept and shown beside the value wherever it is used.

>>> rows = {t.id: t for t in effective_thresholds(SiteRules())}
>>> rows["implant_keep_out"].value, rows["implant_keep_out"].origin
(0.0005, 'default')
"""
from __future__ import annotations

import difflib
import math
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources

import yaml

from planner.assessment import Threshold
from planner.setup import Problem, SetupError
from planner.setup.model import SiteRules
from planner.units import UnitError, mu_0, to_si

__all__ = ["ThresholdRow", "load_thresholds", "effective_thresholds", "parse_threshold_value",
           "CONFIRM_NOTE", "SI_UNITS"]

#: Printed beside every value recalled from memory ([M] in the table).
CONFIRM_NOTE = "to be confirmed against the current edition"

#: The SI unit each kind of threshold is held in after reading.
SI_UNITS = {
    "field": "T", "field_at_distance": "T", "source_field": "T", "coercivity": "A/m", "force": "N",
    "pressure": "Pa", "energy": "J", "voltage": "V", "current": "A", "charge": "C",
    "flux_index": "T^2 m^2", "length": "m", "age": "year", "ratio": "",
}
# Kinds that planner.units reads directly, by the name it knows them under.
_UNIT_KINDS = {"field": "flux density", "field_at_distance": "flux density", "source_field": "flux density",
               "coercivity": "field strength", "force": "force", "pressure": "pressure", "energy": "energy",
               "voltage": "voltage", "current": "current", "length": "length"}
# Kinds planner.units has no name for: the units accepted and their factor to SI.
_OTHER_UNITS = {
    "charge": {"C": 1.0, "mC": 1e-3, "uC": 1e-6, "µC": 1e-6, "nC": 1e-9},
    # 1 kG^2 mm^2 = (0.1 T)^2 (1e-3 m)^2 = 1e-8 T^2 m^2 (ASTM F963 8.25 defines the index in kG^2 mm^2)
    "flux_index": {"kG^2 mm^2": 1e-8, "kG2 mm2": 1e-8, "kG^2*mm^2": 1e-8, "T^2 m^2": 1.0, "T2 m2": 1.0},
    "age": {"year": 1.0, "years": 1.0, "y": 1.0},
    "ratio": {"": 1.0},
}


@dataclass(frozen=True)
class ThresholdRow:
    """One row of the default table, as read (``value`` already SI)."""

    id: str
    value: float
    unit: str
    kind: str
    stricter: str
    applies_to: str
    source: str
    confidence: str
    note: str | None
    at_distance_m: float | None

    def display(self) -> str:
        """The value as the source writes it, e.g. ``0.5 mT``."""
        return raw_display(self.id)


@lru_cache(maxsize=1)
def _raw_rows() -> tuple[dict, ...]:
    text = resources.files("hazards").joinpath("thresholds.yaml").read_text(encoding="utf-8")
    return tuple(yaml.safe_load(text)["thresholds"])


def raw_display(threshold_id: str) -> str:
    """The default value of a row as written in the table, with its unit (``0.5 mT``)."""
    for row in _raw_rows():
        if row["id"] == threshold_id:
            return f"{row['value']:g} {row['unit']}".strip()
    raise KeyError(threshold_id)


def parse_threshold_value(text, kind: str) -> float:
    """Read a threshold value with its unit as SI for the row's kind.

    Field kinds also accept a field strength in air (``A/m``, ``Oe``), converted with
    B = mu0 H. Raises :class:`planner.units.UnitError` when the unit does not fit the kind.

    >>> round(parse_threshold_value("4800 A/m", "field") * 1e3, 2)   # ISO 764: 4 800 A/m = 6.03 mT
    6.03
    """
    return _tidy(_parse_threshold_value(text, kind))


def _tidy(value: float) -> float:
    """Drop binary noise from unit conversion (0.9 mT -> 0.0009, not 0.0009000000000000001)."""
    return float(f"{value:.12g}") if math.isfinite(value) else value


def _parse_threshold_value(text, kind: str) -> float:
    if kind in _OTHER_UNITS:
        return _parse_other(text, kind)
    unit_kind = _UNIT_KINDS.get(kind)
    if unit_kind is None:
        raise UnitError(f"threshold kind `{kind}` has no units benchplan can read")
    try:
        return to_si(text, unit_kind)
    except UnitError:
        if unit_kind != "flux density":
            raise
        try:
            return mu_0 * to_si(text, "field strength")
        except UnitError:
            pass
        raise


def _parse_other(text, kind: str) -> float:
    units = _OTHER_UNITS[kind]
    if isinstance(text, (int, float)) and not isinstance(text, bool) and "" in units:
        return float(text)
    parts = str(text).strip().split(None, 1)
    try:
        number = float(parts[0])
    except (ValueError, IndexError):
        raise UnitError(f"must be a {kind.replace('_', ' ')} such as `{_example(kind)}`; got `{text}`") from None
    unit = parts[1].strip() if len(parts) > 1 else ""
    if unit not in units or not math.isfinite(number):
        raise UnitError(f"must be a {kind.replace('_', ' ')} such as `{_example(kind)}`; got `{text}`")
    return number * units[unit]


def _example(kind: str) -> str:
    return {"charge": "45 uC", "flux_index": "50 kG^2 mm^2", "age": "14 year", "ratio": "1"}[kind]


@lru_cache(maxsize=1)
def _rows() -> tuple[ThresholdRow, ...]:
    rows = []
    for raw in _raw_rows():
        text = f"{raw['value']} {raw['unit']}".strip()
        value = parse_threshold_value(text if raw["unit"] else raw["value"], raw["kind"])
        at_distance = raw.get("at_distance")
        rows.append(ThresholdRow(
            id=raw["id"], value=value, unit=SI_UNITS[raw["kind"]], kind=raw["kind"], stricter=raw["stricter"],
            applies_to=raw["applies_to"], source=raw["source"], confidence=str(raw["confidence"]),
            note=raw.get("note"), at_distance_m=to_si(at_distance, "length") if at_distance else None))
    return tuple(rows)


def load_thresholds() -> list[ThresholdRow]:
    """All rows of the default threshold table, values in SI (see :data:`SI_UNITS`)."""
    return list(_rows())


def _is_looser(row: ThresholdRow, value: float) -> bool:
    return value > row.value if row.stricter == "lower" else value < row.value


def effective_thresholds(site_rules: SiteRules) -> list[Threshold]:
    """The thresholds for a setup: the default table with the site's overrides applied.

    Parameters
    ----------
    site_rules : planner.setup.model.SiteRules
        The setup's site rules (``planner.setup.site_rules_of(setup)``).

    Returns
    -------
    list of planner.assessment.Threshold
        One per row of the table, ``origin`` "site" where overridden (``default_value`` and the
        site's ``reason`` kept), "default" elsewhere.

    Raises
    ------
    planner.setup.SetupError
        Listing every bad override: an unknown id (with the known ids and a did-you-mean), a
        value in units of the wrong kind, or a looser value without a written reason.
    """
    overrides = dict(site_rules.thresholds) if site_rules is not None else {}
    rows = _rows()
    by_id = {row.id: row for row in rows}
    problems: list[Problem] = []
    for threshold_id in overrides:
        if threshold_id not in by_id:
            guesses = difflib.get_close_matches(threshold_id, list(by_id), n=3, cutoff=0.5)
            hint = f" Did you mean {', '.join(f'`{g}`' for g in guesses)}?" if guesses else ""
            problems.append(Problem(f"site_rules.thresholds.{threshold_id}",
                                    f"is not a threshold benchplan knows.{hint} Known ids: {', '.join(by_id)}"))
    result = []
    for row in rows:
        override = overrides.get(row.id)
        default = Threshold(id=row.id, value=row.value, unit=row.unit, applies_to=row.applies_to,
                            source=row.source, confidence=row.confidence, origin="default",
                            default_value=row.value, reason=None, note=row.note, kind=row.kind)
        if override is None:
            result.append(default)
            continue
        path = f"site_rules.thresholds.{row.id}.value"
        try:
            value = parse_threshold_value(override.value, row.kind)
        except UnitError as error:
            problems.append(Problem(path, f"{error} (the default is {raw_display(row.id)}, {row.source})"))
            continue
        if not math.isfinite(value) or value < 0 or (value == 0 and row.kind not in ("age",)):
            problems.append(Problem(path, f"must be a positive value; got `{override.value}` "
                                          f"(the default is {raw_display(row.id)}, {row.source})"))
            continue
        reason = (override.reason or "").strip() or None
        if _is_looser(row, value) and reason is None:
            problems.append(Problem(path, f"`{override.value}` is less strict than the default "
                                          f"{raw_display(row.id)} ({row.source}); add a written `reason` "
                                          f"beside it, or use a stricter value"))
            continue
        result.append(Threshold(id=row.id, value=value, unit=row.unit, applies_to=row.applies_to,
                                source=row.source, confidence=row.confidence, origin="site",
                                default_value=row.value, reason=reason, note=row.note, kind=row.kind))
    if problems:
        raise SetupError(problems)
    return result
