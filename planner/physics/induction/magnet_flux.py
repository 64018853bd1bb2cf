"""Flux of a magnet through circles coaxial with its path, and the magnet's radial field.

Cylinders and rings magnetized along their axis are current sheets (``K = J / mu0``; a ring is
the outer sheet minus the inner one), so their flux is the closed form of :mod:`.sheets`.
A sphere is an exact dipole outside and has uniform ``B = 2J/3`` inside. A magnetization
component across the path adds no flux through a coaxial circle: turning the magnet half a
turn about the path reverses it but leaves the circle unchanged, so its share is zero.
Blocks, or paths off the axis, use :func:`flux_from_bodies`, which integrates ``B`` from
``planner.physics.fields`` over the disc.

References
----------
Derby & Olbert, Am. J. Phys. 78, 229-235 (2010); J. D. Jackson, Classical Electrodynamics,
3rd ed., section 5.10 (1999) (uniformly magnetized sphere).
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from planner.physics.constants import mu_0
from planner.physics.gauss import gauss_panels
from planner.physics.bodies import rotation_from_axis

from .sheets import sheet_flux, sheet_radial_field

_ALIGNMENT_TOLERANCE = 1e-6


class AxialMagnet(NamedTuple):
    """A magnet seen from a path along its symmetry axis, in plain numbers.

    Attributes
    ----------
    shape : str
        ``"cylinder"``, ``"ring"`` or ``"sphere"``.
    outer_radius : float
        Outer radius (sphere radius) [m].
    inner_radius : float
        Bore radius of a ring, else 0 [m].
    length : float
        Length along the path (sphere: diameter) [m].
    polarization : float
        Component of J along the path direction [T].
    """

    shape: str
    outer_radius: float
    inner_radius: float
    length: float
    polarization: float

    @property
    def moment(self) -> float:
        """Dipole moment along the path, ``J V / mu0`` [A m^2]."""
        if self.shape == "sphere":
            volume = 4.0 / 3.0 * np.pi * self.outer_radius**3
        else:
            volume = np.pi * (self.outer_radius**2 - self.inner_radius**2) * self.length
        return self.polarization * volume / mu_0


def axial_magnet(body, direction=None) -> AxialMagnet:
    """Describe a :class:`~planner.physics.bodies.MagnetBody` for a path along ``direction``.

    Parameters
    ----------
    body : MagnetBody
        Cylinder, ring or sphere.
    direction : array (3,), optional
        Unit vector of the path (the coil axis) in the global frame; default the body axis.

    Raises
    ------
    ValueError
        For blocks, or cylinders and rings whose axis is not along ``direction``: use
        :func:`flux_from_bodies` for those.
    """
    direction = body.axis if direction is None else np.asarray(direction, dtype=float)
    direction = direction / np.linalg.norm(direction)
    polarization = float(body.polarization @ direction)
    if body.shape == "sphere":
        radius = body.diameter / 2.0
        return AxialMagnet("sphere", radius, 0.0, 2.0 * radius, polarization)
    if body.shape not in ("cylinder", "ring"):
        raise ValueError(f"a {body.shape} has no closed-form flux; use flux_from_bodies")
    if np.linalg.norm(np.cross(body.axis, direction)) > _ALIGNMENT_TOLERANCE:
        raise ValueError("the magnet's axis is not along the path; use flux_from_bodies")
    inner = body.inner_diameter / 2.0 if body.shape == "ring" else 0.0
    return AxialMagnet(body.shape, body.diameter / 2.0, inner, body.height, polarization)


def dipole_loop_flux(moment, loop_radius, distance):
    """Flux of an axial point dipole through a coaxial circle [Wb].

    Notes
    -----
    ``Phi = mu0 m a^2 / (2 (a^2 + z^2)^(3/2))``: the dipole's ``A_phi = mu0 m rho / (4 pi r^3)``
    times ``2 pi a``.

    References
    ----------
    Jackson, Classical Electrodynamics, 3rd ed., eq. 5.55 (1999).

    >>> from planner.physics.constants import mu_0
    >>> round(float(dipole_loop_flux(1.0, 0.01, 0.0) / (mu_0 / 0.02)), 12)
    1.0
    """
    a = np.asarray(loop_radius, dtype=float)
    z = np.asarray(distance, dtype=float)
    return mu_0 * moment * a**2 / (2.0 * (a**2 + z**2) ** 1.5)


def loop_flux(magnet: AxialMagnet, loop_radius, axial_offset):
    """Flux of a magnet through a circle coaxial with its path [Wb].

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet (see :func:`axial_magnet`).
    loop_radius : float or array
        Radius of the circle [m].
    axial_offset : float or array
        Position of the circle's plane minus the magnet's centre, along the path [m].

    Notes
    -----
    Exact for uniform magnetization (recoil permeability 1): cylinder and ring by the sheet
    closed form, sphere by its exact outside dipole field and uniform inside field
    ``Phi = 2 pi J rho^2 / 3`` when the circle lies inside the sphere.

    References
    ----------
    Derby & Olbert, Am. J. Phys. 78, 229 (2010); Jackson, 3rd ed., 5.10 (1999).
    """
    rho = np.asarray(loop_radius, dtype=float)
    z = np.asarray(axial_offset, dtype=float)
    if magnet.shape == "sphere":
        r = np.sqrt(rho**2 + z**2)
        inside = 2.0 * np.pi * magnet.polarization * rho**2 / 3.0
        return np.where(r < magnet.outer_radius, inside, dipole_loop_flux(magnet.moment, rho, z))
    return _outer_minus_bore(sheet_flux, magnet, rho, z)


def radial_field(magnet: AxialMagnet, radius, axial_offset):
    """Radial flux density ``B_rho`` of a magnet at a point [T].

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet.
    radius : float or array
        Distance of the point from the path axis [m].
    axial_offset : float or array
        Axial position of the point minus the magnet's centre [m].

    Notes
    -----
    Sheet closed form for cylinders and rings (module :mod:`.sheets`); for a sphere the
    outside dipole ``3 mu0 m rho z / (4 pi r^5)`` and zero inside.

    References
    ----------
    Derby & Olbert, Am. J. Phys. 78, 229 (2010).
    """
    rho = np.asarray(radius, dtype=float)
    z = np.asarray(axial_offset, dtype=float)
    if magnet.shape == "sphere":
        r = np.sqrt(rho**2 + z**2)
        with np.errstate(divide="ignore", invalid="ignore"):
            outside = 3.0 * mu_0 * magnet.moment * rho * z / (4.0 * np.pi * r**5)
        return np.where(r < magnet.outer_radius, 0.0, outside)
    return _outer_minus_bore(sheet_radial_field, magnet, rho, z)


def _outer_minus_bore(sheet_function, magnet: AxialMagnet, rho, z):
    """A cylinder's or ring's quantity as its outer current sheet minus its bore's (superposition).

    ``sheet_function(sheet_radius, radius, start, end, surface_current)`` is
    :func:`.sheets.sheet_flux` or :func:`.sheets.sheet_radial_field`; the surface current of
    a uniformly magnetized body is J / mu0 (Derby & Olbert 2010).
    """
    surface_current = magnet.polarization / mu_0
    start, end = -magnet.length / 2.0 - z, magnet.length / 2.0 - z
    value = sheet_function(magnet.outer_radius, rho, start, end, surface_current)
    if magnet.inner_radius > 0.0:
        value = value - sheet_function(magnet.inner_radius, rho, start, end, surface_current)
    return value


def flux_from_field(field, center, normal, radius, radial_nodes=16, angular_nodes=32,
                    radial_breaks=()):
    """Flux of any field through a disc, by quadrature [Wb].

    Parameters
    ----------
    field : callable
        ``field(points)`` with points (n, 3) [m] returning B (n, 3) [T].
    center : array (3,)
        Centre of the disc [m].
    normal : array (3,)
        Normal of the disc (sets the sign of the flux) [-].
    radius : float
        Radius of the disc [m].
    radial_nodes, angular_nodes : int
        Gauss-Legendre nodes in radius (per panel), trapezoid nodes in angle [-].
    radial_breaks : sequence of float
        Radii where the field jumps (where the disc cuts a magnet's side) [m]; the radial
        rule is split there.

    Notes
    -----
    ``Phi = int_0^a int_0^2pi B.n r dphi dr``. The trapezoid rule is spectrally accurate in the
    periodic angle. Inside a magnet B jumps at its surface: where the disc cuts a magnet,
    give the jump radii as ``radial_breaks`` (coaxial bodies), or expect the error to fall
    only slowly with the node counts.

    References
    ----------
    Abramowitz & Stegun, 25.4.29-30 (1964) (Gauss-Legendre and periodic trapezoid rules).
    """
    first, second, normal = rotation_from_axis(normal).T  # an orthonormal frame with the disc's normal
    r, weight_r = gauss_panels(np.unique(np.clip([0.0, radius, *radial_breaks], 0.0, radius)), radial_nodes)
    weight_r = weight_r * r
    radial_nodes = len(r)
    phi = 2.0 * np.pi * np.arange(angular_nodes) / angular_nodes
    directions = np.outer(np.cos(phi), first) + np.outer(np.sin(phi), second)
    points = np.asarray(center, dtype=float) + r[:, None, None] * directions[None, :, :]
    b = np.asarray(field(points.reshape(-1, 3))).reshape(radial_nodes, angular_nodes, 3)
    return float(np.sum(weight_r[:, None] * (b @ normal)) * 2.0 * np.pi / angular_nodes)


def flux_from_bodies(bodies, center, normal, radius, radial_nodes=16, angular_nodes=32,
                     radial_breaks=()):
    """Flux of a set of magnets of any shape and place through a disc [Wb].

    Uses ``planner.physics.fields.field_of_bodies`` and :func:`flux_from_field`; see there.

    References
    ----------
    As :func:`flux_from_field`; fields as in ``planner.physics.fields``.
    """
    from planner.physics.fields import field_of_bodies

    return flux_from_field(lambda points: field_of_bodies(bodies, points), center, normal,
                           radius, radial_nodes, angular_nodes, radial_breaks)
