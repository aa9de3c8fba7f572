"""Service configuration: defaults, overridden by FORMWISE_* environment variables, then by
the dict given to :func:`service.create_app`."""

from __future__ import annotations

import os
from collections.abc import Mapping

from service import __version__

DEFAULTS: dict[str, object] = {
    # flask-smorest / OpenAPI
    "API_TITLE": "Formwise",
    "API_VERSION": __version__,
    "OPENAPI_VERSION": "3.1.0",
    "OPENAPI_URL_PREFIX": "/v1",
    "OPENAPI_JSON_PATH": "openapi.json",
    # Request bodies above this many bytes are refused with 413.
    "MAX_CONTENT_LENGTH": 2 * 1024 * 1024,
    # Largest number of cases one sweep request may expand to.
    "SWEEP_MAX_CASES": 100_000,
    # Processes that size one POST /v1/sweeps request's cases (sweeps of more than one chunk
    # of cases; 1: in the serving process). Default: one per CPU.
    "SWEEP_WORKERS": os.cpu_count() or 1,
    # Processes that size one POST /v1/designs request, its section families in shares side
    # by side (1: all in the serving process). Default: one per CPU.
    "DESIGN_WORKERS": os.cpu_count() or 1,
    # A materials CSV to use instead of the built-in data (None: built-in).
    "MATERIALS_FILE": None,
    "LOG_LEVEL": "INFO",
    # Team data (see service/storage): an SQLAlchemy URL (None: formwise.db in the instance
    # folder) and, for PostgreSQL, a schema to keep the tables in (None: the user's default).
    "DATABASE_URL": None,
    "DATABASE_SCHEMA": None,
    # Jobs (see service/jobs): the queue (None: queue.db in the instance folder; redis://...)
    # and its name (services and workers that share a queue use the same name),
    # whether this process runs jobs itself, with how many threads, cases per stored chunk,
    # seconds without a heartbeat before a running job counts as lost, starts before it fails.
    "QUEUE_URL": None,
    "QUEUE_NAME": "formwise",
    "JOBS_WORKER": True,
    "JOBS_THREADS": 1,
    "JOB_CHUNK_CASES": 50,
    "JOB_STALE_SECONDS": 30.0,
    "JOB_MAX_ATTEMPTS": 3,
    # A dask scheduler address (tcp://host:8786) that computes jobs' rows; None: the worker
    # computes them itself (see service/dask_backend.py, pip install formwise[dask]).
    "DASK_SCHEDULER": None,
    # Limits per API key: requests (a flask-limiter rate such as "600 per minute"; None: no
    # limit) and queued or running jobs at once; where the request counts are kept.
    "RATE_LIMIT": None,
    "RATE_LIMIT_STORAGE_URL": "memory://",
    "MAX_ACTIVE_JOBS": 4,
    # Browser origins allowed to call the API (CORS); empty: none.
    "CORS_ORIGINS": (),
}

def flag(text: str) -> bool:
    """``1/true/yes/on`` or ``0/false/no/off``."""
    value = text.strip().lower()
    if value not in ("1", "true", "yes", "on", "0", "false", "no", "off"):
        raise ValueError(text)
    return value in ("1", "true", "yes", "on")


def origins(text: str) -> tuple[str, ...]:
    """A comma-separated list of origins, e.g. ``https://dash.example.org``."""
    return tuple(part.strip() for part in text.split(",") if part.strip())


# Environment variables read on start-up: FORMWISE_<NAME> -> config key and its type.
ENVIRONMENT: dict[str, tuple[str, type]] = {
    "FORMWISE_MAX_BODY_BYTES": ("MAX_CONTENT_LENGTH", int),
    "FORMWISE_SWEEP_MAX_CASES": ("SWEEP_MAX_CASES", int),
    "FORMWISE_SWEEP_WORKERS": ("SWEEP_WORKERS", int),
    "FORMWISE_DESIGN_WORKERS": ("DESIGN_WORKERS", int),
    "FORMWISE_MATERIALS_FILE": ("MATERIALS_FILE", str),
    "FORMWISE_LOG_LEVEL": ("LOG_LEVEL", str),
    "FORMWISE_DATABASE_URL": ("DATABASE_URL", str),
    "FORMWISE_DATABASE_SCHEMA": ("DATABASE_SCHEMA", str),
    "FORMWISE_QUEUE_URL": ("QUEUE_URL", str),
    "FORMWISE_QUEUE_NAME": ("QUEUE_NAME", str),
    "FORMWISE_JOBS_WORKER": ("JOBS_WORKER", flag),
    "FORMWISE_JOBS_THREADS": ("JOBS_THREADS", int),
    "FORMWISE_JOB_CHUNK_CASES": ("JOB_CHUNK_CASES", int),
    "FORMWISE_JOB_STALE_SECONDS": ("JOB_STALE_SECONDS", float),
    "FORMWISE_DASK_SCHEDULER": ("DASK_SCHEDULER", str),
    "FORMWISE_RATE_LIMIT": ("RATE_LIMIT", str),
    "FORMWISE_RATE_LIMIT_STORAGE_URL": ("RATE_LIMIT_STORAGE_URL", str),
    "FORMWISE_MAX_ACTIVE_JOBS": ("MAX_ACTIVE_JOBS", int),
    "FORMWISE_CORS_ORIGINS": ("CORS_ORIGINS", origins),
}


def load_config(
    overrides: Mapping[str, object] | None = None,
    environ: Mapping[str, str] | None = None,
) -> dict[str, object]:
    """Defaults, then environment, then explicit overrides (later wins)."""
    environ = os.environ if environ is None else environ
    config = dict(DEFAULTS)
    for variable, (key, kind) in ENVIRONMENT.items():
        if variable in environ:
            try:
                config[key] = kind(environ[variable])
            except ValueError as error:
                raise ValueError(
                    f"{variable}={environ[variable]!r} is not a valid {kind.__name__}"
                ) from error
    config.update(overrides or {})
    return config
