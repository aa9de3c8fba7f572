"""Rejections grouped by reason (service.core.sizing.results): the reasons the engine writes,
and what a group of them keeps."""

from __future__ import annotations

import math

from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.engine import NOT_MADE_IN_FORM, brittle_rejection
from service.core.sizing.results import Rejection, grouped_rejections, reason_summary


def test_a_summary_drops_the_values_of_each_material():
    table = load_builtin()
    brittle = [i for i, flag in enumerate(table.brittle) if flag]
    summaries = {reason_summary(brittle_rejection(table, i)) for i in brittle}
    assert summaries == {"brittle: it may break without warning; left out by default: set "
                         "requirements.allow_brittle to true to size it"}
    assert reason_summary("envelope max_depth 0.03 m is too small: stiffness needs at least "
                          "0.0332 m") == "envelope max_depth 0.03 m is too small"
    assert reason_summary(NOT_MADE_IN_FORM) == NOT_MADE_IN_FORM
    # a headline that names the material's own value is all there is: kept whole
    limit = "density 7850 kg/m^3 is above requirements.property_limits.density.max 3000 kg/m^3"
    assert reason_summary(limit) == limit


def test_groups_keep_the_order_the_materials_and_the_count():
    rejections = [
        Rejection(0, "a", "round_tube", "envelope max_depth 0.03 m is too small: x needs 1 m"),
        Rejection(1, "b", "round_tube", NOT_MADE_IN_FORM),
        Rejection(2, "c", "i_section", "envelope max_depth 0.03 m is too small: x needs 2 m"),
        Rejection(0, "a", "i_section", "envelope max_depth 0.03 m is too small: x needs 3 m",
                  math.inf),
    ]
    first, second = grouped_rejections(rejections)
    assert (first.reason, first.material_ids, first.families, first.count) == (
        "envelope max_depth 0.03 m is too small", ("a", "c"), ("round_tube", "i_section"), 3)
    assert (second.reason, second.material_ids, second.families, second.count) == (
        NOT_MADE_IN_FORM, ("b",), ("round_tube",), 1)


def test_every_rejection_of_a_request_is_counted_once():
    request = DesignRequest("cantilever_end_load", span=0.9, load=44.0, max_deflection=0.004,
                            safety_factor=2.0, max_depth=0.03, max_width=0.03, min_wall=0.0005)
    result = size_designs(request, load_builtin())
    groups = grouped_rejections(result.rejected)
    assert sum(group.count for group in groups) == len(result.rejected)
    assert len(groups) < len(result.rejected) / 10
