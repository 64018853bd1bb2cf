"""A magnet moving along the axis of a coil: flux linkage, EMF, and the current into a meter.

Faraday's law ``e = -d(lambda)/dt`` with ``lambda`` the flux linkage of the whole winding.
For a layer of ``N_i`` turns spread evenly over the length ``l``,
``lambda_i(z0) = (N_i / l) int_{-l/2}^{l/2} Phi(rho_i, z - z0) dz``, so its derivative with
respect to the magnet position needs only the flux through the two end circles [D]:

    d(lambda_i)/d(z0) = -(N_i / l) [Phi(rho_i, l/2 - z0) - Phi(rho_i, -l/2 - z0)].

That makes the EMF exact for the current-sheet winding and cheap: two closed-form fluxes
per layer and sample.

References
----------
Faraday's law: Purcell & Morin, Electricity and Magnetism, 3rd ed., ch. 7 (2013).
Magnet as a current sheet: Derby & Olbert, Am. J. Phys. 78, 229-235 (2010).
"""
from __future__ import annotations

from dataclasses import dataclass
from itertools import accumulate

import numpy as np

from planner.physics.constants import STANDARD_GRAVITY as standard_gravity
from planner.physics.gauss import gauss_legendre, gauss_panels
from planner.physics.bodies import rotation_from_axis

from .coils import Winding, winding_inductance
from .magnet_flux import AxialMagnet, loop_flux

_INDUCTANCE_FLAG = 0.1


def linkage_gradient(magnet: AxialMagnet, winding: Winding, positions):
    """Rate of change of the flux linkage with the magnet's position, ``d(lambda)/dz0`` [Wb/m].

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet, moving along the coil axis.
    winding : Winding
        The coil.
    positions : array
        Magnet centre minus coil centre along the coil axis [m].

    Notes
    -----
    Exact for the current-sheet winding (module notes). Layers beyond five are Gauss nodes
    over the depth (``Winding.radial_nodes``).

    References
    ----------
    Faraday's law; Derby & Olbert (2010); derivation in the module docstring [D].
    """
    z0 = np.asarray(positions, dtype=float)[..., None]
    radii, turns = winding.radial_nodes()
    half = winding.length / 2.0
    difference = loop_flux(magnet, radii, half - z0) - loop_flux(magnet, radii, -half - z0)
    return -np.sum(turns / winding.length * difference, axis=-1)


def flux_linkage(magnet: AxialMagnet, winding: Winding, positions, nodes_per_panel=8):
    """Flux linkage of the whole winding for a magnet on its axis [Wb-turns].

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet.
    winding : Winding
        The coil.
    positions : array
        Magnet centre minus coil centre along the coil axis [m].
    nodes_per_panel : int
        Gauss-Legendre nodes per panel along the winding [-].

    Notes
    -----
    ``lambda = sum_i (N_i / l) int Phi(rho_i, z - z0) dz`` by Gauss-Legendre panels that break
    at the coil ends and are graded towards the magnet's faces, where the integrand bends
    sharply. Used for plots and checks; the EMF comes from :func:`linkage_gradient`.

    References
    ----------
    Faraday's law; Derby & Olbert, Am. J. Phys. 78, 229 (2010).
    """
    z0 = np.atleast_1d(np.asarray(positions, dtype=float))
    half = winding.length / 2.0
    gap = max(winding.inner_radius - magnet.outer_radius, 1e-4 * winding.inner_radius)
    grading = gap * np.array([0.0, 0.3, 1.0, 3.0, 10.0, 30.0])
    faces = z0[:, None] + np.array([-magnet.length / 2.0, magnet.length / 2.0])[None, :]
    grid = np.concatenate([(faces[:, :, None] + grading).reshape(len(z0), -1),
                           (faces[:, :, None] - grading).reshape(len(z0), -1),
                           np.linspace(-half, half, 9)[None, :].repeat(len(z0), 0)], axis=1)
    breaks = np.sort(np.clip(grid, -half, half), axis=1)
    z, weights = gauss_panels(breaks, nodes_per_panel)  # one rule per row; repeated breaks weigh 0
    radii, turns = winding.radial_nodes()
    total = np.zeros(len(z0))
    for radius, count in zip(radii, turns):
        flux = loop_flux(magnet, radius, z - z0[:, None])
        total += count / winding.length * np.sum(weights * flux, axis=1)
    return total.reshape(np.shape(positions))


def circuit_current(times, emf, resistance, inductance=0.0):
    """Current of ``L di/dt + R i = e(t)`` for a sampled EMF, starting from zero [A].

    Parameters
    ----------
    times : array (n,)
        Evenly spaced sample times [s].
    emf : array (n,)
        EMF at those times [V].
    resistance : float
        Total circuit resistance, coil plus meter or load [ohm]; ``inf`` for an open circuit.
    inductance : float
        Coil inductance [H].

    Notes
    -----
    Exact for an EMF linear between samples: with ``a = exp(-h R / L)`` and
    ``q = (L / (R h)) (1 - a)``, ``i[n+1] = a i[n] + ((1 - q) e[n+1] + (q - a) e[n]) / R``
    (a first-order recursive filter). ``L = 0`` gives ``i = e / R``.

    References
    ----------
    Any circuits text, e.g. Horowitz & Hill, The Art of Electronics, 3rd ed., 1.4 (2015)
    (RL circuit); the update is the exact solution for a ramp input [D].
    """
    emf = np.asarray(emf, dtype=float)
    if not np.isfinite(resistance):
        return np.zeros_like(emf)
    if inductance <= 0.0 or len(emf) < 2:
        return emf / resistance
    step = float(times[1] - times[0])
    decay = np.exp(-step * resistance / inductance)
    q = inductance / (resistance * step) * (1.0 - decay)
    numerator = np.array([1.0 - q, q - decay]) / resistance
    # i[0] = 0; i[n+1] = a i[n] + b0 e[n+1] + b1 e[n] (a plain loop: scipy.signal's filter
    # cost half a second of start-up for this one recursion).
    drive = numerator[0] * emf[1:] + numerator[1] * emf[:-1]
    return np.fromiter(accumulate(drive, lambda current, push: decay * current + push, initial=0.0),
                       dtype=float, count=len(emf))


def passage_time_series(magnet: AxialMagnet, winding: Winding, *, speed=None, drop_height=None,
                        samples=10_000, resistance=np.inf, inductance=None, approach=None,
                        gravity=standard_gravity):
    """EMF and current while a magnet passes along a coil's axis: ``(t, emf, current)``.

    Parameters
    ----------
    magnet : AxialMagnet
        The magnet; it must fit through the coil's bore.
    winding : Winding
        The coil; its axis points up, the magnet moves down it.
    speed : float, optional
        Constant speed [m/s]: the magnet comes from ``approach`` beyond one end to as far
        beyond the other.
    drop_height : float, optional
        Release height of the magnet's centre above the coil's centre, from rest [m]; the
        series runs from release until the magnet is ``approach`` below the coil.
    samples : int
        Number of evenly spaced samples [-].
    resistance : float
        Total resistance of coil plus meter or load [ohm]; ``inf`` leaves the coil open.
    inductance : float, optional
        Coil inductance [H]; default from :func:`winding_inductance`.
    approach : float, optional
        Distance beyond the coil ends where the series starts and stops [m]; default three
        times (coil outer radius plus magnet length).
    gravity : float
        [m/s^2].

    Returns
    -------
    t, emf, current : arrays (samples,)
        Time [s], EMF [V] (``-d(lambda)/dt``, right-handed about the coil axis), current [A].

    Notes
    -----
    Give exactly one of ``speed`` and ``drop_height``. Free fall ignores air drag and the
    magnetic drag of the coil current (small for a meter circuit). The current solves
    ``L di/dt + R i = e`` (:func:`circuit_current`).

    References
    ----------
    Faraday's law; Derby & Olbert, Am. J. Phys. 78, 229 (2010).
    """
    if (speed is None) == (drop_height is None):
        raise ValueError("give exactly one of speed and drop_height")
    if magnet.outer_radius >= winding.inner_radius:
        raise ValueError(f"the magnet (radius {magnet.outer_radius * 1e3:.1f} mm) does not fit "
                         f"through the coil bore (radius {winding.inner_radius * 1e3:.1f} mm)")
    if approach is None:
        approach = 3.0 * (winding.outer_radius + magnet.length)
    end = winding.length / 2.0 + approach
    if speed is not None:
        t = np.linspace(0.0, 2.0 * end / speed, samples)
        position, velocity = end - speed * t, np.full(samples, -float(speed))
    else:
        t = np.linspace(0.0, np.sqrt(2.0 * (drop_height + end) / gravity), samples)
        position, velocity = drop_height - gravity * t**2 / 2.0, -gravity * t
    emf = -linkage_gradient(magnet, winding, position) * velocity
    if inductance is None:
        inductance = winding_inductance(winding) if np.isfinite(resistance) else 0.0
    return t, emf, circuit_current(t, emf, resistance, inductance)


@dataclass(frozen=True)
class PassageSummary:
    """Headline figures of a magnet passage.

    Attributes
    ----------
    peak_emf : float
        Largest EMF magnitude [V].
    peak_emf_time : float
        When it occurs [s].
    peak_current : float
        Largest current magnitude [A].
    full_scale_ratio : float
        Peak current over the meter's full-scale current [-] (nan when not given).
    pulse_time : float
        Time between the largest positive and negative EMF peaks [s].
    inductance_ratio : float
        ``omega L / R`` with ``omega = pi / pulse_time`` [-].
    inductance_matters : bool
        True when ``inductance_ratio`` exceeds 0.1, so the current lags and is reduced.
    """

    peak_emf: float
    peak_emf_time: float
    peak_current: float
    full_scale_ratio: float
    pulse_time: float
    inductance_ratio: float
    inductance_matters: bool


def summarize_passage(t, emf, current, resistance=np.inf, inductance=0.0,
                      full_scale_current=None) -> PassageSummary:
    """Peak figures of a passage time series (see :class:`PassageSummary`).

    Parameters
    ----------
    t, emf, current : arrays
        From :func:`passage_time_series` [s, V, A].
    resistance : float
        Total circuit resistance [ohm].
    inductance : float
        Coil inductance [H].
    full_scale_current : float, optional
        Meter full-scale current [A].

    References
    ----------
    Definitions of this project; Faraday's law as in :func:`passage_time_series`.
    """
    emf, current = np.asarray(emf), np.asarray(current)
    peak = int(np.argmax(np.abs(emf)))
    pulse = abs(float(t[np.argmax(emf)] - t[np.argmin(emf)]))
    ratio = (np.pi * inductance / (resistance * pulse)
             if pulse > 0 and np.isfinite(resistance) else 0.0)
    peak_current = float(np.max(np.abs(current)))
    scale = peak_current / full_scale_current if full_scale_current else float("nan")
    return PassageSummary(float(abs(emf[peak])), float(t[peak]), peak_current, scale, pulse,
                          float(ratio), bool(ratio > _INDUCTANCE_FLAG))


def body_flux_linkage(body, centers, winding: Winding, coil_center, coil_axis, axial_nodes=6,
                      radial_nodes=12, angular_nodes=32):
    """Flux linkage of a winding for a magnet of any shape, at any places [Wb-turns].

    Parameters
    ----------
    body : MagnetBody
        The magnet (its own ``center`` is replaced by each of ``centers``).
    centers : array (n, 3)
        Positions of the magnet's centre along its path, global frame [m].
    winding : Winding
        The coil.
    coil_center, coil_axis : array (3,)
        Centre and axis of the coil, global frame [m], [-].
    axial_nodes, radial_nodes, angular_nodes : int
        Gauss-Legendre filaments along the winding, Gauss-Legendre and trapezoid nodes over
        each filament's disc [-].

    Notes
    -----
    ``lambda = sum_f N_f int_disc_f B . n dA`` with B from ``planner.physics.fields``: for blocks,
    tilted magnets and paths off the coil axis, where no closed form applies. Accurate while
    the discs do not cut through the magnet (magnet beside or beyond the coil); for a
    coaxial cylinder, ring or sphere use :func:`flux_linkage`. The EMF along a path sampled at
    times ``t`` is ``-numpy.gradient(lambda, t)``.

    References
    ----------
    Faraday's law; fields as in ``planner.physics.fields`` (physics.md section 1).
    """
    from planner.physics.fields import field_of_body

    first, second, axis = rotation_from_axis(coil_axis).T  # an orthonormal frame with the coil's axis
    radii, turns = winding.radial_nodes()
    x_axial, w_axial = gauss_legendre(axial_nodes)
    x_radial, w_radial = gauss_legendre(radial_nodes)
    phi = 2.0 * np.pi * np.arange(angular_nodes) / angular_nodes
    ring = np.outer(np.cos(phi), first) + np.outer(np.sin(phi), second)          # (A, 3)
    r = radii[:, None] * (x_radial[None, :] + 1.0) / 2.0                        # (R, Q)
    area_weight = (radii[:, None] / 2.0 * w_radial[None, :] * r * 2.0 * np.pi / angular_nodes
                   * turns[:, None])                                            # (R, Q)
    heights = winding.length / 2.0 * x_axial                                    # (H,)
    points = (np.asarray(coil_center, dtype=float) + heights[:, None, None, None, None] * axis
              + r[None, :, :, None, None] * ring[None, None, None, :, :])        # (H, R, Q, A, 3)
    weights = (w_axial[:, None, None] / 2.0) * area_weight[None, :, :]          # (H, R, Q)
    centers = np.atleast_2d(np.asarray(centers, dtype=float))
    linkage = np.empty(len(centers))
    for index, center in enumerate(centers):
        shifted = points - (center - body.center)
        field = field_of_body(body, shifted.reshape(-1, 3)).reshape(points.shape)
        linkage[index] = np.sum(weights[..., None] * (field @ axis))
    return linkage
