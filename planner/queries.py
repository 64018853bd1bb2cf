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
