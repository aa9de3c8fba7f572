"""Sizing of one self-similar section family for rows of (case, material) pairs.

Fix the proportions and every requirement gives the smallest scale in closed form
(:mod:`service.core.sizing.scale`); :mod:`service.core.sizing.proportions` searches the
proportions (a first grid, then a refinement), and :mod:`service.core.sizing.recheck` rounds
and rechecks the dimensions. :class:`SelfSimilarRun` holds one family of a group of cases: the
first grid runs over (cases, materials, grid points) a block of cases at a time (memory stays
bounded whatever the number of cases), on the rows the engine asks for and with a mass
threshold above which points need no exact value (:meth:`SelfSimilarRun.search`), and from
there every (case, material) pair is a row of its own, refined only when the engine asks for
it (see :data:`PRUNE_MARGIN`). Every row's search, rounding and recheck depends on its own
inputs alone, so a case gets the same design whichever cases share the arrays.

The objective only multiplies the mass by a per-material constant (price, embodied carbon),
so the best proportions per material are the same for every objective; only the order
differs.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from service.core.sections.base import SectionFamily
from service.core.sizing.demand import Demand
from service.core.sizing.limits import WORDS
from service.core.sizing.manufacturing import (
    failed_limits,
    limit_words,
    raise_to_limits,
    set_by_limit,
)
from service.core.sizing.proportions import (
    FIRST_GRID_POINTS,
    STARTS,
    GridStart,
    Optimum,
    grid_starts,
    refine,
)
from service.core.sizing.recheck import Evaluation, finalise, make_design
from service.core.sizing.results import Design, Reason
from service.core.sizing.scale import REQUIREMENTS, ScaleBounds, requirement
from service.core.sizing.unit_bounds import bounds_at, dimensions_at
from service.core.sizing.values import MaterialValues

PRUNE_MARGIN = 0.5
"""No design of a row is lighter than this fraction of the lightest grid point's mass without
self-weight among the points near the envelope (:attr:`GridStart.floor_mass`; measured below
with the envelope ignored, the floor's earlier definition). Self-weight only
adds mass, and without it every bound is a smooth power law of the proportions, so the grid
can only overestimate the lightest point by what lies between its points. Measured: the
worst ratio of design mass to that grid mass was 0.69 (a rectangular tube whose
min_wall-governed wall sits between grid points at the half-width limit), over about
110,000 feasible rows of 900 random requests of every kind, half of the bending ones with
self-weight; tests/core/test_sizing_selfsimilar.py keeps checking it on random requests. A
row whose bound (:meth:`SelfSimilarRun.lower`) is above its case's ``top``-th best
objective cannot be among the designs kept, so the engine does not refine it."""

BLOCK_ELEMENTS = 1 << 19
"""Cases x materials x first-grid points per block: 4 MB per grid array. A chunk of 256 cases
of every built-in material then peaks near 60 MB of arrays (tests/benchmarks); larger
blocks are no faster."""

RAISE_MARGIN = 1e-6
"""A smallest size within this fraction of the envelope counts as above it (the raise to it
overshoots by ``SIZE_TOLERANCE`` of :mod:`service.core.sizing.manufacturing`)."""

PER_KG = {"cost": "price", "carbon": "embodied_carbon"}
"""The material value that turns a mass into each objective (Design.cost, Design.carbon)."""

def _infeasible_reason(family: SectionFamily, optimum: Optimum, index: int, demand: Demand,
                       relaxed: ScaleBounds | None) -> Reason:
    """Why material ``index`` has no design, from its least-violating proportions, and its
    shortfall: the envelope dimension it needs over the one allowed."""
    bounds = optimum.bounds
    lower = bounds.lower[:, index]
    fatigue_row = REQUIREMENTS.index("fatigue")
    if demand.member is not None and demand.member.checks_fatigue \
            and not np.isfinite(lower[fatigue_row]):
        return ("no fatigue strength is known for this material, and fatigue_cycles asks for "
                "a fatigue check"), math.inf
    if not np.isfinite(bounds.mass[index]) or not np.all(np.isfinite(lower)):
        return "missing or non-physical material data", math.inf
    needed_by = str(requirement(int(np.argmax(lower))))
    word = WORDS[needed_by]
    made = demand.form_limit
    if needed_by == "min_wall":
        word = f"min_wall {demand.min_wall:.3g} m"
        if made is not None and set_by_limit(demand, "min_wall", True).all():
            word = f"the thinnest wall its process makes ({made.process}, {made.min_wall:.3g} m)"
    depth_limited = bool(bounds.depth_limited[index])
    limit_name = "max_depth" if depth_limited else "max_width"
    limit = demand.max_depth if depth_limited else demand.max_width
    stop = f"envelope {limit_name} {limit:.3g} m"
    if made is not None and set_by_limit(demand, "envelope", depth_limited).all():
        stop = f"the largest size its process makes ({made.process}, {made.max_size:.3g} m)"
    ratios = optimum.ratios[index]
    dims = dimensions_at(family, ratios, np.asarray(lower.max()))
    needed = float(dims[family.depth_dimension if depth_limited else family.width_dimension])
    bounded = np.isfinite(needed) and np.isfinite(limit)
    shortfall = max(needed / float(limit), 1.0) if bounded else math.inf
    if relaxed is not None and relaxed.feasible[index]:
        return (f"cannot carry its own weight within the envelope: with its self-weight, {word}"
                f" needs a {limit_name.removeprefix('max_')} of at least {needed:.3g} m"
                f" ({stop})"), shortfall
    return f"{stop} is too small: {word} needs at least {needed:.3g} m", shortfall


@dataclass(frozen=True)
class FamilySizing:
    """One self-similar family sized for rows of (case, material) pairs (arrays (R,)).

    Attributes:
        values: the material values of each row.
        optimum: the searched proportions and their scale bounds.
        relaxed: the bounds at those proportions without self-weight (to tell "cannot carry
            its own weight" apart), or None when not needed.
        dimensions: the rounded dimensions, m.
        check: every requirement recomputed from ``dimensions``.
    """

    values: MaterialValues
    optimum: Optimum
    relaxed: ScaleBounds | None
    dimensions: dict
    check: Evaluation

    @property
    def feasible(self) -> np.ndarray:
        """Rows with a design: a feasible optimum that passes every check once rounded."""
        return self.optimum.bounds.feasible & self.check.feasible

    def rejection_reason(self, family: SectionFamily, row: int, demand: Demand
                         ) -> Reason | None:
        """Why ``row`` has no design and its shortfall (None when it has one); ``demand`` is
        that row's."""
        if not self.optimum.bounds.feasible[row]:
            return _infeasible_reason(family, self.optimum, row, demand, self.relaxed)
        if not self.check.feasible[row]:
            limit = demand.form_limit
            dims = {name: value[row] for name, value in self.dimensions.items()}
            if limit is not None and (failed := failed_limits(limit, dims)):
                return (f"outside {limit_words(limit)}: {', '.join(failed)}; "
                        f"{limit.source}"), 1.0
            if limit is not None and not self.check.fits[row]:
                return (f"the smallest section {limit_words(limit)} allow (outer size "
                        f"{limit.min_size:.4g} m) does not fit the envelope"), math.inf
            return "no feasible design after rounding the dimensions to 0.001 mm", 1.0
        return None


def size_started(family: SectionFamily, start: GridStart, values: MaterialValues,
                 demand: Demand) -> FamilySizing:
    """Refine, round and recheck the rows of ``start``, with each row's material values (R,)
    and demand (fields (R, 1) or floats)."""
    optimum = refine(family, start, values, demand)
    feasible = optimum.bounds.feasible
    relaxed = None
    if demand.self_weight and not feasible.all():
        without_weight = demand.replace(self_weight=False)
        relaxed = bounds_at(family, optimum.ratios[:, None, :], values.column(),
                            without_weight).take(np.zeros(len(feasible), dtype=int))
    dims, _ = raise_to_limits(
        family, dimensions_at(family, optimum.ratios, optimum.bounds.scale), demand)
    rounded, check = finalise(family, dims, values, demand, feasible)
    return FamilySizing(values, optimum, relaxed, rounded, check)


def grid_size(family: SectionFamily) -> int:
    """Points of the family's first grid."""
    return FIRST_GRID_POINTS.get(len(family.ratio_bounds), 1) ** len(family.ratio_bounds)


def per_kg(values: MaterialValues, objective: str) -> np.ndarray:
    """The objective of one kg of each material, (M,)."""
    return np.ones(len(values.density)) if objective == "mass" else getattr(
        values, PER_KG[objective])


class PartedRows:
    """The bookkeeping of a run whose (case, material) rows are sized in parts (case-major
    over the K materials ``indices``): ``parts`` holds the rows sized together and their
    sizing (which has a ``feasible`` array over them), ``part`` the part of each row (-1: not
    sized) and ``local`` its place there."""

    indices: np.ndarray
    family: SectionFamily
    parts: list
    part: np.ndarray
    local: np.ndarray

    def reshape(self, array: np.ndarray) -> np.ndarray:
        """A per-row array as (C, K)."""
        return array.reshape(-1, len(self.indices))

    def search(self, bound) -> None:
        """Nothing to do where every row's grid is done when the run begins (the engine's
        ``FamilyRun.search``; :class:`SelfSimilarRun` searches on demand)."""

    def _record(self, chosen: np.ndarray, sized) -> None:
        """The rows ``chosen`` were sized together as ``sized``."""
        self.part[chosen] = len(self.parts)
        self.local[chosen] = np.arange(len(chosen))
        self.parts.append((chosen, sized))

    def feasible(self) -> np.ndarray:
        """Rows with a design, (C, K) (False for a row not sized)."""
        feasible = np.zeros(len(self.part), dtype=bool)
        for rows, sized in self.parts:
            feasible[rows] = sized.feasible
        return self.reshape(feasible)

    def _locate(self, case: int, position: int):
        """The sizing of material ``position`` in ``case`` and the row's place in it."""
        row = case * len(self.indices) + position
        if self.part[row] < 0:
            raise LookupError(f"row {row} of {self.family.id} was not sized")
        return self.parts[self.part[row]][1], int(self.local[row])


@dataclass
class SelfSimilarRun(PartedRows):
    """One self-similar family for every (case, material) row of a group: rows are
    case-major, row = c K + k over the K materials made in its form. :meth:`search` runs
    the first grid of the rows that can be among a case's best, :meth:`size` refines, rounds
    and rechecks rows.

    Attributes:
        family: the section family.
        indices: the materials made in its form (rows of the engine's table), (K,).
        values: their material values, (K,).
        demand: the group's demand, fields of shape (C, 1, 1) (one per case).
        start: the first grid of every row (a row not searched yet: no feasible point, a
            floor of 0 and not exact).
        per_kg: the objective of one kg of each material, (K,).
        searched: the objective up to which each case's rows are searched, (C,) (see
            :meth:`search`).
        parts: the sized parts: the rows sized together (ascending) and their sizing.
        part: the part that sized each row, (C K,); -1 for a row not sized.
        local: each row's place in its part, (C K,).
    """

    family: SectionFamily
    indices: np.ndarray
    values: MaterialValues
    demand: Demand
    start: GridStart
    per_kg: np.ndarray
    searched: np.ndarray
    parts: list[tuple[np.ndarray, FamilySizing]] = field(default_factory=list)
    part: np.ndarray = field(default_factory=lambda: np.zeros(0, dtype=int))
    local: np.ndarray = field(default_factory=lambda: np.zeros(0, dtype=int))

    @classmethod
    def begin(cls, family: SectionFamily, indices: np.ndarray, values: MaterialValues,
              demand: Demand, objective: str) -> SelfSimilarRun:
        """The run of ``family`` for every (case, material) row, none searched yet.
        ``values`` are those of the whole table, ``demand`` has fields of shape (C, 1, 1)."""
        cases, count = np.shape(demand.span)[0], len(indices)
        rows = cases * count
        n_ratios = len(family.ratio_bounds)
        starts = STARTS[n_ratios] if n_ratios > 1 else 1
        start = GridStart((cases, count), np.zeros((rows, starts, n_ratios)),
                          np.full(rows, np.inf), np.full(rows, np.inf), np.zeros(rows),
                          np.zeros(rows, dtype=bool))
        made = values.take(indices)
        return cls(family, indices, made, demand, start, per_kg(made, objective),
                   np.full(cases, -np.inf), part=np.full(rows, -1),
                   local=np.zeros(rows, dtype=int))

    def search(self, bound) -> None:
        """The first grid of the rows whose objective may be at most ``bound`` (C,) (their
        :meth:`lower` is not above it) and that are not yet exact, with the threshold
        ``bound`` sets on their masses (:func:`~service.core.sizing.proportions.grid_starts`:
        the grid's points heavier than a row's design could be while among the best are
        not sized exactly). Afterwards every row of a case is either exact, or its
        :meth:`lower` (a lower bound still) is above ``bound``, or it is at most
        ``bound`` (exact) with a lightest point or starts above the threshold: its
        :meth:`estimate` is then above ``bound`` (exact or not), and :meth:`size` grids it
        again without a threshold. ``inf`` grids every row exactly."""
        cases = len(self.searched)
        bound = np.broadcast_to(np.asarray(bound, dtype=float), (cases,))
        wider = bound > self.searched
        wanted = (wider[:, None] & ~self.reshape(self.start.exact)
                  & ~(self.lower() > bound[:, None]))
        self.searched = np.where(wider, bound, self.searched)
        with np.errstate(divide="ignore", invalid="ignore"):
            limit = bound[:, None] / (PRUNE_MARGIN * self.per_kg)
        self._grid(wanted, limit)

    def _grid(self, wanted: np.ndarray, limit: np.ndarray) -> None:
        """Grid the rows ``wanted`` (C, K) with the mass thresholds ``limit`` (C, K), over
        the cases and materials that have any, a block of cases at a time (the grid's
        arrays are the large ones); the other rows there are skipped by a threshold of -inf
        (only the closed forms are computed for them)."""
        cases = np.flatnonzero(wanted.any(axis=1))
        if not cases.size:
            return
        count = len(self.indices)
        materials = np.flatnonzero(wanted.any(axis=0))
        wanted = wanted[np.ix_(cases, materials)]
        threshold = np.where(wanted, limit[np.ix_(cases, materials)], -np.inf)
        every = bool(np.all(wanted) and not np.any(threshold < np.inf))
        values = self.values.take(materials)
        demand = self.demand.take_materials(materials)
        block_cases = max(1, BLOCK_ELEMENTS // (grid_size(self.family) * len(materials)))
        for first in range(0, len(cases), block_cases):
            block = cases[first:first + block_cases]
            found = grid_starts(self.family, values, demand.take(block),
                                None if every else threshold[first:first + block_cases, :,
                                                             None])
            rows = (block[:, None] * count + materials).reshape(-1)
            keep = wanted[first:first + block_cases].reshape(-1)
            for name in ("points", "unconstrained_mass", "lightest", "floor_mass", "exact"):
                getattr(self.start, name)[rows[keep]] = getattr(found, name)[keep]

    def lower(self) -> np.ndarray:
        """No design of a row has an objective below this, (C, K) (see
        :data:`PRUNE_MARGIN`)."""
        return self.reshape(PRUNE_MARGIN * self.start.floor_mass) * self.per_kg

    def estimate(self) -> np.ndarray:
        """The objective of each row's lightest feasible grid point, (C, K); ``inf`` where
        none is feasible, or where the manufacturing limits may still rule it out (a
        smallest size above the envelope, or a thinnest side, can raise a design out of the
        envelope, which only its sizing tells)."""
        demand = self.demand
        shape = (np.shape(demand.span)[0], len(self.indices))

        def per_row(value) -> np.ndarray:
            return np.broadcast_to(np.asarray(value, dtype=float)[..., 0], shape)

        envelope = np.minimum(per_row(demand.max_depth), per_row(demand.max_width))
        uncertain = (per_row(demand.min_side) > 0) | (
            per_row(demand.min_size) * (1.0 + RAISE_MARGIN) > envelope)
        return np.where(uncertain, np.inf, self.reshape(self.start.lightest) * self.per_kg)

    def size(self, rows: np.ndarray) -> None:
        """Refine, round and recheck the rows ``rows`` (not sized before; those whose grid
        is not exact are gridded again without a threshold first), in parts of at most as
        many rows as a grid block holds."""
        count = len(self.indices)
        pending = np.zeros(len(self.part), dtype=bool)
        pending[rows] = ~self.start.exact[rows]
        if pending.any():
            self._grid(self.reshape(pending), np.full(self.reshape(pending).shape, np.inf))
        size = max(1, BLOCK_ELEMENTS // grid_size(self.family))
        demand = self.demand.per_row(count)
        for first in range(0, len(rows), size):
            chosen = rows[first:first + size]
            self._record(chosen, size_started(self.family, self.start.take(chosen),
                                              self.values.take(chosen % count),
                                              demand.take(chosen)))

    def sized(self) -> np.ndarray:
        """Rows sized so far, (C, K)."""
        return self.reshape(self.part >= 0)

    def objective(self) -> np.ndarray:
        """The objective of every row's design, (C, K); ``inf`` where there is none (or the
        row was not sized)."""
        mass = np.full(len(self.part), np.inf)
        for rows, sized in self.parts:
            mass[rows] = sized.check.mass
        return np.where(self.feasible(), self.reshape(mass) * self.per_kg, np.inf)

    def design(self, case: int, position: int, material_id: str, demand: Demand) -> Design:
        """The design of material ``position`` in ``case`` (whose scalar demand is
        ``demand``)."""
        sized, row = self._locate(case, position)
        return make_design(self.family, int(self.indices[position]), material_id, row,
                           sized.dimensions, sized.check, sized.values, demand)

    def rejection(self, case: int, position: int, demand: Demand) -> Reason | None:
        """Why material ``position`` has no design in ``case`` and its shortfall; None when
        it has one."""
        sized, row = self._locate(case, position)
        return sized.rejection_reason(self.family, row, demand)
