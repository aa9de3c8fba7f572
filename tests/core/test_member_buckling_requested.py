"""Which requests report member buckling, and the requests the general form cannot size with
it yet (refused by path, never silently unchecked).

Source of the families that buckle laterally: Trahair, Flexural-Torsional Buckling of
Structures, 1993, sec. 3.8 (no lateral-torsional mode when I_minor = I_major: round
sections); the rest is the contract's rule that an entry not asked for is null."""

from __future__ import annotations

import dataclasses

import pytest

from service.core.errors import InputError
from service.core.loading.actions import Action
from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, size_designs, validate_request

TABLE = load_builtin()
STEEL = TABLE.take([TABLE.ids.index("s355j2")])


@pytest.mark.parametrize(("request_fields", "path"), [
    (dict(load_case="column", span=2.0, load=1e4, end_conditions="pinned_pinned",
          min_frequency=5.0), "min_frequency"),
    (dict(load_case="tie", span=2.0, load=1e4, fatigue_cycles=1e6), "fatigue_cycles"),
    (dict(load_case="tie", span=2.0, load=1e4, diagrams=True), "diagrams"),
    (dict(load_case="member", span=2.0, supports="simply_supported",
          actions=(Action("force", 1e3, at=1.0),), axial_force=-1e3), "axial_force"),
])
def test_the_general_form_refuses_what_it_cannot_check_yet(request_fields, path):
    with pytest.raises(InputError) as raised:
        validate_request(DesignRequest(**request_fields))
    assert path in raised.value.errors


def test_member_buckling_is_reported_where_it_is_asked_for():
    beam = DesignRequest("simply_supported_center_load", span=3.0, load=5000.0,
                         safety_factor=1.5, sections=("i_section", "round_tube"))
    designs = {d.family: d for d in size_designs(beam, STEEL).designs}
    assert 0.0 < designs["i_section"].utilization["member_buckling"] <= 1.0
    assert designs["round_tube"].utilization["member_buckling"] is None
    braced = DesignRequest("simply_supported_center_load", span=3.0, load=5000.0,
                           safety_factor=1.5, sections=("i_section",),
                           lateral_restraint="continuous")
    (design,) = size_designs(braced, STEEL).designs
    assert design.utilization["member_buckling"] is None
    # sized in its general form (a frequency asked for): checked and reported the same
    # way, and null once braced
    general = DesignRequest("simply_supported_center_load", span=3.0, load=5000.0,
                            safety_factor=1.5, sections=("i_section",), min_frequency=5.0)
    (design,) = size_designs(general, STEEL).designs
    assert 0.0 < design.utilization["member_buckling"] <= 1.0
    (design,) = size_designs(dataclasses.replace(general, lateral_restraint="continuous"),
                             STEEL).designs
    assert design.utilization["member_buckling"] is None
    tie = DesignRequest("tie", span=3.0, load=5000.0, safety_factor=1.5,
                        sections=("round_tube",))
    (design,) = size_designs(tie, STEEL).designs
    assert design.utilization["member_buckling"] is None
    assert design.utilization["local_buckling"] is None
