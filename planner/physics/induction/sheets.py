"""Cylindrical current sheets (ideal solenoids) in closed form.

A uniformly magnetized axial cylinder is exactly a current sheet of surface current
``J / mu0`` on its curved face (Derby & Olbert 2010), and a winding layer is a sheet of
``N I / l``. So one set of formulas serves magnets and coils.

Derivation of the flux [D]
--------------------------
A sheet of radius ``a`` with surface current ``K`` between ``z1`` and ``z2`` has
``A_phi(rho, z) = (mu0 K a / 2 pi) [I(z2 - z) - I(z1 - z)]`` where
``I(u) = int_0^pi cos(phi) asinh(u / q) dphi``, ``q^2 = a^2 + rho^2 - 2 a rho cos(phi)``.
Integrating by parts and putting ``phi = pi - 2 theta`` turns ``I`` into complete elliptic
integrals, which in Carlson's symmetric form read

    I(u) = (2 u / 3 S) [R_D(0, 1 - m, 1) - g^2 R_J(0, 1 - m, 1, g^2)]
         = (2 u / S) [(K(m) - E(m)) / m - g^2 cel(k', g^2, 0, 1)],

``S^2 = (a + rho)^2 + u^2``, ``m = 4 a rho / S^2``, ``g = (a - rho)/(a + rho)``. Checks: for a
long sheet ``I(inf) - I(-inf)`` gives the flux ``mu0 K pi min(a, rho)^2``; the tests compare
with direct quadrature of Maxwell's formula. The radial field ``B_rho = -dA_phi/dz`` needs only
``dI/du = 2 Psi(m) / (k sqrt(a rho))`` (the loop's own vector potential).

References
----------
K. W. Derby & S. Olbert, Am. J. Phys. 78, 229-235 (2010) (magnet = ideal solenoid).
B. C. Carlson, Numer. Algorithms 10, 13-26 (1995) (R_D, R_J);
R. Bulirsch, Numer. Math. 13, 305-315 (1969) (cel).
"""
from __future__ import annotations

import numpy as np

from planner.physics.constants import mu_0
from planner.physics.fields.elliptic import complete_elliptic_integrals, legendre_k_and_e
from planner.physics.gauss import gauss_panels

from .loops import elliptic_psi_over_k


def _cel_zero_one(kc, p):
    """Bulirsch's cel(kc, p, 0, 1) [-], by the fields module's shared iteration."""
    kc, p = np.broadcast_arrays(np.asarray(kc, dtype=float), np.asarray(p, dtype=float))
    value = complete_elliptic_integrals(kc.ravel(), [(p.ravel(), [(0.0, 1.0)])])[0][0]
    return value.reshape(kc.shape)


def _k_minus_e_over_m(m, kc2):
    """``(K(m) - E(m)) / m`` without cancellation; ``kc2 = 1 - m`` given exactly [-]."""
    small = m < 1e-3
    complete_k, complete_e = legendre_k_and_e(np.sqrt(kc2))
    with np.errstate(divide="ignore", invalid="ignore"):
        direct = (complete_k - complete_e) / m
    series = np.pi / 4.0 * (1.0 + m * (3.0 / 8.0 + m * (15.0 / 64.0 + m * 175.0 / 1024.0)))
    return np.where(small, series, direct)


def _sheet_integral(a, rho, u):
    """I(u) of the module notes, times ``a rho``: the flux per unit ``mu0 K`` is its difference.

    ``R_D(0, kc^2, 1) = 3 (K - E)/m`` and ``R_J(0, kc^2, 1, p) = 3 cel(kc, p, 0, 1)`` [D: both
    sides equal ``3 int sin^2 / ((cos^2 + p sin^2) Delta)``, with ``p = 1`` for R_D].
    """
    a, rho, u = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (a, rho, u)))
    s2 = (a + rho) ** 2 + u**2
    kc2 = ((a - rho) ** 2 + u**2) / s2            # 1 - m, computed without cancellation
    m = 4.0 * a * rho / s2
    g2 = ((a - rho) / (a + rho)) ** 2
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        first = _k_minus_e_over_m(m, kc2)
        bore = g2 > 0.0
        if np.all(bore):
            second = g2 * _cel_zero_one(np.sqrt(kc2), g2)
        else:                                # circle on the sheet's radius: the term vanishes
            second = np.zeros_like(first)
            second[bore] = g2[bore] * _cel_zero_one(np.sqrt(kc2[bore]), g2[bore])
        value = 2.0 * u / np.sqrt(s2) * (first - second)
    good = (u != 0.0) & (rho > 0.0) & (a > 0.0) & (kc2 > 0.0)
    return np.where(good, a * rho * value, 0.0)


def sheet_flux(sheet_radius, loop_radius, start_offset, end_offset, surface_current):
    """Flux of a finite cylindrical current sheet through a coaxial circle [Wb].

    Parameters
    ----------
    sheet_radius : float or array
        Radius of the sheet [m].
    loop_radius : float or array
        Radius of the circle [m].
    start_offset, end_offset : float or array
        Axial positions of the sheet's two ends measured from the circle's plane,
        ``start_offset < end_offset`` [m].
    surface_current : float or array
        Azimuthal current per unit length ``K`` [A/m]; ``J/mu0`` for a magnet.

    Notes
    -----
    ``Phi = mu0 K a rho [I(end) - I(start)]`` (module notes). Exact for an ideal sheet; valid
    everywhere, including circles that cut through the sheet. Vectorised by broadcasting.

    References
    ----------
    Derby & Olbert, Am. J. Phys. 78, 229 (2010); derivation in the module docstring [D].

    >>> from planner.physics.constants import mu_0
    >>> flux = sheet_flux(0.01, 0.005, -100.0, 100.0, 1.0 / mu_0)   # long sheet, B = 1 T
    >>> round(float(flux / (np.pi * 0.005**2)), 6)
    1.0
    """
    upper = _sheet_integral(sheet_radius, loop_radius, end_offset)
    lower = _sheet_integral(sheet_radius, loop_radius, start_offset)
    return mu_0 * np.asarray(surface_current, dtype=float) * (upper - lower)


def sheet_radial_field(sheet_radius, radius, start_offset, end_offset, surface_current):
    """Radial flux density of a finite cylindrical current sheet [T].

    Parameters
    ----------
    sheet_radius : float or array
        Radius of the sheet [m].
    radius : float or array
        Distance of the field point from the axis [m].
    start_offset, end_offset : float or array
        Axial positions of the sheet's ends measured from the field point [m].
    surface_current : float or array
        Surface current ``K`` [A/m].

    Notes
    -----
    ``B_rho = (mu0 K / pi) sqrt(a / rho) [Psi(m_end)/k_end - Psi(m_start)/k_start]`` with
    ``m = 4 a rho / ((a + rho)^2 + u^2)``, ``u`` the end offsets. Logarithmically singular on the
    sheet's end rings; zero on the axis.

    References
    ----------
    Derby & Olbert, Am. J. Phys. 78, 229 (2010); re-derived from ``B_rho = -dA_phi/dz`` [D].
    """
    a = np.asarray(sheet_radius, dtype=float)
    rho = np.asarray(radius, dtype=float)
    terms = []
    for u in (end_offset, start_offset):
        u = np.asarray(u, dtype=float)
        terms.append(elliptic_psi_over_k(4.0 * a * rho / ((a + rho) ** 2 + u**2)))
    with np.errstate(divide="ignore", invalid="ignore"):
        scale = np.where(rho > 0.0, np.sqrt(a / np.where(rho > 0.0, rho, 1.0)), 0.0)
    return mu_0 * np.asarray(surface_current, dtype=float) / np.pi * scale * (terms[0] - terms[1])


def coaxial_sheet_mutual_inductance(radius_1, length_1, turns_1, radius_2, length_2, turns_2,
                                    offset=0.0, nodes_per_panel=12):
    """Mutual inductance of two coaxial single-layer windings treated as current sheets [H].

    Parameters
    ----------
    radius_1, length_1, turns_1 : float (radii and turns may be arrays, broadcast together)
        Radius [m], winding length [m] and turns [-] of winding 1.
    radius_2, length_2, turns_2 : float
        The same for winding 2.
    offset : float
        Axial distance from the centre of winding 1 to the centre of winding 2 [m].
    nodes_per_panel : int
        Gauss-Legendre nodes on each panel of winding 2's length [-].

    Notes
    -----
    ``M = (N2 / l2) int Phi_1(rho2, z) dz / I`` over winding 2, with ``Phi_1`` the closed-form
    flux of sheet 1 (``K = N1 I / l1``). Panels break at sheet 1's ends, where the integrand's
    derivative is singular, and are graded towards them. Sheets are exact for close-wound
    windings whose pitch is small against their distance from each other.

    References
    ----------
    Grover, Inductance Calculations, ch. 13-15 (1946) (coaxial solenoids); closed-form sheet
    flux as in the module notes [D].
    """
    half_1, half_2 = length_1 / 2.0, length_2 / 2.0
    start, end = offset - half_2, offset + half_2
    scale = max(min(length_1, length_2), 1e-9)
    grading = scale * np.array([1e-4, 1e-3, 1e-2, 0.05, 0.15, 0.4])
    breaks = [start, end]
    for edge in (-half_1, half_1):
        breaks.extend(edge + grading)
        breaks.extend(edge - grading)
        breaks.append(edge)
    breaks = np.clip(np.array(breaks), start, end)
    z, w = gauss_panels(np.unique(breaks), nodes_per_panel)
    radius_1 = np.asarray(radius_1, dtype=float)[..., None]
    radius_2 = np.asarray(radius_2, dtype=float)[..., None]
    flux = sheet_flux(radius_1, radius_2, -half_1 - z, half_1 - z, np.asarray(turns_1)[..., None] / length_1)
    mutual = np.asarray(turns_2) / length_2 * np.sum(w * flux, axis=-1)
    return float(mutual) if mutual.ndim == 0 else mutual
