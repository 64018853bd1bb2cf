"""A coil turned in a uniform field: the hand-cranked AC generator.

References
----------
Faraday's law for a rotating coil, ``e = N B A omega sin(omega t)``: D. Halliday, R. Resnick &
J. Walker, Fundamentals of Physics, ch. 30-31 (any recent edition); Purcell & Morin,
Electricity and Magnetism, 3rd ed., ch. 7 (2013).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class GeneratorFigures:
    """Steady running figures of a generator driving a resistive load.

    Attributes
    ----------
    emf_amplitude : float
        Peak EMF ``N B A omega`` [V].
    emf_rms : float
        ``emf_amplitude / sqrt 2`` [V].
    current_amplitude : float
        Peak current [A].
    load_voltage_amplitude : float
        Peak voltage across the load [V].
    mean_power : float
        Mean electrical power, load plus coil [W].
    load_power : float
        Mean power in the load [W].
    mean_torque : float
        Mean crank torque ``P / omega`` needed against the magnetic drag [N m].
    inductance_ratio : float
        ``omega L / (R + r)`` [-]; the inductance is included in the current either way.
    """

    emf_amplitude: float
    emf_rms: float
    current_amplitude: float
    load_voltage_amplitude: float
    mean_power: float
    load_power: float
    mean_torque: float
    inductance_ratio: float


def generator_figures(turns, field, area, speed_rpm, load_resistance, coil_resistance=0.0,
                      coil_inductance=0.0) -> GeneratorFigures:
    """EMF, current, power and crank torque of a coil turning in a uniform field.

    Parameters
    ----------
    turns : float
        Turns of the coil [-].
    field : float
        Flux density perpendicular to the axis of rotation [T].
    area : float
        Area of one turn [m^2].
    speed_rpm : float
        Turning speed [rev/min].
    load_resistance : float
        Load resistance R [ohm].
    coil_resistance : float
        Coil resistance r [ohm].
    coil_inductance : float
        Coil inductance L [H].

    Notes
    -----
    ``e0 = N B A omega``; ``i0 = e0 / |Z|`` with ``|Z| = sqrt((R + r)^2 + (omega L)^2)``;
    mean power ``i0^2 (R + r) / 2`` (equal to ``e0^2 / (2 (R + r))`` when ``omega L << R + r``);
    mean torque ``P / omega`` from the energy balance. Uniform field, rigid coil,
    friction not included.

    References
    ----------
    Halliday, Resnick & Walker, Fundamentals of Physics, ch. 30-31; Purcell & Morin, 3rd ed.,
    ch. 7 (2013).

    >>> f = generator_figures(100, 0.1, 0.01, 600 / np.pi, 10.0)
    >>> round(f.emf_amplitude, 6), round(f.mean_power, 6), round(f.mean_torque, 6)
    (2.0, 0.2, 0.01)
    """
    omega = 2.0 * np.pi * speed_rpm / 60.0
    amplitude = turns * field * area * omega
    total = load_resistance + coil_resistance
    impedance = np.hypot(total, omega * coil_inductance)
    current = amplitude / impedance
    if np.isinf(load_resistance):  # open circuit: no current, the whole EMF across the terminals
        load_voltage, power, load_power = amplitude, 0.0, 0.0
    else:
        load_voltage = current * load_resistance
        power, load_power = current**2 * total / 2.0, current**2 * load_resistance / 2.0
    return GeneratorFigures(
        emf_amplitude=float(amplitude),
        emf_rms=float(amplitude / np.sqrt(2.0)),
        current_amplitude=float(current),
        load_voltage_amplitude=float(load_voltage),
        mean_power=float(power),
        load_power=float(load_power),
        mean_torque=float(power / omega) if omega > 0 else 0.0,
        inductance_ratio=float(omega * coil_inductance / total) if total > 0 else float("inf"),
    )


def speed_for_voltage(target_emf_amplitude, turns, field, area):
    """Turning speed needed for a given EMF amplitude, ``omega = e0 / (N B A)`` [rev/min].

    References
    ----------
    As :func:`generator_figures`.

    >>> round(speed_for_voltage(2.0, 100, 0.1, 0.01) * np.pi, 6)
    600.0
    """
    return target_emf_amplitude / (turns * field * area) * 60.0 / (2.0 * np.pi)
