"""Closed-form minimum scales of the sizing (service.core.sizing.scale): roots, cubics, bounds."""


from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from service.core.loadcases import LOAD_CASES
from service.core.sizing.demand import Demand
from service.core.sizing.scale import (
    WALL_ROW,
    UnitSection,
    cubic_scale,
    root_scale,
    scale_bounds,
)


def test_cubic_scale_matches_brentq():
    """The closed-form root of alpha s^3 - beta s^2 - gamma against scipy's brentq (1e-12),
    over twelve decades of each coefficient (self-weight dominating, or negligible), with
    the edge cases gamma = 0 (s = beta / alpha) and beta = 0 (s = cbrt(gamma / alpha))."""
    rng = np.random.default_rng(1)
    alpha, beta, gamma = (10.0 ** rng.uniform(-6, 6, 200) for _ in range(3))
    beta[:5], gamma[5:10] = 0.0, 0.0
    ours = cubic_scale(alpha, beta, gamma)
    for a, b, c, s in zip(alpha, beta, gamma, ours, strict=True):
        if c == 0.0:
            assert math.isclose(s, b / a, rel_tol=1e-12)
            continue
        high = np.cbrt(c / a) + b / a
        reference = brentq(lambda x, a=a, b=b, c=c: a * x**3 - b * x**2 - c, 0.0, 2 * high,
                           xtol=1e-300, rtol=1e-15)
        assert math.isclose(s, reference, rel_tol=1e-12), (a, b, c)
    assert cubic_scale(np.inf, 1.0, 1.0) == 0.0


@pytest.mark.parametrize("power", [2, 3, 4])
def test_root_scale_solves_its_inequality(power):
    """capacity s^power = need at the returned s (1e-13), over twelve decades of each; no
    scale for a capacity of zero or below, none needed for an unlimited one."""
    rng = np.random.default_rng(power)
    need, capacity = (10.0 ** rng.uniform(-6, 6, 500) for _ in range(2))
    scale = root_scale(need, capacity, power)
    assert np.allclose(capacity * scale**power / need, 1.0, rtol=1e-13, atol=0.0)
    assert root_scale(1.0, np.array([0.0, -1.0]), power).tolist() == [np.inf, np.inf]
    assert root_scale(1.0, np.inf, power) == 0.0


def unit_section(**overrides):
    fields = dict(area=np.array(0.1), stiffness_modulus=np.array(0.01),
                  strength_modulus=np.array(0.02), buckling_stress=np.array(np.inf),
                  depth_ratio=np.array(1.0), width_ratio=np.array(0.5),
                  wall_ratio=np.array([np.inf]))
    fields.update(overrides)
    return UnitSection(**fields)


def demand(**overrides):
    fields = dict(case=LOAD_CASES["simply_supported_center_load"], span=3.0, action=2000.0,
                  stiffness_limit=0.01, safety_factor=1.5, max_depth=np.inf, max_width=np.inf,
                  min_wall=0.0, self_weight=True, local_buckling=True)
    fields.update(overrides)
    return Demand(**fields)


def test_stiffness_scale_with_self_weight_solves_the_deflection_equation():
    """s from the closed-form quadratic in s^2 makes (c_D P + c_Du rho a g L s^2) L^3 /
    (E i s^4) equal to delta_max (Roark table 8.1 coefficients; root by brentq, 1e-10)."""
    unit, load, span, limit, density, youngs = unit_section(), 2000.0, 3.0, 0.01, 7850.0, 2.1e11
    bounds = scale_bounds(unit, density, youngs, 355e6, demand())

    def excess(s):
        weight = density * 0.1 * s**2 * 9.80665 * span
        return (load / 48 + 5 / 384 * weight) * span**3 / (youngs * 0.01 * s**4) - limit

    assert math.isclose(bounds.lower[0], brentq(excess, 1e-3, 10.0, xtol=1e-15), rel_tol=1e-10)


def test_bounds_broadcast_over_a_leading_case_axis():
    """A (C, 1, 1) span axis gives the same bounds as C separate calls."""
    unit = unit_section(area=np.array([[0.1, 0.2]]), stiffness_modulus=np.array([[0.01, 0.02]]),
                        strength_modulus=np.array([[0.02, 0.03]]))
    density = np.array([[7850.0], [2700.0]])
    spans = np.array([1.0, 2.0, 4.0])
    together = scale_bounds(unit, density, 7e10, 2e8, demand(span=spans[:, None, None]))
    for k, span in enumerate(spans):
        alone = scale_bounds(unit, density, 7e10, 2e8, demand(span=span))
        np.testing.assert_allclose(together.scale[k], alone.scale, rtol=1e-12)
        np.testing.assert_allclose(together.mass[k], alone.mass, rtol=1e-12)


def test_lower_bounds_are_the_maxima_of_their_smooth_parts():
    """Each merged requirement row is the largest of its terms: two buckling modes and web
    shear buckling in the local buckling row, bending and shear in the strength row."""
    modes = (np.array([3e8, 1e8]), np.array([2e8, 4e8]))
    unit = unit_section(area=np.array([0.1, 0.1]), buckling_stress=np.minimum(*modes),
                        buckling_modes=modes, shear_area=np.array([0.05, 0.01]),
                        shear_buckling_stress=np.array([1e9, 5e6]),
                        wall_ratio=np.array([[0.05, 0.05]]))
    bounds = scale_bounds(unit, 7850.0, 2.1e11, 355e6, demand(self_weight=False, min_wall=0.002),
                          shear_strength=205e6)
    stiffness, bending, shear, first, second, web, wall = bounds.parts
    np.testing.assert_array_equal(bounds.lower[0], stiffness)
    np.testing.assert_array_equal(bounds.lower[1], np.maximum(bending, shear))
    np.testing.assert_array_equal(bounds.lower[2], np.maximum.reduce([first, second, web]))
    # member buckling (none asked of it), frequency, fatigue: not asked
    np.testing.assert_array_equal(bounds.lower[3:WALL_ROW], 0.0)
    np.testing.assert_array_equal(bounds.lower[WALL_ROW], wall)
    # the weaker mode sets the buckling scale: sigma = M SF / (z s^3) at the mode's stress
    moment = LOAD_CASES["simply_supported_center_load"].moment_coefficient * 2000.0 * 3.0
    np.testing.assert_allclose(np.maximum(first, second),
                               np.cbrt(moment * 1.5 / (0.02 * np.minimum(*modes))), rtol=1e-12)
    assert web[1] > first[1]            # the thin web's shear buckling governs the second
