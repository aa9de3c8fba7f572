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
from typing import TYPE_CHECKING

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sections.base import SectionFamily
from service.core.sections.bearing import (
    i_section_web_bearing,
    rectangular_tube_web_bearing,
    round_tube_bearing,
)
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.closed_forms import shear_scale
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection

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


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray] | None:
    """The smallest scale whose bearing check holds at fixed proportions
    (:func:`bearing_scale`; under the earlier checks' floor where only the scale is read,
    ``found.floor()``), or None where the sections carry no dimensions, the family no
    bearing check here or the request no transverse force."""
    if unit.dimensions is None:
        return None
    scale = bearing_scale(unit.section_family, unit.dimensions, unit.area, materials,
                          materials.density, demand, found.floor())
    return None if scale is None else [scale]


BEARING = Check("bearing", utilization, requested, "bearing under point loads and at supports",
                for_family, scale_bound)

# --- the minimum scale at fixed proportions -----------------------------------------------

BISECTION_STEPS = 32
"""Halvings of the log-scale bracket (at most a factor 1 / :data:`BRACKET_FLOOR`): its
width ends below ln(4096) / 2^32, 2e-9 of the scale."""

BRACKET_FLOOR = 2.0**-12
"""The bracket's lower end is at least this fraction of its upper end (a bearing so long
that it alone carries the force at a smaller scale gives that scale, which passes)."""


def bearing_scale(family_id: str, unit_dims: dict, area, materials: MaterialValues,
                  density, demand: Demand, floor=None) -> np.ndarray | None:
    """The smallest scale whose bearing check holds (the largest over the force terms), or
    None where the family has no bearing check here or the request no transverse force.
    ``unit_dims``: the sections at scale 1; ``area``: their area (m^2 at scale 1).

    Each force term asks (F + F' s^2) SF <= F_R(s): F the unfactored force, F' s^2 the
    self-weight's share of a reaction (rho a g s^2 per metre times the unit reaction), F_R the
    resistance of the section at scale s.

    - Patch loading (I-sections, boxes) with a knife edge (s_s = 0, and c = 0 at an end) is
      homogeneous of degree 2 at fixed proportions: F_cr = 0.9 k_F E t_w^3 / h_w ~ s^2, the
      yield length l_y ~ s, lambda_F scale-free, so F_R = F_R(1) s^2 and the row is the closed
      root of :func:`~service.core.sizing.closed_forms.shear_scale` (the same form as the transverse
      shear's). With s_s > 0 (or a force at a distance c from an end: s_s + c in type (c)) it is
      not, but F_R grows with s_s, and the clause caps s_s at h_w: F_R lies between the
      homogeneous resistances with s_s = 0 and with s_s = h_w, whose closed roots bracket the
      scale. Where the lower root already passes it is the answer (the usual case of a point
      load far from the ends); elsewhere a vectorised bisection on log s closes the bracket
      (:data:`BISECTION_STEPS`), keeping the upper (passing) end.
    - Round tubes (:func:`~service.core.sections.bearing.round_tube_bearing`) likewise: with a
      knife edge the plate joint resistance 5 k_p f t^2 ~ s^2 (closed root); with s_s > 0 the
      bracket runs from the resistance at s_s = 0 to that at the longest plate credited
      (eta = 4), the ring mechanism f t^2 s_s / R adding within it.

    With ``floor`` (m, the other checks' largest scale on a grid that reads only the scale:
    :meth:`~service.core.sizing.checks.base.Found.floor`), an element whose bracket lies
    below the floor (its upper root, which passes, at most the floor by more than the
    rounding of the search's last step) cannot set the scale: it returns the bracket's lower
    end, a lower bound at most the floor, without the search, and so does an element whose
    passing end falls below the floor during the search (once at least half of those
    searching have). Each element's steps are its own: the search runs on the elements
    still bracketing alone.
    """
    if family_id not in RESISTANCES or not requested(demand):
        return None
    resistance = RESISTANCES[family_id]
    factor = np.asarray(demand.safety_factor, dtype=float)
    bearing = np.asarray(demand.bearing_length, dtype=float)
    offset = np.asarray(demand.bearing_offset, dtype=float)
    weight = (np.asarray(density) * area * STANDARD_GRAVITY if demand.self_weight else 0.0)
    force = np.asarray(demand.bearing_force, dtype=float)
    reaction = np.asarray(demand.bearing_reaction, dtype=float)
    terms = (   # (F, F', end distance: None within the span)
        (force, 0.0, None),
        (force, 0.0, offset),
        (reaction, np.asarray(demand.bearing_unit_reaction) * weight, 0.0),
    )

    def capacity_of(dims: dict, materials: MaterialValues) -> Callable[..., np.ndarray]:
        def capacity(scale, length, distance):
            scaled = (dims if isinstance(scale, float) and scale == 1.0
                      else {name: np.asarray(value) * scale for name, value in dims.items()})
            return resistance(scaled, materials, length, distance)
        return capacity

    capacity = capacity_of(unit_dims, materials)

    def narrow(shape: tuple[int, ...], index: np.ndarray) -> Narrowed:
        def take(value):
            return np.broadcast_to(value, shape).reshape(-1).take(index)
        return capacity_of({name: take(value) for name, value in unit_dims.items()},
                           materials.map(take)), take

    # the terms' closed roots read the resistance at scale 1 by bearing length and end
    # (None within the span, 0 at an end): the point force at an end and the reaction
    # share theirs
    at_unit_scale: dict[tuple[float, float | None], np.ndarray] = {}

    def unit_capacity(length: float, end: float | None) -> np.ndarray:
        if (length, end) not in at_unit_scale:
            at_unit_scale[length, end] = capacity(1.0, length, end)
        return at_unit_scale[length, end]

    scales = []
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for constant, per_scale2, distance in terms:
            scale = _term_scale(unit_capacity, narrow, bearing, distance, factor,
                                per_scale2, constant, floor)
            # no force in this term: it asks nothing
            unloaded = (constant == 0) & (np.asarray(per_scale2) == 0)
            scales.append(np.where(unloaded, 0.0, scale) if np.count_nonzero(unloaded)
                          else scale)
    return np.maximum.reduce(scales)


Narrowed = tuple[Callable[..., np.ndarray], Callable[[object], np.ndarray]]
"""The capacity(scale, length, distance) of the flat positions ``index`` of a shape alone,
and take(value): a value broadcast to that shape, at those positions."""

FLOOR_MARGIN = 1e-12
"""An upper root below the floor by this fraction settles an element (the search's result,
exp of its upper end, may exceed the upper root by the rounding of exp(log s): far less)."""


def _term_scale(unit_capacity, narrow, bearing, distance, factor, per_scale2, constant,
                floor) -> np.ndarray:
    """One force term's scale (see :func:`bearing_scale`); ``unit_capacity(length, end)``
    is the capacity at scale 1, ``narrow(shape, index)`` the capacity of some elements
    alone (:data:`Narrowed`)."""
    def root(length, end):
        return shear_scale(unit_capacity(length, end) / factor, per_scale2, constant)

    end = None if distance is None else 0.0
    upper = root(0.0, end)
    if not np.any(bearing + (0.0 if distance is None else distance) > 0):
        return upper
    # the resistance with the longest bearing credited bounds it from above (a web's
    # s_s <= h_w, a tube's eta <= 4); never below the search's floor
    lower = np.minimum(np.maximum(root(np.inf, end), upper * BRACKET_FLOOR), upper)
    shape = np.broadcast_shapes(np.shape(upper), np.shape(bearing), np.shape(distance),
                                np.shape(factor), np.shape(per_scale2), np.shape(constant),
                                np.shape(floor))
    result = np.array(np.broadcast_to(lower, shape))
    flat = result.reshape(-1)
    below = (np.zeros(shape, dtype=bool) if floor is None
             else upper * (1.0 + FLOOR_MARGIN) <= floor)
    searching = np.flatnonzero(~np.broadcast_to(below, shape))
    if not searching.size:
        return result

    def measure_of(index: np.ndarray) -> Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]:
        capacity, take = narrow(shape, index)
        length, at = take(bearing), None if distance is None else take(distance)
        asked, grows, safety = take(constant), take(per_scale2), take(factor)

        def measure(scale):
            """Whether the check passes at ``scale`` and ln(need / capacity) there."""
            with np.errstate(divide="ignore", invalid="ignore"):
                need = (asked + grows * scale**2) * safety
                resistance = capacity(scale, length, at)
                return need <= resistance, np.log(need / resistance)
        return measure

    def passes_of(index: np.ndarray) -> Callable[[np.ndarray], np.ndarray]:
        measure = measure_of(index)
        return lambda scale: measure(scale)[0]

    low, high = flat[searching], np.broadcast_to(upper, shape).reshape(-1)[searching]
    at_lower = passes_of(searching)(low)
    flat[searching] = np.where(at_lower, low, high)
    bracketing = ~at_lower & (low < high)
    searching, low, high = searching[bracketing], np.log(low[bracketing]), np.log(
        high[bracketing])
    if not searching.size:
        return result
    failing, passing = _known_ends(measure_of(searching), low, high)
    # an element whose passing end falls below the floor is settled on the way (its result
    # only comes down from there): its lower root stands in, as for those settled at once
    ceiling = None if floor is None else np.log(
        np.broadcast_to(floor, shape).reshape(-1)[searching] / (1.0 + FLOOR_MARGIN))
    for _ in range(BISECTION_STEPS):
        if ceiling is not None and 2 * np.count_nonzero(high < ceiling) >= high.size:
            keep = ~(high < ceiling)
            settled = searching[~keep]
            flat[settled] = np.broadcast_to(lower, shape).reshape(-1)[settled]
            searching, low, high, ceiling, failing, passing = (
                a[keep] for a in (searching, low, high, ceiling, failing, passing))
            if not searching.size:
                return result
        middle = 0.5 * (low + high)
        # the check's answer wherever a known end settles it (see _known_ends), else asked
        ok = middle >= passing
        unsure = np.flatnonzero(~ok & (middle > failing))
        if unsure.size:
            asked = passes_of(searching[unsure])(np.exp(middle[unsure]))
            ok[unsure] = asked
            passing[unsure] = np.where(asked, middle[unsure], passing[unsure])
            failing[unsure] = np.where(asked, failing[unsure], middle[unsure])
        high = np.where(ok, middle, high)
        low = np.where(ok, low, middle)
    flat[searching] = np.exp(high)
    return result


BRACKET_STEPS = 12
"""Most regula falsi steps of :func:`_known_ends` (the bracket is usually below
:data:`BRACKET_WIDTH` after 4 to 8)."""

BRACKET_WIDTH = 1e-13
"""Width, in ln s, at which :func:`_known_ends` stops: far below the bisection's last step
(2e-9), so that its midpoints rarely fall between the known ends."""


def _known_ends(measure, low: np.ndarray, high: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """ln s of the largest scale known to fail and the smallest known to pass, found by
    regula falsi on ln(need / capacity) against ln s (the Anderson-Bjorck variant, as in
    :func:`~service.core.stability.scaling.falling_root`) within the bracket (``low``,
    ``high``) of the bisection of :func:`bearing_scale` (whose midpoints all lie strictly
    inside it). A trial within a quarter of :data:`BRACKET_WIDTH` of an end moves to that
    distance, so a root at an end (the usual lower root that passes but for rounding)
    closes the bracket in one step.

    The need rises and the resistance with it, monotonely in s at fixed proportions, so the
    check fails below any failing scale and passes above any passing one: the bisection's
    answer at each midpoint outside the two known ends is known without asking, and its
    steps (and result) are those of asking every midpoint, for a small fraction of the
    evaluations (the rare midpoint between the ends is asked).
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        ok_low, f_low = measure(np.exp(low))
        ok_high, f_high = measure(np.exp(high))
        # an end that answers otherwise than its role settles every midpoint (a bracket of
        # no width there)
        passing = np.where(ok_low, low, high)
        failing = np.where(ok_low | ~ok_high, passing, low)
        f_fail = np.where(f_low > 0.0, f_low, 0.0)
        f_pass = np.where(f_high <= 0.0, f_high, 0.0)
        nudge = 0.25 * BRACKET_WIDTH
        last = np.zeros(low.shape, dtype=int)     # which end moved last: -1 failing, +1 passing
        for _ in range(BRACKET_STEPS):
            width = passing - failing
            open_ = width > BRACKET_WIDTH
            if not open_.any():
                break
            trial = passing - f_pass * width / (f_pass - f_fail)
            trial = np.where(np.isfinite(trial), trial, 0.5 * (failing + passing))
            trial = np.minimum(np.maximum(trial, failing + nudge), passing - nudge)
            ok, value = measure(np.exp(trial))
            moved_pass = open_ & ok
            moved_fail = open_ & ~ok
            # Anderson-Bjorck: an end kept twice in a row has its value scaled
            factor = 1.0 - value / np.where(ok, f_pass, f_fail)
            factor = np.where(factor > 0.0, factor, 0.5)
            f_fail = np.where(moved_pass & (last == 1), factor * f_fail, f_fail)
            f_pass = np.where(moved_fail & (last == -1), factor * f_pass, f_pass)
            passing = np.where(moved_pass, trial, passing)
            f_pass = np.where(moved_pass, np.minimum(value, 0.0), f_pass)
            failing = np.where(moved_fail, trial, failing)
            f_fail = np.where(moved_fail, np.maximum(value, 0.0), f_fail)
            last = np.where(moved_pass, 1, np.where(moved_fail, -1, last))
    return failing, passing
