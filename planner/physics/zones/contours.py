"""Iso-field contours of the total field on a horizontal or vertical plane.

The contoured quantity is the proven upper value |B| + error of ``bounds.field_with_error``
(exact field near each magnet, dipole plus bounded remainder far away), so each drawn line
lies on or outside the true line up to the grid resolution. Lines come from contourpy
(marching squares with saddle handling); the grid grows until its whole border is below the
lowest threshold, so every line is closed and regions of neighbouring magnets that join are
one line.

The map grid is evaluated adaptively (``refine``): exactly at every corner of every grid
cell a line can cross, by proven interpolation elsewhere, so the lines are those of the
fully evaluated grid at a fraction of the cost (for an invented row of 30 magnets at seven
thresholds, 44 % of the points of a plan and 23 % of an elevation).

References
----------
W. E. Lorensen, H. E. Cline, Computer Graphics 21(4), 163-169 (1987) (marching cubes/squares,
as implemented by contourpy).
"""
from __future__ import annotations

import numpy as np
from contourpy import LineType, contour_generator

from planner.physics.constants import mu_0
from planner.physics.zones.bounds import field_with_error
from planner.physics.zones.refine import INSIDE_VALUE, VIEWS, plane_points, refined_plane_grid

__all__ = ["VIEWS", "contour_lines", "field_contours", "field_grid", "plane_grid"]


def plane_grid(bodies, view, offset, extent, resolution, allowed_error):
    """|B| upper values on a plane grid, evaluated at every point.

    Parameters
    ----------
    bodies : list of MagnetBody
    view : {"plan", "elevation"}
        Plan: the plane z = offset, coordinates (x, y). Elevation: the plane y = offset,
        coordinates (x, z).
    offset : float
        Position of the plane along its normal [m].
    extent : (u_min, u_max, v_min, v_max)
        Plane coordinates [m].
    resolution : int
        Grid points along each side.
    allowed_error : float
        Accepted error of the far-field dipole model [T].

    Returns
    -------
    u (resolution,), v (resolution,), magnitude (resolution, resolution) [m, m, T];
    ``magnitude[j, i]`` is at (u[i], v[j]).
    """
    u = np.linspace(extent[0], extent[1], resolution)
    v = np.linspace(extent[2], extent[3], resolution)
    uu, vv = np.meshgrid(u, v)
    value, error = field_with_error(bodies, plane_points(view, offset, uu.ravel(), vv.ravel()), allowed_error)
    magnitude = (value + error).reshape(uu.shape)
    return u, v, np.where(np.isfinite(magnitude), magnitude, INSIDE_VALUE)


def _first_extent(bodies, view, threshold):
    across, up, _ = VIEWS[view]
    centres = np.array([b.center for b in bodies])
    reach = np.array([(mu_0 / (2 * np.pi) * np.linalg.norm(b.moment) / threshold) ** (1 / 3) + b.bounding_radius
                      for b in bodies])
    low = np.min(centres[:, [across, up]] - reach[:, None], axis=0)
    high = np.max(centres[:, [across, up]] + reach[:, None], axis=0)
    return np.array([low[0], high[0], low[1], high[1]])


def _border(magnitude):
    return max(magnitude[0].max(), magnitude[-1].max(), magnitude[:, 0].max(), magnitude[:, -1].max())


def field_grid(bodies, thresholds, view="plan", offset=0.0, resolution=400, extent=None):
    """Plane grid for the ``thresholds``, its border below the lowest (grown by 1.5x until it is).

    Parameters
    ----------
    bodies : list of MagnetBody
    thresholds : array_like
        Flux densities whose lines the grid is for [T].
    view, offset, resolution
        As :func:`field_contours` (offset [m]).
    extent : sequence of 4 floats, optional
        First grid tried (u_min, u_max, v_min, v_max) [m].

    Returns
    -------
    u (resolution,), v (resolution,), magnitude (resolution, resolution) [m, m, T]
        As :func:`plane_grid`, with the same values at every corner of every grid cell
        that a threshold line crosses, and elsewhere values proven to lie on the same side
        of every threshold as :func:`plane_grid`'s, so contour lines and the border test
        come out the same.

    Notes
    -----
    The grid is refined from a coarse lattice (``refine.refined_plane_grid``): a cell is
    filled by interpolation when no threshold lies in the proven range of |B| + error over
    it, from its corner fields and the interpolation remainder (h_u^2 + h_v^2) M2 / 8. An
    extent is given up as soon as its coarse lattice shows a border point at or above the
    lowest threshold, before any refinement; the dipole allowance is 0.2 % of the lowest
    threshold.

    References
    ----------
    Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 25.2.4; Jackson,
    Classical Electrodynamics, 3rd ed. (1999), eq. 3.70.
    """
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    lowest = float(np.min(thresholds))
    extent = np.asarray(_first_extent(bodies, view, lowest) if extent is None else extent, float)
    for _ in range(12):
        grid = refined_plane_grid(bodies, thresholds, view, offset, extent, resolution, 2e-3 * lowest,
                                  border_limit=lowest)
        if grid is not None and _border(grid[2]) < lowest:
            return grid[:3]
        middle = np.repeat([(extent[0] + extent[1]) / 2, (extent[2] + extent[3]) / 2], 2)
        extent = middle + 1.5 * (extent - middle)
    raise RuntimeError("the field does not fall below the threshold on any plane grid tried")


def contour_lines(u, v, magnitude, threshold):
    """Closed polylines (list of (n, 2) arrays, plane coordinates [m]) of |B| = threshold.

    ``u``, ``v``, ``magnitude`` as returned by :func:`field_grid` [m, m, T]; ``threshold`` [T].
    Marching squares (Lorensen & Cline, Computer Graphics 21(4), 163-169 (1987), via
    contourpy) reads only the corner values of the cells a line crosses. Lines of fewer
    than three points are dropped; open ones (touching the grid's edge) are closed.
    """
    generator = contour_generator(x=u, y=v, z=magnitude, line_type=LineType.Separate)
    lines = []
    for line in generator.lines(threshold):
        line = np.asarray(line, dtype=float)
        if len(line) < 3:
            continue
        if not np.allclose(line[0], line[-1]):
            line = np.vstack([line, line[:1]])
        lines.append(line)
    return lines


def field_contours(bodies, thresholds, view="plan", offset=0.0, resolution=400, extent=None):
    """Contours of the total |B| for each threshold on one plane.

    Parameters
    ----------
    bodies : list of MagnetBody
    thresholds : array_like
        Flux densities [T].
    view : {"plan", "elevation"}
        Plan: plane z = offset, coordinates (x, y); elevation: plane y = offset, (x, z).
    offset : float
        Height of a plan plane (e.g. bench top 0, a seated head about 1.2 m above the
        floor expressed in the setup frame) or the y of an elevation plane [m].
    resolution : int
        Grid points per side (the grid grows until its border is below every threshold).
    extent : sequence of 4 floats, optional
        First grid tried (u_min, u_max, v_min, v_max) [m].

    Returns
    -------
    dict
        threshold [T] -> list of closed (n, 2) arrays in plane coordinates [m].

    Notes
    -----
    |B| + error is contoured, error being the proven dipole remainder of far magnets
    (at most 0.2 % of the lowest threshold), so lines sit on the safe side of the exact
    ones up to the grid spacing. Inside a magnet the field is taken as very large, so a
    plane cutting a magnet shows it inside every line.

    References
    ----------
    Lorensen & Cline, Computer Graphics 21(4), 163-169 (1987).

    Examples
    --------
    >>> from planner.physics.bodies import MagnetBody
    >>> ball = MagnetBody("sphere", [0, 0, 0], np.eye(3), [0, 0, 1.2], diameter=0.01)
    >>> lines = field_contours([ball], [1e-3], view="elevation", resolution=101)[1e-3]
    >>> len(lines), bool(np.allclose(lines[0][0], lines[0][-1]))
    (1, True)
    """
    thresholds = np.atleast_1d(np.asarray(thresholds, dtype=float))
    u, v, magnitude = field_grid(bodies, thresholds, view, offset, resolution, extent)
    return {float(t): contour_lines(u, v, magnitude, t) for t in thresholds}
