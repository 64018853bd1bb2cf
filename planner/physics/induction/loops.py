"""Circular current loops: Maxwell's coaxial mutual inductance and the loop's vector potential.

Everything here rests on one combination of complete elliptic integrals,
``Psi(m) = (1 - m/2) K(m) - E(m)`` with the parameter ``m = k^2`` (K and E from
:func:`planner.physics.fields.elliptic.legendre_k_and_e`). For small ``m`` the two terms cancel, so the hypergeometric
series ``Psi(m) = (pi m^2 / 32) 2F1(3/2, 3/2; 3; m)`` is used there [D: expand K and E in
powers of m; checked numerically against the direct form to 1e-13 for m >= 0.1].

References
----------
J. C. Maxwell, A Treatise on Electricity and Magnetism, Vol. 2, Art. 701 (3rd ed., 1891).
W. R. Smythe, Static and Dynamic Electricity, 3rd ed., section 7.10 (1968): vector potential
of a circular loop.
F. W. Grover, Inductance Calculations (Van Nostrand, 1946; Dover reprint 2004).
"""
from __future__ import annotations

import numpy as np

from planner.physics.constants import mu_0
from planner.physics.fields.elliptic import legendre_k_and_e

_SERIES_LIMIT = 0.25


def elliptic_psi(m):
    """``(1 - m/2) K(m) - E(m)`` computed without cancellation [-].

    Parameters
    ----------
    m : float or array
        Elliptic parameter ``m = k^2`` in [0, 1] [-].

    Notes
    -----
    For ``m < 0.25`` the series ``(pi m^2/32) 2F1(3/2, 3/2; 3; m)`` is used; above it the
    direct form. ``m = 1`` gives ``inf`` (coincident filaments).

    References
    ----------
    Abramowitz & Stegun, Handbook of Mathematical Functions, 17.3.11-12 and 15.1.1 (1964).

    With K(1/2) = 1.8540747 and E(1/2) = 1.3506439 (A & S Table 17.1):

    >>> round(float(elliptic_psi(0.5)), 6)
    0.039912
    """
    m = np.asarray(m, dtype=float)
    small = m < _SERIES_LIMIT
    series = np.pi * m**2 / 32.0 * _hypergeometric_3_2(np.where(small, m, 0.0))
    complete_k, complete_e = legendre_k_and_e(np.sqrt(np.clip(1.0 - m, 0.0, 1.0)))
    with np.errstate(invalid="ignore"):
        direct = (1.0 - m / 2.0) * complete_k - complete_e
    return np.where(small, series, direct)


def _hypergeometric_3_2(m):
    """Gauss's series 2F1(3/2, 3/2; 3; m) for 0 <= m < 1/4, summed to rounding [-].

    Term ratio (3/2 + n)^2 m / ((3 + n)(n + 1)) < m (A & S 15.1.1): 30 terms reach 1e-18.
    """
    term = np.ones_like(m)
    total = np.ones_like(m)
    for n in range(60):
        term = term * ((1.5 + n) ** 2 / ((3.0 + n) * (n + 1.0))) * m
        total = total + term
        if not np.any(term > 1e-18 * total):
            break
    return total


def elliptic_psi_over_k(m):
    """``Psi(m) / sqrt(m)``, finite at ``m = 0`` where it vanishes [-].

    >>> float(elliptic_psi_over_k(0.0))
    0.0
    """
    m = np.asarray(m, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = elliptic_psi(m) / np.sqrt(m)
    return np.where(m > 0.0, ratio, 0.0)


def coaxial_loop_mutual_inductance(radius_1, radius_2, distance):
    """Maxwell's mutual inductance of two coaxial circular filaments [H].

    Parameters
    ----------
    radius_1, radius_2 : float or array
        Loop radii [m].
    distance : float or array
        Axial distance between the loop planes [m].

    Returns
    -------
    float or array
        Mutual inductance [H]; ``inf`` for coincident loops.

    Notes
    -----
    ``M = mu0 sqrt(a b) [(2/k - k) K(k) - (2/k) E(k)] = 2 mu0 sqrt(a b) Psi(m)/k`` with
    ``m = k^2 = 4 a b / ((a + b)^2 + d^2)``. Exact for filaments of zero thickness; far apart it
    tends to ``mu0 pi a^2 b^2 / (2 d^3)``.

    References
    ----------
    Maxwell, Treatise Vol. 2, Art. 701 (1891); Grover, Inductance Calculations, ch. 13 (1946).

    >>> from planner.physics.constants import mu_0
    >>> round(float(coaxial_loop_mutual_inductance(1.0, 1.0, 1000.0) / (mu_0 * np.pi / 2e9)), 4)
    1.0
    """
    a = np.asarray(radius_1, dtype=float)
    b = np.asarray(radius_2, dtype=float)
    d = np.asarray(distance, dtype=float)
    m = 4.0 * a * b / ((a + b) ** 2 + d**2)
    return 2.0 * mu_0 * np.sqrt(a * b) * elliptic_psi_over_k(m)


def loop_vector_potential(loop_radius, radius, axial_offset, current=1.0):
    """Azimuthal vector potential of a circular current loop [T m].

    Parameters
    ----------
    loop_radius : float or array
        Radius of the current loop [m].
    radius : float or array
        Distance of the field point from the loop's axis [m].
    axial_offset : float or array
        Axial distance of the field point from the loop's plane [m].
    current : float
        Loop current [A].

    Notes
    -----
    ``A_phi = (mu0 I / pi) sqrt(a / rho) Psi(m) / k`` with ``m = 4 a rho / ((a + rho)^2 + z^2)``
    (Smythe 1968, 7.10). The flux of the loop through a coaxial circle of radius rho is
    ``2 pi rho A_phi``, which is Maxwell's formula. Zero on the axis.

    References
    ----------
    W. R. Smythe, Static and Dynamic Electricity, 3rd ed., 7.10 (1968).
    """
    a = np.asarray(loop_radius, dtype=float)
    rho = np.asarray(radius, dtype=float)
    z = np.asarray(axial_offset, dtype=float)
    m = 4.0 * a * rho / ((a + rho) ** 2 + z**2)
    with np.errstate(divide="ignore", invalid="ignore"):
        scale = np.where(rho > 0.0, np.sqrt(a / np.where(rho > 0.0, rho, 1.0)), 0.0)
    return mu_0 * current / np.pi * scale * elliptic_psi_over_k(m)
