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

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from service.core.loading.actions import Action
from service.core.materials import load_builtin, select
from service.core.sizing import DesignRequest, size_designs
from service.core.stability.buckling_curves import lateral_torsional_curve
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
    node = st.integers(1, last).map(lambda n: n * span / ELEMENTS)
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


@settings(max_examples=20, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(members())
def test_every_open_section_holds_against_lateral_torsional_buckling(member):
    assume(any(a.value > 0 for a in member.actions))
    result = size_designs(member, TABLE)
    failures = []
    for design in result.designs:
        index = list(TABLE.ids).index(design.material_id)
        e, g, rho, strength = (float(TABLE.values(name, member.property_basis)[index])
                               for name in ("youngs_modulus", "shear_modulus", "density",
                                            "strength"))
        area, major, minor, modulus, torsion, warping, depth = _constants(design)
        if minor >= major:
            continue   # no lateral-torsional mode (Trahair 1993 sec. 3.8)
        weight = rho * area * GRAVITY if member.self_weight else 0.0
        load_matrix = [[1, 2, a.value, a.at, 0] for a in member.actions if a.kind == "force"]
        load_matrix += [[1, 1, a.value, 0, 0] for a in member.actions
                        if a.kind == "distributed"]
        if weight:
            load_matrix.append([1, 1, weight, 0, 0])
        analysis = pycba.BeamAnalysis([member.span], e * major, RESTRAINTS[member.supports],
                                      load_matrix)
        analysis.analyze(npts=4000)
        lines = analysis.beam_results.results
        x, moment = np.asarray(lines.x), np.asarray(lines.M)
        peak = float(np.abs(moment).max())

        def diagram(points, x=x, moment=moment):
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
        critical = factor * peak
        curve = lateral_torsional_curve(TABLE.families[index], design.family)
        elastic = modulus * strength
        chi = perry_robertson(math.sqrt(elastic / critical), curve.imperfection, curve.plateau)
        ratio = member.safety_factor * peak / (chi * elastic)
        if ratio > 1.01:
            failures.append(f"{design.material_id} {design.family} {design.dimensions}: "
                            f"M SF / M_b = {ratio:.4f} (reported "
                            f"{design.utilization['member_buckling']})")
    assert not failures, (repr(member), failures)
