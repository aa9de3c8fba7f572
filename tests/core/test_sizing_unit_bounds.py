"""Scale bounds at given proportions (service.core.sizing.unit_bounds), against the closed
form of a solid rectangle: depth s, width r s, I = r s^4 / 12, A = r s^2; a cantilever's tip
deflection P L^3 / (3 E I) (Roark's Formulas for Stress and Strain, table 8.1 case 1a, from
memory) plus the Timoshenko shear deflection P L / (k G A) with Cowper's
k = 10 (1 + nu) / (12 + 11 nu) (J. Appl. Mech. 1966, from memory): a quadratic in s^2.
Tolerance 1e-12 relative: the same formula."""

from __future__ import annotations

import math

import numpy as np

from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest
from service.core.sizing.demand import demand_of
from service.core.sizing.unit_bounds import bounds_at, pick_point


def test_stiffness_bound_of_a_solid_rectangle(demo_values):
    demand = demand_of(DesignRequest("cantilever_end_load", span=1.5, load=500.0,
                                     max_deflection=0.005, local_buckling=False))
    ratios = np.array([[0.25], [0.5], [1.0]])
    bounds = bounds_at(FAMILIES["solid_rectangle"], ratios, demo_values.column(), demand)
    assert bounds.scale.shape == (2, 3)
    r = ratios[:, 0]
    nu = demo_values.poisson_ratio[:, None]
    k = 10 * (1 + nu) / (12 + 11 * nu)
    linear = 500.0 * 1.5 / (k * demo_values.shear_modulus[:, None] * r)
    constant = 500.0 * 1.5**3 * 12 / (3 * demo_values.youngs_modulus[:, None] * r)
    stiffness = np.sqrt((linear + np.sqrt(linear**2 + 4 * 0.005 * constant)) / (2 * 0.005))
    np.testing.assert_allclose(bounds.lower[0], stiffness, rtol=1e-12)
    np.testing.assert_allclose(
        bounds.mass, demo_values.density[:, None] * r * bounds.scale**2 * 1.5, rtol=1e-12)


def test_pick_point_takes_the_lightest_feasible_else_the_least_violating(demo_values):
    demand = demand_of(DesignRequest("cantilever_end_load", span=1.5, load=500.0,
                                     max_deflection=0.005, max_depth=0.06))
    ratios = np.exp(np.linspace(math.log(0.1), math.log(10.0), 41))[:, None]
    bounds = bounds_at(FAMILIES["solid_rectangle"], ratios, demo_values.column(), demand)
    chosen = pick_point(bounds)
    mass = np.where(bounds.feasible, bounds.mass, np.inf)
    np.testing.assert_array_equal(chosen, np.argmin(mass, axis=-1))
    tight = demand_of(DesignRequest("cantilever_end_load", span=1.5, load=500.0,
                                    max_deflection=0.005, max_depth=0.001, max_width=0.001))
    none = bounds_at(FAMILIES["solid_rectangle"], ratios, demo_values.column(), tight)
    assert not none.feasible.any()
    np.testing.assert_array_equal(pick_point(none),
                                  np.argmin(none.scale / none.upper, axis=-1))
