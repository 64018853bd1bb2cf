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

from planner.physics.zones.bounds import K, _ball_geometry, dipole_assignment, exact_body_field

_CURVED = {0: 0.0, 1: 2.0, 2: pi / 2, 3: 4.0 / 3.0}


def _columns(geometry, chosen):
    """The geometry tuple of ``_ball_geometry`` restricted to the chosen bodies."""
    centre_distance, solid_distance, *constants = geometry
    return (centre_distance[:, chosen], solid_distance[:, chosen], *[c[chosen] for c in constants])


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


def _dipole_field_and_jacobian(bodies, points, far):
    """Summed point-dipole field (n, 3) and Jacobian (n, 3, 3) [j, l] = dB_l/dx_j of the far pairs.

    dB_l/dx_j = 3 k / r^4 [(m.u)(delta_jl - 5 u_j u_l) + m_j u_l + m_l u_j] (derivative of
    Jackson eq. 5.56).
    """
    field = np.zeros((len(points), 3))
    jacobian = np.zeros((len(points), 3, 3))
    if not far.any():
        return field, jacobian
    moments = np.array([b.moment for b in bodies])
    offset = points[:, None, :] - np.array([b.center for b in bodies])[None]
    distance = np.sqrt(np.sum(offset**2, axis=2))
    distance = np.where(far, distance, 1.0)
    unit = offset / distance[..., None]
    along = np.einsum("nbk,bk->nb", unit, moments)
    weight = np.where(far, K / distance**3, 0.0)
    field = np.einsum("nb,nbl->nl", weight, 3 * unit * along[..., None] - moments[None])
    scaled = 3 * weight / distance
    along_scaled = scaled * along
    outer = np.matmul(np.swapaxes(along_scaled[..., None] * unit, 1, 2), unit)  # sum_b c (m.u) u_j u_l
    mixed = np.matmul(np.swapaxes(scaled[..., None] * moments[None], 1, 2), unit)  # sum_b c m_j u_l
    jacobian = (np.sum(along_scaled, axis=1)[:, None, None] * np.eye(3) - 5 * outer
                + mixed + np.swapaxes(mixed, 1, 2))
    return field, jacobian


def field_and_gradient(bodies, points, allowed_error):
    """Model field |B| (n,) [T], its error bound (n,) [T], grad |B|^2 (n, 3) [T^2/m] and its error bound.

    Far pairs: analytic dipole field and Jacobian. Near pairs: exact field and a
    central-difference Jacobian with step 1e-3 of the distance to the nearest body.
    """
    far, error, jacobian_error = dipole_assignment(bodies, points, allowed_error)
    geometry = _ball_geometry(bodies, points)
    field, jacobian = _dipole_field_and_jacobian(bodies, points, far)
    step = 1e-3 * np.maximum(np.min(np.maximum(geometry[1], geometry[0] - geometry[3]), axis=1), 1e-9)
    basis = np.vstack([np.eye(3), -np.eye(3)])
    for i, body in enumerate(bodies):
        near = np.flatnonzero(~far[:, i])
        if not len(near):
            continue
        h = step[near]
        stacked = np.concatenate([points[near]] + [points[near] + h[:, None] * e for e in basis])
        values = exact_body_field(body, stacked).reshape(7, len(near), 3)
        field[near] += values[0]
        jacobian[near] += np.transpose((values[1:4] - values[4:7]) / (2 * h[None, :, None]), (1, 0, 2))
        jacobian_error[near] += 1e-14 * np.max(np.abs(values), axis=(0, 2)) / h  # rounding
    jacobian_error += np.sqrt(3) * step**2 / 6 * derivative_bound(geometry, step, 3)  # truncation
    size = np.sqrt(np.sum(field**2, axis=1))
    gradient = 2 * np.einsum("njl,nl->nj", jacobian, field)
    jacobian_norm = np.sqrt(np.sum(jacobian**2, axis=(1, 2)))
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
    high = np.maximum(np.min(np.maximum(geometry[1], geometry[0] - geometry[3]), axis=1), 1e-9)
    high = np.minimum(high, radii)
    along = np.abs(np.sum(gradient * axes, axis=1))
    across = np.linalg.norm(gradient - np.sum(gradient * axes, axis=1)[:, None] * axes, axis=1)
    along, across = along + gradient_error, across + gradient_error
    upper = size + error
    across_reach = radii * np.sin(half_angles)
    bulge = radii * (1 - np.cos(half_angles))
    limit = threshold**2 * (1 - 1e-9)
    # Bodies far from every ball of the search: their bounds, which grow with the ball, are
    # taken once at the largest ball (still bounds for smaller ones, and nearly as tight).
    widest = np.hypot(high + bulge, across_reach)
    close = np.any(geometry[0] - geometry[3] < 10 * widest[:, None], axis=0)
    fixed_first = derivative_bound(_columns(geometry, ~close), widest, 1)
    fixed_second = derivative_bound(_columns(geometry, ~close), widest, 2)
    geometry = _columns(geometry, close)

    def holds(depth):
        shift = depth + bulge
        spread = np.hypot(shift, across_reach)
        first = fixed_first + derivative_bound(geometry, spread, 1)
        second = fixed_second + derivative_bound(geometry, spread, 2)
        with np.errstate(invalid="ignore", over="ignore"):
            largest = upper + first * spread
            curvature = 2 * (first**2 + largest * second)
            bound = upper**2 + along * shift + across * across_reach + 0.5 * curvature * spread**2
        return np.nan_to_num(bound, nan=np.inf) <= limit

    low = np.zeros(len(points))
    ok = holds(low)
    for _ in range(iterations):
        middle = 0.5 * (low + high)
        fits = holds(middle)
        low = np.where(fits, middle, low)
        high = np.where(fits, high, middle)
    return np.where(ok, low, -1.0), size, error
