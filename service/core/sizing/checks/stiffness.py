"""Stiffness: peak deflection (bending) or angle of twist (torsion) against its limit."""

from __future__ import annotations

import numpy as np

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """deflection / max_deflection, twist / max_twist or extension / max_extension (0 with no
    limit: it is ``inf``)."""
    if actions.member is not None:
        # a general member: its deflection and its twist, each against its own limit
        return np.maximum(actions.member.deflection / demand.stiffness_limit,
                          actions.member.twist / demand.twist_limit)
    carried = actions.twist if demand.torsion else actions.deflection
    return carried / demand.stiffness_limit


def requested(demand: Demand) -> bool:
    """Asked for when the request gives max_deflection (bending), max_twist (torsion) or
    max_extension (a tie)."""
    return bool(np.isfinite(demand.stiffness_limit))


STIFFNESS = Check("stiffness", utilization, requested)
