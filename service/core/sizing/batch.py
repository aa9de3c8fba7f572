"""Sizing many requests at once (sweeps): the designs of one :func:`size_designs` each, batched.

Requests that differ only in their numbers (:data:`DEMAND_FIELDS`: loads, limits, envelope)
form a group. A group's self-similar families are sized together, a block of cases at a time
(memory stays bounded whatever the number of cases): the demand carries a case axis
(:class:`Demand` fields of shape (C, 1, 1)), the proportion grid runs over (cases, materials,
grid points) at once, and from there every (case, material) pair is a row of its own (see
:mod:`service.core.sizing.proportions`). Every row's search, rounding and recheck depends on
its own inputs alone, so each case gets exactly the designs :func:`size_designs` gives it
alone. A sweep keeps only each case's ``top`` best, so rows that cannot be among them
are not refined at all (:data:`PRUNE_MARGIN`; every row still gets the first grid). The
best ``top`` per case are picked from the arrays, and only those become :class:`Design`
objects. Sandwich panels are sized case by case (their search also runs over
core materials), and requests with a catalogue go through :func:`size_designs` whole.

A result keeps only what a sweep row needs: its designs and, for a case without any, the one
rejection :func:`service.core.sweeps.infeasible_reason` reports (the first that is not
"not made in this form", else the first).
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from service.core.sections import FAMILIES
from service.core.sizing.designs import (
    NOT_MADE_IN_FORM,
    actionable_first,
    best_designs,
    made_in,
    size_designs,
    size_in_family,
)
from service.core.sizing.engine import FamilySizing, make_design, size_started
from service.core.sizing.proportions import GRID_POINTS, GridStart, grid_starts
from service.core.sizing.request import DesignRequest, validate_request
from service.core.sizing.results import Design, DesignResult, Rejection
from service.core.sizing.sandwich import SANDWICH_FAMILY
from service.core.sizing.scale import DEMAND_VALUES, Demand
from service.core.sizing.values import MaterialValues, demand_of

if TYPE_CHECKING:
    from service.core.materials import MaterialTable
    from service.core.sections.base import SectionFamily

DEMAND_FIELDS = ("span", "load", "torque", "max_deflection", "max_twist", "safety_factor",
                 "max_depth", "max_width", "min_wall")
"""The :class:`DesignRequest` fields that may differ within a group sized together."""

PRUNE_MARGIN = 0.5
"""No design of a row is lighter than this fraction of the lightest grid point's mass when
the envelope and self-weight are ignored (:attr:`GridStart.floor_mass`). Self-weight only
adds mass, and without it every bound is a smooth power law of the proportions, so the grid
can only overestimate the lightest point by what lies between its points. Measured: the
worst ratio of design mass to that grid mass was 0.69 (a rectangular tube whose
min_wall-governed wall sits between grid points at the half-width limit), over about
110,000 feasible rows of 900 random requests of every kind, half of the bending ones with
self-weight; tests/core/test_sizing_batch.py keeps checking it on random requests. A row
whose bound is above its case's ``top``-th best objective cannot be among the designs a
sweep keeps, so it is not refined (see :func:`_size_started`)."""

BLOCK_ELEMENTS = 1 << 19
"""Cases x materials x first-grid points per block: 4 MB per grid array. A chunk of 256 cases
of every built-in material then peaks near 60 MB of arrays (tests/benchmarks); larger
blocks are no faster."""


def size_cases(
    requests: Sequence[DesignRequest],
    materials: MaterialTable,
    core_materials: MaterialTable | None = None,
) -> list[DesignResult]:
    """One result per request, in order: the designs :func:`size_designs` gives (best first,
    cut to ``top``) and the rejection that explains a case without any (see the module doc).

    Raises InputError for the first impossible request, like :func:`size_designs`.
    """
    groups: dict[object, list[int]] = {}
    for index, request in enumerate(requests):
        validate_request(request)
        groups.setdefault(_group_key(request, index), []).append(index)
    results: list[DesignResult | None] = [None] * len(requests)
    for indices in groups.values():
        group = [requests[i] for i in indices]
        if group[0].catalog:
            sized = [_for_sweep(size_designs(r, materials, core_materials)) for r in group]
        else:
            sized = _size_group(group, materials, core_materials)
        for index, result in zip(indices, sized, strict=True):
            results[index] = result
    return results


@dataclass(frozen=True)
class CaseSizer:
    """:func:`size_cases` bound to its material tables, as a sweep's ``size_batch``; it
    pickles (the tables travel as their fields), so worker processes can run it."""

    materials: MaterialTable
    core_materials: MaterialTable | None = None

    def __call__(self, requests: Sequence[DesignRequest]) -> list[DesignResult]:
        return size_cases(requests, self.materials, self.core_materials)

    def __reduce__(self):
        tables = (self.materials, self.core_materials)
        return _rebuild_sizer, tuple(None if t is None else _table_fields(t) for t in tables)


def _table_fields(table: MaterialTable) -> dict:
    return {f.name: dict(value) if isinstance(value := getattr(table, f.name), Mapping)
            else value for f in dataclasses.fields(table)}


def _rebuild_sizer(materials: dict, core_materials: dict | None) -> CaseSizer:
    from service.core.materials import MaterialTable

    return CaseSizer(MaterialTable(**materials),
                     None if core_materials is None else MaterialTable(**core_materials))


def _group_key(request: DesignRequest, index: int) -> object:
    """Requests with equal keys differ only in :data:`DEMAND_FIELDS`; a catalogue request is
    a group of its own."""
    if request.catalog:
        return ("catalog", index)
    return dataclasses.replace(request, **dict.fromkeys(DEMAND_FIELDS))


def _for_sweep(result: DesignResult) -> DesignResult:
    """The designs, and the rejection that explains a result without any."""
    if result.designs:
        return DesignResult(result.designs, ())
    return DesignResult((), tuple(actionable_first(result.rejected)[:1]))


@dataclass(frozen=True)
class _Started:
    """One self-similar family after the first grid, for every (case, material) row of a
    group: rows are case-major, row = c K + k over the K materials made in its form."""

    family: SectionFamily
    indices: np.ndarray
    values: MaterialValues
    start: GridStart
    per_kg: np.ndarray

    @property
    def rows(self) -> int:
        """C K."""
        return len(self.start.unconstrained_mass)

    def reshape(self, array: np.ndarray) -> np.ndarray:
        """A per-row array as (C, K)."""
        return array.reshape(-1, len(self.indices))

    @property
    def lower(self) -> np.ndarray:
        """No design of a row has an objective below this, (C, K) (see :data:`PRUNE_MARGIN`)."""
        return self.reshape(PRUNE_MARGIN * self.start.floor_mass) * self.per_kg

    @property
    def estimate(self) -> np.ndarray:
        """The objective of each row's lightest feasible grid point, (C, K); ``inf`` where
        none is feasible."""
        return self.reshape(self.start.lightest) * self.per_kg


@dataclass(frozen=True)
class _Batched:
    """One self-similar family sized for every case of a group.

    Attributes:
        family: the section family.
        indices: the materials made in its form, (K,); rows are case-major, row = c K + k.
        parts: the sized parts of the rows (each a set of rows sized together).
        part: the part that sized each row, (C K,); -1 for a row left out because it cannot
            be among its case's best (see :data:`PRUNE_MARGIN`).
        local: each row's place in its part, (C K,).
        feasible: rows with a design, (C, K).
        objective: the objective value of every row, (C, K); ``inf`` where there is no design
            (or the row was left out).
    """

    family: SectionFamily
    indices: np.ndarray
    parts: list[FamilySizing]
    part: np.ndarray
    local: np.ndarray
    feasible: np.ndarray
    objective: np.ndarray

    def locate(self, case: int, position: int) -> tuple[FamilySizing, int]:
        """The part that sized material ``position`` of ``case``, and its row there."""
        row = case * len(self.indices) + position
        if self.part[row] < 0:
            raise LookupError(f"row {row} of {self.family.id} was not sized")
        return self.parts[self.part[row]], int(self.local[row])


@dataclass(frozen=True)
class _PerCase:
    """A family sized case by case: each case's designs and rejections."""

    designs: list[list[Design]]
    rejected: list[list[Rejection]]


def _size_group(requests: list[DesignRequest], materials: MaterialTable,
                core_materials: MaterialTable | None) -> list[DesignResult]:
    """Results of requests that differ only in :data:`DEMAND_FIELDS` (see the module doc)."""
    first = requests[0]
    values = MaterialValues.from_table(materials, first.property_basis)
    demands = [demand_of(request) for request in requests]
    stacked = dataclasses.replace(demands[0], **{
        name: np.array([getattr(d, name) for d in demands], dtype=float)[:, None, None]
        for name in DEMAND_VALUES})
    fallback: Rejection | None = None          # the first "not made in this form"
    outcomes: list[_Started | _PerCase] = []
    for family_id in first.families:
        family = FAMILIES[family_id]
        made = made_in(materials, family_id)
        if fallback is None and not made.all():
            missing = int(np.argmin(made))
            fallback = Rejection(missing, materials.ids[missing], family_id, NOT_MADE_IN_FORM)
        if first.case.loading in family.loadings and family_id != SANDWICH_FAMILY:
            indices = np.flatnonzero(made)
            if len(indices):
                outcomes.append(_start(family, indices, values, stacked, first.objective))
            continue
        per_case = [size_in_family(request, family_id, values, materials, core_materials,
                                   demand) for request, demand in zip(requests, demands,
                                                                      strict=True)]
        outcomes.append(_PerCase([found for found, _ in per_case],
                                 [[r for r in lost if r.reason != NOT_MADE_IN_FORM]
                                  for _, lost in per_case]))
    started = [o for o in outcomes if isinstance(o, _Started)]
    batched = dict(zip(map(id, started), _size_started(started, stacked, first), strict=True))
    outcomes = [batched.get(id(o), o) for o in outcomes]
    picks = _top_rows([o for o in outcomes if isinstance(o, _Batched)], materials,
                      len(requests), first.top)
    results = []
    for case, (request, demand) in enumerate(zip(requests, demands, strict=True)):
        designs = [_design(batched, case, k, materials, demand) for batched, k in picks[case]]
        designs.extend(d for o in outcomes if isinstance(o, _PerCase) for d in o.designs[case])
        designs = best_designs(designs, request)
        if designs:
            results.append(DesignResult(tuple(designs), ()))
            continue
        reason = next((r for r in (_first_rejection(o, case, materials, demand)
                                   for o in outcomes) if r is not None), fallback)
        results.append(DesignResult((), () if reason is None else (reason,)))
    return results


def _start(family: SectionFamily, indices: np.ndarray, values: MaterialValues, demand: Demand,
           objective: str) -> _Started:
    """The first grid of ``family`` for every (case, material) row, a block of cases at a
    time (the grid's arrays are the large ones)."""
    cases, count = len(demand.span), len(indices)
    block_cases = max(1, BLOCK_ELEMENTS // (_grid_size(family) * count))
    made = values.take(indices)
    blocks = [grid_starts(family, made, demand.take(slice(start, start + block_cases)))
              for start in range(0, cases, block_cases)]
    start = GridStart((cases, count), *(np.concatenate([getattr(b, name) for b in blocks])
                                        for name in ("points", "unconstrained_mass",
                                                     "lightest", "floor_mass")))
    per_kg = np.ones(count) if objective == "mass" else getattr(made, _PER_KG[objective])
    return _Started(family, indices, made, start, per_kg)


def _size_started(started: list[_Started], demand: Demand, request: DesignRequest
                  ) -> list[_Batched]:
    """Refine, round and recheck the rows that can be among their case's ``top`` best.

    With a ``top``, a row whose objective cannot get below the ``top``-th best of its case
    (its :attr:`_Started.lower` is above it) is left out: first against the grid's
    estimate, then, once the rest are sized, against the designs themselves, sizing any row
    that estimate left out wrongly. With self-weight the bound is the one without it
    (:attr:`GridStart.floor_mass`): self-weight can shrink a feasible region below the
    grid's spacing, but it only ever adds mass.
    """
    if request.top is None:
        return [_batched(b, _size_chosen(b, np.arange(b.rows), demand)) for b in started]
    if not started:
        return []
    bound = _nth_smallest(np.concatenate([b.estimate for b in started], axis=1), request.top)
    chosen = [~(b.lower > bound[:, None]).reshape(-1) for b in started]
    sized = [_size_chosen(b, np.flatnonzero(rows), demand)
             for b, rows in zip(started, chosen, strict=True)]
    objective = [_objective(b, parts)[1] for b, parts in zip(started, sized, strict=True)]
    bound = _nth_smallest(np.concatenate(objective, axis=1), request.top)
    for b, rows, parts in zip(started, chosen, sized, strict=True):
        missed = np.flatnonzero(~rows & ~(b.lower > bound[:, None]).reshape(-1))
        if len(missed):
            parts.extend(_size_chosen(b, missed, demand))
    return [_batched(b, parts) for b, parts in zip(started, sized, strict=True)]


def _grid_size(family: SectionFamily) -> int:
    """Points of the family's first grid."""
    return GRID_POINTS.get(len(family.ratio_bounds), 1) ** len(family.ratio_bounds)


def _size_chosen(started: _Started, rows: np.ndarray, demand: Demand
                 ) -> list[tuple[np.ndarray, FamilySizing]]:
    """The rows ``rows`` of ``started`` sized, in parts of at most as many rows as a grid
    block holds."""
    size = max(1, BLOCK_ELEMENTS // _grid_size(started.family))
    count = len(started.indices)
    demand = demand.per_row(count)
    return [(part, size_started(started.family, started.start.take(part),
                                started.values.take(part % count), demand.take(part)))
            for part in (rows[i:i + size] for i in range(0, len(rows), size))]


def _objective(started: _Started, parts: list[tuple[np.ndarray, FamilySizing]]
               ) -> tuple[np.ndarray, np.ndarray]:
    """Which rows have a design, and the objective of each row's design, (C, K) each; the
    objective is ``inf`` where there is none (or the row was not sized)."""
    feasible = np.zeros(started.rows, dtype=bool)
    mass = np.full(feasible.shape, np.inf)
    for rows, sized in parts:
        feasible[rows], mass[rows] = sized.feasible, sized.check.mass
    feasible = started.reshape(feasible)
    return feasible, np.where(feasible, started.reshape(mass) * started.per_kg, np.inf)


def _batched(started: _Started, parts: list[tuple[np.ndarray, FamilySizing]]) -> _Batched:
    part, local = np.full(started.rows, -1), np.zeros(started.rows, dtype=int)
    for number, (chosen, _) in enumerate(parts):
        part[chosen], local[chosen] = number, np.arange(len(chosen))
    return _Batched(started.family, started.indices, [sized for _, sized in parts], part,
                    local, *_objective(started, parts))


def _nth_smallest(values: np.ndarray, n: int) -> np.ndarray:
    """The ``n``-th smallest of each row of (C, N), NaN counting as ``inf``; ``inf`` where a
    row has fewer than ``n`` values."""
    if n > values.shape[1]:
        return np.full(values.shape[0], np.inf)
    finite = np.where(np.isnan(values), np.inf, values)
    return np.partition(finite, n - 1, axis=1)[:, n - 1]


_PER_KG = {"cost": "price", "carbon": "embodied_carbon"}
"""The material value that turns a mass into each objective (Design.cost, Design.carbon)."""


def _top_rows(batched: list[_Batched], materials: MaterialTable, cases: int, top: int | None
              ) -> list[list[tuple[_Batched, int]]]:
    """Per case, the best ``top`` (family, material position) with a design, best first, in
    :func:`best_designs` order (objective, then material id, then family)."""
    if not batched:
        return [[] for _ in range(cases)]
    material_rank = {m: r for r, m in enumerate(sorted(set(materials.ids)))}
    family_rank = {f: r for r, f in enumerate(sorted(b.family.id for b in batched))}
    objective = np.concatenate([b.objective for b in batched], axis=1)          # (C, N)
    owner = np.concatenate([np.full(len(b.indices), j) for j, b in enumerate(batched)])
    position = np.concatenate([np.arange(len(b.indices)) for b in batched])
    by_material = np.concatenate([[material_rank[materials.ids[i]] for i in b.indices]
                                  for b in batched])
    by_family = np.concatenate([np.full(len(b.indices), family_rank[b.family.id])
                                for b in batched])
    # lexsort is stable and sorts by its last key first: objective, material id, family, then
    # the order size_designs builds its list in (family, then material).
    order = np.lexsort(np.broadcast_arrays(by_family, by_material, objective), axis=-1)
    keep = order.shape[1] if top is None else min(top, order.shape[1])
    best = order[:, :keep]
    found = np.take_along_axis(np.concatenate([b.feasible for b in batched], axis=1), best,
                               axis=1)
    return [[(batched[owner[n]], int(position[n])) for n in best[c][found[c]]]
            for c in range(cases)]


def _design(batched: _Batched, case: int, position: int, materials: MaterialTable,
            demand: Demand) -> Design:
    sized, row = batched.locate(case, position)
    index = int(batched.indices[position])
    return make_design(batched.family, index, materials.ids[index], row, sized.dimensions,
                       sized.check, sized.values, demand, str(sized.governing[row]))


def _first_rejection(outcome: _Batched | _PerCase, case: int, materials: MaterialTable,
                     demand: Demand) -> Rejection | None:
    """The family's first rejection of ``case`` other than "not made in this form"."""
    if isinstance(outcome, _PerCase):
        return outcome.rejected[case][0] if outcome.rejected[case] else None
    missing = np.flatnonzero(~outcome.feasible[case])
    if not len(missing):
        return None
    sized, row = outcome.locate(case, int(missing[0]))
    index = int(outcome.indices[missing[0]])
    return Rejection(index, materials.ids[index], outcome.family.id,
                     sized.rejection_reason(outcome.family, row, demand))
