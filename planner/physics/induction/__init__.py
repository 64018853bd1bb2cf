"""Induction: flux of magnets through coils, EMF, mutual and self inductance, generators.

Pure functions on SI floats and arrays (see each module). Project issue 6.

Modules
-------
loops        Maxwell's coaxial mutual inductance, vector potential of a loop
sheets       closed-form flux and radial field of a finite current sheet (solenoid or magnet)
magnet_flux  magnets on a coil's axis: flux and radial field; disc flux from any field
coils        windings, wire resistance, self-inductance, switch-off spike, stored energy
mutual       loops and coils in any position, coupling, induced EMF, coupling tables
passage      magnet through a coil: linkage, EMF, current, time series and summary
generator    coil turning in a field
"""
from .coils import (
    ANNEALED_COPPER_RESISTIVITY,
    COPPER_RESISTIVITY,
    Winding,
    nagaoka_coefficient,
    solenoid_inductance,
    stored_energy,
    switch_off_spike,
    wheeler_multilayer_inductance,
    wheeler_solenoid_inductance,
    winding_from_wire,
    winding_inductance,
    wire_length,
    wire_resistance,
)
from .generator import GeneratorFigures, generator_figures, speed_for_voltage
from .loops import coaxial_loop_mutual_inductance, elliptic_psi, loop_vector_potential
from .magnet_flux import (
    AxialMagnet,
    axial_magnet,
    dipole_loop_flux,
    flux_from_bodies,
    flux_from_field,
    loop_flux,
    radial_field,
)
from .mutual import (
    alternating_induced_emf,
    coaxial_coil_mutual_inductance,
    coil_mutual_inductance,
    coupling_coefficient,
    coupling_table,
    loop_mutual_inductance,
    switched_induced_emf,
)
from .passage import (
    PassageSummary,
    body_flux_linkage,
    circuit_current,
    flux_linkage,
    linkage_gradient,
    passage_time_series,
    summarize_passage,
)
from .sheets import coaxial_sheet_mutual_inductance, sheet_flux, sheet_radial_field

__all__ = [
    "ANNEALED_COPPER_RESISTIVITY",
    "AxialMagnet",
    "COPPER_RESISTIVITY",
    "GeneratorFigures",
    "PassageSummary",
    "Winding",
    "alternating_induced_emf",
    "axial_magnet",
    "body_flux_linkage",
    "circuit_current",
    "coaxial_coil_mutual_inductance",
    "coaxial_loop_mutual_inductance",
    "coaxial_sheet_mutual_inductance",
    "coil_mutual_inductance",
    "coupling_coefficient",
    "coupling_table",
    "dipole_loop_flux",
    "elliptic_psi",
    "flux_from_bodies",
    "flux_from_field",
    "flux_linkage",
    "generator_figures",
    "linkage_gradient",
    "loop_flux",
    "loop_mutual_inductance",
    "loop_vector_potential",
    "nagaoka_coefficient",
    "passage_time_series",
    "radial_field",
    "sheet_flux",
    "sheet_radial_field",
    "solenoid_inductance",
    "speed_for_voltage",
    "stored_energy",
    "summarize_passage",
    "switch_off_spike",
    "switched_induced_emf",
    "wheeler_multilayer_inductance",
    "wheeler_solenoid_inductance",
    "winding_from_wire",
    "winding_inductance",
    "wire_length",
    "wire_resistance",
]
