"""Team data over HTTP on SQLite and PostgreSQL: keys, team materials and catalogues,
studies, jobs, limits; isolation between two teams on every resource; a restart keeps all."""

import io
import json
import time
import uuid

import pandas as pd
import pytest

from service import create_app
from service.formats import read_csv_table
from service.storage import keys

# Demo material: invented values, not a real alloy's (test data only).
DEMO = {
    "id": "demo_tube_alloy", "name": "Demo tube alloy (invented test data)",
    "family": "aluminium",
    "properties": {
        "density": {"low": 2600, "high": 2800},
        "youngs_modulus": {"low": "68 GPa", "high": "72 GPa"},
        "shear_modulus": {"low": "25.5 GPa", "high": "27 GPa"},
        "poisson_ratio": {"low": 0.32, "high": 0.34},
        "strength": {"low": "240 MPa", "high": "280 MPa"},
        "price": {"low": 2.0, "high": 3.0},
        "embodied_carbon": {"low": 8.0, "high": 12.0},
    },
    "forms": ["round_tube"],
}
# Demo catalogue: invented tube sizes.
CATALOG = {"id": "demo_tubes", "name": "Demo supplier tubes (invented)", "members": [
    {"designation": "T60x3", "family": "round_tube",
     "dimensions": {"outer_diameter": "60 mm", "wall": "3 mm"}},
    {"designation": "T90x4", "family": "round_tube",
     "dimensions": {"outer_diameter": "90 mm", "wall": "4 mm"}}]}
DESIGN = {
    "load_case": {"type": "cantilever_end_load", "span": 1.5, "load": 2000.0},
    "requirements": {"max_deflection": 0.01, "safety_factor": 1.5},
    "envelope": {"max_depth": 0.1},
    "sections": ["round_tube"],
    "materials": {"ids": ["demo_tube_alloy", "al_6061_t6"]},
}
SWEEP = {"base": {**DESIGN, "sections": ["round_tube", "solid_round"],
                  "materials": {"ids": ["al_6061_t6", "s355j2"]}},
         "grid": {"load_case.span": [0.8, 1.2, 1.5], "load_case.load": [500, 2000, 4000]},
         "top": 2}
TEAM_SWEEP = {**SWEEP, "base": {**SWEEP["base"], "materials": DESIGN["materials"]}}


REDIS_URL = "redis://127.0.0.1:6379/0"


def _stiffer(factor):
    """DEMO with its moduli scaled (Poisson's ratio, so the isotropy check, unchanged)."""
    material = json.loads(json.dumps(DEMO))
    for prop, (low, high) in (("youngs_modulus", (68, 72)), ("shear_modulus", (25.5, 27))):
        material["properties"][prop] = {"low": f"{low * factor} GPa",
                                         "high": f"{high * factor} GPa"}
    return material


@pytest.fixture()
def make_app(database, tmp_path):
    """Apps on the test's database; their job consumers stopped and connections closed after."""
    apps = []

    def make(**config):
        app = create_app({"TESTING": True, **database, "JOBS_WORKER": False,
                          "QUEUE_URL": str(tmp_path / "queue.db"), **config})
        apps.append(app)
        return app

    yield make
    for app in apps:
        app.extensions["formwise_jobs"].stop()
        app.extensions["formwise_storage"].dispose()


@pytest.fixture()
def teams(make_app):
    """An app with a key for team alpha and one for team beta: (app, alpha, beta headers)."""
    app = make_app()
    with app.extensions["formwise_storage"].transaction() as session:
        _, alpha = keys.create_key(session, "alpha")
        _, beta = keys.create_key(session, "beta")
    return app, {"Authorization": f"Bearer {alpha}"}, {"Authorization": f"Bearer {beta}"}


def _run_queued_jobs(app):
    """Run the jobs the way a consumer does, without its threads."""
    queue = app.extensions["formwise_jobs"]
    while (task := queue.huey.dequeue()) is not None:
        queue.huey.execute(task)


def test_open_without_keys_and_closed_with_one(make_app):
    app = make_app()
    client = app.test_client()
    assert client.post("/v1/materials", json=DEMO).status_code == 201
    with app.extensions["formwise_storage"].transaction() as session:
        key_id, key = keys.create_key(session, "alpha")
    for headers in ({}, {"Authorization": "Bearer fw_nope_nope"}, {"Authorization": key}):
        response = client.get("/v1/materials", headers=headers)
        assert response.status_code == 401
        assert response.content_type == "application/problem+json"
        assert "alpha" not in response.get_data(as_text=True)
        assert response.headers["WWW-Authenticate"].startswith("Bearer")
    good = {"Authorization": f"Bearer {key}"}
    assert client.get("/v1/materials", headers=good).status_code == 200
    assert client.get("/v1/health").status_code == 200  # probes need no key
    with app.extensions["formwise_storage"].transaction() as session:
        keys.revoke_key(session, key_id)
    assert client.get("/v1/materials", headers=good).status_code == 401


def test_team_material_lifecycle_with_etags(teams):
    app, alpha, _ = teams
    client = app.test_client()
    created = client.post("/v1/materials", json=DEMO, headers=alpha)
    assert created.status_code == 201, created.get_json()
    assert created.headers["Location"] == "/v1/materials/demo_tube_alloy"
    assert created.get_json()["properties"]["youngs_modulus"]["low"] == 68e9
    assert client.post("/v1/materials", json=DEMO, headers=alpha).status_code == 409
    got = client.get("/v1/materials/demo_tube_alloy", headers=alpha)
    assert got.status_code == 200 and got.headers["ETag"] == created.headers["ETag"]
    listed = client.get("/v1/materials", headers=alpha).get_json()
    assert "demo_tube_alloy" in [m["id"] for m in listed["materials"]]

    stiffer = _stiffer(1.25)
    url = "/v1/materials/demo_tube_alloy"
    assert client.put(url, json=stiffer, headers=alpha).status_code == 428
    assert client.put(url, json=stiffer, headers={**alpha, "If-Match": '"7"'}).status_code == 412
    updated = client.put(url, json=stiffer, headers={**alpha, "If-Match": got.headers["ETag"]})
    assert updated.status_code == 200 and updated.headers["ETag"] != got.headers["ETag"]
    # The second writer that read the same version is refused, not silently lost.
    late = client.put(url, json=DEMO, headers={**alpha, "If-Match": got.headers["ETag"]})
    assert late.status_code == 412
    assert client.get(url, headers=alpha).get_json()["properties"]["youngs_modulus"]["low"] \
        == 85e9
    assert client.delete(url, headers={**alpha, "If-Match": updated.headers["ETag"]}) \
        .status_code == 204
    assert client.get(url, headers=alpha).status_code == 404


def test_a_bad_material_is_refused_at_its_field_and_stores_nothing(teams):
    app, alpha, _ = teams
    client = app.test_client()
    bad = json.loads(json.dumps(DEMO))
    bad["properties"]["density"] = {"low": 2800, "high": 2600}
    response = client.post("/v1/materials", json=bad, headers=alpha)
    assert response.status_code == 422
    assert any(path.startswith("properties.density") for path in response.get_json()["errors"])
    builtin = client.post("/v1/materials", json={**DEMO, "id": "al_6061_t6"}, headers=alpha)
    assert builtin.status_code == 422 and "id" in builtin.get_json()["errors"]
    assert client.get("/v1/materials/demo_tube_alloy", headers=alpha).status_code == 404


def test_team_material_and_catalogue_are_used_by_id(teams):
    app, alpha, _ = teams
    client = app.test_client()
    client.post("/v1/materials", json=DEMO, headers=alpha)
    assert client.post("/v1/catalogs", json=CATALOG, headers=alpha).status_code == 201
    designs = client.post("/v1/designs", json=DESIGN, headers=alpha).get_json()["designs"]
    assert "demo_tube_alloy" in {d["material"]["id"] for d in designs}
    light = {**DESIGN, "load_case": {**DESIGN["load_case"], "load": 500.0}}
    from_catalog = client.post("/v1/designs", json={**light, "catalog": "demo_tubes"},
                               headers=alpha).get_json()["designs"]
    assert from_catalog
    assert {d["section"]["designation"] for d in from_catalog} <= {"T60x3", "T90x4"}
    ranking = client.post("/v1/rankings", headers=alpha, json={
        "loading": "bending", "limit": "stiffness", "objective": "mass",
        "materials": {"ids": ["demo_tube_alloy"]}})
    assert ranking.status_code == 200
    assert {r["material"]["id"] for r in ranking.get_json()["results"]} == {"demo_tube_alloy"}
    sweep = client.post("/v1/sweeps", json=TEAM_SWEEP, headers=alpha).get_json()
    assert "demo_tube_alloy" in {row[sweep["columns"].index("material_id")]
                                 for row in sweep["rows"]}
    catalogs = client.get("/v1/catalogs", headers=alpha).get_json()["catalogs"]
    assert {"chs_en10219", "demo_tubes"} <= {c["id"] for c in catalogs}


def test_a_catalogue_member_is_checked_like_its_family(teams):
    app, alpha, _ = teams
    bad = json.loads(json.dumps(CATALOG))
    bad["members"][1]["dimensions"]["wall"] = "50 mm"  # thicker than half the tube
    response = app.test_client().post("/v1/catalogs", json=bad, headers=alpha)
    assert response.status_code == 422
    assert list(response.get_json()["errors"]) == ["members.1.dimensions.wall"]


def test_teams_never_see_each_others_objects(teams):
    app, alpha, beta = teams
    client = app.test_client()
    client.post("/v1/materials", json=DEMO, headers=alpha)
    client.post("/v1/catalogs", json=CATALOG, headers=alpha)
    study = client.post("/v1/studies", json={"kind": "designs", "request": DESIGN},
                        headers=alpha).get_json()
    job = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP},
                      headers=alpha).get_json()
    etag = {"If-Match": '"1"'}
    for method, url, body in [
        ("get", "/v1/materials/demo_tube_alloy", None),
        ("put", "/v1/materials/demo_tube_alloy", DEMO),
        ("delete", "/v1/materials/demo_tube_alloy", None),
        ("get", "/v1/catalogs/demo_tubes", None),
        ("put", "/v1/catalogs/demo_tubes", CATALOG),
        ("delete", "/v1/catalogs/demo_tubes", None),
        ("get", f"/v1/studies/{study['id']}", None),
        ("post", f"/v1/studies/{study['id']}/rerun", None),
        ("delete", f"/v1/studies/{study['id']}", None),
        ("get", f"/v1/jobs/{job['id']}", None),
        ("get", f"/v1/jobs/{job['id']}/result", None),
        ("delete", f"/v1/jobs/{job['id']}", None),
    ]:
        response = getattr(client, method)(url, json=body, headers={**beta, **etag})
        assert response.status_code == 404, (method, url, response.get_json())
    assert "demo_tube_alloy" not in [
        m["id"] for m in client.get("/v1/materials", headers=beta).get_json()["materials"]]
    assert "demo_tubes" not in [
        c["id"] for c in client.get("/v1/catalogs", headers=beta).get_json()["catalogs"]]
    assert client.get("/v1/studies", headers=beta).get_json()["count"] == 0
    assert client.get("/v1/jobs", headers=beta).get_json() == {"count": 0, "jobs": []}
    assert [j["id"] for j in client.get("/v1/jobs", headers=alpha).get_json()["jobs"]] \
        == [job["id"]]
    refused = client.post("/v1/designs", json=DESIGN, headers=beta)
    assert refused.status_code == 422 and "materials.ids.0" in refused.get_json()["errors"]
    # beta may use the same ids for its own objects.
    assert client.post("/v1/materials", json=DEMO, headers=beta).status_code == 201
    assert client.get(f"/v1/studies/{study['id']}", headers=alpha).status_code == 200


def test_a_study_keeps_its_versions_and_a_rerun_says_what_changed(teams):
    app, alpha, _ = teams
    client = app.test_client()
    created = client.post("/v1/materials", json=DEMO, headers=alpha)
    response = client.post("/v1/studies", json={"kind": "designs", "request": DESIGN},
                           headers=alpha)
    assert response.status_code == 201
    study = response.get_json()
    assert study["inputs"]["materials"] == {"demo_tube_alloy": 1}
    assert study["result"] == client.post("/v1/designs", json=DESIGN, headers=alpha).get_json()
    same = client.post(f"/v1/studies/{study['id']}/rerun", headers=alpha).get_json()
    assert same["changed_inputs"] == [] and not same["result_changed"]

    stiffer = _stiffer(2)
    client.put("/v1/materials/demo_tube_alloy", json=stiffer,
               headers={**alpha, "If-Match": created.headers["ETag"]})
    rerun = client.post(f"/v1/studies/{study['id']}/rerun", headers=alpha)
    assert rerun.status_code == 201
    changes = rerun.get_json()
    assert changes["changed_inputs"] == [
        {"input": "materials", "id": "demo_tube_alloy", "before": 1, "after": 2}]
    assert changes["result_changed"] and changes["difference_count"] > 0
    assert changes["study"]["rerun_of"] == study["id"]
    # The old study still holds the values it was computed with.
    assert client.get(f"/v1/studies/{study['id']}", headers=alpha).get_json()["result"] \
        == study["result"]
    listed = client.get("/v1/studies", headers=alpha).get_json()
    assert listed["count"] == 3  # the study and its two reruns
    assert client.delete(f"/v1/studies/{study['id']}", headers=alpha).status_code == 204
    assert client.get(f"/v1/studies/{study['id']}", headers=alpha).status_code == 404


def test_a_study_request_is_checked_like_its_endpoint(teams):
    app, alpha, _ = teams
    bad = {**DESIGN, "load_case": {**DESIGN["load_case"], "span": "3 kg"}}
    response = app.test_client().post("/v1/studies", json={"kind": "designs", "request": bad},
                                      headers=alpha)
    assert response.status_code == 422
    assert list(response.get_json()["errors"]) == ["request.load_case.span"]
    assert app.test_client().get("/v1/studies", headers=alpha).get_json()["count"] == 0


def test_a_job_equals_the_same_sweep_run_at_once_in_every_format(teams):
    app, alpha, _ = teams
    client = app.test_client()
    client.post("/v1/materials", json=DEMO, headers=alpha)
    posted = client.post("/v1/jobs", json={"kind": "sweeps", "request": TEAM_SWEEP}, headers=alpha)
    assert posted.status_code == 202
    url = posted.headers["Location"]
    assert client.get(url, headers=alpha).get_json()["status"] == "queued"
    assert client.get(url + "/result", headers=alpha).status_code == 409
    app.config["JOB_CHUNK_CASES"] = 4  # several chunks, the last one short
    _run_queued_jobs(app)
    status = client.get(url, headers=alpha).get_json()
    assert status["status"] == "done" and status["progress"] == {"done": 9, "total": 9}

    direct = client.post("/v1/sweeps", json=TEAM_SWEEP, headers=alpha).get_json()
    table = client.get(url + "/result", headers=alpha).get_json()
    assert table["columns"] == direct["columns"] and table["cases"] == direct["cases"]
    assert table["rows"] == direct["rows"]
    csv_direct = client.post("/v1/sweeps", json=TEAM_SWEEP, headers={**alpha, "Accept": "text/csv"})
    csv_job = client.get(url + "/result", headers={**alpha, "Accept": "text/csv"})
    assert read_csv_table(csv_job.get_data(as_text=True)) == \
        read_csv_table(csv_direct.get_data(as_text=True))
    ndjson = client.get(url + "/result", headers={**alpha, "Accept": "application/x-ndjson"})
    lines = [json.loads(line) for line in ndjson.get_data(as_text=True).splitlines()]
    assert [list(line.values()) for line in lines] == direct["rows"]
    parquet = client.get(url + "/result",
                         headers={**alpha, "Accept": "application/vnd.apache.parquet"})
    frame = pd.read_parquet(io.BytesIO(parquet.get_data()))
    assert list(frame.columns) == direct["columns"] and len(frame) == len(direct["rows"])
    assert client.get(url + "/result", headers={**alpha, "Accept": "image/png"}).status_code \
        == 406


def test_jobs_are_listed_newest_first_and_by_status(teams):
    app, alpha, _ = teams
    client = app.test_client()
    first = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP},
                        headers=alpha).get_json()
    _run_queued_jobs(app)
    second = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP},
                         headers=alpha).get_json()
    listed = client.get("/v1/jobs", headers=alpha).get_json()
    assert listed["count"] == 2
    assert [j["id"] for j in listed["jobs"]] == [second["id"], first["id"]]
    done = client.get("/v1/jobs?status=done", headers=alpha).get_json()["jobs"]
    assert [(j["id"], j["result"]) for j in done] == \
        [(first["id"], f"/v1/jobs/{first['id']}/result")]
    bad = client.get("/v1/jobs?status=finished", headers=alpha)
    assert bad.status_code == 422 and "status" in bad.get_json()["errors"]


def test_a_job_on_a_dask_cluster_equals_the_same_sweep_run_at_once(make_app):
    distributed = pytest.importorskip("dask.distributed")
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=False,
                                  dashboard_address=None) as cluster:
        app = make_app(DASK_SCHEDULER=cluster.scheduler_address, JOB_CHUNK_CASES=4)
        client = app.test_client()
        url = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP}).headers[
            "Location"]
        _run_queued_jobs(app)
    assert client.get(url).get_json()["status"] == "done"
    assert client.get(url + "/result").get_json()["rows"] == \
        client.post("/v1/sweeps", json=SWEEP).get_json()["rows"]


def test_a_job_whose_dask_scheduler_is_gone_fails_with_its_id(make_app):
    dask = pytest.importorskip("dask")
    pytest.importorskip("dask.distributed")
    app = make_app(DASK_SCHEDULER="tcp://127.0.0.1:9", JOB_CHUNK_CASES=4)  # nothing listens
    client = app.test_client()
    url = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP}).headers["Location"]
    with dask.config.set({"distributed.comm.timeouts.connect": "1s"}):
        _run_queued_jobs(app)
    status = client.get(url).get_json()
    assert status["status"] == "failed" and status["id"] in status["error"]
    assert status["progress"]["done"] == 0


def test_a_bad_job_request_is_refused_at_its_path_and_a_cancelled_job_never_runs(teams):
    app, alpha, _ = teams
    client = app.test_client()
    client.post("/v1/materials", json=DEMO, headers=alpha)
    bad = client.post("/v1/jobs", headers=alpha, json={
        "kind": "sweeps", "request": {**SWEEP, "grid": {"load_case.nothing": [1]}}})
    assert bad.status_code == 422
    assert all(p.startswith("request.") for p in bad.get_json()["errors"])
    url = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP},
                      headers=alpha).headers["Location"]
    assert client.delete(url, headers=alpha).get_json()["status"] == "cancelled"
    _run_queued_jobs(app)
    status = client.get(url, headers=alpha).get_json()
    assert status["status"] == "cancelled" and status["progress"]["done"] == 0


def _redis_answers() -> bool:
    import redis

    try:
        return bool(redis.Redis.from_url(REDIS_URL, socket_connect_timeout=2).ping())
    except redis.RedisError:
        return False


def _queue_settings(queue, database):
    """Queue settings of a queue of its own (other test runs may share the servers)."""
    if queue == "sqlite":
        return {}
    name = {"QUEUE_NAME": f"formwise-test-{uuid.uuid4().hex}"}
    if queue == "redis":
        if not _redis_answers():
            pytest.skip(f"no Redis answers at {REDIS_URL}")
        return {"QUEUE_URL": REDIS_URL, **name}
    if not database["DATABASE_SCHEMA"]:
        pytest.skip("the PostgreSQL queue is tested with the PostgreSQL database")
    # In the test's schema, so its tables go with it.
    options = f"?options=-csearch_path%3D{database['DATABASE_SCHEMA']}"
    return {"QUEUE_URL": database["DATABASE_URL"] + options, **name}


@pytest.mark.parametrize("queue", ["sqlite", "redis", "postgresql"])
def test_the_embedded_worker_runs_jobs_in_the_service_process(make_app, database, queue):
    client = make_app(JOBS_WORKER=True, **_queue_settings(queue, database)).test_client()
    url = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP}).headers["Location"]
    deadline = time.monotonic() + 60
    while client.get(url).get_json()["status"] in ("queued", "running"):
        assert time.monotonic() < deadline, "the embedded worker did not finish the job"
        time.sleep(0.1)
    assert client.get(url).get_json()["status"] == "done"


def test_a_restart_keeps_keys_materials_catalogues_studies_and_jobs(teams, make_app):
    app, alpha, _ = teams
    client = app.test_client()
    client.post("/v1/materials", json=DEMO, headers=alpha)
    client.post("/v1/catalogs", json=CATALOG, headers=alpha)
    study = client.post("/v1/studies", json={"kind": "designs", "request": DESIGN},
                        headers=alpha).get_json()
    job_url = client.post("/v1/jobs", json={"kind": "sweeps", "request": SWEEP},
                          headers=alpha).headers["Location"]
    _run_queued_jobs(app)

    again = make_app().test_client()
    assert again.get("/v1/materials/demo_tube_alloy").status_code == 401  # still closed
    assert again.get("/v1/materials/demo_tube_alloy", headers=alpha).status_code == 200
    assert again.get("/v1/catalogs/demo_tubes", headers=alpha).status_code == 200
    assert again.get(f"/v1/studies/{study['id']}", headers=alpha).get_json()["result"] \
        == study["result"]
    assert again.get(job_url, headers=alpha).get_json()["status"] == "done"
    assert len(again.get(job_url + "/result", headers=alpha).get_json()["rows"]) == 18


def test_limits_per_key_answer_429_with_retry_after(make_app):
    app = make_app(RATE_LIMIT="3 per minute", MAX_ACTIVE_JOBS=1)
    with app.extensions["formwise_storage"].transaction() as session:
        alpha = {"Authorization": f"Bearer {keys.create_key(session, 'alpha')[1]}"}
        beta = {"Authorization": f"Bearer {keys.create_key(session, 'beta')[1]}"}
    client = app.test_client()
    job = {"kind": "sweeps", "request": SWEEP}
    assert client.post("/v1/jobs", json=job, headers=alpha).status_code == 202
    busy = client.post("/v1/jobs", json=job, headers=alpha)
    assert busy.status_code == 429 and int(busy.headers["Retry-After"]) > 0
    assert client.get("/v1/catalogs", headers=alpha).status_code == 200
    limited = client.get("/v1/catalogs", headers=alpha)
    assert limited.status_code == 429 and int(limited.headers["Retry-After"]) > 0
    assert limited.content_type == "application/problem+json"
    assert client.get("/v1/catalogs", headers=beta).status_code == 200  # per key


def test_cors_is_off_by_default_and_follows_the_allow_list(make_app):
    origin = {"Origin": "https://dash.example.org"}
    closed = make_app().test_client().get("/v1/health", headers=origin)
    assert "Access-Control-Allow-Origin" not in closed.headers
    client = make_app(CORS_ORIGINS=("https://dash.example.org",)).test_client()
    assert client.get("/v1/health", headers=origin).headers[
        "Access-Control-Allow-Origin"] == "https://dash.example.org"
    other = client.get("/v1/health", headers={"Origin": "https://elsewhere.example.org"})
    assert "Access-Control-Allow-Origin" not in other.headers
    preflight = client.options("/v1/materials", headers={
        **origin, "Access-Control-Request-Method": "POST",
        "Access-Control-Request-Headers": "Authorization, Content-Type"})
    assert preflight.status_code == 200
    assert "Authorization" in preflight.headers["Access-Control-Allow-Headers"]


@pytest.mark.parametrize("kind", ["designs", "rankings", "sweeps"])
def test_a_study_of_each_kind_stores_what_its_endpoint_answers(teams, kind):
    app, alpha, _ = teams
    client = app.test_client()
    request = {"designs": DESIGN | {"materials": SWEEP["base"]["materials"]},
               "sweeps": SWEEP,
               "rankings": {"loading": "bending", "limit": "stiffness", "objective": "mass"}}[kind]
    study = client.post("/v1/studies", json={"kind": kind, "request": request}, headers=alpha)
    assert study.status_code == 201
    assert study.get_json()["result"] == client.post(f"/v1/{kind}", json=request,
                                                     headers=alpha).get_json()
