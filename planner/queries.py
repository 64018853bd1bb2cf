"""Direct questions on a setup: the field at points, the force on a magnet, keep-out distances.

These are the bodies of the public API functions re-exported by ``planner``.
"""
from __future__ import annotations

import numpy as np

from planner.setup import Setup
from planner.setup.geometry import bodies_of, magnet_index


def field(setup: Setup, points) -> np.ndarray:
    """Flux density B [T] at ``points`` [m], summed over every magnet in the setup.

    Parameters
    ----------
    setup : Setup
    points : array (n, 3) or (3,)
        Points in the setup frame [m].

    Returns
    -------
    ndarray
        B [T], the same shape as ``points``.

    Notes
    -----
    Each magnet is a uniformly magnetized body with J = Br (recoil permeability 1), which
    overstates the field by a few percent: the safe side for keep-out lines.
    """
    from planner.physics.fields import field_of_bodies

    points = np.asarray(points, dtype=float)
    if points.shape[-1] != 3 or points.ndim not in (1, 2):
        raise ValueError(f"points must have shape (n, 3) or (3,); got {points.shape}")
    bodies = bodies_of(setup)
    if not bodies:
        return np.zeros_like(points)
    return field_of_bodies(bodies, points)


def resolve_magnet(setup: Setup, magnet: str | None) -> int:
    """Index of the named magnet, or of the only magnet when ``magnet`` is None."""
    if magnet is None:
        if len(setup.magnets) != 1:
            names = ", ".join(m.id for m in setup.magnets) or "none"
            raise ValueError(f"this setup has {len(setup.magnets)} magnets ({names}); name one")
        return 0
    try:
        return magnet_index(setup, magnet)
    except KeyError:
        names = ", ".join(m.id for m in setup.magnets) or "none"
        raise ValueError(f"no magnet `{magnet}` in this setup; magnets: {names}") from None


def force(setup: Setup, on: str, by: str | None = None) -> np.ndarray:
    """Force [N], shape (3,), on magnet ``on`` from magnet or steel surface ``by``.

    Parameters
    ----------
    setup : Setup
    on : str
        Id of the magnet the force acts on.
    by : str, optional
        Id of another magnet or of a steel surface; None sums over every other magnet and
        every steel surface in the setup.

    Notes
    -----
    Magnets at their places in the setup (charge model; exact closed forms for coaxial
    cylinders and parallel cuboids). Steel surfaces by the method of images: an upper bound
    (no saturation, infinitely permeable steel).
    """
    return force_and_torque(setup, on, by)[0]


def force_and_torque(setup: Setup, on: str, by: str | None = None) -> tuple[np.ndarray, np.ndarray]:
    """(force [N], torque about the magnet's centre [N m]) on ``on`` from ``by`` (see :func:`force`)."""
    from planner.physics.forces import force_and_torque as pair_force_and_torque
    from planner.physics.forces import steel_surface_force_and_torque

    bodies = bodies_of(setup)
    target = bodies[resolve_magnet(setup, on)]
    surfaces = {s.id: s for s in setup.steel_surfaces}
    ids = [m.id for m in setup.magnets]
    if by is None:
        sources = [i for i in ids if i != on] + list(surfaces)
    elif by in surfaces or by in ids:
        if by == on:
            raise ValueError(f"`{on}` cannot pull on itself")
        sources = [by]
    else:
        known = ", ".join(ids + list(surfaces))
        raise ValueError(f"no magnet or steel surface `{by}` in this setup; known: {known}")
    total_force, total_torque = np.zeros(3), np.zeros(3)
    for source in sources:
        if source in surfaces:
            surface = surfaces[source]
            f, t = steel_surface_force_and_torque(target, np.asarray(surface.at), np.asarray(surface.normal))
        else:
            f, t = pair_force_and_torque(target, bodies[ids.index(source)])
        total_force += f
        total_torque += t
    return total_force, total_torque


def keep_out_distance(setup: Setup, threshold: float, magnet: str | None = None) -> float:
    """Largest distance [m] from the magnet's centre to a point where the total |B| >= ``threshold`` [T].

    Never smaller than the exact value (conservative by construction), at most 5 % or 5 mm
    larger. With several magnets the total field of all of them is used, and a point is
    attributed to the magnet whose centre is nearest to it.
    """
    from planner.physics.zones import keep_out_radius

    if not threshold > 0:
        raise ValueError(f"threshold must be a positive flux density in tesla; got {threshold}")
    return float(keep_out_radius(bodies_of(setup), resolve_magnet(setup, magnet), float(threshold)))
