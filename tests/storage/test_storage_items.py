"""Versioned team items, keys and migrations on SQLite and PostgreSQL."""

import threading

import pytest
from alembic.autogenerate import compare_metadata
from alembic.migration import MigrationContext
from sqlalchemy import select

from service.storage import Storage, items, keys
from service.storage.models import ApiKey, Base


@pytest.fixture()
def storage(database):
    store = Storage(database["DATABASE_URL"], database["DATABASE_SCHEMA"])
    store.migrate()
    yield store
    store.dispose()


def test_migrations_build_the_models_schema_and_run_twice(storage):
    storage.migrate()  # a second start finds the schema current
    with storage.engine.connect() as connection:
        context = MigrationContext.configure(connection)
        assert compare_metadata(context, Base.metadata) == []


def test_a_key_is_stored_only_as_its_hash_and_revoking_closes_it(storage):
    with storage.transaction() as session:
        assert keys.caller(session, None).key_id is None  # no key: open, one user
        key_id, key = keys.create_key(session, "alpha")
    with storage.transaction() as session:
        stored = session.scalars(select(ApiKey)).one()
        assert key not in (stored.id, stored.secret_hash) and key_id == stored.id
        assert keys.caller(session, key).key_id == key_id
        assert keys.caller(session, key + "x") is None
        assert keys.caller(session, None) is None  # keys exist: the service is closed
        assert keys.revoke_key(session, key_id) and not keys.revoke_key(session, "nokey")
    with storage.transaction() as session:
        assert keys.caller(session, key) is None
        assert [k.revoked for k in keys.list_keys(session)] == [True]


def test_versions_are_kept_and_a_stale_writer_is_refused(storage):
    with storage.transaction() as session:
        team = keys.team_id(session, "alpha")
        other = keys.team_id(session, "beta")
        assert items.create(session, team, items.MATERIAL, "m", {"v": 1}) == 1
    with storage.transaction() as session:
        assert items.update(session, team, items.MATERIAL, "m", {"v": 2}, expected=1) == 2
        with pytest.raises(items.StaleVersion) as stale:
            items.update(session, team, items.MATERIAL, "m", {"v": 3}, expected=1)
        assert stale.value.current == 2
        with pytest.raises(items.Conflict):
            items.create(session, team, items.MATERIAL, "m", {"v": 9})
        assert items.get(session, other, items.MATERIAL, "m") is None
        assert items.update(session, other, items.MATERIAL, "m", {}, expected=2) is None
    with storage.transaction() as session:
        assert items.update(session, team, items.MATERIAL, "m", None, expected=2) == 3
    with storage.transaction() as session:
        assert items.current(session, team, items.MATERIAL) == []
        old = items.at_versions(session, team, items.MATERIAL, {"m": 1})
        assert [(v.version, v.body) for v in old] == [(1, {"v": 1})]
        # Created again after its deletion: the versions go on, so no ETag repeats.
        assert items.create(session, team, items.MATERIAL, "m", {"v": 4}) == 4


def test_of_two_writers_of_the_same_version_one_wins_and_one_conflicts(storage):
    with storage.transaction() as session:
        team = keys.team_id(session, "alpha")
        items.create(session, team, items.CATALOG, "c", {"v": 1})
    outcomes, barrier = [], threading.Barrier(2)

    def write(value):
        # Both read version 1 and write version 2 at once. PostgreSQL lets both in and the
        # unique version refuses the second (Conflict); SQLite serialises the transactions
        # at their first statement, so the second reads version 2 (StaleVersion).
        try:
            with storage.transaction() as session:
                barrier.wait(timeout=10)
                outcomes.append(items.update(session, team, items.CATALOG, "c", {"v": value},
                                             expected=1))
        except (items.Conflict, items.StaleVersion) as error:
            outcomes.append(type(error).__name__)

    threads = [threading.Thread(target=write, args=(v,)) for v in (2, 3)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join()
    assert sorted(map(str, outcomes)) in (["2", "Conflict"], ["2", "StaleVersion"])
    with storage.transaction() as session:
        assert [v.version for v in items.current(session, team, items.CATALOG)] == [2]
