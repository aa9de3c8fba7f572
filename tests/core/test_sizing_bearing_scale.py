"""The bearing row of the scale bounds (service.core.sizing.bearing_scale): the smallest
scale at fixed proportions whose bearing check holds, against scipy's brentq on the check
itself (an independent root finder on the section library's resistances; tolerance 1e-6
relative, brentq's xtol), with a knife edge (the closed root), with a stiff bearing (the
bracketed bisection) and with self-weight."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from scipy.optimize import brentq

from service.core.sizing import DesignRequest
from service.core.sizing.bearing_scale import bearing_scale
from service.core.sizing.checks.bearing import bearing_ratio
from service.core.sizing.demand import demand_of
from service.core.sizing.values import MaterialValues

STEEL = MaterialValues(*(np.array([v]) for v in (
    7850.0, 210e9, 81e9, 0.3, 355e6, 355e6 / np.sqrt(3.0), 1.0, 2.0)))
"""S355 (EN 10025-2 f_y for t <= 16 mm; E, G, nu and rho from EN 1993-1-1 3.2.6)."""

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
