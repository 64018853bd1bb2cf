"""Contour maps drawn from the adaptively evaluated grid (planner.physics.zones.contours, refine).

References
----------
* Independent computation: ``contours.plane_grid`` evaluates ``bounds.field_with_error`` at
  every grid point (no interpolation, no proof); the adaptive grid must give the same lines
  and the same side of every threshold at every point.
* Point-dipole field B = mu0/(4 pi) (3 r (m.r) - m r^2)/r^5, |B| = mu0 m sqrt(1 + 3 cos^2 g)
  / (4 pi r^3) (Jackson, Classical Electrodynamics, 3rd ed. (1999), eq. 5.56), exact outside
  a uniformly magnetized sphere (Jackson section 5.10).
* Remainder of linear interpolation, |f - I f| <= h^2/8 max|f''| (Abramowitz & Stegun,
  Handbook of Mathematical Functions (1964), 25.2.4), checked against the exact field of
  ``planner.physics.fields`` sampled inside each cell.
* magpylib, the open field library named in reference/physics.md, as a test-only reference.
Every layout here is invented for the test.
"""
from __future__ import annotations

import numpy as np
import pytest
from scipy.constants import mu_0
from scipy.spatial import cKDTree

from planner.physics.bodies import MagnetBody, rotation_from_axis
from planner.physics.fields import field_of_bodies
from planner.physics.zones.contours import contour_lines, field_contours, field_grid, plane_grid
from planner.physics.zones.refine import interpolation_remainder, plane_points, refined_plane_grid
from tests.physics.polygons import inside, polygon_area
from tests.physics.references import magpylib_source, sphere

RNG = np.random.default_rng(20261202)


def bench_layout(count, seed):
    """Discs and blocks of assorted grades and tilts in a row (invented, like benchmarks/zones.py)."""
    rng = np.random.default_rng(seed)
    bodies = []
    for k in range(count):
        centre = [-0.3 + 0.6 * k / max(count - 1, 1), rng.uniform(-0.08, 0.08), rng.uniform(-0.01, 0.01)]
        axis = rng.normal(size=3)
        polarization = rng.choice([0.4, 1.2, 1.45]) * axis / np.linalg.norm(axis)
        if k % 3 == 2:
            bodies.append(MagnetBody("block", centre, rotation_from_axis(axis), polarization,
                                     size=rng.uniform(5e-3, 20e-3, size=3)))
        else:
            bodies.append(MagnetBody("cylinder", centre, rotation_from_axis(axis), polarization,
                                     diameter=rng.uniform(5e-3, 20e-3), height=rng.uniform(3e-3, 10e-3)))
    return bodies


def radial_square(radius=0.03):
    """Four spheres on a square, each magnetized away from the centre: B = 0 at the centre."""
    angles = np.arange(4) * np.pi / 2
    return [sphere([radius * np.cos(a), radius * np.sin(a), 0], 1.2 * np.array([np.cos(a), np.sin(a), 0]))
            for a in angles]


def hausdorff(a, b):
    """Largest distance from a vertex of either polyline to the nearest vertex of the other [m]."""
    return max(cKDTree(b).query(a)[0].max(), cKDTree(a).query(b)[0].max())


def assert_same_lines(lines, reference, spacing):
    """Same number of lines, each within one grid spacing of its own partner."""
    assert len(lines) == len(reference)
    unmatched = list(range(len(reference)))
    for line in lines:
        distances = [hausdorff(line, reference[k]) for k in unmatched]
        best = int(np.argmin(distances))
        assert distances[best] <= spacing
        unmatched.pop(best)


def dipole_contour_radius(moment, directions, threshold):
    """r at which |B| = threshold along unit directions: mu0 m sqrt(1 + 3 cos^2 g)/(4 pi r^3) (eq. 5.56)."""
    cosine = directions @ (moment / np.linalg.norm(moment))
    return (mu_0 * np.linalg.norm(moment) * np.sqrt(1 + 3 * cosine**2) / (4 * np.pi * threshold)) ** (1 / 3)


# --- adaptive grid against the fully evaluated grid ---------------------------------------

LAYOUTS = {
    "bench row, plan": (lambda: bench_layout(8, 3), [0.5e-3, 1e-3, 3e-3, 0.1], "plan", 0.0),
    "bench row, elevation through the magnets": (lambda: bench_layout(6, 4), [0.5e-3, 2e-3, 0.4], "elevation", 0.0),
    "radial square, plan (holes)": (radial_square, [0.5e-3, 2e-3, 5e-3, 0.02], "plan", 0.0),
    "tilted dipole, plan": (lambda: [sphere([0.01, -0.02, 0], [0.6, 0.3, 0.9])], [0.5e-3, 1e-3, 3e-3], "plan", 0.0),
    "ring above the plane": (lambda: [MagnetBody("ring", [0, 0, 0.02], rotation_from_axis([0.3, 0, 1]),
                                                 [0.3, 0, 1.2], diameter=0.03, height=0.01, inner_diameter=0.012)],
                             [0.5e-3, 3e-3, 30e-3], "plan", 0.0),
}


@pytest.mark.parametrize("name", LAYOUTS)
def test_adaptive_grid_draws_the_lines_of_the_full_grid(name):
    make, thresholds, view, offset = LAYOUTS[name]
    bodies = make()
    resolution = 181
    u, v, adaptive = field_grid(bodies, thresholds, view, offset, resolution)
    # Independent computation: every point evaluated by field_with_error on the same extent.
    _, _, full = plane_grid(bodies, view, offset, (u[0], u[-1], v[0], v[-1]), resolution, 2e-3 * min(thresholds))
    spacing = max(u[1] - u[0], v[1] - v[0])
    for threshold in thresholds:
        # The proof in refine's docstring: the same side of every threshold at every point ...
        assert np.array_equal(adaptive > threshold, full > threshold)
        # ... so the same lines (asked: same count, each within a grid spacing).
        lines = contour_lines(u, v, adaptive, threshold)
        assert lines, f"no line at {threshold} T"
        assert_same_lines(lines, contour_lines(u, v, full, threshold), spacing)


def test_adaptive_grid_evaluates_fewer_points_and_keeps_values_where_lines_cross():
    bodies = bench_layout(8, 3)
    thresholds = np.array([0.5e-3, 1e-3, 3e-3])
    extent = (-0.45, 0.45, -0.25, 0.25)
    u, v, adaptive, count = refined_plane_grid(bodies, thresholds, "plan", 0.0, extent, 201, 1e-6)
    _, _, full = plane_grid(bodies, "plan", 0.0, extent, 201, 1e-6)  # independent full evaluation
    assert count < 0.6 * 201**2  # the point of the method: most of the map is not evaluated
    for threshold in thresholds:
        above = full > threshold
        corners = np.stack([above[:-1, :-1], above[1:, :-1], above[:-1, 1:], above[1:, 1:]])
        crossed = corners.any(axis=0) & ~corners.all(axis=0)
        rows, columns = np.nonzero(crossed)
        for dr in (0, 1):
            for dc in (0, 1):
                # Identity: the corners of crossed cells hold the very values of the full grid.
                assert np.allclose(adaptive[rows + dr, columns + dc], full[rows + dr, columns + dc],
                                   rtol=1e-12, atol=0)


def test_grid_grows_from_a_small_first_extent_and_matches_the_full_grid():
    bodies = radial_square()
    thresholds = [1e-3, 5e-3]
    u, v, adaptive = field_grid(bodies, thresholds, "plan", 0.0, 121, extent=(-0.02, 0.02, -0.02, 0.02))
    # At (7 cm, 0) the sphere at (3 cm, 0) gives 1.6 mT along its axis, the far one 0.1 mT against
    # it and the other two at most 0.23 mT each (eq. 5.56): |B| > 1 mT, so the grid must reach past it.
    assert u[-1] > 0.07
    _, _, full = plane_grid(bodies, "plan", 0.0, (u[0], u[-1], v[0], v[-1]), 121, 2e-6)
    border = np.concatenate([full[0], full[-1], full[:, 0], full[:, -1]])
    assert border.max() < 1e-3  # the stopping rule, checked on the independent full grid
    for threshold in thresholds:
        assert np.array_equal(adaptive > threshold, full > threshold)


# --- lines against the analytic dipole (Jackson eq. 5.56) ---------------------------------

@pytest.mark.parametrize("moment_direction", [[0, 0, 1], [1, 0, 0], [0.6, 0.3, 0.9]])
def test_single_dipole_lines_follow_the_analytic_contour(moment_direction):
    direction = np.asarray(moment_direction, float) / np.linalg.norm(moment_direction)
    ball = sphere([0, 0, 0], 1.3 * direction)
    thresholds = [0.5e-3, 1e-3, 4e-3]
    u, v, magnitude = field_grid([ball], thresholds, "plan", 0.0, 241)
    spacing = max(u[1] - u[0], v[1] - v[0])
    areas = []
    for threshold in thresholds:
        (line,) = contour_lines(u, v, magnitude, threshold)  # one closed line per threshold
        assert np.allclose(line[0], line[-1])
        points = np.c_[line, np.zeros(len(line))]
        radius = np.linalg.norm(points, axis=1)
        exact = dipole_contour_radius(ball.moment, points / radius[:, None], threshold)
        # Jackson eq. 5.56: within a grid spacing of the exact line, and not inside it by more.
        assert np.abs(radius - exact).max() <= spacing
        assert (radius - exact).min() >= -spacing
        areas.append(polygon_area(line))
    assert areas[0] > areas[1] > areas[2]  # |B| >= 4 mT implies |B| >= 1 mT >= 0.5 mT: nested


def test_dipole_in_its_meridian_plane_matches_axis_and_equator():
    ball = sphere([0, 0, 0], [0, 0, 1.2])
    moment = float(np.linalg.norm(ball.moment))
    threshold = 1e-3
    (line,) = field_contours([ball], [threshold], view="elevation", resolution=201)[threshold]
    u, v, _ = field_grid([ball], [threshold], "elevation", 0.0, 201)
    spacing = u[1] - u[0]
    # Elevation (x, z): axis r = (mu0 m / 2 pi B)^(1/3), equator (mu0 m / 4 pi B)^(1/3) (eq. 5.56).
    assert np.abs(line[:, 1]).max() == pytest.approx((mu_0 * moment / (2 * np.pi * threshold)) ** (1 / 3), abs=spacing)
    assert np.abs(line[:, 0]).max() == pytest.approx((mu_0 * moment / (4 * np.pi * threshold)) ** (1 / 3), abs=spacing)


# --- nested and closed lines --------------------------------------------------------------

def test_radial_square_has_a_hole_around_its_field_free_centre():
    bodies = radial_square()
    lines = field_contours(bodies, [2e-3, 5e-3, 0.02], view="plan", resolution=201)
    centre = np.zeros((1, 2))
    for threshold in (2e-3, 5e-3):
        # Symmetry: the four fields cancel at the centre (|B| = 0), which the region must leave out.
        outer, hole = sorted(lines[threshold], key=lambda line: -np.ptp(line[:, 0]))
        assert len(lines[threshold]) == 2
        assert inside(outer, hole).all()  # nested: the hole lies within the outer line
        assert inside(hole, centre).all() and inside(outer, centre).all()
        magnets = np.array([b.center[:2] for b in bodies])
        assert inside(outer, magnets).all() and not inside(hole, magnets).any()
    # At 20 mT each sphere has its own line: midway between neighbours (2.1 cm from each, at 45
    # degrees to both moments) each gives mu0 m sqrt(1 + 3/2) / (4 pi r^3) = 8.3 mT (eq. 5.56),
    # together at most 16.6 mT < 20 mT, so the four regions do not join.
    assert len(lines[0.02]) == 4
    for line in sum(lines.values(), []):
        assert np.allclose(line[0], line[-1])  # closed


def test_lines_stay_inside_the_grid_and_are_closed_for_a_bench_row():
    bodies = bench_layout(8, 3)
    thresholds = [0.5e-3, 1e-3, 3e-3]
    u, v, magnitude = field_grid(bodies, thresholds, "plan", 0.0, 201)
    spacing = u[1] - u[0]
    for threshold in thresholds:
        for line in contour_lines(u, v, magnitude, threshold):
            assert np.allclose(line[0], line[-1])
            # The border lies below the lowest threshold, so no line touches it.
            assert line[:, 0].min() > u[0] + 0.5 * spacing and line[:, 0].max() < u[-1] - 0.5 * spacing
            assert line[:, 1].min() > v[0] + 0.5 * spacing and line[:, 1].max() < v[-1] - 0.5 * spacing


# --- the proof's inequality ---------------------------------------------------------------

REMAINDER_BODIES = [
    MagnetBody("cylinder", [0, 0, 0], rotation_from_axis([0.4, 0.2, 1]), [0.3, 0.1, 1.2], diameter=0.02, height=0.01),
    MagnetBody("block", [0.05, 0.01, 0], rotation_from_axis([1, 0.3, 0.2]), [1.3, 0.2, 0.1], size=[0.02, 0.01, 0.005]),
]


@pytest.mark.parametrize("cell", [0.002, 0.01, 0.04])
def test_interpolation_remainder_bounds_the_exact_field_between_corners(cell):
    """A&S 25.2.4 applied along u then v: |B - P| <= E2 at points sampled inside each cell."""
    rng = np.random.default_rng(7)
    corners_u = rng.uniform(-0.12, 0.15, 40)
    corners_v = rng.uniform(-0.1, 0.1, 40)
    centres = plane_points("plan", 0.003, corners_u + cell / 2, corners_v + cell / 2)
    bound = interpolation_remainder(REMAINDER_BODIES, centres, np.full(40, cell), np.full(40, cell))
    finite = np.isfinite(bound)
    assert finite.sum() >= 20  # most cells are clear of the magnets
    s, t = rng.uniform(size=(2, 25))
    for k in np.flatnonzero(finite):
        u0, v0 = corners_u[k], corners_v[k]
        corner = field_of_bodies(REMAINDER_BODIES, plane_points(
            "plan", 0.003, np.array([u0, u0 + cell, u0, u0 + cell]), np.array([v0, v0, v0 + cell, v0 + cell])))
        inner = field_of_bodies(REMAINDER_BODIES, plane_points("plan", 0.003, u0 + s * cell, v0 + t * cell))
        blend = ((1 - t)[:, None] * ((1 - s)[:, None] * corner[0] + s[:, None] * corner[1])
                 + t[:, None] * ((1 - s)[:, None] * corner[2] + s[:, None] * corner[3]))
        assert np.linalg.norm(inner - blend, axis=1).max() <= bound[k]


# --- the open field library as an outside reference ---------------------------------------

def test_lines_match_those_of_the_reference_library_field():
    magpylib = pytest.importorskip("magpylib")
    disc = MagnetBody("cylinder", [0.01, 0, 0], rotation_from_axis([1, 0, 1]), [0.8, 0, 0.8],
                      diameter=0.02, height=0.01)
    source = magpylib_source(disc, magpylib)
    thresholds = [0.5e-3, 3e-3, 20e-3]
    u, v, magnitude = field_grid([disc], thresholds, "plan", 0.0, 161)
    uu, vv = np.meshgrid(u, v)
    reference = np.linalg.norm(source.getB(plane_points("plan", 0.0, uu.ravel(), vv.ravel())), axis=1)
    reference = reference.reshape(uu.shape)
    spacing = u[1] - u[0]
    for threshold in thresholds:
        assert_same_lines(contour_lines(u, v, magnitude, threshold),
                          contour_lines(u, v, reference, threshold), spacing)
