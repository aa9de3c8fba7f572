"""Validation of a sizing request (service.core.sizing.request): every impossible value named."""


from __future__ import annotations

import pytest

from service.core.errors import InputError
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.fields import at_contract_paths

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
def test_impossible_requests_name_the_field(table, pick, change, path):
    base = dict(load_case="cantilever_end_load", span=1.0, load=100.0)
    with pytest.raises(InputError) as error:
        size_designs(DesignRequest(**{**base, **change}), pick(table, "s355j2"))
    # the core names its own fields; the declarations give their contract paths
    assert path in at_contract_paths(error.value).errors


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
    table, pick, sections, envelope, min_wall, path
):
    request = DesignRequest("cantilever_end_load", span=1.0, load=100.0, sections=sections,
                            min_wall=min_wall, **envelope)
    with pytest.raises(InputError) as caught:
        size_designs(request, pick(table, "al_6061_t6"))
    assert path in caught.value.errors


@pytest.mark.parametrize("sections", [("round_tube",), ("i_section",), ("sandwich_panel",)])
def test_named_family_that_fits_is_accepted(table, pick, sections):
    # Walls of 2 mm in a 30 mm x 50 mm envelope: the check refuses only the impossible.
    request = DesignRequest("cantilever_end_load", span=0.2, load=1.0, sections=sections,
                            min_wall=0.002, max_depth=0.03, max_width=0.05)
    (design,) = size_designs(request, pick(table, "al_6061_t6")).designs
    assert design.family == sections[0]
    assert min(design.dimensions[name] for name in FAMILIES[sections[0]].wall_dimensions) >= 0.002


def test_named_family_that_does_not_carry_the_loading_is_refused(table, pick):
    request = DesignRequest("torsion", span=1.0, torque=10.0,
                            sections=("round_tube", "sandwich_panel"))
    with pytest.raises(InputError) as caught:
        size_designs(request, pick(table, "al_6061_t6"))
    assert list(caught.value.errors) == ["sections.1"]
