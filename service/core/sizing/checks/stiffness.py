"""Stiffness: peak deflection (bending) or angle of twist (torsion) against its limit."""

from __future__ import annotations

import numpy as np

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """deflection / max_deflection, twist / max_twist or extension / max_extension (0 with no
    limit: it is ``inf``)."""
    carried = actions.twist if demand.torsion else actions.deflection
    return carried / demand.stiffness_limit


STIFFNESS = Check("stiffness", utilization)
