"""Field of a point dipole, of a uniformly magnetized sphere, and the far-field expansion
(dipole plus octupole) used for any centrally symmetric body far away."""
from __future__ import annotations

import numpy as np

from planner.physics.constants import mu_0
from planner.physics.fields.chunking import in_blocks


def dipole_field(points, moment, position):
    """Flux density of a point magnetic dipole.

    Parameters
    ----------
    points : array (n, 3) or (3,)
        Field points [m].
    moment : array (3,) or (n, 3)
        Dipole moment m [A m^2], one for all points or one per point.
    position : array (3,) or (n, 3)
        Location of the dipole [m], one for all points or one per point.

    Returns
    -------
    ndarray, same shape as ``points``
        B [T]; NaN at the dipole's own location.

    Notes
    -----
    B = mu0/(4 pi) (3 r_hat (m . r_hat) - m) / r^3, exact for a point dipole and, outside
    it, for a uniformly magnetized sphere with m = J V / mu0.

    References
    ----------
    J. D. Jackson, Classical Electrodynamics, 3rd ed., Wiley (1999), eq. (5.56).

    Examples
    --------
    On the axis of a 1 A m^2 dipole at 1 m: B = mu0 m / (2 pi r^3) = 2e-7 T.

    >>> round(float(dipole_field([0.0, 0.0, 1.0], [0.0, 0.0, 1.0], [0.0, 0.0, 0.0])[2]) * 1e7, 9)
    2.0
    """
    points = np.asarray(points, dtype=float)
    relative = points.reshape(-1, 3) - np.asarray(position, dtype=float).reshape(-1, 3)
    moment = np.asarray(moment, dtype=float)
    distance_squared = np.einsum("ij,ij->i", relative, relative)
    along = relative @ moment if moment.ndim == 1 else np.einsum("ij,ij->i", relative, moment)
    with np.errstate(divide="ignore", invalid="ignore"):
        inverse_square = 1.0 / np.where(distance_squared > 0, distance_squared, np.nan)
        scale = mu_0 / (4 * np.pi) * inverse_square * np.sqrt(inverse_square)
        along *= 3.0 * inverse_square
    field = (along[:, None] * relative - moment) * scale[:, None]
    return field.reshape(points.shape)


def sphere_field(points, diameter, polarization):
    """Flux density of a uniformly magnetized sphere centred at the origin.

    Parameters
    ----------
    points : array (n, 3)
        Field points relative to the centre [m] (any frame, with ``polarization`` in it).
    diameter : float
        Sphere diameter [m].
    polarization : array (3,)
        J = mu0 M [T].

    Returns
    -------
    ndarray (n, 3)
        B [T].

    Notes
    -----
    Outside: exactly the field of a dipole m = J V / mu0 at the centre. Inside: uniform
    B = 2J/3. On the surface the normal component is continuous and the tangential one
    jumps; the mean of the two sides is returned there.

    References
    ----------
    J. D. Jackson, Classical Electrodynamics, 3rd ed., Wiley (1999), section 5.10.

    Examples
    --------
    >>> sphere_field([[0.0, 0.0, 0.0]], 0.01, [0.0, 0.0, 1.5])[0].tolist()
    [0.0, 0.0, 1.0]
    """
    polarization = np.asarray(polarization, dtype=float).reshape(3)
    return in_blocks(_sphere_field_block, points, diameter / 2.0, polarization)


def _sphere_field_block(points, radius, polarization):
    """:func:`sphere_field` for one block of points (see there)."""
    r2 = np.einsum("ij,ij->i", points, points)
    inside = np.heaviside(radius * radius - r2, 0.5)
    # dipole m = J V / mu0 with V = 4 pi R^3 / 3: B = (R^3/3) (3 r (J.r)/r^5 - J/r^3)
    with np.errstate(divide="ignore", invalid="ignore"):
        inverse_r2 = np.where(r2 > 0, 1.0 / r2, 0.0)
    scale = (radius**3 / 3.0) * inverse_r2 * np.sqrt(inverse_r2)
    projection = 3.0 * (points @ polarization) * inverse_r2
    outside = 1.0 - inside
    field = (projection * scale * outside)[:, None] * points
    field += ((2.0 / 3.0) * inside - scale * outside)[:, None] * polarization
    return field


def far_field(points, volume, second_moments, polarization):
    """Far field of a uniformly magnetized, centrally symmetric body: dipole + octupole.

    Parameters
    ----------
    points : array (n, 3)
        Field points relative to the body centre, in the frame of ``second_moments`` [m].
    volume : float
        Body volume V [m^3].
    second_moments : array (3, 3)
        I_ij = integral over the body of x_i x_j dV [m^5].
    polarization : array (3,)
        J [T] in the same frame.

    Returns
    -------
    ndarray (n, 3)
        B [T].

    Notes
    -----
    B = (grad grad Phi) J outside, with the Newtonian potential of the shape
    Phi = (1/4 pi) [V/r + (1/2) I_ij d_i d_j (1/r) + O(r^-5)] (first and third moments
    vanish by central symmetry). The first term is the dipole m = J V/mu0; the second,
    using d_i d_j d_k d_l (1/r) = 105 x_i x_j x_k x_l / r^9 - 15 (6 terms delta x x)/r^7
    + 3 (3 terms delta delta)/r^5, is the octupole. The relative error is of order
    (size/r)^4: a few 1e-9 at 150 bounding radii, where the closed forms start to
    lose digits to cancellation.

    References
    ----------
    J. D. Jackson, Classical Electrodynamics, 3rd ed., Wiley (1999), sections 4.1 and 5.6.

    Examples
    --------
    >>> V = 1e-6; I = np.eye(3) * V * 1e-4 / 12  # a 1 cm cube
    >>> B = far_field([[0.0, 0.0, 1.0]], V, I, [0.0, 0.0, 1.0])
    >>> bool(np.isclose(B[0, 2], 2 * V / (4 * np.pi), rtol=1e-3))
    True
    """
    x = np.asarray(points, dtype=float).reshape(-1, 3)
    moments = np.asarray(second_moments, dtype=float).reshape(3, 3)
    J = np.asarray(polarization, dtype=float).reshape(3)
    r2 = np.einsum("ij,ij->i", x, x)
    inverse_r2 = 1.0 / r2
    inverse_r3 = inverse_r2 / np.sqrt(r2)
    inverse_r5 = inverse_r3 * inverse_r2
    x_dot_j = x @ J
    moment_x = x @ moments  # (I x), I symmetric
    s = np.einsum("ij,ij->i", moment_x, x)
    trace = np.trace(moments)
    dipole = volume * (3.0 * (x_dot_j * inverse_r5)[:, None] * x - inverse_r3[:, None] * J)
    fourth = (
        (105.0 * s * x_dot_j * inverse_r5 * inverse_r2 * inverse_r2)[:, None] * x
        - (15.0 * inverse_r5 * inverse_r2)[:, None]
        * ((trace * x_dot_j)[:, None] * x + 2.0 * x_dot_j[:, None] * moment_x
           + 2.0 * (moment_x @ J)[:, None] * x + s[:, None] * J)
        + (3.0 * inverse_r5)[:, None] * (trace * J + 2.0 * (moments @ J))
    )
    return (dipole + 0.5 * fourth) / (4.0 * np.pi)
