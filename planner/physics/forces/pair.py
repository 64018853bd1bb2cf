"""Force and torque between two magnets: exact fast paths where the geometry allows, else
the charge-model quadrature; placing a magnet at a gap along an approach direction.

References
----------
Akoun & Yonnet, IEEE Trans. Magn. 20(5), 1962-1964 (1984); Vokoun, Beleggia, Heller &
Sittner, J. Magn. Magn. Mater. 321, 3758-3763 (2009); Furlani, *Permanent Magnet and
Electromechanical Devices* (2001), sec. 3.4.
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import field_and_jacobian, field_of_body
from planner.physics.forces.charge_model import force_and_torque_by_charges, interaction_energy
from planner.physics.forces.closed_forms import (coaxial_cylinders_axial_force,
                                                 parallel_cuboids_force)

_TOLERANCE = 1e-9


def extent_along(body: MagnetBody, direction) -> float:
    """Half-width of ``body`` along a unit ``direction``: max over the body of (x - c) . u.

    Parameters
    ----------
    body : MagnetBody
    direction : array (3,)
        Direction [-] (normalised here).

    Returns
    -------
    float
        Support distance from the centre [m].

    Notes
    -----
    Cylinder or ring: (L/2)|a . u| + R sqrt(1 - (a . u)^2); block: sum of (s_i/2)|e_i . u|;
    sphere: R. Elementary convex geometry.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody, rotation_from_axis
    >>> b = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.0], size=[0.02, 0.01, 0.004])
    >>> extent_along(b, [0, 0, 1]), extent_along(b, [1, 0, 0])
    (0.002, 0.01)
    """
    u = np.asarray(direction, dtype=float)
    u = u / np.linalg.norm(u)
    if body.shape in ("cylinder", "ring"):
        along = abs(float(body.axis @ u))
        return body.height / 2 * along + body.diameter / 2 * np.sqrt(max(0.0, 1 - along**2))
    if body.shape == "block":
        return float(np.abs(body.rotation.T @ u) @ body.size / 2)
    return body.diameter / 2


def place_at_gap(target: MagnetBody, source: MagnetBody, approach, gap: float) -> MagnetBody:
    """Move ``target`` along ``approach`` so that its gap to ``source`` along it is ``gap``.

    Parameters
    ----------
    target, source : MagnetBody
    approach : array (3,)
        Direction in which the target moves toward the source [-].
    gap : float
        Distance between the two bodies' extents along ``approach`` [m]; for faces normal
        to ``approach`` it is the face-to-face gap.

    Returns
    -------
    MagnetBody
        The target with a new centre; orientation and the offset across ``approach`` kept.

    Notes
    -----
    c . u = c_source . u - (h_source(u) + h_target(u) + gap) with h the half-width from
    :func:`extent_along`. For tilted or offset bodies the true closest distance is at least
    ``gap``.
    """
    u = np.asarray(approach, dtype=float)
    u = u / np.linalg.norm(u)
    shift = (source.center - target.center) @ u - (
        extent_along(source, u) + extent_along(target, u) + gap)
    return replace(target, center=target.center + shift * u)


def _coaxial_cylinders(target, source):
    """(force on target) if both are axially magnetized coaxial cylinders/rings, else None."""
    if target.shape not in ("cylinder", "ring") or source.shape not in ("cylinder", "ring"):
        return None
    axis = source.axis
    separation = target.center - source.center
    distance = float(np.linalg.norm(separation))
    size = max(source.bounding_radius, target.bounding_radius)
    if distance < _TOLERANCE * size or abs(abs(axis @ target.axis) - 1) > _TOLERANCE:
        return None
    direction = separation / distance
    if np.linalg.norm(np.cross(direction, axis)) > _TOLERANCE:
        return None
    for body in (target, source):
        J = body.polarization
        if np.linalg.norm(np.cross(J, axis)) > _TOLERANCE * max(np.linalg.norm(J), 1e-300):
            return None

    def radii(body):
        return body.diameter / 2, (body.inner_diameter / 2 if body.shape == "ring" else 0.0)
    force = coaxial_cylinders_axial_force(
        *radii(source), source.height, float(source.polarization @ direction),
        *radii(target), target.height, float(target.polarization @ direction), distance)
    return force * direction


def _parallel_cuboids(target, source):
    """(force on target, torque is zero by symmetry) for parallel cuboids, else None."""
    if target.shape != "block" or source.shape != "block":
        return None
    relative = source.rotation.T @ target.rotation
    if np.abs(np.abs(relative) - np.round(np.abs(relative))).max() > _TOLERANCE:
        return None
    size_target = np.round(np.abs(relative)) @ target.size
    J_source = source.rotation.T @ source.polarization
    J_target = source.rotation.T @ target.polarization
    axis = int(np.argmax(np.abs(J_source) + np.abs(J_target)))
    scale = np.abs(J_source).max() + np.abs(J_target).max()
    others = [i for i in range(3) if i != axis]
    if np.abs(np.r_[J_source[others], J_target[others]]).max() > _TOLERANCE * scale:
        return None
    order = [(axis + 1) % 3, (axis + 2) % 3, axis]
    offset = source.rotation.T @ (target.center - source.center)
    if np.all(np.abs(offset) < (source.size + size_target) / 2 * (1 - _TOLERANCE)):
        raise ValueError("the two blocks overlap")
    force = parallel_cuboids_force(source.size[order], J_source[axis], size_target[order],
                                   J_target[axis], offset[order])
    in_source_frame = np.empty(3)
    in_source_frame[order] = force
    symmetric = np.count_nonzero(np.abs(offset) > _TOLERANCE * source.bounding_radius) <= 1
    return source.rotation @ in_source_frame, symmetric


def _sphere_pair(target: MagnetBody, source: MagnetBody):
    """Exact force and torque on ``target`` when either body is a sphere, else None.

    A uniformly magnetized sphere in a field B that has no sources inside it has the
    interaction energy U = -m . B(c): U = -M . integral B dV and, B being harmonic in the
    ball, its volume integral is V B(c) (mean-value property). Hence, on the sphere,
    F = grad(m . B)(c) = (m . grad) B(c) (curl B = 0 there) and T = m x B(c) about its
    centre; the other body takes -F and, about its own centre, -T - (c_sphere - c_other) x F.
    The gradient is a fourth-order central difference of the other body's exact field
    (:func:`planner.physics.fields.field_and_jacobian`), with steps of 1e-2 of the sphere's radius (the other body's
    material is at least that radius away from the sphere's centre).
    """
    if target.shape == "sphere":
        sphere, other, sign = target, source, 1.0
    elif source.shape == "sphere":
        sphere, other, sign = source, target, -1.0
    else:
        return None
    field, jacobian = field_and_jacobian(other, sphere.center, 1e-2 * sphere.diameter / 2)
    moment = sphere.moment
    force = moment @ jacobian  # (m . grad) B: row j of the Jacobian is dB/dx_j
    torque = np.cross(moment, field)
    if sign > 0:
        return force, torque
    lever = sphere.center - other.center
    return -force, -torque - np.cross(lever, force)


def _mean_width_across(body: MagnetBody, line) -> float:
    """Mean half-width of ``body`` over the directions normal to ``line`` [m]."""
    e1 = rotation_from_axis(line)
    angles = np.linspace(0.0, np.pi, 12, endpoint=False)
    return float(np.mean([extent_along(body, np.cos(a) * e1[:, 0] + np.sin(a) * e1[:, 1])
                          for a in angles]))


def charges_on_narrower_body(target: MagnetBody, source: MagnetBody, rtol: float = 1e-3,
                             need_torque: bool = True) -> tuple[np.ndarray, np.ndarray]:
    """Force and torque on ``target``, integrated over the faces of the narrower body.

    Parameters
    ----------
    target, source : MagnetBody
        Non-overlapping bodies.
    rtol : float
        Relative accuracy, as for :func:`force_and_torque_by_charges` [-].
    need_torque : bool
        False if only the force is used (then no tighter tolerance is needed).

    Returns
    -------
    force [N], torque about the target's centre [N m] : ndarray (3,), ndarray (3,)

    Notes
    -----
    The charge-model integrand on a face is smooth except where the other body's edges
    touch or nearly touch that face. A small magnet on the face of a larger one has its
    contact face inside the larger face, where the larger body's field is smooth; the other
    way round the small body's rim lies across the larger face and the quadrature must
    refine along it (a 20 mm disc on a 50 mm cube: ~50 s instead of ~0.01 s). So the body
    with the smaller mean half-width across the line of centres carries the quadrature,
    and Newton's third law and the balance of angular momentum give the target's share:

        F_target = -F_source,   T_target = -T_source - (c_source - c_target) x F_source.

    The torque then gets the lever arm |c_source - c_target| times the force error, so the
    source side is integrated to rtol * R_target / (R_source + |c_source - c_target|).

    References
    ----------
    Furlani (2001), sec. 3.4; Goldstein, *Classical Mechanics*, 3rd ed. (2002), sec. 1.2
    (conservation of linear and angular momentum for internal forces).
    """
    lever = source.center - target.center
    distance = float(np.linalg.norm(lever))
    if distance == 0.0 or _mean_width_across(target, lever) <= _mean_width_across(source, lever):
        return force_and_torque_by_charges(target, source, rtol=rtol)
    tighter = rtol * min(1.0, target.bounding_radius / (source.bounding_radius + distance)) \
        if need_torque else rtol
    force, torque = force_and_torque_by_charges(source, target, rtol=tighter)
    return -force, -torque - np.cross(lever, force)


def force_between(target: MagnetBody, source: MagnetBody, rtol: float = 1e-3) -> np.ndarray:
    """Force on ``target`` from ``source`` [N], by an exact formula where one applies.

    Parameters
    ----------
    target, source : MagnetBody
        Non-overlapping bodies of any shape, position and orientation.
    rtol : float
        Relative accuracy when the quadrature is used [-].

    Returns
    -------
    ndarray (3,)
        Force on the target [N].

    Notes
    -----
    Coaxial, axially magnetized cylinders and rings: Vokoun et al. (2009). Cuboids with
    parallel edges both magnetized along the same edge direction: Akoun & Yonnet (1984).
    A sphere and any other body: the force on a point dipole at the sphere's centre, exact
    by the mean-value property (:func:`_sphere_pair`). Anything else: the charge-model
    quadrature over the narrower body's faces, :func:`charges_on_narrower_body`.

    References
    ----------
    Vokoun et al., J. Magn. Magn. Mater. 321, 3758 (2009); Akoun & Yonnet, IEEE Trans.
    Magn. 20, 1962 (1984).
    """
    coaxial = _coaxial_cylinders(target, source)
    if coaxial is not None:
        return coaxial
    cuboids = _parallel_cuboids(target, source)
    if cuboids is not None:
        return cuboids[0]
    sphere = _sphere_pair(target, source)
    if sphere is not None:
        return sphere[0]
    return charges_on_narrower_body(target, source, rtol=rtol, need_torque=False)[0]


def force_and_torque(target: MagnetBody, source: MagnetBody,
                     rtol: float = 1e-3) -> tuple[np.ndarray, np.ndarray]:
    """Force [N] and torque about the target's centre [N m] on ``target`` from ``source``.

    Parameters
    ----------
    target, source : MagnetBody
        Non-overlapping bodies.
    rtol : float
        Relative accuracy when the quadrature is used [-].

    Returns
    -------
    force, torque : ndarray (3,), ndarray (3,)

    Notes
    -----
    The exact fast paths are taken where the torque vanishes by symmetry (coaxial cylinders
    and rings; parallel cuboids whose centres lie on a line along a common edge direction)
    and where one body is a sphere (point dipole at its centre, :func:`_sphere_pair`);
    otherwise the charge-model quadrature over the narrower body gives both
    (:func:`charges_on_narrower_body`).

    References
    ----------
    As :func:`force_between`.
    """
    coaxial = _coaxial_cylinders(target, source)
    if coaxial is not None:
        return coaxial, np.zeros(3)
    cuboids = _parallel_cuboids(target, source)
    if cuboids is not None and cuboids[1]:
        return cuboids[0], np.zeros(3)
    sphere = _sphere_pair(target, source)
    if sphere is not None:
        return sphere
    return charges_on_narrower_body(target, source, rtol=rtol)


def energy_between(target: MagnetBody, source: MagnetBody, rtol: float = 1e-6) -> float:
    """Interaction energy of two magnets [J], integrated over the narrower body's volume.

    Parameters
    ----------
    target, source : MagnetBody
        Non-overlapping bodies.
    rtol : float
        Relative accuracy of the volume integral [-].

    Returns
    -------
    float
        U [J]; F_target = -grad U with the target displaced.

    Notes
    -----
    U = -integral_V1 M_1 . B_2 dV = -integral_V2 M_2 . B_1 dV (reciprocity), so the volume
    integral is taken over the body with the smaller mean half-width across the line of
    centres, where the other's field is smooth (see :func:`charges_on_narrower_body`).
    If either body is a sphere, U = -m_sphere . B_other(c_sphere) exactly (mean-value
    property of the harmonic B_other in the ball).

    References
    ----------
    Jackson (1999), sec. 5.7 (energy of a magnetization in an external field).
    """
    if target.shape == "sphere" or source.shape == "sphere":
        # exact: U = -m . B_other(c) for the sphere (mean-value property, see _sphere_pair)
        sphere, other = (target, source) if target.shape == "sphere" else (source, target)
        return float(-sphere.moment @ field_of_body(other, sphere.center))
    lever = source.center - target.center
    if np.linalg.norm(lever) > 0 and \
            _mean_width_across(target, lever) > _mean_width_across(source, lever):
        target, source = source, target
    return interaction_energy(target, source, rtol=rtol)


def approach_profile(target: MagnetBody, source: MagnetBody, approach, gaps,
                     rtol: float = 1e-3, energy_rtol: float = 1e-6):
    """Energy and attraction of ``target`` brought toward ``source`` along ``approach``.

    Parameters
    ----------
    target, source : MagnetBody
    approach : array (3,)
        Direction in which the target moves toward the source [-].
    gaps : array (n,)
        Gaps along ``approach`` [m] (see :func:`place_at_gap`).
    rtol, energy_rtol : float
        Accuracy of the force and of the energy [-].

    Returns
    -------
    energy : ndarray (n,)
        Interaction energy U(gap) [J].
    attraction : ndarray (n,)
        Force on the target along ``approach`` [N]; positive pulls the bodies together.

    Notes
    -----
    attraction = F . u = dU/dgap, since moving the target by ds along u closes the gap by
    ds and F . u = -dU/ds.

    References
    ----------
    Jackson (1999), sec. 5.7; Furlani (2001), sec. 3.4.
    """
    u = np.asarray(approach, dtype=float)
    u = u / np.linalg.norm(u)
    gaps = np.atleast_1d(np.asarray(gaps, dtype=float))
    energy, attraction = np.empty(len(gaps)), np.empty(len(gaps))
    for k, gap in enumerate(gaps):
        moved = place_at_gap(target, source, u, gap)
        energy[k] = energy_between(moved, source, rtol=energy_rtol)
        attraction[k] = force_between(moved, source, rtol=rtol) @ u
    return energy, attraction
