"""Force, torque and interaction energy between two magnets by the charge (Coulombian) model.

The target body carries the magnetic surface charge sigma = M . n = J . n / mu0 on its
faces. In the field B_source of the other body,

    F = integral sigma B_source dA,        T = integral (r - c) x sigma B_source dA,

with c the target's centre, and the interaction energy is U = -(1/mu0) J_target . integral
B_source dV over the target's volume. Both are exact for uniform magnetization as long as
the two bodies do not overlap (B_source is then curl- and divergence-free inside the
target).

References
----------
E. P. Furlani, *Permanent Magnet and Electromechanical Devices*, Academic Press (2001),
sec. 2.14 and 3.4 (charge model, force and torque on a magnet in an external field).
J. D. Jackson, *Classical Electrodynamics*, 3rd ed., Wiley (1999), sec. 5.9 (magnetic
charge density M . n) and sec. 5.7 (energy of a magnetization in an external field).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np
from scipy.constants import mu_0

from planner.physics.bodies import MagnetBody
from planner.physics.forces.quadrature import (_box_arrays, adaptive_box_integral, box_nodes,
                                               box_sums)

#: Quadrature points are set this fraction of the target size inside the target, so that
#: at contact they see the source field from the target's side of the shared surface.
INWARD_OFFSET = 1e-9

TWO_PI = 2.0 * np.pi


def _field_function(source):
    from planner.physics.fields import field_of_body  # import here: fields is a sibling module

    return lambda points: field_of_body(source, points)


def surface_charge_patches(body: MagnetBody):
    """Faces of ``body`` as parameter boxes carrying their magnetic surface charge.

    Parameters
    ----------
    body : MagnetBody

    Returns
    -------
    maps : list of callables
        ``maps[i](u)`` -> (points in the body frame (m, 3) [m], charge per unit parameter
        measure (m,) [A m^-1 times the face Jacobian]).
    boxes : list of (map index, low, high)
        Initial parameter boxes (2-D), with angles split into quarter turns.

    Notes
    -----
    Charge density sigma = J . n / mu0 [A/m]. Cylinder and ring: end faces +-J_z/mu0
    (parameters r, phi; Jacobian r); curved faces (J_x cos phi + J_y sin phi)/mu0 times the
    radius, negative on a ring's bore (parameters phi, z). Block: +-J_i/mu0 on the faces
    normal to body axis i. Sphere: J . n / mu0 = J cos(theta)/mu0 about J (parameters
    theta, phi; Jacobian R^2 sin theta). Faces with zero charge are left out. Points are
    pulled ``INWARD_OFFSET`` times the body size inside the body.

    References
    ----------
    Furlani (2001), sec. 2.14; Jackson (1999), sec. 5.9.
    """
    J = body.polarization_body / mu_0
    offset = INWARD_OFFSET * body.bounding_radius
    maps, boxes = [], []
    angles = [(k * np.pi / 2, (k + 1) * np.pi / 2) for k in range(4)]  # quarter turns

    def add(map_function, ranges_list):
        maps.append(map_function)
        for low, high in ranges_list:
            boxes.append((len(maps) - 1, low, high))

    if body.shape in ("cylinder", "ring"):
        outer = body.diameter / 2
        inner = body.inner_diameter / 2 if body.shape == "ring" else 0.0
        half = body.height / 2
        if J[2] != 0.0:
            for side in (+1.0, -1.0):
                def end_face(u, side=side):
                    r, phi = u[:, 0], u[:, 1]
                    z = np.full_like(r, side * (half - offset))
                    return np.stack([r * np.cos(phi), r * np.sin(phi), z], axis=1), side * J[2] * r
                add(end_face, [([inner, a], [outer, b]) for a, b in angles])
        if J[0] != 0.0 or J[1] != 0.0:
            for radius, sign in ((outer, 1.0), (inner, -1.0)):
                if radius == 0.0:
                    continue
                def curved_face(u, radius=radius, sign=sign):
                    phi, z = u[:, 0], u[:, 1]
                    c, s = np.cos(phi), np.sin(phi)
                    rho = radius - sign * offset
                    charge = sign * (J[0] * c + J[1] * s) * radius
                    return np.stack([rho * c, rho * s, z], axis=1), charge
                add(curved_face, [([a, -half], [b, half]) for a, b in angles])
    elif body.shape == "block":
        half_size = body.size / 2
        for axis in range(3):
            if J[axis] == 0.0:
                continue
            others = [i for i in range(3) if i != axis]
            for side in (+1.0, -1.0):
                def block_face(u, axis=axis, side=side, others=others):
                    points = np.empty((len(u), 3))
                    points[:, others[0]] = u[:, 0]
                    points[:, others[1]] = u[:, 1]
                    points[:, axis] = side * (half_size[axis] - offset)
                    return points, np.full(len(u), side * J[axis])
                add(block_face, [(-half_size[others], half_size[others])])
    else:  # sphere
        radius = body.diameter / 2

        def sphere_face(u):
            theta, phi = u[:, 0], u[:, 1]
            normal = np.stack([np.sin(theta) * np.cos(phi), np.sin(theta) * np.sin(phi),
                               np.cos(theta)], axis=1)
            charge = (normal @ J) * radius**2 * np.sin(theta)
            return (radius - offset) * normal, charge
        add(sphere_face, [([t0, a], [t1, b]) for a, b in angles
                          for t0, t1 in ((0.0, np.pi / 2), (np.pi / 2, np.pi))])
    return maps, boxes


def volume_patches(body: MagnetBody):
    """The volume of ``body`` as parameter boxes (3-D) with their Jacobians.

    Returns
    -------
    maps, boxes
        As :func:`surface_charge_patches`, with ``maps[i](u)`` -> (points in the body
        frame (m, 3) [m], volume Jacobian (m,)).

    Notes
    -----
    Cylinder and ring: (r, phi, z), Jacobian r. Block: (x, y, z), Jacobian 1. Sphere:
    (r, theta, phi), Jacobian r^2 sin theta.
    """
    quarters = [(k * np.pi / 2, (k + 1) * np.pi / 2) for k in range(4)]
    if body.shape in ("cylinder", "ring"):
        outer = body.diameter / 2
        inner = body.inner_diameter / 2 if body.shape == "ring" else 0.0
        half = body.height / 2

        def cylinder_volume(u):
            r, phi = u[:, 0], u[:, 1]
            return np.stack([r * np.cos(phi), r * np.sin(phi), u[:, 2]], axis=1), r
        return [cylinder_volume], [(0, [inner, a, -half], [outer, b, half]) for a, b in quarters]
    if body.shape == "block":
        half_size = body.size / 2
        return [lambda u: (u.copy(), np.ones(len(u)))], [(0, -half_size, half_size)]
    radius = body.diameter / 2

    def sphere_volume(u):
        r, theta, phi = u[:, 0], u[:, 1], u[:, 2]
        points = r[:, None] * np.stack([np.sin(theta) * np.cos(phi),
                                        np.sin(theta) * np.sin(phi), np.cos(theta)], axis=1)
        return points, r**2 * np.sin(theta)
    return [sphere_volume], [(0, [0.0, 0.0, a], [radius, np.pi, b]) for a, b in quarters]


def force_and_torque_by_charges(target: MagnetBody, source: MagnetBody, rtol: float = 1e-3,
                                field=None) -> tuple[np.ndarray, np.ndarray]:
    """Force and torque on ``target`` from ``source`` by the surface-charge model.

    Parameters
    ----------
    target, source : MagnetBody
        Any shapes, positions and orientations; the bodies must not overlap.
    rtol : float
        Relative accuracy of the result, measured on |F| + |T| / R_target with R_target the
        target's bounding radius [-]. The default 1e-3 (0.1 %) is met with margin.
    field : callable, optional
        ``field(points (n, 3)) -> B (n, 3) [T]``; default the field of ``source``.

    Returns
    -------
    force : ndarray (3,)
        Force on the target [N].
    torque : ndarray (3,)
        Torque on the target about its centre [N m].

    Notes
    -----
    F = sum over faces of integral sigma B dA and T = integral (r - c) x sigma B dA with
    sigma = J_target . n / mu0. Exact for uniform magnetization (rigid, recoil permeability
    1) and non-overlapping bodies: the volume term M x B + r x (M . grad) B integrates to the
    surface term because B_source is curl-free in the target. Integrated by adaptive
    Gauss-Legendre quadrature (:func:`adaptive_box_integral`), which subdivides toward the
    part of a face that nearly touches the source.

    References
    ----------
    Furlani (2001), sec. 3.4; Jackson (1999), sec. 5.9.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> uniform = lambda points: np.tile([0.0, 0.0, 0.1], (len(points), 1))
    >>> m = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.0], diameter=0.01, height=0.01)
    >>> force, torque = force_and_torque_by_charges(m, m, field=uniform)
    >>> bool(np.allclose(force, 0.0, atol=1e-12)), bool(np.allclose(torque, 0.0, atol=1e-12))
    (True, True)
    """
    field = field or _field_function(source)
    maps, boxes, first_nodes = _body_frame_rule(*_rule_key(target))
    if not boxes:
        return np.zeros(3), np.zeros(3)
    rotation, center = target.rotation, target.center
    length = target.bounding_radius

    def integrand(points, charge):
        B = np.asarray(field(points), dtype=float).reshape(-1, 3)
        lever = points - center
        values = np.empty((len(points), 6))
        values[:, :3] = charge[:, None] * B
        scaled = charge / length
        values[:, 3] = scaled * (lever[:, 1] * B[:, 2] - lever[:, 2] * B[:, 1])
        values[:, 4] = scaled * (lever[:, 2] * B[:, 0] - lever[:, 0] * B[:, 2])
        values[:, 5] = scaled * (lever[:, 0] * B[:, 1] - lever[:, 1] * B[:, 0])
        return values

    def size(values):
        return (np.sqrt((values[..., :3] ** 2).sum(axis=-1))
                + np.sqrt((values[..., 3:] ** 2).sum(axis=-1)))

    # the initial boxes' nodes are kept in the body frame: one rotation and one field call
    local_points, weights, n_low = first_nodes
    values = integrand(center + local_points @ rotation.T, weights)
    first_pass = box_sums(values.reshape(len(boxes), -1, 6), n_low, size)
    global_maps = [_to_global(m, rotation, center) for m in maps]
    total = adaptive_box_integral(global_maps, boxes, integrand, size, rtol=rtol / 4,
                                  absolute_floor=_floor(target, source), first_pass=first_pass)
    return total[:3], total[3:] * length


def _rule_key(body: MagnetBody):
    """What the body-frame quadrature rule of ``body`` depends on, as a hashable tuple.

    Polarization components below 1e-12 of the largest (rounding left by rotations) are
    set to zero, so that no face with a vanishing charge is integrated.
    """
    J = body.polarization_body
    J = np.where(np.abs(J) > 1e-12 * np.abs(J).max(), J, 0.0)
    return (body.shape, float(body.diameter), float(body.height), float(body.inner_diameter),
            tuple(float(v) for v in body.size), tuple(float(v) for v in J))


@lru_cache(maxsize=256)
def _body_frame_rule(shape, diameter, height, inner_diameter, size, polarization):
    """Faces of a body at the origin and the Gauss nodes of their initial boxes (cached)."""
    body = MagnetBody(shape, np.zeros(3), np.eye(3), polarization, diameter=diameter,
                      height=height, inner_diameter=inner_diameter, size=size)
    maps, boxes = surface_charge_patches(body)
    if not boxes:
        return maps, boxes, None
    points, weights, n_low = box_nodes(maps, *_box_arrays(boxes))
    points, weights = points.reshape(-1, 3), weights.ravel()
    points.flags.writeable = False
    weights.flags.writeable = False
    return maps, boxes, (points, weights, n_low)


def interaction_energy(target: MagnetBody, source: MagnetBody, rtol: float = 1e-6,
                       field=None) -> float:
    """Interaction energy U of ``target`` in the field of ``source``.

    Parameters
    ----------
    target, source : MagnetBody
        Non-overlapping bodies.
    rtol : float
        Relative accuracy of the volume integral of B_source [-].
    field : callable, optional
        ``field(points (n, 3)) -> B (n, 3) [T]``; default the field of ``source``.

    Returns
    -------
    float
        U [J]; the force on the target is F = -grad U (target displaced, source fixed).

    Notes
    -----
    U = -integral_V M_target . B_source dV = -(J_target / mu0) . integral_V B_source dV,
    exact for rigid uniform magnetization. Symmetric: U(1 in 2) = U(2 in 1).

    References
    ----------
    Jackson (1999), sec. 5.7 (energy of a magnetization in an external field);
    Furlani (2001), sec. 3.4.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> uniform = lambda points: np.tile([0.0, 0.0, 0.1], (len(points), 1))
    >>> m = MagnetBody("block", [0, 0, 0], np.eye(3), [0, 0, 1.0], size=[0.01] * 3)
    >>> round(interaction_energy(m, m, field=uniform), 9)  # -m . B = -(1 T 1e-6 m^3 / mu0) 0.1 T
    -0.079577472
    """
    field = field or _field_function(source)
    maps, boxes = volume_patches(target)
    global_maps = [_to_global(m, target.rotation, target.center) for m in maps]

    def integrand(points, jacobian):
        return jacobian[:, None] * np.asarray(field(points), dtype=float).reshape(-1, 3)

    integral = adaptive_box_integral(global_maps, boxes, integrand,
                                     lambda v: np.linalg.norm(v, axis=-1), rtol=rtol,
                                     orders=(4, 6))
    return float(-target.polarization @ integral / mu_0)


def _to_global(body_map, rotation, center):
    def mapped(u):
        points, measure = body_map(u)
        return center + points @ rotation.T, measure
    return mapped


def _floor(target, source):
    """An absolute error floor: 1e-12 of the force scale J1 J2 A / mu0 of the pair."""
    j_target = float(np.sqrt(target.polarization @ target.polarization))
    j_source = float(np.sqrt(source.polarization @ source.polarization))
    return 1e-12 * j_target * j_source * min(target.bounding_radius,
                                             source.bounding_radius) ** 2 / mu_0
