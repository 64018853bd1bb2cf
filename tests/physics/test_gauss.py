"""Composite Gauss-Legendre panels (planner.physics.gauss.gauss_panels) against integrals known in closed form."""
import numpy as np
import pytest

from planner.physics.gauss import gauss_legendre, gauss_panels


def test_sine_over_zero_to_pi_is_two():
    # int_0^pi sin x dx = 2; eight panels of ten nodes leave only rounding
    z, w = gauss_panels(np.linspace(0.0, np.pi, 9), 10)
    assert float(w @ np.sin(z)) == pytest.approx(2.0, rel=1e-14)


@pytest.mark.parametrize("order", [1, 2, 3, 5, 8])
def test_polynomial_of_degree_two_order_minus_one_is_exact(order):
    # int_a^b x^k dx = (b^(k+1) - a^(k+1)) / (k+1) for k = 2 order - 1, on unequal panels
    breaks = np.array([-0.7, -0.2, 0.05, 0.9, 1.3])
    degree = 2 * order - 1
    z, w = gauss_panels(breaks, order)
    assert z.shape == w.shape == ((len(breaks) - 1) * order,)
    exact = (breaks[-1] ** (degree + 1) - breaks[0] ** (degree + 1)) / (degree + 1)
    assert float(w @ z**degree) == pytest.approx(exact, rel=1e-13)


def test_nodes_lie_in_their_panels_and_weights_sum_to_the_width():
    breaks = np.array([0.0, 1e-3, 0.1, 2.0])
    z, w = gauss_panels(breaks, 6)
    panels = z.reshape(3, 6)
    assert np.all(panels > breaks[:-1, None]) and np.all(panels < breaks[1:, None])
    assert np.all(np.diff(z) > 0.0)
    assert w.reshape(3, 6).sum(axis=1) == pytest.approx(np.diff(breaks), rel=1e-14)


def test_one_panel_is_the_mapped_rule():
    x, w_ref = gauss_legendre(7)
    z, w = gauss_panels([2.0, 5.0], 7)
    np.testing.assert_allclose(z, 3.5 + 1.5 * x, rtol=1e-15)
    np.testing.assert_allclose(w, 1.5 * w_ref, rtol=1e-15)


def test_rows_of_breaks_give_one_rule_each():
    # the batched form, as flux_linkage uses it: each row equals the row on its own
    rows = np.array([[0.0, 0.5, 0.5, 1.0], [-1.0, 0.0, 2.0, 3.0], [0.0, 1.0, 2.0, 3.0]])
    z, w = gauss_panels(rows, 8)
    assert z.shape == w.shape == (3, 24)
    for i, row in enumerate(rows):
        z_i, w_i = gauss_panels(row, 8)
        np.testing.assert_array_equal(z[i], z_i)
        np.testing.assert_array_equal(w[i], w_i)
    # a repeated break is a panel of zero weight; exp integrates to e^b - e^a per row
    exact = np.exp(rows[:, -1]) - np.exp(rows[:, 0])
    np.testing.assert_allclose((w * np.exp(z)).sum(axis=-1), exact, rtol=1e-12)
    assert np.all(w[0, 8:16] == 0.0)
