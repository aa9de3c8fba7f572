"""No returned design exceeds its own member buckling capacity, recomputed independently.

Hypothesis draws unbraced bending requests (every built-in bending case, spans, loads, a top or
shear-centre load, self-weight, envelope, safety factor) and a few materials of every family
with a buckling curve. Each returned design's factored peak moment is compared with its
buckling resistance from the finite element solution of the energy equation and the
Perry-Robertson reduction (tests/validation/member_check.py: no C1, C2 or three-factor
formula), for the design's own moment diagram. Tolerance 1 %: the tabulated factors against
the FE solution (test_critical_moment.py).
"""

from __future__ import annotations

import math

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from service.core.errors import InputError
from service.core.loadcases import LOAD_CASES
from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.values import MaterialValues
from tests.validation.member_check import (
    FE_TOLERANCE,
    beam_column_ratio,
    column_resistance,
    member_moment_and_resistance,
    squash_area,
)

TABLE = load_builtin()
MATERIALS = [TABLE.ids.index(m) for m in (
    "s355j2", "s235jr", "al_6061_t6", "al_7075_t6", "cfrp_qi_sm", "gfrp_pultruded_e23",
    "douglas_fir")]
FAMILIES = ("i_section", "solid_rectangle", "rectangular_tube")
BENDING = [case for case, c in LOAD_CASES.items() if c.loading == "bending"]


def log_uniform(low, high):
    return st.floats(math.log(low), math.log(high)).map(math.exp)


@st.composite
def requests(draw):
    span = draw(log_uniform(0.5, 8.0))
    return DesignRequest(
        load_case=draw(st.sampled_from(BENDING)),
        span=span,
        load=draw(log_uniform(100.0, 5e4)),
        max_deflection=draw(st.one_of(st.none(), log_uniform(span / 1000, span / 50))),
        safety_factor=draw(st.floats(1.0, 2.5)),
        self_weight=draw(st.booleans()),
        load_position=draw(st.sampled_from(["shear_centre", "top"])),
        max_depth=draw(st.one_of(st.none(), log_uniform(0.05, 0.6))),
        max_width=draw(st.one_of(st.none(), log_uniform(0.03, 0.4))),
        allow_brittle=True, property_basis="typical",
        sections=FAMILIES,
    )


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(request=requests(), picks=st.lists(st.sampled_from(MATERIALS), min_size=1, max_size=3,
                                          unique=True))
def test_no_design_exceeds_its_member_buckling_capacity(request, picks):
    materials = TABLE.take(picks)
    try:
        result = size_designs(request, materials)
    except InputError:
        return
    problems = []
    for design in result.designs:
        index = design.material_index
        values = {**{name: float(materials.values(name, "typical")[index]) for name in (
            "density", "youngs_modulus", "shear_modulus", "strength")},
            "family": materials.families[index]}
        moment, resistance = member_moment_and_resistance(design, request, values)
        if moment > resistance * (1 + FE_TOLERANCE):
            problems.append(f"{design.material_id}/{design.family} {design.dimensions}: "
                            f"M SF {moment:.5g} > M_b {resistance:.5g} N m")
    assert not problems, problems


# Columns: the Euler load about the weaker axis with the design effective length factors of
# AISC 360-16 Commentary table C-A-7.1 (from memory), reduced by the Perry-Robertson equation
# (tests/validation/ltb_reference.py), against the factored load. Tolerance 1e-9: the same
# closed forms, so only round-off separates the two.
EFFECTIVE_LENGTH = {"pinned_pinned": 1.0, "fixed_free": 2.1, "fixed_pinned": 0.80,
                    "fixed_fixed": 0.65}
COLUMN_FAMILIES = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube",
                   "i_section")


@st.composite
def column_requests(draw):
    span = draw(log_uniform(0.2, 10.0))
    return DesignRequest(
        load_case="column", span=span, load=draw(log_uniform(100.0, 1e6)),
        end_conditions=draw(st.sampled_from(sorted(EFFECTIVE_LENGTH))),
        safety_factor=draw(st.floats(1.0, 2.5)),
        local_buckling=draw(st.booleans()),
        max_depth=draw(st.one_of(st.none(), log_uniform(0.02, 0.6))),
        max_width=draw(st.one_of(st.none(), log_uniform(0.02, 0.6))),
        allow_brittle=True, property_basis="typical", sections=COLUMN_FAMILIES)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(request=column_requests(), picks=st.lists(st.sampled_from(MATERIALS), min_size=1,
                                                 max_size=3, unique=True))
def test_no_column_exceeds_its_buckling_resistance(request, picks):
    """P SF <= N_b = chi A f about the weaker axis, A the effective area of slender walls
    (EN 1993-1-1 6.3.1.1 eq. 6.48; tests/validation/member_check.py writes A_eff out from
    EN 1993-1-5 4.4), recomputed from each design's rounded dimensions."""
    materials = TABLE.take(picks)
    try:
        result = size_designs(request, materials)
    except InputError:
        return
    problems = []
    for design in result.designs:
        values = material_values(materials, design.material_index)
        resistance = column_resistance(
            design, values, squash_area(design, request, values),
            EFFECTIVE_LENGTH[request.end_conditions] * request.span)
        if request.load * request.safety_factor > resistance * (1 + 1e-9):
            problems.append(f"{design.material_id}/{design.family} {design.dimensions}: "
                            f"P SF {request.load * request.safety_factor:.6g} > "
                            f"N_b {resistance:.6g} N")
    assert not problems, problems


def material_values(materials, index: int) -> dict:
    """What member_check reads of one material, on its typical values: E, G, nu, density,
    strength and the compressive strength (the lower, as the sizing takes it), family,
    brittle and orthotropic."""
    values = MaterialValues.from_table(materials, "typical")
    return {**{name: float(np.asarray(getattr(values, name))[index]) for name in (
        "density", "youngs_modulus", "shear_modulus", "poisson_ratio", "strength",
        "compression_strength")},
        "family": materials.families[index],
        "brittle": bool(np.asarray(values.brittle)[index]),
        "orthotropic": bool(np.asarray(values.orthotropic)[index])}


# Beam-columns: the interaction recomputed with the FE critical moment, the Euler loads and
# the Perry-Robertson equation (tests/validation/member_check.py); effective lengths of the
# supports as the member sees them in its plane (AISC 360-16 Commentary table C-A-7.1).
SUPPORTS = {"cantilever_end_load": "fixed_free", "cantilever_uniform_load": "fixed_free",
            "simply_supported_center_load": "pinned_pinned",
            "simply_supported_uniform_load": "pinned_pinned",
            "fixed_fixed_center_load": "fixed_fixed", "fixed_fixed_uniform_load": "fixed_fixed"}


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(request=requests(), axial=st.one_of(log_uniform(100.0, 2e5),
                                           log_uniform(100.0, 2e5).map(lambda x: -x)),
       restraint=st.sampled_from(["none", "continuous"]),
       picks=st.lists(st.sampled_from(MATERIALS), min_size=1, max_size=3, unique=True))
def test_no_beam_column_exceeds_its_interaction(request, axial, restraint, picks):
    import dataclasses

    request = dataclasses.replace(request, axial_force=axial, lateral_restraint=restraint,
                                  sections=FAMILIES + ("round_tube", "solid_round"))
    materials = TABLE.take(picks)
    try:
        result = size_designs(request, materials)
    except InputError:
        return
    problems = []
    for design in result.designs:
        values = material_values(materials, design.material_index)
        ratio = beam_column_ratio(design, request, values,
                                  EFFECTIVE_LENGTH[SUPPORTS[request.load_case]])
        if ratio > 1 + FE_TOLERANCE:
            problems.append(f"{design.material_id}/{design.family} {design.dimensions}: "
                            f"interaction {ratio:.5f}")
    assert not problems, problems
