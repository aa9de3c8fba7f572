"""The job queue: huey carrying job ids, consumers and the heartbeat that finds lost jobs.

- Default: huey's SQLite storage in the instance folder, consumed by threads inside the
  service process (nothing else to start).
- ``FORMWISE_QUEUE_URL=redis://...`` or ``postgresql://...``: a queue several hosts share;
  run ``formwise worker`` beside the services (or keep the embedded consumers,
  ``FORMWISE_JOBS_WORKER``).

Every consumer process beats for the jobs it runs; a job whose worker stopped beating for
``JOB_STALE_SECONDS`` (killed, host lost) is queued again and resumes after its last stored
chunk, or fails after ``JOB_MAX_ATTEMPTS`` starts. It is never reported done with rows
missing, because ``done`` is written only with the last chunk.
"""

from __future__ import annotations

import logging
import os
import secrets
import threading
from pathlib import Path

from flask import Flask
from huey import PostgresHuey, RedisHuey, SqliteHuey
from huey.consumer import Consumer

from service.jobs.run import run_job
from service.storage import jobs as job_store

_log = logging.getLogger("service.jobs")


class _QuietConsumer(Consumer):
    """A consumer inside the service process: the server owns the signal handlers."""

    def _set_signal_handlers(self):
        pass


class JobQueue:
    def __init__(self, app: Flask):
        self.app = app
        self.worker = f"{os.uname().nodename}:{os.getpid()}:{secrets.token_hex(4)}"
        self._connections: list = []
        url, name = app.config["QUEUE_URL"], str(app.config["QUEUE_NAME"])
        if url and str(url).startswith(("redis://", "rediss://", "unix://")):
            self.huey = RedisHuey(name, url=str(url))
        elif url and str(url).startswith("postgresql"):
            self.huey = PostgresHuey(name, connection=self._postgres_connection)
        else:
            path = Path(str(url or Path(app.instance_path) / "queue.db").removeprefix("sqlite:///"))
            path.parent.mkdir(parents=True, exist_ok=True)
            self.huey = SqliteHuey(name, filename=str(path))
        self._task = self.huey.task(name="run_job")(self._run)
        self._heartbeat: threading.Thread | None = None
        self._stop = threading.Event()
        self._consumer: Consumer | None = None

    def _postgres_connection(self):
        """A connection for huey's PostgreSQL queue, kept to be closed by :meth:`stop` (huey
        leaves its per-thread connections to the garbage collector)."""
        import psycopg

        # huey speaks to psycopg itself: a plain libpq URL, without SQLAlchemy's driver name.
        url = str(self.app.config["QUEUE_URL"]).replace("+psycopg", "", 1)
        connection = psycopg.connect(url)
        self._connections.append(connection)
        return connection

    def _run(self, job_id: str) -> None:
        run_job(self.app, job_id, self.worker)

    def enqueue(self, job_id: str) -> None:
        self._task(job_id)

    def start_embedded(self) -> None:
        """Consumer threads and the heartbeat inside this process (returns at once)."""
        self._consumer = _QuietConsumer(self.huey, workers=int(self.app.config["JOBS_THREADS"]),
                                        worker_type="thread", periodic=False, max_delay=1.0)
        self._consumer.start()
        self._start_heartbeat()

    def run_worker(self, threads: int) -> None:
        """``formwise worker``: consume until SIGINT / SIGTERM (blocks)."""
        self._start_heartbeat()
        consumer = self.huey.create_consumer(workers=threads, worker_type="thread",
                                             periodic=False, max_delay=1.0)
        try:
            consumer.run()
        finally:
            self._stop.set()

    def stop(self) -> None:
        self._stop.set()
        if self._consumer is not None:
            self._consumer.stop(graceful=True)
        if self._heartbeat is not None:
            self._heartbeat.join()
        for connection in self._connections:
            connection.close()

    def _start_heartbeat(self) -> None:
        self._heartbeat = threading.Thread(target=self._beat, name="formwise-heartbeat",
                                           daemon=True)
        self._heartbeat.start()

    def _beat(self) -> None:
        storage = self.app.extensions["formwise_storage"]
        stale = float(self.app.config["JOB_STALE_SECONDS"])
        attempts = int(self.app.config["JOB_MAX_ATTEMPTS"])
        while True:
            try:
                with storage.transaction() as session:
                    job_store.heartbeat(session, self.worker)
                    again = job_store.reclaim_stale(session, stale, attempts)
                for job_id in again:
                    _log.warning("job %s lost its worker; queued again", job_id)
                    self.enqueue(job_id)
            except Exception:  # a database hiccup must not end the heartbeat
                _log.exception("job heartbeat failed")
            if self._stop.wait(stale / 4):
                return
