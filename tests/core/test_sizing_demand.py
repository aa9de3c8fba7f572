"""What a request asks of a member (service.core.sizing.demand)."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from service.core.sizing import DesignRequest
from service.core.sizing.demand import DEMAND_VALUES, Demand, demand_of


def test_a_bending_request_asks_its_load_and_deflection():
    demand = demand_of(DesignRequest("cantilever_end_load", span=2.0, load=300.0,
                                     max_deflection=0.01, min_wall=0.002))
    assert demand.bending
    assert (demand.span, demand.action, demand.stiffness_limit) == (2.0, 300.0, 0.01)
    assert (demand.max_depth, demand.max_width, demand.min_wall) == (math.inf, math.inf, 0.002)


def test_a_torsion_request_asks_its_torque_and_twist():
    demand = demand_of(DesignRequest("torsion", span=1.0, torque=40.0))
    assert not demand.bending
    assert (demand.action, demand.stiffness_limit) == (40.0, math.inf)


def test_stacked_demands_carry_a_case_axis_and_rows():
    demands = [demand_of(DesignRequest("cantilever_end_load", span=span, load=100.0))
               for span in (1.0, 2.0, 3.0)]
    stacked = Demand.stack(demands)
    for name in DEMAND_VALUES:
        assert np.shape(getattr(stacked, name)) == (3, 1, 1)
    np.testing.assert_array_equal(stacked.take(slice(1, 2)).span, [[[2.0]]])
    rows = stacked.per_row(2)                 # two materials: rows case-major
    np.testing.assert_array_equal(rows.span[:, 0], [1.0, 1.0, 2.0, 2.0, 3.0, 3.0])


def test_replace_gives_what_dataclasses_replace_gives():
    demand = demand_of(DesignRequest("cantilever_end_load", span=2.0, load=300.0,
                                     max_deflection=0.01))
    changes = {"span": np.array([[1.0], [2.0]]), "self_weight": True, "form_limit": None}
    replaced = demand.replace(**changes)
    expected = dataclasses.replace(demand, **changes)
    assert type(replaced) is Demand
    for field in dataclasses.fields(Demand):
        assert getattr(replaced, field.name) is getattr(expected, field.name), field.name
    assert demand.span == 2.0 and not demand.self_weight    # the original is left as it was
    with pytest.raises(TypeError, match="spam"):
        demand.replace(spam=1.0)
