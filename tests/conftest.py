"""Shared fixtures: one app per test session (data load is the slow part), a client per test."""

import pytest

from service import create_app


@pytest.fixture(scope="session")
def app():
    return create_app({"TESTING": True})


@pytest.fixture()
def client(app):
    return app.test_client()
