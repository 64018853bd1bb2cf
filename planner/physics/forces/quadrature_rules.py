"""Quadrature rules on the unit interval and the unit cube: Gauss-Legendre, Gauss-Kronrod and
the trapezoidal rule for periodic parameters, each with an embedded lower rule.

An embedded rule uses a subset of the nodes of the full rule, so the difference of the two
(the error estimate) costs no extra integrand values:

* Gauss-Kronrod: the n Gauss-Legendre nodes plus n + 1 Kronrod nodes between them; the
  2n + 1 point rule is exact for polynomials of degree 3n + 1 (n even) or 3n + 2 (n odd),
  the embedded Gauss rule for degree 2n - 1;
* trapezoidal rule on a full period with m equally spaced nodes; the embedded rule takes
  every other node. For a smooth periodic integrand its error falls geometrically with m
  (exponentially convergent), and it is exact for trigonometric polynomials of degree < m.

References
----------
P. J. Davis and P. Rabinowitz, *Methods of Numerical Integration*, 2nd ed., Academic Press
(1984), sec. 2.7 (Gauss-Legendre), sec. 2.9 (trapezoidal rule for periodic functions).
A. S. Kronrod, *Nodes and Weights of Quadrature Formulas*, Consultants Bureau (1965).
D. P. Laurie, "Calculation of Gauss-Kronrod quadrature rules", Math. Comp. 66, 1133-1145
(1997).
L. N. Trefethen and J. A. C. Weideman, "The exponentially convergent trapezoidal rule",
SIAM Review 56, 385-458 (2014).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np
from numpy.polynomial import legendre


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
    x, w = legendre.leggauss(order)
    return _tensor([(x + 1.0) / 2.0] * dimension, [w / 2.0] * dimension)


@lru_cache(maxsize=None)
def gauss_kronrod_rule(gauss_points: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Gauss-Kronrod rule on [0, 1] with its embedded Gauss-Legendre rule.

    Parameters
    ----------
    gauss_points : int
        n, the number of Gauss nodes (1 to 10) [-].

    Returns
    -------
    nodes : ndarray (2n + 1,)
        Increasing nodes in (0, 1) [-].
    kronrod_weights : ndarray (2n + 1,)
        Weights of the full rule, summing to 1 [-].
    gauss_weights : ndarray (2n + 1,)
        Weights of the embedded n-point Gauss rule, zero at the Kronrod nodes [-].

    Notes
    -----
    The Kronrod nodes are the zeros of the Stieltjes polynomial E_{n+1}, the monic
    polynomial of degree n + 1 with integral P_n(x) E_{n+1}(x) x^k dx = 0 over [-1, 1] for
    k = 0..n (P_n the Legendre polynomial). Here E_{n+1} is found by solving these n + 1
    conditions in the Legendre basis, and the weights by requiring exactness for P_0 ..
    P_{2n}; the rule is then exact up to degree 3n + 1 (3n + 2 for odd n). Computed in
    double precision, which is ample for n <= 10.

    References
    ----------
    Kronrod (1965); Laurie, Math. Comp. 66, 1133-1145 (1997); Davis & Rabinowitz (1984),
    sec. 2.7.1.

    Examples
    --------
    >>> nodes, kronrod, gauss = gauss_kronrod_rule(3)
    >>> len(nodes), round(float(kronrod.sum()), 12), round(float(gauss.sum()), 12)
    (7, 1.0, 1.0)
    """
    n = gauss_points
    if not 1 <= n <= 10:
        raise ValueError(f"gauss_points must be 1..10; got {n}")
    gauss_nodes, gauss_w = legendre.leggauss(n)
    # exact inner products by a Gauss rule of ample order
    x, w = legendre.leggauss(2 * n + 2)
    p_n = legendre.legval(x, np.eye(n + 1)[n])
    basis = legendre.legvander(x, n + 1)  # P_0 .. P_{n+1} at x
    conditions = np.array([(w * p_n * x**k) @ basis for k in range(n + 1)])
    lower = np.linalg.solve(conditions[:, :n + 1], -conditions[:, n + 1])
    new_nodes = np.real(legendre.legroots(np.r_[lower, 1.0]))
    nodes = np.sort(np.r_[gauss_nodes, new_nodes])
    moments = np.zeros(2 * n + 1)
    moments[0] = 2.0
    kronrod_w = np.linalg.solve(legendre.legvander(nodes, 2 * n).T, moments)
    embedded = np.zeros(2 * n + 1)
    embedded[np.searchsorted(nodes, gauss_nodes - 1e-12)] = gauss_w
    return (nodes + 1.0) / 2.0, kronrod_w / 2.0, embedded / 2.0


@lru_cache(maxsize=None)
def periodic_rule(points: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Trapezoidal rule on one period [0, 1) with the embedded rule on every other node.

    Parameters
    ----------
    points : int
        m, an even number of equally spaced nodes [-].

    Returns
    -------
    nodes : ndarray (m,)
        (k + 1/2) / m [-].
    weights : ndarray (m,)
        1/m each [-].
    half_weights : ndarray (m,)
        2/m on the even nodes, 0 on the odd ones [-].

    Notes
    -----
    Exact for trigonometric polynomials of degree < m (the embedded rule: < m/2).

    References
    ----------
    Trefethen & Weideman, SIAM Review 56, 385-458 (2014); Davis & Rabinowitz (1984), 2.9.

    Examples
    --------
    >>> nodes, weights, half = periodic_rule(8)
    >>> round(float(weights @ np.cos(2 * np.pi * nodes) ** 2), 12)
    0.5
    """
    if points % 2:
        raise ValueError(f"points must be even; got {points}")
    half = np.zeros(points)
    half[::2] = 2.0 / points
    return (np.arange(points) + 0.5) / points, np.full(points, 1.0 / points), half


@lru_cache(maxsize=None)
def nested_tensor_rule(kinds: tuple) -> tuple[np.ndarray, np.ndarray]:
    """Tensor rule on [0, 1]^d with, for each parameter, the rule lowered along it alone.

    Parameters
    ----------
    kinds : tuple of (str, int)
        Per parameter ``("kronrod", n)`` (Gauss-Kronrod, 2n + 1 nodes) or ``("periodic",
        m)`` (trapezoidal rule over one full period, m nodes).

    Returns
    -------
    nodes : ndarray (N, d)
        Tensor nodes [-].
    weights : ndarray (N, 1 + d)
        Column 0: the full tensor rule. Column 1 + j: the same rule with parameter j
        integrated by its embedded lower rule (Gauss, or every other periodic node) [-].

    Notes
    -----
    The difference of column 0 and column 1 + j estimates the error made along parameter
    j; their sum estimates the error of the lower tensor rule, an overestimate of the
    error of the full rule wherever the rules converge.

    References
    ----------
    Davis & Rabinowitz (1984), sec. 5.6 (product rules) and 6.2 (error estimates).

    Examples
    --------
    >>> nodes, weights = nested_tensor_rule((("kronrod", 2), ("periodic", 4)))
    >>> nodes.shape, weights.sum(axis=0).round(12).tolist()
    ((20, 2), [1.0, 1.0, 1.0])
    """
    grids, full, lowered = [], [], []
    for kind, count in kinds:
        if kind == "kronrod":
            x, w_full, w_low = gauss_kronrod_rule(count)
        elif kind == "periodic":
            x, w_full, w_low = periodic_rule(count)
        else:
            raise ValueError(f"unknown rule {kind!r}")
        grids.append(x)
        full.append(w_full)
        lowered.append(w_low)
    nodes, weight_full = _tensor(grids, full)
    columns = [weight_full]
    for j in range(len(kinds)):
        columns.append(_tensor(grids, full[:j] + [lowered[j]] + full[j + 1:])[1])
    weights = np.stack(columns, axis=1)
    nodes.flags.writeable = False
    weights.flags.writeable = False
    return nodes, weights


def _tensor(grids, weights):
    """Tensor-product nodes (N, d) and weights (N,) of one-dimensional rules."""
    mesh = np.meshgrid(*grids, indexing="ij")
    weight_mesh = np.meshgrid(*weights, indexing="ij")
    nodes = np.stack([g.ravel() for g in mesh], axis=1)
    return nodes, np.prod(np.stack([g.ravel() for g in weight_mesh], axis=1), axis=1)
