"""formwise keys create / list / revoke, and migrate, on SQLite and PostgreSQL."""

import pytest

from service.cli import EXIT_OK, EXIT_USAGE, main
from service.storage import Storage, keys


@pytest.fixture()
def database_env(database, monkeypatch):
    monkeypatch.setenv("FORMWISE_DATABASE_URL", database["DATABASE_URL"])
    if database["DATABASE_SCHEMA"]:
        monkeypatch.setenv("FORMWISE_DATABASE_SCHEMA", database["DATABASE_SCHEMA"])
    return database


def test_a_key_is_printed_once_listed_without_its_secret_and_revoked(database_env, capsys):
    assert main(["migrate"]) == EXIT_OK
    assert main(["keys", "create", "--team", "alpha"]) == EXIT_OK
    key = capsys.readouterr().out.splitlines()[-1]
    assert key.startswith("fw_")
    storage = Storage(database_env["DATABASE_URL"], database_env["DATABASE_SCHEMA"])
    try:
        with storage.transaction() as session:
            caller = keys.caller(session, key)
            assert caller is not None
        assert main(["keys", "list"]) == EXIT_OK
        listing = capsys.readouterr().out
        assert caller.key_id in listing and "alpha" in listing
        assert key.split("_", 2)[2] not in listing     # the secret may hold "_" itself
        assert main(["keys", "revoke", caller.key_id]) == EXIT_OK
        assert main(["keys", "revoke", "no-such-key"]) == EXIT_USAGE
        with storage.transaction() as session:
            assert keys.caller(session, key) is None
        assert main(["keys", "list"]) == EXIT_OK
        assert "revoked" in capsys.readouterr().out
    finally:
        storage.dispose()
