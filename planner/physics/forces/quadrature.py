"""Adaptive tensor Gauss-Legendre quadrature over boxes in parameter space.

The charge-model forces and the interaction energy are integrals of the source field over
the faces (or the volume) of the target body. Each face is a box in its own parameters
(for example radius and angle on an end disc). This module integrates such integrands to a
requested relative accuracy:

1. every box is integrated with two successive Gauss-Legendre orders, whose difference is
   the error estimate of the higher one (in fact of the lower one, so an overestimate
   wherever the rules converge); or with the nested rules of 1, 3 and 7 points per
   parameter (midpoint, Gauss, Kronrod), which reuse each other's nodes and whose two
   differences give the rate of convergence and an extrapolated error estimate of the
   7-point rule (:func:`~planner.physics.forces.quadrature_rules.extrapolated_error`);
2. while the summed error estimate exceeds ``rtol`` times the size of the total, the boxes
   carrying most of the error are bisected into 2^d children. The error sits where a face
   nearly touches the source, so the subdivision closes in on the closest point there and
   leaves the far parts of the face whole.

All field evaluations of one round go into a single vectorised call.

The nested rules also tell which parameter carries the error: the full tensor rule is
compared with the rules coarsened along one parameter at a time, and a box is bisected only
along the parameters whose estimate is large.

References
----------
P. J. Davis and P. Rabinowitz, *Methods of Numerical Integration*, 2nd ed., Academic Press
(1984), ch. 5-6 (Gauss-Legendre rules, adaptive subdivision with error estimates from two
rules).
A. S. Kronrod, *Nodes and Weights of Quadrature Formulas*, Consultants Bureau (1965);
D. P. Laurie, "Calculation of Gauss-Kronrod quadrature rules", Math. Comp. 66,
1133-1145 (1997).
"""
from __future__ import annotations

from functools import lru_cache
from typing import Callable, Sequence

import numpy as np

from planner.physics.forces.quadrature_rules import (extrapolated_error, nested_tensor_rule,
                                                     tensor_gauss_rule)

DEFAULT_ORDERS = (4, 6)


def adaptive_box_integral(
    maps: Sequence[Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]],
    boxes: Sequence[tuple[int, Sequence[float], Sequence[float]]],
    integrand: Callable[[np.ndarray, np.ndarray], np.ndarray],
    error_size: Callable[[np.ndarray], np.ndarray],
    rtol: float = 1e-3,
    orders: tuple[int, int] | int = DEFAULT_ORDERS,
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
        ``integrand(points (m, 3), weight (m,)) -> values (m, k)``, linear in ``weight``
        (the measure times the box volume); evaluated on all the points of one round at
        once.
    error_size : callable
        ``error_size(values (..., k)) -> (...)``: a norm used both for the error estimate
        and for the size of the total.
    rtol : float
        Requested relative accuracy of the total [-].
    orders : (int, int) or int
        Two successive Gauss-Legendre orders per dimension, or the points (7 or 15) of the
        finest of the nested rules per dimension (:func:`box_rule`).
    max_rounds, max_boxes : int
        Safety limits; refinement stops when either is reached.
    absolute_floor : float
        Errors below this absolute size are accepted (for totals that vanish by symmetry,
        or when the caller sets an absolute budget with ``rtol = 0``).
    first_pass : (ndarray (b, k), ndarray (b, p)), optional
        The values and error parts of the initial boxes, if already known (see
        :func:`box_nodes` and :func:`box_sums`); saves their evaluation.

    Returns
    -------
    ndarray (k,)
        The integral, from the better rule on every final box.

    Notes
    -----
    Stops when the summed error estimate over all boxes is at most
    ``max(rtol * size(total), absolute_floor)``; in each round the boxes holding the largest
    errors, enough to bring the sum under half that bound if they were perfect, are
    bisected: in every parameter for two Gauss orders, and for the nested rules only along
    the parameters whose own estimate is at least a tenth of the box's largest.

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
        points, weight, rule_weights = box_nodes(maps, face, low, high, orders)
        values = integrand(points.reshape(-1, 3), weight.ravel())
        return box_sums(values.reshape(len(face), -1, values.shape[-1]), rule_weights,
                        error_size)

    value, error = evaluate(face, low, high) if first_pass is None else first_pass
    for _ in range(max_rounds):
        total = value.sum(axis=0)
        bound = max(rtol * float(error_size(total)), absolute_floor)
        box_error = error.sum(axis=1)
        excess = box_error.sum() - bound
        if excess <= 0 or len(face) >= max_boxes:
            break
        order = np.argsort(box_error)[::-1]
        needed = np.searchsorted(np.cumsum(box_error[order]), excess + bound / 2) + 1
        split = order[: max(1, needed)]
        keep = np.ones(len(face), dtype=bool)
        keep[split] = False
        if error.shape[1] == 1:
            along = np.ones((len(split), low.shape[1]), dtype=bool)
        else:
            parts = error[split]
            along = parts >= SPLIT_FRACTION * parts.max(axis=1, keepdims=True)
        child_face, child_low, child_high = _bisect(face[split], low[split], high[split], along)
        child_value, child_error = evaluate(child_face, child_low, child_high)
        face = np.concatenate([face[keep], child_face])
        low = np.concatenate([low[keep], child_low])
        high = np.concatenate([high[keep], child_high])
        value = np.concatenate([value[keep], child_value])
        error = np.concatenate([error[keep], child_error])
    return value.sum(axis=0)


#: A nested-rule box is bisected along the parameters whose error estimate is at least
#: this fraction of its largest one.
SPLIT_FRACTION = 0.1


@lru_cache(maxsize=None)
def box_rule(orders: tuple[int, int] | int, dimension: int) -> tuple[np.ndarray, np.ndarray]:
    """Nodes on the unit cube and the weight columns of a box rule with its error estimate.

    Parameters
    ----------
    orders : (int, int) or int
        Two Gauss-Legendre orders (the nodes of both, side by side), or the points n (7 or
        15) of the finest nested rule per parameter.
    dimension : int
        Number of parameters d [-].

    Returns
    -------
    nodes : ndarray (m, d)
    weights : ndarray (m, c)
        Column 0 the better rule. Two orders: column 1 the lower order (c = 2). Nested:
        columns 1 + 2j, 2 + 2j the rule coarsened once and twice along parameter j
        (c = 1 + 2d; :func:`~planner.physics.forces.quadrature_rules.nested_tensor_rule`).

    Notes
    -----
    The error parts of a box (:func:`box_sums`): ``error_size(Q_0 - Q_1)`` for two orders;
    for the nested rules one extrapolated estimate per parameter.

    References
    ----------
    Davis & Rabinowitz (1984), sec. 5.6 and 6.2; Patterson, Math. Comp. 22, 847 (1968).

    Examples
    --------
    >>> nodes, weights = box_rule(7, 2)
    >>> nodes.shape, weights.shape
    ((49, 2), (49, 5))
    """
    if np.ndim(orders) == 0:
        return nested_tensor_rule((("interval", int(orders)),) * dimension)
    rule_low, rule_high = (tensor_gauss_rule(order, dimension) for order in orders)
    n_low, n_high = len(rule_low[1]), len(rule_high[1])
    weights = np.zeros((n_low + n_high, 2))
    weights[n_low:, 0] = rule_high[1]
    weights[:n_low, 1] = rule_low[1]
    return np.concatenate([rule_low[0], rule_high[0]]), weights


def _box_arrays(boxes):
    """Map indices, low and high corners of a list of (map index, low, high) boxes."""
    face = np.array([b[0] for b in boxes], dtype=int)
    low = np.array([b[1] for b in boxes], dtype=float)
    high = np.array([b[2] for b in boxes], dtype=float)
    return face, low, high


def box_nodes(maps, face, low, high, orders: tuple[int, int] | int = DEFAULT_ORDERS):
    """Points and weights of a box rule on every box.

    Parameters
    ----------
    maps : sequence of callables
        As in :func:`adaptive_box_integral`.
    face : array (b,) of int
        Map index of each box.
    low, high : arrays (b, d)
        Box corners in parameter space.
    orders : (int, int) or int
        As in :func:`box_rule`.

    Returns
    -------
    points : ndarray (b, m, 3)
        Mapped nodes [m].
    weight : ndarray (b, m)
        The map's measure at the nodes times the box volume in parameter space.
    rule_weights : ndarray (m, c)
        The rule's weight columns (:func:`box_rule`).

    Notes
    -----
    Rule nodes scaled onto each box; the integral over a box by rule column j is
    sum_i rule_weights[i, j] * f(points_i) * weight_i.

    References
    ----------
    Davis & Rabinowitz, Methods of Numerical Integration (1984), sec. 5.6.
    """
    nodes, rule_weights = box_rule(orders, low.shape[1])
    per_box = len(nodes)
    span = high - low
    params = low[:, None, :] + span[:, None, :] * nodes[None, :, :]
    if face.min() == face.max():  # all boxes on one face: one call of its map
        p, m = maps[face[0]](params.reshape(-1, low.shape[1]))
        points, measure = p.reshape(len(face), per_box, 3), m.reshape(len(face), per_box)
    else:
        points = np.empty(params.shape[:2] + (3,))
        measure = np.empty(params.shape[:2])
        for index in np.unique(face):
            mine = face == index
            p, m = maps[index](params[mine].reshape(-1, low.shape[1]))
            points[mine] = p.reshape(-1, per_box, 3)
            measure[mine] = m.reshape(-1, per_box)
    return points, measure * np.prod(span, axis=1)[:, None], rule_weights


def box_sums(values, rule_weights, error_size):
    """Value and error parts of every box from the weighted integrand at its nodes.

    Parameters
    ----------
    values : array (b, m, k)
        Integrand times ``weight`` at the nodes of :func:`box_nodes`.
    rule_weights : array (m, c)
    error_size : callable
        As in :func:`adaptive_box_integral`.

    Returns
    -------
    value : ndarray (b, k)
        The better rule (column 0).
    error : ndarray (b, p)
        Two orders (c = 2): ``error_size(Q_0 - Q_1)``, p = 1. Nested rules (c = 1 + 2d):
        for each parameter j the extrapolated estimate from ``error_size(Q_0 - Q_1+2j)``
        and ``error_size(Q_1+2j - Q_2+2j)``, p = d.
    """
    sums = np.matmul(rule_weights.T, values)  # (c, m) @ (b, m, k) -> (b, c, k)
    if sums.shape[1] == 2:
        return sums[:, 0], error_size(sums[:, :1] - sums[:, 1:])
    once, twice = sums[:, 1::2], sums[:, 2::2]
    return sums[:, 0], extrapolated_error(error_size(sums[:, :1] - once),
                                          error_size(once - twice))


def _bisect(face, low, high, along):
    """Split each box at its midpoint along the parameters flagged in ``along`` (b, d)."""
    dimension = low.shape[1]
    mid = (low + high) / 2
    faces, lows, highs = [], [], []
    for pattern in np.unique(along, axis=0):
        mine = np.all(along == pattern, axis=1)
        axes = np.flatnonzero(pattern)
        corners = np.zeros((2 ** len(axes), dimension), dtype=int)
        corners[:, axes] = np.array(np.meshgrid(*([[0, 1]] * len(axes)),
                                                indexing="ij")).reshape(len(axes), -1).T
        split = corners[None, :, :] == 1
        child_low = np.where(split, mid[mine][:, None, :], low[mine][:, None, :])
        child_high = np.where(split | ~pattern[None, None, :], high[mine][:, None, :],
                              mid[mine][:, None, :])
        faces.append(np.repeat(face[mine], len(corners)))
        lows.append(child_low.reshape(-1, dimension))
        highs.append(child_high.reshape(-1, dimension))
    return np.concatenate(faces), np.concatenate(lows), np.concatenate(highs)
