"""Team data bound to the app: the database (migrated at start), API keys, per-key limits,
CORS and the job queue, in that order."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path

from flask import Flask, g, request

from service.api.auth import announce_mode, authenticate
from service.jobs.queue import JobQueue
from service.storage import Storage

DATABASE_FILE = "formwise.db"


def open_storage(config: Mapping[str, object], instance_path: str) -> Storage:
    """The database of ``DATABASE_URL`` (default: an SQLite file in the instance folder),
    migrated to the newest schema."""
    url = config["DATABASE_URL"]
    if not url:
        Path(instance_path).mkdir(parents=True, exist_ok=True)
        url = f"sqlite:///{Path(instance_path) / DATABASE_FILE}"
    storage = Storage(str(url), config["DATABASE_SCHEMA"])
    storage.migrate()
    return storage


def init_team_data(app: Flask) -> None:
    storage = open_storage(app.config, app.instance_path)
    app.extensions["formwise_storage"] = storage
    announce_mode(app)
    app.before_request(authenticate)
    _limit_rate(app)
    _allow_origins(app)
    queue = JobQueue(app)
    app.extensions["formwise_jobs"] = queue
    if app.config["JOBS_WORKER"]:
        queue.start_embedded()


def rate_key() -> str:
    """Requests count per key (per client address while the service runs open)."""
    caller = g.get("caller")
    if caller is not None and caller.key_id is not None:
        return f"key:{caller.key_id}"
    return f"address:{request.remote_addr}"


def _limit_rate(app: Flask) -> None:
    if not app.config["RATE_LIMIT"]:
        return
    from flask_limiter import Limiter

    Limiter(rate_key, app=app, application_limits=[str(app.config["RATE_LIMIT"])],
            storage_uri=str(app.config["RATE_LIMIT_STORAGE_URL"]), headers_enabled=True)


def _allow_origins(app: Flask) -> None:
    if not app.config["CORS_ORIGINS"]:
        return
    from flask_cors import CORS

    CORS(app, origins=list(app.config["CORS_ORIGINS"]),
         allow_headers=["Authorization", "Content-Type", "If-Match", "Accept"],
         expose_headers=["Location", "ETag", "Retry-After", "X-Request-Id", "Formwise-Caution"])
