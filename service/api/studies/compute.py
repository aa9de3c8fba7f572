"""Run a stored request through the same view that serves it, and say how two results differ.

A study is computed by the endpoint of its kind (POST /v1/designs, /v1/rankings, /v1/sweeps)
inside this request, with this caller's materials and catalogues: one code path per job.
"""

from __future__ import annotations

import hashlib
from collections.abc import Iterator

from flask import current_app
from werkzeug.exceptions import HTTPException

from service import __version__
from service.api.errors import _webargs_errors
from service.api.teamdata import team_inputs
from service.core.errors import InputError
from service.core.materials import BUILTIN_CSV

KINDS = {"designs": "designs.Designs", "rankings": "rankings.Rankings", "sweeps": "sweeps.Sweeps"}

MAX_DIFFERENCES = 200
"""Differences listed at most by a rerun (the count says how many there are)."""


def compute(kind: str, body: dict) -> dict:
    """The JSON answer of POST /v1/<kind> to ``body``; errors at ``request.<path>``."""
    view = current_app.view_functions[KINDS[kind]]
    with current_app.test_request_context(f"/v1/{kind}", method="POST", json=body,
                                          headers={"Accept": "application/json"}):
        try:
            response = current_app.make_response(view())
        except InputError as error:
            raise error.prefixed("request") from None
        except HTTPException as error:
            errors = _webargs_errors(error)
            if error.code == 422 and errors:
                raise InputError(errors).prefixed("request") from None
            raise
    return response.get_json()


def inputs() -> dict:
    """What a result depends on besides the request: the team's item versions, the built-in
    data and the service version."""
    return {**team_inputs(), "builtin_data": _builtin_digest(), "service": __version__}


def _builtin_digest() -> str:
    path = current_app.config.get("MATERIALS_FILE") or BUILTIN_CSV
    with open(path, "rb") as handle:
        return hashlib.sha256(handle.read()).hexdigest()[:16]


def input_changes(before: dict, after: dict) -> list[dict]:
    """Each input whose version differs: ``{"input", "id", "before", "after"}``."""
    changes = []
    for name in ("materials", "catalogs"):
        old, new = before.get(name, {}), after.get(name, {})
        for slug in sorted(set(old) | set(new)):
            if old.get(slug) != new.get(slug):
                changes.append({"input": name, "id": slug, "before": old.get(slug),
                                "after": new.get(slug)})
    for name in ("builtin_data", "service"):
        if before.get(name) != after.get(name):
            changes.append({"input": name, "id": None, "before": before.get(name),
                            "after": after.get(name)})
    return changes


def differences(before: object, after: object, path: str = "") -> Iterator[dict]:
    """Every JSON path where ``after`` differs from ``before``: ``{"path", "before", "after"}``
    (a whole subtree where its shape changed)."""
    if isinstance(before, dict) and isinstance(after, dict):
        for key in list(before) + [k for k in after if k not in before]:
            sub = f"{path}.{key}" if path else str(key)
            if key not in after or key not in before:
                yield {"path": sub, "before": before.get(key), "after": after.get(key)}
            else:
                yield from differences(before[key], after[key], sub)
    elif isinstance(before, list) and isinstance(after, list) and len(before) == len(after):
        for k, (a, b) in enumerate(zip(before, after, strict=True)):
            yield from differences(a, b, f"{path}.{k}" if path else str(k))
    elif before != after:
        yield {"path": path or "$", "before": before, "after": after}
