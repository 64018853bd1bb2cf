"""Magnetic flux density of uniformly magnetized bodies: cylinder, ring, block, sphere, dipole.

Pure functions on SI arrays, vectorised over points (n, 3) [m], returning B [T].

:func:`field_of_body` and :func:`field_of_bodies` take :class:`~planner.physics.bodies.MagnetBody`
objects in the global frame; the shape functions below work in a body's own frame
(origin at its centre, z along the axis of a cylinder or ring, axes along a block's edges).

Conventions shared by every function here:

* J = mu0 M is the polarization [T] (the remanence for recoil permeability 1).
* On a face the normal component of B is exact; the tangential components, which jump
  there, are the mean of the two sides. On an edge or a corner of a body the field
  diverges and NaN is returned (no warning is raised).
* Far from a body (beyond 150 bounding radii) the closed forms lose digits to
  cancellation, so the dipole-plus-octupole expansion (:func:`far_field`) is used there;
  its relative error there is a few 1e-9.

References
----------
N. Derby and S. Olbert, Am. J. Phys. 78, 229-235 (2010) (cylinders).
A. Caciagli et al., J. Magn. Magn. Mater. 456, 423-432 (2018) (diametral cylinders).
R. Engel-Herbert and T. Hesjedal, J. Appl. Phys. 97, 074504 (2005) (cuboids).
D. Cichon et al., IEEE Sensors J. 19, 2509-2516 (2019) (numerically stable cuboid).
A. Camacho and V. Sosa, Rev. Mex. Fis. E 59, 8-17 (2013) (on-axis forms).
"""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.fields.chunking import in_blocks
from planner.physics.fields.cuboid import block_field, block_on_axis_field
from planner.physics.fields.elliptic import FULL_ACCURACY
from planner.physics.fields.cylinder import cylinder_field, cylinder_on_axis_field, ring_field
from planner.physics.fields.sphere import dipole_field, far_field, sphere_field

__all__ = [
    "field_of_body",
    "body_frame_field",
    "field_and_jacobian",
    "field_of_bodies",
    "cylinder_field",
    "ring_field",
    "block_field",
    "sphere_field",
    "dipole_field",
    "far_field",
    "cylinder_on_axis_field",
    "block_on_axis_field",
    "second_moments",
    "FAR_FIELD_RADII",
]

FAR_FIELD_RADII = 150.0  # beyond this many bounding radii the multipole expansion is used


def second_moments(body: MagnetBody) -> np.ndarray:
    """Second moments of the body's volume in its own frame, I_ij = integral x_i x_j dV [m^5].

    Parameters
    ----------
    body : MagnetBody

    Returns
    -------
    ndarray (3, 3)
        Diagonal matrix in the body frame [m^5].

    Notes
    -----
    Cylinder of radius a, length L: I_xx = I_yy = V a^2/4, I_zz = V L^2/12; a ring is the
    outer cylinder minus the bore; block of edges s_i: I_ii = V s_i^2/12; sphere of radius
    R: I_ii = V R^2/5.

    References
    ----------
    Elementary integrals; see any table of moments of inertia (e.g. CRC Standard
    Mathematical Tables), divided by the density.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> b = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1], size=[1.0, 1.0, 1.0])
    >>> np.diag(second_moments(b)).round(6).tolist()
    [0.083333, 0.083333, 0.083333]
    """
    if body.shape in ("cylinder", "ring"):
        def cylinder_moments(diameter):
            radius = diameter / 2.0
            volume = np.pi * radius**2 * body.height
            return volume * np.array([radius**2 / 4, radius**2 / 4, body.height**2 / 12])

        diagonal = cylinder_moments(body.diameter)
        if body.shape == "ring" and body.inner_diameter > 0:
            diagonal = diagonal - cylinder_moments(body.inner_diameter)
    elif body.shape == "block":
        diagonal = body.volume * body.size**2 / 12.0
    else:
        diagonal = np.full(3, body.volume * (body.diameter / 2) ** 2 / 5.0)
    return np.diag(diagonal)


def body_frame_field(body: MagnetBody, local_points: np.ndarray, polarization: np.ndarray,
                     accuracy: float = FULL_ACCURACY) -> np.ndarray:
    """Exact closed-form field of ``body``'s shape at body-frame points, in the body frame.

    Parameters
    ----------
    body : MagnetBody
        Its shape and sizes are used; its position and rotation are not.
    local_points : array (m, 3)
        Points in the body frame [m].
    polarization : array (3,)
        J in the body frame [T].
    accuracy : float
        For cylinders and rings, the relative accuracy of their elliptic integrals
        (:func:`cylinder_field`); default double precision. Blocks and spheres are exact.

    Returns
    -------
    ndarray (m, 3)
        B [T] in the body frame.

    Examples
    --------
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> round(float(body_frame_field(ball, np.zeros((1, 3)), np.array([0, 0, 1.2]))[0, 2]), 6)  # 2J/3 inside
    0.8
    """
    if body.shape == "cylinder":
        return cylinder_field(local_points, body.diameter, body.height, polarization, accuracy)
    if body.shape == "ring":
        return ring_field(local_points, body.diameter, body.inner_diameter, body.height,
                          polarization, accuracy)
    if body.shape == "block":
        return block_field(local_points, body.size, polarization)
    return sphere_field(local_points, body.diameter, polarization)


def _field_of_body_block(points, body, polarization, rotation, far_radius, moments):
    """:func:`field_of_body` for one block of global points (m, 3); see there."""
    # small per-block products stay single-threaded in BLAS and in cache; one product over
    # 10^6 rows is handed to BLAS threads, which stall badly when another process is busy
    local = points - body.center if body.center.any() else points
    if rotation is not None:
        local = local @ rotation
    if far_radius is None:
        local_field = body_frame_field(body, local, polarization)
    else:
        far = np.einsum("ij,ij->i", local, local) > far_radius * far_radius
        if not far.any():
            local_field = body_frame_field(body, local, polarization)
        else:
            local_field = np.empty_like(local)
            near = ~far
            if near.any():
                local_field[near] = body_frame_field(body, local[near], polarization)
            local_field[far] = far_field(local[far], body.volume, moments, polarization)
    if rotation is not None:
        local_field = local_field @ rotation.T
    return local_field


def field_of_body(body: MagnetBody, points) -> np.ndarray:
    """Flux density of one uniformly magnetized body at points in the global frame.

    Parameters
    ----------
    body : MagnetBody
        Shape, size, position, orientation and polarization (global frame) of the magnet.
    points : array (n, 3) or (3,)
        Field points in the global frame [m].

    Returns
    -------
    ndarray, same shape as ``points``
        B in the global frame [T].

    Notes
    -----
    Points are moved into the body frame, p_body = R^T (p - c), the exact closed form of
    the shape is evaluated there (cylinder and ring: Derby & Olbert plus the diametral
    part; block: the corner-sum formula; sphere: dipole outside, 2J/3 inside) and B is
    turned back, B = R B_body. Beyond ``FAR_FIELD_RADII`` bounding radii the dipole plus
    octupole expansion replaces the closed form (relative error a few 1e-9). On faces the
    tangential components are the mean of both sides; on edges NaN. Points are processed
    in blocks of a few thousand (frame change included), so memory stays small for
    millions of points and every temporary array stays in the processor cache.

    References
    ----------
    See the module docstring and ../shared/reference/physics.md, section 1.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> magnet = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> field_of_body(magnet, [0.0, 0.0, 0.0]).round(3).tolist()
    [0.0, 0.0, 0.8]
    """
    points = np.asarray(points, dtype=float)
    if points.shape[-1:] != (3,):
        raise ValueError(f"points must have shape (n, 3) or (3,); got {points.shape}")
    flat = points.reshape(-1, 3)
    rotation = np.asarray(body.rotation, dtype=float)
    turned = not np.array_equal(rotation, np.eye(3))
    if body.shape == "sphere":
        far_radius, moments = None, None
    else:
        far_radius, moments = FAR_FIELD_RADII * body.bounding_radius, second_moments(body)
    field = in_blocks(_field_of_body_block, flat, body, body.polarization_body,
                      rotation if turned else None, far_radius, moments)
    return field.reshape(points.shape)


def field_and_jacobian(body: MagnetBody, point, step: float) -> tuple[np.ndarray, np.ndarray]:
    """B and its Jacobian dB_l/dx_j of one body at one point in the global frame [T], [T/m].

    Parameters
    ----------
    body : MagnetBody
    point : array (3,)
        Field point, outside the body [m].
    step : float
        Difference step h [m]; about 1e-2 of the distance from ``point`` to the body.

    Returns
    -------
    field : ndarray (3,)
        B at the point [T].
    jacobian : ndarray (3, 3)
        Row j is dB/dx_j [T/m].

    Notes
    -----
    Fourth-order central differences, B'(x) = [8 (B(x+h) - B(x-h)) - (B(x+2h) - B(x-2h))] / 12h,
    all twelve points in one field call. With h at 1e-2 of the distance to the body the
    truncation error, about h^4/30 of the fifth derivative, is some 1e-10 of the gradient
    and the rounding error about 1e-14 of it.

    References
    ----------
    Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 25.3.6.

    Examples
    --------
    A sphere's outside field is a dipole's: on its axis at r, dB_z/dz = -3 mu0 m / (2 pi r^4).

    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.0], diameter=0.01)
    >>> _, jacobian = field_and_jacobian(ball, [0.0, 0.0, 0.05], 1e-4)
    >>> from planner.physics.constants import mu_0
    >>> exact = -3 * mu_0 * ball.moment[2] / (2 * np.pi * 0.05**4)
    >>> bool(np.isclose(jacobian[2, 2], exact, rtol=1e-9))
    True
    """
    point = np.asarray(point, dtype=float).reshape(3)
    offsets = np.concatenate([np.eye(3) * h for h in (step, -step, 2 * step, -2 * step)])
    values = field_of_body(body, np.vstack([point, point + offsets])).reshape(-1, 3)
    centre, plus, minus, plus2, minus2 = values[0], values[1:4], values[4:7], values[7:10], values[10:13]
    return centre, (8.0 * (plus - minus) - (plus2 - minus2)) / (12.0 * step)


def field_of_bodies(bodies, points) -> np.ndarray:
    """Flux density of several bodies, summed (superposition) [T].

    Parameters
    ----------
    bodies : iterable of MagnetBody
    points : array (n, 3) or (3,)
        Field points in the global frame [m].

    Returns
    -------
    ndarray, same shape as ``points``
        Total B in the global frame [T]; zeros for no bodies.

    Notes
    -----
    B = sum_i B_i: exact for rigid magnets with recoil permeability 1 (no mutual
    demagnetization), the idealisation used throughout (physics.md, section 1).

    References
    ----------
    N. Derby and S. Olbert, Am. J. Phys. 78, 229-235 (2010).

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> m = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> field_of_bodies([m, m], [0.0, 0.0, 0.0]).round(3).tolist()
    [0.0, 0.0, 1.6]
    """
    points = np.asarray(points, dtype=float)
    if points.shape[-1:] != (3,):
        raise ValueError(f"points must have shape (n, 3) or (3,); got {points.shape}")
    total = np.zeros(points.shape)
    for body in bodies:
        total += field_of_body(body, points)
    return total
