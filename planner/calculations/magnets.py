"""Per-magnet figures: remanence used, mass, moment, pole-face field, pole area and flux index.

References
----------
ASTM F963-23, 4.38 and 8.25 (flux index: (maximum surface flux density at the pole face in kG)^2 x
(pole area perpendicular to the magnetization in mm^2); sphere: great-circle area);
16 CFR 1262 (2022); 16 CFR 1501.4 (small-parts cylinder, 31.7 mm inside diameter, 25.4 to 57.1 mm deep);
Camacho & Sosa, Rev. Mex. Fis. E 59, 8-17 (2013) (pole-face field of a cylinder).
"""
from __future__ import annotations

import numpy as np

from planner.assessment import MagnetFigures
from planner.physics.bodies import MagnetBody
from planner.physics.fields import field_of_body
from planner.physics.forces import extent_along
from planner.setup import Setup
from planner.setup.geometry import body_of, grade_of, mass_of, remanence_of
from planner.summary import magnet_size

#: Small-parts cylinder of 16 CFR 1501.4: inside diameter and the deep side's depth [m].
SMALL_PARTS_DIAMETER = 0.0317
SMALL_PARTS_DEEP_SIDE = 0.0571

TESLA_PER_KILOGAUSS = 0.1


def pole_area(body: MagnetBody) -> float:
    """Area of the body projected on the plane perpendicular to its magnetization [m^2].

    For a box the projection is sum_i |m_i| A_i over the face areas A_i; a cylinder's is
    |m_axial| pi R^2 + |m_across| D H; a sphere's is the great circle pi R^2.
    """
    direction = body.polarization_body / np.linalg.norm(body.polarization_body)
    if body.shape == "sphere":
        return np.pi * body.diameter**2 / 4
    if body.shape == "block":
        x, y, z = body.size
        return float(abs(direction[0]) * y * z + abs(direction[1]) * x * z + abs(direction[2]) * x * y)
    end_area = np.pi * (body.diameter**2 - body.inner_diameter**2) / 4
    across = float(np.hypot(direction[0], direction[1]))
    return float(abs(direction[2]) * end_area + across * body.diameter * body.height)


def pole_face_field(body: MagnetBody) -> float:
    """|B| [T] just outside the pole face, on the line of magnetization through the centre.

    For a ring, whose centre line runs through the bore, the point is on the face at the
    mean radius. This is the face-centre value of ASTM F963's probe reading (the field at a
    face's rim can be higher; the report says so).
    """
    direction = body.polarization / np.linalg.norm(body.polarization)
    tiny = 1e-9 * max(body.bounding_radius, 1e-6)
    if body.shape == "ring":
        mean_radius = (body.diameter + body.inner_diameter) / 4
        sideways = body.rotation[:, 0]
        start = body.center + mean_radius * sideways
        point = start + (body.height / 2 + tiny) * np.sign(direction @ body.axis or 1.0) * body.axis
    else:
        point = body.center + (extent_along(body, direction) + tiny) * direction
    return float(np.linalg.norm(field_of_body(body, point)))


def fits_small_parts_cylinder(body: MagnetBody) -> bool:
    """True if the magnet may fit wholly in the 16 CFR 1501.4 small-parts cylinder.

    Errs toward "fits": the magnet fits if, in some orientation, its cross-section lies in
    the 31.7 mm circle and its length does not exceed the deep side, 57.1 mm.
    """
    if body.shape == "sphere":
        return body.diameter <= SMALL_PARTS_DIAMETER
    if body.shape in ("cylinder", "ring"):
        upright = body.diameter <= SMALL_PARTS_DIAMETER and body.height <= SMALL_PARTS_DEEP_SIDE
        lying = np.hypot(body.diameter, body.height) <= SMALL_PARTS_DIAMETER and body.diameter <= SMALL_PARTS_DEEP_SIDE
        return bool(upright or lying)
    a, b, c = sorted(body.size)
    return bool(np.hypot(a, b) <= SMALL_PARTS_DIAMETER and c <= SMALL_PARTS_DEEP_SIDE)


def flux_index(face_field: float, area: float) -> float:
    """ASTM F963 flux index [kG^2 mm^2] from the pole-face field [T] and pole area [m^2]."""
    return (face_field / TESLA_PER_KILOGAUSS) ** 2 * (area * 1e6)


def magnet_figures(setup: Setup) -> list[MagnetFigures]:
    """Figures of every magnet in the setup, in file order."""
    figures = []
    for magnet in setup.magnets:
        body = body_of(magnet)
        grade = grade_of(magnet)
        face = pole_face_field(body)
        area = pole_area(body)
        if magnet.remanence is not None:
            note = "given in the setup file"
        else:
            note = f"top of the {grade.name} range {grade.remanence_min:.2f}-{grade.remanence_max:.2f} T ({grade.source})"
        figures.append(MagnetFigures(
            id=magnet.id, shape=magnet.shape, size=magnet_size(magnet),
            material=grade.name if grade else f"Br {remanence_of(magnet):.3g} T",
            remanence_T=remanence_of(magnet), remanence_note=note, count=magnet.count,
            mass_kg=mass_of(magnet), volume_m3=body.volume,
            moment_A_m2=float(np.linalg.norm(body.moment)),
            pole_face_field_T=face, pole_area_m2=area, flux_index_kG2_mm2=flux_index(face, area),
            fits_small_parts_cylinder=fits_small_parts_cylinder(body),
            max_working_temperature_C=grade.max_working_temperature if grade else None,
            coercivity_min_A_per_m=grade.coercivity_min if grade else None,
            family=grade.family if grade else "unknown",
        ))
    return figures
