"""Strength: peak stress times the safety factor against the material's strength.

Bending checks the bending stress against the weaker fibre's strength (``strength`` on the
tension side, the compressive strength on the compression side where the material gives one:
``MaterialValues.compression_strength``) and the transverse shear stress against the shear
strength (the larger governs); torsion the shear stress against the shear strength
(``strength / sqrt(3)``, von Mises, unless the material gives its own); a tie its axial
stress P / A against ``strength``, a column against the compressive strength (its squash
load).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, cast

import numpy as np

from service.core.loading.stress import peak_von_mises, point_stresses
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.closed_forms import (
    case_peaks,
    case_values,
    cubic_scale,
    root_scale,
    shear_scale,
    weighted_peaks,
)
from service.core.sizing.demand import Demand
from service.core.sizing.member import (
    MemberDemand,
    MemberUnit,
    search_shape,
    smallest_scale,
    weight_per_scale2,
)
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """stress x SF / strength (bending: the larger of bending and transverse shear)."""
    if actions.member is not None:
        # a general member: bending, torsion, axial and transverse shear combined, piece by
        # piece (von Mises, or the maximum principal stress of a brittle material)
        return actions.member.strength
    factor = demand.safety_factor
    if demand.bending:
        return np.maximum(actions.stress * factor / materials.compression_strength,
                          actions.shear * factor / materials.shear_strength)
    if demand.axial:
        return actions.stress * factor / materials.axial_strength(demand.case.loading)
    return actions.stress * factor / materials.shear_strength


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray]:
    """The smallest scales whose stresses meet the strength at fixed proportions: the
    bending (or torsion, or axial) stress and, in bending, the transverse shear, each a
    closed form (a root, or with self-weight Cardano's cubic and the shear root:
    :mod:`service.core.sizing.closed_forms`); a general member's by :func:`member_scales`."""
    if demand.member is not None and unit.member is not None:
        return member_scales(unit.member, materials, demand)
    strength = (materials.shear_strength if demand.torsion
                else materials.axial_strength(demand.case.loading))
    _, span, action, factor = case_values(demand)
    if demand.self_weight:
        moment, moment_per_scale2, shear, shear_per_scale2 = weighted_peaks(
            unit, materials.density, demand, action, span)
        # Stress x SF <= allowed: z s^3 allowed / SF - M'(s) s^2 - M >= 0.
        parts = [cubic_scale(unit.strength_modulus * strength / factor, moment_per_scale2,
                             moment)]
        if demand.bending:
            parts.append(shear_scale(unit.shear_area * materials.shear_strength / factor,
                                     shear_per_scale2, shear))
        return parts
    if demand.axial:
        # A s^2 carries P: P SF / A <= f
        return [root_scale(action * factor, unit.strength_modulus * strength, 2)]
    moment, peak_shear = case_peaks(demand, action, span)
    parts = [root_scale(moment * factor, unit.strength_modulus * strength, 3)]
    if peak_shear is not None:
        parts.append(root_scale(peak_shear * factor, unit.shear_area * materials.shear_strength,
                                2))
    return parts


def combined_stress_utilization(normal, bending, torsion, transverse, brittle, strength,
                                factor):
    """Safety factor x combined stress / strength at the outer fibre and the neutral axis,
    the larger (terms as magnitudes, Pa, the worst fibre's; see
    :mod:`service.core.loading.stress`); a brittle material by the maximum principal stress.
    The signs are unknown here, so ``strength`` is the weaker side's
    (``MaterialValues.compression_strength``): on the safe side of the exact recheck, which
    judges each point by its sign."""
    stresses = point_stresses(bending, torsion, normal, transverse, 1.0, 1.0, 1.0)
    ductile = peak_von_mises(stresses)
    fibre = normal + bending
    principal = np.maximum(fibre / 2.0 + np.hypot(fibre / 2.0, torsion),
                           normal / 2.0 + np.hypot(normal / 2.0, torsion + transverse))
    return factor * np.where(brittle, principal, ductile) / strength


def member_scales(unit: MemberUnit, materials: MaterialValues, demand: Demand
                  ) -> list[np.ndarray]:
    """A general member's strength scales, the combined stress and the neutral axis's
    shear (peaks superposed, :mod:`service.core.sizing.member`): closed forms for bending
    alone, else bisections (:func:`~service.core.sizing.member.smallest_scale`)."""
    member = cast(MemberDemand, demand.member)
    factor = np.asarray(demand.safety_factor, dtype=float)
    weight = weight_per_scale2(unit, materials, demand)
    moment, shear = member.moment, member.shear
    torque, axial = member.torque, np.abs(member.axial)
    brittle = materials.brittle
    strength = materials.strength
    fibre_strength = materials.compression_strength    # the weaker fibre's
    shear_strength = materials.shear_strength
    weight_moment = member.weight_moment * weight
    weight_shear = member.weight_shear * weight
    if not member.flags & {"torque", "axial"}:
        # closed forms: the fibre stress is M / Z (either rule); at the neutral axis the
        # transverse shear against the shear strength (the material's own where it gives
        # one: composites and wood are weak in shear) and against the combined-stress rule
        # (von Mises: sqrt(3) tau <= f; maximum principal stress: tau <= f), the lower
        neutral = np.where(brittle > 0, 1.0, 1.0 / math.sqrt(3.0))
        allowed_shear = np.minimum(shear_strength, strength * neutral)
        return [
            cubic_scale(unit.section_modulus * fibre_strength / factor, weight_moment, moment),
            shear_scale(unit.shear_area * allowed_shear / factor, weight_shear, shear)]
    shape = search_shape(unit, materials, demand)

    def combined(s):
        return combined_stress_utilization(
            axial / (unit.area * s**2),
            (moment + weight_moment * s**2) / (unit.section_modulus * s**3),
            torque / (unit.torsion_modulus * s**3),
            (shear + weight_shear * s**2) / (unit.shear_area * s**2),
            brittle, fibre_strength, factor)
    with np.errstate(divide="ignore", invalid="ignore"):
        return [
            smallest_scale(combined, shape),
            _shear_torsion_scale(unit.shear_area, shear_strength / factor, weight_shear,
                                 shear, torque / unit.torsion_modulus, shape,
                                 "torque" in member.flags)]


def _shear_torsion_scale(shear_area, allowed, weight_shear, shear, torsion, shape,
                         with_torque: bool):
    """Smallest s with (V + V_w s^2) / (a_s s^2) + (T / q) / s^3 <= ``allowed`` (Pa, the
    strength over the safety factor): closed form without torque (:func:`shear_scale`),
    else bisection."""
    if not with_torque:
        return shear_scale(shear_area * allowed, weight_shear, shear)

    def ratio(s):
        return ((shear + weight_shear * s**2) / (shear_area * s**2) + torsion / s**3) / allowed
    return smallest_scale(ratio, shape)


STRENGTH = Check("strength", utilization, scale_bound=scale_bound)
