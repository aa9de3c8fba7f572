"""Who is calling: ``Authorization: Bearer <key>`` once any API key exists.

While no key has ever been created the service runs open, for one user (the embedded
default), and says so when it starts. A missing, wrong or revoked key gets one and the same
401 answer, which names no team.
"""

from __future__ import annotations

from flask import Flask, Response, g, request

from service.api.errors import problem
from service.api.teamdata import storage
from service.storage import keys

OPEN_PATHS = frozenset({"/v1/health", "/v1/openapi.json"})
"""Answered without a key: probes and the public contract carry no team data."""

UNAUTHORIZED = "A valid API key is required: send the header Authorization: Bearer <key>."


def authenticate() -> Response | None:
    """Set ``g.caller``, or answer 401."""
    if request.method == "OPTIONS" or request.path in OPEN_PATHS:
        return None
    scheme, _, key = request.headers.get("Authorization", "").partition(" ")
    with storage().transaction() as session:
        found = keys.caller(session, key.strip() if scheme.lower() == "bearer" else None)
    if found is None:
        return problem(401, UNAUTHORIZED, headers={"WWW-Authenticate": 'Bearer realm="formwise"'})
    g.caller = found
    return None


def announce_mode(app: Flask) -> None:
    """Log whether keys are required (at start; the mode follows the keys at every request)."""
    with storage_of(app).transaction() as session:
        closed = keys.keys_exist(session)
    if closed:
        app.logger.info("API keys are in use: every request needs Authorization: Bearer <key>")
    else:
        app.logger.warning(
            "no API key exists: the service runs open, for one user; anyone who reaches it can "
            "read and change its team data (create a key: formwise keys create --team NAME)")


def storage_of(app: Flask):
    return app.extensions["formwise_storage"]
