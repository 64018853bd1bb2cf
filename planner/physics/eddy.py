"""Eddy-current braking: a magnet falling through a conducting tube, a magnet moving over a sheet.

Low-speed method [D]. When the field of the eddy currents is small against the magnet's
(induction number ``mu0 sigma v L << 1``), a conductor moving at ``v`` through the magnet's
static field carries ``j = sigma (v x B - grad V)``. For the axisymmetric cases here no charge
builds up (``V = 0``), so the drag is the dissipated power over the speed,

    F = sigma v int |e|^2 dV,   e = (v x B)/v in the tube,  e = dA/dx over a sheet.

Tube (axis z): ``|e| = B_rho``, so ``k = F / v = 2 pi sigma int_b^c rho int B_rho^2 dz drho``.
For a point dipole ``int B_rho^2 dz = (mu0 m / 4 pi)^2 45 pi / (128 rho^5)`` (a Beta integral),
which gives ``k = (15 mu0^2 m^2 sigma / 1024)(1/b^3 - 1/c^3)`` and, for a thin wall w,
``k = 45 mu0^2 m^2 sigma w / (1024 b^4)``: the formulas of MacLatchy et al. (1993), here
re-derived. The same ``k`` follows from Maxwell's M between the magnet's current sheet and
each ring of the tube, since a ring's EMF is ``v dPhi/dz = 2 pi rho v B_rho``.

Sheet (vertical-axis magnet at height h, sheet moving along x): ``A = A_phi(rho, z) phi_hat``
has no vertical part, so ``e = dA/dx`` is divergence-free with no normal component: ``V = 0``.
Averaged over the azimuth, ``|dA/dx|^2 = ((dA_phi/drho)^2 + (A_phi/rho)^2) / 2``. For a dipole
this integrates to ``F = 3 mu0^2 m^2 sigma d v / (128 pi h^4)`` (thin) and
``mu0^2 m^2 sigma v (1/h^3 - 1/(h+t)^3) / (128 pi)`` (thick), the low-speed limit of Reitz's
thin-sheet result.

References
----------
C. S. MacLatchy, P. Backman & L. Bogan, Am. J. Phys. 61, 1096-1101 (1993).
Y. Levin, F. L. da Silveira & F. B. Rizzato, Am. J. Phys. 74, 815-817 (2006).
J. Iniguez, V. Raposo, A. Hernandez-Lopez, A. G. Flores & M. Zazo, Eur. J. Phys. 25,
593-604 (2004) (copper tube experiment).
M. H. Partovi & E. J. Morris, Can. J. Phys. 84, 253-271 (2006) (beyond low speed).
J. R. Reitz, J. Appl. Phys. 41, 2067-2071 (1970); W. M. Saslow, Am. J. Phys. 60, 693-711 (1992).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from planner.physics.constants import mu_0, STANDARD_GRAVITY as standard_gravity
from planner.physics.gauss import gauss_panels
from planner.physics.induction.magnet_flux import AxialMagnet, loop_flux, radial_field
from planner.physics.roots import bracketed_root

_LOW_SPEED_LIMIT = 0.1
_GRADING = np.array([0.03, 0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0, 300.0, 1000.0])


def dipole_tube_drag_constant(moment, inner_radius, outer_radius, conductivity):
    """Drag constant of a point dipole on the axis of a thick tube [kg/s].

    Notes
    -----
    ``k = (15 mu0^2 m^2 sigma / 1024)(1/b^3 - 1/c^3)``; low speed, long tube, magnet far from
    the ends. Re-derived in the module notes [D].

    References
    ----------
    MacLatchy, Backman & Bogan, Am. J. Phys. 61, 1096 (1993).
    """
    return 15.0 * mu_0**2 * moment**2 * conductivity / 1024.0 * (
        inner_radius**-3.0 - outer_radius**-3.0)


def thin_tube_drag_constant(moment, radius, wall, conductivity):
    """Drag constant of a point dipole in a thin-walled tube, ``45 mu0^2 m^2 sigma w/(1024 b^4)`` [kg/s].

    References
    ----------
    MacLatchy, Backman & Bogan, Am. J. Phys. 61, 1096 (1993); module notes [D].
    """
    return 45.0 * mu_0**2 * moment**2 * conductivity * wall / (1024.0 * radius**4)


def tube_drag_constant(magnet: AxialMagnet, inner_radius, outer_radius, conductivity, nodes=8):
    """Drag constant ``k = F / v`` of a finite magnet on the axis of a thick tube [kg/s].

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet, its axis along the tube.
    inner_radius, outer_radius : float
        Tube radii b and c [m].
    conductivity : float
        [S/m].
    nodes : int
        Gauss-Legendre nodes per panel [-].

    Notes
    -----
    ``k = 4 pi sigma int_b^c rho int_0^inf B_rho^2 dz drho`` with the exact radial field of
    the finite magnet; panels are graded towards the bore and the magnet's face planes,
    where ``B_rho`` peaks. Low speed (see :func:`tube_fall`), long tube.

    References
    ----------
    Module notes [D]; dipole limit MacLatchy et al., Am. J. Phys. 61, 1096 (1993).
    """
    if magnet.polarization == 0.0 or conductivity == 0.0:
        return 0.0
    gap = max(inner_radius - magnet.outer_radius, 1e-3 * inner_radius)
    rho, w_rho = gauss_panels(np.unique(np.append(
        np.clip(inner_radius + gap * _GRADING, inner_radius, outer_radius), [inner_radius, outer_radius])), nodes)
    face = magnet.length / 2.0
    far = face + 60.0 * outer_radius
    z_breaks = np.concatenate([[0.0, face, far], face + gap * _GRADING, face - gap * _GRADING,
                               face + outer_radius * np.geomspace(1, 60, 8)])
    z, w_z = gauss_panels(np.unique(np.clip(z_breaks, 0.0, far)), nodes)
    b_rho = radial_field(magnet, rho[:, None], z[None, :])
    return float(4.0 * np.pi * conductivity * np.sum(w_rho * rho * ((b_rho**2) @ w_z)))


def fall_distance(time, mass, drag_constant, entry_speed=0.0, gravity=standard_gravity):
    """Distance fallen under gravity and linear drag ``F = k v`` [m].

    Notes
    -----
    ``s(t) = v_t t + (v0 - v_t) tau (1 - exp(-t/tau))`` with ``tau = M/k``, ``v_t = g tau``,
    from ``M dv/dt = M g - k v``; written with ``expm1`` so that ``k -> 0`` gives free fall.

    References
    ----------
    Newton's second law with linear drag; e.g. Taylor, Classical Mechanics, 2.2 (2005).
    """
    t = np.asarray(time, dtype=float)
    if drag_constant <= 0.0:
        return entry_speed * t + gravity * t**2 / 2.0
    tau = mass / drag_constant
    x = t / tau
    small = x < 1e-3
    xs = np.where(small, x, 0.0)
    rest = np.where(small, xs**2 / 2 - xs**3 / 6 + xs**4 / 24, x + np.expm1(-x))
    return entry_speed * tau * -np.expm1(-x) + gravity * tau**2 * rest


@dataclass(frozen=True)
class TubeFall:
    """Figures of a magnet falling through a conducting tube.

    Attributes
    ----------
    drag_constant : float
        ``k`` [kg/s].
    terminal_speed : float
        ``M g / k`` [m/s] (inf without drag).
    time_constant : float
        ``M / k`` [s].
    fall_time : float
        Time to pass the tube's length, acceleration phase included [s].
    free_fall_time : float
        The same without drag [s].
    exit_speed : float
        Speed leaving the tube [m/s].
    radial_clearance : float
        Bore radius minus magnet radius [m].
    induction_number : float
        ``mu0 sigma v_t b`` [-]; the low-speed model needs it small.
    low_speed_valid : bool
        True when the induction number is below 0.1.
    """

    drag_constant: float
    terminal_speed: float
    time_constant: float
    fall_time: float
    free_fall_time: float
    exit_speed: float
    radial_clearance: float
    induction_number: float
    low_speed_valid: bool


def tube_fall(magnet: AxialMagnet, mass, tube_length, inner_radius, outer_radius, conductivity,
              entry_speed=0.0, gravity=standard_gravity) -> TubeFall:
    """Terminal speed, time constant and fall time of a magnet dropped through a tube.

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet (polarization 0 for a non-magnetic slug).
    mass : float
        Mass of the magnet [kg].
    tube_length : float
        [m]
    inner_radius, outer_radius : float
        Tube radii [m].
    conductivity : float
        [S/m].
    entry_speed : float
        Speed entering the tube [m/s].
    gravity : float
        [m/s^2].

    Notes
    -----
    ``v(t) = v_t + (v0 - v_t) exp(-t/tau)``; the fall time solves ``s(t) = tube_length``
    (:func:`fall_distance`). The drag is taken at its value deep in the tube; near the ends it
    is lower, which shortens the fall by roughly the time to cross a few bore radii. The
    low-speed model overstates the drag when ``mu0 sigma v b`` is not small.

    References
    ----------
    MacLatchy et al. (1993); Iniguez et al., Eur. J. Phys. 25, 593 (2004);
    Partovi & Morris, Can. J. Phys. 84, 253 (2006).
    """
    clearance = inner_radius - magnet.outer_radius
    if clearance <= 0.0:
        raise ValueError("the magnet does not fit in the tube's bore")
    k = tube_drag_constant(magnet, inner_radius, outer_radius, conductivity)
    free = (np.sqrt(entry_speed**2 + 2.0 * gravity * tube_length) - entry_speed) / gravity
    if k <= 0.0:
        return TubeFall(0.0, float("inf"), float("inf"), float(free), float(free),
                        float(entry_speed + gravity * free), clearance, 0.0, True)
    tau = mass / k
    terminal = gravity * tau
    upper = tube_length / terminal + 2.0 * tau
    time = bracketed_root(lambda t: fall_distance(t, mass, k, entry_speed, gravity) - tube_length,
                          0.0, max(upper, free), xtol=1e-12, rtol=1e-12)
    exit_speed = terminal + (entry_speed - terminal) * np.exp(-time / tau)
    number = mu_0 * conductivity * terminal * inner_radius
    return TubeFall(k, terminal, tau, float(time), float(free), float(exit_speed), clearance,
                    number, bool(number < _LOW_SPEED_LIMIT))


def sheet_characteristic_speed(conductivity, thickness):
    """Characteristic speed of a thin conducting sheet, ``w = 2 / (mu0 sigma d)`` [m/s].

    References
    ----------
    Reitz, J. Appl. Phys. 41, 2067 (1970); Saslow, Am. J. Phys. 60, 693 (1992).

    >>> round(sheet_characteristic_speed(58e6, 1e-3), 2)
    27.44
    """
    return 2.0 / (mu_0 * conductivity * thickness)


def dipole_sheet_drag(moment, height, conductivity, thickness, speed):
    """Low-speed drag on a vertical dipole above a thin sheet [N].

    Notes
    -----
    ``F = 3 mu0^2 m^2 sigma d v / (128 pi h^4)`` for ``v << w``, ``d << h`` (module notes [D]).

    References
    ----------
    Reitz (1970) low-speed limit; Saslow, Am. J. Phys. 60, 693 (1992).
    """
    return 3.0 * mu_0**2 * moment**2 * conductivity * thickness * speed / (128.0 * np.pi * height**4)


def dipole_plate_drag(moment, height, conductivity, thickness, speed):
    """Low-speed drag on a vertical dipole above a plate of any thickness [N].

    Notes
    -----
    ``F = mu0^2 m^2 sigma v (1/h^3 - 1/(h + t)^3) / (128 pi)``: the thin-sheet result summed over
    depth (module notes [D]); skin effect neglected (low speed).

    References
    ----------
    Module notes [D]; thin limit as :func:`dipole_sheet_drag`.
    """
    return mu_0**2 * moment**2 * conductivity * speed * (
        height**-3.0 - (height + thickness) ** -3.0) / (128.0 * np.pi)


def reitz_sheet_forces(moment, height, conductivity, thickness, speed):
    """Drag and lift on a vertical dipole moving over a thin sheet at any speed: ``(drag, lift)`` [N].

    Notes
    -----
    ``F_lift = F_image [1 - w / sqrt(v^2 + w^2)]``, ``F_drag = (w / v) F_lift`` with the image
    force ``F_image = 3 mu0 m^2 / (32 pi h^4)`` and ``w`` from
    :func:`sheet_characteristic_speed`. Thin sheet (``d`` small against ``h``). Recalled [M];
    its low-speed limit equals :func:`dipole_sheet_drag`, which is derived independently.

    References
    ----------
    Reitz, J. Appl. Phys. 41, 2067 (1970); Saslow, Am. J. Phys. 60, 693 (1992).
    """
    w = sheet_characteristic_speed(conductivity, thickness)
    image = 3.0 * mu_0 * moment**2 / (32.0 * np.pi * height**4)
    lift = image * (1.0 - w / np.hypot(speed, w))
    drag = image * w * (np.hypot(speed, w) - w) / (speed * np.hypot(speed, w)) if speed else 0.0
    return float(drag), float(lift)


def sheet_drag(magnet: AxialMagnet, height, conductivity, thickness, speed, nodes=8):
    """Low-speed drag on a finite magnet, axis vertical, moving over a conducting plate [N].

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet; its path direction is vertical.
    height : float
        From the magnet's centre down to the plate's top surface [m].
    conductivity : float
        [S/m].
    thickness : float
        Plate thickness [m].
    speed : float
        Horizontal speed [m/s].

    Notes
    -----
    ``F = pi sigma v int int ((dA_phi/drho)^2 + (A_phi/rho)^2) rho drho dz`` over the plate,
    ``A_phi = Phi / (2 pi rho)`` from the closed-form flux, ``dA_phi/drho`` by a central
    difference. Infinite plate, low speed (module notes [D]).

    References
    ----------
    Module notes [D]; dipole limit Reitz (1970), Saslow (1992).
    """
    if magnet.polarization == 0.0:
        return 0.0
    size = max(magnet.outer_radius, magnet.length / 2.0)
    depth = height + thickness
    rho, w_rho = gauss_panels(np.unique(np.concatenate([[0.0], height * _GRADING, size * _GRADING[:6],
                                                        [1000.0 * depth]])), nodes)
    z, w_z = gauss_panels(np.unique(height + np.clip(np.concatenate([[0.0, thickness], height * _GRADING]),
                                                     0.0, thickness)), nodes)
    step = 1e-5 * rho[:, None]

    def potential(r):
        return loop_flux(magnet, r, -z[None, :]) / (2.0 * np.pi * r)

    a = potential(rho[:, None])
    slope = (potential(rho[:, None] + step) - potential(rho[:, None] - step)) / (2.0 * step)
    integrand = (slope**2 + (a / rho[:, None]) ** 2) @ w_z
    return float(np.pi * conductivity * speed * np.sum(w_rho * rho * integrand))


@dataclass(frozen=True)
class SheetDamping:
    """Eddy damping of a magnet swinging over a conducting sheet.

    Attributes
    ----------
    drag : float
        Drag at the given speed [N].
    damping_constant : float
        ``b = F / v`` [kg/s].
    decay_time : float
        Amplitude decay time ``2 m / b`` of the pendulum [s].
    characteristic_speed : float
        ``w = 2 / (mu0 sigma d_eff)``, ``d_eff`` the smaller of thickness and height [m/s].
    speed_ratio : float
        ``v / w`` [-].
    low_speed_valid : bool
        True when ``v / w`` is below 0.1; above it the drag grows slower than ``v``.
    """

    drag: float
    damping_constant: float
    decay_time: float
    characteristic_speed: float
    speed_ratio: float
    low_speed_valid: bool


def sheet_damping(magnet: AxialMagnet, bob_mass, height, conductivity, thickness,
                  speed) -> SheetDamping:
    """Drag, damping constant and amplitude decay time of a magnet pendulum over a sheet.

    Parameters
    ----------
    magnet : AxialMagnet
        The bob's magnet, axis vertical.
    bob_mass : float
        Pendulum bob mass [kg].
    height : float
        Magnet centre to plate surface at the lowest point [m].
    conductivity, thickness : float
        Plate [S/m], [m].
    speed : float
        Speed at the lowest point [m/s].

    Notes
    -----
    ``m x'' + b x' + ... = 0`` decays in amplitude as ``exp(-b t / 2m)``. The drag is taken at
    the lowest point, where it is largest, so the decay time is on the short side. For plates
    thicker than the height the field reaches a depth of about the height, so that sets
    ``d_eff`` in the speed check (common practice, order of magnitude only).

    References
    ----------
    Reitz (1970); Saslow, Am. J. Phys. 60, 693 (1992); module notes [D].
    """
    drag = sheet_drag(magnet, height, conductivity, thickness, speed)
    damping = drag / speed if speed > 0 else 0.0
    decay = 2.0 * bob_mass / damping if damping > 0 else float("inf")
    w = sheet_characteristic_speed(conductivity, min(thickness, height))
    return SheetDamping(drag, damping, decay, float(w), float(speed / w),
                        bool(speed / w < _LOW_SPEED_LIMIT))
