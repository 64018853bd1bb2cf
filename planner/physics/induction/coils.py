"""Coils as plain numbers: winding geometry, wire resistance and self-inductance.

References
----------
H. Nagaoka, J. Coll. Sci. Tokyo 27(6), 1-33 (1909); F. W. Grover, Inductance Calculations
(Van Nostrand 1946; Dover 2004), tables of Nagaoka's coefficient.
H. A. Wheeler, "Simple inductance formulas for radio coils", Proc. IRE 16, 1398-1400 (1928).
CRC Handbook of Chemistry and Physics (resistivity of copper, 1.68e-8 ohm m at 20 C);
IEC 60028 (International Annealed Copper Standard, 58 MS/m).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from planner.physics.constants import INCH as inch, mu_0
from planner.physics.fields.elliptic import legendre_k_and_e
from planner.physics.gauss import gauss_legendre

from .sheets import coaxial_sheet_mutual_inductance

COPPER_RESISTIVITY = 1.68e-8
"""Pure copper at 20 C [ohm m], CRC Handbook of Chemistry and Physics. The lower of the two
common values, so currents come out on the high side."""
ANNEALED_COPPER_RESISTIVITY = 1.0 / 58.0e6
"""International Annealed Copper Standard, 58 MS/m at 20 C [ohm m], IEC 60028."""

_EXACT_LAYER_LIMIT = 5        # up to this many layers each is a sheet; beyond, Gauss in radius
_INDUCTANCE_LAYER_LIMIT = 24  # layers are merged beyond this for the self-inductance sum


@dataclass(frozen=True)
class Winding:
    """A cylindrical winding of round wire, in plain numbers.

    Parameters
    ----------
    turns : float
        Total number of turns [-].
    inner_radius : float
        Inner radius of the winding, the radius of its former [m].
    outer_radius : float
        Outer radius of the winding (equal to ``inner_radius`` for an ideal single
        sheet, which then sits at that radius) [m].
    length : float
        Axial length of the winding [m].
    layers : int
        Number of layers, equal turns in each [-].

    Notes
    -----
    Layer ``i`` sits at ``inner + (i + 1/2) (outer - inner) / layers`` with its turns spread
    evenly over the length (current-sheet model: good when the wire pitch is small against
    the distance to the magnet or other coil).
    """

    turns: float
    inner_radius: float
    outer_radius: float
    length: float
    layers: int = 1

    def __post_init__(self):
        if not (self.turns > 0 and self.length > 0 and self.inner_radius > 0):
            raise ValueError("a winding needs turns, length and inner radius above zero")
        if self.outer_radius < self.inner_radius or int(self.layers) < 1:
            raise ValueError("outer radius below inner radius, or fewer than one layer")
        object.__setattr__(self, "layers", int(self.layers))

    @property
    def mean_radius(self) -> float:
        """Mean winding radius [m]."""
        return (self.inner_radius + self.outer_radius) / 2.0

    @property
    def depth(self) -> float:
        """Radial depth of the winding [m]."""
        return self.outer_radius - self.inner_radius

    @property
    def layer_radii(self) -> np.ndarray:
        """Radius of each layer [m]."""
        return self.inner_radius + (np.arange(self.layers) + 0.5) * self.depth / self.layers

    def radial_nodes(self):
        """Radii [m] and turn weights [-] (summing to ``turns``) for sums over the winding.

        Each layer exactly up to 5 layers; beyond, 5-point Gauss-Legendre over the depth
        (the flux varies smoothly across the winding there).
        """
        if self.layers <= _EXACT_LAYER_LIMIT or self.depth == 0.0:
            return self.layer_radii, np.full(self.layers, self.turns / self.layers)
        x, w = gauss_legendre(_EXACT_LAYER_LIMIT)
        return self.mean_radius + self.depth / 2.0 * x, self.turns * w / 2.0


def winding_from_wire(turns, inner_radius, length, wire_diameter):
    """Close-wound winding of round wire on a former [-].

    Parameters
    ----------
    turns : int
        Number of turns [-].
    inner_radius : float
        Radius of the former (bore) [m].
    length : float
        Winding length [m].
    wire_diameter : float
        Overall wire diameter including insulation [m].

    Notes
    -----
    Turns per layer ``floor(length / wire_diameter)``; layers ``ceil(turns / that)``; layer
    centres start half a wire above the former.

    >>> w = winding_from_wire(200, 0.01, 0.02, 0.0005); (w.layers, round(w.outer_radius, 4))
    (5, 0.0125)
    """
    per_layer = max(int(np.floor(length / wire_diameter + 1e-9)), 1)
    layers = int(np.ceil(turns / per_layer))
    return Winding(turns, inner_radius, inner_radius + layers * wire_diameter, length, layers)


def wire_length(winding: Winding) -> float:
    """Length of wire in a winding, ``2 pi r_mean N`` [m].

    >>> round(wire_length(Winding(100, 0.01, 0.01, 0.02)), 4)
    6.2832
    """
    return float(2.0 * np.pi * np.sum(winding.layer_radii) * winding.turns / winding.layers)


def wire_resistance(wire_diameter, length, resistivity=COPPER_RESISTIVITY):
    """DC resistance of a round wire, ``R = rho L / (pi d^2 / 4)`` [ohm].

    Parameters
    ----------
    wire_diameter : float
        Conductor diameter (without insulation) [m].
    length : float
        Wire length [m].
    resistivity : float
        [ohm m]; default pure copper at 20 C (CRC Handbook); ``ANNEALED_COPPER_RESISTIVITY``
        for IEC 60028.

    >>> round(wire_resistance(1e-3, 1.0), 5)
    0.02139
    """
    return resistivity * length / (np.pi * wire_diameter**2 / 4.0)


def nagaoka_coefficient(diameter_over_length):
    """Nagaoka's coefficient of a single-layer current sheet [-].

    Notes
    -----
    ``K_N = 4/(3 pi k') [(k'^2/k^2)(K - E) + E - k]`` with ``k^2 = D^2/(D^2 + l^2)``,
    ``k' = sqrt(1 - k^2)``; tends to 1 for a long solenoid. Exact for a current sheet.

    References
    ----------
    Nagaoka, J. Coll. Sci. Tokyo 27 (1909); Grover, Inductance Calculations, Table 36 (1946).

    >>> round(float(nagaoka_coefficient(1.0)), 4)
    0.6884
    """
    ratio = np.asarray(diameter_over_length, dtype=float)
    m = ratio**2 / (1.0 + ratio**2)
    k, kp = np.sqrt(m), 1.0 / np.sqrt(1.0 + ratio**2)
    complete_k, complete_e = legendre_k_and_e(kp)
    with np.errstate(divide="ignore", invalid="ignore"):
        value = 4.0 / (3.0 * np.pi * kp) * (
            (1.0 - m) / m * (complete_k - complete_e) + complete_e - k)
    return np.where(ratio > 0.0, value, 1.0)


def solenoid_inductance(turns, radius, length):
    """Self-inductance of a single-layer solenoid, ``L = mu0 pi a^2 N^2 K_N / l`` [H].

    Parameters
    ----------
    turns : float
        [-]
    radius : float
        Radius to the wire centre [m].
    length : float
        Winding length [m].

    References
    ----------
    Nagaoka (1909); Grover, Inductance Calculations, ch. 16 (1946).
    """
    return mu_0 * np.pi * radius**2 * turns**2 * nagaoka_coefficient(2 * radius / length) / length


def wheeler_solenoid_inductance(turns, radius, length):
    """Wheeler's single-layer formula ``L[uH] = a^2 N^2 / (9 a + 10 l)``, a and l in inches [H].

    Notes
    -----
    Within about 1 % for ``l > 0.8 a`` (Wheeler 1928). A check on :func:`solenoid_inductance`.

    References
    ----------
    H. A. Wheeler, Proc. IRE 16, 1398-1400 (1928).
    """
    a, l = radius / inch, length / inch
    return 1e-6 * a**2 * turns**2 / (9.0 * a + 10.0 * l)


def wheeler_multilayer_inductance(turns, mean_radius, length, depth):
    """Wheeler's multilayer formula ``L[uH] = 0.8 a^2 N^2 / (6a + 9l + 10c)`` in inches [H].

    Parameters
    ----------
    turns : float
        [-]
    mean_radius : float
        Mean radius of the winding [m].
    length : float
        Winding length [m].
    depth : float
        Radial depth of the winding [m].

    Notes
    -----
    About 1 % when the three terms of the denominator are of similar size (Wheeler 1928).

    References
    ----------
    H. A. Wheeler, Proc. IRE 16, 1398-1400 (1928).
    """
    a, l, c = mean_radius / inch, length / inch, depth / inch
    return 1e-6 * 0.8 * a**2 * turns**2 / (6.0 * a + 9.0 * l + 10.0 * c)


def winding_inductance(winding: Winding) -> float:
    """Self-inductance of a (multi-layer) winding by summing its layers as current sheets [H].

    Notes
    -----
    ``L = sum_i L_i + 2 sum_{i<j} M_ij``: each layer's own inductance by Nagaoka's
    coefficient, the mutual inductance of two layers from the closed-form sheet flux.
    Beyond 24 layers neighbouring layers are merged (24 sheets). Ignores the round-wire
    corrections of Rosa (a percent or less for close-wound coils of many turns).

    References
    ----------
    Grover, Inductance Calculations, ch. 13-16 (1946); check by
    :func:`wheeler_multilayer_inductance`.
    """
    layers = min(winding.layers, _INDUCTANCE_LAYER_LIMIT)
    radii = winding.inner_radius + (np.arange(layers) + 0.5) * winding.depth / layers
    turns = winding.turns / layers
    total = float(np.sum(solenoid_inductance(turns, radii, winding.length)))
    first, second = np.triu_indices(layers, 1)
    if len(first):
        total += 2.0 * float(np.sum(coaxial_sheet_mutual_inductance(
            radii[first], winding.length, turns, radii[second], winding.length, turns)))
    return total


def switch_off_spike(inductance, current, switch_time):
    """Voltage across opening contacts, ``V ~ L I / t`` [V].

    Parameters
    ----------
    inductance : float
        [H]
    current : float
        Current before switching [A].
    switch_time : float
        Time over which the current falls to zero [s].

    Notes
    -----
    Linear fall of the current; the real spike is limited by arcing and stray capacitance
    and can be higher for an abrupt break, so treat it as an order of magnitude.

    References
    ----------
    Faraday's law, ``e = -L di/dt``; any text, e.g. Purcell & Morin, Electricity and
    Magnetism, 3rd ed., ch. 7 (2013).

    >>> switch_off_spike(0.1, 2.0, 1e-3)
    200.0
    """
    return inductance * current / switch_time


def stored_energy(inductance, current):
    """Energy stored in an inductance, ``W = L I^2 / 2`` [J].

    References
    ----------
    Purcell & Morin, Electricity and Magnetism, 3rd ed., ch. 7 (2013).

    >>> stored_energy(0.1, 2.0)
    0.2
    """
    return 0.5 * inductance * current**2
