"""Adaptive tensor Gauss-Legendre quadrature over boxes in parameter space.

The charge-model forces and the interaction energy are integrals of the source field over
the faces (or the volume) of the target body. Each face is a box in its own parameters
(for example radius and angle on an end disc). This module integrates such integrands to a
requested relative accuracy:

1. every box is integrated with two successive Gauss-Legendre orders; the difference of the
   two results is the error estimate of the higher order;
2. while the summed error estimate exceeds ``rtol`` times the size of the total, the boxes
   carrying most of the error are bisected into 2^d children. The error sits where a face
   nearly touches the source, so the subdivision closes in on the closest point there and
   leaves the far parts of the face whole.

All field evaluations of one round go into a single vectorised call.

References
----------
P. J. Davis and P. Rabinowitz, *Methods of Numerical Integration*, 2nd ed., Academic Press
(1984), ch. 5-6 (Gauss-Legendre rules, adaptive subdivision with error estimates from two
rules).
"""
from __future__ import annotations

from functools import lru_cache
from typing import Callable, Sequence

import numpy as np

DEFAULT_ORDERS = (4, 6)


@lru_cache(maxsize=None)
def tensor_gauss_rule(order: int, dimension: int) -> tuple[np.ndarray, np.ndarray]:
    """Tensor Gauss-Legendre rule on the unit cube [0, 1]^dimension.

    Parameters
    ----------
    order : int
        Points per dimension [-].
    dimension : int
        1, 2 or 3 [-].

    Returns
    -------
    nodes : ndarray (order**dimension, dimension)
        Node coordinates in [0, 1] [-].
    weights : ndarray (order**dimension,)
        Weights summing to 1 [-].

    Notes
    -----
    Exact for polynomials of degree 2*order - 1 in each variable.

    References
    ----------
    Davis & Rabinowitz, Methods of Numerical Integration (1984), sec. 2.7.

    Examples
    --------
    >>> nodes, weights = tensor_gauss_rule(3, 2)
    >>> round(float(weights.sum()), 12), nodes.shape
    (1.0, (9, 2))
    """
    x, w = np.polynomial.legendre.leggauss(order)
    x = (x + 1.0) / 2.0
    w = w / 2.0
    grids = np.meshgrid(*([x] * dimension), indexing="ij")
    weight_grids = np.meshgrid(*([w] * dimension), indexing="ij")
    nodes = np.stack([g.ravel() for g in grids], axis=1)
    weights = np.prod(np.stack([g.ravel() for g in weight_grids], axis=1), axis=1)
    return nodes, weights


def adaptive_box_integral(
    maps: Sequence[Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]],
    boxes: Sequence[tuple[int, Sequence[float], Sequence[float]]],
    integrand: Callable[[np.ndarray, np.ndarray], np.ndarray],
    error_size: Callable[[np.ndarray], np.ndarray],
    rtol: float = 1e-3,
    orders: tuple[int, int] = DEFAULT_ORDERS,
    max_rounds: int = 40,
    max_boxes: int = 200_000,
    absolute_floor: float = 0.0,
    first_pass: tuple[np.ndarray, np.ndarray] | None = None,
) -> np.ndarray:
    """Integrate ``integrand`` over boxes mapped onto surfaces or volumes, adaptively.

    Parameters
    ----------
    maps : sequence of callables
        ``maps[i](u)`` takes parameters u (m, d) and returns ``(points (m, 3), measure (m,))``,
        the points and the Jacobian (times any density) at those parameters.
    boxes : sequence of (map index, low (d,), high (d,))
        Initial boxes in parameter space.
    integrand : callable
        ``integrand(points (m, 3), measure (m,)) -> values (m, k)``; evaluated on all the
        points of one round at once.
    error_size : callable
        ``error_size(values (..., k)) -> (...)``: a norm used both for the error estimate
        and for the size of the total.
    rtol : float
        Requested relative accuracy of the total [-].
    orders : (int, int)
        The two successive Gauss-Legendre orders per dimension.
    max_rounds, max_boxes : int
        Safety limits; refinement stops when either is reached.
    absolute_floor : float
        Errors below this absolute size are accepted (for totals that vanish by symmetry).
    first_pass : (ndarray (b, k), ndarray (b,)), optional
        The higher-order values and error sizes of the initial boxes, if already known
        (see :func:`box_nodes` and :func:`box_sums`); saves their evaluation.

    Returns
    -------
    ndarray (k,)
        The integral, from the higher order on every final box.

    Notes
    -----
    Stops when the sum of |Q_high - Q_low| over all boxes is at most
    ``rtol * size(total)``; in each round the boxes holding the largest errors, enough
    to bring the sum under half that bound if they were perfect, are bisected in every
    parameter.

    References
    ----------
    Davis & Rabinowitz, Methods of Numerical Integration (1984), sec. 6.2.

    Examples
    --------
    >>> area = adaptive_box_integral([lambda u: (np.c_[u, 0 * u[:, 0]], np.ones(len(u)))],
    ...                              [(0, [0, 0], [2, 3])], lambda p, w: w[:, None],
    ...                              lambda v: np.abs(v[..., 0]))
    >>> round(float(area[0]), 12)
    6.0
    """
    face, low, high = _box_arrays(boxes)

    def evaluate(face, low, high):
        points, weights, n_low = box_nodes(maps, face, low, high, orders)
        values = integrand(points.reshape(-1, 3), weights.ravel())
        return box_sums(values.reshape(len(face), -1, values.shape[-1]), n_low, error_size)

    value, error = evaluate(face, low, high) if first_pass is None else first_pass
    for _ in range(max_rounds):
        total = value.sum(axis=0)
        bound = max(rtol * float(error_size(total)), absolute_floor)
        excess = error.sum() - bound
        if excess <= 0 or len(face) >= max_boxes:
            break
        order = np.argsort(error)[::-1]
        needed = np.searchsorted(np.cumsum(error[order]), excess + bound / 2) + 1
        split = order[: max(1, needed)]
        keep = np.ones(len(face), dtype=bool)
        keep[split] = False
        child_face, child_low, child_high = _bisect(face[split], low[split], high[split])
        child_value, child_error = evaluate(child_face, child_low, child_high)
        face = np.concatenate([face[keep], child_face])
        low = np.concatenate([low[keep], child_low])
        high = np.concatenate([high[keep], child_high])
        value = np.concatenate([value[keep], child_value])
        error = np.concatenate([error[keep], child_error])
    return value.sum(axis=0)


@lru_cache(maxsize=None)
def _paired_rule(orders: tuple[int, int], dimension: int):
    """Nodes and weights of two Gauss orders side by side, and the count of the lower."""
    rule_low, rule_high = (tensor_gauss_rule(order, dimension) for order in orders)
    return (np.concatenate([rule_low[0], rule_high[0]]),
            np.concatenate([rule_low[1], rule_high[1]]), len(rule_low[1]))


def _box_arrays(boxes):
    """Map indices, low and high corners of a list of (map index, low, high) boxes."""
    face = np.array([b[0] for b in boxes], dtype=int)
    low = np.array([b[1] for b in boxes], dtype=float)
    high = np.array([b[2] for b in boxes], dtype=float)
    return face, low, high


def box_nodes(maps, face, low, high, orders: tuple[int, int] = DEFAULT_ORDERS):
    """Points and weights of both Gauss orders on every box.

    Parameters
    ----------
    maps : sequence of callables
        As in :func:`adaptive_box_integral`.
    face : array (b,) of int
        Map index of each box.
    low, high : arrays (b, d)
        Box corners in parameter space.
    orders : (int, int)
        The two Gauss-Legendre orders per dimension.

    Returns
    -------
    points : ndarray (b, n_low + n_high, 3)
        Mapped nodes, the lower order's first [m].
    weights : ndarray (b, n_low + n_high)
        Gauss weight times box size times the map's measure.
    n_low : int
        Nodes per box of the lower order.

    Notes
    -----
    Tensor Gauss-Legendre nodes scaled onto each box; see :func:`tensor_gauss_rule`.

    References
    ----------
    Davis & Rabinowitz, Methods of Numerical Integration (1984), sec. 5.6.
    """
    nodes, weights, n_low = _paired_rule(tuple(orders), low.shape[1])
    per_box = len(weights)
    span = high - low
    params = low[:, None, :] + span[:, None, :] * nodes[None, :, :]
    box_weight = np.prod(span, axis=1)[:, None] * weights[None, :]
    points = np.empty(params.shape[:2] + (3,))
    measure = np.empty(params.shape[:2])
    for index in np.unique(face):
        mine = face == index
        p, m = maps[index](params[mine].reshape(-1, low.shape[1]))
        points[mine] = p.reshape(-1, per_box, 3)
        measure[mine] = m.reshape(-1, per_box)
    return points, measure * box_weight, n_low


def box_sums(values, n_low: int, error_size):
    """Higher-order value and error size of every box from the integrand at its nodes.

    Parameters
    ----------
    values : array (b, n_low + n_high, k)
        Weighted integrand at the nodes of :func:`box_nodes`.
    n_low : int
    error_size : callable
        As in :func:`adaptive_box_integral`.

    Returns
    -------
    q_high : ndarray (b, k)
    error : ndarray (b,)
        ``error_size(q_high - q_low)``.
    """
    q_low = values[:, :n_low].sum(axis=1)
    q_high = values[:, n_low:].sum(axis=1)
    return q_high, error_size(q_high - q_low)


def _bisect(face, low, high):
    """Split each box into 2^d children at its midpoint."""
    dimension = low.shape[1]
    mid = (low + high) / 2
    corners = np.array(np.meshgrid(*([[0, 1]] * dimension), indexing="ij")).reshape(dimension, -1).T
    child_low = np.where(corners[None, :, :] == 0, low[:, None, :], mid[:, None, :])
    child_high = np.where(corners[None, :, :] == 0, mid[:, None, :], high[:, None, :])
    n_children = len(corners)
    return (np.repeat(face, n_children), child_low.reshape(-1, dimension),
            child_high.reshape(-1, dimension))
