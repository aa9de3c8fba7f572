"""Every returned web and wall bears its concentrated forces, rechecked independently.

Hypothesis draws general members (any supports, point forces anywhere, a uniform load over
the span, an attached mass, self-weight, a stiff bearing length) and sizes I-sections,
rectangular tubes and round tubes of a few built-in materials. Each design's bearing is then
recomputed from its rounded dimensions (tests/properties/bearing_check.py: the section
library's resistances), every force with its own distance to the end, against reactions
written out here by superposition of Roark's Formulas for Stress and Strain, 8th ed., table
8.1 (from memory): a point load P at a (b = L - a) gives

- cantilever (fixed at x = 0): R_0 = P (1a);
- simply supported: R_L = P a / L (1e);
- fixed-fixed: R_0 = P b^2 (3a + b) / L^3, R_L = P a^2 (a + 3b) / L^3 (1d);
- propped cantilever (fixed at x = 0): R_L = P a^2 (3L - a) / (2 L^3) (1c);

and a uniform w the cantilever's w L, the simply supported and fixed-fixed beams' w L / 2 at
each end, the propped cantilever's 5 w L / 8 and 3 w L / 8 (2a, 2e, 2d, 2c). Tolerance
1e-9 relative: the same resistances from the same rounded dimensions.
"""

from __future__ import annotations

import math

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from service.core.loading.actions import Action
from service.core.materials import load_builtin, select
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, size_designs
from tests.properties.bearing_check import GRAVITY, bearing_ratio, material

TABLE = select(load_builtin(), ids=["s355j2", "al_6061_t6", "cfrp_qi_sm", "gfrp_pultruded_e23"])
WEBS = ("i_section", "rectangular_tube", "round_tube")
UNIFORM = {"cantilever": (1.0, 0.0), "simply_supported": (0.5, 0.5),
           "fixed_fixed": (0.5, 0.5), "propped_cantilever": (5 / 8, 3 / 8)}
"""Reactions (x = 0, x = L) of a uniform load, per its total (Roark table 8.1, 2a-2e)."""


def point_reactions(supports: str, span: float, force: float, at: float):
    a, b = at, span - at
    if supports == "cantilever":
        return force, 0.0
    if supports == "simply_supported":
        right = force * a / span
    elif supports == "fixed_fixed":
        right = force * a**2 * (a + 3 * b) / span**3
    else:
        right = force * a**2 * (3 * span - a) / (2 * span**3)
    return force - right, right


def log_uniform(low, high):
    return st.floats(math.log(low), math.log(high)).map(math.exp)


@st.composite
def members(draw):
    span = draw(log_uniform(0.5, 5.0))
    forces = draw(st.lists(st.tuples(log_uniform(100.0, 3e4), st.floats(0.0, 1.0)),
                           min_size=1, max_size=3))
    actions = [Action("force", value, at=fraction * span) for value, fraction in forces]
    if draw(st.booleans()):
        actions.append(Action("distributed", draw(log_uniform(100.0, 5e3)), start=0.0,
                              end=span))
    if draw(st.booleans()):
        actions.append(Action("mass", draw(log_uniform(1.0, 200.0)),
                              at=draw(st.floats(0.0, 1.0)) * span))
    return DesignRequest(
        "member", span=span, supports=draw(st.sampled_from(list(UNIFORM))),
        actions=tuple(actions), safety_factor=draw(st.floats(1.0, 2.5)),
        max_deflection=draw(st.one_of(st.none(), log_uniform(span / 1000, span / 50))),
        self_weight=draw(st.booleans()), lateral_restraint="continuous",
        bearing_length=draw(st.sampled_from([0.0, 0.0, 0.02, 0.2])), sections=WEBS)


def forces_of(request: DesignRequest, own_weight: float):
    """(point forces with their distance to the nearer end, the two support reactions)."""
    span, supports = request.span, request.supports
    points, reactions = [], [0.0, 0.0]
    for action in request.actions:
        if action.kind in ("force", "mass"):
            value = action.value * (GRAVITY if action.kind == "mass" else 1.0)
            points.append((value, min(action.at, span - action.at)))
            for k, r in enumerate(point_reactions(supports, span, value, action.at)):
                reactions[k] += r
        elif action.kind == "distributed":
            total = action.value * span
            for k, share in enumerate(UNIFORM[supports]):
                reactions[k] += share * total
    for k, share in enumerate(UNIFORM[supports]):
        reactions[k] += share * own_weight
    return points, reactions


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(request=members())
def test_every_web_and_wall_bears_its_forces(request):
    result = size_designs(request, TABLE)
    problems = []
    for design in result.designs:
        row = design.material_index
        area = float(FAMILIES[design.family].properties(design.dimensions).area)
        weight = (float(TABLE.values("density", request.property_basis)[row]) * area
                  * GRAVITY * request.span if request.self_weight else 0.0)
        points, reactions = forces_of(request, weight)
        ratio = bearing_ratio(design.family, design.dimensions,
                              material(TABLE, row, request.property_basis),
                              request.bearing_length, request.safety_factor, points, reactions)
        if ratio > 1 + 1e-9:
            problems.append(f"{design.material_id}/{design.family}: bearing {ratio:.6g}")
        reported = design.utilization["bearing"]
        if reported is None or reported < ratio * (1 - 1e-9):
            problems.append(f"{design.material_id}/{design.family}: reported {reported}, "
                            f"recomputed {ratio:.6g}")
    assert not problems, problems
