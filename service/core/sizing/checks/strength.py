"""Strength: peak stress times the safety factor against the material's strength.

Bending checks the bending stress against ``strength`` and the transverse shear stress
against the shear strength (the larger governs); torsion the shear stress against the shear
strength (``strength / sqrt(3)``, von Mises, unless the material gives its own); a tie or a
column its axial stress P / A against ``strength`` (the squash load of a column).
"""

from __future__ import annotations

import numpy as np

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """stress x SF / strength (bending: the larger of bending and transverse shear)."""
    if actions.member is not None:
        # a general member: bending, torsion, axial and transverse shear combined, piece by
        # piece (von Mises, or the maximum principal stress of a brittle material)
        return actions.member.strength
    factor = demand.safety_factor
    if demand.bending:
        return np.maximum(actions.stress * factor / materials.strength,
                          actions.shear * factor / materials.shear_strength)
    if demand.axial:
        return actions.stress * factor / materials.strength
    return actions.stress * factor / materials.shear_strength


STRENGTH = Check("strength", utilization)
