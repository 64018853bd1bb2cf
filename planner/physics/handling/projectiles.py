"""Loose soft-steel items near a magnet: pull along a line, slide-off, lift and gradient distances.

References
----------
J. F. Schenck, "Safety of strong, static magnetic fields", J. Magn. Reson. Imaging 12,
2-19 (2000): force on soft ferromagnetic objects, unsaturated and saturated, and the
gradient at which a saturated object's pull equals its weight.
ASTM F2052, Standard Test Method for Measurement of Magnetically Induced Displacement Force
on Medical Devices in the Magnetic Resonance Environment: "magnetic force equals weight"
(45 degree deflection) as the reference point.
J. A. Osborn, "Demagnetizing factors of the general ellipsoid", Phys. Rev. 67, 351-357
(1945); NIST Digital Library of Mathematical Functions, sec. 19.33 (the same factors as
Carlson's symmetric integral R_D).
B. D. Cullity and C. D. Graham, *Introduction to Magnetic Materials*, 2nd ed., Wiley (2009),
table 4.2: saturation magnetization of iron 1714 emu/cm^3 = 1.71 MA/m at room temperature.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.constants import mu_0, STANDARD_GRAVITY
from planner.physics.forces import extent_along
from planner.physics.fields.elliptic import carlson_rd
from planner.physics.handling.pinch import DEFAULT_STATIC_FRICTION
from planner.physics.handling.search import largest_exceeding

#: Saturation magnetization of iron at room temperature [A/m] (Cullity & Graham 2009).
IRON_SATURATION_MAGNETIZATION = 1.71e6
#: Density of carbon steel [kg/m^3] (ASM Handbook vol. 1; physics reference sheet sec. 7).
STEEL_DENSITY = 7850.0


@dataclass(frozen=True)
class SteelItem:
    """A loose soft-steel item reduced to what its pull depends on (SI).

    Attributes
    ----------
    volume : float
        [m^3].
    mass : float
        [kg].
    effective_susceptibility : float
        chi_eff = 1/N along the field, N the demagnetizing factor [-].
    saturation_magnetization : float
        [A/m].
    """

    volume: float
    mass: float
    effective_susceptibility: float
    saturation_magnetization: float = IRON_SATURATION_MAGNETIZATION


def demagnetizing_factor(semi_axis_along: float, semi_axis_2: float, semi_axis_3: float) -> float:
    """Demagnetizing factor of an ellipsoid along one of its axes [-].

    Parameters
    ----------
    semi_axis_along : float
        Semi-axis along the field [m].
    semi_axis_2, semi_axis_3 : float
        The other two semi-axes [m].

    Returns
    -------
    float
        N in [0, 1]; the three factors of one ellipsoid add up to 1.

    Notes
    -----
    N_a = (a b c / 2) integral_0^inf dt / ((t + a^2)^(3/2) (t + b^2)^(1/2) (t + c^2)^(1/2))
    = (a b c / 3) R_D(b^2, c^2, a^2) (Osborn 1945; DLMF 19.33). Sphere: 1/3.

    References
    ----------
    Osborn, Phys. Rev. 67, 351-357 (1945); DLMF sec. 19.33.

    Examples
    --------
    >>> round(demagnetizing_factor(1.0, 1.0, 1.0), 12)
    0.333333333333
    """
    a, b, c = semi_axis_along, semi_axis_2, semi_axis_3
    return float(a * b * c / 3 * carlson_rd(b * b, c * c, a * a))


def steel_sphere(diameter: float, density: float = STEEL_DENSITY,
                 saturation_magnetization: float = IRON_SATURATION_MAGNETIZATION) -> SteelItem:
    """A steel ball (or a compact item such as a nut) of ``diameter`` [m]; chi_eff = 3.

    Examples
    --------
    >>> steel_sphere(0.01).effective_susceptibility
    3.0
    """
    volume = np.pi * diameter**3 / 6
    return SteelItem(volume, density * volume, 3.0, saturation_magnetization)


def steel_rod(length: float, diameter: float, density: float = STEEL_DENSITY,
              saturation_magnetization: float = IRON_SATURATION_MAGNETIZATION) -> SteelItem:
    """A rod-like item (screwdriver, pin) aligned with the field; N of the inscribed spheroid.

    Notes
    -----
    Volume of the cylinder pi D^2 L / 4; chi_eff = 1/N with N of the prolate spheroid of
    semi-axes L/2, D/2, D/2 (Osborn 1945), the usual approximation for a rod.
    """
    volume = np.pi * diameter**2 / 4 * length
    factor = demagnetizing_factor(length / 2, diameter / 2, diameter / 2)
    return SteelItem(volume, density * volume, 1 / factor, saturation_magnetization)


def steel_plate(length: float, width: float, thickness: float, density: float = STEEL_DENSITY,
                saturation_magnetization: float = IRON_SATURATION_MAGNETIZATION) -> SteelItem:
    """A flat item (ruler, bracket) with its length along the field; N of the inscribed ellipsoid.

    Notes
    -----
    Volume L W t; chi_eff = 1/N with N of the ellipsoid of semi-axes L/2, W/2, t/2 along
    L (Osborn 1945).
    """
    volume = length * width * thickness
    factor = demagnetizing_factor(length / 2, width / 2, thickness / 2)
    return SteelItem(volume, density * volume, 1 / factor, saturation_magnetization)


def surface_point(body: MagnetBody, direction) -> np.ndarray:
    """The point where the line from the centre of ``body`` along ``direction`` leaves its extent.

    Examples
    --------
    >>> b = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.0], diameter=0.02)
    >>> surface_point(b, [0, 0, 2]).tolist()
    [0.0, 0.0, 0.01]
    """
    u = np.asarray(direction, dtype=float) / np.linalg.norm(direction)
    return body.center + extent_along(body, u) * u


def _as_field(field):
    if callable(field):
        return field
    from planner.physics.fields import field_of_bodies

    bodies = [field] if isinstance(field, MagnetBody) else list(field)
    return lambda points: field_of_bodies(bodies, points)


def projectile_attraction(field, origin, direction, distances, item: SteelItem) -> np.ndarray:
    """Pull on a steel item toward the magnet along a line [N].

    Parameters
    ----------
    field : callable, MagnetBody or list of MagnetBody
        ``field(points (n, 3)) -> B (n, 3) [T]``, or the bodies that make it.
    origin : array (3,)
        Start of the line, e.g. :func:`surface_point` of the magnet [m].
    direction : array (3,)
        Outward direction of the line [-].
    distances : float or array (n,)
        Distances s >= 0 from ``origin`` [m].
    item : SteelItem

    Returns
    -------
    ndarray (n,)
        Force toward the origin [N]; positive is a pull toward the magnet.

    Notes
    -----
    F = V min(chi_eff |B| / mu0, Ms) (-d|B|/ds): the unsaturated induced moment
    (chi_eff V / mu0) B gives (chi_eff V / mu0) B dB/ds, the saturated one Ms V gives
    Ms V d|B|/ds, and the smaller induced moment applies (Schenck 2000). The item is taken
    aligned with the field (the worst case); d|B|/ds by second-order finite differences.

    References
    ----------
    Schenck, J. Magn. Reson. Imaging 12, 2-19 (2000).
    """
    field = _as_field(field)
    u = np.asarray(direction, dtype=float) / np.linalg.norm(direction)
    origin = np.asarray(origin, dtype=float)
    s = np.atleast_1d(np.asarray(distances, dtype=float))
    step = 1e-4 * np.maximum(s, 1e-3)
    central = s >= step
    stencil = np.where(central[:, None], s[:, None] + step[:, None] * [-1.0, 0.0, 1.0],
                       s[:, None] + step[:, None] * [0.0, 1.0, 2.0])
    points = origin + stencil.reshape(-1, 1) * u
    magnitude = np.linalg.norm(np.asarray(field(points)).reshape(-1, 3), axis=1).reshape(-1, 3)
    slope = np.where(central, (magnitude[:, 2] - magnitude[:, 0]) / (2 * step),
                     (-3 * magnitude[:, 0] + 4 * magnitude[:, 1] - magnitude[:, 2]) / (2 * step))
    here = np.where(central, magnitude[:, 1], magnitude[:, 0])
    moment_density = np.minimum(item.effective_susceptibility * here / mu_0,
                                item.saturation_magnetization)
    return item.volume * moment_density * (-slope)


def _line_function(field, origin, direction, item):
    """The pull along the line as a function of an array of distances (one field call)."""
    field = _as_field(field)
    return lambda s: projectile_attraction(field, origin, direction, s, item)


def pull_off_distance(field, origin, direction, item: SteelItem,
                      static_friction: float = DEFAULT_STATIC_FRICTION,
                      search_limit: float = 0.5) -> float:
    """Largest distance at which the pull exceeds the item's bench friction mu m g [m].

    Notes
    -----
    Largest s with :func:`projectile_attraction` > mu_s m g (common-practice mu_s = 0.3).

    References
    ----------
    Schenck (2000); ASTM F2052.
    """
    level = static_friction * item.mass * STANDARD_GRAVITY
    return largest_exceeding(_line_function(field, origin, direction, item), level, search_limit,
                             vectorized=True)


def lift_distance(field, origin, direction, item: SteelItem, search_limit: float = 0.5) -> float:
    """Largest distance at which the pull exceeds the item's weight m g [m].

    Notes
    -----
    Magnetic force equal to weight is the ASTM F2052 reference point (45 degree
    deflection of a hanging item).

    References
    ----------
    ASTM F2052; Schenck (2000).
    """
    level = item.mass * STANDARD_GRAVITY
    return largest_exceeding(_line_function(field, origin, direction, item), level, search_limit,
                             vectorized=True)


def gradient_distance(field, origin, direction, threshold: float | None = None,
                      search_limit: float = 0.5) -> float:
    """Largest distance at which -d|B|/ds exceeds ``threshold`` [m].

    Parameters
    ----------
    field, origin, direction
        As :func:`projectile_attraction`.
    threshold : float, optional
        [T/m]; default rho g / Ms for steel and iron saturation, about 0.045 T/m.
    search_limit : float
        [m].

    Notes
    -----
    A saturated item's pull Ms V d|B|/ds bounds the pull of any soft-iron item of that
    volume, so where the gradient exceeds rho g / Ms an elongated steel item can lift off
    (Schenck 2000).

    References
    ----------
    Schenck, J. Magn. Reson. Imaging 12, 2-19 (2000).
    """
    if threshold is None:
        threshold = STEEL_DENSITY * STANDARD_GRAVITY / IRON_SATURATION_MAGNETIZATION
    saturated = SteelItem(1.0, 0.0, np.inf, 1.0)  # pull = -d|B|/ds exactly
    return largest_exceeding(_line_function(field, origin, direction, saturated), threshold,
                             search_limit, vectorized=True)
