"""The stiffness check's minimum scale at fixed proportions
(service.core.sizing.checks.stiffness.scale_bound): the closed-form quadratic in s^2 with
self-weight against scipy's brentq on the deflection equation (Roark table 8.1 coefficients)."""

from __future__ import annotations

import math

from scipy.optimize import brentq

from service.core.sizing.checks.base import Found
from service.core.sizing.checks.stiffness import STIFFNESS
from tests.core.test_sizing_scale import demand, unit_section, values


def test_stiffness_scale_with_self_weight_solves_the_deflection_equation():
    """s from the closed-form quadratic in s^2 makes (c_D P + c_Du rho a g L s^2) L^3 /
    (E i s^4) equal to delta_max (Roark table 8.1 coefficients; root by brentq, 1e-10)."""
    unit, load, span, limit, density, youngs = unit_section(), 2000.0, 3.0, 0.01, 7850.0, 2.1e11
    assert STIFFNESS.scale_bound is not None
    (scale,) = STIFFNESS.scale_bound(unit, values(density, youngs, 355e6), demand(), Found({}))

    def excess(s):
        weight = density * 0.1 * s**2 * 9.80665 * span
        return (load / 48 + 5 / 384 * weight) * span**3 / (youngs * 0.01 * s**4) - limit

    assert math.isclose(scale, brentq(excess, 1e-3, 10.0, xtol=1e-15), rel_tol=1e-10)
