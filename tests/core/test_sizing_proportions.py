"""The proportion search (service.core.sizing.proportions): first grid, then refinement.

Reference: without an envelope a stiffness-limited solid rectangle is lightest at its
smallest width/depth ratio (mass ~ r^(1/2) at fixed stiffness, elementary beam theory), so
the search must end on that bound; with a depth limit it must end where the depth binds.
"""

from __future__ import annotations

import numpy as np

from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest
from service.core.sizing.demand import Demand, demand_of
from service.core.sizing.proportions import grid_starts, refine


def searched(materials, **changes):
    family = FAMILIES["solid_rectangle"]
    demand = demand_of(DesignRequest("cantilever_end_load", span=1.5, load=500.0,
                                     max_deflection=0.005, local_buckling=False, **changes))
    start = grid_starts(family, materials, Demand.stack([demand]))
    assert start.shape == (1, 2)
    optimum = refine(family, start, materials, Demand.stack([demand]).per_row(2))
    return start, optimum


def test_without_an_envelope_the_search_ends_on_the_smallest_ratio(demo_values):
    start, optimum = searched(demo_values)
    np.testing.assert_allclose(optimum.ratios[:, 0], 0.1, rtol=1e-12)
    assert np.all(optimum.bounds.mass <= start.lightest * (1 + 1e-12))


def test_with_a_depth_limit_the_search_ends_where_the_depth_binds(demo_values):
    _, optimum = searched(demo_values, max_depth=0.05)
    assert optimum.bounds.feasible.all()
    # depth = scale: the depth limit binds (to the refinement's precision, 1e-5 in log)
    np.testing.assert_allclose(optimum.bounds.scale, 0.05, rtol=1e-4)
