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

__all__ = ["gauss_legendre"]


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
