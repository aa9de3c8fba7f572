"""Distributed sweeps on a dask cluster (``pip install formwise[dask]``).

The cases are cut into contiguous partitions; each dask task sizes one partition with the same
:func:`service.core.sweeps.sweep_rows` a single process uses, and the rows are gathered back
in case order, so the table is identical to a local run. ``formwise sweep --dask`` computes a
whole sweep this way; a background job (:mod:`service.jobs.run`), when
``FORMWISE_DASK_SCHEDULER`` names a scheduler, computes each of its stored chunks this way.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from contextlib import contextmanager
from itertools import pairwise

from service.core.sweeps import SizeBatch, Sweep, sweep_rows

RowSource = Callable[[int, int], Iterator[list[object]]]
"""(start, stop) -> the rows of cases ``start`` to ``stop - 1``, in case order."""


def _partition_rows(
    sweep: Sweep, size_batch: SizeBatch, start: int, stop: int
) -> list[list[object]]:
    return list(sweep_rows(sweep, size_batch, case_indices=range(start, stop)))


def partitions(case_count: int, parts: int, start: int = 0) -> list[tuple[int, int]]:
    """Split ``range(start, start + case_count)`` into at most ``parts`` contiguous, nearly
    equal pieces."""
    parts = max(1, min(parts, case_count))
    bounds = [start + round(i * case_count / parts) for i in range(parts + 1)]
    return [(a, b) for a, b in pairwise(bounds) if b > a]


@contextmanager
def dask_row_source(sweep: Sweep, size_batch: SizeBatch, address: str,
                    parts: int | None = None) -> Iterator[RowSource]:
    """A :data:`RowSource` that computes on the dask scheduler at ``address`` (one client
    and one copy of the sweep on the workers for all the ranges asked for).

    Each range is cut into ``parts`` partitions, by default four per worker thread, so slow
    partitions balance out.
    """
    try:
        from dask.distributed import Client
    except ImportError as error:  # the optional extra is not installed
        raise RuntimeError("the dask backend needs `pip install formwise[dask]`") from error
    with Client(address) as client:
        pieces = parts or 4 * max(1, sum(client.nthreads().values()))
        sweep_future = client.scatter(sweep, broadcast=True)

        def rows(start: int, stop: int) -> Iterator[list[object]]:
            futures = [
                client.submit(_partition_rows, sweep_future, size_batch, a, b, pure=False)
                for a, b in partitions(stop - start, pieces, start)
            ]
            for future in futures:
                yield from future.result()

        yield rows


def dask_sweep_rows(
    sweep: Sweep, size_batch: SizeBatch, address: str, parts: int | None = None
) -> Iterator[list[object]]:
    """Rows of ``sweep`` computed on the dask scheduler at ``address``, in case order."""
    with dask_row_source(sweep, size_batch, address, parts) as rows:
        yield from rows(0, len(sweep.cases))
