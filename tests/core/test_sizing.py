"""Unit checks of the sizing engine: closed forms, validation, rejections, governing, order."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy.optimize import brentq

from service.core.errors import InputError
from service.core.loadcases import LOAD_CASES
from service.core.materials import load_builtin
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.demand import Demand
from service.core.sizing.fields import at_contract_paths
from service.core.sizing.scale import (
    UnitSection,
    cubic_scale,
    root_scale,
    scale_bounds,
)

FIVE = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube", "i_section")


@pytest.fixture(scope="module")
def table():
    return load_builtin()


def pick(table, *ids):
    return table.take([table.ids.index(i) for i in ids])


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
    np.testing.assert_array_equal(bounds.lower[3], wall)
    # the weaker mode sets the buckling scale: sigma = M SF / (z s^3) at the mode's stress
    moment = LOAD_CASES["simply_supported_center_load"].moment_coefficient * 2000.0 * 3.0
    np.testing.assert_allclose(np.maximum(first, second),
                               np.cbrt(moment * 1.5 / (0.02 * np.minimum(*modes))), rtol=1e-12)
    assert web[1] > first[1]            # the thin web's shear buckling governs the second


BAD_REQUESTS = [
    (dict(span=-1.0), "load_case.span"),
    (dict(load=None), "load_case.load"),
    (dict(load_case="torsion", load=None), "load_case.torque"),
    (dict(safety_factor=0.9), "requirements.safety_factor"),
    (dict(max_twist=0.1), "requirements.max_twist"),
    (dict(max_depth=0.0), "envelope.max_depth"),
    (dict(min_wall=-0.001), "min_wall"),
    (dict(sections=("solid_round", "hexagon")), "sections.1"),
    (dict(load_case="bridge"), "load_case.type"),
    (dict(load_case="torsion", load=None, torque=5.0, self_weight=True),
     "requirements.self_weight"),
]


@pytest.mark.parametrize("change, path", BAD_REQUESTS)
def test_impossible_requests_name_the_field(table, change, path):
    base = dict(load_case="cantilever_end_load", span=1.0, load=100.0)
    with pytest.raises(InputError) as error:
        size_designs(DesignRequest(**{**base, **change}), pick(table, "s355j2"))
    # the core names its own fields; the declarations give their contract paths
    assert path in at_contract_paths(error.value).errors


def test_not_made_in_this_form(table):
    glass = pick(table, "glass_soda_lime")
    assert "i_section" not in glass.forms[0]
    result = size_designs(DesignRequest("cantilever_end_load", span=1.0, load=100.0,
                                        sections=("i_section",)), glass)
    assert [r.reason for r in result.rejected] == ["not made in this form"]


def test_envelope_rejection_names_the_needed_size(table):
    """A solid round needs D = (64 c_D P L^3 / (pi E delta))^(1/4) for stiffness (c_D = 1/3,
    Roark table 8.1 case 1a): the reason quotes it to 3 figures."""
    steel = pick(table, "s355j2")
    request = DesignRequest("cantilever_end_load", span=2.0, load=1000.0, max_deflection=0.005,
                            max_depth=0.04, sections=("solid_round",))
    (rejection,) = size_designs(request, steel).rejected
    youngs = float(steel.values("youngs_modulus")[0])
    needed = (64 * 1000.0 * 2.0**3 / (3 * math.pi * youngs * 0.005)) ** 0.25
    assert rejection.reason == (
        f"envelope max_depth 0.04 m is too small: stiffness needs at least {needed:.3g} m")


def test_cannot_carry_its_own_weight(table):
    """A 10 m steel cantilever bar: its own weight alone gives sigma = 4 rho g L^2 / D, so it
    needs D >= 4 rho g L^2 / sigma_f = 0.087 m (hand calculation) > the 0.05 m envelope."""
    request = DesignRequest("cantilever_end_load", span=10.0, load=1.0, max_depth=0.05,
                            sections=("solid_round",))
    steel = pick(table, "s355j2")
    assert size_designs(request, steel).designs
    with_weight = size_designs(dataclasses.replace(request, self_weight=True), steel)
    assert not with_weight.designs
    assert with_weight.rejected[0].reason.startswith("cannot carry its own weight")


def test_self_weight_makes_designs_heavier(table):
    request = DesignRequest("simply_supported_uniform_load", span=6.0, load=2000.0,
                            max_deflection=0.02, sections=FIVE)
    materials = pick(table, "s355j2", "douglas_fir")
    light = {(d.material_id, d.family): d.mass for d in size_designs(request, materials).designs}
    heavy = size_designs(dataclasses.replace(request, self_weight=True), materials).designs
    assert heavy and all(d.mass > light[(d.material_id, d.family)] for d in heavy)


@pytest.mark.parametrize("change, governing, family", [
    (dict(), "strength", "solid_round"),
    (dict(max_deflection=0.001), "stiffness", "solid_round"),
    (dict(min_wall=0.006), "min_wall", "round_tube"),
    (dict(max_deflection=0.004, max_depth=0.08), "envelope", "i_section"),
])
def test_governing_requirement(table, change, governing, family):
    request = DesignRequest(**{**dict(load_case="simply_supported_center_load", span=2.0,
                                      load=3000.0, safety_factor=1.5, sections=(family,)),
                               **change})
    (design,) = size_designs(request, pick(table, "s355j2")).designs
    assert design.governing == governing
    assert max(design.utilization.values()) <= 1.0


def test_designs_sorted_by_the_objective_and_cut_to_top(table):
    materials = pick(table, "s355j2", "al_6061_t6", "cfrp_qi_sm", "douglas_fir")
    base = DesignRequest("cantilever_end_load", span=1.0, load=500.0, max_deflection=0.005,
                         sections=("round_tube",))
    for objective in ("mass", "cost", "carbon"):
        designs = size_designs(dataclasses.replace(base, objective=objective), materials).designs
        values = [getattr(d, objective) for d in designs]
        assert values == sorted(values)
    by_cost = size_designs(dataclasses.replace(base, objective="cost"), materials).designs
    by_mass = size_designs(base, materials).designs
    assert [d.material_id for d in by_cost] != [d.material_id for d in by_mass]
    top = size_designs(dataclasses.replace(base, top=2), materials).designs
    assert [d.material_id for d in top] == [d.material_id for d in by_mass[:2]]


def test_conservative_basis_is_heavier(table):
    request = DesignRequest("cantilever_end_load", span=1.0, load=500.0, max_deflection=0.005,
                            sections=("solid_round",))
    materials = pick(table, "s355j2", "al_6061_t6")
    typical = size_designs(request, materials).designs
    conservative = size_designs(dataclasses.replace(request, property_basis="conservative"),
                                materials).designs
    by_id = {d.material_id: d.mass for d in typical}
    assert all(d.mass >= by_id[d.material_id] for d in conservative)


def test_no_feasible_design_returns_reasons_not_an_error(table):
    request = DesignRequest("cantilever_end_load", span=3.0, load=1e5, max_deflection=0.001,
                            max_depth=0.01, max_width=0.01, sections=FIVE)
    result = size_designs(request, pick(table, "s355j2", "al_6061_t6"))
    assert result.designs == ()
    assert len(result.rejected) == 10
    assert all(r.reason for r in result.rejected)


def test_sandwich_panel_meets_classical_sandwich_theory(table):
    """A sized panel rechecked with Allen (1969), Analysis and Design of Structural Sandwich
    Panels, ch. 2 and 8 (from memory), written out here: D = E_f b t d^2/2 + E_f b t^3/6 +
    E_c b c^3/12, S = G_c b d^2/c, deflection 5 W L^3/(384 D) + W L/(8 S) (simply supported,
    uniform), face stress M E_f (c/2 + t)/D, core shear V/(b d), wrinkling 0.5 (E_f E_c G_c)^(1/3)
    on the face mid-plane stress. Tolerance 1e-9 (round-off)."""
    request = DesignRequest("simply_supported_uniform_load", span=2.0, load=2000.0,
                            max_deflection=0.008, safety_factor=1.5, max_width=0.4,
                            sections=("sandwich_panel",))
    faces = pick(table, "al_6061_t6", "cfrp_qi_sm")
    cores = pick(table, "pvc_foam_100", "pmi_foam_75")
    result = size_designs(request, faces, cores)
    assert len(result.designs) == 2
    for design in result.designs:
        f = {n: float(faces.values(n)[design.material_index]) for n in
             ("youngs_modulus", "strength")}
        k = design.core_material_index
        c_ = {n: float(cores.values(n)[k]) for n in ("youngs_modulus", "shear_modulus",
                                                    "density")}
        core_shear_strength = float(cores.shear_strength()[k])
        b, c, t = (design.dimensions[n] for n in ("width", "core_thickness", "face_thickness"))
        d = c + t
        rigidity = f["youngs_modulus"] * b * (t * d**2 / 2 + t**3 / 6) + c_["youngs_modulus"] * (
            b * c**3 / 12)
        shear_stiffness = c_["shear_modulus"] * b * d**2 / c
        deflection = 5 * 2000.0 * 2.0**3 / (384 * rigidity) + 2000.0 * 2.0 / (8 * shear_stiffness)
        moment, shear = 2000.0 * 2.0 / 8, 2000.0 / 2
        face_stress = moment * f["youngs_modulus"] * (c / 2 + t) / rigidity
        wrinkling = 0.5 * (f["youngs_modulus"] * c_["youngs_modulus"] * c_["shear_modulus"]) ** (
            1 / 3)
        assert b == 0.4
        assert math.isclose(design.deflection, deflection, rel_tol=1e-9)
        assert deflection <= 0.008 * (1 + 1e-12)
        assert face_stress * 1.5 <= f["strength"]
        assert shear / (b * d) * 1.5 <= core_shear_strength
        assert moment * f["youngs_modulus"] * d / 2 / rigidity * 1.5 <= wrinkling
        assert design.core_material_id in cores.ids


def test_sandwich_needs_a_width(table):
    # Named without a width, the panel is impossible: a 422 on the envelope's max_width.
    request = DesignRequest("cantilever_end_load", span=1.0, load=100.0,
                            sections=("sandwich_panel",))
    with pytest.raises(InputError) as caught:
        size_designs(request, pick(table, "al_6061_t6"))
    assert "sandwich_panel" in at_contract_paths(caught.value).errors["envelope.max_width"][0]
    # Taken by default, it is a rejection with the reason.
    default = DesignRequest("cantilever_end_load", span=1.0, load=100.0)
    (rejection,) = [r for r in size_designs(default, pick(table, "al_6061_t6")).rejected
                    if r.family == "sandwich_panel"]
    assert "max_width" in rejection.reason


@pytest.mark.parametrize(
    ("sections", "envelope", "min_wall", "path"),
    [
        (("round_tube",), {"max_width": 0.003}, 0.002, "min_wall"),
        (("rectangular_tube",), {"max_depth": 0.05, "max_width": 0.004}, 0.002, "min_wall"),
        (("i_section",), {"max_depth": 0.004}, 0.002, "min_wall"),
        (("i_section",), {"max_width": 0.001}, 0.002, "min_wall"),
        (("sandwich_panel",), {"max_depth": 0.004, "max_width": 0.1}, 0.002, "min_wall"),
    ],
)
def test_named_family_that_cannot_fit_its_walls_is_refused(
    table, sections, envelope, min_wall, path
):
    request = DesignRequest("cantilever_end_load", span=1.0, load=100.0, sections=sections,
                            min_wall=min_wall, **envelope)
    with pytest.raises(InputError) as caught:
        size_designs(request, pick(table, "al_6061_t6"))
    assert path in caught.value.errors


@pytest.mark.parametrize("sections", [("round_tube",), ("i_section",), ("sandwich_panel",)])
def test_named_family_that_fits_is_accepted(table, sections):
    # Walls of 2 mm in a 30 mm x 50 mm envelope: the check refuses only the impossible.
    request = DesignRequest("cantilever_end_load", span=0.2, load=1.0, sections=sections,
                            min_wall=0.002, max_depth=0.03, max_width=0.05)
    (design,) = size_designs(request, pick(table, "al_6061_t6")).designs
    assert design.family == sections[0]
    assert min(design.dimensions[name] for name in FAMILIES[sections[0]].wall_dimensions) >= 0.002


def test_named_family_that_does_not_carry_the_loading_is_refused(table):
    request = DesignRequest("torsion", span=1.0, torque=10.0,
                            sections=("round_tube", "sandwich_panel"))
    with pytest.raises(InputError) as caught:
        size_designs(request, pick(table, "al_6061_t6"))
    assert list(caught.value.errors) == ["sections.1"]


def test_pareto_front_is_the_non_dominated_set(table):
    """Against a brute-force dominance check over every pair of designs."""
    from service.core.sizing.pareto import pareto_front

    request = DesignRequest("cantilever_end_load", span=1.0, load=500.0, max_deflection=0.005,
                            sections=FIVE)
    designs = size_designs(request, table).designs
    for objectives in (("mass", "cost"), ("mass", "carbon")):
        front = pareto_front(designs, objectives)

        def dominated(d, objectives=objectives):
            a = [d.objective_value(o) for o in objectives]
            return any(all(e.objective_value(o) <= v for o, v in zip(objectives, a, strict=True))
                       and any(e.objective_value(o) < v for o, v in zip(objectives, a,
                                                                          strict=True))
                       for e in designs)

        expected = {id(d) for d in designs if not dominated(d)}
        assert {id(d) for d in front} == expected
        assert len(front) >= 2
    with pytest.raises(InputError):
        pareto_front(designs, ("mass", "mass"))


def test_catalogue_sizing_returns_the_lightest_passing_member(table):
    """Brute force: every member of the EN 10365 IPE list checked one at a time with the
    section property functions and the simply supported uniform-load formulas (Roark 8th ed.
    table 8.1 case 2e, from memory); the engine's pick must be the lightest that passes."""
    from service.core.sections import FAMILIES
    from service.core.sections.base import Elastic
    from service.core.sizing import catalog_members

    members = catalog_members("ipe_en10365")
    request = DesignRequest("simply_supported_uniform_load", span=5.0, load=30000.0,
                            max_deflection=0.02, safety_factor=1.5, max_depth=0.3,
                            catalog=members)
    steel = pick(table, "s355j2", "al_6082_t6")
    designs = {d.material_id: d for d in size_designs(request, steel).designs}
    family = FAMILIES["i_section"]
    for row, material_id in enumerate(steel.ids):
        e, g, nu, rho, strength = (float(steel.values(n)[row]) for n in (
            "youngs_modulus", "shear_modulus", "poisson_ratio", "density", "strength"))
        passing = []
        for member in members:
            dims = {k: np.asarray(v) for k, v in member.dimensions.items()}
            props = family.properties(dims)
            stress = 30000.0 * 5.0 / 8 / float(props.section_modulus_major)
            ok = (5 * 30000.0 * 5.0**3 / (384 * e * float(props.second_moment_major)) <= 0.02
                  and stress * 1.5 <= strength
                  and stress * 1.5 <= float(family.local_buckling(dims, Elastic(e, g, nu)).bending)
                  and member.dimensions["depth"] <= 0.3)
            if ok:
                passing.append((rho * float(props.area) * 5.0, member.designation))
        assert passing
        assert designs[material_id].designation == min(passing)[1]
        assert math.isclose(designs[material_id].mass, min(passing)[0], rel_tol=1e-12)


def test_builtin_catalogues_load():
    from service.core.sizing import catalog_names, load_catalog

    assert set(catalog_names()) >= {"chs_en10219", "rhs_en10219", "ipe_en10365"}
    for name in catalog_names():
        assert load_catalog(name)
