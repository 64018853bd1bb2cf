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
  coaxial pair); its coarser rules take every second and every fourth node;
* every other parameter (radius, height, a block face's sides, the sphere's polar angle):
  the 7-point Kronrod rule with the 3-point Gauss rule and the midpoint inside it.

References
----------
Trefethen & Weideman, SIAM Review 56, 385-458 (2014) (trapezoidal rule); Laurie, Math.
Comp. 66, 1133-1145 (1997) and Patterson, Math. Comp. 22, 847-856 (1968) (nested rules); Furlani, *Permanent Magnet and
Electromechanical Devices* (2001), sec. 3.4 (charge model).
"""
from __future__ import annotations

import math
from functools import lru_cache
from typing import NamedTuple

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.fields import FAR_FIELD_RADII, body_frame_field, field_of_body
from planner.physics.fields.elliptic import FULL_ACCURACY
from planner.physics.fields.multipole import (MAX_RATIO, axisymmetric_series_field,
                                              cached_zonal_moments, terms_needed)
from planner.physics.forces.quadrature_rules import nested_tensor_rule

#: Nodes of the whole-face rule along an angle over a full turn (trapezoidal rule).
ANGLE_POINTS = 16
#: Nodes of the nested rule (1, 3, 7 or 15 points) along every other parameter.
INTERVAL_POINTS = 7
#: (separation, (interval points, angle points)): the first-pass rule for a target whose
#: centre distance from the source is at least ``separation`` times the sum of the two
#: bounding radii. Closer faces see a field that varies faster, above all around the
#: turn, where a near rim crosses them; the tiers were set on the pairs of the tests and
#: of benchmarks/forces.py so that most of them need one pass (the estimate decides).
RULE_TIERS = ((2.0, (7, 12)), (0.75, (INTERVAL_POINTS, ANGLE_POINTS)), (0.0, (7, 24)))


def first_pass_size(target: MagnetBody, source: MagnetBody) -> tuple[int, int]:
    """The (interval points, angle points) of the first-pass rule for this pair.

    Parameters
    ----------
    target, source : MagnetBody

    Returns
    -------
    (int, int)
        From ``RULE_TIERS`` by d / (R_target + R_source), d the distance between the
        centres and R the bounding radii.

    Notes
    -----
    Only the cost depends on this choice: the error estimate decides whether a face is
    refined.

    Examples
    --------
    >>> a = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.0], diameter=0.01)
    >>> first_pass_size(a, MagnetBody("sphere", [0, 0, 0.1], np.eye(3), [0, 0, 1.0], diameter=0.01))
    (7, 12)
    """
    reach = target.bounding_radius + source.bounding_radius
    ratio = math.dist(target.center.tolist(), source.center.tolist()) / reach
    for separation, size in RULE_TIERS:
        if ratio >= separation:
            return size
    return RULE_TIERS[-1][1]


#: Layout of ``WholeFaceRule.moments @ B.ravel()``: rows of F then T / R (6 numbers), row 0
#: the total and then ROWS_PER_FACE rows per face (its integral and the four differences).
ROW_WIDTH = 6
ROWS_PER_FACE = 5
#: Rows of a face's block holding Q_full - Q_once along parameter 0 and along parameter 1.
PLAIN_DIFFERENCE_ROWS = (1, 3)


class WholeFaceRule(NamedTuple):
    """A body's charged faces with the whole-face rule on them, in the body frame."""

    maps: list
    faces: list
    points: np.ndarray
    moments: np.ndarray
    length: float


@lru_cache(maxsize=256)
def whole_face_rule(shape: str, diameter: float, height: float, inner_diameter: float,
                    size: tuple, polarization: tuple, interval_points: int = INTERVAL_POINTS,
                    angle_points: int = ANGLE_POINTS) -> WholeFaceRule | None:
    """Nodes and weights of the first-pass rule on every charged face of a body at the origin.

    Parameters
    ----------
    shape, diameter, height, inner_diameter, size, polarization
        The fields of a :class:`~planner.physics.bodies.MagnetBody` placed at the origin
        with the identity rotation, ``polarization`` being J in the body frame [T]; sizes
        [m]. Floats and tuples of floats, so that the result can be cached.
    interval_points : int
        Nodes (3, 7 or 15) of the nested rule along each parameter that is not a full
        turn [-].
    angle_points : int
        Nodes of the trapezoidal rule along a full turn (a multiple of 4) [-].

    Returns
    -------
    WholeFaceRule or None
        ``maps`` and ``faces`` as from
        :func:`~planner.physics.forces.charge_model.surface_charge_patches` with
        ``whole_faces=True``; ``points`` (N, 3) the nodes of all faces [m];
        ``moments`` ((1 + 5 F) * 6, 3 N) [A m]; ``length`` the bounding radius R [m].
        None if no face carries charge.

    Notes
    -----
    With B (N, 3) the field at ``points`` [T], ``moments @ B.ravel()``, reshaped to
    (1 + 5 F, 6), gives in each row the force integral of sigma B dA [N] and the torque
    integral of r x sigma B dA divided by R [N]: row 0 over all faces by the full rule,
    then for each face f its own integral and, for each parameter i, the differences
    Q_full - Q_once and Q_once - Q_twice, Q_once and Q_twice being the rule coarsened
    once and twice along parameter i
    (:func:`~planner.physics.forces.quadrature_rules.nested_tensor_rule`). The charge,
    the Jacobian, the rule weights and the lever arms r are folded into one matrix, so
    the sums cost a single matrix-vector product. A face's error estimate is the sum over
    its parameters of the error extrapolated from the two differences
    (:func:`~planner.physics.forces.quadrature_rules.extrapolated_error`).

    References
    ----------
    Davis & Rabinowitz, *Methods of Numerical Integration* (1984), sec. 5.6 and 6.2.

    Examples
    --------
    >>> rule = whole_face_rule("cylinder", 0.01, 0.005, 0.0, (0.0,) * 3, (0.0, 0.0, 1.0))
    >>> rule.points.shape, rule.moments.shape  # two end discs of 7 x 16 nodes
    ((224, 3), (66, 672))
    """
    from planner.physics.forces.charge_model import surface_charge_patches

    body = MagnetBody(shape, np.zeros(3), np.eye(3), polarization, diameter=diameter,
                      height=height, inner_diameter=inner_diameter, size=size)
    maps, faces = surface_charge_patches(body, whole_faces=True)
    if not faces:
        return None
    blocks = []
    for index, low, high, periodic in faces:
        kinds = tuple(("periodic", angle_points) if axis == periodic
                      else ("interval", interval_points) for axis in range(2))
        nodes, rule_weights = nested_tensor_rule(kinds)
        low, high = np.asarray(low), np.asarray(high)
        points, measure = maps[index](low + (high - low) * nodes)
        # columns: full rule, then per parameter the two coarser ones -> the full rule and,
        # per parameter, (full - once) and (once - twice)
        full, once, twice = rule_weights[:, :1], rule_weights[:, 1::2], rule_weights[:, 2::2]
        differences = np.stack([full - once, once - twice], axis=2).reshape(len(nodes), 4)
        scaled = np.c_[full, differences] * (measure * np.prod(high - low))[:, None]
        blocks.append((points, scaled))
    points = np.concatenate([points for points, _ in blocks])
    # row 0 the total over all faces by the full rule; then per face its full rule and
    # its 4 differences
    weights = np.zeros((1 + ROWS_PER_FACE * len(faces), len(points)))
    start = 0
    for f, (face_points, scaled) in enumerate(blocks):
        stop = start + len(face_points)
        weights[0, start:stop] = scaled[:, 0]
        weights[1 + ROWS_PER_FACE * f:1 + ROWS_PER_FACE * (f + 1), start:stop] = scaled.T
        start = stop
    length = body.bounding_radius
    # force rows: sum_i w_i B_i; torque rows: sum_i w_i (r_i x B_i) / R, r x B = [r]_x B
    moments = np.zeros((len(weights), ROW_WIDTH, len(points), 3))
    for k in range(3):
        moments[:, k, :, k] = weights
    lever = points / length
    for row in range(3):  # (r x B)_row = r_next B_after - r_after B_next, cyclically
        after, following = (row + 1) % 3, (row + 2) % 3
        moments[:, 3 + row, :, following] = weights * lever[:, after]
        moments[:, 3 + row, :, after] = -weights * lever[:, following]
    moments = moments.reshape(len(weights) * ROW_WIDTH, len(points) * 3)
    points.flags.writeable = False
    moments.flags.writeable = False
    return WholeFaceRule(maps, faces, points, moments, length)


def field_in_frame_of(target: MagnetBody, source: MagnetBody, field=None, accuracy=FULL_ACCURACY):
    """The source's field as a function of points in the target's frame, in that frame.

    Parameters
    ----------
    target : MagnetBody
        Whose frame (centre, axes) the points and the returned field are given in.
    source : MagnetBody
        The body whose field is wanted (unless ``field`` is given).
    field : callable, optional
        ``field(global points (n, 3)) -> B (n, 3) [T]`` to use instead.
    accuracy : float
        Relative accuracy of the elliptic integrals of a cylinder's or ring's closed form
        (:func:`~planner.physics.fields.cylinder.cylinder_field`); default double
        precision.

    Returns
    -------
    callable
        ``f(points (n, 3) [m]) -> B (n, 3) [T]``, both in the target's frame.

    Notes
    -----
    A target-frame point p is q = R_s^T R_t p + R_s^T (c_t - c_s) in the source's frame,
    where the closed form of the source's shape is evaluated directly
    (:func:`planner.physics.fields.body_frame_field`), and B turns back with
    B_t = R_t^T R_s B_s: one frame change for the pair instead of two. Where every point
    of the target is at least R_source / ``MAX_RATIO`` from the centre of a cylinder or ring
    source, its exterior multipole series replaces the closed form
    (:func:`planner.physics.fields.multipole.axisymmetric_series_field`, the rest proven
    below 1e-10 of the dipole field): the same field to that accuracy for about half the
    cost. Beyond the range where the fields package switches to its dipole-plus-octupole
    expansion the general :func:`planner.physics.fields.field_of_body` is used instead.

    References
    ----------
    Derby & Olbert, Am. J. Phys. 78, 229-235 (2010) and the other field references of
    :mod:`planner.physics.fields`.
    """
    rotation, center = target.rotation, target.center
    apart = center - source.center
    distance = math.hypot(*apart.tolist())
    if field is not None or distance + target.bounding_radius > \
            0.5 * FAR_FIELD_RADII * source.bounding_radius:
        global_field = field or (lambda points: field_of_body(source, points))
        return lambda points: np.asarray(global_field(center + points @ rotation.T),
                                         dtype=float).reshape(-1, 3) @ rotation
    # ndarray.dot rather than @: for 3 x 3 arrays it has a third of the call overhead
    back = source.rotation.T
    turn = back.dot(rotation)
    shift = back.dot(apart)
    J = source.polarization_body
    series_ratio = _series_ratio(target, source, distance)
    if series_ratio is not None:
        shape = (source.diameter / 2, source.inner_diameter / 2, source.height / 2)
        moments = cached_zonal_moments(*shape, terms_needed(series_ratio, shape=shape))
        radius = source.bounding_radius

        def closed_form(q):
            return axisymmetric_series_field(q, moments, radius, J)
    else:
        def closed_form(q):
            return body_frame_field(source, q, J, accuracy)
    turn_back = rotation.T.dot(source.rotation)  # turn.T
    return lambda points: closed_form(points.dot(turn_back) + shift).dot(turn)


def _series_ratio(target, source, distance):
    """R_source / (nearest possible distance of a target point), if the series may serve."""
    if source.shape not in ("cylinder", "ring"):
        return None
    nearest = distance - target.bounding_radius
    if nearest <= 0.0 or source.bounding_radius > MAX_RATIO * nearest:
        return None
    return source.bounding_radius / nearest
