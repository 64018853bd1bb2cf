"""Second-order proof that a slab of a cone lies below a threshold.

For g = |B|^2 and any x near a point y, Taylor's theorem gives
g(x) <= g(y) + grad g(y) . (x - y) + (1/2) M |x - y|^2, with M a bound on ||D^2 g|| over the
ball, ||D^2 g|| <= 2 (L1^2 + L0 L2) (L0, L1, L2: bounds on |B|, ||DB||, ||D^2 B||). Splitting
x - y into a part along the cone axis (|alpha| <= s + r (1 - cos delta)) and a part across it
(|w| <= r sin delta) bounds the linear term by |G_along| |alpha| + |G_across| |w|. Near the
direction of farthest reach the across part of grad g is nearly zero, so the cone width
enters only quadratically: coarse cones suffice where it matters.

The Jacobian at y is known (below), so L1 and L0 are also bounded from it: along the segment
from y to x, ||DB(x)|| <= ||DB(y)|| + L2 |x - y| and |B(x)| <= |B(y)| + ||DB(y)|| |x - y|
+ L2 |x - y|^2 / 2 (Taylor with integral remainder; the operator norm of DB(y) is at most the
Frobenius norm of the model Jacobian plus its error bound). The smaller of this and the
distance-only bound is used. Beside a body the distance-only L1 is often ten times the true
slope and L1^2 dominates the curvature M, so this cut M, and the number of cones, by about
three (the 50 mm cube at 0.4 T: 29,800 cones to 9,300).

The same first-order bound on |B| itself, |B(y)| + ||DB(y)|| rho + L2 rho^2 / 2 < threshold
over the ball of radius rho holding the slab, proves a slab on its own. It is the better of
the two in wide cones well below the threshold: there the |B|^2 bound carries (L1 rho)^2,
with the loose L1 of a far body, and can exceed threshold^2 alone (a 10-degree cone 20 cm
from a ring at 1.5 mT against 6 mT could not be walked at all and had to be split twice).

grad g(y) = 2 Jac(y)^T B(y) uses a forward-difference Jacobian of the field model; its error
is bounded by (eps / 2) sqrt(3) L2 (Taylor remainder), plus the error of the field values
(relative 1e-8, divided by the step) and the model's own derivative error.

Derivative bounds of order n for one body (``bounds.derivative_bounds``; (n+2)! from the Legendre
expansion, the surface-charge forms from integrating 1/r^(n+2) over a plane or a cylinder):
volume form (n+2)! k m / e^(n+3); surface form (n+1)!/(2n) A / D^n + (n+1)! b_n / 4 C / D^(n+1),
b_1 = 2, b_2 = pi/2, b_3 = 4/3; for cylinders, rings and blocks also the multipole-series form
(n+2)! k m S_n(a/d) / d^(n+3) (``zones.bounds``); the smallest is used. Here D is the distance to the
solid and e = D for every shape but the sphere, e = d for a sphere (its outside field is
exactly a dipole's at the centre). The volume form with e = D holds because outside the
body B is the superposition of the fields of the volume elements M dV, each a point dipole
at distance >= D, whose n-th derivative is at most (n+2)! k |M| dV / D^(n+3); the integral
of |M| dV is m. (The earlier form used d - a <= D: never tighter, often far looser beside
a flat face, where D - (d - a) is a sizeable part of the body.)

References
----------
Jackson, Classical Electrodynamics, 3rd ed. (1999), eqs. 3.70 and 5.56; Abramowitz & Stegun,
Handbook of Mathematical Functions (1964), 25.2.24 (Taylor's theorem with Lagrange's remainder,
which gives the forward-difference error).
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from planner.physics.zones.bounds import (K, _ball_geometry, body_table, derivative_bounds, dipole_assignment,
                                          exact_body_field, far_dipoles)

def _split_far(geometry, widest, centre_bounds, ratio=10.0):
    """Split the (point, body) pairs by how far the body is from each ball, widest radius ``widest``.

    Far pairs (distance to the solid D >= ``ratio`` * widest) are summed once per point at
    the ball's centre: returns ``near`` (the geometry tuple with per-point columns of only
    the near bodies, padded with empty bodies), and per point the far sums
    S_n = sum of the bounds of order n = 1, 2 at the centre (the smaller of the volume and
    surface forms of :func:`derivative_bounds`), and the smallest far D. Over a ball of
    radius rho <= widest the volume form grows by (1 - rho / e)^-(n+3) and the surface
    form by at most (1 - rho / D)^-(n+1); as e >= D, each far term is at most its value at
    the centre times (1 - rho / D_min)^-(n+3): a fixed value and its growth across the
    ball instead of a sum of per-body bounds for every candidate ball. Their sums at the
    widest ball are returned as well (also a bound for every smaller ball); the smaller
    of the two is used. ``centre_bounds``: the per-body bounds of orders 1 and 2 at the
    ball centres (:func:`derivative_bounds` with ``per_body``, spread 0), which do not
    depend on ``widest`` and so are computed once per set of points by the caller.
    """
    centre_distance, solid_distance, moments, reach, shift, flat, curved, series_row, series = geometry
    far = solid_distance >= ratio * widest[:, None]
    only_far = (centre_distance, np.where(far, solid_distance, np.inf)) + tuple(geometry[2:])
    at_centre = tuple(np.sum(np.where(far, per_pair, 0.0), axis=1) for per_pair in centre_bounds)
    at_widest = tuple(np.sum(np.where(far, per_pair, 0.0), axis=1)
                      for per_pair in derivative_bounds(only_far, widest, (1, 2), per_body=True))
    nearest_far = np.min(np.where(far, solid_distance, np.inf), axis=1)
    count = int(np.max(np.sum(~far, axis=1), initial=0))
    order = np.argsort(far, axis=1, kind="stable")[:, :count]  # near bodies first
    keep = ~np.take_along_axis(far, order, axis=1)

    def gather(values, empty):
        values = np.broadcast_to(values, far.shape)
        return np.where(keep, np.take_along_axis(values, order, axis=1), empty)

    near = (gather(centre_distance, np.inf), gather(solid_distance, np.inf), gather(moments, 0.0),
            gather(reach, 0.0), gather(shift, 0.0), gather(flat, 0.0), gather(curved, 0.0),
            gather(series_row, -1.0), series)
    return near, at_centre, at_widest, nearest_far


class LocalModel(NamedTuple):
    """The field model at a set of points, with what the proofs need about it.

    ``field`` (n, 3) [T] and ``jacobian`` (n, 3, 3) [T/m], [j, l] = dB_l/dx_j, of the model
    (:func:`local_model`); ``error`` (n,) [T] and ``jacobian_error`` (n,) [T/m] bound how far
    the true |B| and the Frobenius norm of the true Jacobian are from them; ``geometry`` the
    per-body distances and constants of :func:`~planner.physics.zones.bounds.derivative_bounds`.
    """

    field: np.ndarray
    jacobian: np.ndarray
    error: np.ndarray
    jacobian_error: np.ndarray
    geometry: tuple

    def take(self, rows) -> "LocalModel":
        """The model at the points ``rows`` only (the geometry's per-point columns with them)."""
        return LocalModel(self.field[rows], self.jacobian[rows], self.error[rows], self.jacobian_error[rows],
                          _geometry_rows(self.geometry, rows))


def _geometry_rows(geometry, rows):
    """The geometry tuple of :func:`~planner.physics.zones.bounds.derivative_bounds` at the points ``rows``."""
    return tuple(part[rows] if isinstance(part, np.ndarray) and part.ndim == 2 else part for part in geometry)


def local_model(bodies, points, allowed_error, table=None) -> LocalModel:
    """Model field and Jacobian at ``points`` (n, 3) [m], with their error bounds.

    Far pairs: analytic dipole field and Jacobian. Near pairs: exact field and a
    forward-difference Jacobian with step 1e-4 of the distance to the nearest body (four
    field evaluations per point, where central differences take seven).
    ``allowed_error`` [T]: the dipole stand-ins' summed field error allowed per point.
    """
    table = body_table(bodies, table)
    distance = table.centre_distances(points)
    far, error, jacobian_error = dipole_assignment(bodies, points, allowed_error, table, distance)
    geometry = _ball_geometry(bodies, points, table, distance)
    field, jacobian = far_dipoles(points, far, table, distance, with_jacobian=True)
    step = 1e-4 * np.maximum(np.min(np.maximum(geometry[1], geometry[0] - geometry[3]), axis=1), 1e-9)
    for i in np.flatnonzero(~far.all(axis=0)):  # the bodies exact at some point
        body, near = bodies[i], np.flatnonzero(~far[:, i])
        h = step[near]
        stacked = np.concatenate([points[near]] + [points[near] + h[:, None] * e for e in np.eye(3)])
        values = exact_body_field(body, stacked).reshape(4, len(near), 3)
        field[near] += values[0]
        jacobian[near] += np.transpose((values[1:4] - values[0]) / h[None, :, None], (1, 0, 2))
        # Error of the field values themselves: the fields module states a relative error
        # of a few 1e-9 at worst (its far-field expansion; a few 1e-10 at the near-axis
        # switch), so each entry (f(x + h) - f(x)) / h is off by at most 2e-8 max|B| / h
        # and the 3 x 3 Frobenius norm by three times that.
        jacobian_error[near] += 6e-8 * np.max(np.abs(values), axis=(0, 2)) / h
        # truncation: each column is off by at most (h / 2) max ||D^2 B_i|| within h of the
        # point (only this body's field is differenced)
        jacobian_error[near] += np.sqrt(3) * h / 2 * _second_derivative_bound(table, i, distance[near, i],
                                                                              geometry[1][near, i], h)
    return LocalModel(field, jacobian, error, jacobian_error, geometry)


def _second_derivative_bound(table, body, centre_distance, solid_distance, spread):
    """Bound on ||D^2 B|| [T/m^2] of one body over balls of radius ``spread`` (n,) [m]: the smaller
    of the volume and surface forms of :func:`~planner.physics.zones.bounds.derivative_bounds`
    at order 2 (24 k m / e^5 and 3/2 A / D^2 + 3 pi / 4 C / D^3 with the distances less the
    spread), written out for the few points of one body; +inf where a ball reaches the body."""
    gap = solid_distance - spread
    far = np.maximum(centre_distance - table.shift[body], solid_distance) - spread
    with np.errstate(divide="ignore", invalid="ignore"):
        volume = 24 * K * table.moments[body] / far**5
        surface = 1.5 * table.flat[body] / gap**2 + 0.75 * np.pi * table.curved[body] / gap**3
    return np.where(gap > 0, np.fmin(volume, surface), np.inf)


def gradient_parts(model: LocalModel):
    """|B| (n,) [T], grad |B|^2 (n, 3) [T^2/m], its error bound (n,) and the slope (n,) [T/m].

    The slope bounds the operator norm of the true Jacobian DB at each point: the Frobenius
    norm of the model Jacobian (never below its operator norm) plus the bound on its error.
    Points where anything is not finite get |B| = slope = +inf (nothing is proven there).
    """
    field, jacobian, error, jacobian_error = model.field, model.jacobian, model.error, model.jacobian_error
    size = np.sqrt(np.sum(field**2, axis=1))
    gradient = 2 * np.einsum("njl,nl->nj", jacobian, field)
    jacobian_norm = np.sqrt(np.sum(jacobian**2, axis=(1, 2)))
    gradient_error = 2 * (jacobian_error * (size + error) + jacobian_norm * error)
    bad = ~np.isfinite(size) | ~np.isfinite(gradient_error) | ~np.all(np.isfinite(gradient), axis=1)
    size[bad] = np.inf
    slope = np.where(bad, np.inf, jacobian_norm + jacobian_error)
    return size, gradient, gradient_error, slope


def field_and_gradient(bodies, points, allowed_error, table=None):
    """Model field |B| (n,) [T], its error bound (n,) [T], grad |B|^2 (n, 3) [T^2/m] and its error bound.

    The model of :func:`local_model`. Also returned (after the geometry): ``slope`` (n,)
    [T/m], a bound on the operator norm of the true Jacobian (:func:`gradient_parts`).
    """
    model = local_model(bodies, points, allowed_error, table)
    size, gradient, gradient_error, slope = gradient_parts(model)
    return size, model.error, gradient, gradient_error, model.geometry, slope


def taylor_holds(upper, along, across, slope, first, second, shift, across_reach, threshold):
    """Whether the second-order bounds of the module docstring keep |B| below ``threshold``.

    Over a ball of radius rho = hypot(shift, across_reach) [m] about a point y whose
    displacements have a part along an axis of at most ``shift`` and a part across it of at
    most ``across_reach``: ``upper`` |B(y)| plus its error [T]; ``along`` and ``across`` the
    two parts of grad |B|^2 at y plus its error [T^2/m]; ``slope`` the bound on ||DB(y)||
    [T/m]; ``first`` and ``second`` bounds on ||DB|| and ||D^2 B|| over the ball. All
    broadcast together. Either bound proves the ball: the one on |B|^2 (best near the
    farthest reach, where the across gradient vanishes) or the one on |B| itself (best well
    below the threshold, where (L1 rho)^2 alone can exceed threshold^2). A NaN compares
    False: nothing is proven from it.
    """
    spread = np.hypot(shift, across_reach)
    with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
        # The Jacobian known at y: ||DB(x)|| <= slope + L2 |x - y| and
        # |B(x)| <= |B(y)| + slope rho + L2 rho^2 / 2 (Taylor, see the module docstring).
        first = np.minimum(first, slope + second * spread)
        largest = np.minimum(upper + first * spread, upper + (slope + 0.5 * second * spread) * spread)
        curvature = 2 * (first**2 + largest * second)
        bound = upper**2 + across * across_reach + along * shift + 0.5 * curvature * spread**2
    limit = threshold**2 * (1 - 1e-9)
    return (np.nan_to_num(bound, nan=np.inf) <= limit) | (largest <= np.sqrt(limit))


def axis_parts(gradient, gradient_error, axes):
    """|part of grad |B|^2 along ``axes``| and |part across them|, each plus its error bound."""
    along = np.sum(gradient * axes, axis=1)
    across = np.linalg.norm(gradient - along[:, None] * axes, axis=1)
    return np.abs(along) + gradient_error, across + gradient_error


def patch_below(model: LocalModel, axes, along_reach, across_reach, threshold, derivatives=None):
    """Whether |B| < ``threshold`` [T] at every point y + d of the patches about the model's points.

    ``d`` has a part along the unit ``axes`` (n, 3) of at most ``along_reach`` (n,) [m] and a
    part across them of at most ``across_reach`` (n,) [m]: a spherical cap about its centre
    (the bulge and the half-width), or a flat patch about its centre (0 and its radius).
    Second-order bounds of the module docstring, with the derivative bounds taken over the
    ball of radius hypot(along_reach, across_reach) about each point; ``derivatives``: those
    bounds of orders 1 and 2 (each (n,)) if the caller has them.
    """
    size, gradient, gradient_error, slope = gradient_parts(model)
    along, across = axis_parts(gradient, gradient_error, axes)
    if derivatives is None:
        derivatives = derivative_bounds(model.geometry, np.hypot(along_reach, across_reach), (1, 2))
    first, second = derivatives
    return taylor_holds(size + model.error, along, across, slope, first, second, along_reach, across_reach,
                        threshold)


# The depth is searched by bisection on a log scale between 1e-4 and 1 of the largest
# allowed depth: 8 halvings leave a ratio of 1e4^(1/256) = 1.037, so the depth found is
# within 3.7 % of the deepest one the bound allows (14 linear halvings before).
_SMALLEST_FRACTION = 1e-4
_HALVINGS = 8
_RESPLIT_AFTER = 2  # far/near split of the bodies redone once the depth bracket has shrunk


def certified_depth(bodies, points, axes, radii, half_angles, threshold, allowed_error, table=None):
    """Largest s [m] such that every cone point with radius in [r - s, r] has |B| < threshold.

    ``points`` are the axis points at ``radii`` along unit ``axes``; the cone half-angles are
    ``half_angles`` [rad]. Returns 0 where nothing can be proven (the walk stops there).

    Every candidate depth is checked on its own (the bound at depth s covers the whole slab
    [r - s, r]), so the one returned is proven whatever the shape of the bound; the bound
    grows with s, so bisection finds nearly the largest provable s.
    """
    table = body_table(bodies, table)
    size, error, gradient, gradient_error, geometry, slope = field_and_gradient(
        bodies, points, allowed_error, table)
    high = np.maximum(np.min(np.maximum(geometry[1], geometry[0] - geometry[3]), axis=1), 1e-9)
    high = np.minimum(high, radii)
    along, across = axis_parts(gradient, gradient_error, axes)
    upper = size + error
    across_reach = radii * np.sin(half_angles)
    bulge = radii * (1 - np.cos(half_angles))

    def holds(depth, parts):  # depth (n, m) -> (n, m) bool; parts: _split_far for balls >= these
        near, (far_first, far_second), (widest_first, widest_second), nearest_far = parts
        shift = depth + bulge[:, None]
        spread = np.hypot(shift, across_reach[:, None])
        first, second = derivative_bounds(near, spread, (1, 2))
        with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
            growth = 1.0 / np.maximum(1.0 - spread / nearest_far[:, None], 0.0)
            first = first + np.minimum(far_first[:, None] * growth**4, widest_first[:, None])
            second = second + np.minimum(far_second[:, None] * growth**5, widest_second[:, None])
        return taylor_holds(upper[:, None], along[:, None], across[:, None], slope[:, None], first, second,
                            shift, across_reach[:, None], threshold)

    # grown to each ball by _split_far's factor, which the series form does not obey
    centre_bounds = derivative_bounds(geometry, np.zeros(len(points)), (1, 2), per_body=True,
                                      series_form=False)

    def split(largest):
        return _split_far(geometry, np.hypot(largest + bulge, across_reach), centre_bounds)

    # No separate check at depth 0: every candidate is proven on its own, and a point with
    # none proven returns 0, where the walk stops (as it did on the -1 such a check gave).
    low, high_exponent = np.zeros(len(points)), np.zeros(len(points))
    low_exponent = np.full(len(points), np.log(_SMALLEST_FRACTION))
    parts = split(high)
    for step in range(_HALVINGS):
        if step == _RESPLIT_AFTER:
            parts = split(high * np.exp(high_exponent))
        middle = 0.5 * (low_exponent + high_exponent)
        candidate = high * np.exp(middle)
        fits = holds(candidate[:, None], parts)[:, 0]
        low = np.where(fits, candidate, low)
        low_exponent = np.where(fits, middle, low_exponent)
        high_exponent = np.where(fits, high_exponent, middle)
    return low, size, error
