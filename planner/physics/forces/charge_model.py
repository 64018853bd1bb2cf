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

import math

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.constants import mu_0
from planner.physics.fields.chunking import without_rounding_noise
from planner.physics.forces.face_rules import (INTERVAL_POINTS, PLAIN_DIFFERENCE_ROWS, ROW_WIDTH,
                                               ROWS_PER_FACE, field_in_frame_of, first_pass_size,
                                               whole_face_rule)
from planner.physics.forces.quadrature import adaptive_box_integral
from planner.physics.forces.quadrature_rules import extrapolated_error

#: Quadrature points are set this fraction of the target size inside the target, so that
#: at contact they see the source field from the target's side of the shared surface.
INWARD_OFFSET = 1e-9

TWO_PI = 2.0 * np.pi
#: Share of ``rtol`` allowed as the relative error of the source's elliptic integrals.
FIELD_ACCURACY_SHARE = 1e-4


def _field_function(source):
    from planner.physics.fields import field_of_body  # import here: fields is a sibling module

    return lambda points: field_of_body(source, points)


def surface_charge_patches(body: MagnetBody, whole_faces: bool = False):
    """Faces of ``body`` as parameter boxes carrying their magnetic surface charge.

    Parameters
    ----------
    body : MagnetBody
    whole_faces : bool
        Return one entry per face, with the index of its periodic parameter, instead of the
        initial boxes of the adaptive quadrature.

    Returns
    -------
    maps : list of callables
        ``maps[i](u)`` -> (points in the body frame (m, 3) [m], charge per unit parameter
        measure (m,) [A m^-1 times the face Jacobian]).
    boxes : list of (map index, low, high), or of (map index, low, high, periodic)
        Initial parameter boxes (2-D), with angles split into quarter turns; or, with
        ``whole_faces``, each face whole, ``periodic`` being the index of its angle parameter
        that runs over a full turn (None for a block's face).

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
    maps, faces = [], []

    def add(map_function, low, high, periodic=None):
        maps.append(map_function)
        faces.append((len(maps) - 1, list(low), list(high), periodic))

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
                add(end_face, [inner, 0.0], [outer, TWO_PI], periodic=1)
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
                add(curved_face, [0.0, -half], [TWO_PI, half], periodic=0)
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
                add(block_face, -half_size[others], half_size[others])
    else:  # sphere
        radius = body.diameter / 2

        def sphere_face(u):
            theta, phi = u[:, 0], u[:, 1]
            normal = np.stack([np.sin(theta) * np.cos(phi), np.sin(theta) * np.sin(phi),
                               np.cos(theta)], axis=1)
            charge = (normal @ J) * radius**2 * np.sin(theta)
            return (radius - offset) * normal, charge
        add(sphere_face, [0.0, 0.0], [np.pi, TWO_PI], periodic=1)
    if whole_faces:
        return maps, faces
    return maps, [box for face in faces for box in _initial_boxes(*face)]


def _initial_boxes(index, low, high, periodic):
    """A face cut into the adaptive quadrature's first boxes: quarter turns of its angle."""
    if periodic is None:
        return [(index, low, high)]
    boxes = []
    for k in range(4):
        box_low, box_high = list(low), list(high)
        box_low[periodic], box_high[periodic] = k * np.pi / 2, (k + 1) * np.pi / 2
        boxes.append((index, box_low, box_high))
    return boxes


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
        target's bounding radius [-]: the estimated error, |dF| + |dT| / R_target, is kept
        below rtol (|F| + |T| / R_target). The default 1e-3 (0.1 %) is met with margin
        (checked against tight references in the tests: actual errors up to ~0.1 rtol).
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
    surface term because B_source is curl-free in the target.

    The source's closed form computes its elliptic integrals to ``FIELD_ACCURACY_SHARE``
    (1e-4) times ``rtol``, not to double precision: at rtol = 1e-3 that saves one or two
    steps of Bulirsch's iteration, and the field is still within about 5e-7 of exact
    (:func:`~planner.physics.fields.cylinder.cylinder_field`), a thousandth of the error
    allowed.

    First pass: one fixed rule over each whole face
    (:func:`~planner.physics.forces.face_rules.whole_face_rule`; 7 nodes along a radius,
    height or side and 12, 16 or 24 around a turn, more for closer pairs,
    :func:`~planner.physics.forces.face_rules.first_pass_size`), with the
    source's closed form evaluated in the target's frame in a single call. Its error
    estimate per face and parameter is extrapolated from the two coarser nested rules
    (:func:`~planner.physics.forces.quadrature_rules.extrapolated_error`). If the summed
    estimate exceeds the bound, the faces carrying most of it are integrated again by the
    adaptive subdivision (:func:`adaptive_box_integral`, nested 7-point rules), which closes
    in on the part of a face that nearly touches the source, within the rest of the budget.

    References
    ----------
    Furlani (2001), sec. 3.4; Jackson (1999), sec. 5.9; Davis & Rabinowitz, *Methods of
    Numerical Integration* (1984), ch. 5-6.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> uniform = lambda points: np.tile([0.0, 0.0, 0.1], (len(points), 1))
    >>> m = MagnetBody("cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.0], diameter=0.01, height=0.01)
    >>> force, torque = force_and_torque_by_charges(m, m, field=uniform)
    >>> bool(np.allclose(force, 0.0, atol=1e-12)), bool(np.allclose(torque, 0.0, atol=1e-12))
    (True, True)
    """
    rule = whole_face_rule(*_rule_key(target), *first_pass_size(target, source))
    if rule is None:
        return np.zeros(3), np.zeros(3)
    local_field = field_in_frame_of(target, source, field, accuracy=FIELD_ACCURACY_SHARE * rtol)
    length = rule.length

    # first pass: the whole-face rule on every face, in one field call; each face's error
    # is the sum over its two parameters of the error extrapolated from the coarser rules
    sums = rule.moments.dot(local_field(rule.points).ravel())  # .dot: less overhead than @
    total = sums[:ROW_WIDTH]
    values = sums.tolist()
    fx, fy, fz, tx, ty, tz = values[:ROW_WIDTH]
    bound = rtol * (math.hypot(fx, fy, fz) + math.hypot(tx, ty, tz))
    # The plain differences Q_full - Q_once of every face and parameter, never below the
    # extrapolated estimate, often meet the bound already (rows of the layout in
    # face_rules); summed here on Python floats, which for these few numbers is quicker
    # than array reductions.
    plain = 0.0
    for face_start in range(ROW_WIDTH, len(values), ROWS_PER_FACE * ROW_WIDTH):
        for row in PLAIN_DIFFERENCE_ROWS:
            at = face_start + row * ROW_WIDTH
            plain += math.hypot(*values[at:at + 3]) + math.hypot(*values[at + 3:at + 6])
    if plain <= bound:
        return _turned_to_global(total, target.rotation, length)
    per_face = sums[ROW_WIDTH:].reshape(-1, ROWS_PER_FACE, ROW_WIDTH)
    differences = per_face[:, 1:].reshape(-1, 2, 2, 2, 3)  # face, parameter, difference, F|T
    sizes = np.sqrt((differences * differences).sum(axis=4)).sum(axis=3)
    error = extrapolated_error(sizes[:, :, 0], sizes[:, :, 1]).sum(axis=1)
    error_sum = float(error.sum())
    if error_sum > bound:  # the absolute floor matters only for totals that vanish
        bound = max(bound, _floor(target, source))
    if error_sum > bound:
        # refine the faces with the largest errors, enough to leave at most half the bound
        # on the others, by adaptive subdivision with the rest of the budget
        order = np.argsort(error)[::-1]
        excess = error_sum - bound
        count = int(np.searchsorted(np.cumsum(error[order]), excess + bound / 2)) + 1
        refine = order[:count]
        budget = bound - (error_sum - error[refine].sum())

        def integrand(points, charge):
            """sigma B and sigma (r x B) / R at target-frame points, times the weight."""
            B = local_field(points)
            values = np.empty((len(points), 6))
            np.multiply(B, charge[:, None], out=values[:, :3])
            lever = points * (charge / length)[:, None]
            for row in range(3):  # (r x B)_row, cyclically
                after, following = (row + 1) % 3, (row + 2) % 3
                values[:, 3 + row] = (lever[:, after] * B[:, following]
                                      - lever[:, following] * B[:, after])
            return values

        boxes = [box for f in refine for box in _initial_boxes(*rule.faces[f])]
        refined = adaptive_box_integral(rule.maps, boxes, integrand, _size, rtol=0.0,
                                        orders=INTERVAL_POINTS, absolute_floor=budget)
        total = total - per_face[refine, 0].sum(axis=0) + refined
    return _turned_to_global(total, target.rotation, length)


def _turned_to_global(total, rotation, length):
    """Force and torque in the global frame from (F, T / R) in the target's frame."""
    both = rotation.dot(total.reshape(2, 3).T)
    return both[:, 0], both[:, 1] * length


def _size(values):
    """|F| + |T| / R of (..., 6) arrays holding F and T / R [N]."""
    return (np.sqrt((values[..., :3] ** 2).sum(axis=-1))
            + np.sqrt((values[..., 3:] ** 2).sum(axis=-1)))


def _rule_key(body: MagnetBody):
    """What the body-frame quadrature rule of ``body`` depends on, as a hashable tuple.

    Polarization components that are only rounding left by rotations are set to zero
    (:func:`~planner.physics.fields.chunking.without_rounding_noise`), so that no face with
    a vanishing charge is integrated.
    """
    J = tuple(without_rounding_noise(body.polarization_body).tolist())
    return (body.shape, float(body.diameter), float(body.height), float(body.inner_diameter),
            tuple(body.size.tolist()), J)


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
    global_maps = [in_global_frame(m, target.rotation, target.center) for m in maps]

    def integrand(points, jacobian):
        return jacobian[:, None] * np.asarray(field(points), dtype=float).reshape(-1, 3)

    integral = adaptive_box_integral(global_maps, boxes, integrand,
                                     lambda v: np.linalg.norm(v, axis=-1), rtol=rtol,
                                     orders=(4, 6))
    return float(-target.polarization @ integral / mu_0)


def in_global_frame(body_map, rotation, center):
    """A patch map of :func:`surface_charge_patches` or :func:`volume_patches`, its points
    moved from the body frame to the global frame, p -> c + R p (the measure unchanged)."""
    def mapped(u):
        points, measure = body_map(u)
        return center + points @ rotation.T, measure
    return mapped


def _floor(target, source):
    """An absolute error floor: 1e-12 of the force scale J1 J2 A / mu0 of the pair."""
    j_target = math.sqrt(target.polarization @ target.polarization)
    j_source = math.sqrt(source.polarization @ source.polarization)
    return 1e-12 * j_target * j_source * min(target.bounding_radius,
                                             source.bounding_radius) ** 2 / mu_0
