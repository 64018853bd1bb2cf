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
    dimension = len(boxes[0][1])
    rule_low = tensor_gauss_rule(orders[0], dimension)
    rule_high = tensor_gauss_rule(orders[1], dimension)
    face = np.array([b[0] for b in boxes], dtype=int)
    low = np.array([b[1] for b in boxes], dtype=float)
    high = np.array([b[2] for b in boxes], dtype=float)

    def evaluate(face, low, high):
        n_low, n_high = len(rule_low[1]), len(rule_high[1])
        per_box = n_low + n_high
        nodes = np.concatenate([rule_low[0], rule_high[0]])
        weights = np.concatenate([rule_low[1], rule_high[1]])
        span = high - low
        params = low[:, None, :] + span[:, None, :] * nodes[None, :, :]
        box_weight = np.prod(span, axis=1)[:, None] * weights[None, :]
        points = np.empty(params.shape[:2] + (3,))
        measure = np.empty(params.shape[:2])
        for index in np.unique(face):
            mine = face == index
            p, m = maps[index](params[mine].reshape(-1, dimension))
            points[mine] = p.reshape(-1, per_box, 3)
            measure[mine] = m.reshape(-1, per_box)
        values = integrand(points.reshape(-1, 3), (measure * box_weight).ravel())
        values = values.reshape(len(face), per_box, -1)
        q_low = values[:, :n_low].sum(axis=1)
        q_high = values[:, n_low:].sum(axis=1)
        return q_high, error_size(q_high - q_low)

    value, error = evaluate(face, low, high)
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
