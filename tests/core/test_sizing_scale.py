"""The scale bounds of the sizing (service.core.sizing.scale): each check's rows assembled in
CHECK_NAMES order, the walls', broadcasting over a case axis."""


from __future__ import annotations

import numpy as np
import pytest

from service.core.loadcases import LOAD_CASES
from service.core.loading.actions import Action
from service.core.materials import load_builtin
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, unit_bounds
from service.core.sizing.checks import CHECK_NAMES, CHECKS
from service.core.sizing.checks.base import Found
from service.core.sizing.checks.member_buckling import applies
from service.core.sizing.demand import Demand, demand_of
from service.core.sizing.scale import (
    WALL_ROW,
    UnitSection,
    scale_bounds,
)
from service.core.sizing.unit_bounds import bounds_at, pressed
from service.core.sizing.values import MaterialValues


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


def values(density, youngs, strength, shear_strength=np.inf):
    """Material values with the given density, E and strength (G, nu, price and carbon are
    not read by these rows: the unit sections have no shear deformation area)."""
    return MaterialValues(np.asarray(density), np.asarray(youngs), np.asarray(youngs / 2.6),
                          np.asarray(0.3), np.asarray(strength), np.asarray(shear_strength),
                          np.asarray(1.0), np.asarray(1.0))


def test_bounds_broadcast_over_a_leading_case_axis():
    """A (C, 1, 1) span axis gives the same bounds as C separate calls."""
    unit = unit_section(area=np.array([[0.1, 0.2]]), stiffness_modulus=np.array([[0.01, 0.02]]),
                        strength_modulus=np.array([[0.02, 0.03]]))
    density = np.array([[7850.0], [2700.0]])
    spans = np.array([1.0, 2.0, 4.0])
    materials = values(density, 7e10, 2e8)
    together = scale_bounds(unit, materials, demand(span=spans[:, None, None]))
    for k, span in enumerate(spans):
        alone = scale_bounds(unit, materials, demand(span=span))
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
    bounds = scale_bounds(unit, values(7850.0, 2.1e11, 355e6, 205e6),
                          demand(self_weight=False, min_wall=0.002))
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


def test_the_floor_is_the_largest_earlier_part_and_only_where_parts_need_not_be_exact():
    """Found.floor: the largest of the earlier checks' parts for a grid (not exact), None for
    the polish (exact) or when no earlier check bounds the scale."""
    parts = {"stiffness": [np.array([1.0, 5.0])],
             "strength": [np.array([3.0, 2.0]), np.array([0.5, 6.0])], "local_buckling": []}
    np.testing.assert_array_equal(Found(parts, exact=False).floor(), [3.0, 6.0])
    assert Found(parts, exact=True).floor() is None
    assert Found({"stiffness": []}, exact=False).floor() is None


@pytest.mark.parametrize("self_weight", [False, True])
def test_a_grid_without_exact_parts_keeps_the_scale(self_weight):
    """An unbraced I-section (member buckling searched) over random proportions and every
    built-in material: with exact_parts False the scale is the exact one's to 1e-11 (member
    buckling's search then starts from the other checks' floor, not from the strength's
    scale: round-off only), and member buckling's part is never above its exact value
    (where it cannot set the scale a lower bound stands in)."""
    family = FAMILIES["i_section"]
    materials = MaterialValues.from_table(load_builtin(), "design").column()
    low, high = (np.log([getattr(b, end) for b in family.ratio_bounds]) for end in ("low", "high"))
    ratios = np.exp(low + np.random.default_rng(3).random((30, len(low))) * (high - low))
    asked = demand_of(DesignRequest("cantilever_end_load", span=3.0, load=5000.0,
                                    safety_factor=1.5, self_weight=self_weight))
    exact = bounds_at(family, ratios, materials, asked)
    grid = bounds_at(family, ratios, materials, asked, exact_parts=False)
    finite = np.isfinite(exact.scale)
    np.testing.assert_allclose(grid.scale[finite], exact.scale[finite], rtol=1e-11, atol=0.0)
    np.testing.assert_array_equal(np.isfinite(grid.scale), finite)
    row = CHECK_NAMES.index("member_buckling")
    assert np.any(grid.lower[row] < exact.lower[row])          # the skip happened somewhere
    assert np.all(grid.lower[row] <= exact.lower[row] * (1.0 + 1e-12))


@pytest.mark.parametrize("request_", [
    DesignRequest("simply_supported_center_load", span=2.0, load=5000.0, safety_factor=1.5,
                  max_deflection=0.005, self_weight=True, bearing_length=0.02),
    DesignRequest("member", span=0.8, supports="simply_supported", safety_factor=1.5,
                  rotating=True, fatigue_cycles=1e7, min_frequency=40.0,
                  max_deflection=0.002, actions=(Action("force", 500.0, at=0.4),
                                                 Action("torque", 20.0, at=0.4))),
], ids=["shorthand", "general"])
def test_each_row_is_its_checks_own_bound_in_check_order(request_):
    """scale_bounds asks every check in CHECK_NAMES order: each row is the largest of what
    the check's own scale_bound returns given the checks before it (0 where it returns none),
    and the parts are those returns, stacked in the same order."""
    family = FAMILIES["rectangular_tube"]
    materials = MaterialValues.from_table(load_builtin(), "design").take(
        np.arange(6)).column()
    low, high = (np.log([getattr(b, end) for b in family.ratio_bounds]) for end in ("low", "high"))
    ratios = np.exp(low + np.random.default_rng(5).random((8, len(low))) * (high - low))
    asked = demand_of(request_)
    unit, _ = unit_bounds.unit_section(family, ratios, materials, asked.case.loading,
                                       applies(asked), asked.member, pressed(asked))
    bounds = scale_bounds(unit, materials, asked)
    found = Found({})
    stacked = []
    for row, check in enumerate(CHECKS):
        assert check.scale_bound is not None
        own = list(check.scale_bound(unit, materials, asked, found) or ())
        found.parts[check.name] = own
        stacked += own
        expected = np.maximum.reduce(own) if own else 0.0
        np.testing.assert_array_equal(bounds.lower[row], np.broadcast_to(
            expected, bounds.scale.shape), err_msg=check.name)
    np.testing.assert_array_equal(bounds.parts[:len(stacked)], np.broadcast_arrays(
        *stacked, bounds.scale)[:-1])
    # the rows asked of each form (a general member's frequency and fatigue among them)
    asked_rows = {name for name, own in found.parts.items() if own}
    assert asked_rows >= {"stiffness", "strength", "local_buckling", "interaction"}
    if asked.member is not None:
        assert {"frequency", "fatigue"} <= asked_rows
    else:
        assert "bearing" in asked_rows


def test_skipped_checks_give_nan_parts_and_leave_the_others_exact():
    """bounds_at with ``skip``: the skipped checks' parts are NaN (as many as ``layout``
    says they give), every other part is the full evaluation's to the bit; strength is
    evaluated all the same where member buckling (which reads it) is."""
    family = FAMILIES["i_section"]
    materials = MaterialValues.from_table(load_builtin(), "design").take(
        np.arange(8)).column()
    low, high = (np.log([getattr(b, end) for b in family.ratio_bounds]) for end in ("low", "high"))
    ratios = np.exp(low + np.random.default_rng(7).random((12, len(low))) * (high - low))
    asked = demand_of(DesignRequest("fixed_fixed_center_load", span=1.2, load=3000.0,
                                    safety_factor=1.5, axial_force=-5000.0))
    full = bounds_at(family, ratios, materials, asked)
    counts = dict(zip(CHECK_NAMES, full.layout, strict=True))
    assert counts["member_buckling"] > 1 and counts["interaction"] == 3
    starts = dict(zip(CHECK_NAMES, np.cumsum((0, *full.layout)), strict=False))

    def rows(name):
        return np.arange(starts[name], starts[name] + counts[name])

    for skip in (["interaction", "bearing"], ["member_buckling", "interaction", "bearing"],
                 ["strength", "bearing"]):
        bounds = bounds_at(family, ratios, materials, asked,
                           skip={name: counts[name] for name in skip})
        assert bounds.layout == full.layout
        skipped = [name for name in skip if name != "strength"]   # member buckling reads it
        left_out = np.concatenate([rows(name) for name in skipped])
        assert np.all(np.isnan(bounds.parts[left_out]))
        kept = np.setdiff1d(np.arange(len(full.parts)), left_out)
        np.testing.assert_array_equal(bounds.parts[kept], full.parts[kept])
