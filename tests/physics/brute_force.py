"""Brute-force references for the keep-out tests: the exact field of planner.physics.fields
sampled densely, an independent computation of what the proofs bound.

* :func:`in_own_cell`: which points belong to a magnet (nearest centre, as the program
  attributes them);
* :func:`largest_field_beyond`: the largest |B| found at random points of a cell just beyond a
  radius;
* :func:`farthest_found`: a lower bound of the exact keep-out distance (shells, then a local
  search with bisection along each ray).
"""
from __future__ import annotations

import numpy as np

from planner.physics.fields import field_of_bodies


def in_own_cell(bodies, index, points):
    """Points (n, 3) at least as close to the centre of body ``index`` as to any other (its
    Voronoi cell; points on a face count, up to a rounding of 1e-12)."""
    own = np.linalg.norm(points - bodies[index].center, axis=1)
    others = [b.center for i, b in enumerate(bodies) if i != index]
    if not others:
        return np.ones(len(points), bool)
    nearest = np.min(np.linalg.norm(points[:, None] - np.array(others)[None], axis=2), axis=1)
    return own <= nearest * (1 + 1e-12)


def largest_field_beyond(bodies, index, radius, rng, count=60000):
    """Brute force: largest exact |B| at random points between radius and 1.4 radius."""
    unit = rng.normal(size=(count, 3))
    unit /= np.linalg.norm(unit, axis=1)[:, None]
    distance = radius * (1 + 0.4 * rng.random(count) ** 2)
    points = bodies[index].center + distance[:, None] * unit
    points = points[in_own_cell(bodies, index, points)]
    return float(np.nanmax(np.linalg.norm(field_of_bodies(bodies, points), axis=1)))


def farthest_found(bodies, index, threshold, start, rng, directions=6000):
    """Brute force lower bound of the exact distance: shells from ``start`` inward, then a
    local search around each of the first few directions that reach the threshold on the
    outermost shell with any (random turns, bisection along each ray)."""
    unit = rng.normal(size=(directions, 3))
    unit /= np.linalg.norm(unit, axis=1)[:, None]
    floor = bodies[index].bounding_radius
    centre = bodies[index].center

    def reached(points):
        keep = in_own_cell(bodies, index, points)
        values = np.zeros(len(points))
        values[keep] = np.linalg.norm(field_of_bodies(bodies, points[keep]), axis=1)
        return np.nan_to_num(values) >= threshold

    shells = np.geomspace(start, max(floor, 1e-4), 240)
    for outer, radius in zip(np.concatenate([[start], shells[:-1]]), shells):
        hits = reached(centre + radius * unit)
        if hits.any():
            break
    else:
        return floor
    # a local search from each of a few hit directions: the farthest point can lie in a
    # different lobe than the first hit (a neighbour's field spilling over a face)
    found = radius
    for best in unit[hits][:4]:
        reach = radius
        for spread in (0.2, 0.05, 0.01):
            trial = best + spread * rng.normal(size=(400, 3))
            trial = np.vstack([best, trial / np.linalg.norm(trial, axis=1)[:, None]])
            low, high = np.full(len(trial), 0.0), np.full(len(trial), outer)
            low[reached(centre + reach * trial)] = reach
            for _ in range(25):
                middle = np.where(low > 0, 0.5 * (low + high), reach)
                ok = reached(centre + middle[:, None] * trial) & (low > 0)
                low = np.where(ok, middle, low)
                high = np.where(ok | (low == 0), high, middle)
            reach, best = max(reach, float(low.max())), trial[np.argmax(low)]
        found = max(found, reach)
    return found
