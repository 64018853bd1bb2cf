"""Second-order proof that a slab of a cone lies below a threshold.

For g = |B|^2 and any x near a point y, Taylor's theorem gives
g(x) <= g(y) + grad g(y) . (x - y) + (1/2) M |x - y|^2, with M a bound on ||D^2 g|| over the
ball, ||D^2 g|| <= 2 (L1^2 + L0 L2) (L0, L1, L2: bounds on |B|, ||DB||, ||D^2 B||). Splitting
x - y into a part along the cone axis (|alpha| <= s + r (1 - cos delta)) and a part across it
(|w| <= r sin delta) bounds the linear term by |G_along| |alpha| + |G_across| |w|. Near the
direction of farthest reach the across part of grad g is nearly zero, so the cone width
enters only quadratically: coarse cones suffice where it matters.

grad g(y) = 2 Jac(y)^T B(y) uses a central-difference Jacobian of the field model; its error
is bounded by (eps^2 / 6) sqrt(3) L3 (Taylor remainder), plus the model's own derivative error.

Derivative bounds of order n for one body (see ``bounds``; (n+2)! from the Legendre
expansion, the surface-charge forms from integrating 1/r^(n+2) over a plane or a cylinder):
far, d > a: (n+2)! k m / (d - a)^(n+3); near: (n+1)!/(2n) A / D^n + (n+1)! b_n / 4 C / D^(n+1),
b_1 = 2, b_2 = pi/2, b_3 = 4/3.

References
----------
Jackson, Classical Electrodynamics, 3rd ed. (1999), eqs. 3.70 and 5.56; Abramowitz & Stegun,
Handbook of Mathematical Functions (1964), 25.3.4 (central-difference error).
"""
from __future__ import annotations

from math import factorial, pi

import numpy as np

from planner.physics.zones.bounds import K, _ball_geometry, _dipole_field, body_constants, exact_body_field

_CURVED = {0: 0.0, 1: 2.0, 2: pi / 2, 3: 4.0 / 3.0}


def derivative_bound(geometry, spread, order):
    """Bound on ||D^order B|| [T/m^order] over balls of radius ``spread`` (n,) [m]."""
    centre_distance, solid_distance, moments, reach, shift, flat, curved = geometry
    distance = centre_distance - spread[:, None]
    gap = solid_distance - spread[:, None]
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        far = np.where(distance > reach, factorial(order + 2) * K * moments / (distance - shift) ** (order + 3), np.inf)
        if order == 0:
            near = np.full_like(far, np.inf)
        else:
            near = (factorial(order + 1) / (2 * order) * flat / gap**order
                    + factorial(order + 1) * _CURVED[order] / 4 * curved / gap ** (order + 1))
            near = np.where(gap > 0, near, np.inf)
    return np.sum(np.nan_to_num(np.minimum(far, near), nan=np.inf), axis=1)


def _assignment(bodies, points, allowed_error):
    """Which bodies may be taken as dipoles at each point, and the error that costs [T], [T/m]."""
    moments, reach, square = body_constants(bodies)
    far = np.zeros((len(points), len(bodies)), bool)
    error = np.zeros(len(points))
    gradient_error = np.zeros(len(points))
    share = allowed_error / max(len(bodies), 1)
    for i, (body, m, a, s2) in enumerate(zip(bodies, moments, reach, square)):
        distance = np.linalg.norm(points - body.center, axis=1)
        gap = np.where(distance > 1.01 * a, distance - (0.0 if s2 == 0 else a), np.nan)
        with np.errstate(invalid="ignore"):
            remainder = 12 * K * m * s2 / gap**5
            far[:, i] = remainder <= share
        error += np.where(far[:, i], remainder, 0.0)
        gradient_error += np.where(far[:, i], 60 * K * m * s2 / np.where(far[:, i], gap, 1.0) ** 6, 0.0)
    return far, error, gradient_error


def _model(bodies, points, far):
    total = np.zeros_like(points)
    for i, body in enumerate(bodies):
        if far[:, i].any():
            total[far[:, i]] += _dipole_field(body.moment, body.center, points[far[:, i]])
        if (~far[:, i]).any():
            total[~far[:, i]] += exact_body_field(body, points[~far[:, i]])
    return total


def field_and_gradient(bodies, points, allowed_error):
    """Model field B (n, 3) [T], its error bound (n,) [T], grad |B|^2 (n, 3) [T^2/m] and its error bound."""
    far, error, model_gradient_error = _assignment(bodies, points, allowed_error)
    geometry = _ball_geometry(bodies, points)
    step = 1e-3 * np.maximum(np.min(np.maximum(geometry[1], geometry[0] - geometry[3]), axis=1), 1e-9)
    field = _model(bodies, points, far)
    offsets = np.concatenate([step[:, None] * e for e in np.vstack([np.eye(3), -np.eye(3)])])
    shifted = _model(bodies, np.tile(points, (6, 1)) + offsets, np.tile(far, (6, 1))).reshape(6, -1, 3)
    jacobian = (shifted[:3] - shifted[3:]) / (2 * step[None, :, None])  # [j, n, l] = d B_l / d x_j
    third = derivative_bound(geometry, step, 3)
    scale = np.max(np.abs(shifted), axis=(0, 2))
    jacobian_error = (np.sqrt(3) * step**2 / 6 * third + 1e-14 * scale / step
                      + model_gradient_error)
    size = np.linalg.norm(field, axis=1)
    gradient = 2 * np.einsum("jnl,nl->nj", jacobian, field)
    jacobian_norm = np.sqrt(np.sum(jacobian**2, axis=(0, 2)))
    gradient_error = 2 * (jacobian_error * (size + error) + jacobian_norm * error)
    bad = ~np.isfinite(size) | ~np.isfinite(gradient_error) | ~np.all(np.isfinite(gradient), axis=1)
    size[bad] = np.inf
    return size, error, gradient, gradient_error, geometry


def certified_depth(bodies, points, axes, radii, half_angles, threshold, allowed_error, iterations=14):
    """Largest s [m] such that every cone point with radius in [r - s, r] has |B| < threshold.

    ``points`` are the axis points at ``radii`` along unit ``axes``; the cone half-angles are
    ``half_angles`` [rad]. Returns 0 where nothing can be proven (the walk stops there).
    """
    size, error, gradient, gradient_error, geometry = field_and_gradient(bodies, points, allowed_error)
    along = np.abs(np.sum(gradient * axes, axis=1))
    across = np.linalg.norm(gradient - np.sum(gradient * axes, axis=1)[:, None] * axes, axis=1)
    along, across = along + gradient_error, across + gradient_error
    upper = size + error
    across_reach = radii * np.sin(half_angles)
    bulge = radii * (1 - np.cos(half_angles))
    limit = threshold**2 * (1 - 1e-9)

    def holds(depth):
        shift = depth + bulge
        spread = np.hypot(shift, across_reach)
        first = derivative_bound(geometry, spread, 1)
        second = derivative_bound(geometry, spread, 2)
        with np.errstate(invalid="ignore", over="ignore"):
            largest = upper + first * spread
            curvature = 2 * (first**2 + largest * second)
            bound = upper**2 + along * shift + across * across_reach + 0.5 * curvature * spread**2
        return np.nan_to_num(bound, nan=np.inf) <= limit

    low = np.zeros(len(points))
    ok = holds(low)
    high = np.maximum(np.min(np.maximum(geometry[1], geometry[0] - geometry[3]), axis=1), 1e-9)
    high = np.minimum(high, radii)
    for _ in range(iterations):
        middle = 0.5 * (low + high)
        fits = holds(middle)
        low = np.where(fits, middle, low)
        high = np.where(fits, high, middle)
    return np.where(ok, low, -1.0), size, error
