"""The utilization entries and the governing rule, declared once in sizing/limits.py."""

from __future__ import annotations

import dataclasses

import pytest

from service.core.sizing import DIMENSION_RESOLUTION, DesignRequest, size_designs
from service.core.sizing.checks import CHECK_NAMES
from service.core.sizing.limits import GOVERNING, LIMIT_NAMES, UTILIZATION_KEYS, governing
from service.core.sizing.scale import REQUIREMENTS


def test_every_entry_is_declared_once():
    assert set(UTILIZATION_KEYS) == set(GOVERNING) == set(CHECK_NAMES) | set(LIMIT_NAMES)
    assert len(UTILIZATION_KEYS) == len(set(UTILIZATION_KEYS))
    assert set(REQUIREMENTS) <= set(GOVERNING)


@pytest.mark.parametrize("utilization, expected", [
    ({"stiffness": 0.5, "strength": 1.0, "envelope": 0.3}, "strength"),
    ({"stiffness": 1.0, "strength": 0.9995, "proportions": 0.2}, "stiffness"),
    # the tie goes to the geometric limit: it kept the design from a lighter one
    ({"strength": 1.0, "min_wall": 0.9995}, "min_wall"),
    ({"strength": 1.0, "proportions": 1.0, "envelope": 0.9992}, "envelope"),
    ({"strength": 1.0, "proportions": 0.99, "stiffness": None}, "strength"),
    # held by the process alone: it is named; with the request's own limit, that one
    ({"strength": 1.0, "min_wall": None, "manufacturing": 0.9995}, "manufacturing"),
    ({"strength": 1.0, "envelope": 1.0, "manufacturing": 1.0}, "envelope"),
])
def test_governing_is_the_largest_with_geometric_limits_first_in_a_tie(utilization, expected):
    assert governing(utilization) == expected


def test_requirements_not_asked_for_are_null(table):
    """No max_deflection, local buckling off, no envelope, no min_wall: those entries are
    None; strength is always asked for and governs."""
    request = DesignRequest("cantilever_end_load", span=1.0, load=500.0, local_buckling=False,
                            sections=("solid_round", "round_tube"))
    designs = size_designs(request, table.take([table.ids.index("s355j2")])).designs
    by_family = {d.family: d for d in designs}
    for design in designs:
        assert set(design.utilization) == set(UTILIZATION_KEYS)
        for name in ("stiffness", "local_buckling", "envelope", "min_wall"):
            assert design.utilization[name] is None
    assert by_family["solid_round"].utilization["proportions"] is None   # no rule
    assert by_family["round_tube"].utilization["proportions"] is not None
    assert by_family["solid_round"].governing == "strength"


def test_an_envelope_design_reports_the_envelope_at_one(table):
    """A stiff I-beam in a shallow envelope: its depth is max_depth to within the rounding
    steps, the envelope entry is 1 to within them and governs (the envelope forced the
    proportions). Without the manufacturing limits, which this test is not about."""
    request = DesignRequest("simply_supported_center_load", span=2.0, load=3000.0,
                            safety_factor=1.5, max_deflection=0.004, max_depth=0.08,
                            sections=("i_section",))
    unmade = dataclasses.replace(table, form_limits=None)
    (design,) = size_designs(request, unmade.take([unmade.ids.index("s355j2")])).designs
    assert 0.08 - 2 * DIMENSION_RESOLUTION <= design.dimensions["depth"] <= 0.08
    assert design.utilization["envelope"] == pytest.approx(design.dimensions["depth"] / 0.08)
    assert design.utilization["envelope"] == pytest.approx(1.0, abs=1e-4)
    assert design.governing == "envelope"
