"""Two magnets, or a magnet and flat steel, brought together by hand.

Definitions used by this project (the physics is in :mod:`planner.physics.forces`):

- snap distance: the largest gap at which the attraction exceeds a resisting force (static
  friction of a magnet lying on a bench, or the force a hand can control);
- clamp force: the attraction at a finger-thickness gap;
- released energy: W = U(snap distance) - U(finger gap), the work the attraction does
  between the two; impact speed v = sqrt(2 W / m_reduced);
- flip torque: the largest torque over orientation on a magnet held at a gap, the twist a
  magnet brought up the wrong way round gives the hand.

References
----------
Physics: Vokoun et al., J. Magn. Magn. Mater. 321, 3758 (2009); Akoun & Yonnet, IEEE
Trans. Magn. 20, 1962 (1984); Furlani, *Permanent Magnet and Electromechanical Devices*
(2001). Impact speed: conservation of energy and momentum for two free bodies (any
mechanics text, e.g. Goldstein, *Classical Mechanics*, 3rd ed. (2002), sec. 3.1).
"""
from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from planner.physics.constants import STANDARD_GRAVITY
from planner.physics.gauss import gauss_legendre
from planner.physics.bodies import MagnetBody, rotation_about, rotation_from_axis
from planner.physics.forces import (energy_between, extent_along, force_and_torque,
                                    force_between, place_at_gap,
                                    steel_surface_force_and_torque)
from planner.physics.handling.search import largest_exceeding
from planner.physics.roots import golden_section_maximum

#: Static friction coefficient of a plated magnet on a bench top [-]. Common practice
#: (typical of metal on wood or laminate, 0.2-0.5); not from a single source; override.
DEFAULT_STATIC_FRICTION = 0.3
#: Force a hand can hold steadily against a magnet's pull [N]. Common practice; not from a
#: single source; override with the site's figure.
DEFAULT_HAND_FORCE = 10.0
#: Finger thickness at which the clamp force is quoted [m]. Common practice; override.
DEFAULT_FINGER_GAP = 0.010


def bench_friction_force(mass: float, static_friction: float = DEFAULT_STATIC_FRICTION) -> float:
    """Static friction holding a magnet of ``mass`` on a level bench, mu_s m g [N].

    Parameters
    ----------
    mass : float
        [kg].
    static_friction : float
        Static friction coefficient [-] (common-practice default 0.3).

    Returns
    -------
    float
        [N].

    Notes
    -----
    Coulomb friction on a level surface; the magnet's pull on the other body is taken as
    horizontal (it adds no normal load).

    References
    ----------
    Goldstein, Classical Mechanics (2002), sec. 1.1 (Coulomb's friction law).

    Examples
    --------
    >>> round(bench_friction_force(0.1), 6)
    0.294199
    """
    return static_friction * mass * STANDARD_GRAVITY


def snap_distance(attraction, resisting_force: float, search_limit: float,
                  smallest_gap: float = 0.0) -> float:
    """Largest gap at which the attraction exceeds ``resisting_force`` [m].

    Parameters
    ----------
    attraction : callable
        ``attraction(gap [m]) -> force pulling the bodies together [N]``.
    resisting_force : float
        Friction on the bench (:func:`bench_friction_force`) or a hand's force [N].
    search_limit : float
        A gap beyond which the attraction is expected to be small [m] (doubled if not).
    smallest_gap : float
        The smallest gap considered [m].

    Returns
    -------
    float
        Snap distance [m]; 0 if the attraction never exceeds the resisting force.

    Notes
    -----
    Largest root of attraction(g) = resisting force, by a geometric scan and Brent's method
    (:func:`planner.physics.handling.search.largest_exceeding`).

    References
    ----------
    Definition of this project (module docstring); Brent (1973), ch. 4.

    Examples
    --------
    >>> round(snap_distance(lambda g: 1.0 / (0.01 + g) ** 2 * 1e-4, 0.25, 0.1), 6)
    0.01
    """
    # 24 geometric samples over four decades (a step of 1.47): the pull of two magnets or a magnet
    # and steel falls steadily with the gap, so the last crossing is found, then refined to 1 nm.
    return largest_exceeding(attraction, resisting_force, search_limit, smallest_gap, samples=24)


def clamp_force(attraction, finger_gap: float = DEFAULT_FINGER_GAP) -> float:
    """Attraction at a finger-thickness gap [N] (common-practice default gap 10 mm).

    Examples
    --------
    >>> clamp_force(lambda g: 2.0 - g, 0.01)
    1.99
    """
    return float(attraction(finger_gap))


def released_energy(attraction, from_gap: float, to_gap: float) -> float:
    """Work done by the attraction as the gap closes from ``from_gap`` to ``to_gap`` [J].

    Parameters
    ----------
    attraction : callable
        ``attraction(gap [m]) -> force pulling together [N]``.
    from_gap, to_gap : float
        [m]; from_gap > to_gap for closing.

    Returns
    -------
    float
        W = integral_to^from attraction dg = U(from_gap) - U(to_gap) [J]; 0 if from_gap <=
        to_gap.

    Notes
    -----
    The attraction is dU/dgap, so the integral equals the energy difference. Adaptive
    Gauss-Legendre quadrature in the logarithm of the gap (W = integral F(g) g d(ln g) for
    to_gap > 0: a force falling like a power of the gap is smooth there, 15-45 force
    evaluations for 1e-12 on the example setups): an interval is accepted when its 5- and
    10-point rules agree to 1e-6 of the whole integral, otherwise halved. Own code rather
    than QUADPACK: importing ``scipy.integrate`` cost a third of the program's start-up.

    References
    ----------
    Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 25.4.29 (Gauss-Legendre
    rule); Davis & Rabinowitz, Methods of Numerical Integration, 2nd ed. (1984), ch. 6
    (adaptive subdivision).

    Examples
    --------
    >>> round(released_energy(lambda g: 3.0, 0.02, 0.01), 12)
    0.03
    """
    if from_gap <= to_gap:
        return 0.0
    if to_gap > 0:
        return _adaptive_integral(lambda s: attraction(np.exp(s)) * np.exp(s), np.log(to_gap), np.log(from_gap))
    return _adaptive_integral(attraction, to_gap, from_gap)


_COARSE, _FINE = gauss_legendre(5), gauss_legendre(10)


def _adaptive_integral(function, low, high, rtol=1e-6, max_intervals=200):
    """Integral of a smooth scalar ``function`` over [low, high] (see :func:`released_energy`)."""
    def rule(a, b, nodes_weights):
        nodes, weights = nodes_weights
        half, middle = 0.5 * (b - a), 0.5 * (a + b)
        return half * sum(w * float(function(middle + half * x)) for x, w in zip(nodes, weights))

    pending = [(low, high)]
    accepted, whole = [], None
    while pending:
        a, b = pending.pop()
        fine = rule(a, b, _FINE)
        coarse = rule(a, b, _COARSE)
        if whole is None:
            whole = abs(fine)
        if abs(fine - coarse) <= rtol * whole or len(accepted) + len(pending) >= max_intervals:
            accepted.append(fine)
        else:
            middle = 0.5 * (a + b)
            pending += [(a, middle), (middle, b)]
    return float(sum(accepted))


def reduced_mass(mass_1: float, mass_2: float = np.inf) -> float:
    """m1 m2 / (m1 + m2) [kg]; ``mass_2 = inf`` for a body that does not move (steel).

    Examples
    --------
    >>> round(reduced_mass(0.2, 0.2), 12), reduced_mass(0.2)
    (0.1, 0.2)
    """
    if np.isinf(mass_2):
        return float(mass_1)
    return mass_1 * mass_2 / (mass_1 + mass_2)


def impact_speed(energy: float, mass_1: float, mass_2: float = np.inf) -> float:
    """Closing speed at impact, v = sqrt(2 W / m_reduced) [m/s].

    Notes
    -----
    Two free bodies starting at rest: momentum and energy conservation give the relative
    speed sqrt(2 W (m1 + m2) / (m1 m2)). Friction and the hand's work are left out, which
    overstates the speed (the safe side).

    References
    ----------
    Goldstein, Classical Mechanics (2002), sec. 3.1 (reduced mass).

    Examples
    --------
    >>> impact_speed(0.5, 0.25)
    2.0
    """
    return float(np.sqrt(2 * max(energy, 0.0) / reduced_mass(mass_1, mass_2)))


def pair_attraction(target: MagnetBody, source: MagnetBody, approach, rtol: float = 1e-3):
    """The callable gap -> attraction [N] of ``target`` moved along ``approach`` to ``source``.

    Notes
    -----
    attraction(g) = F(target at gap g) . u with :func:`planner.physics.forces.place_at_gap`.
    Values are remembered by gap: the snap searches for the bench and the hand scan the
    same gaps, and every search starts at contact, the dearest gap to integrate.
    """
    u = np.asarray(approach, dtype=float) / np.linalg.norm(approach)
    known: dict[float, float] = {}

    def attraction(gap):
        gap = float(gap)
        if gap not in known:
            known[gap] = float(force_between(place_at_gap(target, source, u, gap), source,
                                             rtol=rtol) @ u)
        return known[gap]
    return attraction


def attraction_to_steel(body: MagnetBody, plane_point, plane_normal, rtol: float = 1e-3):
    """The callable gap -> attraction [N] of ``body`` toward a large flat steel surface.

    Notes
    -----
    The body is moved along the surface normal, its orientation kept, so that the gap
    between it and the surface is g; the force is the image-method upper bound
    (:func:`planner.physics.forces.steel_surface_force_and_torque`).
    """
    n = np.asarray(plane_normal, dtype=float) / np.linalg.norm(plane_normal)
    point = np.asarray(plane_point, dtype=float)

    def attraction(gap):
        height = extent_along(body, n) + gap
        moved = replace(body, center=body.center + ((point @ n + height) - body.center @ n) * n)
        return float(-steel_surface_force_and_torque(moved, point, n, rtol=rtol)[0] @ n)
    return attraction


@dataclass(frozen=True)
class FlipTorque:
    """Largest torque on a magnet turned about an axis across the approach direction.

    Attributes
    ----------
    torque : float
        Largest |torque| about the turning axis [N m].
    angle : float
        Turn from the given orientation where it occurs [rad].
    axis : ndarray (3,)
        The turning axis [-].
    """

    torque: float
    angle: float
    axis: np.ndarray


def flip_torque(target: MagnetBody, source: MagnetBody, approach, gap: float,
                samples: int = 24, rtol: float = 1e-3) -> FlipTorque:
    """The torque that flips a magnet held at ``gap`` from ``source`` [N m].

    Parameters
    ----------
    target, source : MagnetBody
    approach : array (3,)
        Direction in which the target is brought toward the source [-].
    gap : float
        Gap along ``approach`` kept at every orientation [m].
    samples : int
        Angles on the first scan over a full turn.
    rtol : float
        Accuracy of each torque [-].

    Returns
    -------
    FlipTorque

    Notes
    -----
    The target is turned by theta about an axis w normal to the approach direction and to
    its polarization (any normal to the approach if the two are parallel), re-placed at the
    same gap, and T(theta) . w is evaluated about its centre; the largest |T . w| over a
    scan, refined by a golden-section search, is returned.

    References
    ----------
    Furlani (2001), sec. 3.4 (torque by the charge model); Kiefer, Proc. Am. Math. Soc. 4,
    502 (1953) (golden-section search).
    """
    u = np.asarray(approach, dtype=float) / np.linalg.norm(approach)
    axis = np.cross(u, target.polarization)
    if np.linalg.norm(axis) < 1e-9 * np.linalg.norm(target.polarization):
        axis = rotation_from_axis(u)[:, 0]
    axis = axis / np.linalg.norm(axis)

    def twist(theta):
        turn = rotation_about(axis, theta)
        turned = replace(target, rotation=turn @ target.rotation,
                         polarization=turn @ target.polarization)
        placed = place_at_gap(turned, source, u, gap)
        return float(force_and_torque(placed, source, rtol=rtol)[1] @ axis)

    angles = np.linspace(0, 2 * np.pi, samples, endpoint=False)
    values = np.abs([twist(a) for a in angles])
    best = int(np.argmax(values))
    step = angles[1] - angles[0]
    # the torque is flat at its largest value, T ~ T_max (1 - (theta - theta*)^2 / 2) for a
    # sinusoid-like T(theta): an angle within 5e-3 rad gives T_max to 1.3e-5, far inside rtol
    angle, largest = golden_section_maximum(lambda a: abs(twist(a)), angles[best] - step, angles[best] + step,
                                            xtol=1e-2)
    if largest > values[best]:
        return FlipTorque(float(largest), float(angle % (2 * np.pi)), axis)
    return FlipTorque(float(values[best]), float(angles[best]), axis)


@dataclass(frozen=True)
class HandlingFigures:
    """Handling figures of a pair (SI); see :func:`pair_handling`."""

    resisting_force: float
    snap_distance: float
    finger_gap: float
    clamp_force: float
    released_energy: float
    impact_speed: float
    flip_torque: float


def pair_handling(target: MagnetBody, source: MagnetBody, approach, target_mass: float,
                  source_mass: float = np.inf, resisting_force: float | None = None,
                  finger_gap: float = DEFAULT_FINGER_GAP,
                  static_friction: float = DEFAULT_STATIC_FRICTION,
                  rtol: float = 1e-3) -> HandlingFigures:
    """Snap distance, clamp force, released energy, impact speed and flip torque of a pair.

    Parameters
    ----------
    target, source : MagnetBody
        The magnet brought up, and the one it is brought to.
    approach : array (3,)
        Direction in which the target moves toward the source [-].
    target_mass, source_mass : float
        [kg]; ``source_mass = inf`` for a source that is held fixed.
    resisting_force : float, optional
        [N]; default the bench friction of the target, :func:`bench_friction_force`.
    finger_gap : float
        [m] (common-practice default 10 mm).
    static_friction : float
        Used when ``resisting_force`` is not given [-].
    rtol : float
        Accuracy of each force [-].

    Returns
    -------
    HandlingFigures

    Notes
    -----
    W = U(snap) - U(finger) from :func:`planner.physics.forces.energy_between`, 0 when
    the snap distance is inside the finger gap; v = sqrt(2 W / m_reduced); flip torque at
    the finger gap. The gap is measured along ``approach``
    (:func:`planner.physics.forces.place_at_gap`).

    References
    ----------
    As the module.
    """
    u = np.asarray(approach, dtype=float) / np.linalg.norm(approach)
    if resisting_force is None:
        resisting_force = bench_friction_force(target_mass, static_friction)
    attraction = pair_attraction(target, source, u, rtol)
    size = target.bounding_radius + source.bounding_radius
    snap = snap_distance(attraction, resisting_force, 10 * size)

    def energy(gap):
        return energy_between(place_at_gap(target, source, u, gap), source)
    work = energy(snap) - energy(finger_gap) if snap > finger_gap else 0.0
    return HandlingFigures(
        resisting_force=float(resisting_force), snap_distance=snap, finger_gap=finger_gap,
        clamp_force=clamp_force(attraction, finger_gap), released_energy=float(work),
        impact_speed=impact_speed(work, target_mass, source_mass),
        flip_torque=flip_torque(target, source, u, finger_gap, rtol=rtol).torque)
