"""Small read-only helpers the rules share: looking things up in the setup and the assessment.

Every helper tolerates missing parts (a setup without zones, an assessment without figures),
so a rule can never fail on an attribute that is simply absent.
"""
from __future__ import annotations

import dataclasses
import math

from hazards.findings import ACTION, Finding, is_number, missing_figure
from hazards.grouping import name_parts, natural_key

__all__ = ["missing_figure_of", "figures_by_value", "items", "magnet_figures_by_id", "setup_magnets_by_id", "activities_of", "audience_has_children",
           "public_present", "implant_wearers_screened", "reaches", "largest_distance_per_magnet",
           "zone_max_field", "largest_zone_field"]


def missing_figure_of(concern: str, what: str, part: str, checklist: str, severity: str = ACTION) -> Finding:
    """The finding for a figure of one part (an activity, a zone) that is not in the assessment.

    Like :func:`hazards.findings.missing_figure`, with the part's id written between backticks
    in the title (as every rule names parts) and standing alone in the finding's id,
    ``<concern>.<part>.missing``: so the same gap at twelve identical stations is one finding
    naming them all (:func:`hazards.grouping.group_findings` merges on the backticked ids).

    Parameters
    ----------
    concern : str
        The rule's concern (``electrical``).
    what : str
        The missing figure, with ``{part}`` where the id goes: ``the electrical figures of {part}``.
    part : str
        The id of the part.
    checklist : str
        What to do instead; may name the part between backticks.
    severity : str
        The finding's severity.

    Returns
    -------
    Finding

    Examples
    --------
    >>> finding = missing_figure_of("electrical", "the electrical figures of {part}", "drop-01", "Measure it.")
    >>> finding.id, finding.title
    ('electrical.drop-01.missing', 'Not checked: the electrical figures of `drop-01` (not among the computed figures)')
    """
    finding = missing_figure(concern, what.format(part=f"`{part}`"), checklist, severity=severity)
    return dataclasses.replace(finding, id=f"{concern}.{part}.missing")


def figures_by_value(label: str, values) -> list[tuple[str, str]]:
    """A finding's per-part figures, parts with the same printed value named in one figure.

    Parameters
    ----------
    label : str
        The figure's label with ``{parts}`` where the ids go: ``implant_keep_out (0.5 mT) from {parts}``.
    values : iterable of (str, str)
        (part id, printed value) in the order to report them.

    Returns
    -------
    list of (str, str)
        One (label, value) per distinct value, in the order each value first occurs; several
        parts are written ``each of magnet-01 to magnet-12`` (ranges only for consecutive
        numbers, :func:`hazards.grouping.name_parts`). Every value is kept.

    Examples
    --------
    >>> figures_by_value("line from {parts}", [("m-1", "87 mm"), ("m-2", "86.9 mm"), ("m-3", "87 mm")])
    [('line from each of m-1 and m-3', '87 mm'), ('line from m-2', '86.9 mm')]
    """
    groups: dict[str, list[str]] = {}
    for part, value in values:
        groups.setdefault(value, []).append(part)
    figures = []
    for value, parts in groups.items():
        parts = sorted(dict.fromkeys(parts), key=natural_key)
        named = ("each of " if len(parts) > 1 else "") + name_parts(parts, code=False)
        figures.append((label.format(parts=named), value))
    return figures


def items(container, name: str) -> list:
    """``container.name`` as a list, or an empty list when absent or None."""
    value = getattr(container, name, None) if container is not None else None
    return list(value) if value else []


def magnet_figures_by_id(assessment) -> dict:
    return {m.id: m for m in items(assessment, "magnets")}


def setup_magnets_by_id(setup) -> dict:
    return {m.id: m for m in items(setup, "magnets")}


def activities_of(setup, *kinds: str) -> list:
    return [a for a in items(setup, "activities") if not kinds or getattr(a, "kind", None) in kinds]


def _audience(setup):
    return getattr(setup, "audience", None)


def public_present(setup) -> bool:
    return "public" in items(_audience(setup), "groups")


def audience_has_children(setup, age_limit: float) -> tuple[bool, str]:
    """(children may be present, why): youngest age under the limit, or unknown with the public present."""
    youngest = getattr(_audience(setup), "youngest_age", None)
    if youngest is not None:
        if youngest < age_limit:
            return True, f"the youngest person present is {youngest}, under {age_limit:g}"
        return False, f"the youngest person present is {youngest}"
    if public_present(setup):
        return True, "the public is present and the youngest age is not given"
    return False, "no children are expected (no youngest age given, no public)"


def implant_wearers_screened(setup) -> bool:
    return getattr(_audience(setup), "implant_wearers", "may_be_present") == "screened_out"


def reaches(max_field, threshold_value: float, flagged: bool = False) -> bool:
    """True when a zone's largest field reaches a threshold (or the calculation flagged it as
    reached for this same value); an unknown field (NaN, or infinite: a magnet in or at the
    zone) counts as reaching it.

    The one place this is decided: the rules and the reports' zone summary
    (:func:`reports.zone_summary.zone_summaries`) both ask here.

    >>> reaches(2e-6, 5e-4), reaches(7e-4, 5e-4), reaches(float("nan"), 5e-4), reaches(float("inf"), 5e-4)
    (False, True, True, True)
    """
    return bool(flagged) or (bool(max_field >= threshold_value) if is_number(max_field) else True)


def largest_zone_field(values) -> float:
    """A zone's largest field over its rows (they share it): infinite kept (a magnet in or at
    the zone, no bound), NaN when any row has no number or there is no row.

    >>> largest_zone_field([2e-6, 2e-6]), largest_zone_field([math.inf]), largest_zone_field([2e-6, None])
    (2e-06, inf, nan)
    """
    values = list(values)
    known = [v for v in values if is_number(v) or v == math.inf]
    return max(known) if values and len(known) == len(values) else math.nan


def largest_distance_per_magnet(assessment, threshold_id: str) -> dict[str, float]:
    """Keep-out distance of each magnet for one threshold id (largest if listed twice); NaN kept."""
    result: dict[str, float] = {}
    for row in items(assessment, "keep_out"):
        if getattr(row, "threshold_id", None) != threshold_id:
            continue
        distance = getattr(row, "distance_m", float("nan"))
        previous = result.get(row.magnet_id)
        if previous is None or (is_number(distance) and (not is_number(previous) or distance > previous)):
            result[row.magnet_id] = distance
    return result


def zone_max_field(assessment, zone_id: str):
    """Largest field in a zone over its reach rows (:func:`largest_zone_field`); None when the zone has no row."""
    values = [r.max_field_T for r in items(assessment, "zone_reach") if getattr(r, "zone_id", None) == zone_id]
    return largest_zone_field(values) if values else None
