"""HTTP side of the versioned team items (materials, catalogues): ETags, If-Match, and the
answers to conflicting writers.

The ETag of an item is its version. A write must send ``If-Match`` with the ETag it read
(428 without one); a stale one is 412; losing a race to another writer, or creating an id
that exists, is 409. Each write is one transaction: a failed validation stores nothing.
"""

from __future__ import annotations

from collections.abc import Callable

from flask import abort, request

from service.api.errors import problem
from service.api.teamdata import caller, storage
from service.storage import items


def write_responses(blp):
    """Document the answers of a PUT or DELETE of a versioned item (404, 409, 412, 428)."""

    def document(view):
        for status, name in ((404, "NOT_FOUND"), (409, "CONFLICT"),
                             (412, "PRECONDITION_FAILED"), (428, "PRECONDITION_REQUIRED")):
            view = blp.alt_response(status, response=name)(view)
        return view

    return document


def etag(version: int) -> str:
    return f'"{version}"'


def _expected_version() -> int:
    header = request.headers.get("If-Match")
    if not header:
        abort(problem(428, "Send If-Match with the ETag of the version you read (from GET)."))
    tag = header.strip().removeprefix("W/").strip('"')
    if not tag.isdigit():
        abort(problem(412, "If-Match does not match the current version; GET it again."))
    return int(tag)


def create(kind: str, slug: str, body: dict) -> int:
    try:
        with storage().transaction() as session:
            return items.create(session, caller().team_id, kind, slug, body)
    except items.Conflict:
        abort(problem(409, f"{kind} {slug!r} exists already; change it with PUT."))


def replace(kind: str, slug: str, body: dict | None, not_found: Callable[[], None]) -> int:
    """Store ``body`` (None: delete) over the version If-Match names; the new version."""
    expected = _expected_version()
    try:
        with storage().transaction() as session:
            version = items.update(session, caller().team_id, kind, slug, body, expected)
    except items.StaleVersion as stale:
        abort(problem(412, "If-Match does not match the current version; GET it again.",
                      headers={"ETag": etag(stale.current)}))
    except items.Conflict:
        abort(problem(409, "Another request changed it at the same moment; GET it again."))
    if version is None:
        not_found()
    return version


def current_version(kind: str, slug: str) -> items.Version | None:
    who = caller()
    if who is None:
        return None
    with storage().transaction() as session:
        return items.get(session, who.team_id, kind, slug)
