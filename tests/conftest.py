"""Shared fixtures: one app per test session (data load is the slow part), a client per test."""

import threading

import pytest
from werkzeug.serving import make_server

from service import create_app


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
