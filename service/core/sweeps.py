"""Design-space sweeps: many variations of one design request, as one table.

A sweep is a base :class:`~service.core.sizing.DesignRequest` plus cases, each case a mapping
from a contract path (``"load_case.span"``, one of
:data:`~service.core.sizing.fields.SWEEPABLE_PATHS`) to an SI value. The cases come from a
grid (the cartesian product of value lists) or an explicit list. Sizing runs over chunks of
cases, and the result is a table with the columns of :func:`sweep_columns`, one row per case
and rank.
"""

from __future__ import annotations

import dataclasses
import itertools
import math
import multiprocessing
from collections import deque
from collections.abc import Callable, Iterable, Iterator, Mapping, Sequence
from concurrent.futures import Future, ProcessPoolExecutor, ThreadPoolExecutor
from dataclasses import dataclass
from typing import Any

from service.core.errors import InputError
from service.core.materials.vocabulary import PRICE_CURRENCY
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, DesignResult, validate_request
from service.core.sizing.engine import closest_first
from service.core.sizing.fields import SWEEPABLE_PATHS, action_path, at_contract_paths
from service.core.sizing.limits import UTILIZATION_KEYS
from service.core.sizing.results import REPORTED_DIGITS

RESULT_COLUMNS = ("rank", "material_id", "family", "mass", "cost", "carbon", "governing")
"""The contract's result columns, after ``case`` and the varied paths."""

UTILIZATION_COLUMNS = tuple(f"utilization.{name}" for name in UTILIZATION_KEYS)
"""One column per check and limit of a design's ``utilization``."""

DETAIL_COLUMNS = ("core_material_id", "designation", "deflection", "twist", "max_stress",
                  *UTILIZATION_COLUMNS, "reason")
"""The columns after the dimensions: what a script needs to rebuild or judge a design, and
why a case has none. They come last so that every earlier column keeps its position."""


def _digits(name: str) -> str:
    return f"to {REPORTED_DIGITS[name]} significant digits"


COLUMNS = {
    "case": ("integer", "the case's position in the grid or list, from 0"),
    "rank": ("integer", "the design's rank in its case, from 1; empty for a case without a "
                        "design"),
    "material_id": ("string", "the material's id (GET /v1/materials/{id})"),
    "family": ("string", "the section family id"),
    "mass": ("number", f"kg, {_digits('mass')}"),
    "cost": ("number", f"price x mass, {PRICE_CURRENCY}, {_digits('cost')}"),
    "carbon": ("number", f"kg CO2e, {_digits('carbon')}"),
    "governing": ("string", "the requirement that set the size (as a design's `governing`)"),
    "dimensions.<name>": ("number", "m, each dimension name of the families involved; empty "
                                    "where it does not apply"),
    "core_material_id": ("string", "the core material's id (sandwich panels), else empty"),
    "designation": ("string", "the catalogue member's name, when sized from a catalogue"),
    "deflection": ("number", f"m, peak deflection (bending), {_digits('deflection')}"),
    "twist": ("number", f"rad, angle of twist (torsion), {_digits('twist')}"),
    "max_stress": ("number", f"Pa, peak stress, {_digits('max_stress')}"),
    "utilization.<check>": ("number", "the design's utilization of each check and limit ("
                            + ", ".join(UTILIZATION_KEYS)
                            + f"), empty where not asked for, {_digits('utilization')}"),
    "reason": ("string", "for a case without a design: why, naming the material and section "
                         "family closest to a design; else empty"),
}
"""The type and meaning (with unit) of each column, for the table's documentation and its
typed formats (Parquet); a varied path's column has the type of its field."""


def column_type(column: str) -> str | None:
    """``integer``, ``number`` or ``string`` for a result column; None for a varied path."""
    for pattern in ("dimensions.", "utilization."):
        if column.startswith(pattern):
            return "number"
    entry = COLUMNS.get(column)
    return None if entry is None else entry[0]


@dataclass(frozen=True)
class Sweep:
    """A validated sweep.

    Attributes:
        base: the request every case starts from.
        paths: the varied contract paths, in column order.
        cases: one tuple of SI values per case, in the order of ``paths``.
        top: designs kept per case.
    """

    base: DesignRequest
    paths: tuple[str, ...]
    cases: tuple[tuple[object, ...], ...]
    top: int

    def request(self, index: int) -> DesignRequest:
        """The full design request of case ``index``."""
        changes: dict[str, Any] = {}
        actions = list(self.base.actions)
        for path, value in zip(self.paths, self.cases[index], strict=True):
            located = action_path(path)
            if located is None:
                changes[SWEEPABLE_PATHS[path]] = value
            else:
                position, name = located
                field: dict[str, Any] = {name: value}   # SI, converted by the API
                actions[position] = dataclasses.replace(actions[position], **field)
        if actions:
            changes["actions"] = tuple(actions)
        return dataclasses.replace(self.base, top=self.top, **changes)

    def columns(self) -> list[str]:
        """The sweep table's columns (see :func:`sweep_columns`)."""
        return sweep_columns(self.paths, self.families())

    def families(self) -> tuple[str, ...]:
        """Every family that any case may size, in registry order."""
        varied_types = {
            str(case[self.paths.index("load_case.type")]) for case in self.cases
        } if "load_case.type" in self.paths else {self.base.load_case}
        involved: set[str] = set()
        for load_case in varied_types:
            involved.update(dataclasses.replace(self.base, load_case=load_case).families)
        return tuple(fid for fid in FAMILIES if fid in involved)


def grid_size(grid: Mapping[str, Sequence[object]]) -> int:
    """Number of cases a grid expands to (without expanding it)."""
    return math.prod(len(values) for values in grid.values())


def build_sweep(
    base: DesignRequest,
    *,
    grid: Mapping[str, Sequence[object]] | None = None,
    cases: Sequence[Mapping[str, object]] | None = None,
    top: int = 1,
    max_cases: int = 100_000,
) -> Sweep:
    """Expand and check a sweep; raise InputError naming the offending path.

    Exactly one of ``grid`` and ``cases`` is given. Values are SI already. Every case's full
    request is validated, so a sweep either runs whole or is refused before any sizing.
    """
    if (grid is None) == (cases is None):
        raise InputError.single("grid", "give either grid or cases, not both and not neither")
    if top < 1:
        raise InputError.single("top", "must be at least 1")
    if grid is not None:
        paths = tuple(grid)
        _check_paths(paths, "grid", base)
        for path, values in grid.items():
            if not values:
                raise InputError.single(f"grid.{path}", "must list at least one value")
        count = grid_size(grid)
        if count > max_cases:
            raise InputError.single(
                "grid", f"expands to {count} cases; at most {max_cases} are allowed per request"
            )
        rows = tuple(itertools.product(*grid.values()))
        where = "grid"
    else:
        if not cases:
            raise InputError.single("cases", "must list at least one case")
        if len(cases) > max_cases:
            raise InputError.single(
                "cases", f"lists {len(cases)} cases; at most {max_cases} are allowed per request"
            )
        paths = tuple(dict.fromkeys(path for case in cases for path in case))
        _check_paths(paths, "cases.0", base)
        rows = tuple(
            tuple(case.get(path, _base_value(base, path)) for path in paths) for case in cases
        )
        where = "cases"
    sweep = Sweep(base=base, paths=paths, cases=rows, top=top)
    _validate_cases(sweep, where)
    return sweep


def _base_value(base: DesignRequest, path: str) -> object:
    located = action_path(path)
    if located is not None:
        return getattr(base.actions[located[0]], located[1])
    return getattr(base, SWEEPABLE_PATHS[path])


def sweepable(path: str, base: DesignRequest) -> bool:
    """Whether sweeps may vary ``path`` of ``base``: a declared sweepable field, or a field
    of one of its member actions (``load_case.actions.<i>.value``, ``at``, ``from``,
    ``to``)."""
    located = action_path(path)
    if located is None:
        return path in SWEEPABLE_PATHS
    return located[0] < len(base.actions)


def _check_paths(paths: Iterable[str], where: str, base: DesignRequest) -> None:
    unknown = [path for path in paths if not sweepable(path, base)]
    if unknown:
        allowed = ", ".join(SWEEPABLE_PATHS) + (
            ", load_case.actions.<i>.value | at | from | to" if base.actions else "")
        raise InputError(
            {f"{where}.{path}": [f"cannot be varied; use one of {allowed}"] for path in unknown}
        )


def _validate_cases(sweep: Sweep, where: str) -> None:
    """Validate each distinct full request once (grids repeat most combinations of checks)."""
    seen: set[tuple[object, ...]] = set()
    for index, values in enumerate(sweep.cases):
        if values in seen:
            continue
        seen.add(values)
        try:
            validate_request(sweep.request(index))
        except InputError as error:
            raise _case_error(error, sweep.paths, where, index) from None


def _case_error(error: InputError, paths: Sequence[str], where: str, index: int) -> InputError:
    """A case's error at JSON paths of the sweep request: a varied field under ``grid`` (or
    ``cases.<i>``), any other field under ``base``; each message names the case."""
    located: dict[str, list[str]] = {}
    for path, messages in at_contract_paths(error).errors.items():
        if path in paths:
            where_path = f"cases.{index}.{path}" if where == "cases" else f"grid.{path}"
        else:
            where_path = f"base.{path}"
        located.setdefault(where_path, []).extend(f"case {index}: {m}" for m in messages)
    return InputError(located)


def sweep_columns(paths: Sequence[str], families: Sequence[str]) -> list[str]:
    """The contract's column order: case, varied paths, results, dimensions, then the
    details (:data:`DETAIL_COLUMNS`)."""
    dimension_names = dict.fromkeys(
        name for fid in families for name in FAMILIES[fid].dimension_names
    )
    return ["case", *paths, *RESULT_COLUMNS, *(f"dimensions.{name}" for name in dimension_names),
            *DETAIL_COLUMNS]


SizeBatch = Callable[[Sequence[DesignRequest]], Sequence[DesignResult]]
"""Sizes a chunk of requests; the rows of the i-th result belong to the i-th request."""


CHUNK_CASES = 256
"""Cases sized together in one chunk: enough for the engine's arrays over cases to pay off,
few enough that a chunk's memory stays small (see service.core.sizing.selfsimilar
BLOCK_ELEMENTS) and that two workers share a sweep evenly."""

FIRST_CHUNK = 1
"""Cases of a sweep's first chunk when it runs in worker processes: the calling process sizes
them while the workers start, so the first rows come within a fraction of a second."""


def sweep_rows(
    sweep: Sweep,
    size_batch: SizeBatch,
    chunk_size: int | None = None,
    case_indices: range | None = None,
    workers: int = 1,
) -> Iterator[list[object]]:
    """Rows of the sweep table, yielded chunk by chunk as they are computed.

    ``chunk_size`` cases are sized together (default :data:`CHUNK_CASES`); ``case_indices``
    restricts the rows to some cases (a partition of a distributed sweep).
    ``workers`` > 1 sizes the chunks in that many processes (``size_batch`` must pickle),
    once there are at least two chunks for them: the calling process sizes a first chunk of
    :data:`FIRST_CHUNK` cases while they start. The rows still come in case order, and at
    most two chunks per worker are in flight, so memory stays bounded by the chunk size
    whatever the number of cases.
    """
    indices = range(len(sweep.cases)) if case_indices is None else case_indices
    if not indices:
        return
    chunk_size = chunk_size or CHUNK_CASES
    first = min(FIRST_CHUNK, chunk_size) if workers > 1 else chunk_size
    chunks = [indices[:first], *(indices[start : start + chunk_size]
                                 for start in range(first, len(indices), chunk_size))]
    if workers > 1 and len(chunks) > 2:
        yield from _in_processes(sweep, size_batch, chunks, workers)
        return
    for chunk in chunks:
        yield from partition_rows(sweep, size_batch, chunk)


def partition_rows(sweep: Sweep, size_batch: SizeBatch, cases: range) -> list[list[object]]:
    """The rows of the cases ``cases`` (contiguous), sized together, in case order: one chunk
    of :func:`sweep_rows`, here or in a worker process."""
    dimension_columns = [c for c in sweep.columns() if c.startswith("dimensions.")]
    results = size_batch([sweep.request(i) for i in cases])
    return [row for index, result in zip(cases, results, strict=True)
            for row in _case_rows(index, sweep.cases[index], result, dimension_columns)]


def _in_processes(sweep: Sweep, size_batch: SizeBatch, chunks: Sequence[range], workers: int
                  ) -> Iterator[list[object]]:
    """The rows of ``chunks``: the first sized here while a pool of fresh ("spawn")
    processes starts, each one holding the sweep, sizes the others, in order.

    Spawned, not forked: a fork of a threaded server process can deadlock.
    """
    pool = ProcessPoolExecutor(min(workers, len(chunks) - 1),
                               mp_context=multiprocessing.get_context("spawn"),
                               initializer=_set_worker_sweep, initargs=(sweep, size_batch))
    waiting = iter(chunks[1:])
    pending: deque[Future] = deque()

    def submit(count: int) -> None:
        pending.extend(pool.submit(_worker_rows, chunk.start, chunk.stop)
                       for chunk in itertools.islice(waiting, count))

    # Starting a spawned process waits until it has read the sweep, which needs its imports
    # (a second or more): the first submissions start them from a thread of their own.
    starter = ThreadPoolExecutor(1)
    started = starter.submit(submit, 2 * workers)
    try:
        yield from partition_rows(sweep, size_batch, chunks[0])
        started.result()
        while pending:
            rows = pending.popleft().result()
            submit(1)
            yield from rows
    finally:
        starter.shutdown(wait=True)
        pool.shutdown(wait=True, cancel_futures=True)


_WORKER_SWEEP: list[tuple[Sweep, SizeBatch]] = []
"""The sweep and size_batch of this worker process (set once by the pool's initializer)."""


def _set_worker_sweep(sweep: Sweep, size_batch: SizeBatch) -> None:
    _WORKER_SWEEP[:] = [(sweep, size_batch)]


def _worker_rows(start: int, stop: int) -> list[list[object]]:
    sweep, size_batch = _WORKER_SWEEP[0]
    return partition_rows(sweep, size_batch, range(start, stop))


def infeasible_reason(result: DesignResult) -> str:
    """One line for a case without a design: the reason of the material and section family
    closest to a design (:attr:`~service.core.sizing.results.Rejection.shortfall`)."""
    reasons = closest_first(result.rejected, 1)
    if not reasons:
        return "no feasible design: no material and section family to size"
    first = reasons[0]
    return (f"no feasible design; closest: {first.material_id} as {first.family}: "
            f"{first.reason}")


def _case_rows(
    index: int, values: tuple[object, ...], result: DesignResult, dimension_columns: list[str]
) -> Iterator[list[object]]:
    if not result.designs:
        empty = len(RESULT_COLUMNS) + len(dimension_columns) + len(DETAIL_COLUMNS) - 1
        yield [index, *values, *[None] * empty, infeasible_reason(result)]
        return
    for rank, full in enumerate(result.designs, start=1):
        design = full.reported()
        dims = design.dimensions
        yield [
            index, *values, rank, design.material_id, design.family,
            design.mass, design.cost, design.carbon, design.governing,
            *[dims.get(column.removeprefix("dimensions.")) for column in dimension_columns],
            design.core_material_id, design.designation, design.deflection, design.twist,
            design.max_stress,
            *[design.utilization.get(column.removeprefix("utilization."))
              for column in UTILIZATION_COLUMNS],
            None,
        ]
