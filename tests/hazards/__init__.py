"""Tests of the hazard rules. Builders here make Assessment figures directly, so each rule can
be checked just above and just below its threshold without running any physics."""
from __future__ import annotations

import textwrap

from planner.assessment import (Assessment, InductionFigures, KeepOut, MagnetFigures, PairFigures,
                                ProjectileFigures, ShippingFigures, ZoneReach)
from planner.setup import parse_setup

DISC = "{id: disc, shape: cylinder, diameter: 10 mm, height: 5 mm, grade: N42, at: [0 mm, 0 mm, 2.5 mm], magnetization: +z}"


def setup_from(extra: str = "", magnets: str = f"  - {DISC}\n", audience: str = "") -> object:
    """A validated setup: one disc unless `magnets` is given, plus any extra top-level YAML."""
    text = "title: rule test\n" + (textwrap.dedent(audience) if audience else "") + "magnets:\n" + magnets
    return parse_setup(text + textwrap.dedent(extra))


def magnet(id="disc", **changes) -> MagnetFigures:
    values = dict(id=id, shape="cylinder", size="10 x 5 mm", material="N42", remanence_T=1.32,
                  remanence_note="", count=1, mass_kg=0.003, volume_m3=3.9e-7, moment_A_m2=0.41,
                  pole_face_field_T=0.3, pole_area_m2=7.85e-5, flux_index_kG2_mm2=700.0,
                  fits_small_parts_cylinder=True, max_working_temperature_C=80.0,
                  coercivity_min_A_per_m=955e3, family="NdFeB")
    values.update(changes)
    return MagnetFigures(**values)


def assessment(**parts) -> Assessment:
    return Assessment(title="rule test", program_version="test", **parts)


def keep_out(threshold_id, distance, magnet_id="disc", threshold_T=0.0) -> KeepOut:
    return KeepOut(threshold_id=threshold_id, threshold_T=threshold_T, magnet_id=magnet_id, distance_m=distance,
                   origin="default", source="")


def zone_reach(zone_id, threshold_id, max_field, people=True, kind="seating", contains=()) -> ZoneReach:
    return ZoneReach(zone_id=zone_id, zone_kind=kind, threshold_id=threshold_id, threshold_T=0.0,
                     max_field_T=max_field, reached=False, people=people, contains=list(contains))


def pair(**changes) -> PairFigures:
    values = dict(activity_id="join", magnet_id="disc", other_id="disc2", other_kind="magnet", approach="hand",
                  force_at_contact_N=20.0, force_at_finger_gap_N=5.0, finger_gap_m=0.01,
                  pressure_at_finger_gap_Pa=5.0 / magnet().pole_area_m2,  # the gap force over the pole area
                  snap_distance_bench_m=0.03, snap_distance_hand_m=0.01, pinch_energy_J=0.05,
                  impact_speed_m_per_s=2.0, flip_torque_N_m=None, both_brittle=True, upper_bound=False)
    values.update(changes)
    return PairFigures(**values)


def projectile(**changes) -> ProjectileFigures:
    values = dict(item_id="spanner", magnet_id="disc", distance_m=0.5, pull_off_distance_m=0.1,
                  lift_distance_m=0.05, mass_kg=0.1, within_pull=False, within_lift=False)
    values.update(changes)
    return ProjectileFigures(**values)


def package(at_2_1, at_4_6, activity_id="send") -> ShippingFigures:
    return ShippingFigures(activity_id=activity_id, magnet_ids=["disc"], pieces=1, total_moment_A_m2=1.0,
                           field_at_2_1_m_T=at_2_1, field_at_4_6_m_T=at_4_6, shielded=False)


def induction(values, activity_id="run", kind="pass_through_coil") -> InductionFigures:
    return InductionFigures(activity_id=activity_id, kind=kind, values=dict(values))


def ids(findings) -> dict:
    """Findings by id."""
    return {f.id: f for f in findings}
