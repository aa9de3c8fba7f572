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
        return np.maximum(actions.stress * factor / materials.compression_strength,
                          actions.shear * factor / materials.shear_strength)
    if demand.axial:
        return actions.stress * factor / materials.axial_strength(demand.case.loading)
    return actions.stress * factor / materials.shear_strength


STRENGTH = Check("strength", utilization)
