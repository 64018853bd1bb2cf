"""Keep-out distances, contour lines and zone reach for the field thresholds in force.

Attribution for several magnets: a point belongs to the magnet whose centre is nearest (see
:func:`planner.physics.zones.keep_out_radius`); the total field of all magnets is used
everywhere, so a region where the fields of two magnets add up is counted.

References
----------
Thresholds: hazards/thresholds.yaml (ICNIRP 2009; Directive 2013/35/EU; ISO 14117; ISO 764;
National Research Council, Prudent Practices in the Laboratory (2011), Table 7.1).
"""
from __future__ import annotations

import numpy as np

from planner.assessment import Contour, KeepOut, Threshold, ZoneReach
from planner.materials import MAX_PERMANENT_MAGNET_REMANENCE_T
from planner.physics.zones import KeepOutJob, field_contours, zone_reach
from planner.setup import Setup
from planner.setup.geometry import bodies_of

#: Thresholds drawn on the maps, when present (the most asked-for lines).
MAP_THRESHOLDS = ("implant_keep_out", "cards", "projectile_line", "watches", "instruments")
#: Thresholds that get a keep-out distance per magnet: people with implants, cards, the projectile line,
#: watches, instruments, storage media and the public exposure limit. The context rows (the 2022 MR
#: contour, the implant makers' test level, the enhanced watch class) are compared with the zones only.
KEEP_OUT_THRESHOLDS = MAP_THRESHOLDS + ("storage_media", "public_exposure")
#: Zone kinds where people are unless the file says otherwise.
PEOPLE_KINDS = {"seating", "standing", "walkway", "door", "desk", "next_room", "stage"}
MAP_RESOLUTION = 241


def field_thresholds(thresholds: list[Threshold]) -> list[Threshold]:
    """Thresholds on |B| that a permanent magnet can reach outside itself.

    The field outside a permanent magnet stays below its remanence, itself below about
    1.5 T (standards.md, permanent-magnet materials), so higher limits (2 T, 8 T) are met
    everywhere outside and need no line.
    """
    return [t for t in thresholds if t.kind == "field" and 0 < t.value < MAX_PERMANENT_MAGNET_REMANENCE_T]


def keep_out_distances(setup: Setup, thresholds: list[Threshold]) -> list[KeepOut]:
    """The keep-out distance of every magnet for every field threshold [m from the centre]."""
    return PendingKeepOut(setup, thresholds).result()


class PendingKeepOut:
    """:func:`keep_out_distances` started in worker processes; :meth:`result` collects them.

    The caller can work out other figures meanwhile; the workers use every core. Call
    :meth:`close` (or :meth:`result`) so that no worker is left running.
    """

    def __init__(self, setup: Setup, thresholds: list[Threshold]):
        bodies = bodies_of(setup)
        self.magnet_ids = [m.id for m in setup.magnets]
        self.rows = [t for t in field_thresholds(thresholds) if t.id in KEEP_OUT_THRESHOLDS]
        self.values = np.unique([t.value for t in self.rows])  # equal values share one computation
        self.job = KeepOutJob(bodies, self.values) if bodies and self.rows else None

    def result(self) -> list[KeepOut]:
        if self.job is None:
            return []
        table = self.job.result()
        result = []
        for index, magnet_id in enumerate(self.magnet_ids):
            radius_of = dict(zip(self.values.tolist(), table[index]))
            result += [KeepOut(threshold_id=t.id, threshold_T=t.value, magnet_id=magnet_id,
                               distance_m=float(radius_of[t.value]), origin=t.origin, source=t.source)
                       for t in self.rows]
        return result

    def close(self) -> None:
        if self.job is not None:
            self.job.close()


def map_planes(setup: Setup) -> tuple[float, float]:
    """(height of the plan plane, y of the elevation plane) [m]: through the strongest magnet's centre."""
    bodies = bodies_of(setup)
    strongest = max(bodies, key=lambda b: float(np.linalg.norm(b.moment)))
    return float(strongest.center[2]), float(strongest.center[1])


def contours(setup: Setup, thresholds: list[Threshold], planes: dict[str, float] | None = None) -> list[Contour]:
    """Plan and elevation contour lines of the total |B| for the map thresholds.

    ``planes`` may give the plane of either view [m]: {"plan": z, "elevation": y}; only the
    views named are drawn then. Default: both, through the strongest magnet's centre.
    """
    bodies = bodies_of(setup)
    rows = [t for t in field_thresholds(thresholds) if t.id in MAP_THRESHOLDS]
    if not bodies or not rows:
        return []
    height, across = map_planes(setup)
    chosen = planes or {"plan": height, "elevation": across}
    result = []
    for view, offset in chosen.items():
        lines = field_contours(bodies, [t.value for t in rows], view=view, offset=offset,
                               resolution=MAP_RESOLUTION)
        for threshold in rows:
            polylines = lines.get(float(threshold.value), [])
            result.append(Contour(threshold_id=threshold.id, threshold_T=threshold.value, view=view,
                                  plane_offset_m=offset,
                                  lines=[[(float(u), float(v)) for u, v in line] for line in polylines]))
    return result


def zone_reaches(setup: Setup, thresholds: list[Threshold]) -> list[ZoneReach]:
    """For every zone: the largest |B| in it and which thresholds' regions reach it.

    A zone's own `instrument_limit` is checked as an extra threshold with the id
    ``<zone id>:instrument_limit``.
    """
    bodies = bodies_of(setup)
    rows = field_thresholds(thresholds)
    if not bodies or not setup.zones or not rows:
        return []
    result = []
    for zone in setup.zones:
        zone_rows = list(rows)
        if zone.instrument_limit is not None:
            zone_rows.append(Threshold(id=f"{zone.id}:instrument_limit", value=zone.instrument_limit, unit="T",
                                       applies_to=f"instruments in {zone.id}", source="the setup file (zone's own limit)",
                                       confidence="site", origin="site"))
        box = np.array([[zone.corner_from, zone.corner_to]])
        reach = zone_reach(bodies, box, [t.value for t in zone_rows])
        people = zone.people if zone.people is not None else zone.kind in PEOPLE_KINDS
        for position, threshold in enumerate(zone_rows):
            result.append(ZoneReach(zone_id=zone.id, zone_kind=zone.kind, threshold_id=threshold.id,
                                    threshold_T=threshold.value, max_field_T=float(reach["max_field"][0]),
                                    reached=bool(reach["reached"][0, position]), people=people,
                                    contains=list(zone.contains), depth_m=float(reach["depth"][0, position])))
    return result
