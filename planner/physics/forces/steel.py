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
    Flux into the plate Phi = integral over the surface of max(B_n, 0) dA, with B_n twice
    the magnet's own normal field (magnet plus image, mu_r -> infinity). That flux must
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
    half_width = 3 * (body.bounding_radius + max(height, 0.0))
    field = _field_function(body)

    def plane_map(u):
        return foot + u[:, :1] * frame[:, 0] + u[:, 1:] * frame[:, 1], np.ones(len(u))

    def integrand(points, weight):
        normal_field = 2 * np.asarray(field(points)).reshape(-1, 3) @ n
        return (weight * np.maximum(normal_field, 0.0))[:, None]

    boxes = [(0, [x0, y0], [x0 + half_width, y0 + half_width])
             for x0 in (-half_width, 0.0) for y0 in (-half_width, 0.0)]
    # max(B_n, 0) has a kink along the footprint edge, where two Gauss orders can agree
    # while both are off: ask the estimator for ten times more
    flux = float(adaptive_box_integral([plane_map], boxes, integrand,
                                       lambda v: np.abs(v[..., 0]), rtol=rtol / 10,
                                       orders=(5, 7))[0])
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
