"""Gauss-Legendre nodes and weights, computed once per order.

numpy's ``leggauss`` rather than ``scipy.special.roots_legendre``: the latter loads
``scipy.linalg`` on first use (about 0.05 s of every command's start-up), and both give the
same rule to a few 1e-15 for the orders used here.

References
----------
Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 25.4.29 and table 25.4;
G. H. Golub and J. H. Welsch, Math. Comp. 23, 221-230 (1969) (nodes from the eigenvalues of
the Jacobi matrix, as numpy computes them, with one Newton step).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np

__all__ = ["gauss_legendre", "gauss_panels"]


@lru_cache(maxsize=64)
def _rule(order: int):
    nodes, weights = np.polynomial.legendre.leggauss(order)
    nodes.setflags(write=False)
    weights.setflags(write=False)
    return nodes, weights


def gauss_legendre(order: int):
    """Nodes and weights (order,) of the Gauss-Legendre rule on [-1, 1] [-].

    Exact for polynomials of degree up to 2 order - 1. The arrays are shared and read-only.

    Examples
    --------
    >>> x, w = gauss_legendre(2)
    >>> [round(float(v), 12) for v in x], [float(v) for v in w]
    ([-0.57735026919, 0.57735026919], [1.0, 1.0])
    """
    return _rule(int(order))


def gauss_panels(breaks, order: int):
    """Nodes and weights of the composite Gauss-Legendre rule on the panels between breakpoints.

    Parameters
    ----------
    breaks : array_like (..., n)
        Panel ends along the last axis, in ascending order [any unit, e.g. m or rad]. Taken as
        given: sort them (and drop repeats, if wanted) before the call. A repeated break makes
        a panel of zero width, whose nodes sit on the break with zero weight.
    order : int
        Gauss-Legendre nodes on each panel [-].

    Returns
    -------
    nodes, weights : ndarray (..., (n - 1) order)
        Nodes [unit of ``breaks``] and weights [unit of ``breaks``], panel after panel, each
        panel's nodes in ascending order. ``sum(weights * f(nodes), axis=-1)`` approximates the
        integral of ``f`` from ``breaks[..., 0]`` to ``breaks[..., -1]``, exactly for a
        polynomial of degree up to 2 order - 1 on each panel.

    Notes
    -----
    On a panel ``[a, b]`` the rule of :func:`gauss_legendre` maps to the nodes
    ``(a + b)/2 + (b - a)/2 x_i`` with weights ``(b - a)/2 w_i``.

    References
    ----------
    Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 25.4.29-30.

    Examples
    --------
    Three nodes per panel integrate a quintic exactly: the integral of ``x^5`` over [0, 1] is
    1/6, here over two unequal panels.

    >>> z, w = gauss_panels([0.0, 0.25, 1.0], 3)
    >>> z.shape, abs(float(w @ z**5) - 1.0 / 6.0) < 1e-15
    ((6,), True)

    Rows of ``breaks`` give one rule each: the integral of ``x^3`` over [0, 1] and over [0, 2].

    >>> z, w = gauss_panels([[0.0, 0.5, 1.0], [0.0, 1.0, 2.0]], 2)
    >>> [round(float(v), 14) for v in (w * z**3).sum(axis=-1)]
    [0.25, 4.0]
    """
    x, w = gauss_legendre(order)
    breaks = np.asarray(breaks, dtype=float)
    lo, hi = breaks[..., :-1, None], breaks[..., 1:, None]
    nodes = (lo + hi) / 2.0 + (hi - lo) / 2.0 * x
    weights = (hi - lo) / 2.0 * w
    shape = breaks.shape[:-1] + (-1,)
    return nodes.reshape(shape), weights.reshape(shape)
