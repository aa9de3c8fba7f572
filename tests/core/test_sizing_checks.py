"""The checks (service.core.sizing.checks): each ratio from its definition in the contract
(utilization: deflection / max_deflection, stress x SF / strength with shear strength
strength / sqrt(3) by von Mises, stress x SF / critical stress; 0 for a check not asked for).
Exact arithmetic on round numbers, so the tolerance is round-off (1e-15 relative)."""

from __future__ import annotations

import math

import numpy as np

from service.core.sections.base import LocalBuckling
from service.core.sizing import DesignRequest
from service.core.sizing.checks import CHECK_NAMES, CHECKS, Actions
from service.core.sizing.demand import demand_of
from service.core.sizing.values import MaterialValues

BENDING = demand_of(DesignRequest("cantilever_end_load", span=1.0, load=100.0,
                                  max_deflection=0.01, safety_factor=2.0))
TORSION = demand_of(DesignRequest("torsion", span=1.0, torque=10.0, safety_factor=2.0))


def actions():
    return Actions(stress=np.array([100e6]), shear=np.array([20e6]),
                   deflection=np.array([0.004]), twist=np.array([np.nan]),
                   buckling=LocalBuckling(bending=np.array([400e6]), torsion=np.array([1e9]),
                                          shear=np.array([160e6])))


def ratios(demand, given):
    return {check.name: float(check.utilization(given, steel(), demand)[0])
            for check in CHECKS}


def steel():
    """Invented round numbers of a steel (demo values, not data)."""
    return MaterialValues(*(np.array([v]) for v in (
        7850.0, 210e9, 81e9, 0.3, 250e6, 250e6 / math.sqrt(3.0), 1.0, 2.0)))


def test_the_checks_are_the_contract_utilization_keys():
    assert CHECK_NAMES == ("stiffness", "strength", "local_buckling", "member_buckling",
                           "frequency", "fatigue", "interaction",
                           "bearing")


def test_bending_ratios():
    got = ratios(BENDING, actions())
    assert math.isclose(got["stiffness"], 0.4, rel_tol=1e-15)
    # bending 100 MPa x 2 / 250 MPa = 0.8; shear 20 MPa x 2 / 144.3 MPa = 0.277
    assert math.isclose(got["strength"], 0.8, rel_tol=1e-15)
    # bending 100 x 2 / 400 = 0.5; web shear 20 x 2 / 160 = 0.25
    assert math.isclose(got["local_buckling"], 0.5, rel_tol=1e-15)


def test_torsion_ratios_and_a_check_turned_off():
    given = Actions(stress=np.array([50e6]), shear=0.0, deflection=np.array([np.nan]),
                    twist=np.array([0.02]), buckling=actions().buckling)
    limited = demand_of(DesignRequest("torsion", span=1.0, torque=10.0, max_twist=0.05,
                                      safety_factor=2.0, local_buckling=False))
    got = ratios(limited, given)
    assert math.isclose(got["stiffness"], 0.4, rel_tol=1e-15)
    assert math.isclose(got["strength"], 50e6 * 2 / (250e6 / math.sqrt(3.0)), rel_tol=1e-15)
    assert got["local_buckling"] == 0.0
    # no twist limit asked for: its ratio is 0
    assert ratios(TORSION, given)["stiffness"] == 0.0
    assert math.isclose(ratios(TORSION, given)["local_buckling"], 0.1, rel_tol=1e-15)
