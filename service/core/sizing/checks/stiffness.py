"""Stiffness: peak deflection (bending) or angle of twist (torsion) against its limit."""

from __future__ import annotations

from typing import TYPE_CHECKING, cast

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.closed_forms import (
    amplification_term,
    case_values,
    power_root,
    quadratic_scale,
    root_scale,
    timoshenko_scale,
)
from service.core.sizing.demand import Demand
from service.core.sizing.member import MemberDemand, MemberUnit, weight_per_scale2
from service.core.sizing.member_stability import compression_deflection_term
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection


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


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray]:
    """The smallest scale whose deflection (bending), extension (a tie or column) or twist
    (torsion) meets its limit (0 where there is none), at fixed proportions: a root of the
    case's need over the section's capacity, or with a bending case's shear deflection
    (Timoshenko, psi = E i / (G k a)) or self-weight a quadratic in s^2
    (:mod:`service.core.sizing.closed_forms`); a general member's deflection and twist apart
    (:func:`member_scales`)."""
    if demand.member is not None and unit.member is not None:
        return member_scales(unit.member, materials, demand)
    modulus = materials.shear_modulus if demand.torsion else materials.youngs_modulus
    shear_flexibility = (0.0 if not demand.bending else modulus * unit.stiffness_modulus
                         / (materials.shear_modulus * unit.shear_stiffness_area))
    case, span, action, _ = case_values(demand)
    limit = demand.stiffness_limit
    stiffness: np.ndarray
    if demand.self_weight:
        if demand.bending:
            weight = materials.density * unit.area * STANDARD_GRAVITY * span
            uniform = case.uniform
            # Quadratic in u = s^2: E i delta u^2 - c_Du W' L^3 u - c_D P L^3 >= 0, with the
            # shear deflection (c_S P + c_Su W' u) L psi u on the left (Timoshenko)
            stiffness = timoshenko_scale(
                modulus * unit.stiffness_modulus * limit,
                uniform.shear_deflection_coefficient * weight * span * shear_flexibility,
                uniform.deflection_coefficient * weight * span**3
                + case.shear_deflection_coefficient * action * span * shear_flexibility,
                case.deflection_coefficient * action * span**3
                + limit * amplification_term(demand, span))
        else:
            stiffness = (action * span / (modulus * unit.stiffness_modulus * limit)) ** 0.25
    elif demand.axial:
        # A s^2 carries P: the extension P L / (E A) <= delta
        stiffness = root_scale(action * span / limit, modulus * unit.stiffness_modulus, 2)
    elif demand.bending:
        stiffness = timoshenko_scale(
            modulus * unit.stiffness_modulus * limit, 0.0,
            case.shear_deflection_coefficient * action * span * shear_flexibility,
            case.deflection_coefficient * action * span**3
            + limit * amplification_term(demand, span))
    else:
        stiffness = root_scale(action * span / limit, modulus * unit.stiffness_modulus, 4)
    if not np.all(np.isfinite(limit)):
        stiffness = np.where(np.isfinite(limit), stiffness, 0.0)
    return [stiffness]


def member_scales(unit: MemberUnit, materials: MaterialValues, demand: Demand
                  ) -> list[np.ndarray]:
    """A general member's deflection and twist scales (each where its limit is asked for):
    E i s^4 delta >= D + D_w w s^2 + psi s^2 (H + H_w w s^2), psi = E i / (G k a) and H the
    shear line's peak (Timoshenko; peaks superposed, :mod:`service.core.sizing.member`): a
    quadratic in s^2, infeasible where the self-weight's shear deflection alone reaches the
    limit; with a compression N, delta_0 / (1 - N / P_cr) <= delta adds delta N (K L)^2 /
    pi^2 (:func:`~service.core.sizing.member_stability.compression_deflection_term`). The
    twist G k s^4 theta >= the peak G K phi."""
    member = cast(MemberDemand, demand.member)
    weight = weight_per_scale2(unit, materials, demand)
    e_i = materials.youngs_modulus * unit.second_moment
    g_k = materials.shear_modulus * unit.torsion_constant
    deflection_limit = demand.stiffness_limit
    twist_limit = demand.twist_limit
    stiffness = []
    if "deflection_limit" in member.flags:
        psi = e_i / (materials.shear_modulus * unit.shear_stiffness_area)
        quadratic = e_i * deflection_limit - psi * member.weight_shear_deflection * weight
        with np.errstate(divide="ignore", invalid="ignore"):
            root = quadratic_scale(
                quadratic, member.weight_deflection * weight + psi * member.shear_deflection,
                member.deflection + np.where(np.isfinite(deflection_limit), deflection_limit,
                                             0.0)
                * compression_deflection_term(member, demand.span))
        stiffness.append(np.where(np.isfinite(deflection_limit),
                                  np.where(quadratic > 0, root, np.inf), 0.0))
    if "twist_limit" in member.flags:
        stiffness.append(np.where(np.isfinite(twist_limit),
                                  power_root(member.twist / (g_k * twist_limit), 4), 0.0))
    return stiffness


STIFFNESS = Check("stiffness", utilization, requested, scale_bound=scale_bound)
