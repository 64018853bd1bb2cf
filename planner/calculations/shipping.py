"""Field of a packaged set of magnets at the air-transport measuring distances (2.1 m and 4.6 m).

References
----------
IATA Dangerous Goods Regulations, Packing Instruction 953 (UN 2807, magnetized material): field
at 2.1 m (7 ft) and 4.6 m (15 ft) from any point of the package's surface; US 49 CFR 173.21(d).
Dipole field on the axis, B = mu0 2 m / (4 pi r^3) (Jackson, Classical Electrodynamics, 3rd ed., eq. 5.56).
"""
from __future__ import annotations

import numpy as np

from planner.assessment import ShippingFigures
from planner.physics.constants import mu_0
from planner.setup import Setup
from planner.setup.geometry import body_of

#: Measuring distances from the package surface [m] (IATA PI 953).
REGULATED_DISTANCE = 2.1
FORBIDDEN_DISTANCE = 4.6


def package_field(total_moment: float, distance_from_surface: float, package_size) -> float:
    """Upper bound of |B| [T] at ``distance_from_surface`` [m] from a package of magnets.

    All pieces are taken as aligned (their moments add) and as one dipole at the package's
    centre; the measuring point is on the dipole's axis (where a dipole's field is largest)
    at the distance plus the smallest half-dimension of the package (the nearest the centre
    can be to a point at that distance from the surface). Far from the package (2 m and more
    for a parcel) the dipole term dominates.
    """
    radius = distance_from_surface + min(package_size) / 2
    return float(mu_0 * 2 * total_moment / (4 * np.pi * radius**3))


def shipping_figures(setup: Setup) -> list[ShippingFigures]:
    """Figures of every `ship_package` activity."""
    magnets = {m.id: m for m in setup.magnets}
    figures = []
    for activity in setup.activities:
        if activity.kind != "ship_package":
            continue
        chosen = [magnets[i] for i in activity.magnets]
        moment = sum(m.count * float(np.linalg.norm(body_of(m).moment)) for m in chosen)
        pieces = sum(m.count for m in chosen)
        figures.append(ShippingFigures(
            activity_id=activity.id, magnet_ids=[m.id for m in chosen], pieces=pieces,
            total_moment_A_m2=moment,
            field_at_2_1_m_T=package_field(moment, REGULATED_DISTANCE, activity.package_size),
            field_at_4_6_m_T=package_field(moment, FORBIDDEN_DISTANCE, activity.package_size),
            shielded=activity.shielded,
        ))
    return figures
