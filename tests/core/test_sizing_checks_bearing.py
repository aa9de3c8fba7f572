"""The bearing check (service.core.sizing.checks.bearing) and what it does to the designs.

The ratio is recomputed from its definition with the section library's resistances
(each checked clause by clause in tests/validation/test_bearing_reference.py); the issue's
case is judged by EN 1993-1-5 sec. 6 directly; a longer stiff bearing can only lighten a
design (every resistance grows with it), and so can a honeycomb spanning its strong way
(Bitzer, Honeycomb Technology, 1997: L is stiffer and stronger in shear than W).

The check's minimum scale at fixed proportions (``bearing_scale``, its ``scale_bound``) is
checked against scipy's brentq on the check itself (an independent root finder on the section
library's resistances; tolerance 1e-6 relative, brentq's xtol), with a knife edge (the closed
root), with a stiff bearing (the bracketed bisection) and with self-weight."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy.optimize import brentq

from service.core.materials import load_builtin
from service.core.sections import FAMILIES, bearing
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.checks import Actions
from service.core.sizing.checks.bearing import BEARING, bearing_ratio, bearing_scale
from service.core.sizing.demand import demand_of
from service.core.sizing.values import MaterialValues
from tests.core.test_sizing_checks import actions

STEEL = MaterialValues(*(np.array([v]) for v in (
    7850.0, 210e9, 81e9, 0.3, 355e6, 355e6 / math.sqrt(3.0), 1.0, 2.0)))
"""S355 (EN 10025-2 f_y for t <= 16 mm; E and G from EN 1993-1-1 3.2.6)."""

IPE_300 = {"depth": 0.300, "flange_width": 0.150, "flange_thickness": 0.0107,
           "web_thickness": 0.0071}
"""EN 10365 outline without root fillets, m."""

TABLE = load_builtin()


def with_dimensions(family, dims):
    base = actions()
    return Actions(base.stress, base.shear, base.deflection, base.twist, base.buckling,
                   section_family=family, dimensions=dims, area=0.0)


def test_the_ratio_is_the_largest_force_over_its_resistance():
    """Simply supported, 100 kN at mid-span of 4 m, SF 1.5, 50 mm bearing: the load against
    min(type a, type c with s_s + L/2), each reaction (50 kN) against type c with c = 0."""
    demand = demand_of(DesignRequest("simply_supported_center_load", span=4.0, load=100e3,
                                     safety_factor=1.5, bearing_length=0.05))
    got = float(BEARING.utilization(with_dimensions("i_section", IPE_300), STEEL, demand)[0])
    interior = min(float(bearing.i_section_web_bearing(IPE_300, 210e9, 355e6, 0.05)),
                   float(bearing.i_section_web_bearing(IPE_300, 210e9, 355e6, 2.05, True)))
    end = float(bearing.i_section_web_bearing(IPE_300, 210e9, 355e6, 0.05, True))
    assert got == pytest.approx(max(150e3 / interior, 75e3 / end), rel=1e-12)


def test_it_is_asked_for_in_bending_only_and_solid_sections_report_null():
    assert BEARING.requested(demand_of(DesignRequest("cantilever_end_load", span=1.0,
                                                     load=10.0)))
    assert not BEARING.requested(demand_of(DesignRequest("torsion", span=1.0, torque=10.0)))
    assert not BEARING.requested(demand_of(DesignRequest(
        "tie", span=1.0, load=10.0, max_extension=0.001)))
    beam = demand_of(DesignRequest("cantilever_end_load", span=1.0, load=10.0))
    assert not BEARING.for_family(FAMILIES["solid_rectangle"], beam)
    assert BEARING.for_family(FAMILIES["sandwich_panel"], beam)


ISSUE_CASE = DesignRequest("fixed_fixed_center_load", span=4.0, load=50e3, safety_factor=1.5,
                           max_deflection=0.016,
                           sections=("i_section", "rectangular_tube", "round_tube"))


def test_the_issues_webs_now_resist_the_point_load():
    """Issue 19: an I-section fixed-fixed over 4 m with 50 kN at mid-span had a 2.3 mm web
    resisting 34-42 kN. Every returned web now resists 50 kN x SF within the span (EN
    1993-1-5 type a, knife edge) and each 25 kN reaction x SF at its end (type c)."""
    result = size_designs(ISSUE_CASE, TABLE)
    webs = [d for d in result.designs if d.family in ("i_section", "rectangular_tube")]
    assert webs
    for design in webs:
        row = design.material_index
        youngs = float(TABLE.values("youngs_modulus", "design")[row])
        transverse = float(TABLE.values("transverse_modulus", "design")[row])
        across = youngs if math.isnan(transverse) else min(youngs, transverse)
        strength = float(TABLE.values("strength", "design")[row])
        compressive = float(TABLE.values("compressive_strength", "design")[row])
        if not math.isnan(compressive):
            strength = min(strength, compressive)
        strength *= across / youngs
        hinges = not bool(TABLE.brittle[row])
        web = (bearing.i_section_web_bearing if design.family == "i_section"
               else bearing.rectangular_tube_web_bearing)
        dims = design.dimensions
        within = float(web(dims, across, strength, 0.0, False, hinges))
        end = float(web(dims, across, strength, 0.0, True, hinges))
        assert within >= 50e3 * 1.5 * (1 - 1e-9), (design.material_id, design.family)
        assert end >= 25e3 * 1.5 * (1 - 1e-9), (design.material_id, design.family)
    steel = [d for d in webs if d.material_id == "s355j2" and d.family == "i_section"]
    assert steel and steel[0].dimensions["web_thickness"] > 0.0023


@pytest.mark.parametrize("material_id", ["s355j2", "al_6061_t6", "cfrp_qi_sm"])
def test_a_longer_bearing_is_lighter_or_equal(material_id):
    """Within the search's 0.5 % exactness."""
    subset = TABLE.take([TABLE.ids.index(material_id)])
    masses = []
    for length in (0.0, 0.02, 0.1, 0.3):
        request = DesignRequest("simply_supported_center_load", span=2.0, load=20e3,
                                safety_factor=1.5, max_deflection=0.008,
                                sections=("i_section", "rectangular_tube", "round_tube"),
                                bearing_length=length)
        masses.append({d.family: d.mass for d in size_designs(request, subset).designs})
    for shorter, longer in zip(masses, masses[1:], strict=False):
        for family, mass in longer.items():
            assert mass <= shorter[family] * 1.005, (family, shorter, longer)


def test_a_honeycomb_spanning_its_strong_way_is_lighter_or_equal():
    cores = TABLE.take([TABLE.ids.index(i) for i in ("al_honeycomb_50",
                                                     "meta_aramid_honeycomb_48")])
    faces = TABLE.take([TABLE.ids.index(i) for i in ("al_6061_t6", "gfrp_pultruded_e23")])
    for load, span in ((2000.0, 1.0), (8000.0, 2.0)):
        result = {}
        for direction in ("weak", "strong"):
            request = DesignRequest("simply_supported_uniform_load", span=span, load=load,
                                    safety_factor=1.5, max_deflection=span / 250,
                                    max_width=0.4, sections=("sandwich_panel",),
                                    core_direction=direction)
            result[direction] = {d.material_id: d.mass
                                 for d in size_designs(request, faces, cores).designs}
        assert result["weak"]
        for material_id, mass in result["strong"].items():
            assert mass <= result["weak"][material_id] * 1.005


# --- the minimum scale at fixed proportions ---------------------------------------------

UNITS = {
    # proportions at scale 1 (depth or outer diameter 1 m)
    "i_section": {"depth": np.array([1.0]), "flange_width": np.array([0.5]),
                  "flange_thickness": np.array([0.03]), "web_thickness": np.array([0.01])},
    "rectangular_tube": {"depth": np.array([1.0]), "width": np.array([0.6]),
                         "wall": np.array([0.02])},
    "round_tube": {"outer_diameter": np.array([1.0]), "wall": np.array([0.03])},
}
AREA = {"i_section": 2 * 0.5 * 0.03 + 0.94 * 0.01, "rectangular_tube": 0.6 - 0.56 * 0.96,
        "round_tube": np.pi / 4 * (1.0 - 0.94**2)}


def brentq_scale(family, demand, weight_area):
    def excess(log_scale):
        scale = np.exp(log_scale)
        dims = {name: value * scale for name, value in UNITS[family].items()}
        weight = STEEL.density * weight_area * scale**2 * 9.80665 if demand.self_weight else 0
        return float(bearing_ratio(family, dims, STEEL, demand, weight)[0]) - 1.0
    return np.exp(brentq(excess, np.log(1e-4), np.log(10.0), xtol=1e-9))


@pytest.mark.parametrize("family", list(UNITS))
@pytest.mark.parametrize("case, bearing, self_weight", [
    ("simply_supported_center_load", 0.0, False),
    ("cantilever_end_load", 0.0, True),
    ("fixed_fixed_center_load", 0.05, False),
    ("simply_supported_uniform_load", 0.1, True),
])
def test_the_bearing_row_is_the_root_of_the_check(family, case, bearing, self_weight):
    demand = demand_of(DesignRequest(case, span=2.0, load=20e3, safety_factor=1.5,
                                     bearing_length=bearing, self_weight=self_weight))
    ours = bearing_scale(family, UNITS[family], AREA[family], STEEL, STEEL.density, demand)
    assert ours is not None
    assert float(ours[0]) == pytest.approx(brentq_scale(family, demand, AREA[family]),
                                           rel=1e-6)


def _proportions(family):
    """Unit sections of ``family`` over a spread of proportions (8 walls x 5 widths), with
    their areas."""
    walls = np.geomspace(0.004, 0.1, 8)[:, None]
    widths = np.linspace(0.2, 1.0, 5)[None, :]
    if family == "i_section":
        dims = {"depth": np.ones((8, 5)), "flange_width": widths + 0 * walls,
                "flange_thickness": 2.0 * walls + 0 * widths, "web_thickness": walls + 0 * widths}
        area = 2 * dims["flange_width"] * dims["flange_thickness"] + (
            1 - 2 * dims["flange_thickness"]) * dims["web_thickness"]
    elif family == "rectangular_tube":
        dims = {"depth": np.ones((8, 5)), "width": widths + 0 * walls, "wall": walls + 0 * widths}
        area = dims["width"] - (dims["width"] - 2 * walls) * (1 - 2 * walls)
    else:
        dims = {"outer_diameter": np.ones((8, 5)), "wall": walls + 0 * widths}
        area = np.pi / 4 * (1 - (1 - 2 * dims["wall"]) ** 2)
    return {name: value.reshape(-1) for name, value in dims.items()}, area.reshape(-1)


BRACKETED = [("simply_supported_center_load", 0.05, True), ("cantilever_end_load", 0.03, False),
             ("fixed_fixed_center_load", 0.02, False)]
"""Requests whose bearing rows need the bisection (a stiff bearing, or a point force at a
distance from an end: the centre loads), with and without self-weight."""


@pytest.mark.parametrize("family", list(UNITS))
@pytest.mark.parametrize("case, length, self_weight", BRACKETED)
def test_each_bearing_scale_is_its_own_whatever_shares_the_arrays(family, case, length,
                                                                   self_weight):
    """The search runs on the elements still bracketing alone: each element's scale is the
    one it gets sized alone, to the bit."""
    demand = demand_of(DesignRequest(case, span=1.5, load=20e3, safety_factor=1.5,
                                     bearing_length=length, self_weight=self_weight))
    dims, area = _proportions(family)
    together = bearing_scale(family, dims, area, STEEL, STEEL.density, demand)
    alone = [bearing_scale(family, {name: value[[k]] for name, value in dims.items()},
                           area[[k]], STEEL, STEEL.density, demand)[0] for k in range(len(area))]
    assert together.tolist() == alone


@pytest.mark.parametrize("family", list(UNITS))
@pytest.mark.parametrize("case, length, self_weight", BRACKETED)
def test_under_the_floor_a_bearing_scale_is_a_lower_bound_below_it(family, case, length,
                                                                    self_weight):
    """With the other checks' floor (a grid reading only the scale): the exact scale to the
    bit wherever it may exceed the floor; elsewhere a lower bound of it, below the floor,
    so the largest of the rows (the scale) is the same."""
    demand = demand_of(DesignRequest(case, span=1.5, load=20e3, safety_factor=1.5,
                                     bearing_length=length, self_weight=self_weight))
    dims, area = _proportions(family)
    exact = bearing_scale(family, dims, area, STEEL, STEEL.density, demand)
    floor = exact * np.tile([0.5, 0.999, 1.0, 1.001, 2.0], 8)
    bounded = bearing_scale(family, dims, area, STEEL, STEEL.density, demand, floor)
    settled = bounded != exact
    assert np.any(settled) and np.any(~settled)
    assert np.all(bounded[settled] <= exact[settled])
    assert np.all(bounded[settled] < floor[settled])
    assert np.array_equal(np.maximum(bounded, floor), np.maximum(exact, floor))


def test_no_transverse_force_no_row_and_solid_sections_none():
    torsion = demand_of(DesignRequest("torsion", span=1.0, torque=10.0))
    assert bearing_scale("i_section", UNITS["i_section"], 0.1, STEEL, STEEL.density,
                         torsion) is None
    beam = demand_of(DesignRequest("cantilever_end_load", span=1.0, load=10.0))
    assert bearing_scale("solid_round", {"diameter": np.array([1.0])}, 0.8, STEEL,
                         STEEL.density, beam) is None


def test_a_knife_edge_resistance_grows_as_the_square_of_the_scale():
    """At fixed proportions and s_s = 0, F_R(s) = F_R(1) s^2 (the closed root's premise):
    EN 1993-1-5 6.4-6.5 and EN 1993-1-8 Table 7.2 have every length in proportion."""
    demand = dataclasses.replace(demand_of(DesignRequest(
        "simply_supported_center_load", span=2.0, load=1.0)), bearing_force=1.0)
    for family, unit in UNITS.items():
        ratios = [float(bearing_ratio(family, {k: v * s for k, v in unit.items()}, STEEL,
                                      demand, 0.0)[0]) for s in (0.1, 0.37)]
        assert ratios[0] / ratios[1] == pytest.approx((0.37 / 0.1) ** 2, rel=1e-12)
