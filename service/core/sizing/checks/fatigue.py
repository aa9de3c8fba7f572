"""Fatigue: the cyclic parts of a general member's actions at the required life, by the
modified Goodman rule with Marin's surface and size factors
(:mod:`service.core.loading.fatigue`); 0 where ``fatigue_cycles`` is not set."""

from __future__ import annotations

import numpy as np

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """n (sigma'_a / S_f + sigma'_m / S_ut), computed along the member."""
    if actions.member is None:
        return np.zeros_like(actions.stress)
    return actions.member.fatigue


def requested(demand: Demand) -> bool:
    """Whether the request sets fatigue_cycles (a general member's)."""
    return demand.member is not None and bool(np.any(
        np.asarray(demand.member.fatigue_cycles, dtype=float) > 0))


FATIGUE = Check("fatigue", utilization, requested)
