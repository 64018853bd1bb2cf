"""The Assessment: every figure benchplan computed for a setup, as plain data.

Plain dataclasses of SI floats, strings and lists, so hazards can read them and reports can
print them without computing any physics. JSON keys are snake_case with SI unit suffixes
(``distance_m``, ``peak_emf_V``, ``force_N``).
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from typing import Any


@dataclass(frozen=True)
class Threshold:
    """One threshold row as used for this setup (default table or site override).

    ``value`` is SI (T for fields, N for forces, J for energies, V for voltages...).
    ``origin`` is "default" or "site"; ``reason`` is the site's written reason for a looser value.
    """

    id: str
    value: float
    unit: str
    applies_to: str
    source: str
    confidence: str
    origin: str = "default"
    default_value: float | None = None
    reason: str | None = None
    note: str | None = None
    kind: str = "field"


@dataclass
class MagnetFigures:
    """Figures of one magnet in the setup."""

    id: str
    shape: str
    size: str
    material: str
    remanence_T: float
    remanence_note: str
    count: int
    mass_kg: float
    volume_m3: float
    moment_A_m2: float
    pole_face_field_T: float
    pole_area_m2: float
    flux_index_kG2_mm2: float
    fits_small_parts_cylinder: bool
    max_working_temperature_C: float | None
    coercivity_min_A_per_m: float | None
    family: str


@dataclass
class KeepOut:
    """The largest distance from a magnet's centre at which |B| reaches a threshold."""

    threshold_id: str
    threshold_T: float
    magnet_id: str
    distance_m: float
    origin: str
    source: str


@dataclass
class Contour:
    """Iso-|B| lines of the whole setup on one plane, in plane coordinates [m]."""

    threshold_id: str
    threshold_T: float
    view: str              # "plan" (x-y at a height) or "elevation" (x-z at a y)
    plane_offset_m: float  # the height (plan) or y (elevation) of the plane
    lines: list[list[tuple[float, float]]]


@dataclass
class ZoneReach:
    """How a threshold's region meets a zone of the setup."""

    zone_id: str
    zone_kind: str
    threshold_id: str
    threshold_T: float
    max_field_T: float
    reached: bool
    people: bool
    contains: list[str]
    depth_m: float = 0.0   # how far into the zone, from its nearest side, the field surely reaches the threshold


@dataclass
class PairFigures:
    """Handling figures of a magnet brought to another magnet or to steel."""

    activity_id: str | None
    magnet_id: str
    other_id: str
    other_kind: str                 # "magnet", "steel_surface"
    approach: str                   # "hand" or "sliding_on_bench"
    force_at_contact_N: float
    force_at_finger_gap_N: float
    finger_gap_m: float
    pressure_at_finger_gap_Pa: float  # that force over the smaller pole face (a lower bound of the pad pressure)
    snap_distance_bench_m: float
    snap_distance_hand_m: float
    pinch_energy_J: float
    impact_speed_m_per_s: float
    flip_torque_N_m: float | None
    both_brittle: bool
    upper_bound: bool               # image method: an upper bound (no saturation)
    warnings: list[str] = field(default_factory=list)


@dataclass
class ProjectileFigures:
    """How far a loose steel item is from being pulled or lifted to a magnet."""

    item_id: str
    magnet_id: str
    distance_m: float               # from the item to the magnet's nearest surface along the line of centres
    pull_off_distance_m: float      # within this the magnetic force exceeds friction x weight
    lift_distance_m: float          # within this it exceeds the weight
    mass_kg: float
    within_pull: bool
    within_lift: bool


@dataclass
class InductionFigures:
    """Figures of one induction or eddy-current activity (keys depend on the kind)."""

    activity_id: str
    kind: str
    values: dict[str, Any]
    warnings: list[str] = field(default_factory=list)


@dataclass
class ShippingFigures:
    """Field of a packaged set of magnets at the air-transport measuring distances."""

    activity_id: str
    magnet_ids: list[str]
    pieces: int
    total_moment_A_m2: float
    field_at_2_1_m_T: float
    field_at_4_6_m_T: float
    shielded: bool


@dataclass
class Assessment:
    """Everything computed for one setup, plus the findings the hazard rules add."""

    title: str
    program_version: str
    thresholds: list[Threshold] = field(default_factory=list)
    magnets: list[MagnetFigures] = field(default_factory=list)
    keep_out: list[KeepOut] = field(default_factory=list)
    contours: list[Contour] = field(default_factory=list)
    zone_reach: list[ZoneReach] = field(default_factory=list)
    pairs: list[PairFigures] = field(default_factory=list)
    projectiles: list[ProjectileFigures] = field(default_factory=list)
    steel_lift_gradient_distance_m: dict[str, float] = field(default_factory=dict)
    induction: list[InductionFigures] = field(default_factory=list)
    shipping: list[ShippingFigures] = field(default_factory=list)
    assumptions: list[str] = field(default_factory=list)
    references: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    findings: list[Any] = field(default_factory=list)

    def threshold(self, threshold_id: str) -> Threshold | None:
        """The threshold row with this id, if the assessment used it."""
        return next((t for t in self.thresholds if t.id == threshold_id), None)

    def to_dict(self) -> dict:
        """JSON-ready dict: SI numbers with unit suffixes in the keys; NaN and infinity become None."""
        return _plain(self)


def _plain(value):
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        if hasattr(value, "to_dict") and not isinstance(value, Assessment):
            return value.to_dict()
        return {f.name: _plain(getattr(value, f.name)) for f in dataclasses.fields(value)}
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if hasattr(value, "item") and callable(value.item):  # numpy scalars
        return _plain(value.item())
    return value
