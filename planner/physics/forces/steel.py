"""A magnet near a large flat steel surface: method of images and a saturation check.

References
----------
J. D. Jackson, *Classical Electrodynamics*, 3rd ed., Wiley (1999), sec. 5.12 (boundary
conditions at a highly permeable medium; images).
E. P. Furlani, *Permanent Magnet and Electromechanical Devices*, Academic Press (2001),
sec. 3.6 (magnet near a soft-iron surface, images).
"""
from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.forces.charge_model import _field_function
from planner.physics.forces.pair import extent_along, force_and_torque
from planner.physics.forces.quadrature import adaptive_box_integral

#: Saturation flux density of low-carbon steel [T]; the lower end of 2.0-2.1 T (ASM
#: Handbook vol. 2, magnetically soft materials), so that saturation is flagged early.
LOW_CARBON_STEEL_SATURATION = 2.0


def mirror_in_plane(body: MagnetBody, plane_point, plane_normal) -> MagnetBody:
    """The magnetic image of ``body`` in the surface of an infinitely permeable half-space.

    Parameters
    ----------
    body : MagnetBody
    plane_point : array (3,)
        A point on the steel surface [m].
    plane_normal : array (3,)
        Normal of the surface pointing out of the steel, toward the magnet [-].

    Returns
    -------
    MagnetBody
        The mirrored body: centre and axes reflected, polarization with its normal
        component kept and its tangential components reversed.

    Notes
    -----
    With P = I - 2 n n^T, the image has centre p0 + P (c - p0), rotation P R D (D flips the
    first body axis so the frame stays proper; bodies are symmetric under that flip) and
    J' = -P J. Valid for mu_r -> infinity, an unsaturated half-space and a plane large
    compared with the magnet.

    References
    ----------
    Jackson (1999), sec. 5.12; Furlani (2001), sec. 3.6.

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> m = MagnetBody("cylinder", [0, 0, 0.01], np.eye(3), [0.5, 0, 1.0], diameter=0.01, height=0.01)
    >>> image = mirror_in_plane(m, [0, 0, 0], [0, 0, 1])
    >>> image.center.tolist(), image.polarization.tolist()
    ([0.0, 0.0, -0.01], [-0.5, 0.0, 1.0])
    """
    n = np.asarray(plane_normal, dtype=float)
    n = n / np.linalg.norm(n)
    point = np.asarray(plane_point, dtype=float)
    reflect = np.eye(3) - 2 * np.outer(n, n)
    return replace(body, center=point + reflect @ (body.center - point),
                   rotation=reflect @ body.rotation @ np.diag([-1.0, 1.0, 1.0]),
                   polarization=-reflect @ body.polarization)


def steel_surface_force_and_torque(body: MagnetBody, plane_point, plane_normal,
                                   rtol: float = 1e-3) -> tuple[np.ndarray, np.ndarray]:
    """Upper bound of the force and torque on a magnet from a large flat steel surface.

    Parameters
    ----------
    body : MagnetBody
        The magnet, wholly on the outer side of the surface.
    plane_point, plane_normal : array (3,)
        The steel surface, normal pointing toward the magnet.
    rtol : float
        Relative accuracy [-].

    Returns
    -------
    force [N], torque about the magnet's centre [N m] : ndarray (3,), ndarray (3,)

    Notes
    -----
    Method of images: the force of the steel equals the force of the image magnet
    (:func:`mirror_in_plane`), so a magnet at gap g feels the pull of its twin at gap 2g.
    Assumes mu_r -> infinity and no saturation: an upper bound, right for pinch hazards,
    not for load-holding claims; see :func:`plate_saturation_check` for thin plates.

    References
    ----------
    Jackson (1999), sec. 5.12; Furlani (2001), sec. 3.6.
    """
    return force_and_torque(body, mirror_in_plane(body, plane_point, plane_normal), rtol=rtol)


#: A body counts as standing square on a surface when an axis is this close to its normal.
_SQUARE = 1e-9


def _axis_pieces(edges, scale):
    """One coordinate axis cut at ``edges`` (may start at -inf and end at +inf).

    Returns a list of (map, low, high): ``map(t) -> (x, dx/dt)`` on the parameter interval
    [low, high]. Bounded pieces are the identity; a half-line is x = e +- scale t / (1 - t)
    for t in [0, 1), which turns the slowly decaying far field into a bounded integrand.
    """
    pieces = []
    for low, high in zip(edges[:-1], edges[1:]):
        if np.isfinite(low) and np.isfinite(high):
            pieces.append((lambda t: (t, np.ones_like(t)), low, high))
        elif np.isfinite(low):
            pieces.append((lambda t, e=low: (e + scale * t / (1 - t), scale / (1 - t) ** 2), 0.0, 1.0))
        else:
            pieces.append((lambda t, e=high: (e - scale * t / (1 - t), scale / (1 - t) ** 2), 0.0, 1.0))
    return pieces


def plate_surface_patches(body: MagnetBody, foot, plane_normal):
    """The whole steel surface as parameter boxes whose edges follow the magnet's footprint.

    Parameters
    ----------
    body : MagnetBody
    foot : array (3,)
        The foot of the body's centre on the surface [m].
    plane_normal : array (3,)
        Unit normal of the surface [-].

    Returns
    -------
    maps, boxes
        As :func:`planner.physics.forces.charge_model.surface_charge_patches`:
        ``maps[i](u) -> (surface points (m, 3) [m], area Jacobian (m,) [m^2 per unit
        parameter area])``, and (map index, low, high) boxes covering the whole plane.

    Notes
    -----
    At contact B_n jumps at the footprint outline (from J_n inside to the return field
    outside). Gauss rules converge slowly across a jump, so the box edges are put on the
    outline where it is simple: a cylinder, ring or sphere standing square on the surface
    gets polar boxes about its axis cut at its radii; a block with a face on the surface
    gets a 3 x 3 grid cut at its footprint edges. Any other body gets polar boxes cut at
    its bounding radius. Unbounded pieces are mapped onto [0, 1) (:func:`_axis_pieces`).

    References
    ----------
    Davis & Rabinowitz, Methods of Numerical Integration (1984), sec. 3.2 (breaking the
    range at singularities) and 3.3 (transformation of infinite ranges).
    """
    n = np.asarray(plane_normal, dtype=float)
    foot = np.asarray(foot, dtype=float)
    scale = body.bounding_radius
    maps, boxes = [], []
    if body.shape == "block":
        along = np.abs(body.rotation.T @ n)
        normal_axis = int(np.argmax(along))
        if abs(along[normal_axis] - 1) < _SQUARE:
            in_plane = [i for i in range(3) if i != normal_axis]
            e1, e2 = body.rotation[:, in_plane[0]], body.rotation[:, in_plane[1]]
            half = body.size[in_plane] / 2
            first = _axis_pieces([-np.inf, -half[0], half[0], np.inf], scale)
            second = _axis_pieces([-np.inf, -half[1], half[1], np.inf], scale)
            for map_x, x0, x1 in first:
                for map_y, y0, y1 in second:
                    def grid_map(u, map_x=map_x, map_y=map_y):
                        (x, jx), (y, jy) = map_x(u[:, 0]), map_y(u[:, 1])
                        return foot + x[:, None] * e1 + y[:, None] * e2, jx * jy
                    maps.append(grid_map)
                    boxes.append((len(maps) - 1, [x0, y0], [x1, y1]))
            return maps, boxes
    if body.shape in ("cylinder", "ring") and abs(abs(body.axis @ n) - 1) < _SQUARE:
        e1 = body.rotation[:, 0] - (body.rotation[:, 0] @ n) * n
        radii = [body.inner_diameter / 2] if body.shape == "ring" else []
        radii.append(body.diameter / 2)
    else:
        e1 = rotation_from_axis(n)[:, 0]
        radii = [body.diameter / 2 if body.shape == "sphere" else body.bounding_radius]
    e1 = e1 / np.linalg.norm(e1)
    e2 = np.cross(n, e1)
    quarters = [(k * np.pi / 2, (k + 1) * np.pi / 2) for k in range(4)]
    for map_r, r0, r1 in _axis_pieces([0.0, *[r for r in radii if r > 0], np.inf], scale):
        def polar_map(u, map_r=map_r):
            (r, jr), phi = map_r(u[:, 0]), u[:, 1]
            return (foot + (r * np.cos(phi))[:, None] * e1 + (r * np.sin(phi))[:, None] * e2,
                    r * jr)
        maps.append(polar_map)
        boxes.extend((len(maps) - 1, [r0, a], [r1, b]) for a, b in quarters)
    return maps, boxes


@dataclass(frozen=True)
class PlateSaturation:
    """Outcome of :func:`plate_saturation_check`; all SI.

    Attributes
    ----------
    flux : float
        Flux the magnet drives into the steel, the positive part of B_n over the surface
        with the image included [Wb].
    cross_section : float
        Steel section the flux must pass through sideways, plate thickness times the
        crossing length [m^2].
    plate_flux_density : float
        flux / cross_section [T].
    saturation_flux_density : float
        Saturation of the steel [T].
    saturates : bool
        plate_flux_density > saturation_flux_density: the image force overstates the pull.
    thickness_to_carry_flux : float
        Thickness at which the plate would just carry the flux [m].
    """

    flux: float
    cross_section: float
    plate_flux_density: float
    saturation_flux_density: float
    saturates: bool
    thickness_to_carry_flux: float


def plate_saturation_check(body: MagnetBody, plane_point, plane_normal, thickness: float,
                           saturation_flux_density: float = LOW_CARBON_STEEL_SATURATION,
                           rtol: float = 1e-3) -> PlateSaturation:
    """Estimate whether a steel plate of ``thickness`` saturates under a magnet.

    Parameters
    ----------
    body : MagnetBody
        The magnet on the outer side of the plate surface.
    plane_point, plane_normal : array (3,)
        The plate surface, normal pointing toward the magnet.
    thickness : float
        Plate thickness [m].
    saturation_flux_density : float
        Saturation of the steel [T]; default low-carbon steel (2.0 T; pure iron 2.15 T).
    rtol : float
        Accuracy of the flux integral [-].

    Returns
    -------
    PlateSaturation

    Notes
    -----
    Flux into the plate Phi = integral over the whole surface of max(B_n, 0) dA, with B_n
    twice the magnet's own normal field (magnet plus image, mu_r -> infinity), integrated
    over boxes whose edges follow the footprint (:func:`plate_surface_patches`). That flux must
    turn and run inside the plate to where it leaves again, through a section of
    thickness t times a crossing length: the footprint perimeter (Cauchy's formula,
    integral of the half-width over in-plane directions) when the magnetization is mostly
    normal to the plate, else the footprint chord across the tangential magnetization.
    B_plate = Phi / (t * length). An order-of-magnitude estimate of the kind used in
    magnetic-circuit design; it does not replace a finite-element model.

    References
    ----------
    Furlani (2001), sec. 3.6 and ch. 4 (magnetic circuits); Jackson (1999), sec. 5.12.
    """
    n = np.asarray(plane_normal, dtype=float)
    n = n / np.linalg.norm(n)
    point = np.asarray(plane_point, dtype=float)
    frame = rotation_from_axis(n)
    height = float((body.center - point) @ n)
    foot = body.center - height * n
    field = _field_function(body)
    maps, boxes = plate_surface_patches(body, foot, n)

    def integrand(points, weight):
        normal_field = 2 * np.asarray(field(points)).reshape(-1, 3) @ n
        return (weight * np.maximum(normal_field, 0.0))[:, None]

    # max(B_n, 0) has a kink where B_n changes sign, where two Gauss orders can agree
    # while both are off: ask the estimator for ten times more
    flux = float(adaptive_box_integral(maps, boxes, integrand, lambda v: np.abs(v[..., 0]),
                                       rtol=rtol / 10, orders=(5, 7))[0])
    tangential = body.polarization - (body.polarization @ n) * n
    if np.linalg.norm(tangential) <= abs(body.polarization @ n):
        angles = np.linspace(0, 2 * np.pi, 256, endpoint=False)
        length = float(np.mean([extent_along(body, np.cos(a) * frame[:, 0] + np.sin(a) * frame[:, 1])
                                for a in angles]) * 2 * np.pi)
    else:
        across = np.cross(n, tangential)
        length = 2 * extent_along(body, across)
    section = thickness * length
    density = flux / section
    return PlateSaturation(flux, section, density, saturation_flux_density,
                           bool(density > saturation_flux_density),
                           flux / (saturation_flux_density * length))
