"""Bulirsch's generalized complete elliptic integral, vectorised over numpy arrays.

The field formulas of cylinders and rings need

    C(kc, p, c, s) = integral_0^(pi/2) (c cos^2 t + s sin^2 t)
                     / ((cos^2 t + p sin^2 t) sqrt(cos^2 t + kc^2 sin^2 t)) dt

for several pairs (c, s) that share the same modulus ``kc``. Bulirsch's iteration is linear
in (c, s) and its modulus sequence does not depend on p, so one pass serves every pair and
every parameter p at once; that is what :func:`complete_elliptic_integrals` does.

References
----------
R. Bulirsch, "Numerical calculation of elliptic integrals and elliptic functions. III",
Numer. Math. 13, 305-315 (1969).
N. Derby and S. Olbert, "Cylindrical magnets and ideal solenoids", Am. J. Phys. 78,
229-235 (2010), appendix (the same iteration written out).
"""
from __future__ import annotations

import math

import numpy as np

_TOLERANCE = 1e-8  # Bulirsch's test |g - kc| <= tol*g; quadratic convergence then gives ~1e-16
_MAX_STEPS = 60
FULL_ACCURACY = _TOLERANCE**2  # the default: the iteration runs to double precision


def complete_elliptic_integrals(kc, groups, first_kind=False, accuracy=FULL_ACCURACY):
    """Bulirsch's C(kc, p, c, s) for several (p, [(c, s), ...]) groups sharing ``kc``.

    Parameters
    ----------
    kc : ndarray
        Complementary modulus, 0 < kc [-]. Entries equal to 0 give NaN (the integral
        diverges there).
    groups : list of (p, list of (c, s))
        Each p > 0 (scalar or array broadcastable to ``kc``) with its pairs of
        coefficients c, s (scalars or arrays) [-].
    first_kind : bool
        Also return Legendre's K = C(kc, 1, 1, 1), which the shared modulus sequence
        gives at no cost.
    accuracy : float
        Relative error allowed in each integral, measured on the scale
        C(kc, p, |c|, |s|) [-]. The default runs to double precision; a caller that needs
        less (a force to 0.1 %) saves one or two steps.

    Returns
    -------
    list of list of ndarray
        ``result[i][j]`` is C(kc, p_i, c_ij, s_ij) [-].
    ndarray, only if ``first_kind``
        K(k) with k^2 = 1 - kc^2 [-].

    Notes
    -----
    Bulirsch's algorithm for p > 0: with k = |kc|, m = 1, p <- sqrt(p), s <- s/p, repeat
    c' = c + s/p, g = k_e/p, s' = 2 (s + c g), p' = p + g, m' = m + k, k <- 2 sqrt(k_e),
    k_e <- k m' until |m - k| <= tau m, then one step more; C = (pi/2) (s + c m)/(m (m + p)).
    The relative gap |m - k|/m falls quadratically (to about its square over 8 per step),
    so the error after that last step is about tau^2/8: tau = 1e-8 by default, and
    tau = sqrt(accuracy) otherwise (measured: at most tau^2/8 for kc in [1e-8, 1] and p in
    [1e-8, 10]; the tests check tau^2, the accuracy asked for).
    The modulus sequence (k, k_e, m) is shared by all groups. Convergence is quadratic;
    points with kc -> 0 (the rim of a cylinder face) take a few more steps. The number of
    steps is fixed beforehand from the smallest kc (the slowest to converge), so the loop
    carries no per-step test. Every (c, s) pair of every group is one row of a stacked
    array (its p repeated), so each step is the same seven array operations for any number
    of pairs. For (p, c, s) = (1, 1, 1) the iteration gives
    c = 2^n, s = 2^n m after n steps, so K = (pi/2) 2^n / m: Gauss's arithmetic-geometric
    mean, K = pi / (2 AGM(1, kc)).

    References
    ----------
    R. Bulirsch, Numer. Math. 13, 305-315 (1969).

    Examples
    --------
    >>> import numpy as np
    >>> [[K]] = complete_elliptic_integrals(np.array([1.0]), [(1.0, [(1.0, 1.0)])])
    >>> bool(np.isclose(K[0], np.pi / 2))
    True
    """
    kc = np.abs(np.asarray(kc, dtype=float))
    smallest = float(kc.min()) if kc.size else 1.0
    degenerate = None
    if not smallest > 0:  # kc = 0 (divergent) or NaN never converge; keep them out of the test
        degenerate = ~(kc > 0)
        smallest = float(kc[~degenerate].min()) if not degenerate.all() else 1.0
    steps = _steps_needed(smallest, max(_TOLERANCE, math.sqrt(accuracy)))
    # One row per (c, s) pair of every group, so that each step is a fixed handful of array
    # operations whatever the number of pairs: rows of c, s and p (p repeated for each pair
    # of its group; for p = 1 the sequence of p is that of m, which the row reproduces).
    count = sum(len(pairs) for _, pairs in groups)
    c_rows = np.empty((count,) + kc.shape)
    s_rows = np.empty((count,) + kc.shape)
    p_rows = np.empty((count,) + kc.shape)
    row = 0
    for p, pairs in groups:
        unit = isinstance(p, (int, float)) and p == 1.0
        for c, s in pairs:
            c_rows[row] = c
            if unit:
                p_rows[row] = 1.0
                s_rows[row] = s
            else:
                np.sqrt(p, out=p_rows[row])
                np.divide(s, p_rows[row], out=s_rows[row])
            row += 1
    k = kc.copy()
    k_e = kc.copy()
    m = np.empty_like(kc)
    m.fill(1.0)
    g = np.empty_like(p_rows)
    scratch = np.empty_like(p_rows)
    product = np.empty_like(p_rows)
    for step in range(steps):
        # c' = c + s/p and s' = 2 (s + c g), both from the old c and s; g = k_e/p, p' = p + g
        np.divide(k_e, p_rows, out=g)
        np.divide(s_rows, p_rows, out=scratch)
        np.multiply(c_rows, g, out=product)
        np.add(s_rows, product, out=s_rows)
        np.add(s_rows, s_rows, out=s_rows)
        np.add(c_rows, scratch, out=c_rows)
        np.add(p_rows, g, out=p_rows)
        np.add(m, k, out=m)
        if step + 1 < steps:
            np.sqrt(k_e, out=k)
            np.multiply(k, 2.0, out=k)
            np.multiply(k, m, out=k_e)
    p_rows += m
    p_rows *= m
    c_rows *= m
    c_rows += s_rows
    c_rows /= p_rows
    c_rows *= np.pi / 2
    if degenerate is not None:
        c_rows[:, degenerate] = np.nan
    results, row = [], 0
    for _, pairs in groups:
        results.append([c_rows[row + j] for j in range(len(pairs))])
        row += len(pairs)
    if first_kind:
        complete_k = (np.pi / 2 * 2.0**steps) / m
        if degenerate is not None:
            complete_k[degenerate] = np.nan
        return results, complete_k
    return results


def _steps_needed(smallest, tolerance=_TOLERANCE):
    """Number of Bulirsch steps after which every kc >= ``smallest`` (> 0) has converged.

    The modulus sequence (the arithmetic-geometric mean of 1 and kc) converges the more
    slowly the smaller kc, so the count is that of the smallest entry; it is run here on one
    float with the same operations and test as the array loop.
    """
    k = k_e = smallest
    m = 1.0
    for step in range(1, _MAX_STEPS + 1):
        converged = abs(m - k) <= tolerance * m
        m = m + k
        if converged:
            return step
        k = 2.0 * math.sqrt(k_e)
        k_e = k * m
    return _MAX_STEPS


def legendre_k_and_e(kc):
    """Legendre's complete integrals K and E from the complementary modulus ``kc`` [-].

    Parameters
    ----------
    kc : float or ndarray
        k' = sqrt(1 - m) with m = k^2 the parameter, 0 < kc <= 1 (0 gives K = inf).

    Returns
    -------
    K, E : ndarray
        K(m) and E(m) [-].

    Notes
    -----
    E = C(kc, 1, 1, kc^2) by Bulirsch's iteration (:func:`complete_elliptic_integrals`), K
    from the same modulus sequence. Taking kc rather than m keeps K accurate as m -> 1,
    where 1 - m would lose digits.

    References
    ----------
    R. Bulirsch, Numer. Math. 7, 78-90 (1965) and 13, 305-315 (1969); Abramowitz & Stegun
    17.3 (Table 17.1 check values).

    Examples
    --------
    A & S Table 17.1 at m = 1/2: K = 1.85407 46773, E = 1.35064 38810.

    >>> K, E = legendre_k_and_e(np.sqrt(0.5))
    >>> round(float(K), 9), round(float(E), 9)
    (1.854074677, 1.350643881)
    """
    kc = np.asarray(kc, dtype=float)
    flat = kc.reshape(-1)
    [[complete_e]], complete_k = complete_elliptic_integrals(flat, [(1.0, [(1.0, flat * flat)])],
                                                            first_kind=True)
    complete_k = np.where(flat == 0.0, np.inf, complete_k)
    complete_e = np.where(flat == 0.0, 1.0, complete_e)
    return complete_k.reshape(kc.shape), complete_e.reshape(kc.shape)


def carlson_rd(x: float, y: float, z: float) -> float:
    """Carlson's symmetric elliptic integral R_D(x, y, z), for x, y >= 0 (not both 0), z > 0 [-].

    R_D(x, y, z) = (3/2) integral_0^inf dt / ((t + x)^(1/2) (t + y)^(1/2) (t + z)^(3/2)).

    Notes
    -----
    Duplication: with lambda = sqrt(x y) + sqrt(y z) + sqrt(z x), each step replaces
    (x, y, z) by ((x + lambda)/4, ...) and adds 3 / (4^m sqrt(z) (z + lambda)) to the sum;
    once the three arguments agree to a relative 1e-3 (ten steps at most here), the rest is
    the fifth-order series in their deviations from their weighted mean A = (x + y + 3z)/5:
    X = 1 - x/A, Y = 1 - y/A, Z = -(X + Y)/3, E2 = XY - 6Z^2, E3 = (3XY - 8Z^2) Z,
    E4 = 3 (XY - Z^2) Z^2, E5 = X Y Z^3, and
    R_D ~ A^(-3/2) (1 - 3E2/14 + E3/6 + 9E2^2/88 - 3E4/22 - 9E2E3/52 + 3E5/26) (DLMF 19.36.2),
    whose first neglected terms are of order 1e-3^6 = 1e-18.

    References
    ----------
    B. C. Carlson, "Numerical computation of real or complex elliptic integrals", Numer.
    Algorithms 10, 13-26 (1995); NIST DLMF sec. 19.36 (https://dlmf.nist.gov/19.36).

    Examples
    --------
    >>> carlson_rd(1.0, 1.0, 1.0)
    1.0
    """
    total, scale = 0.0, 1.0
    for _ in range(60):
        mean = (x + y + 3.0 * z) / 5.0
        spread = max(abs(mean - x), abs(mean - y), abs(mean - z))
        if spread <= 1e-3 * mean:
            break
        root_x, root_y, root_z = math.sqrt(x), math.sqrt(y), math.sqrt(z)
        lam = root_x * root_y + root_y * root_z + root_z * root_x
        total += scale / (root_z * (z + lam))
        scale *= 0.25
        x, y, z = (x + lam) * 0.25, (y + lam) * 0.25, (z + lam) * 0.25
    big_x, big_y = 1.0 - x / mean, 1.0 - y / mean
    big_z = -(big_x + big_y) / 3.0
    xy, zz = big_x * big_y, big_z * big_z
    e2, e3 = xy - 6.0 * zz, (3.0 * xy - 8.0 * zz) * big_z
    e4, e5 = 3.0 * (xy - zz) * zz, xy * zz * big_z
    series = (1.0 - 3.0 * e2 / 14.0 + e3 / 6.0 + 9.0 * e2 * e2 / 88.0 - 3.0 * e4 / 22.0
              - 9.0 * e2 * e3 / 52.0 + 3.0 * e5 / 26.0)
    return 3.0 * total + scale * series / (mean * math.sqrt(mean))
