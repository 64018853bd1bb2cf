"""Plane-polygon helpers shared by the contour tests."""
from __future__ import annotations

import numpy as np


def polygon_area(line):
    """Area of a closed polyline (n, 2) by the shoelace formula."""
    x, y = line[:, 0], line[:, 1]
    return 0.5 * abs(np.dot(x, np.roll(y, 1)) - np.dot(y, np.roll(x, 1)))


def inside(polygon, points):
    """Even-odd rule point-in-polygon."""
    x, y = points[:, 0][:, None], points[:, 1][:, None]
    x0, y0 = polygon[:-1, 0][None], polygon[:-1, 1][None]
    x1, y1 = polygon[1:, 0][None], polygon[1:, 1][None]
    crosses = ((y0 > y) != (y1 > y)) & (x < x0 + (y - y0) * (x1 - x0) / (y1 - y0 + 1e-300))
    return np.sum(crosses, axis=1) % 2 == 1
