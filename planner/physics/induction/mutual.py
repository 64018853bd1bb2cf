"""Mutual inductance of loops and coils in any position, coupling, and induced EMF.

General method [D]: the mutual inductance of two circular filaments is the line integral of
the first loop's closed-form vector potential (per ampere) around the second,
``M = oint A_1 . dl_2``. One periodic integral, done by the trapezoid rule, which converges
exponentially; this is the route of Babic, Sirois, Akyel & Girardi (2010), written here from
the vector potential directly. Coaxial coils use the exact current-sheet closed form instead.

References
----------
S. Babic, F. Sirois, C. Akyel & C. Girardi, IEEE Trans. Magn. 46, 3591-3600 (2010).
F. E. Neumann (1845): ``M = mu0/(4 pi) oint oint dl1.dl2 / |r1 - r2|`` (cross-check in tests).
Grover, Inductance Calculations (1946).
"""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import plane_basis
from planner.physics.gauss import gauss_legendre

from .coils import Winding, winding_inductance
from .loops import loop_vector_potential
from .sheets import coaxial_sheet_mutual_inductance

_COAXIAL_TOLERANCE = 1e-9


def _unit(vector):
    vector = np.asarray(vector, dtype=float)
    return vector / np.linalg.norm(vector, axis=-1, keepdims=True)


def _loop_pairs(radius_1, center_1, normal_1, radius_2, center_2, normal_2, nodes):
    """Mutual inductances of many loop pairs, all arrays broadcast to (P,) / (P, 3) [H]."""
    n1, n2 = _unit(normal_1), _unit(normal_2)
    first, second = plane_basis(n2)
    phi = 2.0 * np.pi * np.arange(nodes) / nodes
    cos, sin = np.cos(phi)[None, :, None], np.sin(phi)[None, :, None]
    r2 = np.asarray(radius_2, dtype=float)[..., None, None]
    points = center_2[:, None, :] + r2 * (first[:, None, :] * cos + second[:, None, :] * sin)
    tangent = r2 * (second[:, None, :] * cos - first[:, None, :] * sin)
    offset = points - center_1[:, None, :]
    axial = np.einsum("pqi,pi->pq", offset, n1)
    radial_vector = offset - axial[..., None] * n1[:, None, :]
    radial = np.linalg.norm(radial_vector, axis=-1)
    azimuth = np.cross(n1[:, None, :], radial_vector)
    with np.errstate(divide="ignore", invalid="ignore"):
        azimuth = np.where(radial[..., None] > 0.0, azimuth / radial[..., None], 0.0)
    potential = loop_vector_potential(np.asarray(radius_1, dtype=float)[..., None], radial, axial)
    return np.sum(potential * np.einsum("pqi,pqi->pq", azimuth, tangent), axis=1) * 2 * np.pi / nodes


def loop_mutual_inductance(radius_1, center_1, normal_1, radius_2, center_2, normal_2, nodes=128):
    """Mutual inductance of two circular filaments in any relative position [H].

    Parameters
    ----------
    radius_1, radius_2 : float
        Loop radii [m].
    center_1, center_2 : array (3,)
        Loop centres [m].
    normal_1, normal_2 : array (3,)
        Loop normals (their signs set the sign of M) [-].
    nodes : int
        Trapezoid nodes around loop 2 [-]; raise it when the loops nearly touch.

    Notes
    -----
    ``M = int_0^2pi A_1(r_2(phi)) . dr_2/dphi dphi`` with ``A_1`` the closed-form vector
    potential of loop 1 per ampere. Exact for filaments; coaxial it equals Maxwell's formula.

    References
    ----------
    Babic et al., IEEE Trans. Magn. 46, 3591 (2010); Smythe, 3rd ed., 7.10 (1968).
    """
    arrays = [np.atleast_2d(np.asarray(x, dtype=float)) for x in (center_1, normal_1, center_2, normal_2)]
    return float(_loop_pairs(np.atleast_1d(radius_1), arrays[0], arrays[1],
                             np.atleast_1d(radius_2), arrays[2], arrays[3], nodes)[0])


def _filaments(winding: Winding, center, axis, axial_nodes):
    """Filament radii, centres (F, 3) and turn weights of a winding by Gauss quadrature."""
    radii, radial_weights = winding.radial_nodes()
    x, w = gauss_legendre(axial_nodes)
    positions = winding.length / 2.0 * x
    centers = np.asarray(center, dtype=float) + positions[:, None] * _unit(axis)
    weights = np.outer(radial_weights, w / 2.0).ravel()
    return np.repeat(radii, axial_nodes), np.tile(centers, (len(radii), 1)), weights


def coaxial_coil_mutual_inductance(winding_1: Winding, winding_2: Winding, offset):
    """Mutual inductance of two coaxial windings [H].

    Parameters
    ----------
    winding_1, winding_2 : Winding
        The two windings.
    offset : float
        Axial distance from the centre of winding 1 to the centre of winding 2 [m].

    Notes
    -----
    Sum over the layers (or radial Gauss nodes) of both windings of the closed-form
    mutual inductance of two current sheets. Exact for the current-sheet model.

    References
    ----------
    Grover, Inductance Calculations, ch. 13-15 (1946).
    """
    radii_1, turns_1 = winding_1.radial_nodes()
    radii_2, turns_2 = winding_2.radial_nodes()
    return float(np.sum(coaxial_sheet_mutual_inductance(
        radii_1[:, None], winding_1.length, turns_1[:, None], radii_2[None, :], winding_2.length,
        turns_2[None, :], offset)))


def coil_mutual_inductance(winding_1: Winding, center_1, axis_1, winding_2: Winding, center_2,
                           axis_2, axial_nodes=8, nodes=96):
    """Mutual inductance of two windings in any position and orientation [H].

    Parameters
    ----------
    winding_1, winding_2 : Winding
        The windings.
    center_1, center_2 : array (3,)
        Winding centres [m].
    axis_1, axis_2 : array (3,)
        Winding axes; turns circulate right-handed about them [-].
    axial_nodes : int
        Gauss-Legendre filaments along each winding's length [-].
    nodes : int
        Trapezoid nodes around each filament of winding 2 [-].

    Notes
    -----
    Coaxial windings go to :func:`coaxial_coil_mutual_inductance` (exact). Otherwise each
    winding becomes Gauss-Legendre filaments (radial nodes as ``Winding.radial_nodes``, axial
    nodes along the length) and filament pairs are summed with :func:`loop_mutual_inductance`.
    Good while the windings are farther apart than a few filament spacings.

    References
    ----------
    Babic et al., IEEE Trans. Magn. 46, 3591 (2010); Grover (1946).
    """
    a1, a2 = _unit(axis_1), _unit(axis_2)
    c1, c2 = np.asarray(center_1, dtype=float), np.asarray(center_2, dtype=float)
    separation = c2 - c1
    off_axis = np.linalg.norm(separation - (separation @ a1) * a1)
    parallel = np.linalg.norm(np.cross(a1, a2))
    if off_axis < _COAXIAL_TOLERANCE and parallel < _COAXIAL_TOLERANCE:
        return float(np.sign(a1 @ a2) * coaxial_coil_mutual_inductance(
            winding_1, winding_2, float(separation @ a1)))
    r1, p1, w1 = _filaments(winding_1, c1, a1, axial_nodes)
    r2, p2, w2 = _filaments(winding_2, c2, a2, axial_nodes)
    i, j = np.meshgrid(np.arange(len(r1)), np.arange(len(r2)), indexing="ij")
    i, j = i.ravel(), j.ravel()
    pairs = _loop_pairs(r1[i], p1[i], np.broadcast_to(a1, (len(i), 3)),
                        r2[j], p2[j], np.broadcast_to(a2, (len(j), 3)), nodes)
    return float(np.sum(w1[i] * w2[j] * pairs))


def coupling_coefficient(mutual_inductance, inductance_1, inductance_2):
    """Coupling coefficient ``k = M / sqrt(L1 L2)`` [-].

    References
    ----------
    Grover, Inductance Calculations, ch. 1 (1946).

    >>> coupling_coefficient(1.0, 4.0, 1.0)
    0.5
    """
    return float(mutual_inductance / np.sqrt(inductance_1 * inductance_2))


def alternating_induced_emf(mutual_inductance, current_amplitude, frequency):
    """EMF induced by a sinusoidal current in the other coil: ``(peak, rms)`` [V].

    Notes
    -----
    ``e(t) = -M dI/dt`` with ``I = I0 sin(2 pi f t)``: peak ``2 pi f M I0``, rms ``peak/sqrt 2``.
    The secondary is taken as open (a meter of high resistance).

    References
    ----------
    Faraday's law; Purcell & Morin, Electricity and Magnetism, 3rd ed., ch. 7 (2013).

    >>> [round(x, 4) for x in alternating_induced_emf(1e-3, 1.0, 50.0)]
    [0.3142, 0.2221]
    """
    peak = float(2.0 * np.pi * frequency * abs(mutual_inductance) * current_amplitude)
    return peak, float(peak / np.sqrt(2.0))


def switched_induced_emf(mutual_inductance, current_change, switch_time):
    """Mean EMF induced while the other coil's current changes by ``dI`` in ``dt`` [V].

    Notes
    -----
    ``e = M dI / dt`` for a linear ramp; an abrupt break gives a larger, shorter pulse.

    References
    ----------
    Faraday's law; Purcell & Morin, 3rd ed., ch. 7 (2013).

    >>> switched_induced_emf(1e-3, 2.0, 1e-3)
    2.0
    """
    return abs(mutual_inductance) * current_change / switch_time


def coupling_table(winding_1: Winding, winding_2: Winding, distances, angles, axial_nodes=6):
    """Coupling coefficient against centre distance and tilt [-].

    Parameters
    ----------
    winding_1, winding_2 : Winding
        Coil 1 sits at the origin with its axis along z.
    distances : array (n,)
        Distance of coil 2's centre along coil 1's axis [m].
    angles : array (p,)
        Tilt of coil 2's axis from coil 1's axis, about an axis through coil 2's centre
        perpendicular to the line of centres [rad].
    axial_nodes : int
        Filaments along each winding for tilted positions [-].

    Returns
    -------
    array (n, p)
        ``k = M / sqrt(L1 L2)``.

    References
    ----------
    As :func:`coil_mutual_inductance`; self-inductances by ``winding_inductance``.
    """
    inductance = np.sqrt(winding_inductance(winding_1) * winding_inductance(winding_2))
    table = np.empty((len(distances), len(angles)))
    for i, distance in enumerate(distances):
        for j, angle in enumerate(angles):
            axis_2 = np.array([np.sin(angle), 0.0, np.cos(angle)])
            table[i, j] = coil_mutual_inductance(
                winding_1, [0.0, 0.0, 0.0], [0.0, 0.0, 1.0], winding_2, [0.0, 0.0, distance],
                axis_2, axial_nodes=axial_nodes) / inductance
    return table
