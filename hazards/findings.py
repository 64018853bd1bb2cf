"""Findings: what the hazard rules conclude, as plain data for the terminal, JSON and the PDF.

Three severities, from most to least pressing:

``blocking``
    resolve before work starts (a figure is past a threshold where people are, or a check
    could not be made);
``action``
    a precaution to put in place and tick off during the work;
``note``
    for awareness; nothing has to change.

A finding carries the figures it rests on (label, value with unit), why it matters, the usual
cautions, checklist items, the thresholds used with their sources, and the line deferring to
the site's own rules and competent persons. A finding merged from several that said the same of
different parts (``hazards.grouping``) lists those parts in ``parts``.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from planner.assessment import Threshold
from planner.units import LENGTH_PREFIXES, MICRO_ASCII, format_flux_density, format_number, format_quantity

__all__ = ["Finding", "SEVERITIES", "BLOCKING", "ACTION", "NOTE", "severity_rank", "DEFERRAL",
           "deferral_line", "show", "show_field", "threshold_text", "source_entry", "threshold_map",
           "missing_figure", "is_number", "plain_number", "sentence"]

BLOCKING, ACTION, NOTE = "blocking", "action", "note"
#: Severities from least to most pressing.
SEVERITIES = (NOTE, ACTION, BLOCKING)
SEVERITY_MEANINGS = {
    BLOCKING: "resolve before work starts",
    ACTION: "put in place and tick off during the work",
    NOTE: "for awareness",
}

DEFERRAL = ("These figures support, and never replace, the site's own risk assessment, local codes and "
            "the judgement of its competent persons; where they differ, the site's rules win.")


def severity_rank(severity: str) -> int:
    """0 for ``note``, 1 for ``action``, 2 for ``blocking``."""
    return SEVERITIES.index(severity)


def deferral_line(setup=None) -> str:
    """The deferral line, naming the site's competent persons when the setup lists them."""
    rules = getattr(setup, "site_rules", None)
    persons = list(getattr(rules, "competent_persons", None) or [])
    if not persons:
        return DEFERRAL
    names = "; ".join(f"{p.name} ({p.role})" for p in persons)
    return f"{DEFERRAL} Competent persons named by the site: {names}."


@dataclass
class Finding:
    """One conclusion of a hazard rule."""

    id: str
    severity: str
    title: str
    figures: list[tuple[str, str]] = field(default_factory=list)
    why: str = ""
    cautions: list[str] = field(default_factory=list)
    checklist: list[str] = field(default_factory=list)
    sources: list[tuple[str, str]] = field(default_factory=list)
    deferral: str = DEFERRAL
    concern: str = ""
    #: The ids of the parts a merged finding applies to, in natural order; empty for a finding
    #: that a rule gave as it is (``hazards.grouping.group_findings`` fills it).
    parts: list[str] = field(default_factory=list)

    def __post_init__(self):
        if self.severity not in SEVERITIES:
            raise ValueError(f"severity must be one of {SEVERITIES}; got {self.severity!r}")

    @property
    def rank(self) -> int:
        return severity_rank(self.severity)

    @property
    def blocking(self) -> bool:
        """Must this be resolved before work starts?"""
        return self.severity == BLOCKING

    def to_dict(self) -> dict:
        """JSON-ready dict."""
        return {
            "id": self.id, "severity": self.severity, "severity_meaning": SEVERITY_MEANINGS[self.severity],
            "concern": self.concern, "title": self.title,
            "figures": [{"label": label, "value": value} for label, value in self.figures],
            "why": self.why, "cautions": list(self.cautions), "checklist": list(self.checklist),
            "sources": [{"threshold": tid, "source": text} for tid, text in self.sources],
            "deferral": self.deferral, "parts": list(self.parts),
        }


# --- numbers as text ------------------------------------------------------------------------

def is_number(value) -> bool:
    """True for a finite real number (not bool, NaN or infinity)."""
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


# kind -> (unit written after the number, the SI value of one of it, prefixes allowed).
# The prefixes of mass go on the gram (kg, g).
_UNITS = {
    "length": ("m", 1.0, LENGTH_PREFIXES),
    "force": ("N", 1.0, ("k", "", "m")),
    "energy": ("J", 1.0, ("", "m", "u")),
    "voltage": ("V", 1.0, ("k", "", "m", "u")),
    "current": ("A", 1.0, ("", "m", "u", "n")),
    "charge": ("C", 1.0, ("", "m", "u", "n")),
    "pressure": ("N/cm^2", 1e4, ("",)),
    "speed": ("m/s", 1.0, ("",)),
    "mass": ("kg", 1.0, ("k", "")),
    "moment": ("A m^2", 1.0, ("",)),
}


def sentence(text: str) -> str:
    """A remark as a sentence: ``the load gets 1 V`` -> ``The load gets 1 V.``; empty stays empty.

    Only a first word of lower-case letters is capitalised, so an id or a symbol (``mu0``) that
    opens a remark stays as written; a remark already ending a sentence gets no second stop.

    >>> sentence("the load gets 1 V"), sentence("mu0 sigma d is large"), sentence("the coil is warm.")
    ('The load gets 1 V.', 'mu0 sigma d is large.', 'The coil is warm.')
    """
    text = text.strip()
    if not text:
        return ""
    first = text.split(" ", 1)[0]
    if first.isalpha() and first.islower():
        text = text[0].upper() + text[1:]
    return text if text.endswith((".", "!", "?")) else text + "."


def plain_number(value: float) -> str:
    """Three significant figures, without exponents below a million: 3621.7 -> ``3 620``."""
    return format_number(value) if is_number(value) else f"{value:.3g}"


def show_field(tesla) -> str:
    """A flux density for people: ``0.5 mT``, ``1.32 T``, ``0.525 uT``."""
    return format_flux_density(tesla) if is_number(tesla) else "not available"


def approach_text(approach: str) -> str:
    """How a pair is brought together, in words: ``held in the hand`` or ``sliding on the bench``."""
    return "held in the hand" if approach == "hand" else "sliding on the bench"


def none_if_zero(value, formatted: str) -> str:
    """A handling figure as printed: ``none`` where it is exactly 0, else ``formatted``.

    A snap distance of 0 m means the attraction stays below the grip or the bench friction
    at every gap (the parts only stick when put in contact); a pinch energy or impact speed
    of exactly 0 means they jump together only inside the finger gap. "0 m" or "0 J" says
    neither.

    >>> none_if_zero(0.0, "0 m"), none_if_zero(0.03, "30 mm")
    ('none', '30 mm')
    """
    return "none" if is_number(value) and value == 0 else formatted


def show(value, kind: str) -> str:
    """A value with a readable unit for the terminal and JSON: ``show(0.012, "length") -> '12 mm'``.

    Micro is written ``u``; NaN, infinity and non-numbers give ``not available``. The units and
    prefixes for each kind are in ``_UNITS``; the formatting is :func:`planner.units.format_quantity`.
    """
    if not is_number(value):
        return "not available"
    if kind in ("field", "field_at_distance", "source_field"):
        return show_field(value)
    if kind == "temperature":
        return f"{value:.4g} degC"
    if kind == "ratio":
        return f"{value:.3g}"
    if kind == "flux_index":
        return f"{plain_number(value / 1e-8)} kG^2 mm^2"
    if kind == "age":
        return f"{value:g} years"
    if kind == "coercivity":
        return f"{value / 1e3:.3g} kA/m"
    if kind == "torque":  # below 1 N m in newton millimetres, as small torques are usually written
        large = value == 0 or abs(value) >= 1 - 5e-4  # 0, or 1 N m or more once rounded to three figures
        return format_quantity(value if large else value / 1e-3, "N m" if large else "N mm", prefixes=("",))
    if kind not in _UNITS:
        return plain_number(value)
    unit, size, prefixes = _UNITS[kind]
    return format_quantity(value / size, unit, micro=MICRO_ASCII, prefixes=prefixes)


def threshold_text(threshold: Threshold) -> str:
    """``0.5 mT (default)`` or ``0.3 mT (site rule; default 0.5 mT; reason: ...)``."""
    value = show(threshold.value, threshold.kind)
    if threshold.origin == "site":
        extra = f"site rule; default {show(threshold.default_value, threshold.kind)}"
        if threshold.reason:
            extra += f"; reason: {threshold.reason}"
        return f"{value} ({extra})"
    return f"{value} (default)"


def source_entry(threshold: Threshold) -> tuple[str, str]:
    """(threshold id, source with confidence and any confirm-against-edition note)."""
    text = f"{threshold.source} [{threshold.confidence}]"
    if threshold.note:
        text += f"; {threshold.note}"
    if threshold.origin == "site":
        text += f"; value set by the site's rules ({threshold_text(threshold)})"
    return threshold.id, text


def threshold_map(thresholds) -> dict[str, Threshold]:
    """Thresholds by id: the given ones, with any missing row filled from the default table."""
    from hazards.thresholds import effective_thresholds
    from planner.setup.model import SiteRules

    table = {t.id: t for t in effective_thresholds(SiteRules())}
    for threshold in thresholds or []:
        table[threshold.id] = threshold
    return table


def missing_figure(concern: str, what: str, checklist: str, severity: str = ACTION) -> Finding:
    """The finding a rule returns when a figure it needs is not in the assessment."""
    slug = "-".join("".join(c if c.isalnum() else " " for c in what.lower()).split())[:60]
    return Finding(
        id=f"{concern}.missing.{slug}", severity=severity, concern=concern,
        title=f"Not checked: {what} (not among the computed figures)",
        why=f"The {concern} check needs {what}; without it benchplan cannot say whether a threshold is passed.",
        checklist=[checklist])
