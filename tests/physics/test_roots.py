"""The root finder and maximum search written in planner.physics.roots."""
from __future__ import annotations

import math

import pytest

from planner.physics.handling.pinch import released_energy
from planner.physics.roots import bracketed_root, golden_section_maximum


@pytest.mark.parametrize("function, low, high, root", [
    (lambda x: x * x - 2.0, 0.0, 2.0, math.sqrt(2.0)),  # identity: sqrt(2)
    (lambda x: math.cos(x) - x, 0.0, 1.0, 0.7390851332151607),  # Dottie number (OEIS A003957)
    (lambda x: x**3 - x - 1.0, 1.0, 2.0, 1.3247179572447460),  # plastic number (OEIS A060006)
    (lambda x: math.exp(x) - 5.0, 0.0, 10.0, math.log(5.0)),  # identity: ln 5
    (lambda x: (x - 0.123) ** 5, 0.0, 1.0, 0.123),  # a flat, fifth-order root
])
def test_bracketed_root_finds_known_roots(function, low, high, root):
    assert bracketed_root(function, low, high, xtol=1e-13) == pytest.approx(root, abs=1e-12)
    # either orientation of the bracket
    assert bracketed_root(function, high, low, xtol=1e-13) == pytest.approx(root, abs=1e-12)


def test_bracketed_root_takes_few_calls_and_refuses_a_bad_bracket():
    calls = []

    def function(x):
        calls.append(x)
        return x * x - 2.0
    bracketed_root(function, 0.0, 2.0, xtol=1e-12)
    # Brent (1973): superlinear on a smooth root; bisection alone would need ~41 calls.
    assert len(calls) < 15
    with pytest.raises(ValueError, match="same sign"):
        bracketed_root(function, 2.0, 3.0)


def test_golden_section_finds_the_maximum():
    x, value = golden_section_maximum(math.sin, 0.0, 3.0, xtol=1e-7)
    assert x == pytest.approx(math.pi / 2, abs=1e-6)  # identity: sin is largest at pi/2
    assert value == pytest.approx(1.0, abs=1e-12)


def test_released_energy_integrates_to_the_antiderivative():
    # integral of (1 + g)^-4 over [a, b] = ((1 + a)^-3 - (1 + b)^-3) / 3 (antiderivative)
    exact = ((1 + 0.001) ** -3 - (1 + 2.0) ** -3) / 3
    assert released_energy(lambda g: (1 + g) ** -4, 2.0, 0.001) == pytest.approx(exact, rel=1e-9)
    # a steep near-contact force, 1 / (g + 1e-4)^2 from 1e-4 to 0.1 m
    exact = 1 / 2e-4 - 1 / (0.1 + 1e-4)
    assert released_energy(lambda g: (g + 1e-4) ** -2, 0.1, 1e-4) == pytest.approx(exact, rel=1e-6)
