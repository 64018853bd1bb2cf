"""Field of uniformly magnetized solid cylinders and rings, in the body frame.

Body frame: origin at the centre, z along the symmetry axis. Points are (n, 3) arrays [m];
the polarization J = mu0 M is a (3,) vector in the same frame [T]; fields are B [T].

Any magnetization is split into an axial part (Derby & Olbert's closed form) and a
transverse (diametral) part. Both come from the second derivatives of the Newtonian
potential of the cylinder, Phi(r) = (1/4 pi) integral dV' / |r - r'|, because
B = (grad grad Phi) J + J inside. The axial part gives Phi_rho_z and Phi_zz; the one extra
quantity the transverse part needs is W = Phi_rho / rho, which for a cylinder reduces to
one more pair of Bulirsch integrals (derived below, checked against an open field library
and against Laplace's equation in the tests). Caciagli et al. (2018) give an equivalent
closed form with Legendre's integrals K, E and Pi.
"""
from __future__ import annotations

import numpy as np

from planner.physics.fields.chunking import in_blocks, without_rounding_noise
from planner.physics.fields.elliptic import FULL_ACCURACY, complete_elliptic_integrals

_TINY = np.finfo(float).tiny
_AXIS_FRACTION = 3e-6  # rho below this fraction of the radius: on-axis limit of W (error a few 1e-10, measured)


def _unit_cylinder_terms(rho, z, radius, half_height, transverse, accuracy=FULL_ACCURACY):
    """Axial field per unit J (b_rho, b_z) and W = Phi_rho / rho for a cylinder [-].

    b_rho = Phi_rho_z and b_z = Phi_zz + inside are Derby & Olbert's B_rho/J and B_z/J.
    W = -(a / (pi rho)) sum_{+-} (+-) beta_+- [C(k,1,0,1) - gamma^2 C(k,gamma^2,0,1)],
    obtained by integrating the surface form grad Phi = -(1/4 pi) oint n'/|r - r'| dA' over
    z' and by parts over phi'. On the axis W -> -(1/4) sum (+-) zeta/sqrt(zeta^2 + a^2).
    The two end faces are the rows of (2, n) arrays, so that every step is one array
    operation for both.
    """
    a = radius
    zeta = np.empty((2,) + z.shape)
    np.add(z, half_height, out=zeta[0])
    np.subtract(z, half_height, out=zeta[1])
    sum_radius = rho + a
    difference = a - rho
    zeta_squared = zeta * zeta
    outer = np.sqrt(zeta_squared + sum_radius * sum_radius)
    kc = np.sqrt(zeta_squared + difference * difference) / outer
    gamma = difference / sum_radius
    # at rho = a exactly (gamma = 0, p = 0) C(kc, p, 1, gamma) -> K(kc) +- pi/(2 kc); take the
    # mean of the two sides, K(kc) = C(kc, 1, 1, 1): B_z there is the average of in and out.
    gamma_squared = gamma * gamma
    if not gamma_squared.all():  # on the rim, or so near it (|gamma| < 1e-154) that it is the same
        on_rim = gamma_squared == 0.0
        p = np.where(on_rim, 1.0, gamma_squared)
        s_axial = np.where(on_rim, 1.0, gamma)
    else:
        p, s_axial = gamma_squared, gamma
    groups = [(1.0, [(1.0, -1.0)]), (p, [(1.0, s_axial)])]
    if transverse:
        groups[1][1].append((0.0, 1.0))
        values, complete_k = complete_elliptic_integrals(kc, groups, first_kind=True, accuracy=accuracy)
    else:
        values = complete_elliptic_integrals(kc, groups, accuracy=accuracy)
    radial_terms = values[0][0] / outer
    beta = zeta / outer
    axial_terms = beta * values[1][0]
    b_rho = radial_terms[0] - radial_terms[1]
    b_rho *= a / np.pi
    b_z = axial_terms[0] - axial_terms[1]
    b_z /= sum_radius
    b_z *= a / np.pi
    if not transverse:
        return b_rho, b_z, None
    # C(kc,1,0,1) = (K - C(kc,1,1,-1))/2 by linearity in (c, s), as K = C(kc,1,1,1); for
    # kc <= 1, K > 0 and C(kc,1,1,-1) <= 0, so this adds two positive numbers: no cancellation
    sine_integral = complete_k - values[0][0]
    sine_integral *= 0.5
    bracket_terms = beta * (sine_integral - gamma_squared * values[1][1])
    near_axis = rho < _AXIS_FRACTION * a
    with np.errstate(divide="ignore", invalid="ignore"):
        w = -a / (np.pi * rho) * (bracket_terms[0] - bracket_terms[1])
    if np.any(near_axis):
        axis_terms = zeta / np.sqrt(zeta_squared + a * a)
        w_axis = -0.25 * (axis_terms[0] - axis_terms[1])
        w = np.where(near_axis, w_axis, w)
    return b_rho, b_z, w


def cylinder_field(points, diameter, height, polarization, accuracy=FULL_ACCURACY):
    """Flux density of a uniformly magnetized solid cylinder, any magnetization direction.

    Parameters
    ----------
    points : array (n, 3)
        Field points in the body frame (origin at the centre, z on the axis) [m].
    diameter, height : float
        Cylinder diameter and length [m].
    polarization : array (3,)
        J = mu0 M in the body frame [T].
    accuracy : float
        Relative error allowed in the complete elliptic integrals
        (:func:`~planner.physics.fields.elliptic.complete_elliptic_integrals`); default
        double precision. Where the two end faces' terms nearly cancel, the relative
        error of B is larger: measured up to 5 times ``accuracy`` for a 10 mm x 0.5 mm
        disc within 4 bounding radii (the tests allow 20 times).

    Returns
    -------
    ndarray (n, 3)
        B in the body frame [T].

    Notes
    -----
    Axial part (Derby & Olbert 2010), a radius, b half-length, zeta+- = z +- b,
    alpha = a / sqrt(zeta^2 + (rho+a)^2), beta = zeta / sqrt(zeta^2 + (rho+a)^2),
    gamma = (a - rho)/(a + rho), kc = sqrt((zeta^2 + (a-rho)^2)/(zeta^2 + (a+rho)^2)):

        B_rho = (J/pi) [alpha+ C(kc+,1,1,-1) - alpha- C(kc-,1,1,-1)]
        B_z = (J/pi) a/(a+rho) [beta+ C(kc+,g^2,1,g) - beta- C(kc-,g^2,1,g)]

    Transverse part J_t, with n the unit radial vector of the point and W = Phi_rho/rho
    (module docstring):

        B_t = (W + I) J_t + (-(2W + b_z)(n . J_t)) n,  B_z += b_rho (n . J_t)

    with I = 1 inside, 1/2 on a face, 0 outside. Exact everywhere; on a face the normal
    component is exact and the tangential one (which jumps there) is the mean of the two
    sides. On the two rim circles (rho = a, |z| = b) the field diverges and NaN is
    returned.

    References
    ----------
    N. Derby and S. Olbert, Am. J. Phys. 78, 229-235 (2010).
    A. Caciagli, R. J. Baars, A. P. Philipse and B. W. M. Kuipers, J. Magn. Magn. Mater.
    456, 423-432 (2018).
    R. Bulirsch, Numer. Math. 13, 305-315 (1969).

    Examples
    --------
    Derby & Olbert's check point (b, rho, z) = (1, 1, 2) in units of the radius:

    >>> B = cylinder_field([[1.0, 0.0, 2.0]], 2.0, 2.0, [0.0, 0.0, 1.0])
    >>> [round(float(v), 4) for v in B[0]]
    [0.0556, 0.0, 0.0669]
    """
    polarization = without_rounding_noise(polarization)
    return in_blocks(_cylinder_field_block, points, diameter / 2.0, height / 2.0, polarization, accuracy)


def _cylinder_field_block(points, radius, half_height, polarization, accuracy=FULL_ACCURACY):
    """:func:`cylinder_field` for one block of points (see there)."""
    x, y, z = points[:, 0], points[:, 1], points[:, 2]
    rho = np.sqrt(x * x + y * y)
    jx, jy, jz = polarization.tolist()
    transverse = jx != 0.0 or jy != 0.0
    b_rho, b_z, w = _unit_cylinder_terms(rho, z, radius, half_height, transverse, accuracy)
    field = np.empty_like(points)
    if not transverse:
        # B_x = b_rho jz cos(phi) = (b_rho jz / rho) x. On the axis x = y = 0 and b_rho is
        # exactly 0 (kc = 1 makes Bulirsch's first step give c = s = 0): dividing by the
        # smallest normal float instead of 0 gives 0 there, without a masked division.
        per_rho = b_rho * jz
        per_rho /= np.maximum(rho, _TINY)
        np.multiply(per_rho, x, out=field[:, 0])
        np.multiply(per_rho, y, out=field[:, 1])
        np.multiply(b_z, jz, out=field[:, 2])
        return field
    with np.errstate(divide="ignore", invalid="ignore"):
        cos_phi = np.where(rho > 0, x / rho, 1.0)
        sin_phi = np.where(rho > 0, y / rho, 0.0)
    field[:, 0] = b_rho * jz * cos_phi
    field[:, 1] = b_rho * jz * sin_phi
    field[:, 2] = b_z * jz
    inside = np.heaviside(radius - rho, 0.5) * np.heaviside(half_height - np.abs(z), 0.5)
    radial_j = jx * cos_phi + jy * sin_phi
    along_n = -(2.0 * w + b_z) * radial_j
    field[:, 0] += (w + inside) * jx + along_n * cos_phi
    field[:, 1] += (w + inside) * jy + along_n * sin_phi
    field[:, 2] += b_rho * radial_j
    return field


def ring_field(points, diameter, inner_diameter, height, polarization, accuracy=FULL_ACCURACY):
    """Flux density of a uniformly magnetized ring (hollow cylinder) [T].

    Parameters
    ----------
    points : array (n, 3)
        Field points in the body frame [m].
    diameter, inner_diameter, height : float
        Outer and bore diameters and length [m].
    polarization : array (3,)
        J in the body frame [T].
    accuracy : float
        As for :func:`cylinder_field`.

    Returns
    -------
    ndarray (n, 3)
        B in the body frame [T].

    Notes
    -----
    Superposition: B_ring = B_cylinder(outer) - B_cylinder(bore), exact because the field
    is linear in the magnetized volume. In the bore (outside the material) the two
    'inside' terms cancel as they should.

    References
    ----------
    N. Derby and S. Olbert, Am. J. Phys. 78, 229-235 (2010).

    Examples
    --------
    >>> B = ring_field([[0.0, 0.0, 0.05]], 0.02, 0.0, 0.01, [0.0, 0.0, 1.0])
    >>> bool(np.allclose(B, cylinder_field([[0.0, 0.0, 0.05]], 0.02, 0.01, [0, 0, 1.0])))
    True
    """
    field = cylinder_field(points, diameter, height, polarization, accuracy)
    if inner_diameter > 0:
        field = field - cylinder_field(points, inner_diameter, height, polarization, accuracy)
    return field


def cylinder_on_axis_field(distance, diameter, height, remanence):
    """Axial flux density on the axis of an axially magnetized cylinder [T].

    Parameters
    ----------
    distance : float or ndarray
        Distance from the pole face along the axis, outward, d >= 0 [m].
    diameter, height : float
        Cylinder diameter and length [m].
    remanence : float
        Br = J [T].

    Returns
    -------
    float or ndarray
        B_z [T].

    Notes
    -----
    B(d) = (Br/2) [(d + L)/sqrt((d + L)^2 + R^2) - d/sqrt(d^2 + R^2)]; at the face centre
    B = (Br/2) L / sqrt(L^2 + R^2). Exact on the axis for uniform magnetization.

    References
    ----------
    A. Camacho and V. Sosa, Rev. Mex. Fis. E 59, 8-17 (2013).

    Examples
    --------
    >>> round(float(cylinder_on_axis_field(0.0, 2.0, 2.0, 1.0)), 4)  # (1/2) 2/sqrt(5)
    0.4472
    """
    d = np.asarray(distance, dtype=float)
    radius = diameter / 2.0
    far = d + height
    value = remanence / 2.0 * (far / np.hypot(far, radius) - d / np.hypot(d, radius))
    return value if value.ndim else float(value)
