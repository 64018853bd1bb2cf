"""Iso-field geometry for safety lines: keep-out distances, contours and zone reach.

Pure functions on SI floats and arrays (tesla, metres); the field comes from
``planner.physics.fields`` (exact near a magnet) and from proven dipole bounds far away.
Each figure errs outward; the module docstrings say how.
"""
from planner.physics.zones.contours import field_contours, field_grid, contour_lines
from planner.physics.zones.keep_out import farthest_start_radius, keep_out_radii, keep_out_radius
from planner.physics.zones.reach import zone_reach
from planner.physics.zones.table import KeepOutJob, available_workers, keep_out_table

__all__ = [
    "KeepOutJob",
    "available_workers",
    "contour_lines",
    "farthest_start_radius",
    "field_contours",
    "field_grid",
    "keep_out_radii",
    "keep_out_radius",
    "keep_out_table",
    "zone_reach",
]
