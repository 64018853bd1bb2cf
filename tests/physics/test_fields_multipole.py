"""Exterior multipole series of cylinders and rings (planner.physics.fields.multipole).

Each check names its source: the closed forms of Derby & Olbert (2010) and of the
diametral part (planner.physics.fields.cylinder, themselves checked against published values
and magpylib in test_fields*.py) as an independent computation; the moments of inertia of a
cylinder (any table of them, e.g. CRC Standard Mathematical Tables); physical identities
(div B = 0 and curl B = 0 outside the sources, the far field of any body is its dipole's,
Jackson 1999 eq. 5.56).
"""
import numpy as np
import pytest
from scipy.constants import mu_0

from planner.physics.bodies import MagnetBody
from planner.physics.fields import cylinder_field, dipole_field, ring_field, second_moments
from planner.physics.fields.multipole import (MAX_RATIO, SERIES_TOLERANCE,
                                              axisymmetric_series_field, terms_needed,
                                              zonal_moments)

SHAPES = {  # (outer radius, bore radius, half-height) [m]
    "flat disc": (10e-3, 0.0, 2.5e-3),
    "tall rod": (3e-3, 0.0, 12e-3),
    "ring": (10e-3, 4e-3, 3e-3),
}
POLARIZATIONS = ([0.0, 0.0, 1.3], [0.6, -0.4, 1.0], [1.1, 0.2, 0.0])


def points_at_ratios(reach, ratios, rng, count=400):
    """Random directions at distances reach / ratio [m] (ratio drawn from ``ratios``)."""
    direction = rng.normal(size=(count, 3))
    direction /= np.linalg.norm(direction, axis=1)[:, None]
    # include the axis and the mid-plane, where the series' polynomials take their extremes
    direction[:3] = [[0, 0, 1], [0, 0, -1], [1, 0, 0]]
    return direction * (reach / rng.choice(ratios, count))[:, None]


def closed_form(shape, points, J):
    radius, bore, half = SHAPES[shape]
    if bore:
        return ring_field(points, 2 * radius, 2 * bore, 2 * half, np.asarray(J))
    return cylinder_field(points, 2 * radius, 2 * half, np.asarray(J))


def dipole_scale(shape, points, J):
    """|J| V / (4 pi r^3), the smallest magnitude of the dipole field at each point [T]."""
    radius, bore, half = SHAPES[shape]
    volume = np.pi * (radius**2 - bore**2) * 2 * half
    return np.linalg.norm(J) * volume / (4 * np.pi * np.linalg.norm(points, axis=1) ** 3)


@pytest.mark.parametrize("shape", SHAPES)
@pytest.mark.parametrize("J", POLARIZATIONS)
def test_series_equals_the_closed_form_outside_the_bounding_sphere(shape, J):
    # independent computation: Derby & Olbert's elliptic-integral closed form (and its
    # diametral part) against the series cut where its proven rest is below 1e-10
    radius, bore, half = SHAPES[shape]
    reach = np.hypot(radius, half)
    rng = np.random.default_rng(7)
    points = points_at_ratios(reach, [MAX_RATIO, 0.2, 0.1, 0.03], rng)
    order = terms_needed(MAX_RATIO)
    series = axisymmetric_series_field(points, zonal_moments(radius, bore, half, order), reach, J)
    error = np.linalg.norm(series - closed_form(shape, points, J), axis=1)
    # the closed form itself loses a few 1e-12 of the dipole scale to cancellation far out
    assert np.all(error <= 5 * SERIES_TOLERANCE * dipole_scale(shape, points, J) + 1e-11 * np.linalg.norm(J)
                  * (reach / np.linalg.norm(points, axis=1)) ** 3)


@pytest.mark.parametrize("shape", SHAPES)
@pytest.mark.parametrize("ratio", [0.05, 0.15, MAX_RATIO])
def test_the_rest_after_the_chosen_terms_is_below_the_stated_bound(ratio, shape):
    # the bound of terms_needed against the actual rest: the series cut at L against the
    # same series carried 30 degrees further (its terms there are ~1e-16 and below), for
    # the general bound and for the one that uses the shape's own moments (shorter)
    radius, bore, half = SHAPES[shape]
    reach = np.hypot(radius, half)
    points = points_at_ratios(reach, [ratio], np.random.default_rng(3))
    J = [0.6, -0.4, 1.0]
    general, own = terms_needed(ratio), terms_needed(ratio, shape=(radius, bore, half))
    assert own <= general
    for order in (general, own):
        cut = axisymmetric_series_field(points, zonal_moments(radius, bore, half, order), reach, J)
        longer = axisymmetric_series_field(points, zonal_moments(radius, bore, half, order + 30), reach, J)
        rest = np.linalg.norm(longer - cut, axis=1)
        assert np.all(rest <= SERIES_TOLERANCE * dipole_scale(shape, points, J))


def test_terms_grow_with_the_ratio_and_refuse_points_inside_the_bounding_sphere():
    orders = [terms_needed(r) for r in (0.0, 0.05, 0.1, 0.2, MAX_RATIO, 0.6)]
    assert orders == sorted(orders) and orders[0] == 0
    with pytest.raises(ValueError, match="bounding sphere"):
        terms_needed(1.2)


@pytest.mark.parametrize("shape", SHAPES)
def test_low_moments_are_the_volume_and_the_second_moments(shape):
    # c_0 = V / 4 pi and c_2 = (1 / 4 pi) integral (z^2 - rho^2 / 2) dV = (I_zz - (I_xx + I_yy) / 2) / 4 pi,
    # with the second moments written out from a table of moments of inertia (any mechanics handbook,
    # e.g. CRC Standard Mathematical Tables; the mass moments divided by the density): for a solid
    # cylinder of radius a and length L, V = pi a^2 L, integral x^2 dV = V a^2 / 4 and integral
    # z^2 dV = V L^2 / 12; for a ring (hollow cylinder) with bore radius b, V = pi (a^2 - b^2) L,
    # integral x^2 dV = V (a^2 + b^2) / 4 and integral z^2 dV = V L^2 / 12.
    radius, bore, half = SHAPES[shape]
    length = 2 * half
    volume = np.pi * (radius**2 - bore**2) * length
    table = np.array([volume * (radius**2 + bore**2) / 4,
                      volume * (radius**2 + bore**2) / 4,
                      volume * length**2 / 12])
    body = MagnetBody("ring" if bore else "cylinder", [0, 0, 0], np.eye(3), [0, 0, 1.0],
                      diameter=2 * radius, inner_diameter=2 * bore, height=2 * half)
    assert body.volume == pytest.approx(volume, rel=1e-14)
    assert np.diag(second_moments(body)) == pytest.approx(table, rel=1e-12)
    c = zonal_moments(radius, bore, half, 2)
    assert c[0] == pytest.approx(volume / (4 * np.pi), rel=1e-14)
    assert c[1] == pytest.approx((table[2] - (table[0] + table[1]) / 2) / (4 * np.pi), rel=1e-12)


def test_divergence_and_curl_vanish():
    # Maxwell's equations outside the sources, by central differences of the series field
    radius, bore, half = SHAPES["ring"]
    reach = np.hypot(radius, half)
    moments = zonal_moments(radius, bore, half, terms_needed(MAX_RATIO))
    J = [0.6, -0.4, 1.0]
    points = points_at_ratios(reach, [0.25], np.random.default_rng(11), count=30)
    h = 1e-6
    jacobian = np.empty((len(points), 3, 3))
    for axis in range(3):
        step = np.zeros(3)
        step[axis] = h
        jacobian[:, :, axis] = (axisymmetric_series_field(points + step, moments, reach, J)
                                - axisymmetric_series_field(points - step, moments, reach, J)) / (2 * h)
    scale = np.max(np.abs(jacobian), axis=(1, 2))
    assert np.all(np.abs(np.trace(jacobian, axis1=1, axis2=2)) <= 1e-7 * scale)
    assert np.all(np.abs(jacobian - np.transpose(jacobian, (0, 2, 1))).max(axis=(1, 2)) <= 1e-7 * scale)


def test_far_away_the_series_is_the_dipole_field():
    # Jackson (1999) eq. 5.56: the leading term alone is the dipole m = J V / mu0
    radius, bore, half = SHAPES["tall rod"]
    reach = np.hypot(radius, half)
    J = np.array([0.6, -0.4, 1.0])
    points = points_at_ratios(reach, [1e-3], np.random.default_rng(5), count=20)
    series = axisymmetric_series_field(points, zonal_moments(radius, bore, half, 0), reach, J)
    volume = np.pi * radius**2 * 2 * half
    dipole = dipole_field(points, J * volume / mu_0, [0.0, 0.0, 0.0])
    np.testing.assert_allclose(series, dipole, rtol=1e-12, atol=1e-12 * np.abs(dipole).max())


@pytest.mark.parametrize("shape", SHAPES)
def test_zonal_moments_against_direct_integration(shape):
    # independent computation: c_l = (1/4 pi) integral r^l P_l(cos theta) dV by tensor
    # Gauss-Legendre quadrature in (rho, z) with numpy's Legendre series (no solid-harmonic
    # expansion); exact up to rounding for these polynomial integrands
    from numpy.polynomial import legendre

    radius, bore, half = SHAPES[shape]
    nodes, weights = legendre.leggauss(40)
    rho = bore + (radius - bore) * (nodes + 1) / 2
    z = half * nodes
    R, Z = np.meshgrid(rho, z, indexing="ij")
    W = np.outer(weights * (radius - bore) / 2, weights * half) * 2 * np.pi * R
    r = np.hypot(R, Z)
    ours = zonal_moments(radius, bore, half, 20)
    for index, degree in enumerate(range(0, 21, 2)):
        direct = np.sum(W * r**degree * legendre.legval(Z / r, np.eye(degree + 1)[degree])) / (4 * np.pi)
        assert ours[index] == pytest.approx(direct, rel=1e-10, abs=1e-13 * ours[0] * np.hypot(radius, half) ** degree)


def test_derivative_bound_factors_are_the_stated_series():
    # independent computation: S_n(q) = sum over even l of mu_l C(n+2+l, l) q^l summed
    # term by term (math.comb; the moments from zonal_moments, checked against direct
    # quadrature above) at points between the grid nodes: the table's value at the next
    # node up is never below it, and at a node it equals the sum to rounding (the moments'
    # rounding bound is tiny there)
    from math import comb

    from planner.physics.fields.multipole import derivative_bound_factors

    radius, bore, half = SHAPES["flat disc"]
    table = derivative_bound_factors(radius, bore, half, max_ratio=0.85, cells=512)
    reach = np.hypot(radius, half)
    moments = np.abs(zonal_moments(radius, bore, half, 100)) / (zonal_moments(radius, bore, half, 0)[0]
                                                                * reach ** np.arange(0, 101, 2))
    for q in (0.1, 0.4, 0.7, 0.84):
        cell = int(np.ceil(q / 0.85 * 512))
        for order in range(4):
            direct = sum(moments[j] * comb(order + 2 + 2 * j, 2 * j) * q ** (2 * j) for j in range(51))
            direct += sum(comb(order + 2 + l, l) * q**l for l in range(102, 700, 2))
            assert table[order, cell] >= direct
            node = 0.85 * cell / 512
            at_node = sum(moments[j] * comb(order + 2 + 2 * j, 2 * j) * node ** (2 * j) for j in range(51)) \
                + sum(comb(order + 2 + l, l) * node**l for l in range(102, 700, 2))
            assert table[order, cell] == pytest.approx(at_node, rel=1e-9)


@pytest.mark.parametrize("size", [(0.03, 0.02, 0.008), (0.02, 0.02, 0.02), (0.004, 0.005, 0.04)])
def test_block_bound_factors_are_the_stated_series_of_the_block_moments(size):
    # independent computation: mu_l = mean of |r'|^l / R^l by Gauss-Legendre quadrature over
    # the block (exact for these polynomials with 30 nodes per axis), mu_2 the smaller of that
    # and the sum of |eigenvalues| of the traceless second moments; the table at each node is
    # the series summed term by term (math.comb), degrees beyond 40 with mu_l = 1
    from math import comb

    from planner.physics.fields.multipole import block_bound_factors

    half = np.array(size) / 2
    reach = np.linalg.norm(half)
    nodes, weights = np.polynomial.legendre.leggauss(30)
    x, y, z = np.meshgrid(*(h * nodes for h in half), indexing="ij")
    w = np.einsum("i,j,k->ijk", weights, weights, weights) / 8
    square = (x**2 + y**2 + z**2) / reach**2
    moments = [float(np.sum(w * square**j)) for j in range(21)]
    second = np.array([np.sum(w * x**2), np.sum(w * y**2), np.sum(w * z**2)]) / reach**2
    moments[1] = min(moments[1], float(np.sum(np.abs(second - second.sum() / 3))))
    if size[0] == size[1] == size[2]:
        assert moments[1] == pytest.approx(0.0, abs=1e-15)  # a cube has no degree-2 term
    table = block_bound_factors(size, max_ratio=0.85, cells=512)
    for q in (0.1, 0.4, 0.7, 0.84):
        cell = int(np.ceil(q / 0.85 * 512))
        node = 0.85 * cell / 512
        for order in range(4):
            direct = sum(moments[j] * comb(order + 2 + 2 * j, 2 * j) * node ** (2 * j) for j in range(21))
            direct += sum(comb(order + 2 + l, l) * node**l for l in range(42, 700, 2))
            assert table[order, cell] == pytest.approx(direct, rel=1e-9)
            assert table[order, cell] >= direct * (1 - 1e-12)
