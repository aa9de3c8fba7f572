"""The tables of team data: teams, API keys, versioned team items, studies and jobs.

SQLAlchemy 2 declarative models. The schema itself is created and changed only by the Alembic
migrations in ``service/storage/migrations`` (a test checks the two agree).
"""

from __future__ import annotations

import datetime as dt

from sqlalchemy import (
    JSON,
    BigInteger,
    Boolean,
    DateTime,
    ForeignKey,
    Integer,
    String,
    Text,
    TypeDecorator,
    UniqueConstraint,
)
from sqlalchemy.orm import DeclarativeBase, Mapped, mapped_column


def utcnow() -> dt.datetime:
    return dt.datetime.now(dt.UTC)


class UTCDateTime(TypeDecorator):
    """A UTC time, aware when read back (SQLite keeps no time zone)."""

    impl = DateTime(timezone=True)
    cache_ok = True

    def process_result_value(self, value, dialect):
        if value is not None and value.tzinfo is None:
            return value.replace(tzinfo=dt.UTC)
        return value


class Base(DeclarativeBase):
    pass


class Team(Base):
    """A group of users sharing materials, catalogues, studies and jobs."""

    __tablename__ = "teams"

    id: Mapped[int] = mapped_column(Integer, primary_key=True)
    name: Mapped[str] = mapped_column(String(100), unique=True)
    created_at: Mapped[dt.datetime] = mapped_column(UTCDateTime(), default=utcnow)


class ApiKey(Base):
    """An API key of a team. Only the SHA-256 of the secret key is stored."""

    __tablename__ = "api_keys"

    id: Mapped[str] = mapped_column(String(32), primary_key=True)
    team_id: Mapped[int] = mapped_column(ForeignKey("teams.id"))
    secret_hash: Mapped[str] = mapped_column(String(64), unique=True)
    created_at: Mapped[dt.datetime] = mapped_column(UTCDateTime(), default=utcnow)
    revoked_at: Mapped[dt.datetime | None] = mapped_column(UTCDateTime())


class Item(Base):
    """One version of a team material or catalogue.

    Versions are never changed or removed: an update adds the next version, a delete adds a
    version with ``deleted`` set. The current state of an item is its highest version.
    """

    __tablename__ = "items"
    __table_args__ = (UniqueConstraint("team_id", "kind", "slug", "version"),)

    id: Mapped[int] = mapped_column(Integer, primary_key=True)
    team_id: Mapped[int] = mapped_column(ForeignKey("teams.id"), index=True)
    kind: Mapped[str] = mapped_column(String(20))
    slug: Mapped[str] = mapped_column(String(100))
    version: Mapped[int] = mapped_column(Integer)
    body: Mapped[dict | None] = mapped_column(JSON)
    deleted: Mapped[bool] = mapped_column(Boolean, default=False)
    created_at: Mapped[dt.datetime] = mapped_column(UTCDateTime(), default=utcnow)


class Study(Base):
    """A stored request with its result, the versions of its inputs and the service version."""

    __tablename__ = "studies"

    id: Mapped[str] = mapped_column(String(32), primary_key=True)
    team_id: Mapped[int] = mapped_column(ForeignKey("teams.id"), index=True)
    kind: Mapped[str] = mapped_column(String(20))
    request: Mapped[dict] = mapped_column(JSON)
    result: Mapped[dict] = mapped_column(JSON)
    inputs: Mapped[dict] = mapped_column(JSON)
    service_version: Mapped[str] = mapped_column(String(40))
    rerun_of: Mapped[str | None] = mapped_column(String(32))
    created_at: Mapped[dt.datetime] = mapped_column(UTCDateTime(), default=utcnow)


class Job(Base):
    """A long request run in the background; its rows are in :class:`JobRow`."""

    __tablename__ = "jobs"

    id: Mapped[str] = mapped_column(String(32), primary_key=True)
    team_id: Mapped[int] = mapped_column(ForeignKey("teams.id"), index=True)
    key_id: Mapped[str | None] = mapped_column(String(32), index=True)
    kind: Mapped[str] = mapped_column(String(20))
    request: Mapped[dict] = mapped_column(JSON)
    inputs: Mapped[dict] = mapped_column(JSON)
    status: Mapped[str] = mapped_column(String(20), index=True)
    done: Mapped[int] = mapped_column(Integer, default=0)
    total: Mapped[int] = mapped_column(Integer)
    columns: Mapped[list | None] = mapped_column(JSON)
    error: Mapped[str | None] = mapped_column(Text)
    attempts: Mapped[int] = mapped_column(Integer, default=0)
    worker: Mapped[str | None] = mapped_column(String(64))
    heartbeat_at: Mapped[dt.datetime | None] = mapped_column(UTCDateTime())
    created_at: Mapped[dt.datetime] = mapped_column(UTCDateTime(), default=utcnow)
    finished_at: Mapped[dt.datetime | None] = mapped_column(UTCDateTime())


class JobRow(Base):
    """One row of a job's result table, in order (``seq``), with the case it belongs to."""

    __tablename__ = "job_rows"

    id: Mapped[int] = mapped_column(BigInteger().with_variant(Integer, "sqlite"),
                                    primary_key=True)
    job_id: Mapped[str] = mapped_column(ForeignKey("jobs.id", ondelete="CASCADE"))
    seq: Mapped[int] = mapped_column(Integer)
    case: Mapped[int] = mapped_column(Integer)
    row: Mapped[list] = mapped_column(JSON)

    __table_args__ = (UniqueConstraint("job_id", "seq"),)
