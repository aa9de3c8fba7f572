"""The elastic critical moment against an independent finite element solution and closed forms.

Reference 1: classical exact results for a narrow rectangular beam (I_w = 0), Timoshenko &
Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 6.3 and 6.5 (from memory), as
P_cr L^2 / sqrt(E I_z G I_t) (point loads) or q_cr L^3 / sqrt(E I_z G I_t) (uniform loads):
cantilever end load 4.013, cantilever uniform load 12.85, simply supported centre load 16.94,
simply supported uniform load 28.3. The finite element solver must reproduce them within
0.5 % (its cubic elements converge from above; 60 elements are 0.4 % high on the cantilever).

Reference 2: the finite element solution of the buckling energy equation
(tests/validation/ltb_reference.py), which knows nothing of C1, C2 or the three-factor
formula. Over the sections the sizing produces (I-sections with kappa = sqrt(pi^2 E I_w /
(G I_t L^2)) from 0.1 to 16 and the load at the shear centre or on top; solid rectangles from
b/h = 0.1 to 0.99 and spans from 3 to 100 depths), service.core.stability.critical_moment
must never exceed the FE value by more than 1 % (the FE discretisation and the three-figure
factors); where its factors are published ones for that case (simply supported, fixed-fixed
uniform), it must also be within 1 % of the FE value at kappa -> 0 with the load at the
shear centre, the condition they were tabulated for. Every mismatch is reported at once.
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from service.core.sections.saint_venant import rectangle_torsion
from service.core.stability.critical_moment import MOMENT_FACTORS, elastic_critical_moment
from tests.validation.ltb_reference import CASES, critical_moment

YOUNGS, SHEAR, SPAN = 2.6, 1.0, 1.0   # E / G = 2.6 (nu = 0.3); only ratios matter

TIMOSHENKO_NARROW_RECTANGLE = {
    # case: (coefficient, peak moment per unit coefficient): M = coefficient * factor
    "cantilever_end_load": (4.013, 1.0),          # P_cr = 4.013 sqrt(B C) / L^2, M = P L
    "cantilever_uniform_load": (12.85, 0.5),      # q_cr L = 12.85 sqrt(B C) / L^2, M = qL^2/2
    "simply_supported_center_load": (16.94, 0.25),  # M = P L / 4
    "simply_supported_uniform_load": (28.3, 0.125),  # M = q L^2 / 8
}


@pytest.mark.parametrize("case_id", sorted(TIMOSHENKO_NARROW_RECTANGLE))
def test_finite_element_solver_reproduces_the_classical_narrow_rectangle(case_id):
    coefficient, moment_factor = TIMOSHENKO_NARROW_RECTANGLE[case_id]
    fe = critical_moment(case_id, span=SPAN, lateral_stiffness=1.0, torsion_stiffness=1.0,
                         warping_stiffness=0.0, elements=120)
    assert fe == pytest.approx(coefficient * moment_factor, rel=5e-3)


def _i_sections():
    """(I_z, I_t, I_w, top height) over kappa = 0.1..16, h / h_s = 1 and 1.2."""
    for kappa in (0.1, 0.3, 0.5, 1.0, 2.0, 4.0, 8.0, 16.0):
        warping = kappa**2 * SHEAR * SPAN**2 / (np.pi**2 * YOUNGS)
        for depth_ratio in (1.0, 1.2):
            yield (f"I kappa={kappa} h/hs={depth_ratio}", 1.0, 1.0, warping,
                   depth_ratio * np.sqrt(warping))


def _rectangles():
    for width_ratio in (0.1, 0.3, 0.6, 0.9, 0.99):
        for span_ratio in (3, 5, 10, 30, 100):
            depth = SPAN / span_ratio
            width = width_ratio * depth
            torsion = float(rectangle_torsion(depth, width)[0])
            yield (f"rectangle b/h={width_ratio} L/h={span_ratio}", depth * width**3 / 12.0,
                   torsion, 0.0, depth / 2.0)


@pytest.mark.parametrize("case_id", sorted(CASES))
def test_critical_moment_never_exceeds_the_finite_element_solution(case_id):
    factors = MOMENT_FACTORS[case_id]
    mismatches = []
    for name, lateral, torsion, warping, top in [*_i_sections(), *_rectangles()]:
        for height in (0.0, top):
            fe = critical_moment(case_id, span=SPAN, lateral_stiffness=YOUNGS * lateral,
                                 torsion_stiffness=SHEAR * torsion,
                                 warping_stiffness=YOUNGS * warping, load_height=height)
            ours = float(elastic_critical_moment(factors, SPAN, YOUNGS, SHEAR, lateral,
                                                 torsion, warping, height))
            if ours > 1.01 * fe:
                mismatches.append(f"{name} load height {height:.3g}: {ours:.4g} > FE {fe:.4g}")
    assert not mismatches, "\n".join(mismatches)


@pytest.mark.parametrize("case_id", [
    "simply_supported_center_load", "simply_supported_uniform_load", "fixed_fixed_uniform_load",
    "cantilever_end_load", "cantilever_uniform_load"])
def test_published_moment_gradient_factor_matches_at_its_own_condition(case_id):
    """C1 at kappa -> 0, load at the shear centre: the condition of the published values
    (the cantilevers' C1 is Timoshenko & Gere's narrow rectangle itself)."""
    fe = critical_moment(case_id, span=SPAN, lateral_stiffness=1.0, torsion_stiffness=1.0,
                         warping_stiffness=0.0, elements=120)
    ours = float(elastic_critical_moment(MOMENT_FACTORS[case_id], SPAN, 1.0, 1.0, 1.0, 1.0, 0.0))
    assert ours == pytest.approx(fe, rel=1e-2)


def test_top_load_is_destabilising_and_shear_centre_load_ignores_c2():
    """Monotone in the load height; at z_g = 0 the result does not depend on C2."""
    factors = MOMENT_FACTORS["simply_supported_uniform_load"]
    heights = np.linspace(0.0, 0.2, 5)
    moments = elastic_critical_moment(factors, 2.0, 2.1e11, 8.1e10, 1.4e-6, 7e-8, 1.3e-8, heights)
    assert np.all(np.diff(moments) < 0)
    other = MOMENT_FACTORS["fixed_fixed_uniform_load"]
    swapped = dataclasses.replace(factors, load_height=other.load_height)
    assert float(elastic_critical_moment(factors, 2.0, 2.1e11, 8.1e10, 1.4e-6, 7e-8, 1.3e-8)) == (
        pytest.approx(float(elastic_critical_moment(swapped, 2.0, 2.1e11, 8.1e10, 1.4e-6, 7e-8,
                                                    1.3e-8))))
