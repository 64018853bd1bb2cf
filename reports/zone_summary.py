"""One summary per zone from the assessment's zone rows (one row per zone and threshold).

The assessment (:class:`planner.assessment.ZoneReach`) gives a row for every zone and every
field threshold, each repeating the zone's largest field. Printed as they are, a zone's largest
field appears once per threshold. :func:`zone_summaries` gathers them into one summary per zone:
its largest field once, the thresholds it was checked against, and those whose regions reach
it. Shared by the PDF table and the terminal summary; pure, and computes no physics. Whether a
threshold reaches a zone, and the zone's largest field, are decided where the rules decide them
(:func:`hazards.rules.common.reaches`, :func:`hazards.rules.common.largest_zone_field`), so the
table and the findings cannot disagree; an unknown field counts as reaching.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from hazards.findings import is_number
from hazards.rules.common import largest_zone_field, reaches

__all__ = ["ZoneSummary", "zone_summaries", "checked_in_every_zone", "UNBOUNDED", "own_limit_name",
           "largest_field_text"]

#: How a zone without a finite bound on its field is described (a magnet in or at it).
UNBOUNDED = "not bounded: a magnet is in or at the zone"


@dataclass(frozen=True)
class ZoneSummary:
    """Everything the zone rows say about one zone.

    ``largest_field_T`` is the proven upper bound of |B| over the zone [T]: infinite when a
    magnet is in or at the zone (no bound), NaN when no row gives a number. ``checked`` holds
    ``(threshold id, value [T])`` of every threshold the zone was checked against, ``reached``
    ``(threshold id, value [T], depth [m])`` of those whose regions reach it, depth being how far
    into the zone, from its nearest side, the field surely reaches the threshold (0 if not known).
    """

    zone_id: str
    kind: str
    people: bool
    contains: tuple[str, ...]
    largest_field_T: float
    checked: tuple[tuple[str, float], ...] = field(default=())
    reached: tuple[tuple[str, float, float], ...] = field(default=())

    @property
    def bounded(self) -> bool:
        """False when no finite upper bound of the field in the zone exists (a magnet in or at it)."""
        return not math.isinf(self.largest_field_T)


def own_limit_name(threshold_id: str) -> str | None:
    """The name of a zone's own limit in a row's threshold id, None for a table threshold.

    :func:`planner.calculations.keep_out.zone_reaches` writes a zone's own limit as
    ``<zone id>:instrument_limit``.

    >>> own_limit_name("desk:instrument_limit"), own_limit_name("implant_keep_out")
    ('instrument_limit', None)
    """
    return threshold_id.split(":", 1)[1] if ":" in threshold_id else None


def largest_field_text(summary: ZoneSummary, show) -> str:
    """A zone's largest field as printed: ``show(value)``, :data:`UNBOUNDED`, or ``not known`` (NaN)."""
    if not summary.bounded:
        return UNBOUNDED
    return show(summary.largest_field_T) if is_number(summary.largest_field_T) else "not known"


def zone_summaries(rows) -> list[ZoneSummary]:
    """The zone rows of an assessment as one summary per zone, zones and thresholds in row order.

    Parameters
    ----------
    rows : iterable of planner.assessment.ZoneReach
        One row per zone and threshold.

    Returns
    -------
    list of ZoneSummary
        A threshold counts as reached when :func:`hazards.rules.common.reaches` says so (the row
        flags it, the zone's largest field is at or above it, or that field is not known); the
        largest field is :func:`hazards.rules.common.largest_zone_field` of the zone's rows
        (they share it): infinite kept, NaN if any row has no number.

    Examples
    --------
    >>> from planner.assessment import ZoneReach
    >>> rows = [ZoneReach("door", "door", "a", 5e-4, 2e-6, False, True, []),
    ...         ZoneReach("door", "door", "b", 1e-6, 2e-6, True, True, [], depth_m=0.01)]
    >>> summary, = zone_summaries(rows)
    >>> summary.largest_field_T, [t for t, _ in summary.checked], summary.reached
    (2e-06, ['a', 'b'], (('b', 1e-06, 0.01),))
    """
    order: dict[str, list] = {}
    for row in rows:
        order.setdefault(row.zone_id, []).append(row)
    result = []
    for zone_id, members in order.items():
        largest = largest_zone_field(r.max_field_T for r in members)
        checked, reached = {}, {}
        for r in members:
            checked.setdefault(r.threshold_id, r.threshold_T)
            if reaches(r.max_field_T, r.threshold_T, r.reached):
                depth = r.depth_m if is_number(getattr(r, "depth_m", 0.0)) else 0.0
                previous = reached.get(r.threshold_id)
                reached[r.threshold_id] = (r.threshold_T, max(depth, previous[1]) if previous else depth)
        first = members[0]
        result.append(ZoneSummary(
            zone_id=zone_id, kind=first.zone_kind, people=any(r.people for r in members),
            contains=tuple(dict.fromkeys(c for r in members for c in r.contains)), largest_field_T=largest,
            checked=tuple(checked.items()),
            reached=tuple((tid, value, depth) for tid, (value, depth) in reached.items())))
    return result


def checked_in_every_zone(summaries) -> list[tuple[str, float]]:
    """``(threshold id, value [T])`` of the thresholds every zone was checked against, in order.

    Parameters
    ----------
    summaries : list of ZoneSummary

    Returns
    -------
    list of tuple
        Empty when there are no zones; a zone's own limit (checked in that zone only) is left out.
    """
    if not summaries:
        return []
    shared = set.intersection(*({tid for tid, _ in s.checked} for s in summaries))
    return [(tid, value) for tid, value in summaries[0].checked if tid in shared]
