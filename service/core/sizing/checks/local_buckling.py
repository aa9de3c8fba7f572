"""Local buckling: peak stress times the safety factor against the section's local buckling
stress (walls, flanges and webs; web shear buckling under transverse shear; a column's walls
under uniform compression, ``stability.wall_compression``), 0 when the request turns the
check off and for ties."""

from __future__ import annotations

from typing import TYPE_CHECKING, cast

import numpy as np

from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.closed_forms import (
    case_peaks,
    case_values,
    cubic_scale,
    power_root,
    root_scale,
    shear_scale,
    weighted_peaks,
)
from service.core.sizing.demand import Demand
from service.core.sizing.member import (
    MemberDemand,
    search_shape,
    smallest_scale,
    weight_per_scale2,
)
from service.core.sizing.member_stability import wall_compression_ratio
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """stress x SF / critical stress (bending: the larger of the bending modes and web
    shear buckling)."""
    if not demand.local_buckling:
        return np.zeros_like(actions.stress)
    factor = demand.safety_factor
    if actions.member is not None:
        # a general member: the compression of bending (and of an axial force) against the
        # bending modes (an axial compression also against the walls' uniform-compression
        # mode, member_stability.wall_compression_ratio), torsional shear against the
        # torsion mode and transverse shear against web shear buckling, each apart (as the
        # shorthand cases do)
        member = actions.member
        bending = wall_compression_ratio(
            member.compression_stress, member.bending_stress - member.compression_stress,
            actions.buckling.bending, actions.compression_buckling)
        return np.maximum.reduce([bending * factor,
                                  member.torsion_stress * factor / actions.buckling.torsion,
                                  member.shear_stress * factor / actions.buckling.shear])
    if demand.axial:
        return actions.stress * factor / actions.compression_buckling
    if demand.bending:
        shear_local = actions.shear * factor / actions.buckling.shear
        return np.maximum(actions.stress * factor / actions.buckling.bending, shear_local)
    return np.maximum(actions.stress * factor / actions.buckling.torsion, 0.0)


def requested(demand: Demand) -> bool:
    """Asked for unless the request turns it off (requirements.local_buckling) or the member
    is a tie (nothing in it is compressed)."""
    return bool(demand.local_buckling) and demand.case.loading != "tension"


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray]:
    """The smallest scales whose peak stresses stay below the local buckling stresses at
    fixed proportions (none where the request turns the check off): each bending (or
    torsion) mode and, in bending, web shear buckling, as the strength's closed forms with
    the critical stress for the strength; a column's walls in uniform compression; a
    general member's by :func:`member_scales`."""
    if demand.member is not None and unit.member is not None:
        return member_scales(unit, materials, demand)
    if not demand.local_buckling:
        return []
    _, span, action, factor = case_values(demand)
    modes = unit.buckling_modes or (unit.buckling_stress,)
    if demand.self_weight:
        moment, moment_per_scale2, shear, shear_per_scale2 = weighted_peaks(
            unit, materials.density, demand, action, span)
        parts = [cubic_scale(unit.strength_modulus * mode / factor, moment_per_scale2, moment)
                 for mode in modes]
        if demand.bending:
            parts.append(shear_scale(unit.shear_area * unit.shear_buckling_stress / factor,
                                     shear_per_scale2, shear))
        return parts
    if demand.axial:
        # a column's walls: P SF / A <= sigma_cr (uniform compression;
        # stability.wall_compression); a tie has none
        return ([root_scale(action * factor, unit.area * unit.buckling_stress, 2)]
                if demand.case.loading == "compression" else [])
    moment, peak_shear = case_peaks(demand, action, span)
    parts = [root_scale(moment * factor, unit.strength_modulus * mode, 3) for mode in modes]
    if peak_shear is not None:
        parts.append(root_scale(peak_shear * factor,
                                unit.shear_area * unit.shear_buckling_stress, 2))
    return parts


def member_scales(unit: UnitSection, materials: MaterialValues, demand: Demand
                  ) -> list[np.ndarray]:
    """A general member's local buckling scales (peaks superposed,
    :mod:`service.core.sizing.member`): each bending mode under the peak moment (with an
    axial compression, against the walls' uniform-compression mode too:
    :func:`~service.core.sizing.member_stability.wall_compression_ratio`, by bisection), the
    torsion mode under a torque, and web shear buckling."""
    if not demand.local_buckling:
        return []
    general = unit.member
    assert general is not None
    member = cast(MemberDemand, demand.member)
    factor = np.asarray(demand.safety_factor, dtype=float)
    weight = weight_per_scale2(general, materials, demand)
    moment, shear, torque = member.moment, member.shear, member.torque
    weight_moment = member.weight_moment * weight
    weight_shear = member.weight_shear * weight
    compression = np.maximum(-np.asarray(member.axial, dtype=float), 0.0)
    parts = []
    for mode in unit.buckling_modes or (unit.buckling_stress,):
        if "compression" not in member.flags:
            parts.append(cubic_scale(general.section_modulus * mode / factor, weight_moment,
                                     moment))
            continue

        def bending_mode(s, mode=mode):
            axial_stress = compression / (general.area * s**2)
            bending = (moment + weight_moment * s**2) / (general.section_modulus * s**3)
            return factor * wall_compression_ratio(axial_stress, bending, mode,
                                                   unit.compression_buckling_stress)
        parts.append(smallest_scale(bending_mode, np.broadcast_shapes(
            search_shape(general, materials, demand), np.shape(mode))))
    if "torque" in member.flags:
        parts.append(power_root(torque * factor / (general.torsion_modulus
                                                   * unit.torsion_buckling_stress), 3))
    parts.append(shear_scale(general.shear_area * unit.shear_buckling_stress / factor,
                             weight_shear, shear))
    return parts


LOCAL_BUCKLING = Check("local_buckling", utilization, requested, scale_bound=scale_bound)
