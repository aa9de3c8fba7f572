"""Team data in a SQL database through SQLAlchemy 2, its schema kept by Alembic migrations.

:class:`Storage` owns the engine and hands out transactions; the repositories
(:mod:`.keys`, :mod:`.items`, :mod:`.studies`, :mod:`.jobs`) take a session and hold the
queries. The default database is an SQLite file in the Flask instance folder; any SQLAlchemy
URL (PostgreSQL for several service instances) may be given instead.
"""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

from sqlalchemy import create_engine, event, text
from sqlalchemy.engine import Engine
from sqlalchemy.orm import Session, sessionmaker

MIGRATIONS = Path(__file__).resolve().parent / "migrations"

SQLITE_BUSY_TIMEOUT = 30
"""s: how long an SQLite writer waits for another process's write lock."""


class Storage:
    """A database: engine, transactions and migrations.

    Args:
        url: SQLAlchemy URL (``sqlite:///path``, ``postgresql+psycopg://user@host/db``).
        schema: PostgreSQL schema to use (created if missing) instead of the user's default;
            lets several deployments, or test runs, share one database.
    """

    def __init__(self, url: str, schema: str | None = None):
        self.url = url
        self.schema = schema
        self.engine = _engine(url, schema)
        self._sessions = sessionmaker(self.engine, expire_on_commit=False)

    @contextmanager
    def transaction(self) -> Iterator[Session]:
        """A session whose work is committed on success and rolled back on any exception."""
        with self._sessions.begin() as session:
            yield session

    def migrate(self) -> None:
        """Bring the schema to the newest migration (a no-op when it is there already)."""
        from alembic import command
        from alembic.config import Config

        config = Config()
        config.set_main_option("script_location", str(MIGRATIONS))
        with self.engine.begin() as connection:
            if self.schema:
                connection.execute(text(f'CREATE SCHEMA IF NOT EXISTS "{self.schema}"'))
            config.attributes["connection"] = connection
            command.upgrade(config, "head")

    def dispose(self) -> None:
        self.engine.dispose()


def _engine(url: str, schema: str | None) -> Engine:
    if url.startswith("sqlite"):
        engine = create_engine(url, connect_args={"timeout": SQLITE_BUSY_TIMEOUT})

        @event.listens_for(engine, "connect")
        def _sqlite_pragmas(dbapi_connection, _record):
            # SQLAlchemy's recipe: the driver leaves transactions to the "begin" hook below.
            dbapi_connection.isolation_level = None
            # WAL: readers do not block the writer; FULL: a commit is on disk when it returns,
            # so a killed process loses nothing it acknowledged.
            cursor = dbapi_connection.cursor()
            cursor.execute("PRAGMA journal_mode=WAL")
            cursor.execute("PRAGMA synchronous=FULL")
            cursor.execute("PRAGMA foreign_keys=ON")
            cursor.close()

        @event.listens_for(engine, "begin")
        def _begin_immediate(connection):
            # Take the write lock at the start: a transaction that read a version then writes
            # cannot find its snapshot stale half-way (SQLite would refuse the write).
            connection.exec_driver_sql("BEGIN IMMEDIATE")

        return engine
    engine = create_engine(url, pool_pre_ping=True)
    if schema:
        @event.listens_for(engine, "connect")
        def _search_path(dbapi_connection, _record):
            cursor = dbapi_connection.cursor()
            cursor.execute(f'SET search_path TO "{schema}"')
            cursor.close()
            dbapi_connection.commit()

    return engine
