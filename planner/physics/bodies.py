"""Uniformly magnetized bodies as plain geometry, the common input of every physics module.

A :class:`MagnetBody` holds only SI floats and arrays: no setup types, no units. The setup
layer (``planner.setup``) builds them; the physics modules (fields, forces, zones,
induction, eddy) take them.

Body frame
----------
Each body has its own frame whose axes are the columns of ``rotation`` expressed in the
global frame (so ``global_vector = rotation @ body_vector``). For cylinders and rings the
body z axis is the symmetry axis; for blocks the body axes run along the three edges
``size[0], size[1], size[2]``; for spheres the frame is irrelevant.

References
----------
Polarization J = mu0 * M taken equal to the remanence Br (recoil permeability 1), as in
Derby & Olbert, Am. J. Phys. 78, 229-235 (2010). Source: ../shared/reference/physics.md.
"""
from __future__ import annotations

import math

from dataclasses import dataclass, field

import numpy as np

from planner.physics.constants import mu_0

SHAPES = ("cylinder", "ring", "block", "sphere")


@dataclass(frozen=True)
class MagnetBody:
    """One uniformly magnetized body.

    Parameters
    ----------
    shape : {"cylinder", "ring", "block", "sphere"}
    center : array (3,)
        Centre of the body in the global frame [m].
    rotation : array (3, 3)
        Proper rotation; column i is body axis i in global coordinates [-].
    polarization : array (3,)
        J = mu0 M in the *global* frame [T]. Its magnitude is the remanence.
    diameter : float
        Outer diameter for cylinder, ring and sphere [m] (0 for blocks).
    height : float
        Length along the body z axis for cylinder and ring [m] (0 otherwise).
    inner_diameter : float
        Bore of a ring [m] (0 otherwise).
    size : array (3,)
        Edge lengths of a block along body x, y, z [m] (zeros otherwise).
    """

    shape: str
    center: np.ndarray
    rotation: np.ndarray
    polarization: np.ndarray
    diameter: float = 0.0
    height: float = 0.0
    inner_diameter: float = 0.0
    size: np.ndarray = field(default_factory=lambda: np.zeros(3))

    def __post_init__(self):
        if self.shape not in SHAPES:
            raise ValueError(f"unknown shape {self.shape!r}")
        object.__setattr__(self, "center", np.asarray(self.center, dtype=float).reshape(3))
        object.__setattr__(self, "rotation", np.asarray(self.rotation, dtype=float).reshape(3, 3))
        object.__setattr__(self, "polarization", np.asarray(self.polarization, dtype=float).reshape(3))
        object.__setattr__(self, "size", np.asarray(self.size, dtype=float).reshape(3))

    @property
    def axis(self) -> np.ndarray:
        """Body z axis in global coordinates (symmetry axis of cylinders and rings) [-]."""
        return self.rotation[:, 2]

    @property
    def polarization_body(self) -> np.ndarray:
        """J expressed in the body frame [T]."""
        return self.polarization.dot(self.rotation)  # R^T J; ndarray.dot: less call overhead than @

    @property
    def volume(self) -> float:
        """Volume [m^3]."""
        if self.shape == "cylinder":
            return np.pi * self.diameter**2 / 4 * self.height
        if self.shape == "ring":
            return np.pi * (self.diameter**2 - self.inner_diameter**2) / 4 * self.height
        if self.shape == "block":
            return float(np.prod(self.size))
        return np.pi * self.diameter**3 / 6

    @property
    def moment(self) -> np.ndarray:
        """Magnetic dipole moment m = J V / mu0 [A m^2]."""
        return self.polarization * self.volume / mu_0

    @property
    def bounding_radius(self) -> float:
        """Radius of the smallest centred sphere that holds the body [m]."""
        if self.shape in ("cylinder", "ring"):
            return math.hypot(self.diameter / 2, self.height / 2)
        if self.shape == "block":
            return float(np.linalg.norm(self.size) / 2)
        return self.diameter / 2

    def to_body(self, points: np.ndarray) -> np.ndarray:
        """Global points (n, 3) [m] -> body-frame points (n, 3) [m]."""
        return (np.asarray(points, dtype=float) - self.center) @ self.rotation

    def to_global(self, vectors: np.ndarray) -> np.ndarray:
        """Body-frame vectors (n, 3) -> global vectors (n, 3)."""
        return np.asarray(vectors, dtype=float) @ self.rotation.T


def rotation_from_axis(axis) -> np.ndarray:
    """A proper rotation whose third column is the unit vector along ``axis``.

    The first column is chosen deterministically (perpendicular to the axis and as close
    to global x as possible, else global y), so the same axis always gives the same frame.

    >>> R = rotation_from_axis([0, 0, 1]); bool(np.allclose(R, np.eye(3)))
    True
    """
    z = np.asarray(axis, dtype=float)
    z = z / np.linalg.norm(z)
    ref = np.array([1.0, 0.0, 0.0]) if abs(z[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    x = ref - z * (ref @ z)
    x /= np.linalg.norm(x)
    y = np.cross(z, x)
    return np.column_stack([x, y, z])


def plane_basis(normal):
    """Two unit vectors (each (..., 3)) spanning the plane perpendicular to each unit ``normal``
    (..., 3): the first is perpendicular to global x as well (to global y where the normal is
    within 26 degrees of x), the second is normal x first, so (first, second, normal) is
    right-handed.

    >>> first, second = plane_basis(np.array([0.0, 0.0, 1.0])); first.tolist(), second.tolist()
    ([0.0, 1.0, 0.0], [-1.0, 0.0, 0.0])
    """
    normal = np.asarray(normal, dtype=float)
    helper = np.where(np.abs(normal[..., :1]) < 0.9, [1.0, 0.0, 0.0], [0.0, 1.0, 0.0])
    first = cross(normal, helper)
    first = first / np.linalg.norm(first, axis=-1, keepdims=True)
    return first, cross(normal, first)


def cross(a, b):
    """a x b over the last axis (length 3), the products of :func:`numpy.cross` written out:
    the same values, without its checks and axis moves, which cost several times more on
    the short arrays of the keep-out proofs (called once per batch of caps)."""
    a0, a1, a2 = a[..., 0], a[..., 1], a[..., 2]
    b0, b1, b2 = b[..., 0], b[..., 1], b[..., 2]
    return np.stack([a1 * b2 - a2 * b1, a2 * b0 - a0 * b2, a0 * b1 - a1 * b0], axis=-1)


def rotation_about(axis, angle: float) -> np.ndarray:
    """Rotation matrix of a right-handed turn by ``angle`` [rad] about ``axis`` (Rodrigues' formula).

    R = I + sin(a) K + (1 - cos(a)) K^2 with K the cross-product matrix of the unit axis.

    >>> bool(np.allclose(rotation_about([0, 0, 1], np.pi / 2) @ [1, 0, 0], [0, 1, 0]))
    True
    """
    x, y, z = np.asarray(axis, dtype=float) / np.linalg.norm(axis)
    k = np.array([[0, -z, y], [z, 0, -x], [-y, x, 0]])
    return np.eye(3) + np.sin(angle) * k + (1 - np.cos(angle)) * (k @ k)


def inside(body: MagnetBody, points, margin: float = 0.0) -> np.ndarray:
    """True for points strictly inside ``body`` shrunk by ``margin`` [m] on every face.

    Parameters
    ----------
    body : MagnetBody
    points : array (n, 3)
        Global points [m].
    margin : float
        Distance [m] by which the body is shrunk first, so touching bodies do not count.
    """
    local = body.to_body(np.atleast_2d(points))
    if body.shape in ("cylinder", "ring"):
        rho = np.hypot(local[:, 0], local[:, 1])
        result = (rho < body.diameter / 2 - margin) & (np.abs(local[:, 2]) < body.height / 2 - margin)
        if body.shape == "ring":
            result &= rho > body.inner_diameter / 2 + margin
        return result
    if body.shape == "block":
        return np.all(np.abs(local) < body.size / 2 - margin, axis=1)
    return np.linalg.norm(local, axis=1) < body.diameter / 2 - margin


def distance_to_body(body: MagnetBody, points) -> np.ndarray:
    """Distance [m] from global points (n, 3) [m] to the solid ``body``; 0 inside it."""
    local = body.to_body(points)
    if body.shape == "sphere":
        return np.maximum(np.linalg.norm(local, axis=1) - body.diameter / 2, 0.0)
    if body.shape == "block":
        return np.linalg.norm(np.maximum(np.abs(local) - body.size / 2, 0.0), axis=1)
    radial = np.hypot(local[:, 0], local[:, 1])
    beyond_end = np.maximum(np.abs(local[:, 2]) - body.height / 2, 0.0)
    beside = np.maximum(radial - body.diameter / 2, 0.0)
    if body.shape == "ring":
        beside = np.where(radial < body.inner_diameter / 2, body.inner_diameter / 2 - radial, beside)
    return np.hypot(beside, beyond_end)


def sample_points(body: MagnetBody, per_axis: int = 9) -> np.ndarray:
    """A regular grid of points in ``body``, its surface included (n, 3) [m], for overlap checks."""
    t = np.linspace(-1.0, 1.0, per_axis)  # the ends lie on the surface, so shallow overlaps are caught
    u, v, w = np.meshgrid(t, t, t, indexing="ij")
    unit = np.column_stack([u.ravel(), v.ravel(), w.ravel()])
    if body.shape in ("cylinder", "ring"):
        local = unit * np.array([body.diameter / 2, body.diameter / 2, body.height / 2])
    elif body.shape == "block":
        local = unit * body.size / 2
    else:
        local = unit * body.diameter / 2
    points = local @ body.rotation.T + body.center
    return points[inside(body, points, margin=-1e-9 * body.bounding_radius)]


def surface_extent_across(body: MagnetBody, axis, samples: int = 720) -> float:
    """Largest distance [m] of the body from a line through its centre along ``axis``.

    This is the radius of the smallest bore, coaxial with ``axis`` and centred on the body,
    through which the body passes (used for coil and tube clearance).
    """
    axis = np.asarray(axis, dtype=float) / np.linalg.norm(axis)
    if body.shape == "sphere":
        return body.diameter / 2
    if body.shape == "block":
        signs = np.array([[sx, sy, sz] for sx in (-1, 1) for sy in (-1, 1) for sz in (-1, 1)], dtype=float)
        corners = (signs * body.size / 2) @ body.rotation.T
    else:
        phi = np.linspace(0, 2 * np.pi, samples, endpoint=False)
        rim = np.column_stack([np.cos(phi), np.sin(phi), np.zeros_like(phi)]) * body.diameter / 2
        top, bottom = rim.copy(), rim.copy()
        top[:, 2], bottom[:, 2] = body.height / 2, -body.height / 2
        corners = np.vstack([top, bottom]) @ body.rotation.T
    across = corners - np.outer(corners @ axis, axis)
    # The rim is sampled; the chord error is below r (1 - cos(pi / samples)), added to stay safe.
    return float(np.max(np.linalg.norm(across, axis=1)) * (1 + (1 - np.cos(np.pi / samples))))
