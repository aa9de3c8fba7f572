"""Sized members against lateral-torsional buckling recomputed outside the engine.

The issue's case: simply supported centre load over 2-6 m, deflection span/250, safety factor
1.5, envelope 400 x 300 mm, steel and 6061 aluminium, the compression flange free between the
supports. Every returned I-section and flat bar (solid rectangle) must carry its factored
moment within its reduced critical moment (finite element M_cr of the energy equation and the
Perry-Robertson reduction: tests/validation/member_check.py), which it did not before this
check (4 to 16 times over for the I-sections).
"""

from __future__ import annotations

import dataclasses

import pytest

from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, size_designs
from tests.validation.member_check import FE_TOLERANCE, member_moment_and_resistance

FAMILIES_CHECKED = ("i_section", "solid_rectangle", "rectangular_tube", "round_tube",
                    "solid_round")
CONSERVATISM = 0.08
"""How far the engine's ratio may lie above the FE one (conservative side)."""
MATERIALS = ("s355j2", "s235jr", "al_6061_t6", "al_6082_t6")


@pytest.fixture(scope="module")
def table():
    everything = load_builtin()
    return everything.take([everything.ids.index(m) for m in MATERIALS])


def values_of(table, index) -> dict:
    return {**{name: float(table.values(name, "typical")[index]) for name in (
        "density", "youngs_modulus", "shear_modulus", "strength")},
        "family": table.families[index]}


def issue_request(span: float, **changes) -> DesignRequest:
    return DesignRequest("simply_supported_center_load", span=span, load=5000.0,
                         max_deflection=span / 250.0, safety_factor=1.5, max_depth=0.4,
                         max_width=0.3, sections=FAMILIES_CHECKED, property_basis="typical",
                         **changes)


@pytest.mark.parametrize("span", [2.0, 4.0, 6.0])
@pytest.mark.parametrize("load_position", ["shear_centre", "top"])
def test_unbraced_i_sections_and_flat_bars_carry_their_moment(table, span, load_position):
    """M SF <= M_b (FE M_cr, Perry-Robertson) x (1 + 1 %) for every returned I-section and
    solid rectangle, and the reported member_buckling ratio is never below the recomputed
    one by more than that 1 % (the three-figure factors against the FE solution), nor above
    it by more than CONSERVATISM (measured: up to 1.1 % at the shear centre and 7 % with a top
    load for the I-sections, whose warping the tabulated C1 and C2 credit less than the FE
    solution does; under 0.2 % for the solid rectangles)."""
    request = issue_request(span, load_position=load_position)
    result = size_designs(request, table)
    checked, problems = 0, []
    for design in result.designs:
        if design.family not in ("i_section", "solid_rectangle"):
            continue
        moment, resistance = member_moment_and_resistance(
            design, request, values_of(table, design.material_index))
        checked += 1
        if moment > resistance * (1 + FE_TOLERANCE):
            problems.append(f"{design.material_id}/{design.family}: M SF {moment:.4g} > "
                            f"M_b {resistance:.4g} N m")
        reported = design.utilization["member_buckling"]
        if not (moment / resistance - FE_TOLERANCE <= reported
                <= moment / resistance * (1 + CONSERVATISM)):
            problems.append(f"{design.material_id}/{design.family}: reported "
                            f"{design.utilization['member_buckling']:.4f}, "
                            f"recomputed {moment / resistance:.4f}")
    assert checked == 2 * len(MATERIALS)
    assert not problems, problems


def test_the_old_sizing_fails_the_same_check_and_restraint_brings_it_back(table):
    """With the compression flange restrained continuously, the I-sections come back as
    before (deep, narrow, thin flanges): recomputed unrestrained they are several times over
    their buckling resistance, as the issue found; the unrestrained ones are heavier."""
    restrained = issue_request(4.0, lateral_restraint="continuous")
    free = issue_request(4.0)
    old = {(d.material_id, d.family): d for d in size_designs(restrained, table).designs}
    new = {(d.material_id, d.family): d for d in size_designs(free, table).designs}
    for key, design in old.items():
        assert design.utilization["member_buckling"] is None    # not asked for: braced
        assert new[key].mass >= design.mass * (1 - 1e-9)
        if design.family == "i_section":
            moment, resistance = member_moment_and_resistance(
                design, free, values_of(table, design.material_index))
            assert moment > 2.0 * resistance, key


@pytest.mark.parametrize("span", [2.0, 6.0])
def test_closed_round_and_square_sections_are_not_governed(table, span):
    """Round sections and square tubes have I_minor = I_major, so no lateral-torsional mode
    (Trahair, Flexural-Torsional Buckling of Structures, 1993, sec. 3.8: M_cr grows without
    bound as I_minor -> I_major): their designs are the same restrained or not, and their
    member ratio is the bending stress ratio M SF / (Z f), which the strength check already
    holds (so the design reports member buckling null: not a mode of these families)."""
    families = ("round_tube", "solid_round")
    free = dataclasses.replace(issue_request(span), sections=families)
    restrained = dataclasses.replace(free, lateral_restraint="continuous")
    one = size_designs(free, table).designs
    other = size_designs(restrained, table).designs
    assert [(d.material_id, d.dimensions) for d in one] == [
        (d.material_id, d.dimensions) for d in other]
    for design in one:
        moment, resistance = member_moment_and_resistance(
            design, free, values_of(table, design.material_index))
        assert design.utilization["member_buckling"] is None
        assert moment / resistance <= design.utilization["strength"] * (1 + 1e-9)
        assert design.governing != "member_buckling"
    square = DesignRequest("simply_supported_center_load", span=span, load=5000.0,
                           property_basis="typical",
                           max_deflection=span / 250.0, safety_factor=1.5, max_depth=0.1,
                           max_width=0.1, sections=("rectangular_tube",))
    # a square tube in a square envelope at its stiffness limit: restrained or not the same
    tight = dataclasses.replace(square, max_depth=0.08, max_width=0.08)
    for request in (square, tight):
        a = size_designs(request, table).designs
        b = size_designs(dataclasses.replace(request, lateral_restraint="continuous"),
                         table).designs
        for x, y in zip(a, b, strict=True):
            if x.dimensions["depth"] <= x.dimensions["width"]:
                assert x.dimensions == y.dimensions
