"""Fatigue: Marin factors, the S-N line and modified Goodman against Shigley's closed forms.

Source: Shigley's Mechanical Engineering Design, 10th ed., ch. 6 and section 7-4 (from
memory). The worked values below are those the book's examples give for these inputs, as far
as remembered (surface factor 0.860 for a machined 520 MPa steel; size factor 0.858 rotating
and 0.954 non-rotating for a 32 mm shaft); they equal the published closed forms evaluated
here, tolerance 5e-4 (the book rounds to three digits). The rotating shaft against the
DE-Goodman shaft-diameter equation (eq. 7-8) is in tests/core/test_loading_utilization.py.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.loading.fatigue import (
    equivalent_alternating_and_mean,
    fatigue_strength_at,
    size_factor,
    surface_factor,
)


def test_marin_factors_of_the_book_examples():
    assert float(surface_factor(520e6, "machined")) == pytest.approx(0.860, abs=5e-4)
    assert float(size_factor(0.032)) == pytest.approx(0.858, abs=5e-4)
    assert float(size_factor(0.032, rotating=False)) == pytest.approx(0.954, abs=5e-4)
    # ranges: 1 below 2.79 mm; the second law above 51 mm (1.51 d^-0.157)
    assert float(size_factor(0.002)) == 1.0
    assert float(size_factor(0.1)) == pytest.approx(1.51 * 100**-0.157, rel=1e-12)
    assert float(surface_factor(100e6, "ground")) == 1.0  # capped


def test_sn_line_is_shigley_eq_6_13_to_6_15():
    """S_f = a N^b, a = (f S_ut)^2 / S_e, b = -log10(f S_ut / S_e) / 3 between 10^3 and 10^6."""
    ultimate, endurance = 700e6, 250e6
    a = (0.9 * ultimate) ** 2 / endurance
    b = -math.log10(0.9 * ultimate / endurance) / 3
    cycles = np.array([1e3, 1e4, 1e5, 5e5, 1e6])
    np.testing.assert_allclose(fatigue_strength_at(cycles, ultimate, endurance, 1e6, True),
                               a * cycles**b, rtol=1e-12)
    assert float(fatigue_strength_at(1e8, ultimate, endurance, 1e6, True)) == endurance
    assert float(fatigue_strength_at(1e8, ultimate, endurance, 1e6, False)) < endurance
    assert float(fatigue_strength_at(10, ultimate, endurance, 1e6, True)) == 0.9 * ultimate


def test_compressive_mean_gets_no_credit_but_mean_shear_counts():
    alternating, mean = equivalent_alternating_and_mean(100e6, 0.0, 0.0, 0.0, -50e6, 20e6)
    assert float(alternating) == 100e6
    assert math.isclose(float(mean), math.sqrt(3) * 20e6, rel_tol=1e-12)
    axial_only, _ = equivalent_alternating_and_mean(0.0, 85e6, 0.0, 0.0, 0.0, 0.0)
    assert math.isclose(float(axial_only), 100e6, rel_tol=1e-12)  # divided by k_c = 0.85
