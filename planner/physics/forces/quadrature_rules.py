"""Quadrature rules on the unit interval and the unit cube: Gauss-Legendre, the nested
Kronrod-Patterson rules and the trapezoidal rule for periodic parameters.

A nested rule uses a subset of the nodes of the next finer one, so comparing a rule with
its coarser members (the error estimate) costs no extra integrand values:

* on an interval, the sequence of 1, 3, 7, 15 points: midpoint, 3-point Gauss, its
  7-point Kronrod extension, Patterson's 15-point extension of that;
* over a full period, the trapezoidal rule with m, m/2 and m/4 equally spaced nodes. For a
  smooth periodic integrand its error falls geometrically with m (exponentially
  convergent), and it is exact for trigonometric polynomials of degree < m.

With three nested rules the rate of convergence can be read off the two differences, and
the error of the finest rule extrapolated (:func:`extrapolated_error`).

References
----------
P. J. Davis and P. Rabinowitz, *Methods of Numerical Integration*, 2nd ed., Academic Press
(1984), sec. 2.7 (Gauss-Legendre), sec. 2.9 (trapezoidal rule for periodic functions).
A. S. Kronrod, *Nodes and Weights of Quadrature Formulas*, Consultants Bureau (1965).
T. N. L. Patterson, Math. Comp. 22, 847-856 (1968).
D. P. Laurie, "Calculation of Gauss-Kronrod quadrature rules", Math. Comp. 66, 1133-1145
(1997).
L. N. Trefethen and J. A. C. Weideman, "The exponentially convergent trapezoidal rule",
SIAM Review 56, 385-458 (2014).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np
from numpy.polynomial import legendre

from planner.physics.gauss import gauss_legendre


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
    x, w = gauss_legendre(order)
    return _tensor([(x + 1.0) / 2.0] * dimension, [w / 2.0] * dimension)


@lru_cache(maxsize=None)
def nested_interval_rule(points: int) -> tuple[np.ndarray, np.ndarray]:
    """The nested rules of 1, 3, 7, 15 points on [0, 1] (Kronrod-Patterson sequence).

    Parameters
    ----------
    points : int
        Nodes of the finest rule: 3, 7 or 15 [-].

    Returns
    -------
    nodes : ndarray (points,)
        Increasing nodes in (0, 1) [-].
    weights : ndarray (points, 3)
        Column 0 the finest rule, column 1 the next coarser one and column 2 the one
        below that, each zero at the nodes it does not use (a 3-point rule has only the
        midpoint below it, and a zero column after that) [-].

    Notes
    -----
    Starting from the midpoint, each rule adds m + 1 nodes to the m it has: the zeros of
    the polynomial q of degree m + 1 with integral pi(x) q(x) x^k dx = 0 over [-1, 1] for
    k = 0..m, pi being the polynomial with the old nodes as zeros. The midpoint gives the
    3-point Gauss rule, that gives its 7-point Kronrod extension, and that Patterson's
    15-point rule. Weights follow from exactness for the Legendre polynomials P_0 ..
    P_{2m}; the rules of 3, 7, 15 points are exact to degree 5, 11 and 23. All weights are
    positive. Computed in double precision, ample at these sizes.

    References
    ----------
    Kronrod (1965); T. N. L. Patterson, "The optimum addition of points to quadrature
    formulae", Math. Comp. 22, 847-856 (1968); Laurie, Math. Comp. 66, 1133 (1997).

    Examples
    --------
    >>> nodes, weights = nested_interval_rule(7)
    >>> len(nodes), weights.sum(axis=0).round(12).tolist()
    (7, [1.0, 1.0, 1.0])
    """
    levels = {3: 2, 7: 3, 15: 4}
    if points not in levels:
        raise ValueError(f"points must be 3, 7 or 15; got {points}")
    rules = [(np.zeros(1), np.array([2.0]))]
    for _ in range(levels[points] - 1):
        rules.append(_extended_rule(rules[-1][0]))
    nodes = rules[-1][0]
    weights = np.zeros((len(nodes), 3))
    for column, (level_nodes, level_weights) in enumerate(rules[::-1][:3]):
        weights[np.searchsorted(nodes, level_nodes - 1e-12), column] = level_weights
    return (nodes + 1.0) / 2.0, weights / 2.0


def _extended_rule(old_nodes):
    """Nodes and weights on [-1, 1] of the optimal extension of a rule by m + 1 nodes."""
    m = len(old_nodes)
    x, w = gauss_legendre(2 * m + 2)  # exact for the products of degree <= 3m + 1 below
    node_polynomial = np.prod(x[:, None] - old_nodes[None, :], axis=1)
    basis = legendre.legvander(x, m + 1)  # P_0 .. P_{m+1} at x
    conditions = np.array([(w * node_polynomial * x**k) @ basis for k in range(m + 1)])
    coefficients = np.linalg.solve(conditions[:, :m + 1], -conditions[:, m + 1])
    new_nodes = np.real(legendre.legroots(np.r_[coefficients, 1.0]))
    nodes = np.sort(np.r_[old_nodes, new_nodes])
    moments = np.zeros(len(nodes))
    moments[0] = 2.0
    return nodes, np.linalg.solve(legendre.legvander(nodes, len(nodes) - 1).T, moments)


@lru_cache(maxsize=None)
def periodic_rule(points: int) -> tuple[np.ndarray, np.ndarray]:
    """Trapezoidal rule on one period [0, 1) with the rules on every 2nd and every 4th node.

    Parameters
    ----------
    points : int
        m, a multiple of 4: the number of equally spaced nodes [-].

    Returns
    -------
    nodes : ndarray (m,)
        k / m [-]: the coarser rules share the node at 0, so that all three sample the
        period with the same phase (with nodes at (k + 1/2) / m the every-other-node rule
        would be shifted by a quarter of its spacing, and for an integrand even about 0
        its leading error term would equal that of the full rule, hiding both).
    weights : ndarray (m, 3)
        Column 0: 1/m on every node; column 1: 2/m on every 2nd; column 2: 4/m on every
        4th [-].

    Notes
    -----
    Exact for trigonometric polynomials of degree < m (the coarser rules: < m/2, < m/4).

    References
    ----------
    Trefethen & Weideman, SIAM Review 56, 385-458 (2014); Davis & Rabinowitz (1984), 2.9.

    Examples
    --------
    >>> nodes, weights = periodic_rule(8)
    >>> (weights.T @ np.cos(2 * np.pi * nodes) ** 2).round(12).tolist()  # 2 nodes: not exact
    [0.5, 0.5, 1.0]
    """
    if points % 4:
        raise ValueError(f"points must be a multiple of 4; got {points}")
    weights = np.zeros((points, 3))
    for column, step in enumerate((1, 2, 4)):
        weights[::step, column] = step / points
    return np.arange(points) / points, weights


@lru_cache(maxsize=None)
def nested_tensor_rule(kinds: tuple) -> tuple[np.ndarray, np.ndarray]:
    """Tensor rule on [0, 1]^d with, for each parameter, the rules coarsened along it alone.

    Parameters
    ----------
    kinds : tuple of (str, int)
        Per parameter ``("interval", n)`` (the nested rules of n = 3, 7 or 15 points,
        :func:`nested_interval_rule`) or ``("periodic", m)`` (trapezoidal rule over one full
        period, m a multiple of 4, :func:`periodic_rule`).

    Returns
    -------
    nodes : ndarray (N, d)
        Tensor nodes [-].
    weights : ndarray (N, 1 + 2 d)
        Column 0: the full tensor rule. Columns 1 + 2j and 2 + 2j: the same rule with
        parameter j integrated by the next coarser and the one after that [-].

    Notes
    -----
    The differences between columns 0, 1 + 2j and 2 + 2j measure the error made along
    parameter j by the two coarser rules; :func:`extrapolated_error` turns them into an
    estimate for the full rule.

    References
    ----------
    Davis & Rabinowitz (1984), sec. 5.6 (product rules) and 6.2 (error estimates).

    Examples
    --------
    >>> nodes, weights = nested_tensor_rule((("interval", 3), ("periodic", 4)))
    >>> nodes.shape, weights.sum(axis=0).round(12).tolist()
    ((12, 2), [1.0, 1.0, 0.0, 1.0, 1.0])
    """
    grids, levels = [], []
    for kind, count in kinds:
        if kind == "interval":
            x, w = nested_interval_rule(count)
        elif kind == "periodic":
            x, w = periodic_rule(count)
        else:
            raise ValueError(f"unknown rule {kind!r}")
        grids.append(x)
        levels.append(w)
    full = [w[:, 0] for w in levels]
    nodes, weight_full = _tensor(grids, full)
    columns = [weight_full]
    for j in range(len(kinds)):
        for level in (1, 2):
            columns.append(_tensor(grids, full[:j] + [levels[j][:, level]] + full[j + 1:])[1])
    weights = np.stack(columns, axis=1)
    nodes.flags.writeable = False
    weights.flags.writeable = False
    return nodes, weights


#: Safety factor of the extrapolated error estimate (see :func:`extrapolated_error`).
EXTRAPOLATION_SAFETY = 100.0


def extrapolated_error(fine_difference, coarse_difference):
    """Error estimate of the finest of three nested rules from the differences between them.

    Parameters
    ----------
    fine_difference : array
        e1 = |Q_fine - Q_middle|, which measures the middle rule's error.
    coarse_difference : array
        e2 = |Q_middle - Q_coarse|, which measures the coarsest rule's error.

    Returns
    -------
    ndarray
        e1 * min(1, S (e1 / e2)^2) with S = ``EXTRAPOLATION_SAFETY``; e1 where e2 = 0.

    Notes
    -----
    For an integrand analytic near the interval (or periodic and analytic), both rule
    families converge geometrically, err(n) ~ C q^n, and each finer rule has about twice
    the nodes of the one before (1, 3, 7, 15, or m/4, m/2, m). Then e1 / e2 = q^(n_mid -
    n_coarse) and err(fine) = e1 q^(n_fine - n_mid) = e1 (e1 / e2)^2. The factor S guards
    against a rate still settling; when the ratio shows no fast convergence (S (e1/e2)^2
    >= 1) the estimate is e1 itself, the plain (pessimistic) difference estimate.

    References
    ----------
    Davis & Rabinowitz (1984), sec. 6.2-6.3 (error estimates from sequences of rules);
    T. O. Espelid, "Algorithm 868: Globally doubly adaptive quadrature - reliable Matlab
    codes", ACM Trans. Math. Softw. 33, 21 (2007) (estimates from the decay of
    differences between nested rules, with a safety factor).

    Examples
    --------
    >>> extrapolated_error(np.array([1e-5, 1e-2]), np.array([1e-2, 1e-2])).round(12).tolist()
    [1e-09, 0.01]
    """
    fine = np.asarray(fine_difference, dtype=float)
    coarse = np.asarray(coarse_difference, dtype=float)
    # min(1, S f^2 / c^2) = S f^2 / max(c^2, S f^2), with the tiny term for f = c = 0
    scaled = EXTRAPOLATION_SAFETY * fine * fine
    return fine * scaled / np.maximum(np.maximum(coarse * coarse, scaled), _TINY)


_TINY = np.finfo(float).tiny


def _tensor(grids, weights):
    """Tensor-product nodes (N, d) and weights (N,) of one-dimensional rules."""
    mesh = np.meshgrid(*grids, indexing="ij")
    weight_mesh = np.meshgrid(*weights, indexing="ij")
    nodes = np.stack([g.ravel() for g in mesh], axis=1)
    return nodes, np.prod(np.stack([g.ravel() for g in weight_mesh], axis=1), axis=1)
