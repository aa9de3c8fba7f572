"""Distributed sweeps on a dask cluster (``pip install formwise[dask]``).

The cases are cut into contiguous partitions; each dask task sizes one partition with the same
:func:`service.core.sweeps.sweep_rows` a single process uses, and the rows are gathered back
in case order, so the table is identical to a local run.
"""

from __future__ import annotations

from collections.abc import Iterator
from itertools import pairwise

from service.core.sweeps import SizeBatch, Sweep, sweep_rows


def _partition_rows(
    sweep: Sweep, size_batch: SizeBatch, start: int, stop: int
) -> list[list[object]]:
    return list(sweep_rows(sweep, size_batch, case_indices=range(start, stop)))


def partitions(case_count: int, parts: int) -> list[tuple[int, int]]:
    """Split ``range(case_count)`` into at most ``parts`` contiguous, nearly equal pieces."""
    parts = max(1, min(parts, case_count))
    bounds = [round(i * case_count / parts) for i in range(parts + 1)]
    return [(a, b) for a, b in pairwise(bounds) if b > a]


def dask_sweep_rows(
    sweep: Sweep, size_batch: SizeBatch, address: str, parts: int | None = None
) -> Iterator[list[object]]:
    """Rows of ``sweep`` computed on the dask scheduler at ``address``, in case order.

    ``parts`` defaults to four partitions per worker thread, so slow partitions balance out.
    """
    try:
        from dask.distributed import Client
    except ImportError as error:  # the optional extra is not installed
        raise RuntimeError("the dask backend needs `pip install formwise[dask]`") from error
    with Client(address) as client:
        if parts is None:
            parts = 4 * max(1, sum(client.nthreads().values()))
        sweep_future = client.scatter(sweep, broadcast=True)
        futures = [
            client.submit(_partition_rows, sweep_future, size_batch, start, stop, pure=False)
            for start, stop in partitions(len(sweep.cases), parts)
        ]
        for future in futures:
            yield from future.result()
