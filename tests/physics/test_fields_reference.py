"""Field models against the open field library named in physics.md (test-only reference).

The reference library works in SI units (positions in m, B in T) and takes the
polarization J = mu0 M [T] in the magnet's own (rotated) frame; a cylinder is given by
(diameter, height), a hollow cylinder by (inner radius, outer radius, height, start and
end angle in degrees), a cuboid by its edge lengths. Our MagnetBody holds J in the global
frame, so it is turned into the body frame before it is handed over
(``tests.physics.references.magpylib_source``).
"""
import numpy as np
import pytest

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import field_of_body
from tests.physics.references import magpylib_source

reference = pytest.importorskip("magpylib")

POINTS_PER_CASE = 2000
ROTATIONS = {
    "aligned": np.eye(3),
    "rotated": rotation_from_axis([0.3, -0.5, 0.8]) @ rotation_from_axis([0.1, 0.9, 0.2]).T,
}
POLARIZATIONS = {  # in the body frame [T]
    "axial": np.array([0.0, 0.0, 1.3]),
    "diametral": np.array([1.1, -0.4, 0.0]),
    "tilted": np.array([0.5, -0.7, 0.9]),
}


def make_body(shape, rotation, J_body):
    centre = np.array([0.004, -0.01, 0.02])
    sizes = dict(
        cylinder=dict(diameter=0.02, height=0.012),
        ring=dict(diameter=0.025, inner_diameter=0.01, height=0.008),
        block=dict(size=[0.02, 0.01, 0.015]),
        sphere=dict(diameter=0.015),
    )[shape]
    return MagnetBody(shape, centre, rotation, rotation @ J_body, **sizes)


def points_outside(body, rng):
    """Random points in a box of 6 bounding radii around the body, outside its material."""
    box = body.center + rng.uniform(-3, 3, (3 * POINTS_PER_CASE, 3)) * body.bounding_radius
    local = body.to_body(box)
    if body.shape in ("cylinder", "ring"):
        rho = np.hypot(local[:, 0], local[:, 1])
        inside = (rho <= body.diameter / 2) & (np.abs(local[:, 2]) <= body.height / 2)
        inside &= rho >= body.inner_diameter / 2
    elif body.shape == "block":
        inside = np.all(np.abs(local) <= body.size / 2, axis=1)
    else:
        inside = np.linalg.norm(local, axis=1) <= body.diameter / 2
    return box[~inside][:POINTS_PER_CASE]


CASES = [(shape, orientation, polarization)
         for shape in ("cylinder", "ring", "block", "sphere")
         for orientation in ROTATIONS
         for polarization in POLARIZATIONS]


@pytest.mark.parametrize("shape, orientation, polarization", CASES)
def test_matches_reference_library(shape, orientation, polarization):
    # reference: magpylib (physics.md names it as the test-only field library)
    body = make_body(shape, ROTATIONS[orientation], POLARIZATIONS[polarization])
    rng = np.random.default_rng(CASES.index((shape, orientation, polarization)))
    points = points_outside(body, rng)
    assert len(points) >= 1000
    ours = field_of_body(body, points)
    theirs = magpylib_source(body, reference).getB(points)
    magnitude = np.linalg.norm(theirs, axis=1)
    assert np.max(np.abs(np.linalg.norm(ours, axis=1) - magnitude) / magnitude) <= 1e-6
    assert np.max(np.linalg.norm(ours - theirs, axis=1) / magnitude) <= 1e-6


@pytest.mark.parametrize("shape", ["cylinder", "ring", "block"])
def test_matches_reference_library_inside(shape):
    # inside the material too (B includes J there); same reference
    body = make_body(shape, ROTATIONS["rotated"], POLARIZATIONS["tilted"])
    rng = np.random.default_rng(7)
    local = rng.uniform(-0.45, 0.45, (4000, 3))
    if shape == "block":
        local *= body.size
    else:
        local *= [body.diameter, body.diameter, body.height]
        rho = np.hypot(local[:, 0], local[:, 1])
        local = local[(rho < body.diameter / 2 * 0.95) & (rho > body.inner_diameter / 2 * 1.05)]
    points = body.center + local @ body.rotation.T
    ours = field_of_body(body, points)
    theirs = magpylib_source(body, reference).getB(points)
    magnitude = np.linalg.norm(theirs, axis=1)
    assert np.max(np.linalg.norm(ours - theirs, axis=1) / magnitude) <= 1e-6
