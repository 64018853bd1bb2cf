"""Handling and projectile figures: snap distance, pinch, impact, flip torque, loose steel.

Modules
-------
pinch
    Two magnets (or a magnet and steel) brought together: snap distance, clamp force at a
    finger gap, energy released, impact speed, the torque that flips a magnet.
projectiles
    Loose soft-steel items near a magnet: the pull along a line, the distances within
    which an item slides off a bench or lifts, and the gradient distance.

Defaults marked "common practice" (friction coefficient, hand force, finger gap) are
plain named parameters, to be overridden by the site's own figures.

References
----------
J. F. Schenck, "Safety of strong, static magnetic fields", J. Magn. Reson. Imaging 12,
2-19 (2000); ASTM F2052 (magnetically induced displacement force, the 45 degree
deflection reference point).
"""
from planner.physics.handling.pinch import (DEFAULT_FINGER_GAP, DEFAULT_HAND_FORCE,
                                            DEFAULT_STATIC_FRICTION, FlipTorque,
                                            HandlingFigures, attraction_to_steel,
                                            bench_friction_force, clamp_force, flip_torque,
                                            impact_speed, pair_attraction, pair_handling,
                                            reduced_mass, released_energy, snap_distance)
from planner.physics.handling.projectiles import (IRON_SATURATION_MAGNETIZATION,
                                                  STEEL_DENSITY, SteelItem,
                                                  demagnetizing_factor, gradient_distance,
                                                  lift_distance, projectile_attraction,
                                                  pull_off_distance, steel_plate, steel_rod,
                                                  steel_sphere, surface_point)

__all__ = [
    "DEFAULT_FINGER_GAP", "DEFAULT_HAND_FORCE", "DEFAULT_STATIC_FRICTION", "FlipTorque",
    "HandlingFigures", "IRON_SATURATION_MAGNETIZATION", "STEEL_DENSITY", "SteelItem",
    "attraction_to_steel", "bench_friction_force", "clamp_force", "demagnetizing_factor",
    "flip_torque", "gradient_distance", "impact_speed", "lift_distance", "pair_attraction",
    "pair_handling", "projectile_attraction", "pull_off_distance", "reduced_mass",
    "released_energy", "snap_distance", "steel_plate", "steel_rod", "steel_sphere",
    "surface_point",
]
