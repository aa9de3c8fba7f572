"""The self-similar run (service.core.sizing.selfsimilar): what lets the engine leave rows out.

The run's rows are the (case, material) pairs of one family; its search is checked against
exhaustive search in tests/validation/test_search_brute_force.py and its designs against
published formulas in tests/validation and tests/properties. Here: the bound behind leaving
rows out holds, and a case axis gives each case its own search.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, reject, settings
from hypothesis import strategies as st
from sizing_cases import BENDING, numbers

from service.core.errors import InputError
from service.core.materials import load_builtin
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, size_designs, validate_request
from service.core.sizing.demand import Demand, demand_of
from service.core.sizing.engine import made_in
from service.core.sizing.selfsimilar import PRUNE_MARGIN, SelfSimilarRun
from service.core.sizing.values import MaterialValues

TABLE = load_builtin()


def sized_run(family, indices, values, *demands):
    """The run the engine builds for ``family``, the materials ``indices`` of ``values`` and
    one case per demand, with every row sized (in one part)."""
    run = SelfSimilarRun.begin(family, indices, values, Demand.stack(demands), "mass")
    run.size(np.arange(len(indices) * len(demands)))
    ((_, sized),) = run.parts
    return run, sized


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.sampled_from([*BENDING, "torsion"]).flatmap(
    lambda case: st.tuples(st.just(case), numbers(case))),
       st.booleans(), st.booleans(), st.sampled_from(["typical", "conservative"]))
def test_no_design_is_lighter_than_the_pruning_bound(drawn, self_weight, local_buckling,
                                                     basis):
    """The assumption behind leaving rows out (PRUNE_MARGIN): no row's design weighs
    less than that fraction of its grid's lightest mass without self-weight among the points
    near the envelope (GridStart.floor_mass). Every built-in material, every family that carries
    the loading."""
    load_case, values = drawn
    request = DesignRequest(load_case, self_weight=self_weight and load_case != "torsion",
                            local_buckling=local_buckling, property_basis=basis, **values)
    try:
        validate_request(request)
    except InputError:
        reject()                     # an impossible request: not an example of the claim
    demand = demand_of(request)
    table_values = MaterialValues.from_table(TABLE, request.property_basis)
    for family_id in request.families:
        family = FAMILIES[family_id]
        indices = np.flatnonzero(made_in(TABLE, family_id))
        if family_id == "sandwich_panel" or not len(indices):
            continue
        run, sized = sized_run(family, indices, table_values, demand)
        floor = run.start.floor_mass
        found = sized.feasible
        ratio = sized.check.mass[found] / floor[found]
        assert np.all(ratio >= PRUNE_MARGIN), (family_id, ratio.min())
        # without self-weight the floor is the grid's own unconstrained mass, or above it
        # where the envelope leaves out the lightest grid points
        if not request.self_weight:
            assert np.all(floor >= sized.optimum.unconstrained_mass)


def test_proportion_search_broadcasts_over_a_case_axis():
    """Three loads on a leading (C, 1, 1) axis give the masses of three separate searches
    (within 0.1 %: the rows of a case axis are searched together, so the two may stop a
    hair apart)."""
    indices = np.array([TABLE.ids.index(i) for i in ("s355j2", "al_6061_t6", "cfrp_qi_sm")])
    values = MaterialValues.from_table(TABLE, "typical")
    demand = demand_of(DesignRequest("simply_supported_center_load", span=2.0, load=1.0,
                                     max_deflection=0.005, safety_factor=1.5, max_depth=0.1))
    loads = np.array([2000.0, 5000.0, 9000.0])
    for family_id in ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube",
                      "i_section"):
        family = FAMILIES[family_id]
        _, together = sized_run(family, indices, values,
                                *(dataclasses.replace(demand, action=load) for load in loads))
        mass = together.optimum.bounds.mass.reshape(len(loads), len(indices))
        assert mass.shape == (3, 3)
        for k, load in enumerate(loads):
            _, alone = sized_run(family, indices, values,
                                 dataclasses.replace(demand, action=load))
            np.testing.assert_allclose(mass[k], alone.optimum.bounds.mass, rtol=1e-3)


def test_envelope_rejection_names_the_needed_size(table, pick):
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


def test_cannot_carry_its_own_weight(table, pick):
    """A 10 m steel cantilever bar: its own weight alone gives sigma = 4 rho g L^2 / D, so it
    needs D >= 4 rho g L^2 / sigma_f = 0.087 m (hand calculation) > the 0.05 m envelope."""
    request = DesignRequest("cantilever_end_load", span=10.0, load=1.0, max_depth=0.05,
                            sections=("solid_round",))
    steel = pick(table, "s355j2")
    assert size_designs(request, steel).designs
    with_weight = size_designs(dataclasses.replace(request, self_weight=True), steel)
    assert not with_weight.designs
    assert with_weight.rejected[0].reason.startswith("cannot carry its own weight")


@pytest.mark.parametrize("change, governing, family", [
    (dict(), "strength", "solid_round"),
    (dict(max_deflection=0.001), "stiffness", "solid_round"),
    (dict(min_wall=0.006), "min_wall", "round_tube"),
    # heavy enough that the walls are above the 3.8 mm of the smallest rolled I-section
    # (EN 10365 IPE 80, data/form_limits.csv), which governs lighter beams
    (dict(load=2e4, max_deflection=0.004, max_depth=0.1), "envelope", "i_section"),
])
def test_governing_requirement(table, pick, change, governing, family):
    request = DesignRequest(**{**dict(load_case="simply_supported_center_load", span=2.0,
                                      load=3000.0, safety_factor=1.5, sections=(family,)),
                               **change})
    (design,) = size_designs(request, pick(table, "s355j2")).designs
    assert design.governing == governing
    assert max(u for u in design.utilization.values() if u is not None) <= 1.0
