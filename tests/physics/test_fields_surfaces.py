"""Points on and near faces, rims, edges, edge extensions and the axis.

Documented behaviour (planner.physics.fields): finite values on faces, with the normal
component exact and the tangential ones the mean of the two sides; NaN on edges and rims
(where the true field diverges); never a warning. The expected values come from the field
just either side of the surface (continuity of normal B, jump of tangential B: Jackson,
Classical Electrodynamics, sec. 5.9) and from the on-axis limit.
"""
import warnings

import numpy as np
import pytest

from planner.physics.fields import block_field, cylinder_field, field_of_body, ring_field
from planner.physics.bodies import MagnetBody


@pytest.fixture(autouse=True)
def warnings_are_errors():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        yield


J_TILTED = np.array([0.5, -0.3, 0.9])
A, HALF = 0.01, 0.006  # cylinder radius and half-length [m]
SIZE = np.array([0.02, 0.012, 0.008])  # block edges [m]


def one_sided_limits(function, point, normal, offset=1e-9):
    point = np.asarray(point, float)
    outside = function([point + offset * np.asarray(normal)])[0]
    inside = function([point - offset * np.asarray(normal)])[0]
    return inside, outside


def cylinder(points):
    return cylinder_field(points, 2 * A, 2 * HALF, J_TILTED)


def block(points):
    return block_field(points, SIZE, J_TILTED)


@pytest.mark.parametrize("point, normal", [
    ([A, 0.0, 0.001], [1, 0, 0]),                     # curved face, rho = a exactly
    ([A * 0.6, A * 0.8, -0.002], [0.6, 0.8, 0]),
    ([0.003, -0.004, HALF], [0, 0, 1]),               # end face
    ([0.0, 0.0, -HALF], [0, 0, -1]),                  # end-face centre
])
def test_cylinder_faces_finite_and_mean_of_sides(point, normal):
    value = cylinder([point])[0]
    inside, outside = one_sided_limits(cylinder, point, normal)
    assert np.all(np.isfinite(value))
    np.testing.assert_allclose(value, (inside + outside) / 2, atol=2e-6)
    normal = np.asarray(normal, float)
    # normal component continuous across the face
    assert inside @ normal == pytest.approx(outside @ normal, abs=2e-6)


@pytest.mark.parametrize("point, normal", [
    ([SIZE[0] / 2, 0.001, -0.002], [1, 0, 0]),
    ([0.004, -SIZE[1] / 2, 0.001], [0, -1, 0]),
    ([-0.003, 0.002, SIZE[2] / 2], [0, 0, 1]),
])
def test_block_faces_finite_and_mean_of_sides(point, normal):
    value = block([point])[0]
    inside, outside = one_sided_limits(block, point, normal)
    assert np.all(np.isfinite(value))
    np.testing.assert_allclose(value, (inside + outside) / 2, atol=2e-6)


def test_edges_and_rims_are_nan():
    # the field diverges logarithmically on edges: documented NaN
    rim = [[A, 0.0, HALF], [0.0, -A, -HALF]]
    assert np.all(np.isnan(cylinder(rim)))
    edges = [SIZE / 2, [SIZE[0] / 2, 0.0, -SIZE[2] / 2], [0.001, SIZE[1] / 2, SIZE[2] / 2]]
    assert np.all(np.isnan(block(edges)))
    # a NaN point does not spoil its neighbours in the same call
    mixed = block([SIZE / 2, SIZE])
    assert np.all(np.isnan(mixed[0])) and np.all(np.isfinite(mixed[1]))


@pytest.mark.parametrize("direction", [[1, 1, 0], [1, 0, 1], [0, 1, 1]])
def test_block_edge_extensions_are_continuous(direction):
    # Cichon et al. (2019): points on the lines that extend an edge need care; the field
    # there is finite and continuous, so it must match points a hair away
    direction = np.asarray(direction, float)
    free_axis = int(np.argmin(direction))
    for along in (1.5, 4.0, 40.0):
        point = direction * SIZE / 2
        point[free_axis] = along * SIZE[free_axis] / 2
        value = block([point])[0]
        nudged = block([point + 1e-10 * np.array([1.0, -1.0, 1.0])])[0]
        assert np.all(np.isfinite(value))
        np.testing.assert_allclose(value, nudged, rtol=1e-6, atol=1e-12)


def test_face_plane_outside_the_face_is_continuous():
    # a point in the plane of a face but beside it: no jump, so both sides agree with it
    for function, point, normal in ((block, [SIZE[0], 0.001, SIZE[2] / 2], [0, 0, 1]),
                                    (cylinder, [2 * A, 0.001, HALF], [0, 0, 1]),
                                    (cylinder, [A, 0.0, 2 * HALF], [1, 0, 0])):
        value = function([point])[0]
        inside, outside = one_sided_limits(function, point, normal)
        np.testing.assert_allclose(value, inside, rtol=1e-6)
        np.testing.assert_allclose(value, outside, rtol=1e-6)


def test_cylinder_axis_and_near_axis_are_smooth():
    # on and near the axis the field is smooth: B(rho) = B(axis) + rho dB/drho + O(rho^2).
    # The linear term is taken from a point at rho = 1e-3 a, so the prediction is good to
    # ~1e-3 of the linear term; the points straddle the switch to the on-axis limit of W.
    reference = 1e-3 * A
    for z in (0.0, 0.004, HALF, 0.02):
        axis_value = cylinder([[0.0, 0.0, z]])[0]
        slope = (cylinder([[reference * 0.6, reference * 0.8, z]])[0] - axis_value) / reference
        for rho in (1e-14, 1e-10, 1e-9, 2.9e-8, 3.1e-8, 1e-7, 1e-6):
            near = cylinder([[rho * 0.6, rho * 0.8, z]])[0]
            np.testing.assert_allclose(near, axis_value + rho * slope,
                                       atol=2e-10 + 1e-2 * rho / A)


def test_ring_bore_and_centre_finite():
    # inside the bore of a ring the field is smooth and finite
    points = [[0.0, 0.0, 0.0], [0.001, 0.0, 0.0], [0.0, 0.002, 0.005]]
    B = ring_field(points, 0.02, 0.008, 0.01, J_TILTED)
    assert np.all(np.isfinite(B))


def test_single_point_and_empty_input_shapes():
    body = MagnetBody("block", [0, 0, 0], np.eye(3), J_TILTED, size=SIZE)
    assert field_of_body(body, [0.05, 0.0, 0.0]).shape == (3,)
    assert field_of_body(body, np.zeros((0, 3))).shape == (0, 3)
    with pytest.raises(ValueError):
        field_of_body(body, [1.0, 2.0])
