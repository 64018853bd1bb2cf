"""Largest field over a zone: proven, finite beside magnets, and close to the truth."""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.fields import field_of_bodies
from planner.physics.zones import zone_reach


def bench_row(count=6, spacing=0.5):
    return [MagnetBody("cylinder", [k * spacing, 0, 0], np.eye(3), [0, 0, 1.3], diameter=0.02, height=0.01)
            for k in range(count)]


def brute_maximum(bodies, low, high, per_side=60):
    axes = [np.linspace(low[k], high[k], per_side if high[k] > low[k] else 1) for k in range(3)]
    points = np.stack(np.meshgrid(*axes, indexing="ij"), axis=-1).reshape(-1, 3)
    return float(np.max(np.linalg.norm(field_of_bodies(bodies, points), axis=1)))


def test_long_zone_beside_a_row_of_magnets_gets_a_close_finite_bound():
    # A seat row 3 m long, 0.3 m from a row of magnets: the first coarse cells are larger than
    # that distance, so a bound over them alone reaches the magnets (and is infinite).
    bodies = bench_row()
    low, high = np.array([-0.5, 0.3, -0.5]), np.array([3.0, 0.9, 0.5])
    found = zone_reach(bodies, [[low, high]], [1e-6])["max_field"][0]
    brute = brute_maximum(bodies, low, high)  # independent computation: dense sampling of the exact field
    assert np.isfinite(found)
    assert brute <= found <= 1.10 * brute  # proven above, refined to 5 % of a sampled value


def test_flat_plan_rectangle_bound_is_close():
    bodies = bench_row(3)
    low, high = np.array([-0.2, 0.1, 0.0]), np.array([1.2, 0.6, 0.0])
    found = zone_reach(bodies, [[low, high]], [1e-6])["max_field"][0]
    brute = brute_maximum(bodies, low, high, per_side=200)
    assert brute <= found <= 1.10 * brute


def test_a_magnet_inside_the_zone_means_no_bound():
    bodies = bench_row(2)
    out = zone_reach(bodies, [[[-0.1, -0.1, -0.1], [0.1, 0.1, 0.1]]], [0.5e-3])
    # the field grows without bound at the magnet's edges (Engel-Herbert & Hesjedal 2005)
    assert np.isinf(out["max_field"][0]) and out["reached"][0, 0]
