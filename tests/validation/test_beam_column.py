"""Beam-column amplification and interaction against exact solutions and AISC 360-16 H1-1.

Reference 1: the exact peak moment of a pin-ended beam-column with axial compression P
(Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 1.11-1.12, from memory),
u = (pi / 2) sqrt(P / P_cr):
- central point load Q: M = (Q / 2k) tan(k L / 2), amplification tan(u) / u;
- uniform load q: M = (q / k^2)(sec(k L / 2) - 1), amplification 2 (sec u - 1) / u^2.
1 / (1 - P / P_cr) must be at least the exact value for the point load, and at least 97 % of
it for the uniform load (the exact value exceeds it by 2.8 % at P / P_cr = 0.9, which the
linear interaction's margin over AISC H1-1a covers; see below).

Reference 2: AISC 360-16 eq. H1-1a (P_r / P_c >= 0.2: P_r / P_c + 8/9 M_r / M_c <= 1) and
H1-1b (P_r / (2 P_c) + M_r / M_c <= 1), from memory: with the same resistances and the same
amplified moment, our linear interaction is never below it (checked over random inputs).
"""

from __future__ import annotations

import numpy as np
import pytest

from service.core.stability.beam_column import amplification, interaction

RATIOS = np.linspace(0.01, 0.9, 90)


def test_amplification_bounds_the_exact_point_load_solution():
    u = 0.5 * np.pi * np.sqrt(RATIOS)
    exact = np.tan(u) / u
    assert np.all(amplification(RATIOS, 1.0) >= exact)


def test_amplification_within_three_percent_of_the_exact_uniform_load_solution():
    u = 0.5 * np.pi * np.sqrt(RATIOS)
    exact = 2.0 * (1.0 / np.cos(u) - 1.0) / u**2
    ratio = amplification(RATIOS, 1.0) / exact
    assert np.all(ratio >= 0.97)
    assert np.all(ratio <= 1.0 + 1e-12)


def test_amplification_limits():
    np.testing.assert_array_equal(amplification([-5.0, 0.0, 1.0, 2.0], 1.0),
                                  [1.0, 1.0, np.inf, np.inf])


def test_interaction_is_never_below_aisc_h1():
    rng = np.random.default_rng(12)
    compression = rng.uniform(0.0, 1.0, 5000)
    compression_resistance = rng.uniform(0.5, 2.0, 5000)
    moment = rng.uniform(0.0, 1.0, 5000)
    moment_resistance = rng.uniform(0.5, 2.0, 5000)
    critical = compression_resistance * rng.uniform(1.0, 10.0, 5000)
    ours = interaction(-compression, moment, 1.0, compression_resistance, moment_resistance,
                       critical)
    amplified = moment * amplification(compression, critical)
    axial = compression / compression_resistance
    aisc = np.where(axial >= 0.2, axial + 8.0 / 9.0 * amplified / moment_resistance,
                    0.5 * axial + amplified / moment_resistance)
    assert np.all(ours >= aisc - 1e-12)


def test_interaction_is_first_yield_for_a_stocky_member_and_adds_tension_without_amplifying():
    area, modulus, strength = 1e-3, 5e-5, 355e6
    force, moment = 100e3, 5e3
    stress = force / area + moment / modulus
    tension = interaction(force, moment, area * strength, area * strength, modulus * strength,
                          np.inf)
    assert float(tension) == pytest.approx(stress / strength)
    compression = interaction(-force, moment, area * strength, area * strength,
                              modulus * strength, 10 * force)
    assert float(compression) == pytest.approx(
        force / (area * strength) + moment / 0.9 / (modulus * strength))
