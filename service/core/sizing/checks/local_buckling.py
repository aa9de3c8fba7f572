"""Local buckling: peak stress times the safety factor against the section's local buckling
stress (walls, flanges and webs; web shear buckling under transverse shear; a column's walls
under uniform compression, ``stability.wall_compression``), 0 when the request turns the
check off and for ties."""

from __future__ import annotations

import numpy as np

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.member_stability import wall_compression_ratio
from service.core.sizing.values import MaterialValues


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


LOCAL_BUCKLING = Check("local_buckling", utilization, requested)
