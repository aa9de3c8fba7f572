"""Faults on SQLite and PostgreSQL: processes killed with SIGKILL lose nothing acknowledged.

- A ``formwise worker`` killed mid-job, on the embedded SQLite queue and on Redis: the job is
  not done, keeps only whole chunks, and a second worker resumes it after the heartbeat goes
  stale; the table equals the same sweep run at once, row for row.
- The HTTP server killed while clients write: every write it acknowledged (201) is stored.
"""

import os
import signal
import socket
import subprocess
import sys
import threading
import time
import urllib.error
import urllib.request
import uuid

import pytest

from service import create_app
from service.storage import Storage, items, keys
from service.storage.models import Job

SWEEP = {
    "base": {"load_case": {"type": "cantilever_end_load", "span": 1.5, "load": 2000.0},
             "requirements": {"max_deflection": 0.01, "safety_factor": 1.5},
             "envelope": {"max_depth": 0.1}, "sections": ["round_tube", "solid_round"],
             "materials": {"ids": ["al_6061_t6", "s355j2", "cfrp_qi_sm"]}},
    "grid": {"load_case.span": [0.5 + 0.02 * k for k in range(40)],
             "load_case.load": [500.0, 2000.0]},
    "top": 2,
}


def _environment(database, tmp_path, **extra):
    env = {**os.environ, "FORMWISE_DATABASE_URL": database["DATABASE_URL"],
           "FORMWISE_QUEUE_URL": str(tmp_path / "queue.db"), "FORMWISE_LOG_LEVEL": "WARNING",
           **extra}
    env.pop("FORMWISE_DATABASE_SCHEMA", None)
    if database["DATABASE_SCHEMA"]:
        env["FORMWISE_DATABASE_SCHEMA"] = database["DATABASE_SCHEMA"]
    return env


def _start(argv, env):
    return subprocess.Popen([sys.executable, "-m", "service", *argv], env=env,
                            start_new_session=True, stdout=subprocess.DEVNULL,
                            stderr=subprocess.DEVNULL)


def _kill(process):
    os.killpg(process.pid, signal.SIGKILL)
    process.wait(timeout=10)


def _job(storage, job_id) -> Job:
    with storage.transaction() as session:
        return session.get(Job, job_id)


def _wait(predicate, timeout, what):
    deadline = time.monotonic() + timeout
    while not predicate():
        assert time.monotonic() < deadline, f"timed out waiting for {what}"
        time.sleep(0.02)


REDIS_URL = "redis://127.0.0.1:6379/0"  # this project's machines run Redis there


@pytest.fixture(params=["sqlite", "redis"])
def queue(request, tmp_path):
    """Queue settings: the embedded SQLite file, or Redis with a queue name of its own."""
    if request.param == "sqlite":
        return {"QUEUE_URL": str(tmp_path / "queue.db")}
    import redis

    try:
        redis.Redis.from_url(REDIS_URL, socket_connect_timeout=2).ping()
    except redis.RedisError:
        pytest.skip(f"no Redis answers at {REDIS_URL}")
    return {"QUEUE_URL": REDIS_URL, "QUEUE_NAME": f"formwise-faults-{uuid.uuid4().hex}"}


@pytest.fixture()
def service_app(database, queue):
    app = create_app({"TESTING": True, **database, "JOBS_WORKER": False, **queue})
    yield app
    app.extensions["formwise_storage"].dispose()


def test_a_worker_killed_mid_job_is_resumed_and_never_done_with_rows_missing(
        service_app, database, queue, tmp_path):
    client = service_app.test_client()
    expected = client.post("/v1/sweeps", json=SWEEP).get_json()
    job_id = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP}).get_json()["id"]
    storage = service_app.extensions["formwise_storage"]
    env = _environment(database, tmp_path, FORMWISE_JOB_CHUNK_CASES="1",
                       FORMWISE_JOB_STALE_SECONDS="1",
                       **{f"FORMWISE_{key}": value for key, value in queue.items()})

    first = _start(["worker"], env)
    try:
        _wait(lambda: _job(storage, job_id).done >= 3, 60, "the first worker's chunks")
    finally:
        _kill(first)
    killed = _job(storage, job_id)
    assert killed.status == "running" and killed.done < killed.total
    rows_kept = client.get(f"/v1/jobs/{job_id}/result")
    assert rows_kept.status_code == 409  # not done: no partial table is served as a result

    second = _start(["worker"], env)
    try:
        _wait(lambda: _job(storage, job_id).status == "done", 120, "the second worker")
    finally:
        _kill(second)
    job = _job(storage, job_id)
    assert job.attempts == 2 and job.done == job.total == expected["cases"]
    assert client.get(f"/v1/jobs/{job_id}/result").get_json()["rows"] == expected["rows"]


def _free_port() -> int:
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


def _post(url, body, key):
    import json

    request = urllib.request.Request(url, data=json.dumps(body).encode(), method="POST",
                                     headers={"Content-Type": "application/json",
                                              "Authorization": f"Bearer {key}"})
    with urllib.request.urlopen(request, timeout=10) as response:
        return response.status


def test_the_server_killed_during_writes_loses_nothing_it_acknowledged(database, tmp_path):
    storage = Storage(database["DATABASE_URL"], database["DATABASE_SCHEMA"])
    storage.migrate()
    with storage.transaction() as session:
        _, key = keys.create_key(session, "alpha")
    port = _free_port()
    server = _start(["serve", "--port", str(port), "--workers", "2"],
                    _environment(database, tmp_path, FORMWISE_JOBS_WORKER="0"))
    base = f"http://127.0.0.1:{port}"
    acknowledged, stop = [], threading.Event()

    def write(writer):
        k = 0
        while not stop.is_set():
            slug = f"w{writer}_{k}"
            body = {"id": slug, "members": [{"designation": slug, "family": "round_tube",
                                             "dimensions": {"outer_diameter": 0.05,
                                                            "wall": 0.002}}]}
            try:
                if _post(f"{base}/v1/catalogs", body, key) == 201:
                    acknowledged.append(slug)
            except (urllib.error.URLError, ConnectionError, OSError):
                if stop.is_set():
                    return
                time.sleep(0.05)  # not up yet
            k += 1

    writers = [threading.Thread(target=write, args=(w,)) for w in range(4)]
    try:
        for thread in writers:
            thread.start()
        _wait(lambda: len(acknowledged) >= 30, 60, "acknowledged writes")
        _kill(server)
    finally:
        stop.set()
        if server.poll() is None:
            _kill(server)
        for thread in writers:
            thread.join(timeout=20)
    with storage.transaction() as session:
        team = keys.team_id(session, "alpha")
        stored = {v.slug for v in items.current(session, team, items.CATALOG)}
    storage.dispose()
    assert set(acknowledged) <= stored
