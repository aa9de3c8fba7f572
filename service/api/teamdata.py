"""The calling team's data as the views see it: its materials beside the built-in ones, its
catalogues by name, and the versions of both that a request used.

A background job pins the versions its request was submitted with (``g.pinned_inputs``), so
it computes with those values even if the team edits its materials meanwhile.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from typing import TypeVar

from flask import abort, current_app, g, has_app_context
from sqlalchemy.orm import Session

from service.api.errors import problem
from service.core import materials as core_materials
from service.storage import Storage, items
from service.storage.keys import Caller

Found = TypeVar("Found")

_KINDS = {"materials": items.MATERIAL, "catalogs": items.CATALOG}
_TABLE_CACHE_SIZE = 64


def storage() -> Storage:
    return current_app.extensions["formwise_storage"]


def caller() -> Caller | None:
    """The authenticated caller of this request or job; None outside one (CLI, documents)."""
    return g.get("caller") if has_app_context() else None


def team_object(change: Callable[[Session, int, str], Found | None], noun: str,
                object_id: str) -> Found:
    """``change(session, team_id, object_id)`` for the caller's team in one transaction (a
    lookup, or a change that returns what it changed); a 404 problem when it finds nothing,
    which is also the answer for another team's object."""
    with storage().transaction() as session:
        found = change(session, caller().team_id, object_id)
    if not found:
        abort(problem(404, f"no {noun} {object_id!r}"))
    return found


def team_versions(kind: str) -> list[items.Version]:
    """The caller's items of ``kind``: at the pinned versions in a job, current otherwise."""
    who = caller()
    if who is None:
        return []
    cache = g.setdefault("team_versions", {})
    if kind not in cache:
        pinned = g.get("pinned_inputs")
        with storage().transaction() as session:
            if pinned is not None:
                name = next(k for k, v in _KINDS.items() if v == kind)
                cache[kind] = items.at_versions(session, who.team_id, kind, pinned.get(name, {}))
            else:
                cache[kind] = items.current(session, who.team_id, kind)
    return cache[kind]


def team_inputs() -> dict[str, dict[str, int]]:
    """``{"materials": {id: version}, "catalogs": {id: version}}`` of the caller's items."""
    return {name: {v.slug: v.version for v in team_versions(kind)}
            for name, kind in _KINDS.items()}


def with_team_materials(builtin: core_materials.MaterialTable) -> core_materials.MaterialTable:
    """``builtin`` followed by the caller's materials (their records were validated when
    stored, with the same checks as client materials)."""
    versions = team_versions(items.MATERIAL)
    if not versions:
        return builtin
    key = (id(builtin), tuple((v.slug, v.version) for v in versions), caller().team_id)
    cache: dict = current_app.extensions.setdefault("formwise_team_tables", {})
    if key not in cache:
        if len(cache) >= _TABLE_CACHE_SIZE:
            cache.clear()
        cache[key] = builtin.concat(core_materials.from_records([v.body for v in versions]))
    return cache[key]


def team_catalog(name: str) -> list[Mapping] | None:
    """The members of the caller's catalogue ``name`` (None when it has none of that name)."""
    for version in team_versions(items.CATALOG):
        if version.slug == name:
            return version.body["members"]
    return None
