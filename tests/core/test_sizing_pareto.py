"""The Pareto front of designs (service.core.sizing.pareto)."""


from __future__ import annotations

import pytest

from service.core.errors import InputError
from service.core.sizing import DesignRequest, size_designs

FIVE = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube", "i_section")



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
