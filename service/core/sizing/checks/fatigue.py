"""Fatigue: the cyclic parts of a general member's actions at the required life, by the
modified Goodman rule with Marin's surface and size factors
(:mod:`service.core.loading.fatigue`); 0 where ``fatigue_cycles`` is not set."""

from __future__ import annotations

from typing import TYPE_CHECKING, cast

import numpy as np

from service.core.loading.fatigue import (
    equivalent_alternating_and_mean,
    goodman_utilization,
    rotating_bending,
)
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.demand import Demand
from service.core.sizing.member import (
    MemberDemand,
    MemberUnit,
    part_fatigue_strength,
    search_shape,
    smallest_scale,
    weight_per_scale2,
)
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """n (sigma'_a / S_f + sigma'_m / S_ut), computed along the member."""
    if actions.member is None:
        return np.zeros_like(actions.stress)
    return actions.member.fatigue


def requested(demand: Demand) -> bool:
    """Whether the request sets fatigue_cycles (a general member's)."""
    return demand.member is not None and bool(np.any(
        np.asarray(demand.member.fatigue_cycles, dtype=float) > 0))


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray] | None:
    """The smallest scale whose modified Goodman utilization (:func:`search_ratio`) is at
    most 1 at fixed proportions, by bisection; None without a fatigue requirement."""
    if demand.member is None or unit.member is None or not demand.member.checks_fatigue:
        return None
    general = unit.member
    weight = weight_per_scale2(general, materials, demand)

    def fatigue(s):
        return search_ratio(general, materials, demand, s, weight * s**2)
    return [smallest_scale(fatigue, search_shape(general, materials, demand))]


def search_ratio(unit: MemberUnit, materials: MaterialValues, demand: Demand, scale, weight):
    """Search form of the modified Goodman utilization at scale ``scale`` (peaks
    superposed, :mod:`service.core.sizing.member`); ``weight`` the self-weight m' g, N/m."""
    member = cast(MemberDemand, demand.member)
    mean_moment = member.mean_moment + member.weight_moment * weight
    alternating_moment = member.alternating_moment
    if member.rotating:
        mean_moment, alternating_moment = rotating_bending(mean_moment, alternating_moment)
    z = unit.section_modulus * scale**3
    q = unit.torsion_modulus * scale**3
    area = unit.area * scale**2
    sigma_a, sigma_m = equivalent_alternating_and_mean(
        alternating_moment / z, member.alternating_axial / area, member.alternating_torque / q,
        mean_moment / z, member.mean_axial / area, member.mean_torque / q)
    ratio = goodman_utilization(sigma_a, sigma_m,
                                part_fatigue_strength(unit, materials, demand, scale),
                                materials.ultimate_strength, demand.safety_factor)
    return np.where(member.fatigue_cycles > 0, ratio, 0.0)


FATIGUE = Check("fatigue", utilization, requested, scale_bound=scale_bound)
