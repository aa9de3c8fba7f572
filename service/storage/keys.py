"""Teams and their API keys.

A key is ``fw_<key id>_<secret>``; the key id is public (listed, revoked by), the secret is
random (32 bytes) and only its SHA-256 is stored, so a copy of the database gives no key. A
plain hash suffices because the secret is random, not a password a person chose.
"""

from __future__ import annotations

import hashlib
import secrets
from dataclasses import dataclass

from sqlalchemy import select
from sqlalchemy.exc import IntegrityError
from sqlalchemy.orm import Session

from service.storage.models import ApiKey, Team, utcnow

OPEN_TEAM = "default"
"""The team of every request while no key exists (the service runs open for one user)."""

_PREFIX = "fw"


@dataclass(frozen=True)
class Caller:
    """Who a request comes from: the team and, when keys are in use, the key."""

    team_id: int
    key_id: str | None


@dataclass(frozen=True)
class KeyInfo:
    id: str
    team: str
    created_at: str
    revoked: bool


def _hash(key: str) -> str:
    return hashlib.sha256(key.encode()).hexdigest()


def team_id(session: Session, name: str) -> int:
    """The id of team ``name``, created when it does not exist yet."""
    found = session.scalar(select(Team.id).where(Team.name == name))
    if found is not None:
        return found
    try:
        with session.begin_nested():  # another process may be creating the same team
            team = Team(name=name)
            session.add(team)
        return team.id
    except IntegrityError:
        return session.scalars(select(Team.id).where(Team.name == name)).one()


def create_key(session: Session, team: str) -> tuple[str, str]:
    """A new key for ``team`` (created if needed): ``(key id, key)``; the key is not kept."""
    key_id = secrets.token_hex(6)
    key = f"{_PREFIX}_{key_id}_{secrets.token_urlsafe(32)}"
    session.add(ApiKey(id=key_id, team_id=team_id(session, team), secret_hash=_hash(key)))
    return key_id, key


def list_keys(session: Session) -> list[KeyInfo]:
    rows = session.execute(
        select(ApiKey, Team.name).join(Team, Team.id == ApiKey.team_id)
        .order_by(ApiKey.created_at, ApiKey.id)
    )
    return [KeyInfo(key.id, name, key.created_at.isoformat(), key.revoked_at is not None)
            for key, name in rows]


def revoke_key(session: Session, key_id: str) -> bool:
    """Revoke ``key_id``; False when there is no such key."""
    key = session.get(ApiKey, key_id)
    if key is None:
        return False
    if key.revoked_at is None:
        key.revoked_at = utcnow()
    return True


def keys_exist(session: Session) -> bool:
    """True once any key was created (revoked ones count: revoking never opens the service)."""
    return session.scalar(select(ApiKey.id).limit(1)) is not None


def caller(session: Session, key: str | None) -> Caller | None:
    """The caller a request's key identifies: None for a missing, wrong or revoked key while
    keys exist; the open team while none does."""
    if not keys_exist(session):
        return Caller(team_id(session, OPEN_TEAM), None)
    if not key:
        return None
    found = session.scalar(
        select(ApiKey).where(ApiKey.secret_hash == _hash(key), ApiKey.revoked_at.is_(None))
    )
    return None if found is None else Caller(found.team_id, found.id)
