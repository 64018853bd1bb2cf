"""Setup parts -> physics inputs: magnet bodies with their remanence, mass and rotation.

The only bridge between the setup model and ``planner.physics``: physics never sees a setup.
"""
from __future__ import annotations

import numpy as np

from planner import materials
from planner.physics.bodies import MagnetBody, rotation_about, rotation_from_axis
from planner.setup import model

#: Density assumed when a magnet gives only a remanence and no mass (sintered NdFeB, trade tables).
DEFAULT_MAGNET_DENSITY = 7500.0


def grade_of(magnet) -> materials.Grade | None:
    """The magnet's grade row, or None when only a remanence is given."""
    return materials.find_grade(magnet.grade) if magnet.grade else None


def remanence_of(magnet) -> float:
    """Remanence used for this magnet [T]: the given value, else the top of the grade's range.

    The upper end of the trade range errs on the safe side for keep-out lines and pinch forces.
    """
    if magnet.remanence is not None:
        return magnet.remanence
    grade = grade_of(magnet)
    return grade.remanence_max if grade else float("nan")


def rotation_of(magnet) -> np.ndarray:
    """Body-frame rotation of a magnet (columns are the body axes in the setup frame)."""
    if isinstance(magnet, model.Block):
        rotation = np.eye(3)
        for step in magnet.rotation:
            rotation = rotation_about(step.about, step.angle) @ rotation
        return rotation
    if isinstance(magnet, (model.Cylinder, model.Ring)):
        return rotation_from_axis(magnet.axis if magnet.axis is not None else magnet.magnetization)
    return np.eye(3)


def body_of(magnet) -> MagnetBody:
    """The uniformly magnetized body a setup magnet stands for."""
    polarization = remanence_of(magnet) * np.asarray(magnet.magnetization, dtype=float)
    common = dict(center=np.asarray(magnet.at), rotation=rotation_of(magnet), polarization=polarization)
    if isinstance(magnet, model.Cylinder):
        return MagnetBody("cylinder", diameter=magnet.diameter, height=magnet.height, **common)
    if isinstance(magnet, model.Ring):
        return MagnetBody("ring", diameter=magnet.diameter, height=magnet.height,
                          inner_diameter=magnet.inner_diameter, **common)
    if isinstance(magnet, model.Block):
        return MagnetBody("block", size=np.asarray(magnet.size), **common)
    return MagnetBody("sphere", diameter=magnet.diameter, **common)


def mass_of(magnet) -> float:
    """Mass of one piece [kg]: the given mass, else density x volume."""
    if magnet.mass is not None:
        return magnet.mass
    grade = grade_of(magnet)
    density = grade.density if grade else DEFAULT_MAGNET_DENSITY
    return density * body_of(magnet).volume


def bodies_of(setup) -> list[MagnetBody]:
    """All magnets of a setup as bodies, in file order."""
    return [body_of(magnet) for magnet in setup.magnets]


def magnet_index(setup, magnet_id: str) -> int:
    """Position of the magnet called ``magnet_id`` in ``setup.magnets``; KeyError if absent."""
    for index, magnet in enumerate(setup.magnets):
        if magnet.id == magnet_id:
            return index
    raise KeyError(magnet_id)


def parts_by_id(setup) -> dict:
    """Every identified part of the setup by id."""
    parts = {}
    for group in (setup.magnets, setup.steel_surfaces, setup.loose_steel, setup.conductors, setup.coils,
                  setup.activities, setup.zones):
        for part in group:
            parts.setdefault(part.id, part)
    return parts
