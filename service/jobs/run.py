"""Run one sweep job: chunk by chunk, each chunk's rows stored with the progress in one
transaction, resuming after the last stored chunk when a job is started again.

The rows of a chunk are computed in this process, or on a dask cluster when
``FORMWISE_DASK_SCHEDULER`` names its scheduler (the same rows either way, see
:mod:`service.dask_backend`)."""

from __future__ import annotations

import logging
from collections.abc import Iterator
from contextlib import nullcontext

from flask import Flask, g

from service.api.sweeps.routes import prepared_sweep
from service.api.sweeps.schemas import SweepRequestSchema
from service.core.sweeps import SizeBatch, Sweep, sweep_rows
from service.dask_backend import RowSource, dask_row_source
from service.formats import json_cells
from service.storage import Storage
from service.storage import jobs as job_store
from service.storage.keys import Caller

_log = logging.getLogger("service.jobs")


def run_job(app: Flask, job_id: str, worker: str) -> None:
    """Compute job ``job_id`` on ``worker`` if it is still queued."""
    storage: Storage = app.extensions["formwise_storage"]
    with storage.transaction() as session:
        job = job_store.claim(session, job_id, worker)
        if job is None:
            return
        seq = job_store.row_count(session, job_id)
    chunk = int(app.config["JOB_CHUNK_CASES"])
    with app.app_context():
        g.caller = Caller(job.team_id, job.key_id)
        g.pinned_inputs = job.inputs
        try:
            inputs = prepared_sweep(SweepRequestSchema().load(job.request))
            sweep, size_batch = inputs.sweep, inputs.sizer()
            with _row_source(app, sweep, size_batch) as rows_of:
                for start in range(job.done, job.total, chunk):
                    stop = min(start + chunk, job.total)
                    rows = [json_cells(row) for row in rows_of(start, stop)]
                    with storage.transaction() as session:
                        if not job_store.append(session, job_id, worker, seq, rows, 0, stop,
                                                job.total):
                            return  # cancelled, or taken over after this worker was lost
                    seq += len(rows)
        except Exception as error:  # the job, not the worker, fails
            _log.exception("job %s failed", job_id)
            with storage.transaction() as session:
                job_store.fail(session, job_id, worker,
                               f"the job failed ({type(error).__name__}); quote id {job_id}")


def _row_source(app: Flask, sweep: Sweep, size_batch: SizeBatch):
    """Where a job's rows are computed: the configured dask scheduler, else this process."""
    address = app.config["DASK_SCHEDULER"]
    if address:
        return dask_row_source(sweep, size_batch, str(address))
    return nullcontext(_local_rows(sweep, size_batch))


def _local_rows(sweep: Sweep, size_batch: SizeBatch) -> RowSource:
    def rows(start: int, stop: int) -> Iterator[list[object]]:
        return sweep_rows(sweep, size_batch, case_indices=range(start, stop))
    return rows
