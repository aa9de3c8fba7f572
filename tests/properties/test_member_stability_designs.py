"""Every open-section design of an unbraced general member holds against lateral-torsional
buckling, rechecked independently from its rounded dimensions.

Hypothesis draws general members (any supports; point forces at the nodes of the finite
element mesh below, some upward; sometimes a uniform load over the whole span; self-weight;
the load at the shear centre or on the top flange) and sizes I-sections and flat bars of a
few built-in materials, unbraced. Each design is rechecked here with nothing from the sizing
engine but the choice of buckling curve (a choice of standard, not physics):

- the moment diagram from PyCBA (Caprani, direct stiffness method, a test-only dependency),
  loads and self-weight rho A g together, at 4000 stations, interpolated for the solver;
- the elastic critical moment of that diagram from the finite element solution of the
  buckling energy equation (tests/validation/ltb_reference.py: no C1, C2 or three-factor
  formula); the self-weight acts at the centroid (the shear centre), so with a load on the
  top flange the self-weight is left out of the draw (the solver puts every load at one
  height);
- section constants written out: I_z, Z of the rectangle and the I written by hand, I_t of
  the rectangle by its series and of the I by the separate-rectangles lower bound
  (b t^3 / 3 (1 - 0.630 t / b) each, Roark's Formulas for Stress and Strain, 8th ed.,
  table 10.7, from memory), I_w = t_f b^3 (h - t_f)^2 / 24 (Timoshenko & Gere, Theory of
  Elastic Stability, 2nd ed. 1961, sec. 5.5);
- chi_LT from the Perry-Robertson equation solved by brentq, and M SF <= chi_LT Z f.

Tolerance 1 %: the finite element solution converges from above (40 elements), and the
roughly approximated torsion constants differ from the sizing's exact series by under 1 %.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from service.core.loading.actions import Action
from service.core.materials import load_builtin, select
from service.core.sizing import DesignRequest, size_designs
from service.core.stability.buckling_curves import column_curve, lateral_torsional_curve
from tests.validation.ltb_reference import critical_load_factor, perry_robertson

pycba = pytest.importorskip("pycba")

GRAVITY = 9.80665  # ISO 80000-3 standard acceleration of gravity, m/s^2
TABLE = select(load_builtin(), ids=["s355j2", "al_6061_t6"])
ELEMENTS = 40
RESTRAINTS = {
    # PyCBA restraint vector [v_0, theta_0, v_L, theta_L]: -1 fixed, 0 free
    "cantilever": [-1, -1, 0, 0],
    "simply_supported": [-1, 0, -1, 0],
    "fixed_fixed": [-1, -1, -1, -1],
    "propped_cantilever": [-1, -1, -1, 0],
}


@st.composite
def members(draw):
    supports = draw(st.sampled_from(list(RESTRAINTS)))
    span = draw(st.floats(1.0, 5.0))
    last = ELEMENTS if supports == "cantilever" else ELEMENTS - 1
    # n span / N may round a hair beyond the span at the last node: at most the span
    node = st.integers(1, last).map(lambda n: min(n * span / ELEMENTS, span))
    actions = [Action("force", draw(st.floats(-1500.0, 6000.0)), at=draw(node))
               for _ in range(draw(st.integers(1, 3)))]
    if draw(st.booleans()):
        actions.append(Action("distributed", draw(st.floats(-500.0, 3000.0)), start=0.0,
                              end=span))
    top = draw(st.booleans())
    return DesignRequest(
        "member", span=span, supports=supports, actions=tuple(actions),
        load_position="top" if top else "shear_centre",
        self_weight=not top and draw(st.booleans()),
        max_deflection=span / draw(st.floats(100.0, 400.0)),
        safety_factor=draw(st.floats(1.0, 2.0)), max_depth=0.4, max_width=0.3,
        sections=("i_section", "solid_rectangle"))


def _thin_rectangle_torsion(long, short):
    return long * short**3 / 3.0 * (1.0 - 0.630 * short / long)


def _constants(design):
    """(A, I_y, I_z, Z, I_t, I_w, depth) written out for a flat bar or an I-section."""
    d = design.dimensions
    if design.family == "solid_rectangle":
        h, b = d["depth"], d["width"]
        major, minor = b * h**3 / 12, h * b**3 / 12
        return (b * h, major, minor, major / (h / 2),
                _thin_rectangle_torsion(max(h, b), min(h, b)), 0.0, h)
    h, b, tf, tw = d["depth"], d["flange_width"], d["flange_thickness"], d["web_thickness"]
    web = h - 2 * tf
    area = 2 * b * tf + web * tw
    major = (b * h**3 - (b - tw) * web**3) / 12
    minor = 2 * tf * b**3 / 12 + web * tw**3 / 12
    torsion = (2 * _thin_rectangle_torsion(max(b, tf), min(b, tf))
               + _thin_rectangle_torsion(max(web, tw), min(web, tw)))
    return area, major, minor, major / (h / 2), torsion, tf * b**3 * (h - tf) ** 2 / 24, h


def _analysis(member, e, major, weight):
    """PyCBA's moment and deflection lines (x, M, y) of the member's loads and weight."""
    load_matrix = [[1, 2, a.value, a.at, 0] for a in member.actions if a.kind == "force"]
    load_matrix += [[1, 1, a.value, 0, 0] for a in member.actions if a.kind == "distributed"]
    if weight:
        load_matrix.append([1, 1, weight, 0, 0])
    analysis = pycba.BeamAnalysis([member.span], e * major, RESTRAINTS[member.supports],
                                  load_matrix)
    analysis.analyze(npts=4000)
    lines = analysis.beam_results.results
    return np.asarray(lines.x), np.asarray(lines.M), np.asarray(lines.D)


def _moment_resistance(member, design, values, constants, lines, weight):
    """(peak |M|, M_b): chi_LT Z f with M_cr from the finite element solution of the
    design's own diagram, or Z f where the section has no lateral-torsional mode."""
    e, g, _, strength, family = values
    _, major, minor, modulus, torsion, warping, depth = constants
    x, moment, _ = lines
    peak = float(np.abs(moment).max())
    elastic = modulus * strength
    if minor >= major or peak == 0.0:
        return peak, elastic   # no lateral-torsional mode (Trahair 1993 sec. 3.8)

    def diagram(points):
        return np.interp(points, x, moment)

    factor = critical_load_factor(
        span=member.span, lateral_stiffness=e * minor, torsion_stiffness=g * torsion,
        warping_stiffness=e * warping, moment=diagram,
        supports="cantilever" if member.supports == "cantilever" else "fork",
        point_loads=[(a.at, a.value) for a in member.actions if a.kind == "force"],
        distributed_load=sum(a.value for a in member.actions if a.kind == "distributed")
        + weight,
        load_height=depth / 2 if member.load_position == "top" else 0.0,
        elements=ELEMENTS)
    curve = lateral_torsional_curve(family, design.family)
    chi = perry_robertson(math.sqrt(elastic / (factor * peak)), curve.imperfection,
                          curve.plateau)
    return peak, chi * elastic


def _values(member, design):
    index = list(TABLE.ids).index(design.material_id)
    return (*(float(TABLE.values(name, member.property_basis)[index])
              for name in ("youngs_modulus", "shear_modulus", "density", "strength")),
            TABLE.families[index])


@settings(max_examples=20, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(members())
def test_every_open_section_holds_against_lateral_torsional_buckling(member):
    assume(any(a.value > 0 for a in member.actions))
    result = size_designs(member, TABLE)
    failures = []
    for design in result.designs:
        values = _values(member, design)
        constants = _constants(design)
        weight = values[2] * constants[0] * GRAVITY if member.self_weight else 0.0
        lines = _analysis(member, values[0], constants[1], weight)
        peak, resistance = _moment_resistance(member, design, values, constants, lines,
                                              weight)
        ratio = member.safety_factor * peak / resistance
        if ratio > 1.01:
            failures.append(f"{design.material_id} {design.family} {design.dimensions}: "
                            f"M SF / M_b = {ratio:.4f} (reported "
                            f"{design.utilization['member_buckling']})")
    assert not failures, (repr(member), failures)


EFFECTIVE_LENGTH = {
    # supports -> K, AISC 360-16 Commentary table C-A-7.1, recommended design values (from
    # memory): pinned-pinned 1.0, fixed-free 2.1, fixed-pinned 0.8, fixed-fixed 0.65
    "simply_supported": 1.0, "cantilever": 2.1, "propped_cantilever": 0.8,
    "fixed_fixed": 0.65,
}


@st.composite
def compressed_members(draw):
    member = draw(members())
    actions = (*member.actions, Action("axial", -draw(st.floats(1000.0, 80000.0))))
    return dataclasses.replace(member, actions=actions, sections=(
        "solid_round", "round_tube", "solid_rectangle", "i_section"))


def _round_constants(design):
    """(A, I, I, Z, I_t, 0, depth) of a circle or an annulus (Roark's Formulas for Stress
    and Strain, 8th ed., table A.1, from memory)."""
    d = design.dimensions
    outer = d.get("diameter", d.get("outer_diameter")) / 2
    inner = 0.0 if design.family == "solid_round" else outer - d["wall"]
    area = math.pi * (outer**2 - inner**2)
    second = math.pi * (outer**4 - inner**4) / 4
    return area, second, second, second / outer, 2 * second, 0.0, 2 * outer


@settings(max_examples=20, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(compressed_members())
def test_every_compressed_member_holds_as_a_beam_column(member):
    """An axial compression with the transverse loads: the beam-column interaction
    P SF / N_b + M SF / (1 - P SF / P_cr) / M_b <= 1 (Timoshenko & Gere 1961 sec.
    1.11-1.13; linear sum, EN 1993-1-1 6.2.1(7), from memory), N_b = chi A f about the
    weaker axis on K L (Euler; chi from the Perry-Robertson equation), P_cr the Euler load
    in the plane of bending, M_b as above; and the deflection amplified by
    1 / (1 - P / P_cr) within its limit (PyCBA's line, 1e-4 for its integration)."""
    result = size_designs(member, TABLE)
    compression = -sum(a.value for a in member.actions if a.kind == "axial")
    length = EFFECTIVE_LENGTH[member.supports] * member.span
    factor = member.safety_factor
    failures = []
    for design in result.designs:
        values = _values(member, design)
        e, _, rho, strength, family = values
        constants = (_round_constants(design) if design.family in ("solid_round", "round_tube")
                     else _constants(design))
        area, major, minor = constants[:3]
        weight = rho * area * GRAVITY if member.self_weight else 0.0
        lines = _analysis(member, e, major, weight)
        peak, resistance = _moment_resistance(member, design, values, constants, lines,
                                              weight)
        squash = area * strength
        euler = math.pi**2 * e * min(major, minor) / length**2
        curve = column_curve(family, design.family)
        column = perry_robertson(math.sqrt(squash / euler), curve.imperfection,
                                 curve.plateau) * squash
        in_plane = math.pi**2 * e * major / length**2
        checks = {"interaction": math.inf if factor * compression >= in_plane else (
            factor * compression / column
            + factor * peak / (1 - factor * compression / in_plane) / resistance)}
        if compression < in_plane:
            deflection = float(np.abs(lines[2]).max()) / (1 - compression / in_plane)
            checks["deflection"] = deflection / member.max_deflection / (1 + 1e-4)
        for name, ratio in checks.items():
            if ratio > 1.01:
                failures.append(f"{design.material_id} {design.family} {design.dimensions}: "
                                f"{name} {ratio:.4f} (reported {design.utilization})")
    assert not failures, (repr(member), failures)
