"""The sizing engine: one way in for one request (POST /v1/designs) and for many (sweeps).

:func:`size_cases` sizes a list of requests; :func:`size_designs` is a batch of one case
through the same code, keeping every rejection. The method:

1. Requests that differ only in their numbers (:data:`DEMAND_FIELDS`: loads, limits,
   envelope) form a group, sized together: the group's :class:`Demand` carries a case axis
   (fields of shape (C, 1, 1)).
2. One family loop: in each family of the group, a material not made in the family's form is
   rejected, a family that does not carry the loading rejects the rest, and otherwise a run
   sizes them for every case: a catalogue run where the request lists members of the family
   (:mod:`service.core.sizing.catalog`), the sandwich run for sandwich panels
   (:mod:`service.core.sizing.sandwich`), else the self-similar run
   (:mod:`service.core.sizing.selfsimilar`); the last two first search a grid (the sandwich
   run of every row at once, the self-similar run of the rows asked for), then refine the
   rows asked for.
3. Only the best ``top`` designs of a case are kept, so rows that cannot be among them are
   not refined at all, nor gridded in full (:func:`_size_runs`, :meth:`FamilyRun.search`).
   When every rejection is asked for, the rows without a feasible grid point are refined
   too (a rejection needs its row sized, and the refinement may still find a design), and
   those whose manufacturing limits may still rule their grid design out; a row left out
   has a feasible grid point, hence a design, which is not among the best (unless its
   rounding to 0.001 mm failed, which only sizing it would tell: over 64 requests of the
   README's kind every rejection of full sizing was still found).
4. One ordering (:func:`best_designs`) and one rejection rule (:func:`actionable_first`).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Iterable, Iterator, Mapping, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Protocol

import numpy as np

from service.core import materials as materials_module
from service.core.materials.brittleness import brittle_reason
from service.core.materials.form_limits import form_limit_of
from service.core.materials.limits import failed_limits
from service.core.sections.base import SectionFamily
from service.core.sizing.catalog import size_catalog
from service.core.sizing.demand import Demand, demand_of
from service.core.sizing.fields import DEMAND_FIELDS
from service.core.sizing.manufacturing import limited_demand
from service.core.sizing.request import DesignRequest, carries, validate_request
from service.core.sizing.results import Design, DesignResult, Reason, Rejection
from service.core.sizing.rules import family_for
from service.core.sizing.sandwich import SANDWICH_FAMILY, SandwichRun
from service.core.sizing.selfsimilar import SelfSimilarRun
from service.core.sizing.values import MaterialValues
from service.core.sizing.walls import UNSOUND_FORMS, unsound_form

if TYPE_CHECKING:
    from service.core.materials import MaterialTable

NOT_MADE_IN_FORM = "not made in this form"
"""The reason given to a material that is not made in a family's form."""

GENERAL_SANDWICH = ("sandwich panels are sized for the shorthand load cases only (without "
                    "frequency, fatigue or diagrams)")
"""The reason a sandwich panel has no design for a general member."""

OPEN_SECTIONS = ("i_section", "solid_rectangle")
"""Open sections, whose lateral-torsional buckling can govern a bent member. Closed tubes
resist it through their torsional stiffness (common practice; within the proportion rules
the member check of the shorthand cases finds the square and round tubes ungoverned)."""

GENERAL_LATERAL = ("lateral-torsional buckling is not checked for a member whose support at "
                   "x = L leaves twist free (twist_free_at_right_end), so open sections are "
                   "left out while it is unbraced: set requirements.lateral_restraint to "
                   "\"continuous\" if a deck or skin holds the compression flange")
"""The reason an open section has no design for an unbraced general member in bending whose
far support does not restrain twist (the fork supports the lateral-torsional buckling check
assumes are not there)."""


def general_reason(request: DesignRequest, family_id: str) -> str | None:
    """Why ``family_id`` is not sized for a request sized in its general form (None when it
    is): sandwich panels never yet; open sections while unbraced in bending on supports
    that leave twist free at x = L (the safe default: the lateral-torsional buckling check
    of :mod:`service.core.sizing.member_stability` assumes twist held at both ends, or a
    cantilever's root)."""
    if not request.general:
        return None
    if family_id == SANDWICH_FAMILY:
        return GENERAL_SANDWICH
    if (family_id in OPEN_SECTIONS and request.lateral_restraint != "continuous"
            and "bending" in request.loadings and request.twist_free_at_right_end
            and request.supports != "cantilever"):
        return GENERAL_LATERAL
    return None


def size_designs(request: DesignRequest, materials: MaterialTable,
                 core_materials: MaterialTable | None = None) -> DesignResult:
    """The best design of every material in every requested section family.

    Args:
        request: what to size (validated here: raises InputError for an impossible request).
        materials: candidate materials (already filtered by the caller).
        core_materials: sandwich core candidates; None for the built-in foam family.

    Returns:
        Designs sorted by the request's objective (best first, cut to ``top``) and a rejection
        for every material and family without one (:func:`actionable_first` order). A request
        nothing can meet returns no designs and the reasons.
    """
    (result,) = size_cases([request], materials, core_materials, every_rejection=True)
    return result


def size_cases(requests: Sequence[DesignRequest], materials: MaterialTable,
               core_materials: MaterialTable | None = None, *, every_rejection: bool = False
               ) -> list[DesignResult]:
    """One result per request, in order (see the module doc).

    Args:
        requests: what to size (each validated: raises InputError for the first impossible
            one).
        materials: candidate materials.
        core_materials: sandwich core candidates; None for the built-in foam family.
        every_rejection: keep every rejection (and size every row that may have one to
            know it: each row but those whose grid design is certain and cannot be among
            the best ``top``); otherwise a result keeps only what a sweep row needs: its
            designs and, for a case without any, the first rejection of
            :func:`actionable_first`.

    Returns:
        Each request's designs, best first, cut to its ``top``, and its rejections.
    """
    groups: dict[object, list[int]] = {}
    for index, request in enumerate(requests):
        validate_request(request)
        groups.setdefault(_group_key(request, index), []).append(index)
    results: list[DesignResult] = [DesignResult((), ())] * len(requests)
    for indices in groups.values():
        group = [requests[i] for i in indices]
        sized = _size_group(group, materials, core_materials, every_rejection)
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


def best_designs(designs: Iterable[Design], request: DesignRequest) -> list[Design]:
    """Sorted by the request's objective (ties by material id, then family), cut to ``top``."""
    ordered = sorted(designs, key=lambda d: (d.objective_value(request.objective),
                                             d.material_id, d.family))
    return ordered if request.top is None else ordered[: request.top]


def actionable_first(rejections: Iterable[Rejection], count: int | None = None
                     ) -> list[Rejection]:
    """Rejections with a reason a designer can act on first, "not made in this form" last
    (each group keeps its order); with ``count``, the first ``count`` of them, reading no
    further than needed."""
    actionable: list[Rejection] = []
    not_made: list[Rejection] = []
    for rejection in rejections:
        (not_made if rejection.reason == NOT_MADE_IN_FORM else actionable).append(rejection)
        if count is not None and len(actionable) >= count:
            break
    return (actionable + not_made)[:count]


def closest_first(rejections: Iterable[Rejection], count: int | None = None
                  ) -> list[Rejection]:
    """Rejections by their shortfall, the material closest to a design first (ties in
    :func:`actionable_first` order); with ``count``, the first ``count`` of them."""
    ordered = sorted(actionable_first(rejections), key=lambda r: r.shortfall)
    return ordered[:count]


def screened_out(materials: MaterialTable, request: DesignRequest) -> np.ndarray:
    """True for the materials a request leaves out before sizing, shape (M,): those that
    fail one of its property limits, and the brittle ones unless it allows them (the safe
    default: a brittle member may break without warning)."""
    failing = np.array([reason is not None for reason in failed_limits(
        materials, request.property_limits, request.property_basis)], dtype=bool)
    if request.allow_brittle:
        return failing
    return failing | np.asarray(materials.brittle, dtype=bool)


def screening_reasons(materials: MaterialTable, request: DesignRequest,
                      screened: np.ndarray) -> dict[int, str]:
    """Why each screened material (:func:`screened_out`) is left out: the property limit it
    fails, else its brittleness."""
    limits = failed_limits(materials, request.property_limits, request.property_basis)
    return {int(index): limits[index] or brittle_rejection(materials, int(index))
            for index in np.flatnonzero(screened)}


def brittle_rejection(materials: MaterialTable, index: int) -> str:
    """The reason a brittle material is left out, and how to include it."""
    why = brittle_reason(float(materials.typical["elongation"][index]),
                         float(materials.typical["fracture_toughness"][index]),
                         materials.families[index])
    return f"{why}; left out by default: set requirements.allow_brittle to true to size it"


def made_in(materials: MaterialTable, family_id: str) -> np.ndarray:
    """True for the materials commonly made in the family's form, shape (M,)."""
    return np.array([family_id in forms for forms in materials.forms], dtype=bool)


def default_cores() -> MaterialTable:
    """The built-in foam family: sandwich cores when the request names none."""
    return materials_module.select(materials_module.load_builtin(), families=["foam"])


class FamilyRun(Protocol):
    """One family sized for every (case, material) row of a group (rows case-major over the
    K materials made in its form)."""

    @property
    def family(self) -> SectionFamily:
        """The section family."""

    @property
    def indices(self) -> np.ndarray:
        """The materials made in its form (rows of the engine's table), (K,)."""

    def search(self, bound) -> None:
        """Search (before sizing) the rows whose objective may be at most ``bound`` (C,):
        afterwards a row's :meth:`lower` is above ``bound`` or its :meth:`estimate` is what
        a search of every row gives, or above ``bound`` (``inf``: every row)."""

    def lower(self) -> np.ndarray:
        """No design of a row has an objective below this, (C, K)."""

    def estimate(self) -> np.ndarray:
        """An objective each row reaches (an estimate before sizing), (C, K)."""

    def size(self, rows: np.ndarray) -> None:
        """Size the case-major rows ``rows`` (not sized before)."""

    def sized(self) -> np.ndarray:
        """Rows sized so far, (C, K)."""

    def feasible(self) -> np.ndarray:
        """Rows with a design, (C, K)."""

    def objective(self) -> np.ndarray:
        """Each row's design's objective, (C, K); ``inf`` without one."""

    def design(self, case: int, position: int, material_id: str, demand: Demand) -> Design:
        """The design of a feasible row."""

    def rejection(self, case: int, position: int, demand: Demand) -> Reason | None:
        """Why a sized row has no design and its shortfall (None when it has one)."""


@dataclass(frozen=True)
class CaseByCaseRun:
    """A family sized case by case (catalogue members): every row is sized
    when the run is built, so its objective is its own bound and estimate.

    Attributes:
        family: the section family.
        indices: the materials made in its form, (K,).
        designs: per case, material position -> design.
        reasons: per case, material position -> why it has no design, and its shortfall.
        objective_name: the request's objective.
    """

    family: SectionFamily
    indices: np.ndarray
    designs: list[dict[int, Design]]
    reasons: list[dict[int, Reason]]
    objective_name: str

    @classmethod
    def of(cls, family: SectionFamily, indices: np.ndarray, demands: Sequence[Demand],
           objective: str,
           size_case: Callable[[Demand], tuple[list[Design], list[Rejection]]]
           ) -> CaseByCaseRun:
        """Run ``size_case`` (designs and rejections of the materials ``indices``) for each
        case's demand."""
        position = {int(index): k for k, index in enumerate(indices)}
        designs, reasons = [], []
        for demand in demands:
            found, lost = size_case(demand)
            designs.append({position[d.material_index]: d for d in found})
            reasons.append({position[r.material_index]: (r.reason, r.shortfall)
                            for r in lost})
        return cls(family, indices, designs, reasons, objective)

    def objective(self) -> np.ndarray:
        """Each row's design's objective, (C, K); ``inf`` without one."""
        values = np.full((len(self.designs), len(self.indices)), np.inf)
        for case, found in enumerate(self.designs):
            for position, design in found.items():
                values[case, position] = design.objective_value(self.objective_name)
        return values

    lower = estimate = objective

    def search(self, bound) -> None:
        """Nothing to do: every row was sized when the run was built."""

    def size(self, rows: np.ndarray) -> None:
        """Nothing to do: every row was sized when the run was built."""

    def sized(self) -> np.ndarray:
        """Every row: all were sized when the run was built, (C, K)."""
        return np.ones((len(self.designs), len(self.indices)), dtype=bool)

    def feasible(self) -> np.ndarray:
        """Rows with a design, (C, K)."""
        feasible = np.zeros((len(self.designs), len(self.indices)), dtype=bool)
        for case, found in enumerate(self.designs):
            feasible[case, list(found)] = True
        return feasible

    def design(self, case: int, position: int, material_id: str, demand: Demand) -> Design:
        """The design of a feasible row."""
        return self.designs[case][position]

    def rejection(self, case: int, position: int, demand: Demand) -> Reason | None:
        """Why a row has no design and its shortfall (None when it has one)."""
        return self.reasons[case].get(position)


@dataclass(frozen=True)
class _Family:
    """One family of a group: the materials made in its form (not screened out) and the run
    that sized them (None when it does not carry the loading or no material is left); the
    materials screened out, request-wide or in this form only (its walls have no sound
    formula for them: ``walls.UNSOUND_FORMS``), with the reason of each."""

    family: SectionFamily
    made: np.ndarray
    run: FamilyRun | None
    screened: np.ndarray
    reasons: Mapping[int, str]


def _group_key(request: DesignRequest, index: int) -> object:
    """Requests with equal keys differ only in :data:`DEMAND_FIELDS`; a catalogue request is
    a group of its own (its members are not hashable)."""
    if request.catalog:
        return ("catalog", index)
    numbers: dict[str, Any] = dict.fromkeys(DEMAND_FIELDS)
    return request.general, dataclasses.replace(request, **numbers)


def _size_group(requests: list[DesignRequest], materials: MaterialTable,
                core_materials: MaterialTable | None, every_rejection: bool
                ) -> list[DesignResult]:
    """Results of requests that differ only in :data:`DEMAND_FIELDS` (see the module doc)."""
    first = requests[0]
    values = MaterialValues.from_table(materials, first.property_basis)
    demands = [demand_of(request) for request in requests]
    stacked = Demand.stack(demands)
    loadings = first.loadings
    screened = screened_out(materials, first)
    why = screening_reasons(materials, first, screened)
    families = []
    for family_id in first.families:
        family = family_for(family_id, first.proportions)
        in_form = made_in(materials, family_id)
        unsound = unsound_form(family_id, values) & ~screened
        left_out = screened | unsound
        made = in_form & ~left_out
        indices = np.flatnonzero(made)
        run = None
        if carries(family, loadings) and general_reason(first, family.id) is None \
                and len(indices):
            run = _run(family, indices, values, materials, core_materials, first, demands,
                       stacked)
        families.append(_Family(family, made, run, in_form & left_out, {
            **why, **{int(index): UNSOUND_FORMS[family_id]
                      for index in np.flatnonzero(unsound)}}))
    runs = [f.run for f in families if f.run is not None]
    _size_runs(runs, first.top, every_rejection)
    feasible = [run.feasible() for run in runs]
    objective = np.concatenate([run.objective() for run in runs] or [np.zeros((len(requests),
                                                                                0))], axis=1)
    cutoff = (np.full(len(requests), np.inf) if first.top is None
              else _nth_smallest(objective, first.top))
    results = []
    for case, (request, demand) in enumerate(zip(requests, demands, strict=True)):
        found: list[Design] = []
        start = 0
        for run, can in zip(runs, feasible, strict=True):
            stop = start + len(run.indices)
            candidates = can[case] & ~(objective[case, start:stop] > cutoff[case])
            found.extend(run.design(case, int(k), materials.ids[run.indices[k]],
                                    _material_demand(demand, run, int(k), materials))
                         for k in np.flatnonzero(candidates))
            start = stop
        designs = best_designs(found, request)
        rejections = _rejections(families, case, materials, demand, loadings, first)
        if every_rejection:
            rejected = actionable_first(rejections)
        else:
            rejected = [] if designs else closest_first(rejections, 1)
        results.append(DesignResult(tuple(designs), tuple(rejected)))
    return results


def _run(family: SectionFamily, indices: np.ndarray, values: MaterialValues,
         materials: MaterialTable, core_materials: MaterialTable | None, request: DesignRequest,
         demands: list[Demand], stacked: Demand) -> FamilyRun:
    """The run that sizes ``family`` for the materials ``indices`` of every case, each
    under its manufacturing limits in the family's form."""
    limits = [form_limit_of(materials, int(index), family.id) for index in indices]
    # per material: fields (K, 1) for a run case by case, (C, K, 1) for the stacked cases
    demands = [limited_demand(demand, family, limits) for demand in demands]
    stacked = limited_demand(stacked, family, limits)
    members = [m for m in request.catalog if m.family == family.id]
    if members:
        return CaseByCaseRun.of(family, indices, demands, request.objective, lambda demand:
                                size_catalog(family, members, indices, values, materials,
                                             demand))
    if family.id == SANDWICH_FAMILY:
        cores = core_materials if core_materials is not None else default_cores()
        return SandwichRun.begin(family, indices, values, cores, stacked, request.objective,
                                 request.property_basis)
    return SelfSimilarRun.begin(family, indices, values, stacked, request.objective)


def _material_demand(demand: Demand, run: FamilyRun, position: int,
                     materials: MaterialTable) -> Demand:
    """The case's scalar ``demand`` for material ``position`` of ``run``, with its
    manufacturing limit in the run's form."""
    index = int(run.indices[position])
    return limited_demand(demand, run.family, [form_limit_of(materials, index, run.family.id)])


def _size_runs(runs: list[FamilyRun], top: int | None, every_rejection: bool = False
               ) -> None:
    """Size the rows that can be among their case's ``top`` best (every row without a top),
    and with ``every_rejection`` also those without a feasible grid point (whose rejection,
    or design, only their sizing tells).

    A row whose objective cannot get below the ``top``-th best of its case (its
    :meth:`FamilyRun.lower` is above it) is left out: first against the estimates, then,
    once the rest are sized, against the designs themselves, sizing any row that the
    estimates left out wrongly. The runs are searched one after the other, each up to the
    ``top``-th best estimate of those before it (:meth:`FamilyRun.search`): that bound is
    at least the ``top``-th best of every run's, and a row left out of the search has a
    bound, hence an estimate, above it, so the estimates' ``top``-th best is that of a
    search of every row, and so is every row sized.
    """
    if top is None:
        for run in runs:
            run.search(np.inf)
            run.size(np.flatnonzero(~run.sized().reshape(-1)))
        return
    if not runs:
        return
    bound: np.ndarray | float = np.inf
    for searched, run in enumerate(runs, start=1):
        run.search(np.inf if every_rejection else bound)
        bound = _nth_smallest(np.concatenate([r.estimate() for r in runs[:searched]],
                                             axis=1), top)
    for estimate in (lambda run: run.estimate(), lambda run: run.objective()):
        bound = _nth_smallest(np.concatenate([estimate(run) for run in runs], axis=1), top)
        for run in runs:
            run.search(bound)
            wanted = ~(run.lower() > bound[:, None])
            if every_rejection:
                wanted |= ~np.isfinite(run.estimate())
            run.size(np.flatnonzero((wanted & ~run.sized()).reshape(-1)))


def _nth_smallest(values: np.ndarray, n: int) -> np.ndarray:
    """The ``n``-th smallest of each row of (C, N), NaN counting as ``inf``; ``inf`` where a
    row has fewer than ``n`` values."""
    if n > values.shape[1]:
        return np.full(values.shape[0], np.inf)
    finite = np.where(np.isnan(values), np.inf, values)
    return np.partition(finite, n - 1, axis=1)[:, n - 1]


def _rejections(families: list[_Family], case: int, materials: MaterialTable, demand: Demand,
                loadings: tuple[str, ...], request: DesignRequest) -> Iterator[Rejection]:
    """Every rejection of ``case``, family by family (each: materials not made in its form,
    then the others in table order), computed as they are read."""
    ids = materials.ids
    for entry in families:
        family_id = entry.family.id
        for left_out in np.flatnonzero(entry.screened).tolist():
            yield Rejection(left_out, ids[left_out], family_id, entry.reasons[left_out])
        for missing in np.flatnonzero(~(entry.made | entry.screened)).tolist():
            yield Rejection(missing, ids[missing], family_id, NOT_MADE_IN_FORM)
        indices = np.flatnonzero(entry.made).tolist()
        unsized = (f"this section family does not carry {' and '.join(loadings)}"
                   if not carries(entry.family, loadings) else general_reason(request, family_id))
        if unsized is not None:
            for made in indices:
                yield Rejection(made, ids[made], family_id, unsized)
            continue
        run = entry.run
        if run is None:
            continue
        # a row not sized has a design that is not among the best (see _size_runs)
        for position in np.flatnonzero(~run.feasible()[case] & run.sized()[case]).tolist():
            index = int(run.indices[position])
            reason, shortfall = run.rejection(
                case, position, _material_demand(demand, run, position, materials)
            ) or ("", math.inf)
            yield Rejection(index, ids[index], family_id, reason, shortfall)
