"""Frequency: the required first bending frequency against the member's own (general members
and any request with ``min_frequency``).

The frequency is Dunkerley's estimate with the member's own mass and the attached masses
(:mod:`service.core.loading.frequency`): it never overestimates the true first frequency, so
the check errs on the safe side."""

from __future__ import annotations

import numpy as np

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """min_frequency / frequency (0 where no frequency is required)."""
    if actions.member is None or demand.member is None:
        return np.zeros_like(actions.stress)
    required = np.asarray(demand.member.min_frequency, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(required > 0, required / actions.member.frequency, 0.0)


def requested(demand: Demand) -> bool:
    """Whether the request sets min_frequency (a general member's)."""
    return demand.member is not None and bool(np.any(
        np.asarray(demand.member.min_frequency, dtype=float) > 0))


FREQUENCY = Check("frequency", utilization, requested)
