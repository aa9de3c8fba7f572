"""Shared fixtures: one app per test session (data load is the slow part), a client per test.

Every app the tests build keeps its team data in a temporary folder, never in the instance
folder a developer's service uses (whose keys would close the service to the tests), and runs
no job consumer unless a test asks for one.
"""

import os
import shutil
import tempfile
import threading

import pytest
from werkzeug.serving import make_server

from service import create_app

_TEAM_DATA = tempfile.mkdtemp(prefix="formwise-tests-")
os.environ["FORMWISE_DATABASE_URL"] = f"sqlite:///{_TEAM_DATA}/formwise.db"
os.environ["FORMWISE_QUEUE_URL"] = f"{_TEAM_DATA}/queue.db"
os.environ["FORMWISE_JOBS_WORKER"] = "0"


def pytest_sessionfinish(session, exitstatus):
    shutil.rmtree(_TEAM_DATA, ignore_errors=True)


@pytest.fixture(scope="session")
def app():
    return create_app({"TESTING": True})


@pytest.fixture()
def client(app):
    return app.test_client()


@pytest.fixture(scope="module")
def live_url(app):
    """The app served on a free loopback port, for clients that speak real HTTP."""
    server = make_server("127.0.0.1", 0, app, threaded=True)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    yield f"http://127.0.0.1:{server.server_port}"
    server.shutdown()
    thread.join(timeout=10)


POSTGRES_URL = os.environ.get(
    "FORMWISE_TEST_POSTGRES_URL", "postgresql+psycopg://postgres@127.0.0.1:5432/test")
"""The PostgreSQL server the storage tests also run on when it answers (trust auth)."""


def _postgres_answers() -> bool:
    if not hasattr(_postgres_answers, "answer"):
        from sqlalchemy import create_engine, text

        engine = create_engine(POSTGRES_URL, connect_args={"connect_timeout": 2})
        try:
            with engine.connect() as connection:
                connection.execute(text("SELECT 1"))
            _postgres_answers.answer = True
        except Exception:
            _postgres_answers.answer = False
        engine.dispose()
    return _postgres_answers.answer


@pytest.fixture(params=["sqlite", "postgresql"])
def database(request, tmp_path):
    """Settings of an empty database: an SQLite file, or a schema of its own on the
    PostgreSQL server (others share that server), dropped afterwards."""
    if request.param == "sqlite":
        yield {"DATABASE_URL": f"sqlite:///{tmp_path}/team.db", "DATABASE_SCHEMA": None}
        return
    if not _postgres_answers():
        pytest.skip(f"no PostgreSQL server answers at {POSTGRES_URL}")
    import uuid

    from sqlalchemy import create_engine, text

    schema = f"formwise_test_{uuid.uuid4().hex[:12]}"
    yield {"DATABASE_URL": POSTGRES_URL, "DATABASE_SCHEMA": schema}
    engine = create_engine(POSTGRES_URL)
    with engine.begin() as connection:
        connection.execute(text(f'DROP SCHEMA IF EXISTS "{schema}" CASCADE'))
    engine.dispose()
