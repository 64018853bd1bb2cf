"""Outside and independent references shared by the field and force tests and benchmarks/forces.py.

* :func:`magpylib_source`: a MagnetBody handed to magpylib, the open field library named in
  reference/physics.md (test-only dependency). magpylib works in SI units (positions in m,
  B in T) and takes the polarization J = mu0 M [T] in the magnet's own (rotated) frame; a
  cylinder is given by (diameter, height), a hollow cylinder by (inner radius, outer radius,
  height, start and end angle in degrees), a cuboid by its edge lengths, a sphere by its
  diameter. Our MagnetBody holds J in the global frame, so it is turned into the body frame
  before it is handed over.
* :func:`tilted_magnet`: one cylinder, ring, block or cube of fixed size, tilt and
  polarization, for the checks of bounds against finite differences of the exact field.
* :func:`sphere`: a uniformly magnetized sphere, whose exterior field is exactly that of a
  point dipole of moment J V / mu0 (Jackson, Classical Electrodynamics, 3rd ed. (1999),
  section 5.10, eq. 5.56): the body of the dipole checks of the zone tests.
* :func:`plain_reference`: force and torque by the plain adaptive quadrature, independent of
  the program's whole-face first pass, its extrapolated error estimate and its target-frame
  field.
"""
from __future__ import annotations

import numpy as np

from planner.physics.bodies import MagnetBody
from planner.physics.fields import field_of_body


def sphere(centre, polarization, diameter=0.01):
    """A sphere of ``diameter`` [m] at ``centre`` [m], uniformly polarized ``polarization`` [T]."""
    return MagnetBody("sphere", centre, np.eye(3), polarization, diameter=diameter)


def tilted_magnet(shape):
    """A ``shape`` ("cylinder", "ring", "block" or "cube") at the origin, tilted, with J = (0.4, -0.3, 1.1) T:
    30 mm across and 6 mm high (bore 12 mm), a 30 x 20 x 8 mm block or a 20 mm cube."""
    from planner.physics.bodies import rotation_from_axis

    rotation, polarization = rotation_from_axis([0.3, -0.2, 1.0]), [0.4, -0.3, 1.1]
    if shape in ("block", "cube"):
        return MagnetBody("block", [0, 0, 0], rotation, polarization,
                          size=[0.03, 0.02, 0.008] if shape == "block" else [0.02, 0.02, 0.02])
    return MagnetBody(shape, [0, 0, 0], rotation, polarization, diameter=0.03, height=0.006,
                      inner_diameter=0.012 if shape == "ring" else 0.0)


def magpylib_source(body, magpylib=None):
    """The magpylib magnet of the same shape, size, placement and polarization as ``body``.

    ``magpylib`` is the imported module (e.g. from ``pytest.importorskip``); imported here if
    not given.
    """
    if magpylib is None:
        import magpylib
    from scipy.spatial.transform import Rotation

    J_local = body.rotation.T @ body.polarization
    placement = dict(position=body.center, orientation=Rotation.from_matrix(body.rotation))
    if body.shape == "cylinder":
        return magpylib.magnet.Cylinder(polarization=J_local,
                                        dimension=(body.diameter, body.height), **placement)
    if body.shape == "ring":
        return magpylib.magnet.CylinderSegment(
            polarization=J_local,
            dimension=(body.inner_diameter / 2, body.diameter / 2, body.height, 0, 360),
            **placement)
    if body.shape == "block":
        return magpylib.magnet.Cuboid(polarization=J_local, dimension=body.size, **placement)
    return magpylib.magnet.Sphere(polarization=J_local, diameter=body.diameter, **placement)


def plain_reference(target, source, rtol=1e-8):
    """Force and torque by the plain adaptive quadrature: two Gauss orders (8, 12), their
    difference as error estimate, over the general field function; independent of the
    whole-face first pass, of the extrapolated estimate and of the target-frame field."""
    from planner.physics.forces.charge_model import in_global_frame, surface_charge_patches
    from planner.physics.forces.quadrature import adaptive_box_integral

    maps, boxes = surface_charge_patches(target)
    c, L = target.center, target.bounding_radius

    def integrand(points, weight):
        B = field_of_body(source, points)
        values = np.concatenate([B, np.cross(points - c, B) / L], axis=1)
        return values * weight[:, None]

    def size(v):
        return np.linalg.norm(v[..., :3], axis=-1) + np.linalg.norm(v[..., 3:], axis=-1)
    global_maps = [in_global_frame(m, target.rotation, c) for m in maps]
    total = adaptive_box_integral(global_maps, boxes, integrand, size, rtol=rtol, orders=(8, 12))
    return total[:3], total[3:] * L
