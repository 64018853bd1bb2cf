"""The first pass of the charge-model force: one fixed rule over each whole face of the target,
and the source's field evaluated directly in the target's own frame.

Most magnet pairs are far enough apart, compared with the size of the target's faces, that
one modest rule per face reaches 0.1 % at once; the adaptive subdivision
(:func:`planner.physics.forces.quadrature.adaptive_box_integral`) is then needed only for
faces that nearly touch the source. Each whole face gets a tensor rule of two nested parts,
so that the error estimate costs no extra field values:

* an angle that runs over a full turn (end discs and curved faces of cylinders and rings,
  the sphere's azimuth): the trapezoidal rule, which converges exponentially for smooth
  periodic integrands and is exact for an integrand that does not depend on the angle (a
  coaxial pair); its embedded rule takes every other node;
* every other parameter (radius, height, a block face's sides, the sphere's polar angle):
  a Gauss-Kronrod rule with its embedded Gauss rule.

References
----------
Trefethen & Weideman, SIAM Review 56, 385-458 (2014) (trapezoidal rule); Laurie, Math.
Comp. 66, 1133-1145 (1997) (Gauss-Kronrod); Furlani, *Permanent Magnet and
Electromechanical Devices* (2001), sec. 3.4 (charge model).
"""
from __future__ import annotations

from functools import lru_cache
from typing import NamedTuple

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.forces.quadrature_rules import nested_tensor_rule

#: Nodes of the whole-face rule along an angle over a full turn (trapezoidal rule).
ANGLE_POINTS = 16
#: Gauss points n of the Gauss-Kronrod rule (2n + 1 nodes) along every other parameter.
KRONROD_GAUSS_POINTS = 3


class WholeFaceRule(NamedTuple):
    """A body's charged faces with the whole-face rule on them, in the body frame."""

    maps: list
    faces: list
    points: np.ndarray
    moments: np.ndarray
    columns: int
    length: float


def whole_face_rule(shape: str, diameter: float, height: float, inner_diameter: float,
                    size: tuple, polarization: tuple) -> WholeFaceRule | None:
    """Nodes and weights of the first-pass rule on every charged face of a body at the origin.

    Parameters
    ----------
    shape, diameter, height, inner_diameter, size, polarization
        The fields of a :class:`~planner.physics.bodies.MagnetBody` placed at the origin
        with the identity rotation, ``polarization`` being J in the body frame [T]; sizes
        [m]. Hashable (tuples), so the result is cached.

    Returns
    -------
    WholeFaceRule or None
        ``maps`` and ``faces`` as from
        :func:`~planner.physics.forces.charge_model.surface_charge_patches` with
        ``whole_faces=True``; ``points`` (N, 3) the nodes of all faces [m];
        ``moments`` (F * c * 6, 3 N) [A m]; ``columns`` = c, the rule columns per face
        (0 the full rule, 1 + i the rule lowered along parameter i); ``length`` the
        bounding radius R [m]. None if no face carries charge.

    Notes
    -----
    With B (N, 3) the field at ``points`` [T], ``moments @ B.ravel()``, reshaped to
    (F, c, 6), gives for each face f and rule column j the force integral of sigma B dA
    [N] and the torque integral of r x sigma B dA divided by R [N]: the charge, the
    Jacobian, the rule weights and the lever arms r are folded into one matrix, so the
    sums cost a single matrix-vector product. A face's error estimate is the sum over its
    parameters of the differences between the full and the lowered rule.

    References
    ----------
    Davis & Rabinowitz, *Methods of Numerical Integration* (1984), sec. 5.6 and 6.2.

    Examples
    --------
    >>> rule = whole_face_rule("cylinder", 0.01, 0.005, 0.0, (0.0, 0.0, 0.0), (0.0, 0.0, 1.0))
    >>> rule.points.shape, rule.moments.shape  # two end discs of 7 x 16 nodes
    ((224, 3), (36, 672))
    """
    return _cached_rule(shape, float(diameter), float(height), float(inner_diameter),
                        tuple(float(v) for v in size), tuple(float(v) for v in polarization))


@lru_cache(maxsize=256)
def _cached_rule(shape, diameter, height, inner_diameter, size, polarization):
    from planner.physics.forces.charge_model import surface_charge_patches

    body = MagnetBody(shape, np.zeros(3), np.eye(3), polarization, diameter=diameter,
                      height=height, inner_diameter=inner_diameter, size=size)
    maps, faces = surface_charge_patches(body, whole_faces=True)
    if not faces:
        return None
    columns = 3  # every face has two parameters
    blocks = []
    for index, low, high, periodic in faces:
        kinds = tuple(("periodic", ANGLE_POINTS) if axis == periodic
                      else ("kronrod", KRONROD_GAUSS_POINTS) for axis in range(2))
        nodes, rule_weights = nested_tensor_rule(kinds)
        low, high = np.asarray(low), np.asarray(high)
        points, measure = maps[index](low + (high - low) * nodes)
        scaled = rule_weights * (measure * np.prod(high - low))[:, None]
        blocks.append((points, scaled))
    points = np.concatenate([points for points, _ in blocks])
    weights = np.zeros((len(faces) * columns, len(points)))
    start = 0
    for f, (face_points, scaled) in enumerate(blocks):
        weights[f * columns:(f + 1) * columns, start:start + len(face_points)] = scaled.T
        start += len(face_points)
    length = body.bounding_radius
    # force rows: sum_i w_i B_i; torque rows: sum_i w_i (r_i x B_i) / R, r x B = [r]_x B
    moments = np.zeros((len(weights), 6, len(points), 3))
    for k in range(3):
        moments[:, k, :, k] = weights
    lever = points / length
    for row in range(3):  # (r x B)_row = r_next B_after - r_after B_next, cyclically
        after, following = (row + 1) % 3, (row + 2) % 3
        moments[:, 3 + row, :, following] = weights * lever[:, after]
        moments[:, 3 + row, :, after] = -weights * lever[:, following]
    moments = moments.reshape(len(weights) * 6, len(points) * 3)
    points.flags.writeable = False
    moments.flags.writeable = False
    return WholeFaceRule(maps, faces, points, moments, columns, length)


def field_in_frame_of(target: MagnetBody, source: MagnetBody, field=None):
    """The source's field as a function of points in the target's frame, in that frame.

    Parameters
    ----------
    target : MagnetBody
        Whose frame (centre, axes) the points and the returned field are given in.
    source : MagnetBody
        The body whose field is wanted (unless ``field`` is given).
    field : callable, optional
        ``field(global points (n, 3)) -> B (n, 3) [T]`` to use instead.

    Returns
    -------
    callable
        ``f(points (n, 3) [m]) -> B (n, 3) [T]``, both in the target's frame.

    Notes
    -----
    A target-frame point p is q = R_s^T R_t p + R_s^T (c_t - c_s) in the source's frame,
    where the closed form of the source's shape is evaluated directly (cylinder, ring,
    block, sphere of :mod:`planner.physics.fields`), and B turns back with
    B_t = R_t^T R_s B_s: one frame change for the pair instead of two. Beyond the range
    where the fields package switches to its multipole expansion the general
    :func:`planner.physics.fields.field_of_body` is used instead.

    References
    ----------
    Derby & Olbert, Am. J. Phys. 78, 229-235 (2010) and the other field references of
    :mod:`planner.physics.fields`.
    """
    from planner.physics.fields import (FAR_FIELD_RADII, block_field, cylinder_field,
                                        field_of_body, ring_field, sphere_field)

    rotation, center = target.rotation, target.center
    reach = np.linalg.norm(target.center - source.center) + target.bounding_radius
    if field is not None or reach > 0.5 * FAR_FIELD_RADII * source.bounding_radius:
        global_field = field or (lambda points: field_of_body(source, points))
        return lambda points: np.asarray(global_field(center + points @ rotation.T),
                                         dtype=float).reshape(-1, 3) @ rotation
    turn = source.rotation.T @ rotation
    shift = source.rotation.T @ (center - source.center)
    J = source.polarization_body
    if source.shape == "cylinder":
        def closed_form(q):
            return cylinder_field(q, source.diameter, source.height, J)
    elif source.shape == "ring":
        def closed_form(q):
            return ring_field(q, source.diameter, source.inner_diameter, source.height, J)
    elif source.shape == "block":
        def closed_form(q):
            return block_field(q, source.size, J)
    else:
        def closed_form(q):
            return sphere_field(q, source.diameter, J)
    return lambda points: closed_form(points @ turn.T + shift) @ turn
