"""Team materials and catalogues: versioned items with optimistic concurrency.

Each write adds a version (a delete adds one marked deleted) and never changes an old one, so
a study or a job can name the exact values it used. A write states the version it read
(If-Match); the unique (team, kind, slug, version) constraint makes the database the referee
between two writers that read the same version: one commits, the other gets
:class:`Conflict`.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from sqlalchemy import func, select
from sqlalchemy.exc import IntegrityError
from sqlalchemy.orm import Session

from service.storage.models import Item

MATERIAL, CATALOG = "material", "catalog"


class Conflict(Exception):
    """Another writer changed the item first (or it already exists)."""


class StaleVersion(Exception):
    """The version the writer read is not the current one."""

    def __init__(self, current: int | None):
        super().__init__(current)
        self.current = current


@dataclass(frozen=True)
class Version:
    slug: str
    version: int
    body: dict


def _latest(session: Session, team_id: int, kind: str):
    """Subquery: each slug's highest version."""
    return (
        select(Item.slug, func.max(Item.version).label("version"))
        .where(Item.team_id == team_id, Item.kind == kind)
        .group_by(Item.slug)
        .subquery()
    )


def current(session: Session, team_id: int, kind: str) -> list[Version]:
    """The team's live items of ``kind``, by slug."""
    latest = _latest(session, team_id, kind)
    rows = session.scalars(
        select(Item)
        .join(latest, (Item.slug == latest.c.slug) & (Item.version == latest.c.version))
        .where(Item.team_id == team_id, Item.kind == kind, Item.deleted.is_(False))
        .order_by(Item.slug)
    )
    return [Version(row.slug, row.version, row.body) for row in rows]


def at_versions(session: Session, team_id: int, kind: str,
                versions: Mapping[str, int]) -> list[Version]:
    """The items of ``kind`` at the given ``{slug: version}`` (what a study or job used)."""
    if not versions:
        return []
    rows = session.scalars(
        select(Item).where(Item.team_id == team_id, Item.kind == kind,
                           Item.slug.in_(list(versions)))
    )
    found = [Version(r.slug, r.version, r.body) for r in rows if versions[r.slug] == r.version]
    return sorted(found, key=lambda v: v.slug)


def revision(session: Session, team_id: int) -> int:
    """A number that grows with every write to the team's items (0 for none)."""
    return session.scalar(select(func.coalesce(func.max(Item.id), 0))
                          .where(Item.team_id == team_id))


def get(session: Session, team_id: int, kind: str, slug: str) -> Version | None:
    row = _head(session, team_id, kind, slug)
    if row is None or row.deleted:
        return None
    return Version(row.slug, row.version, row.body)


def _head(session: Session, team_id: int, kind: str, slug: str) -> Item | None:
    return session.scalars(
        select(Item).where(Item.team_id == team_id, Item.kind == kind, Item.slug == slug)
        .order_by(Item.version.desc()).limit(1)
    ).first()


def _add(session: Session, team_id: int, kind: str, slug: str, version: int,
         body: dict | None) -> int:
    try:
        with session.begin_nested():
            session.add(Item(team_id=team_id, kind=kind, slug=slug, version=version, body=body,
                             deleted=body is None))
    except IntegrityError:
        raise Conflict(slug) from None
    return version


def create(session: Session, team_id: int, kind: str, slug: str, body: dict) -> int:
    """Add a new item; its version. Raises Conflict if a live item has that slug."""
    head = _head(session, team_id, kind, slug)
    if head is not None and not head.deleted:
        raise Conflict(slug)
    return _add(session, team_id, kind, slug, 1 if head is None else head.version + 1, body)


def update(session: Session, team_id: int, kind: str, slug: str, body: dict | None,
           expected: int) -> int | None:
    """Replace (``body``) or delete (None) the item at version ``expected``.

    Returns the new version, or None when there is no live item of that slug.
    Raises StaleVersion (the current version is not ``expected``) or Conflict (another writer
    added the same next version first).
    """
    head = _head(session, team_id, kind, slug)
    if head is None or head.deleted:
        return None
    if head.version != expected:
        raise StaleVersion(head.version)
    return _add(session, team_id, kind, slug, expected + 1, body)
