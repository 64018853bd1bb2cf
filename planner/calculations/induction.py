"""Induction and eddy-current figures for every activity that uses a coil, tube or sheet.

Each activity gives an :class:`InductionFigures` whose ``values`` keys carry SI unit suffixes
(``peak_emf_V``, ``peak_current_A``, ``fall_time_s``, ``terminal_speed_m_per_s``,
``mutual_inductance_H``, ``self_inductance_H``, ``switch_off_peak_V``, ``crank_torque_N_m``...).

References
----------
Faraday's law; Maxwell's mutual inductance; Nagaoka's coefficient (Grover, Inductance
Calculations, 1946); MacLatchy, Backman & Bogan, Am. J. Phys. 61, 1096 (1993); Reitz, J. Appl.
Phys. 41, 2067 (1970); physics.md sections 4 and 5. Copper resistivity 1.68e-8 ohm m at 20 C
(CRC Handbook).
"""
from __future__ import annotations

import numpy as np

from planner import materials
from planner.assessment import InductionFigures
from planner.physics import eddy
from planner.physics.bodies import MagnetBody
from planner.physics.constants import STANDARD_GRAVITY
from planner.physics.forces import extent_along
from planner.physics.induction import (Winding, alternating_induced_emf, axial_magnet, body_flux_linkage,
                                       circuit_current, coil_mutual_inductance, coupling_coefficient,
                                       coupling_table, generator_figures, passage_time_series,
                                       speed_for_voltage, stored_energy, summarize_passage,
                                       switch_off_spike, switched_induced_emf, winding_from_wire,
                                       winding_inductance, wire_length, wire_resistance)
from planner.setup import Setup, model
from planner.setup.geometry import body_of, mass_of

#: Samples of an EMF series when no closed form applies (blocks, paths beside the coil).
GENERAL_PATH_SAMPLES = 400


def winding_of(coil: model.Coil) -> Winding:
    """The winding a setup coil describes (from its outer diameter, else from its wire)."""
    layers = coil.layers or 1
    if coil.outer_diameter is not None:
        return Winding(coil.turns, coil.inner_diameter / 2, coil.outer_diameter / 2, coil.length, layers)
    return winding_from_wire(coil.turns, coil.inner_diameter / 2, coil.length, coil.wire_diameter)


def coil_resistance(coil: model.Coil) -> float:
    """DC resistance [ohm]: the measured value, else copper wire of the given size and length."""
    if coil.resistance is not None:
        return coil.resistance
    return float(wire_resistance(coil.wire_diameter, wire_length(winding_of(coil))))


def conductivity_of(part) -> float:
    """Conductivity [S/m] of a tube or sheet: the given value, else the material's row."""
    if part.conductivity is not None:
        return part.conductivity
    return materials.find_conductor(part.material).conductivity


def _circuit(coil: model.Coil) -> dict:
    """Resistance outside the coil and the meter's full scale, from what the coil feeds."""
    target = coil.connected_to
    if isinstance(target, model.MeterInput):
        full_scale = target.full_scale_current
        if full_scale is None:
            full_scale = target.full_scale_voltage / target.resistance
        return {"external_ohm": target.resistance, "full_scale_A": full_scale, "into": "meter"}
    if isinstance(target, model.Load):
        return {"external_ohm": target.resistance, "full_scale_A": None, "into": "load"}
    return {"external_ohm": np.inf, "full_scale_A": None, "into": "open circuit"}


def pass_through_coil(setup: Setup, activity: model.PassThroughCoil) -> InductionFigures:
    """A magnet moved along (or beside) a coil's axis at a speed, or dropped through it."""
    coil = next(c for c in setup.coils if c.id == activity.coil)
    magnet = next(m for m in setup.magnets if m.id == activity.magnet)
    body = body_of(magnet)
    winding = winding_of(coil)
    resistance = coil_resistance(coil)
    circuit = _circuit(coil)
    total = resistance + circuit["external_ohm"]
    inductance = float(winding_inductance(winding))
    warnings = []
    try:
        if activity.offset != 0:
            raise ValueError("beside the coil")
        magnet_on_axis = axial_magnet(body, np.asarray(coil.axis))
        t, emf, current = passage_time_series(magnet_on_axis, winding, speed=activity.speed,
                                              drop_height=activity.drop_height, resistance=total,
                                              inductance=inductance if np.isfinite(total) else 0.0)
        method = "closed-form flux of the magnet's equivalent current sheet"
    except ValueError:
        t, emf, current = _general_passage(body, winding, coil, activity, total, inductance)
        method = "flux of the exact field integrated over the winding"
    summary = summarize_passage(t, emf, current, total, inductance if np.isfinite(total) else 0.0,
                                circuit["full_scale_A"] or np.inf)
    values = {
        "into": circuit["into"], "method": method,
        "peak_emf_V": summary.peak_emf, "peak_current_A": summary.peak_current,
        "coil_resistance_ohm": resistance, "circuit_resistance_ohm": total,
        "self_inductance_H": inductance, "pulse_duration_s": summary.pulse_time,
        "inductance_ratio": summary.inductance_ratio,
    }
    if circuit["full_scale_A"] is not None:
        values["full_scale_A"] = circuit["full_scale_A"]
        # past 1 the electrical rule's meter finding says so, from this figure
        values["peak_to_full_scale"] = summary.peak_current / circuit["full_scale_A"]
    if summary.inductance_matters:
        warnings.append("the coil's inductance shapes the current pulse (included)")
    return InductionFigures(activity.id, activity.kind, values, warnings)


def _general_passage(body, winding, coil, activity, resistance, inductance):
    """EMF series from the exact field for blocks, tilted magnets and paths beside the coil."""
    axis = np.asarray(coil.axis)
    centre = np.asarray(coil.at)
    sideways = np.cross(axis, [1.0, 0.0, 0.0])
    if np.linalg.norm(sideways) < 1e-6:
        sideways = np.cross(axis, [0.0, 1.0, 0.0])
    sideways /= np.linalg.norm(sideways)
    reach = winding.length / 2 + 3 * (winding.outer_radius + 2 * body.bounding_radius)
    if activity.speed is not None:
        t = np.linspace(0.0, 2 * reach / activity.speed, GENERAL_PATH_SAMPLES)
        along = reach - activity.speed * t
    else:
        t = np.linspace(0.0, np.sqrt(2 * (activity.drop_height + reach) / STANDARD_GRAVITY), GENERAL_PATH_SAMPLES)
        along = activity.drop_height - STANDARD_GRAVITY * t**2 / 2
    centres = centre + np.outer(along, axis) + activity.offset * sideways
    linkage = body_flux_linkage(body, centres, winding, centre, axis)
    emf = -np.gradient(linkage, t)
    current = circuit_current(t, emf, resistance, inductance if np.isfinite(resistance) else 0.0)
    return t, emf, current


def drop_through_tube(setup: Setup, activity: model.DropThroughTube) -> InductionFigures:
    """A magnet dropped through a conducting tube: drag, terminal speed, fall time."""
    tube = next(c for c in setup.conductors if c.id == activity.tube)
    magnet = next(m for m in setup.magnets if m.id == activity.magnet)
    body = body_of(magnet)
    sigma = conductivity_of(tube)
    fall = eddy.tube_fall(axial_magnet(body, np.asarray(tube.axis)), mass_of(magnet), tube.length,
                          tube.inner_diameter / 2, tube.outer_diameter / 2, sigma)
    values = {
        "conductivity_S_per_m": sigma, "drag_constant_N_s_per_m": fall.drag_constant,
        "terminal_speed_m_per_s": fall.terminal_speed, "time_constant_s": fall.time_constant,
        "fall_time_s": fall.fall_time, "free_fall_time_s": fall.free_fall_time,
        "exit_speed_m_per_s": fall.exit_speed, "radial_clearance_m": fall.radial_clearance,
    }
    warnings = [] if fall.low_speed_valid else ["the magnet is fast for the low-speed drag model; the fall time is a rough figure"]
    return InductionFigures(activity.id, activity.kind, values, warnings)


def swing_over_sheet(setup: Setup, activity: model.SwingOverSheet) -> InductionFigures:
    """A magnet pendulum over a conducting sheet: drag, damping constant, decay time."""
    sheet = next(c for c in setup.conductors if c.id == activity.sheet)
    magnet = next(m for m in setup.magnets if m.id == activity.magnet)
    body = body_of(magnet)
    vertical = np.array([0.0, 0.0, 1.0])
    sigma = conductivity_of(sheet)
    bob = activity.bob_mass or mass_of(magnet)
    warnings = []
    if body.shape == "block":
        # Closed forms need a round magnet: an equal-volume cylinder of the block's height stands in.
        height = float(body.size @ np.abs(body.rotation.T @ vertical))
        diameter = float(np.sqrt(4 * body.volume / (np.pi * height)))
        body = MagnetBody("cylinder", body.center, np.eye(3), body.polarization, diameter=diameter, height=height)
        warnings.append("the block is modelled as a round magnet of the same volume and height")
    centre_height = activity.height + extent_along(body, -vertical)  # the gap is under the magnet's lowest face
    damping = eddy.sheet_damping(axial_magnet(body, vertical), bob, centre_height, sigma, sheet.thickness,
                                 activity.speed)
    values = {
        "conductivity_S_per_m": sigma, "drag_at_lowest_point_N": damping.drag,
        "damping_constant_N_s_per_m": damping.damping_constant, "amplitude_decay_time_s": damping.decay_time,
        "characteristic_speed_m_per_s": damping.characteristic_speed, "speed_ratio": damping.speed_ratio,
    }
    if not damping.low_speed_valid:
        warnings.append("the speed is not small against 2/(mu0 sigma d): the low-speed drag overstates the braking")
    return InductionFigures(activity.id, activity.kind, values, warnings)


def crank_generator(setup: Setup, activity: model.CrankGenerator) -> InductionFigures:
    """A coil cranked in a field: EMF, current, power into the load and crank torque."""
    coil = next(c for c in setup.coils if c.id == activity.coil)
    winding = winding_of(coil)
    area = float(np.pi * winding.mean_radius**2)
    rpm = activity.speed * 60 / (2 * np.pi)
    load = coil.connected_to.resistance if isinstance(coil.connected_to, (model.Load, model.MeterInput)) else np.inf
    resistance = coil_resistance(coil)
    inductance = float(winding_inductance(winding))
    figures = generator_figures(coil.turns, activity.field, area, rpm, load, resistance, inductance)
    values = {
        "emf_amplitude_V": figures.emf_amplitude, "emf_rms_V": figures.emf_rms, "peak_emf_V": figures.emf_amplitude,
        "current_amplitude_A": figures.current_amplitude, "load_voltage_amplitude_V": figures.load_voltage_amplitude,
        "mean_power_W": figures.mean_power, "load_power_W": figures.load_power,
        "crank_torque_N_m": figures.mean_torque, "coil_resistance_ohm": resistance,
        "self_inductance_H": inductance, "speed_rpm": rpm,
    }
    warnings = []
    if activity.target_voltage is not None:
        values["speed_for_target_rpm"] = float(speed_for_voltage(activity.target_voltage * np.sqrt(2), coil.turns,
                                                                 activity.field, area))
    target = coil.connected_to
    if isinstance(target, model.Load) and target.rated_voltage is not None:
        values["load_rated_voltage_V"] = target.rated_voltage
        rms = figures.load_voltage_amplitude / np.sqrt(2)
        if rms > 1.1 * target.rated_voltage:
            warnings.append(f"the load gets {rms:.2g} V rms, above its rating of {target.rated_voltage:g} V")
        elif rms < 0.5 * target.rated_voltage:
            warnings.append(f"the load gets only {rms:.2g} V rms of its rated {target.rated_voltage:g} V")
    return InductionFigures(activity.id, activity.kind, values, warnings)


def couple_coils(setup: Setup, activity: model.CoupleCoils) -> InductionFigures:
    """Two coils: mutual inductance, coupling, and the EMF the primary's current induces."""
    coils = {c.id: c for c in setup.coils}
    first, second = coils[activity.primary], coils[activity.secondary]
    w1, w2 = winding_of(first), winding_of(second)
    mutual = float(coil_mutual_inductance(w1, np.asarray(first.at), np.asarray(first.axis),
                                          w2, np.asarray(second.at), np.asarray(second.axis)))
    l1, l2 = float(winding_inductance(w1)), float(winding_inductance(w2))
    values = {"mutual_inductance_H": mutual, "coupling_coefficient": float(coupling_coefficient(mutual, l1, l2)),
              "primary_self_inductance_H": l1, "secondary_self_inductance_H": l2}
    supply = first.connected_to
    if isinstance(supply, model.Supply):
        if supply.frequency is not None:
            peak, rms = alternating_induced_emf(mutual, supply.current * np.sqrt(2), supply.frequency)
            values.update({"induced_emf_peak_V": float(peak), "induced_emf_rms_V": float(rms), "peak_emf_V": float(peak)})
        if supply.switch_off_time is not None:
            values["induced_switch_off_peak_V"] = float(switched_induced_emf(mutual, supply.current, supply.switch_off_time))
            values["peak_emf_V"] = max(values.get("peak_emf_V", 0.0), values["induced_switch_off_peak_V"])
    separation = float(np.linalg.norm(np.asarray(second.at) - np.asarray(first.at)))
    distances = np.array([max(separation, w1.length / 2 + w2.length / 2), 2 * max(separation, 0.01), 4 * max(separation, 0.01)])
    angles = np.radians([0.0, 30.0, 60.0, 90.0])
    table = coupling_table(w1, w2, distances, angles)
    values["coupling_table"] = {"distances_m": distances.tolist(), "angles_deg": [0, 30, 60, 90],
                                "coupling_coefficient": np.asarray(table).tolist()}
    return InductionFigures(activity.id, activity.kind, values, [])


def switch_off(setup: Setup, activity: model.SwitchOff) -> InductionFigures:
    """A coil's supply interrupted: the spike L I / t and the stored energy L I^2 / 2."""
    coil = next(c for c in setup.coils if c.id == activity.coil)
    supply = coil.connected_to
    inductance = float(winding_inductance(winding_of(coil)))
    current = supply.current * (np.sqrt(2) if supply.frequency is not None else 1.0)
    switch_time = supply.switch_off_time
    warnings = []
    if switch_time is None:
        switch_time = 1e-3
        warnings.append("no switch_off_time given: 1 ms assumed (a hand switch or relay opens in about a millisecond; common practice)")
    values = {"self_inductance_H": inductance, "current_A": current, "switch_off_time_s": switch_time,
              "switch_off_peak_V": float(switch_off_spike(inductance, current, switch_time)),
              "stored_energy_J": float(stored_energy(inductance, current)),
              "coil_resistance_ohm": coil_resistance(coil), "mains": supply.mains}
    if supply.voltage is not None:
        values["supply_voltage_V"] = supply.voltage
    return InductionFigures(activity.id, activity.kind, values, warnings)


CALCULATIONS = {
    "pass_through_coil": pass_through_coil, "drop_through_tube": drop_through_tube,
    "swing_over_sheet": swing_over_sheet, "crank_generator": crank_generator,
    "couple_coils": couple_coils, "switch_off": switch_off,
}


def induction_figures(setup: Setup) -> list[InductionFigures]:
    """Figures of every induction and eddy-current activity, in file order."""
    return [CALCULATIONS[a.kind](setup, a) for a in setup.activities if a.kind in CALCULATIONS]
