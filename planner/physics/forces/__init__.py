"""Forces, torques and energies between magnets, and between a magnet and flat steel.

Modules
-------
charge_model
    General force, torque and energy by the surface-charge model with adaptive quadrature.
closed_forms
    Exact coaxial-cylinder (Vokoun et al. 2009) and parallel-cuboid (Akoun & Yonnet 1984)
    forces.
pair
    The dispatcher that uses the exact forms where the geometry allows; approach paths.
steel
    Method of images for a large flat steel surface; plate saturation estimate.
quadrature
    Adaptive quadrature on parameter boxes (nested rules, split along the parameter that
    carries the error).
quadrature_rules
    Nested interval rules (midpoint, Gauss, Kronrod, Patterson), periodic trapezoidal rules
    and the extrapolated error estimate from two nested differences.
face_rules
    One fixed rule per whole charged face, sized by the pair's separation: the first pass
    of the general force (a single field call for most pairs).

All functions take :class:`planner.physics.bodies.MagnetBody` objects or SI floats and
return SI floats and arrays (forces in N, torques in N m, energies in J).

References
----------
Akoun & Yonnet, IEEE Trans. Magn. 20(5), 1962-1964 (1984); Vokoun, Beleggia, Heller &
Sittner, J. Magn. Magn. Mater. 321, 3758-3763 (2009); Furlani, *Permanent Magnet and
Electromechanical Devices* (2001); Jackson, *Classical Electrodynamics* (1999).
"""
from planner.physics.forces.charge_model import (force_and_torque_by_charges,
                                                 interaction_energy)
from planner.physics.forces.closed_forms import (bessel_pair_integral,
                                                 coaxial_cylinders_axial_force,
                                                 parallel_cuboids_force)
from planner.physics.forces.pair import (approach_profile, charges_on_narrower_body,
                                         energy_between, extent_along, force_and_torque,
                                         force_between, place_at_gap)
from planner.physics.forces.steel import (LOW_CARBON_STEEL_SATURATION, PlateSaturation,
                                          mirror_in_plane, plate_saturation_check,
                                          steel_surface_force_and_torque)

__all__ = [
    "LOW_CARBON_STEEL_SATURATION", "PlateSaturation", "approach_profile",
    "bessel_pair_integral", "charges_on_narrower_body", "coaxial_cylinders_axial_force",
    "energy_between", "extent_along",
    "force_and_torque", "force_and_torque_by_charges", "force_between",
    "interaction_energy", "mirror_in_plane", "parallel_cuboids_force", "place_at_gap",
    "plate_saturation_check", "steel_surface_force_and_torque",
]
