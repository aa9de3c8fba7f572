"""One design request on two CPUs: its section families sized in shares, side by side.

A design request's cost is mostly per numpy call, not per element (a family's grid and
polish make about as many calls for 10 materials as for 80), so the way to use a second
CPU for one request is to give it whole families. :class:`FamilySplit` sizes the first
share in the calling process and the others in worker processes, then merges the results
into exactly what :func:`~service.core.sizing.engine.size_designs` returns for the whole
request:

- the designs: a family's designs do not depend on the other families (each row is sized
  on its own), and the ``top`` best of the union of each share's ``top`` best are the
  ``top`` best of all;
- the rejections: every rejection of a share is one of the whole request (a row that a
  share sizes and the whole request would leave unsized has a design, so no rejection),
  and they are put back in the engine's order (:func:`merge_results`).

A worker that dies (killed, out of memory) loses nothing: its share is sized again in the
calling process, and a new pool is started for the next request.
"""

from __future__ import annotations

import atexit
import dataclasses
import multiprocessing
import os
import threading
from collections.abc import Sequence
from concurrent.futures import Future, ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from typing import TYPE_CHECKING

from service.core.sizing.engine import (
    NOT_MADE_IN_FORM,
    CaseSizer,
    best_designs,
    size_designs,
)
from service.core.sizing.request import DesignRequest, validate_request
from service.core.sizing.results import DesignResult, Rejection

if TYPE_CHECKING:
    from service.core.materials import MaterialTable

FAMILY_COST = {
    "solid_round": 1.0,
    "solid_rectangle": 2.7,
    "round_tube": 2.3,
    "rectangular_tube": 13.0,
    "i_section": 11.3,
    "sandwich_panel": 10.1,
}
"""Relative cost of sizing each family, for balancing the shares: wall time of the README's
request with that family alone, over the solid round's (median of 15, measured 2026-12-05
late on a 2-CPU virtual machine: 2.3, 6.2, 5.4, 30.2, 26.4 and 23.7 ms). Only the balance of the
shares depends on it, never a result."""


def shares(families: Sequence[str], count: int) -> list[tuple[str, ...]]:
    """``families`` in at most ``count`` shares of about equal cost (:data:`FAMILY_COST`;
    the costliest first, each into the share with the least so far), each share in the
    request's order, the costliest share first; no empty share."""
    bins: list[list[str]] = [[] for _ in range(min(count, len(families)))]
    totals = [0.0] * len(bins)
    for family in sorted(families, key=lambda f: -FAMILY_COST.get(f, 1.0)):
        lightest = totals.index(min(totals))
        bins[lightest].append(family)
        totals[lightest] += FAMILY_COST.get(family, 1.0)
    order = {family: position for position, family in enumerate(families)}
    ranked = sorted(zip(totals, bins, strict=True), key=lambda pair: -pair[0])
    return [tuple(sorted(share, key=order.__getitem__)) for _, share in ranked if share]


def merge_results(request: DesignRequest, results: Sequence[DesignResult]) -> DesignResult:
    """The result of the whole ``request`` from those of its shares of families.

    The engine lists rejections family by family in the request's order, then moves the
    materials "not made in this form" to the end (:func:`actionable_first`); a share's
    rejections keep that order within its families, so sorting each kind by the family's
    place in the request (a stable sort) restores the whole request's order."""
    place = {family: position for position, family in enumerate(request.families)}
    rejections = [rejection for result in results for rejection in result.rejected]

    def ordered(kept: list[Rejection]) -> list[Rejection]:
        return sorted(kept, key=lambda rejection: place[rejection.family])

    actionable = ordered([r for r in rejections if r.reason != NOT_MADE_IN_FORM])
    not_made = ordered([r for r in rejections if r.reason == NOT_MADE_IN_FORM])
    designs = best_designs([design for result in results for design in result.designs],
                           request)
    return DesignResult(tuple(designs), tuple(actionable + not_made))


class FamilySplit:
    """Sizes a design request's families in ``workers`` shares, the first in the calling
    process and each other in a worker process of its own (spawned once, on first use, and
    kept). With one worker, or a request that cannot be split (one family, a catalogue),
    it is :func:`size_designs` itself."""

    def __init__(self, workers: int) -> None:
        self.workers = max(1, int(workers))
        self._pool: ProcessPoolExecutor | None = None
        self._owner = 0
        self._ready: Future | None = None
        self._lock = threading.Lock()
        atexit.register(self.close)

    def __call__(self, request: DesignRequest, materials: MaterialTable,
                 core_materials: MaterialTable | None = None) -> DesignResult:
        """What ``size_designs(request, materials, core_materials)`` returns."""
        parts = shares(request.families, self.workers) if not request.catalog else []
        pool = self._started() if len(parts) > 1 else None
        if pool is None:
            return size_designs(request, materials, core_materials)
        # validated whole first, so an error names the request's fields as size_designs does
        validate_request(request)
        tables = CaseSizer(materials, core_materials)
        requests = [dataclasses.replace(request, sections=part) for part in parts]
        futures: list[Future | None] = []
        for part in requests[1:]:
            try:
                futures.append(pool.submit(_size_share, tables, part))
            except (BrokenProcessPool, RuntimeError):
                futures.append(None)
        results = [_size_share(tables, requests[0])]
        for part, future in zip(requests[1:], futures, strict=True):
            results.append(self._collect(future, tables, part))
        return merge_results(request, results)

    def _collect(self, future: Future | None, tables: CaseSizer,
                 part: DesignRequest) -> DesignResult:
        """The share's result from its worker, or sized here when the worker died."""
        if future is not None:
            try:
                return future.result()
            except BrokenProcessPool:
                pass
        self._discard()
        return _size_share(tables, part)

    def ready(self, timeout: float | None = None) -> bool:
        """Start the worker processes if they are not running, and wait up to ``timeout``
        seconds for them (None: as long as they take); True once requests are split."""
        if self.workers < 2:
            return False
        self._started()
        ready = self._ready
        if ready is None:
            return False
        try:
            ready.result(timeout=timeout)
        except (TimeoutError, BrokenProcessPool):
            return False
        return self._started() is not None

    def worker_pids(self) -> list[int]:
        """The process ids of the running workers (none before the first request)."""
        pool = self._pool
        processes = getattr(pool, "_processes", None) or {}
        return list(processes)

    def _started(self) -> ProcessPoolExecutor | None:
        """The pool once its workers are up (None while they start: the request is then
        sized here, so no request waits for a worker's start)."""
        if self.workers < 2:
            return None
        with self._lock:
            if self._pool is None or self._owner != os.getpid():
                # a pool made before a fork (gunicorn's workers) belongs to the parent
                self._pool = ProcessPoolExecutor(
                    self.workers - 1, mp_context=multiprocessing.get_context("spawn"),
                    initializer=_warm)
                self._owner = os.getpid()
                self._ready = self._pool.submit(os.getpid)
            if self._ready is not None and not self._ready.done():
                return None
            return self._pool

    def _discard(self) -> None:
        with self._lock:
            if self._pool is not None:
                self._pool.shutdown(wait=False, cancel_futures=True)
            self._pool = None

    def close(self) -> None:
        """Stop the worker processes (a later request starts them again)."""
        self._discard()


_SPLITS: dict[int, FamilySplit] = {}
_SPLITS_LOCK = threading.Lock()


def family_split(workers: int) -> FamilySplit:
    """The process's :class:`FamilySplit` of ``workers`` (one pool per process and count,
    whatever the number of apps or threads that use it)."""
    with _SPLITS_LOCK:
        return _SPLITS.setdefault(max(1, int(workers)), FamilySplit(workers))


def _size_share(tables: CaseSizer, request: DesignRequest) -> DesignResult:
    """:func:`size_designs` of a share, its tables carried by a :class:`CaseSizer` (which
    pickles them by their fields)."""
    return size_designs(request, tables.materials, tables.core_materials)


def _warm() -> None:
    """A worker's start: import the sizing core, so a request finds it loaded."""
    import service.core.sizing.engine  # noqa: F401
