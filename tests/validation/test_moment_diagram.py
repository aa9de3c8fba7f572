"""Lateral-torsional buckling under any moment diagram (service.core.stability.moment_diagram)
against published values and an independent finite element solution.

Reference 1: the classical exact results for a narrow rectangular beam (I_w = 0), Timoshenko &
Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 6.3 and 6.5 (from memory), as
P_cr L^2 / sqrt(E I_z G I_t) (point loads) or q_cr L^3 / sqrt(E I_z G I_t): simply supported
centre load 16.94, uniform load 28.3, cantilever end load 4.013, cantilever uniform load
12.85; the fixed-fixed uniform load's C1 = 2.575 (ENV 1993-1-1:1992 annex F table F.1.2,
from memory; the critical_moment table). The Rayleigh-Ritz C1 must be within 0.5 % of each
(the three- and four-figure published values).

Reference 2: the finite element solution of the buckling energy equation
(tests/validation/ltb_reference.py: Hermite elements, nothing of C1, C2 or the three-factor
formula) for random load sets on every kind of supports, with warping (kappa from 0.05 to
16) and the load at the shear centre or on the top flange. The module's critical moment must
never exceed the finite element value by more than 1 % (the FE converges from above, 40
elements). Every mismatch is reported at once.

Reference 3, a hand computation: a 10 mm x 100 mm steel flat bar used edgewise, simply
supported over 2 m with a centre load at its centroid: P_cr = 16.94 sqrt(E I_z G I_t) / L^2
(Timoshenko & Gere as above) with I_z = h t^3 / 12 = 8.333e-9 m^4 and I_t = h t^3 / 3
(1 - 0.630 t / h) = 3.123e-8 m^4 (Roark's Formulas for Stress and Strain, 8th ed., table
10.7 case 4, from memory; the exact series of sections.saint_venant agrees to 3e-5) gives
M_cr = P_cr L / 4 = 4.455 kN m by hand (E = 210 GPa, G = 81 GPa); the general member's
critical moment must equal it within 0.5 %.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.loading.actions import Action, member_loading
from service.core.loading.internal import internal_actions
from service.core.sections.saint_venant import rectangle_torsion
from service.core.sizing.member_stability import diagram_terms
from service.core.stability.moment_diagram import (
    DiagramLoading,
    diagram_critical_moment,
    ritz_moment_gradient,
)
from tests.validation.ltb_reference import critical_load_factor

YOUNGS, SHEAR, SPAN = 2.6, 1.0, 1.0   # E / G = 2.6 (nu = 0.3); only ratios matter
ELEMENTS = 40

PUBLISHED_C1 = {
    # supports, moment of a unit load (x, L), C1
    "simply supported centre load": ("simply_supported",
                                     lambda x, L: 0.5 * np.minimum(x, L - x),
                                     16.94 / (4 * math.pi)),
    "simply supported uniform load": ("simply_supported", lambda x, L: x * (L - x) / 2,
                                      28.3 / (8 * math.pi)),
    "fixed-fixed uniform load": ("fixed_fixed", lambda x, L: x * (L - x) / 2 - L * L / 12,
                                 2.575),
    "cantilever end load": ("cantilever", lambda x, L: -(L - x), 4.013 * 2 / math.pi),
    "cantilever uniform load": ("cantilever", lambda x, L: -((L - x) ** 2) / 2,
                                12.85 / 2 * 2 / math.pi),
}


@pytest.mark.parametrize("name", sorted(PUBLISHED_C1))
def test_ritz_moment_gradient_matches_the_published_factor(name):
    supports, moment, published = PUBLISHED_C1[name]
    span = 2.0
    peak = np.abs(moment(np.linspace(0.0, span, 4001), span)).max()
    ours = ritz_moment_gradient(supports, lambda x: moment(x, span), [span], [peak])[0]
    assert ours == pytest.approx(published, rel=5e-3)


def _random_member(rng):
    """(supports, actions) of a random load set: up to three point loads at element nodes
    (some upward), sometimes a full-span uniform load, on any supports."""
    supports = str(rng.choice(["simply_supported", "fixed_fixed", "propped_cantilever",
                               "cantilever"]))
    top = ELEMENTS if supports == "cantilever" else ELEMENTS - 1
    actions = [Action("force", float(rng.uniform(-0.3, 1.0)),
                      at=float(rng.integers(1, top + 1)) * SPAN / ELEMENTS)
               for _ in range(int(rng.integers(1, 4)))]
    if rng.random() < 0.5:
        actions.append(Action("distributed", float(rng.uniform(-0.2, 1.0)), start=0.0,
                              end=SPAN))
    return supports, actions


def _finite_element_moment(loading, actions, kappa, height, supports):
    """Peak |M| at buckling by the finite element solver, with the loading's own diagram."""
    peak = float(np.abs(internal_actions(loading, np.linspace(0, SPAN, 4001)).moment).max())
    warping = kappa**2 * SHEAR * SPAN**2 / (math.pi**2 * YOUNGS)

    def moment(x):
        return internal_actions(loading, x.reshape(-1)).moment.reshape(x.shape)

    points = [(a.at, a.value) for a in actions if a.kind == "force"]
    uniform = sum(a.value for a in actions if a.kind == "distributed")
    factor = critical_load_factor(
        span=SPAN, lateral_stiffness=YOUNGS, torsion_stiffness=SHEAR,
        warping_stiffness=YOUNGS * warping, moment=moment,
        supports="cantilever" if supports == "cantilever" else "fork",
        point_loads=points, distributed_load=uniform, load_height=height, elements=ELEMENTS)
    return factor * peak, peak, warping


def test_critical_moment_never_exceeds_the_finite_element_solution_for_random_load_sets():
    rng = np.random.default_rng(20261203)
    mismatches = []
    for trial in range(40):
        supports, actions = _random_member(rng)
        loading = member_loading(supports, [SPAN], [actions])
        peak = float(np.abs(internal_actions(loading, np.linspace(0, SPAN, 4001)).moment).max())
        terms = diagram_terms(loading, peak, SPAN**2 / 8.0 if supports != "cantilever"
                              else SPAN**2 / 2.0)
        diagram = DiagramLoading(supports, SPAN, terms["lateral_gradient"], peak,
                                 terms["weight_lateral_gradient"], 1.0,
                                 terms["height_torsion"], terms["height_warping"])
        for kappa in (0.05, 1.0, 4.0, 16.0):
            for top in (False, True):
                warping = kappa**2 * SHEAR * SPAN**2 / (math.pi**2 * YOUNGS)
                height = 1.2 * math.sqrt(warping) if top else 0.0
                fe, fe_peak, _ = _finite_element_moment(loading, actions, kappa, height,
                                                        supports)
                ours = float(diagram_critical_moment(diagram, fe_peak, 0.0, YOUNGS, SHEAR,
                                                     1.0, 1.0, warping, height))
                if ours > 1.01 * fe:
                    mismatches.append(f"trial {trial} {supports} {actions} kappa {kappa} "
                                      f"top {top}: {ours:.4g} > FE {fe:.4g}")
    assert not mismatches, "\n".join(mismatches)


def test_self_weight_joins_by_dunkerleys_bound_on_the_safe_side():
    """A centre load with the self-weight of the same order on a simply supported I-beam
    (kappa = 1, loads at the shear centre): the bound lies below the finite element value
    of the combined diagram, and above the smaller of the two diagrams' own factors (the
    rule the shorthand cases use), as a weighted harmonic mean of the two."""
    load, weight = 1.0, 1.5
    actions = [Action("force", load, at=SPAN / 2)]
    loading = member_loading("simply_supported", [SPAN], [actions])
    terms = diagram_terms(loading, load * SPAN / 4, SPAN**2 / 8)
    kappa = 1.0
    warping = kappa**2 * SHEAR * SPAN**2 / (math.pi**2 * YOUNGS)
    peak = load * SPAN / 4 + weight * SPAN**2 / 8

    def moment(x):
        return load * 0.5 * np.minimum(x, SPAN - x) + weight * x * (SPAN - x) / 2

    fe = peak * critical_load_factor(
        span=SPAN, lateral_stiffness=YOUNGS, torsion_stiffness=SHEAR,
        warping_stiffness=YOUNGS * warping, moment=moment, supports="fork",
        point_loads=[(SPAN / 2, load)], distributed_load=weight, elements=ELEMENTS)
    diagram = DiagramLoading("simply_supported", SPAN, terms["lateral_gradient"],
                             load * SPAN / 4, terms["weight_lateral_gradient"], SPAN**2 / 8,
                             terms["height_torsion"], terms["height_warping"])
    ours = float(diagram_critical_moment(diagram, peak, weight, YOUNGS, SHEAR, 1.0, 1.0,
                                         warping))
    uniform_only = DiagramLoading("simply_supported", SPAN, terms["weight_lateral_gradient"],
                                  peak, 0.0, 0.0, 0.0, 0.0)
    smaller = float(diagram_critical_moment(uniform_only, peak, 0.0, YOUNGS, SHEAR, 1.0, 1.0,
                                            warping))
    assert smaller <= ours <= 1.01 * fe


def test_flat_bar_by_hand():
    """Reference 3 of the module docstring."""
    youngs, shear, span = 210e9, 81e9, 2.0
    depth, width = 0.100, 0.010
    minor = depth * width**3 / 12
    torsion = float(rectangle_torsion(depth, width)[0])
    by_hand = 16.94 * math.sqrt(youngs * minor * shear * torsion) / span**2 * span / 4
    assert by_hand == pytest.approx(4455.0, rel=5e-3)   # the figure worked by hand
    actions = [Action("force", 1000.0, at=span / 2)]
    loading = member_loading("simply_supported", [span], [actions])
    peak = 1000.0 * span / 4
    terms = diagram_terms(loading, peak, span**2 / 8)
    diagram = DiagramLoading("simply_supported", span, terms["lateral_gradient"], peak,
                             terms["weight_lateral_gradient"], span**2 / 8,
                             terms["height_torsion"], terms["height_warping"])
    ours = float(diagram_critical_moment(diagram, peak, 0.0, youngs, shear, minor, torsion,
                                         0.0))
    assert ours == pytest.approx(by_hand, rel=5e-3)


@pytest.mark.parametrize("fraction", [0.025, 0.1, 0.5])
def test_a_cantilever_loaded_near_its_root_buckles_as_the_loaded_length(fraction):
    """A narrow rectangular cantilever (I_w = 0) with one force at a = fraction x L, at the
    shear centre: beyond a the member carries no moment and may run straight and untwisted at
    no energy, so it buckles as a cantilever of length a with an end load, P_cr = 4.013
    sqrt(E I_z G I_t) / a^2 (Timoshenko & Gere sec. 6.5, from memory; reference 1), i.e.
    M_cr = 4.013 sqrt(E I_z G I_t) / a, within 0.5 % and never above it by more than the
    published value's last figure."""
    at = fraction * SPAN
    loading = member_loading("cantilever", [SPAN], [[Action("force", 1.0, at=at)]])
    peak = float(np.abs(internal_actions(loading, np.linspace(0, SPAN, 4001)).moment).max())
    terms = diagram_terms(loading, peak, SPAN**2 / 2.0)
    diagram = DiagramLoading("cantilever", SPAN, terms["lateral_gradient"], peak,
                             terms["weight_lateral_gradient"], 1.0, terms["height_torsion"],
                             terms["height_warping"])
    ours = float(diagram_critical_moment(diagram, peak, 0.0, YOUNGS, SHEAR, 1.0, 1.0, 0.0))
    published = 4.013 * math.sqrt(YOUNGS * SHEAR) / at
    assert ours == pytest.approx(published, rel=0.005)
