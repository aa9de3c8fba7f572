"""Frequency: the required first bending frequency against the member's own (general members
and any request with ``min_frequency``).

The frequency is Dunkerley's estimate with the member's own mass and the attached masses
(:mod:`service.core.loading.frequency`): it never overestimates the true first frequency, so
the check errs on the safe side."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, cast

import numpy as np

from service.core.loading.frequency import FIRST_EIGENVALUES, SHEAR_EIGENVALUES
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.demand import Demand
from service.core.sizing.member import MemberDemand, MemberUnit
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection


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


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray] | None:
    """The smallest scale whose frequency reaches min_frequency at fixed proportions
    (:func:`member_scale`); None for a shorthand case (one with a frequency requirement is
    sized in its general form)."""
    if demand.member is None or unit.member is None or not demand.member.checks_frequency:
        return None
    return [member_scale(unit.member, materials, demand)]


def member_scale(unit: MemberUnit, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """Smallest s whose Dunkerley frequency reaches min_frequency: with u = 1 / s^2,
    1 / f^2 = c0 + c1 u + c2 u^2 (c1 from the member's own mass in bending and the attached
    masses in shear, c2 from the attached masses in bending, c0 the member's own shear and
    rotary inertia modes, which do not change with the scale: no scale reaches a frequency
    above them)."""
    member = cast(MemberDemand, demand.member)
    target = np.asarray(member.min_frequency, dtype=float)
    beta = FIRST_EIGENVALUES[member.supports]
    span = np.asarray(demand.span, dtype=float)
    e_i = materials.youngs_modulus * unit.second_moment
    # at scale s the shear rigidity k G A and the mass per length both carry s^2
    shear_rigidity = materials.shear_modulus * unit.shear_stiffness_area
    with np.errstate(divide="ignore", invalid="ignore"):
        own = (2.0 * math.pi) ** 2 * span**4 * materials.density * unit.area / (beta**4 * e_i)
        own_shear = ((2.0 * math.pi) ** 2 * span**2 * materials.density / SHEAR_EIGENVALUES[
            member.supports] ** 2 * (unit.area / shear_rigidity + 1.0 / materials.youngs_modulus))
        linear = own + (2.0 * math.pi) ** 2 * member.shear_flexibility_mass / shear_rigidity
        attached = (2.0 * math.pi) ** 2 * member.flexibility_mass / e_i
        limit = np.where(target > 0, 1.0 / target**2, np.inf) - own_shear
        u = np.where(attached > 0,
                     (-linear + np.sqrt(linear**2 + 4.0 * attached * limit)) / (2.0 * attached),
                     limit / linear)
        return np.where(target > 0, np.where(limit > 0, 1.0 / np.sqrt(u), np.inf), 0.0)


FREQUENCY = Check("frequency", utilization, requested, scale_bound=scale_bound)
