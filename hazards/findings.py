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
the site's own rules and competent persons.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from planner.assessment import Threshold
from planner.units import format_flux_density

__all__ = ["Finding", "SEVERITIES", "BLOCKING", "ACTION", "NOTE", "severity_rank", "DEFERRAL",
           "deferral_line", "show", "show_field", "threshold_text", "source_entry", "threshold_map",
           "missing_figure", "is_number", "plain_number"]

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
            "deferral": self.deferral,
        }


# --- numbers as text ------------------------------------------------------------------------

def is_number(value) -> bool:
    """True for a finite real number (not bool, NaN or infinity)."""
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


_UNITS = {
    "length": [(1.0, "m"), (1e-3, "mm")],
    "force": [(1e3, "kN"), (1.0, "N"), (1e-3, "mN")],
    "energy": [(1.0, "J"), (1e-3, "mJ"), (1e-6, "uJ")],
    "voltage": [(1e3, "kV"), (1.0, "V"), (1e-3, "mV"), (1e-6, "uV")],
    "current": [(1.0, "A"), (1e-3, "mA"), (1e-6, "uA"), (1e-9, "nA")],
    "charge": [(1.0, "C"), (1e-3, "mC"), (1e-6, "uC"), (1e-9, "nC")],
    "pressure": [(1e4, "N/cm^2")],
    "speed": [(1.0, "m/s")],
    "mass": [(1.0, "kg"), (1e-3, "g")],
    "moment": [(1.0, "A m^2")],
    "torque": [(1.0, "N m"), (1e-3, "N mm")],
}


def plain_number(value: float) -> str:
    """Three significant figures, without exponents below a million: 3621.7 -> ``3 620``."""
    if is_number(value):
        rounded = float(f"{value:.3g}")
        if 1e3 <= abs(rounded) < 1e6:
            return f"{rounded:,.0f}".replace(",", " ")
    return f"{value:.3g}"


def show_field(tesla) -> str:
    """A flux density for people: ``0.5 mT``, ``1.32 T``, ``0.525 uT``."""
    return format_flux_density(tesla) if is_number(tesla) else "not available"


def show(value, kind: str) -> str:
    """A value with a readable unit: ``show(0.012, "length") -> '12 mm'``; NaN -> ``not available``."""
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
    scales = _UNITS.get(kind, [(1.0, "")])
    if value == 0:
        return f"0 {next((u for f, u in scales if f == 1.0), scales[0][1])}".strip()
    for scale, unit in scales:
        if abs(value) >= scale:
            return f"{plain_number(value / scale)} {unit}".strip()
    scale, unit = scales[-1]
    return f"{plain_number(value / scale)} {unit}".strip()


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
