"""The use cases of the HTTP API and the command line: size a design request, run a sweep,
rank materials.

POST /v1/designs, POST /v1/sweeps, POST /v1/rankings and ``formwise design | sweep`` call
these, so that a
request means the same thing wherever it comes from. A body here is already loaded by its
schema (units converted to SI); the response bodies are built next to their schemas
(service/api/<resource>/schemas.py).
"""

from __future__ import annotations

import dataclasses
import threading
from collections.abc import Iterator, Mapping
from dataclasses import dataclass

import numpy as np

from service.api.materials.schemas import select_materials, with_custom_materials
from service.core.errors import InputError
from service.core.indices import Ranking, RankingRequest, rank, ranked_families
from service.core.materials import CORE_FAMILY, MaterialTable
from service.core.materials.limits import PropertyLimit, failed_limits
from service.core.sizing import CaseSizer, DesignRequest, DesignResult
from service.core.sizing.catalog import catalog_members
from service.core.sizing.fields import at_contract_paths, request_values
from service.core.sizing.pareto import pareto_front
from service.core.sizing.results import Design
from service.core.sizing.rules import overrides_from
from service.core.sizing.split import FamilySplit, family_split
from service.core.sizing.warnings import design_warnings
from service.core.sweeps import Sweep, build_sweep, sweep_rows


@dataclass(frozen=True)
class DesignInputs:
    """What the sizing core needs for one request.

    Attributes:
        request: the sizing request, SI.
        materials: candidate materials (built-in plus custom, filtered).
        cores: sandwich core candidates.
    """

    request: DesignRequest
    materials: MaterialTable
    cores: MaterialTable
    pareto: tuple[str, str] | None = None


def design_inputs(body: Mapping, builtin: MaterialTable) -> DesignInputs:
    """Translate a body loaded by DesignRequestSchema; raises InputError at request paths."""
    table = select_materials(
        with_custom_materials(builtin, body.get("custom_materials")), body.get("materials")
    )
    cores = select_materials(
        builtin, body.get("core_materials") or {"families": [CORE_FAMILY]}, field="core_materials"
    )
    sections = body.get("sections")
    limits = (body.get("requirements") or {}).get("property_limits") or {}
    request = DesignRequest(
        **request_values(body),
        property_limits=tuple(PropertyLimit(prop, bounds.get("min"), bounds.get("max"))
                              for prop, bounds in limits.items()),
        sections=None if sections is None else tuple(sections),
        top=body.get("top"),
        catalog=catalog_members(body.get("catalog")),
        proportions=overrides_from(body.get("proportions")),
        actions=tuple((body.get("load_case") or {}).get("actions") or ()),
    )
    pareto = body.get("pareto")
    return DesignInputs(request, table, cores, None if pareto is None else tuple(pareto))


@dataclass(frozen=True)
class DesignAnswer:
    """A sizing result, when asked for its Pareto front over every design, and the warnings
    of the answer (:func:`~service.core.sizing.warnings.design_warnings`)."""

    result: DesignResult
    pareto: tuple[Design, ...] | None
    warnings: tuple[str, ...] = ()


SIZING_ONE_AT_A_TIME = threading.Lock()
"""Design requests are sized one at a time in each process. The threads of one gunicorn
worker share the GIL, and sizing is many small numpy calls that hold it, so requests
sized side by side take as long in total as one after another, plus the cost of switching
between them; one at a time, each finishes as soon as it can, and the worker's other
threads (health checks, streamed sweeps, whose sizing runs in worker processes) go on."""


def answer(inputs: DesignInputs, workers: int = 1) -> DesignAnswer:
    """Size the request (one at a time per process: :data:`SIZING_ONE_AT_A_TIME`), its
    section families in ``workers`` shares side by side (:mod:`service.core.sizing.split`);
    the Pareto front is taken over all designs, before ``top`` cuts. Raises InputError at
    the request's contract paths."""
    try:
        with SIZING_ONE_AT_A_TIME:
            found = _answer(inputs, family_split(workers))
    except InputError as error:
        raise at_contract_paths(error) from None
    warnings = design_warnings(inputs.request, found.result.designs, inputs.materials.brittle)
    return dataclasses.replace(found, warnings=tuple(warnings))


def _answer(inputs: DesignInputs, size: FamilySplit) -> DesignAnswer:
    if inputs.pareto is None:
        return DesignAnswer(size(inputs.request, inputs.materials, inputs.cores), None)
    full = size(dataclasses.replace(inputs.request, top=None), inputs.materials, inputs.cores)
    front = pareto_front(full.designs, inputs.pareto)
    top = inputs.request.top
    kept = full.designs if top is None else full.designs[:top]
    return DesignAnswer(DesignResult(kept, full.rejected), front)


@dataclass(frozen=True)
class SweepInputs:
    """A validated sweep and the material tables its cases are sized with.

    Attributes:
        design: the base request's inputs (its materials and cores serve every case).
        sweep: the expanded, validated sweep.
    """

    design: DesignInputs
    sweep: Sweep

    def sizer(self) -> CaseSizer:
        """Sizes a chunk of the sweep's cases (it pickles, for worker processes)."""
        return CaseSizer(self.design.materials, self.design.cores)

    def rows(self, workers: int = 1) -> Iterator[list[object]]:
        """The sweep table's rows, chunk by chunk as they are computed."""
        return sweep_rows(self.sweep, self.sizer(), workers=workers)


def sweep_inputs(body: Mapping, builtin: MaterialTable, max_cases: int) -> SweepInputs:
    """Translate a body loaded by SweepRequestSchema and expand its cases; raises InputError
    at request paths (a case's error under ``grid`` or ``cases``, any other under ``base``)."""
    design = design_inputs(body["base"], builtin)
    sweep = build_sweep(design.request, grid=body.get("grid"), cases=body.get("cases"),
                        top=body["top"], max_cases=max_cases)
    return SweepInputs(design, sweep)


@dataclass(frozen=True)
class RankingAnswer:
    """A ranking and the materials screened out before it.

    Attributes:
        ranking: the core's ranking of the materials kept.
        table: the materials kept (the rows of the ranking's ``material_index``).
        selected: the materials the request selected, before screening.
        brittle: rows of ``selected`` left out as brittle.
        failing: rows of ``selected`` left out by a property limit.
        failed: per row of ``selected``, the property limit it fails (None: none).
        families: the section families ranked.
    """

    ranking: Ranking
    table: MaterialTable
    selected: MaterialTable
    brittle: np.ndarray
    failing: np.ndarray
    failed: list[str | None]
    families: set[str]


def rank_materials(body: Mapping, builtin: MaterialTable) -> RankingAnswer:
    """Rank the materials a body loaded by RankingRequestSchema selects, leaving out the
    brittle ones (unless it allows them) and those that fail its property limits; raises
    InputError at request paths (``materials`` when none is left)."""
    selected = select_materials(
        with_custom_materials(builtin, body.get("custom_materials")), body.get("materials"))
    limits = tuple(PropertyLimit(prop, bounds.get("min"), bounds.get("max"))
                   for prop, bounds in (body.get("property_limits") or {}).items())
    failed = failed_limits(selected, limits, body["property_basis"], "property_limits")
    failing = np.array([reason is not None for reason in failed], dtype=bool)
    brittle = selected.brittle & (not body["allow_brittle"]) & ~failing
    if (brittle | failing).all():
        raise InputError.single(
            "materials", "every selected material is brittle or fails property_limits; "
            "set allow_brittle to true or widen the limits to rank them")
    table = selected.take(~(brittle | failing))
    sections = body.get("sections")
    ranking = rank(
        RankingRequest(
            loading=body["loading"],
            limit=body["limit"],
            objective=body["objective"],
            sections=None if sections is None else tuple(sections),
            proportions=body.get("proportions", {}),
            custom_index=body.get("custom_index"),
            property_basis=body["property_basis"],
            top=body.get("top"),
            chart=body["chart"],
        ),
        table,
    )
    families = set(ranked_families(body["loading"]) if sections is None else sections)
    return RankingAnswer(ranking, table, selected, np.flatnonzero(brittle),
                         np.flatnonzero(failing), failed, families)
