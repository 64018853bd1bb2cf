"""Direction sets on the unit sphere with known coverage, and geometric steps of distance.

A spherical triangle with vertices v1, v2, v3 lies inside the cap about its circumcentre
direction n with half-angle delta = angle(n, v1): a point of the triangle is
x = sum l_i v_i / |sum l_i v_i| with l_i >= 0, and x . n = cos(delta) sum l_i / |sum l_i v_i|
>= cos(delta). The triangles of a subdivided icosahedron tile the sphere, so their caps cover it.

References
----------
Icosahedral subdivision of the sphere: J. R. Baumgardner, P. O. Frederickson, SIAM J. Numer.
Anal. 22, 1107-1115 (1985). Fibonacci points: A. Gonzalez, Math. Geosci. 42, 49-64 (2010).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np


@lru_cache(maxsize=8)
def _icosahedron(level):
    golden = (1 + 5**0.5) / 2
    vertices = np.array(
        [[-1, golden, 0], [1, golden, 0], [-1, -golden, 0], [1, -golden, 0],
         [0, -1, golden], [0, 1, golden], [0, -1, -golden], [0, 1, -golden],
         [golden, 0, -1], [golden, 0, 1], [-golden, 0, -1], [-golden, 0, 1]], dtype=float)
    vertices /= np.linalg.norm(vertices, axis=1)[:, None]
    faces = [(0, 11, 5), (0, 5, 1), (0, 1, 7), (0, 7, 10), (0, 10, 11), (1, 5, 9), (5, 11, 4),
             (11, 10, 2), (10, 7, 6), (7, 1, 8), (3, 9, 4), (3, 4, 2), (3, 2, 6), (3, 6, 8),
             (3, 8, 9), (4, 9, 5), (2, 4, 11), (6, 2, 10), (8, 6, 7), (9, 8, 1)]
    triangles = vertices[np.array(faces)]
    for _ in range(level):
        triangles = subdivide(triangles)
    triangles.setflags(write=False)
    return triangles


def geometric_steps(start, end, count: int) -> np.ndarray:
    """``count`` values in geometric progression from ``start`` to ``end`` (each scalar or (n,),
    broadcast), giving (count,) or (n, count): start * (end / start)^f for f = 0 .. 1 evenly.

    >>> geometric_steps(1.0, 8.0, 4).round(12).tolist()
    [1.0, 2.0, 4.0, 8.0]
    """
    start = np.asarray(start, dtype=float)[..., None]
    return start * (np.asarray(end, dtype=float)[..., None] / start) ** np.linspace(0.0, 1.0, count)


def icosahedron_triangles(level: int) -> np.ndarray:
    """Spherical triangles (20 * 4**level, 3, 3) tiling the unit sphere [-]."""
    return _icosahedron(level).copy()


@lru_cache(maxsize=8)
def icosahedron_cones(level: int):
    """Axis (n, 3) and half-angle (n,) [rad] of the cap of every triangle of
    :func:`icosahedron_triangles` (read-only arrays, computed once per level)."""
    axes, half_angles = cone_of_triangle(_icosahedron(level))
    axes.setflags(write=False)
    half_angles.setflags(write=False)
    return axes, half_angles


def child_indices(indices: np.ndarray, level: int) -> np.ndarray:
    """Indices, in the tiling of ``level + 1``, of the four children of the triangles ``indices``
    of ``level``: :func:`subdivide` lists child k of every triangle together, so child k of
    triangle p is k * 20 * 4**level + p."""
    count = 20 * 4**level
    return np.concatenate([k * count + indices for k in range(4)])


def subdivide(triangles: np.ndarray) -> np.ndarray:
    """Split each spherical triangle (n, 3, 3) into four (4n, 3, 3) at its edge midpoints."""
    a, b, c = triangles[:, 0], triangles[:, 1], triangles[:, 2]

    def middle(p, q):
        m = p + q
        return m / np.linalg.norm(m, axis=1)[:, None]

    ab, bc, ca = middle(a, b), middle(b, c), middle(c, a)
    parts = [np.stack(t, axis=1) for t in ((a, ab, ca), (ab, b, bc), (ca, bc, c), (ab, bc, ca))]
    return np.concatenate(parts, axis=0)


def cone_of_triangle(triangles: np.ndarray):
    """Axis (n, 3) and half-angle (n,) [rad] of the cap holding each spherical triangle."""
    a, b, c = triangles[:, 0], triangles[:, 1], triangles[:, 2]
    normal = np.cross(b - a, c - a)
    normal /= np.linalg.norm(normal, axis=1)[:, None]
    flip = np.sum(normal * (a + b + c), axis=1) < 0
    normal[flip] *= -1
    cosines = np.min(np.stack([np.sum(normal * v, axis=1) for v in (a, b, c)]), axis=0)
    half_angle = np.arccos(np.clip(cosines, -1.0, 1.0)) * (1 + 1e-9) + 1e-12
    return normal, half_angle


def fibonacci_directions(count: int) -> np.ndarray:
    """``count`` nearly even unit vectors (count, 3) on the sphere (golden-angle spiral)."""
    index = np.arange(count) + 0.5
    z = 1 - 2 * index / count
    angle = np.pi * (1 + 5**0.5) * index
    radial = np.sqrt(1 - z**2)
    return np.column_stack([radial * np.cos(angle), radial * np.sin(angle), z])
