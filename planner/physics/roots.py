"""Root of a bracketed scalar function and maximum of one over an interval.

Two small classical algorithms written out here so that the program does not import
``scipy.optimize`` for them: that import (which pulls in scipy's linear algebra, sparse
and FFT packages) was a third of the time the command line took to start.

References
----------
R. P. Brent, *Algorithms for Minimization without Derivatives*, Prentice-Hall (1973),
ch. 4 (the zero finder: inverse quadratic interpolation, secant and bisection steps, never
slower than bisection by more than a fixed factor) and ch. 5 (golden-section search).
J. Kiefer, Proc. Am. Math. Soc. 4, 502-506 (1953) (golden-section search).
"""
from __future__ import annotations

import math

__all__ = ["bracketed_root", "golden_section_maximum"]


def bracketed_root(function, low: float, high: float, xtol: float = 1e-12, rtol: float = 4e-16,
                   max_iterations: int = 200) -> float:
    """A root of ``function`` in [low, high], where the function changes sign.

    Parameters
    ----------
    function : callable
        Continuous scalar function of one float.
    low, high : float
        Ends of the bracket; ``function(low)`` and ``function(high)`` must not have the
        same sign.
    xtol, rtol : float
        The root is returned once the bracket is narrower than about
        ``2 * (xtol + rtol * |x|)`` (same unit as x).
    max_iterations : int
        Safety limit on function calls.

    Returns
    -------
    float
        A point within the tolerance of a sign change of ``function``.

    Notes
    -----
    Brent's method (1973, ch. 4): keeps a bracket [b, c] with the best estimate b; tries
    inverse quadratic interpolation (or the secant step with two points), accepts it only
    if it falls well inside the bracket and shrinks it fast enough, otherwise bisects.

    Examples
    --------
    >>> round(bracketed_root(lambda x: x * x - 2.0, 0.0, 2.0), 12)
    1.414213562373
    """
    a, b = float(low), float(high)
    fa, fb = float(function(a)), float(function(b))
    if fa == 0.0:
        return a
    if fb == 0.0:
        return b
    if (fa > 0) == (fb > 0):
        raise ValueError("the function has the same sign at both ends of the bracket")
    c, fc = a, fa
    step = previous_step = b - a
    for _ in range(max_iterations):
        if (fb > 0) == (fc > 0):  # keep the root between b and c
            c, fc = a, fa
            step = previous_step = b - a
        if abs(fc) < abs(fb):  # b is the best estimate so far
            a, b, c = b, c, b
            fa, fb, fc = fb, fc, fb
        tolerance = 2 * rtol * abs(b) + 0.5 * xtol
        half = 0.5 * (c - b)
        if abs(half) <= tolerance or fb == 0.0:
            return b
        if abs(previous_step) >= tolerance and abs(fa) > abs(fb):
            s = fb / fa
            if a == c:  # secant
                p, q = 2 * half * s, 1 - s
            else:  # inverse quadratic interpolation
                q, r = fa / fc, fb / fc
                p = s * (2 * half * q * (q - r) - (b - a) * (r - 1))
                q = (q - 1) * (r - 1) * (s - 1)
            if p > 0:
                q = -q
            p = abs(p)
            if 2 * p < min(3 * half * q - abs(tolerance * q), abs(previous_step * q)):
                previous_step, step = step, p / q
            else:
                previous_step = step = half
        else:
            previous_step = step = half
        a, fa = b, fb
        b += step if abs(step) > tolerance else math.copysign(tolerance, half)
        fb = float(function(b))
    return b


_INVERSE_GOLDEN = (math.sqrt(5) - 1) / 2


def golden_section_maximum(function, low: float, high: float, xtol: float = 1e-3):
    """Maximum of a unimodal ``function`` on [low, high]: ``(x, function(x))``.

    Parameters
    ----------
    function : callable
        Scalar function of one float, with a single maximum in the interval.
    low, high : float
        The interval.
    xtol : float
        Width of the final interval (same unit as x).

    Returns
    -------
    (float, float)
        The best point found and its value.

    Notes
    -----
    Golden-section search (Kiefer 1953): each step keeps the part of the interval holding
    the larger of two interior values and reuses one of them, so the interval shrinks by
    0.618 per function call. The best point evaluated is returned.

    Examples
    --------
    >>> x, value = golden_section_maximum(lambda x: -(x - 0.3) ** 2, 0.0, 1.0, xtol=1e-8)
    >>> round(x, 6), round(value, 12)
    (0.3, -0.0)
    """
    a, b = float(low), float(high)
    left = b - _INVERSE_GOLDEN * (b - a)
    right = a + _INVERSE_GOLDEN * (b - a)
    f_left, f_right = float(function(left)), float(function(right))
    while b - a > xtol:
        if f_left >= f_right:
            b, right, f_right = right, left, f_left
            left = b - _INVERSE_GOLDEN * (b - a)
            f_left = float(function(left))
        else:
            a, left, f_left = left, right, f_right
            right = a + _INVERSE_GOLDEN * (b - a)
            f_right = float(function(right))
    return (left, f_left) if f_left >= f_right else (right, f_right)
