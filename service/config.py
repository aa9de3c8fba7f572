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
    # A materials CSV to use instead of the built-in data (None: built-in).
    "MATERIALS_FILE": None,
    "LOG_LEVEL": "INFO",
}

# Environment variables read on start-up: FORMWISE_<NAME> -> config key and its type.
ENVIRONMENT: dict[str, tuple[str, type]] = {
    "FORMWISE_MAX_BODY_BYTES": ("MAX_CONTENT_LENGTH", int),
    "FORMWISE_SWEEP_MAX_CASES": ("SWEEP_MAX_CASES", int),
    "FORMWISE_MATERIALS_FILE": ("MATERIALS_FILE", str),
    "FORMWISE_LOG_LEVEL": ("LOG_LEVEL", str),
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
