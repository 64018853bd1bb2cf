"""Physical constants and exact unit definitions used by the physics, in SI units.

Written out here rather than taken from ``scipy.constants``: importing that package (with
the array-API layer it loads) cost about 0.15 s of every command's start-up, for three
numbers.

References
----------
E. Tiesinga et al., CODATA recommended values of the fundamental physical constants: 2022,
Rev. Mod. Phys. (2025); NIST SP 961 (2024) (mu_0, the same value scipy.constants gives).
3rd CGPM (1901): the standard acceleration of gravity, 9.806 65 m/s^2, exact.
International yard and pound agreement (1959): 1 in = 25.4 mm, exact.
"""
from __future__ import annotations

import math

__all__ = ["mu_0", "STANDARD_GRAVITY", "INCH"]

#: Vacuum magnetic permeability [N/A^2] (CODATA 2022; 4 pi 1e-7 to within 1e-10).
mu_0 = 1.25663706127e-06
#: Standard acceleration of gravity [m/s^2] (exact by definition).
STANDARD_GRAVITY = 9.80665
#: One inch [m] (exact by definition).
INCH = 0.0254

assert abs(mu_0 / (4e-7 * math.pi) - 1.0) < 1e-9  # the 2019 SI left mu_0 a measured 4 pi 1e-7
