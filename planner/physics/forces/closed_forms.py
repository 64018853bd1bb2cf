"""Exact forces for two common arrangements: coaxial cylinders and parallel cuboids.

References
----------
J. L. G. Akoun and J. P. Yonnet, "3D analytical calculation of the forces exerted between
two cuboidal magnets", IEEE Trans. Magn. 20(5), 1962-1964 (1984).
D. Vokoun, M. Beleggia, L. Heller and P. Sittner, "Magnetostatic interactions and forces
between cylindrical permanent magnets", J. Magn. Magn. Mater. 321, 3758-3763 (2009).
G. N. Watson, *A Treatise on the Theory of Bessel Functions*, 2nd ed., Cambridge (1944),
sec. 11.2 (Neumann's addition theorem) and 13.2 (Lipschitz' integral).
"""
from __future__ import annotations

import numpy as np

from planner.physics.constants import mu_0
from planner.physics.gauss import gauss_panels


def _graded_gauss_on_angle(levels: int = 48, order: int = 8):
    """Composite Gauss-Legendre nodes on [0, pi], graded geometrically toward 0."""
    return gauss_panels(np.concatenate([[0.0], np.pi * 2.0 ** -np.arange(levels, -1, -1.0)]), order)


_ANGLE_NODES, _ANGLE_WEIGHTS = _graded_gauss_on_angle()
_ANGLE_COS = np.cos(_ANGLE_NODES)
_ANGLE_HALF_SINE_SQUARED = np.sin(_ANGLE_NODES / 2) ** 2


def bessel_pair_integral(radius_1: float, radius_2: float, distance) -> np.ndarray:
    """I(z) = integral_0^inf J1(k a) J1(k b) exp(-k z) dk / k for z >= 0.

    Parameters
    ----------
    radius_1, radius_2 : float
        a, b [m], positive.
    distance : float or array
        z >= 0 [m].

    Returns
    -------
    ndarray
        I(z) [-], the shape of ``distance``.

    Notes
    -----
    Neumann's addition theorem, J1(ka) J1(kb) = (1/pi) integral_0^pi J0(k rho) cos phi dphi
    with rho^2 = a^2 + b^2 - 2ab cos phi = (a - b)^2 + 4ab sin^2(phi/2), and Lipschitz' integral of J0(k rho) exp(-kz),
    integrated once in z (the divergent constant drops out against integral cos phi = 0), give

        I(z) = -(1/pi) integral_0^pi cos(phi) ln(z + sqrt(z^2 + rho^2)) dphi,

    a smooth one-dimensional integral, done by composite Gauss-Legendre quadrature graded
    toward phi = 0 where the logarithm is nearly singular for z -> 0 and a -> b. Far away
    I -> ab / (4 z^2). Accurate to ~1e-12 relative, including z = 0.

    References
    ----------
    Watson (1944), sec. 11.2 and 13.2; Vokoun et al. (2009), eq. (8).

    Examples
    --------
    >>> round(float(bessel_pair_integral(1.0, 1.0, 0.0)), 10)  # Weber-Schafheitlin: 1/2
    0.5
    """
    z = np.asarray(distance, dtype=float)
    rho_squared = (radius_1 - radius_2) ** 2 + 4 * radius_1 * radius_2 * _ANGLE_HALF_SINE_SQUARED
    zz = z[..., None]
    log_term = np.log(zz + np.sqrt(zz**2 + rho_squared))
    return -(log_term * (_ANGLE_COS * _ANGLE_WEIGHTS)).sum(axis=-1) / np.pi


def coaxial_cylinders_axial_force(outer_radius_1, inner_radius_1, length_1, polarization_1,
                                  outer_radius_2, inner_radius_2, length_2, polarization_2,
                                  center_distance) -> float:
    """Axial force between two coaxial, axially magnetized cylinders or rings.

    Parameters
    ----------
    outer_radius_1, inner_radius_1, length_1 : float
        Body 1 [m] (inner radius 0 for a solid cylinder).
    polarization_1 : float
        Axial J of body 1, signed along the axis from body 1 to body 2 [T].
    outer_radius_2, inner_radius_2, length_2, polarization_2 : float
        The same for body 2 [m, m, m, T].
    center_distance : float
        d, distance between the centres along the axis, d >= (L1 + L2)/2 [m].

    Returns
    -------
    float
        Force on body 2 along the axis from body 1 to body 2 [N]; negative is attraction.

    Notes
    -----
    Vokoun et al. (2009): F = -4 pi mu0 M1 M2 R1 R2 integral J1(kR1) J1(kR2)
    sinh(kL1/2) sinh(kL2/2) exp(-kd) dk/k, with M = J/mu0. Writing the sinh product as
    exponentials turns it into F = -pi mu0 M1 M2 R1 R2 [I(d - s) - I(d - s + L2) -
    I(d - s + L1) + I(d + s)], s = (L1 + L2)/2, with I from :func:`bessel_pair_integral`
    (exact at contact d = s as well). Rings by superposition of outer minus inner
    cylinders. Rigid magnets, recoil permeability 1. Far field: -3 mu0 m1 m2 / (2 pi d^4).

    References
    ----------
    Vokoun, Beleggia, Heller & Sittner, J. Magn. Magn. Mater. 321, 3758-3763 (2009).

    Examples
    --------
    >>> from planner.physics.constants import mu_0
    >>> r, L, d = 1e-3, 1e-3, 0.5  # far apart: the dipole limit
    >>> m = 1.0 * np.pi * r**2 * L / mu_0
    >>> exact = coaxial_cylinders_axial_force(r, 0, L, 1.0, r, 0, L, 1.0, d)
    >>> round(exact / (-3 * mu_0 * m * m / (2 * np.pi * d**4)), 4)
    1.0
    """
    half_sum = (length_1 + length_2) / 2
    if center_distance < half_sum * (1 - 1e-12):
        raise ValueError("the bodies overlap along the axis")
    gap = max(center_distance - half_sum, 0.0)
    distances = np.array([gap, gap + length_2, gap + length_1, gap + length_1 + length_2])
    signs = np.array([1.0, -1.0, -1.0, 1.0])
    total = 0.0
    for radius_a, sign_a in ((outer_radius_1, 1.0), (inner_radius_1, -1.0)):
        for radius_b, sign_b in ((outer_radius_2, 1.0), (inner_radius_2, -1.0)):
            if radius_a > 0 and radius_b > 0:
                values = bessel_pair_integral(radius_a, radius_b, distances)
                total += sign_a * sign_b * radius_a * radius_b * (signs @ values)
    return float(-np.pi * polarization_1 * polarization_2 / mu_0 * total)


def parallel_cuboids_force(size_1, polarization_1, size_2, polarization_2, offset) -> np.ndarray:
    """Force between two cuboids with parallel edges, both magnetized along the common z.

    Parameters
    ----------
    size_1 : array (3,)
        Edge lengths of cuboid 1 along the common x, y, z [m].
    polarization_1 : float
        J_z of cuboid 1 (signed) [T].
    size_2, polarization_2 : array (3,), float
        The same for cuboid 2.
    offset : array (3,)
        Centre of cuboid 2 minus centre of cuboid 1 [m]; the bodies must not overlap.

    Returns
    -------
    ndarray (3,)
        Force on cuboid 2 [N].

    Notes
    -----
    Akoun & Yonnet (1984): F = J1 J2 / (4 pi mu0) sum over 64 corner combinations of
    (-1)^(i+j+k+l+p+q) phi(u, v, w, r), u = alpha + A(-1)^j - a(-1)^i (likewise v, w),
    r = sqrt(u^2 + v^2 + w^2), with

    - phi_x = (v^2 - w^2)/2 ln(r - u) + u v ln(r - v) + v w atan(uv / (rw)) + r u / 2
    - phi_y = (u^2 - w^2)/2 ln(r - v) + u v ln(r - u) + u w atan(uv / (rw)) + r v / 2
    - phi_z = -u w ln(r - u) - v w ln(r - v) + u v atan(uv / (rw)) - r w

    Every term whose polynomial factor vanishes is dropped (it tends to 0); r - u is
    computed as (v^2 + w^2)/(r + u) for u > 0 to avoid cancellation; at contact (w = 0 with
    u v != 0) atan(uv/(rw)) takes its limit (pi/2) sign(uv) sign(gamma), the side of the
    touching faces on which cuboid 2 lies. Rigid magnets, recoil permeability 1.

    References
    ----------
    Akoun & Yonnet, IEEE Trans. Magn. 20(5), 1962-1964 (1984).

    Examples
    --------
    >>> force = parallel_cuboids_force([0.01] * 3, 1.0, [0.01] * 3, 1.0, [0, 0, 0.02])
    >>> bool(force[2] < 0 and abs(force[0]) < 1e-12)  # aligned magnets attract
    True
    """
    size_1, size_2 = np.asarray(size_1, float) / 2, np.asarray(size_2, float) / 2
    offset = np.asarray(offset, float)
    sign_pair = np.array([1.0, -1.0])
    # u[i, j] = alpha + A (-1)^j - a (-1)^i, with sign (-1)^(i+j)
    axes = [offset[n] + size_2[n] * sign_pair[None, :] - size_1[n] * sign_pair[:, None]
            for n in range(3)]
    u, v, w = np.meshgrid(axes[0].ravel(), axes[1].ravel(), axes[2].ravel(), indexing="ij")
    pair_sign = np.outer(sign_pair, sign_pair).ravel()
    sign = (pair_sign[:, None, None] * pair_sign[None, :, None] * pair_sign[None, None, :])
    r = np.sqrt(u**2 + v**2 + w**2)
    side = 1.0 if offset[2] >= 0 else -1.0

    def log_r_minus(a, others_squared):
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.log(np.where(a > 0, others_squared / (r + a), r - a))

    log_u = log_r_minus(u, v**2 + w**2)
    log_v = log_r_minus(v, u**2 + w**2)
    with np.errstate(divide="ignore", invalid="ignore"):
        angle = np.where(w != 0, np.arctan(u * v / (r * w)),
                         side * np.pi / 2 * np.sign(u * v))

    def term(factor, function):
        return np.where(factor != 0, factor * np.where(factor != 0, function, 0.0), 0.0)

    phi_x = (term((v**2 - w**2) / 2, log_u) + term(u * v, log_v) + term(v * w, angle) + r * u / 2)
    phi_y = (term((u**2 - w**2) / 2, log_v) + term(u * v, log_u) + term(u * w, angle) + r * v / 2)
    phi_z = (-term(u * w, log_u) - term(v * w, log_v) + term(u * v, angle) - r * w)
    prefactor = polarization_1 * polarization_2 / (4 * np.pi * mu_0)
    return prefactor * np.array([(sign * phi).sum() for phi in (phi_x, phi_y, phi_z)])
