"""Sizing of sandwich panels: face material x core material x face/core ratio, at once.

A panel's width is not scaled but set to the envelope's max_width, so the self-similar closed
forms of :mod:`service.core.sizing.scale` do not apply: at a fixed ratio r = t / c the
bending stiffness grows like c^3, the shear stiffness like c, the face stress falls like c^-2
and the core shear stress like c^-1, and self-weight adds terms that do not fall at all.
Every check is still monotone in c, so the smallest core thickness for each (face, core,
ratio) element is found by a vectorised bracketed root search in log c (:func:`_smallest_core`)
on the exact classical sandwich formulas (:mod:`service.core.sections.sandwich`: Allen 1969;
Zenkert 1995), evaluated by :func:`evaluate_sandwich`:

- deflection c_D P L^3 / D + c_S P L / S <= max_deflection (bending plus core shear),
- face stress x SF <= face strength (the compressed face's where lower), and x SF <= the
  face wrinkling stress,
- core shear stress V / (b d) x SF <= core shear strength,
- face_thickness >= min_wall, overall depth c + 2t <= max_depth,
- core indentation under the point load and at the supports (:func:`panel_bearing`,
  reported as ``bearing``),
- lateral-torsional buckling of the panel (:func:`panel_member_buckling`), unless the
  request restrains it continuously: the usual wide panel (width above about 1.7 times its
  depth) has I_minor >= I_major and cannot buckle laterally at all, a narrow deep one can.

The ratio is searched on a log grid and refined like any one-ratio family; for each face
material the core and ratio with the lowest objective (mass, or cost and carbon of faces plus
core) is the design, which is then rounded and rechecked as every other design.
:class:`SandwichRun` does this for every (case, face material) row of a group at once, as
the engine's other runs do: the grid over (rows, cores, ratios) first, giving each row a
bound and an estimate, then the refinement of the rows the engine asks for, and within them
of the cores that can be the lightest.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.materials.core_direction import directed
from service.core.search import RatioBox, zoom
from service.core.sections.bearing import sandwich_indentation
from service.core.sections.sandwich import (
    core_shear_stress,
    face_second_moments,
    face_stress,
    face_torsion_constant,
    flexural_rigidity,
    peak_wrinkling_stress,
    shear_stiffness,
)
from service.core.sizing.checks.member_buckling import (
    applies,
    member_material,
    moment_ratio,
)
from service.core.sizing.demand import Demand
from service.core.sizing.limits import design_utilization, governing, within_rules
from service.core.sizing.manufacturing import made_fits
from service.core.sizing.proportions import (
    ENVELOPE_MARGIN,
    FIRST_GRID_POINTS,
    REFINE_ROUNDS,
    STENCIL_POINTS,
)
from service.core.sizing.recheck import Evaluation
from service.core.sizing.request import STEPS_PER_METRE
from service.core.sizing.results import Design, Reason
from service.core.sizing.selfsimilar import BLOCK_ELEMENTS, PRUNE_MARGIN, PartedRows
from service.core.sizing.values import MaterialValues
from service.core.stability.lateral_properties import LateralTorsionalProperties
from service.core.stability.member import MemberSection

if TYPE_CHECKING:
    from service.core.materials import MaterialTable
    from service.core.sections.base import SectionFamily

SANDWICH_FAMILY = "sandwich_panel"

ROOT_TOLERANCE = 1e-9
"""The root search stops when the log(core thickness) bracket is narrower than this (1e-9
of the thickness, far below 0.001 mm), or when the met end's largest utilization is within
this fraction of 1."""

ROOT_STEPS = 64
"""At most this many steps of the root search (a bisection alone would need 34 to reach
:data:`ROOT_TOLERANCE` from ln(1e6))."""

CORE_BRACKET = (1e-5, 10.0)
"""m: the core thicknesses searched (0.01 mm to 10 m)."""

SUBSET_FRACTION = 0.5
"""Below this fraction of elements still searching, the root search evaluates them alone."""

CORE_GUESS = 0.01
"""m: where the search for a core thickness starts when no nearby one is known."""


def evaluate_sandwich(family: SectionFamily, dims: dict, face: MaterialValues,
                      core: MaterialValues, demand: Demand, objective: str) -> tuple[
                          Evaluation, np.ndarray]:
    """Every check of panels ``dims`` (arrays broadcasting with the face and core values).

    Returns the evaluation (mass of faces plus core, kg) and the objective value.
    """
    width = np.asarray(dims["width"], dtype=float)
    face_thickness = np.asarray(dims["face_thickness"], dtype=float)
    checked = panel_checks(family, dims, face, core, demand)
    shape = checked.shape
    fits = (
        (family.overall_depth(dims) <= demand.max_depth * (1.0 + 1e-9))
        & (width <= demand.max_width * (1.0 + 1e-9))
        & (face_thickness >= demand.min_wall * (1.0 - 1e-9))
        & family.holds(dims)
        & made_fits(family, dims, demand)
        & within_rules(family, dims)
    )
    utilization = checked.utilization
    feasible = np.broadcast_to(fits, shape) & np.logical_and.reduce(
        [u <= 1.0 for u in utilization.values()])
    face_mass, core_mass = checked.face_mass, checked.core_mass
    mass = np.broadcast_to(face_mass + core_mass, shape)
    if objective == "mass":
        value = mass
    else:
        own = "price" if objective == "cost" else "embodied_carbon"
        value = np.broadcast_to(getattr(face, own) * face_mass + getattr(core, own) * core_mass,
                                shape)
    evaluation = Evaluation(mass, np.broadcast_to(checked.deflection, shape),
                            np.full(shape, np.nan), np.broadcast_to(checked.stress, shape),
                            utilization, np.broadcast_to(fits, shape), feasible,
                            np.full(shape, np.nan))
    return evaluation, value


@dataclass(frozen=True)
class PanelChecks:
    """The checks of panels (arrays of one broadcast shape, or broadcasting to it).

    Attributes:
        utilization: requirement -> ratio, each of ``shape`` (0 where not asked for).
        deflection: m. stress: the peak face stress, Pa (unfactored).
        face_mass, core_mass: kg.
        shape: the panels' broadcast shape.
    """

    utilization: dict[str, np.ndarray]
    deflection: np.ndarray
    stress: np.ndarray
    face_mass: np.ndarray
    core_mass: np.ndarray
    shape: tuple[int, ...]


def panel_checks(family: SectionFamily, dims: dict, face: MaterialValues,
                 core: MaterialValues, demand: Demand) -> PanelChecks:
    """Every requirement's utilization of panels ``dims`` (see the module doc), without
    the geometric limits (the root search of :func:`_smallest_core` reads these alone)."""
    width = np.asarray(dims["width"], dtype=float)
    core_thickness = np.asarray(dims["core_thickness"], dtype=float)
    face_thickness = np.asarray(dims["face_thickness"], dtype=float)
    span = demand.span
    face_mass = face.density * 2.0 * width * face_thickness * span
    core_mass = core.density * width * core_thickness * span
    weight = (face_mass + core_mass) * STANDARD_GRAVITY if demand.self_weight else 0.0
    case = demand.case
    uniform = case.uniform
    load = demand.action
    moment = (case.moment_coefficient * load + uniform.moment_coefficient * weight) * span
    shear = case.shear_coefficient * load + uniform.shear_coefficient * weight
    # read by the rigidity and the faces' I_major (products, not power(): several times cheaper)
    core_cube = core_thickness * core_thickness * core_thickness
    rigidity = flexural_rigidity(dims, face.youngs_modulus, core.youngs_modulus, core_cube)
    deflection = (
        (case.deflection_coefficient * load + uniform.deflection_coefficient * weight)
        * span**3 / rigidity
        + (case.shear_deflection_coefficient * load
           + uniform.shear_deflection_coefficient * weight)
        * span / shear_stiffness(dims, core.shear_modulus)
    )
    stress = face_stress(moment, dims, face.youngs_modulus, core.youngs_modulus, rigidity)
    factor = demand.safety_factor
    strength = np.maximum(stress * factor / face.compression_strength,
                          core_shear_stress(shear, dims) * factor / core.shear_strength)
    local = (stress * factor / peak_wrinkling_stress(core_thickness, face_thickness,
                                                     face.elastic(), core.elastic())
             if demand.local_buckling else np.zeros_like(stress))
    member = (panel_member_buckling(family, dims, face, core, demand, moment, stress, rigidity,
                                    core_cube)
              if applies(demand) else np.zeros_like(stress))
    bearing = panel_bearing(dims, face, core, demand, weight / span)
    shape = np.broadcast_shapes(np.shape(stress), np.shape(deflection), np.shape(strength),
                                np.shape(member), np.shape(bearing))

    def shaped(ratio: np.ndarray) -> np.ndarray:      # most have the shape already
        return ratio if np.shape(ratio) == shape else np.broadcast_to(ratio, shape)

    zeros = np.zeros(shape)       # read only, shared by the checks not asked for
    utilization = {
        "stiffness": shaped(deflection / demand.stiffness_limit),
        "strength": shaped(strength),
        "local_buckling": shaped(local),
        "member_buckling": shaped(member),
        # sandwich panels take the shorthand cases only (no frequency or fatigue asked)
        "frequency": zeros,
        "fatigue": zeros,
        # the faces' wrinkling and the core's shear are the panel's own interaction of
        # buckling and shear (checks.interaction reads I-sections and boxes)
        "interaction": zeros,
        "bearing": shaped(bearing),
    }
    return PanelChecks(utilization, deflection, stress, face_mass, core_mass, shape)


def panel_bearing(dims: dict, face: MaterialValues, core: MaterialValues, demand: Demand,
                  weight_per_length) -> np.ndarray:
    """F SF / P of panels: the largest point load and the largest support reaction (with
    the self-weight's share, ``weight_per_length`` N/m) against the core indentation load
    over the bearing length (:func:`service.core.sections.bearing.sandwich_indentation`:
    the loaded face's hinges on a crushing core; the face's compressive strength, the
    core's compressive strength ``strength``, elastic hinges for brittle faces), 0 where
    the request has no transverse force."""
    with np.errstate(divide="ignore", invalid="ignore"):
        resistance = sandwich_indentation(dims, face.compression_strength, core.strength,
                                          demand.bearing_length, np.asarray(face.brittle) != 0)
        force = np.maximum(np.asarray(demand.bearing_force),
                           np.asarray(demand.bearing_reaction)
                           + np.asarray(demand.bearing_unit_reaction) * weight_per_length)
        return np.where(force > 0, force * demand.safety_factor / resistance, 0.0)


def panel_member_buckling(family: SectionFamily, dims: dict, face: MaterialValues,
                          core: MaterialValues, demand: Demand, moment, stress, rigidity,
                          core_cube) -> np.ndarray:
    """M SF / M_b of panels: lateral-torsional buckling on the faces alone (``moment``, N m,
    and the peak face ``stress`` it causes, Pa, unfactored; ``rigidity``, the panels' D,
    N m^2, :func:`~service.core.sections.sandwich.flexural_rigidity`; ``core_cube``, their
    c^3, m^3).

    The faces are taken as the flanges of an I-section without a web (the core adds
    torsional and lateral stiffness through its shear, which is left out: conservative):
    I_minor = t b^3 / 6, I_t = the two b x t strips (exact Saint-Venant rectangles), and
    I_w = t b^3 (c + t)^2 / 24, the doubly symmetric flange value of
    ``stability.lateral_properties`` with h_s = c + t between the face mid-planes. The
    elastic moment resistance is the moment at which the peak face stress reaches the face
    strength (:func:`face_stress`), reduced by the face material's lateral-torsional curve as
    for every other family (``checks.member_buckling``). A panel with I_minor >= I_major
    cannot buckle laterally (``stability.lateral_properties``), so its ratio is the bending
    part of the strength check.
    """
    width, core_thickness, face_thickness = (np.asarray(dims[name], dtype=float) for name in (
        "width", "core_thickness", "face_thickness"))
    major, minor = face_second_moments(width, core_thickness, face_thickness, core_cube)
    susceptible = minor < major
    # M_b = the elastic moment resistance where the panel cannot buckle laterally, taken as
    # the strength check's own ratio for every such panel, whatever the others beside it
    bending = stress * demand.safety_factor / face.compression_strength
    if not np.any(susceptible):
        return bending
    with np.errstate(divide="ignore", invalid="ignore"):
        modulus = 1.0 / face_stress(1.0, dims, face.youngs_modulus, core.youngs_modulus,
                                    rigidity)
    warping = face_thickness * width**3 * (core_thickness + face_thickness) ** 2 / 24.0
    section = MemberSection(
        2.0 * width * face_thickness, major, modulus,    # the faces' area, as the properties'
        LateralTorsionalProperties(
            minor_second_moment=minor,
            torsion_constant=face_torsion_constant(width, face_thickness),
            warping_constant=warping,
            top_load_height=0.5 * (core_thickness + 2.0 * face_thickness),
            susceptible=susceptible))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        ratio = moment_ratio(section, member_material(face, family.id), demand,
                             np.asarray(moment) * demand.safety_factor)
    return np.where(susceptible, ratio, bending)


def _worst(utilization: dict[str, np.ndarray]) -> np.ndarray:
    """log of each element's largest utilization; ``inf`` where one is NaN (not met)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        # pairwise: no stacked copy of every ratio (a maximum is exact in any order)
        worst = np.log(functools.reduce(np.maximum, utilization.values()))
    return np.where(np.isnan(worst), np.inf, worst)


def _smallest_core(family, ratio, width, face, core, demand, guess=CORE_GUESS):
    """Smallest core thickness meeting every check but the envelope, per element; NaN where
    even the thickest (:data:`CORE_BRACKET`) fails (self-weight that never falls).

    Every check falls monotonically with the core thickness c at a fixed ratio, most like
    c^-1 (core shear) to c^-3 (deflection), so the log of the largest utilization is nearly
    linear in log c. One evaluation at ``guess`` (m, broadcasting with the elements) then
    brackets the root as if the utilization fell like c^-1 to c^-3, both ends checked and
    replaced by :data:`CORE_BRACKET`'s where they do not bracket it; the Illinois variant of
    regula falsi (a bracketed secant that halves the value of an end kept twice in a row;
    Dahlquist & Bjorck, Numerical Methods, 1974, sec. 6.2, from memory) narrows it to
    :data:`ROOT_TOLERANCE`, falling back to the midpoint wherever the secant leaves it."""
    shape = np.broadcast_shapes(np.shape(ratio), np.shape(width), np.shape(face.density),
                                np.shape(core.density), np.shape(guess))

    def excess(log_core, active=None):
        """log of the largest utilization at ``log_core``; with ``active``, only there when
        few elements are (they are evaluated alone, the rest of the result is 0)."""
        alone = active is not None and active.mean() <= SUBSET_FRACTION
        inputs = ratio, width, face, core, demand
        if alone:
            where = np.flatnonzero(active)
            log_core = log_core.reshape(-1)[where]
            pick = _picker(shape, where)
            inputs = pick(ratio), pick(width), face.map(pick), core.map(pick), demand._map(pick)
        thickness = np.exp(log_core)
        dims = {"width": inputs[1], "core_thickness": thickness,
                "face_thickness": inputs[0] * thickness}
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            utilization = panel_checks(family, dims, *inputs[2:]).utilization
        if not alone:
            worst = _worst(utilization)
            return (worst if worst.shape == np.shape(log_core)
                    else np.broadcast_to(worst, np.shape(log_core)))
        value = np.zeros(active.size)
        value[where] = _worst(utilization)
        return value.reshape(shape)

    low, low_excess = np.full(shape, -np.inf), np.full(shape, np.inf)
    high, high_excess = np.full(shape, np.inf), np.full(shape, -np.inf)

    def narrow(*points):
        """The bracket narrowed by the evaluations at ``points`` (log core thicknesses,
        kept within :data:`CORE_BRACKET`), taken in turn; they are evaluated in one call
        (an element's checks do not depend on the others evaluated with it); the ends in
        place."""
        log_cores = np.clip(np.stack(np.broadcast_arrays(*points)), *np.log(CORE_BRACKET))
        for log_core, value in zip(log_cores, excess(log_cores), strict=True):
            above = (value > 0.0) & (log_core > low)
            below = (value <= 0.0) & (log_core < high)
            np.putmask(low, above, log_core)
            np.putmask(low_excess, above, value)
            np.putmask(high, below, log_core)
            np.putmask(high_excess, below, value)

    start = np.broadcast_to(np.log(guess), shape)
    narrow(start)
    value = np.where(np.isfinite(low), low_excess, high_excess)
    # log u = value - k (log c - start) with k from 1 to 3 puts the root between these
    reach = np.where(np.isfinite(value), value, 0.0)
    narrow(start + np.minimum(reach, reach / 3.0) - 1e-6,
           start + np.maximum(reach, reach / 3.0) + 1e-6)
    for end, unbounded in ((CORE_BRACKET[0], np.isinf(low)), (CORE_BRACKET[1], np.isinf(high))):
        if unbounded.any():
            narrow(np.full(shape, math.log(end)))
    possible = np.isfinite(high)
    high = np.where(np.isinf(low), math.log(CORE_BRACKET[0]), high)   # the thinnest meets all
    active = possible & np.isfinite(low)
    last = np.zeros(shape, dtype=np.int8)                 # +1: high moved last, -1: low
    for _ in range(ROOT_STEPS):
        # done: a bracket narrower than the tolerance, or a thickness whose largest
        # utilization is within the tolerance of 1 (a secant that lands on the root)
        active &= (high - low > ROOT_TOLERANCE) & (high_excess < -ROOT_TOLERANCE)
        if not active.any():
            break
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            secant = low + low_excess / (low_excess - high_excess) * (high - low)
        inside = np.isfinite(secant) & (secant > low) & (secant < high)
        # at least half the tolerance from either end, so that a root at an end closes the
        # bracket on the next step
        trial = np.clip(np.where(inside, secant, 0.5 * (low + high)),
                        low + 0.5 * ROOT_TOLERANCE, high - 0.5 * ROOT_TOLERANCE)
        value = excess(trial, active)
        met = active & (value <= 0.0)
        missed = active & (value > 0.0)
        # the ends in place (np.putmask: a fraction of np.where's cost; the arrays are this
        # search's own)
        np.putmask(low_excess, met & (last > 0), 0.5 * low_excess)
        np.putmask(high_excess, missed & (last < 0), 0.5 * high_excess)
        np.putmask(high, met, trial)
        np.putmask(high_excess, met, value)
        np.putmask(low, missed, trial)
        np.putmask(low_excess, missed, value)
        np.putmask(last, met, 1)
        np.putmask(last, missed, -1)
    with np.errstate(over="ignore"):
        thickness = np.exp(high)
    # min_wall sets a floor under the face, hence under the core at this ratio; the
    # thinnest panel made (min_size, c + 2 t) another
    thickness = np.maximum(np.maximum(thickness, demand.min_wall / ratio),
                           demand.min_size / (1.0 + 2.0 * ratio))
    return np.where(possible, thickness, np.nan)


def _picker(shape: tuple[int, ...], where: np.ndarray):
    """value -> the elements ``where`` (flat positions in ``shape``) of ``value`` broadcast
    to ``shape``, (len(where),), read from ``value`` itself: its flat positions are worked
    out once per shape of value (the fields of a demand and of material values share a
    few), and no broadcast copy is made."""
    positions = np.unravel_index(where, shape)
    flat: dict[tuple[int, ...], np.ndarray] = {}

    def pick(value) -> np.ndarray:
        value = np.asarray(value)
        padded = (1,) * (len(shape) - value.ndim) + value.shape
        if padded not in flat:
            index = np.zeros(len(where), dtype=np.intp)
            stride = 1
            for axis in reversed(range(len(shape))):
                if padded[axis] > 1:
                    index += positions[axis] * stride
                stride *= padded[axis]
            flat[padded] = index
        return value.reshape(-1)[flat[padded]]
    return pick


def _panels(family, ratio, width, face, core, demand, objective, guess=CORE_GUESS):
    """(objective, core thickness, feasible) at each ratio element: the objective of the
    thinnest core meeting every requirement, ``inf`` where no core does, and whether that
    panel also meets the envelope and the other geometric limits. ``guess``: a core
    thickness near the one sought, m, where known."""
    thickness = _smallest_core(family, ratio, width, face, core, demand, guess)
    dims = {"width": width, "core_thickness": thickness, "face_thickness": ratio * thickness}
    with np.errstate(invalid="ignore"):
        evaluation, value = evaluate_sandwich(family, dims, face, core, demand, objective)
    made = np.isfinite(thickness)
    return np.where(made, value, np.inf), thickness, evaluation.feasible & made


def _shaped(demand: Demand, ndim: int) -> Demand:
    """A demand with fields (R, 1) as (R, 1, ..., 1) of ``ndim`` axes."""
    return demand._map(lambda value: np.reshape(value, (-1,) + (1,) * (ndim - 1)))


@dataclass(frozen=True)
class _Sized:
    """Rows of a sandwich run refined, rounded and rechecked together (arrays (r,)).

    Attributes:
        faces: the face values of each row.
        cores: the values of each row's chosen core.
        core_index: the chosen core (row of the core table).
        ratio: the searched face/core ratio of the chosen core.
        searched: whether any core had a feasible panel before rounding.
        dimensions: the rounded dimensions, m.
        check: every requirement recomputed from ``dimensions``.
        value: the objective of ``dimensions``.
    """

    faces: MaterialValues
    cores: MaterialValues
    core_index: np.ndarray
    ratio: np.ndarray
    searched: np.ndarray
    dimensions: dict
    check: Evaluation
    value: np.ndarray

    @property
    def feasible(self) -> np.ndarray:
        """Rows with a design."""
        return self.searched & self.check.feasible


@dataclass
class SandwichRun(PartedRows):
    """Sandwich panels for every (case, face material) row of a group (rows case-major over
    the K face materials made in the form, as :class:`~service.core.sizing.selfsimilar.
    SelfSimilarRun`), for the engine's pruning: the first grid over (rows, cores, ratios)
    is done when the run begins, and :meth:`size` refines, rounds and rechecks rows.

    A row's bound (:meth:`lower`) is :data:`PRUNE_MARGIN` of its lightest grid panel without
    self-weight whose depth is within :data:`ENVELOPE_MARGIN` of max_depth: like a
    self-similar family's, the objective and the depth of the thinnest core are continuous
    functions of log(ratio) whose grid steps (1/64 of the range) change them by far less
    than those margins. Within a refined row, only the cores whose own bound is
    below the row's lightest feasible grid panel are refined.

    Attributes:
        family: the sandwich family.
        indices: the face materials made in its form (rows of the engine's table), (K,).
        faces: each row's face values, (R,).
        cores: the core table.
        core_values: its values on the request's basis, (N,), honeycombs in the request's
            ``core_direction`` (:mod:`service.core.materials.core_direction`).
        demand: each row's demand, fields (R, 1) or floats.
        width: each row's panel width (the envelope's max_width), (R, 1).
        objective_name: the request's objective.
        refused: rows that are not modelled, and why.
        centers: the log ratio of each row's and core's lightest grid panel, (R, N).
        guesses: its core thickness, m (R, N), where the refinement's search starts.
        floor: each row's and core's bound on its objective, (R, N).
        estimates: each row's lightest feasible grid panel's objective, (R,).
        parts: the sized parts: the rows sized together and their sizing.
        part: the part that sized each row, (R,); -1 for a row not sized.
        local: each row's place in its part, (R,).
    """

    family: SectionFamily
    indices: np.ndarray
    faces: MaterialValues
    cores: MaterialTable
    core_values: MaterialValues
    demand: Demand
    width: np.ndarray
    objective_name: str
    refused: dict[int, str]
    centers: np.ndarray
    guesses: np.ndarray
    floor: np.ndarray
    estimates: np.ndarray
    parts: list[tuple[np.ndarray, _Sized]] = field(default_factory=list)
    part: np.ndarray = field(default_factory=lambda: np.zeros(0, dtype=int))
    local: np.ndarray = field(default_factory=lambda: np.zeros(0, dtype=int))

    @classmethod
    def begin(cls, family: SectionFamily, indices: np.ndarray, values: MaterialValues,
              cores: MaterialTable, demand: Demand, objective: str, basis: str
              ) -> SandwichRun:
        """The first grid of every (case, face) row; ``values`` are those of the whole
        table, ``demand`` has fields of shape (C, 1, 1) or (C, K, 1)."""
        count = len(indices)
        rows = demand.per_row(count)
        total = np.shape(demand.span)[0] * count
        faces = values.take(indices).take(np.arange(total) % count)
        max_width = np.broadcast_to(np.asarray(rows.max_width, dtype=float), (total, 1))
        refused = _refusals(rows, max_width[:, 0], len(cores))
        # refused rows are not searched: a finite width and no axial force keep their
        # arrays finite (an axial force only turns member buckling on, for every row)
        width = np.where(np.isfinite(max_width), max_width, 1.0)
        search = rows.replace(axial_force=0.0)
        core_values = directed(MaterialValues.from_table(cores, basis), cores.ids,
                               demand.core_direction, basis)
        run = cls(family, indices, faces, cores, core_values, search, width, objective,
                  refused, np.zeros((total, len(cores))),
                  np.full((total, len(cores)), CORE_GUESS), np.full((total, len(cores)), np.inf),
                  np.full(total, np.inf), part=np.full(total, -1),
                  local=np.zeros(total, dtype=int))
        if len(cores):
            run._grid(np.setdiff1d(np.arange(total), list(refused)))
        return run

    def _grid(self, rows: np.ndarray) -> None:
        """The first grid of ``rows``, a block of rows at a time."""
        box = RatioBox.of(self.family.ratio_bounds)                      # one ratio: t / c
        grid = box.grid(FIRST_GRID_POINTS[1])[:, 0]
        ratio = np.exp(grid)
        cores = self.core_values.map(lambda v: v[None, :, None])
        block = max(1, BLOCK_ELEMENTS // (len(grid) * len(self.cores)))
        for first in range(0, len(rows), block):
            chosen = rows[first:first + block]
            faces = self.faces.take(chosen).map(lambda v: v[:, None, None])
            demand = _shaped(self.demand.take(chosen), 3)
            width = self.width[chosen][..., None]
            value, thickness, feasible = _panels(self.family, ratio, width, faces, cores,
                                                 demand, self.objective_name)
            usable = np.where(feasible, value, np.inf)
            best = np.argmin(usable, axis=-1)
            self.centers[chosen] = grid[best]
            found = np.take_along_axis(thickness, best[..., None], axis=-1)[..., 0]
            self.guesses[chosen] = np.where(np.isfinite(found), found, CORE_GUESS)
            self.estimates[chosen] = usable.min(axis=(-2, -1))
            if demand.self_weight:
                value, thickness, _ = _panels(self.family, ratio, width, faces, cores,
                                              demand.replace(self_weight=False),
                                              self.objective_name, thickness)
            with np.errstate(invalid="ignore"):
                near = thickness * (1.0 + 2.0 * ratio) <= ENVELOPE_MARGIN * demand.max_depth
            self.floor[chosen] = PRUNE_MARGIN * np.where(near, value, np.inf).min(axis=-1)

    def lower(self) -> np.ndarray:
        """No design of a row has an objective below this, (C, K)."""
        return self.reshape(self.floor.min(axis=-1, initial=np.inf))

    def estimate(self) -> np.ndarray:
        """The objective of each row's lightest feasible grid panel, (C, K); ``inf`` where
        none is feasible."""
        return self.reshape(self.estimates)

    def size(self, rows: np.ndarray) -> None:
        """Refine, round and recheck the rows ``rows`` (not sized before; refused rows need
        nothing), in parts of bounded memory."""
        rows = rows[[int(row) not in self.refused for row in rows]]
        size = max(1, BLOCK_ELEMENTS // (STENCIL_POINTS * max(len(self.cores), 1)))
        for first in range(0, len(rows), size):
            chosen = rows[first:first + size]
            self._record(chosen, self._refine(chosen))

    def _refine(self, rows: np.ndarray) -> _Sized:
        """The best (core, ratio) panel of each row of ``rows``, rounded and rechecked."""
        wanted = ~(self.floor[rows] > self.estimates[rows, None])
        pair_row, pair_core = np.nonzero(wanted)
        taken = rows[pair_row]
        faces = self.faces.take(taken).column()
        cores = self.core_values.take(pair_core).column()
        demand = self.demand.take(taken)
        width = self.width[taken]
        box = RatioBox.of(self.family.ratio_bounds)
        guess = self.guesses[taken, pair_core][:, None]                    # (P, 1)

        def pick(candidates: np.ndarray) -> np.ndarray:
            nonlocal guess
            value, thickness, feasible = _panels(self.family, np.exp(candidates[..., 0]), width,
                                                 faces, cores, demand, self.objective_name,
                                                 guess)
            best = np.argmin(np.where(feasible, value, np.inf), axis=-1)
            found = np.take_along_axis(thickness, best[..., None], axis=-1)
            guess = np.where(np.isfinite(found), found, guess)
            return np.take_along_axis(candidates, best[..., None, None], axis=-2)[..., 0, :]

        center = zoom(box, self.centers[taken, pair_core][:, None],
                      box.spacing(FIRST_GRID_POINTS[1]), pick, points=STENCIL_POINTS,
                      shrink=0.25, rounds=REFINE_ROUNDS)
        pair_ratio = np.exp(center)                                        # (P, 1)
        value, thickness, feasible = _panels(self.family, pair_ratio, width, faces, cores,
                                             demand, self.objective_name, guess)
        shape = wanted.shape
        scattered = {}
        # cores left out keep their grid ratio (a rejection's reason reads the first core's)
        for name, pairs, empty in (("value", np.where(feasible, value, np.inf)[:, 0], np.inf),
                                   ("thickness", thickness[:, 0], np.nan),
                                   ("ratio", pair_ratio[:, 0], np.exp(self.centers[rows])),
                                   ("feasible", feasible[:, 0], False)):
            scattered[name] = np.array(np.broadcast_to(empty, shape),
                                       dtype=np.asarray(pairs).dtype)
            scattered[name][pair_row, pair_core] = pairs
        best_core = np.argmin(scattered["value"], axis=-1)                 # (r,)
        local = np.arange(len(rows))
        thickness = scattered["thickness"][local, best_core]
        ratio = scattered["ratio"][local, best_core]
        chosen_core = self.core_values.take(best_core)
        faces = self.faces.take(rows)
        dims = {"width": self.width[rows, 0], "core_thickness": thickness,
                "face_thickness": ratio * thickness}
        rounded, check, value = _round(self.family, dims, faces, chosen_core,
                                       self.demand.take(rows), self.objective_name)
        searched = np.asarray(scattered["feasible"].any(axis=-1))
        return _Sized(faces, chosen_core, best_core, ratio, searched, rounded, check, value)

    def sized(self) -> np.ndarray:
        """Rows sized so far (refused rows count as sized), (C, K)."""
        sized = self.part >= 0
        sized[list(self.refused)] = True
        return self.reshape(sized)

    def objective(self) -> np.ndarray:
        """The objective of every row's design, (C, K); ``inf`` where there is none (or the
        row was not sized)."""
        value = np.full(len(self.part), np.inf)
        for rows, sized in self.parts:
            value[rows] = np.where(sized.feasible, sized.value, np.inf)
        return self.reshape(value)

    def design(self, case: int, position: int, material_id: str, demand: Demand) -> Design:
        """The design of face material ``position`` in ``case`` (whose scalar demand is
        ``demand``)."""
        sized, local = self._locate(case, position)
        core_index = int(sized.core_index[local])
        return _design(self.family, int(self.indices[position]), material_id, local,
                       sized.dimensions, sized.check, sized.faces, sized.cores, self.cores,
                       core_index, demand)

    def rejection(self, case: int, position: int, demand: Demand) -> Reason | None:
        """Why face material ``position`` has no design in ``case`` and its shortfall; None
        when it has one."""
        row = case * len(self.indices) + position
        if row in self.refused:
            return self.refused[row], math.inf
        sized, local = self._locate(case, position)
        if not sized.searched[local]:
            return _reason(self.family, sized.ratio[local], self.faces.take([row]).column(),
                           self.core_values.map(lambda v: v[None, :, None]), demand)
        if not sized.check.feasible[local]:
            return "no feasible design after rounding the dimensions to 0.001 mm", 1.0
        return None


def _refusals(demand: Demand, max_width: np.ndarray, cores: int) -> dict[int, str]:
    """The rows (fields (R, 1)) a sandwich panel is not sized for, and why."""
    axial = np.broadcast_to(np.asarray(demand.axial_force) != 0.0, (len(max_width), 1))[:, 0]
    refused = {}
    for row in range(len(max_width)):
        if axial[row]:
            refused[row] = ("a sandwich panel under an axial force (a beam-column) is not "
                            "modelled")
        elif not math.isfinite(max_width[row]):
            refused[row] = "a sandwich panel needs envelope max_width (its width)"
        elif not cores:
            refused[row] = "no core material to use"
    return refused


def _round(family, dims, face, core, demand, objective):
    """The best feasible rounding of core and face to 0.001 mm steps: each goes down, up, or up
    one or two steps more (16 combinations at once); the lowest objective that passes wins,
    else the all-up-most one (which then fails and is rejected). Returns the rounded
    dimensions, their check and their objective."""
    width = dims["width"][:, None]
    base = {name: np.ceil(dims[name] * STEPS_PER_METRE - 1e-6)[:, None]
            for name in ("core_thickness", "face_thickness")}
    moves = np.array([-1, 0, 1, 2])
    core_steps = (base["core_thickness"] + moves[:, None].T).repeat(len(moves), axis=-1)
    face_steps = np.tile(base["face_thickness"] + moves, len(moves))
    candidates = {"width": width, "core_thickness": core_steps / STEPS_PER_METRE,
                  "face_thickness": face_steps / STEPS_PER_METRE}
    columns = face.column()
    core_columns = core.column()
    with np.errstate(invalid="ignore", divide="ignore"):
        check, value = evaluate_sandwich(family, candidates, columns, core_columns, demand,
                                         objective)
    usable = check.feasible & (candidates["face_thickness"] > 0) & (
        candidates["core_thickness"] > 0)
    best = np.argmin(np.where(usable, value, np.inf), axis=-1)
    pick = np.where(usable.any(axis=-1), best, core_steps.shape[-1] - 1)
    chosen = {name: np.take_along_axis(np.broadcast_to(v, core_steps.shape), pick[:, None],
                                       axis=-1)[:, 0] for name, v in candidates.items()}
    return chosen, check.take(pick), np.take_along_axis(value, pick[:, None], axis=-1)[:, 0]


def _reason(family, ratio, face, cores3, demand) -> Reason:
    """Why no core and ratio works for the face material ``face`` (values (1, 1)) with the
    cores ``cores3`` (values (1, N, 1)) under its scalar ``demand``, and its shortfall (the
    depth it needs over max_depth)."""
    thickness = _smallest_core(family, np.asarray(ratio)[None, None], demand.max_width, face,
                               cores3, demand)[0]
    if not np.isfinite(thickness).any():
        return ("cannot carry its own weight: with every core, the self-weight alone exceeds "
                "a limit however thick the core"), math.inf
    depth = float(np.nanmin(thickness * (1.0 + 2.0 * ratio)))
    shortfall = max(depth / demand.max_depth, 1.0) if math.isfinite(demand.max_depth) else math.inf
    return (f"envelope max_depth {demand.max_depth:.3g} m is too small: the panel needs an "
            f"overall depth of at least {depth:.3g} m"), shortfall


def _design(family, material_index, material_id, row, dims, check, face, core, cores,
            core_index, demand) -> Design:
    width = dims["width"][row]
    face_mass = face.density[row] * 2.0 * width * dims["face_thickness"][row] * demand.span
    core_mass = core.density[row] * width * dims["core_thickness"][row] * demand.span
    dimensions = {name: float(dims[name][row]) for name in family.dimension_names}
    utilization = design_utilization(
        family, dimensions, {name: float(u[row]) for name, u in check.utilization.items()},
        demand, free=True)
    return Design(
        material_index=material_index,
        material_id=material_id,
        family=family.id,
        dimensions=dimensions,
        core_material_index=core_index,
        core_material_id=cores.ids[core_index],
        designation=None,
        mass=float(face_mass + core_mass),
        cost=float(face.price[row] * face_mass + core.price[row] * core_mass),
        carbon=float(face.embodied_carbon[row] * face_mass
                     + core.embodied_carbon[row] * core_mass),
        deflection=float(check.deflection[row]),
        twist=None,
        max_stress=float(check.max_stress[row]),
        utilization=utilization,
        governing=governing(utilization),
    )
