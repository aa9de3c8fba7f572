"""Bearing: every concentrated transverse force on the member (its point forces and its
support reactions, :mod:`service.core.loading.bearing`), times the safety factor, against
the local resistance of the section over the stiff bearing length s_s
(``requirements.bearing_length``; 0 by default, a knife edge, the safe assumption):

- I-sections and rectangular tubes: patch loading of the webs, EN 1993-1-5 sec. 6
  (:mod:`service.core.sections.bearing`). A reaction at an end support is type (c) with
  c = 0; a point force is checked both as type (a) and as type (c) with its distance c to
  the nearer end (s_s + c in the clause's type (c) terms), the smaller resistance governs
  (the clause draws no line between the two; the smaller is the safe reading).
- Round tubes: local crushing of the wall, the larger of EN 1993-1-8's longitudinal plate
  joint resistance (which holds under a knife edge) and DeRuntz & Hodge's ring mechanism
  over the bearing (:func:`~service.core.sections.bearing.round_tube_bearing`).
- Sandwich panels: core indentation (Steeves & Fleck), checked in
  :mod:`service.core.sizing.sandwich` under this same name.
- Solid sections: not applicable (a solid web does not cripple locally before it yields in
  bending or shear, which the strength check covers): null.

EN 1993-1-5 is written for ductile isotropic steel. Outside that scope it is applied
conservatively: an orthotropic material (one with a transverse modulus E2) has its web
buckle with E2 (the web's depth runs across the member) and its crushing strength taken as
f E2 / E1 (the fibre-direction failure strain across the fibres: below the measured
transverse compressive strength of unidirectional laminates, e.g. about 60 against 200 MPa
for carbon/epoxy, from memory); a brittle material's flanges form no plastic hinges
(m1 = m2 = 0 in the clause's yield length, see
:func:`~service.core.sections.bearing.patch_loading_resistance`).

Utilization = F SF / F_R, the largest over the forces; 0 where the request has no transverse
force (torsion, ties, columns).
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sections.base import SectionFamily
from service.core.sections.bearing import (
    i_section_web_bearing,
    rectangular_tube_web_bearing,
    round_tube_bearing,
)
from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues

Resistance = Callable[..., np.ndarray]


def web_material(materials: MaterialValues) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(E, f, flange hinges) for the webs' bearing: E2 and f E2 / E1 for an orthotropic
    material, no flange hinges for a brittle one (see the module doc)."""
    youngs = np.asarray(materials.youngs_modulus, dtype=float)
    transverse = np.asarray(materials.transverse_modulus, dtype=float)
    across = np.where(np.isnan(transverse), youngs, np.minimum(transverse, youngs))
    strength = materials.compression_strength * across / youngs
    return across, strength, np.asarray(materials.brittle, dtype=float) == 0.0


def _web(bearing: Resistance) -> Resistance:
    def resistance(dims, materials: MaterialValues, bearing_length, end_distance=None):
        youngs, strength, hinges = web_material(materials)
        if end_distance is None:     # type (a), within the span
            return bearing(dims, youngs, strength, bearing_length, False, hinges)
        return bearing(dims, youngs, strength, bearing_length + end_distance, True, hinges)
    return resistance


def _crushing(dims, materials: MaterialValues, bearing_length, end_distance=None):
    _, strength, hinges = web_material(materials)
    return round_tube_bearing(dims, strength, bearing_length, ~hinges)


RESISTANCES: dict[str, Resistance] = {
    "i_section": _web(i_section_web_bearing),
    "rectangular_tube": _web(rectangular_tube_web_bearing),
    "round_tube": _crushing,
}
"""Family id -> resistance(dims, materials, s_s, end_distance) in N: ``end_distance``
None within the span (type a), else the distance c of the force to the end (type c)."""



def _ratio(force, factor, resistance):
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(np.asarray(force) > 0, force * factor / resistance, 0.0)


def bearing_ratio(family_id: str, dims, materials: MaterialValues, demand: Demand,
                  weight_per_length) -> np.ndarray:
    """F SF / F_R of sections ``dims`` of the family, the larger of the point forces' and
    the reactions' (``weight_per_length``, N/m: the self-weight, whose reactions add)."""
    resistance = RESISTANCES[family_id]
    bearing = np.asarray(demand.bearing_length, dtype=float)
    factor = demand.safety_factor
    point = np.minimum(resistance(dims, materials, bearing),
                       resistance(dims, materials, bearing,
                                  np.asarray(demand.bearing_offset, dtype=float)))
    reaction = (np.asarray(demand.bearing_reaction)
                + np.asarray(demand.bearing_unit_reaction) * weight_per_length)
    end = resistance(dims, materials, bearing, 0.0)
    return np.maximum(_ratio(demand.bearing_force, factor, point),
                      _ratio(reaction, factor, end))


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """F SF / F_R (0 where not asked for or the family has no bearing check here)."""
    if (actions.dimensions is None or actions.section_family not in RESISTANCES
            or not requested(demand)):
        return np.zeros_like(actions.stress)
    weight = (materials.density * actions.area * STANDARD_GRAVITY if demand.self_weight
              else 0.0)
    return bearing_ratio(actions.section_family, actions.dimensions, materials, demand, weight)


def requested(demand: Demand) -> bool:
    """Whether the member carries a concentrated transverse force (a point force or a
    support reaction): every bending case."""
    return bool(np.any(np.asarray(demand.bearing_force) > 0)
                or np.any(np.asarray(demand.bearing_reaction) > 0)
                or (demand.self_weight and np.any(np.asarray(demand.bearing_unit_reaction) > 0)))


BEARING_FAMILIES = (*RESISTANCES, "sandwich_panel")
"""The families with a bearing check (solid sections have none: null)."""


def for_family(family: SectionFamily, demand: Demand) -> bool:
    """Whether a design of ``family`` reports bearing (see :data:`BEARING_FAMILIES`)."""
    return family.id in BEARING_FAMILIES


BEARING = Check("bearing", utilization, requested, "bearing under point loads and at supports",
                for_family)
