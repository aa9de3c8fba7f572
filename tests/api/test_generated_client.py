"""A client generated from schemas/openapi.json by a general-purpose generator calls every
operation of the document.

openapi-python-client (the generator schemas/README.md names for Python plugin authors)
writes a typed client into a temporary folder; every operation is then called through it,
against a fresh app on its own database, with its body built by the generated model's
``from_dict`` and its answer parsed by the generated code. An operation the document gains
without an entry in CALLS fails :func:`test_every_operation_is_called`.
"""

from __future__ import annotations

import importlib
import json
import pkgutil
import re
import subprocess
import sys
import typing
from pathlib import Path

import httpx
import pytest

from service import create_app

DOCUMENT = Path(__file__).resolve().parents[2] / "schemas" / "openapi.json"
PACKAGE = "formwise_generated_client"
BINARY_MEDIA = ("image/svg+xml", "image/png")

DESIGN = {
    "load_case": {"type": "cantilever_end_load", "span": 1.5, "load": "2 kN"},
    "requirements": {"max_deflection": "10 mm", "safety_factor": 1.5},
    "envelope": {"max_depth": "100 mm"},
    "sections": ["round_tube"],
    "materials": {"ids": ["s355j2", "al_6061_t6"]},
}
SWEEP = {"base": DESIGN, "grid": {"load_case.span": ["1 m", "1.5 m"]}}
# Demo material and catalogue: invented values, for the calls only.
MATERIAL = {
    "id": "demo_client_alloy", "name": "Demo alloy (invented)", "family": "aluminium",
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
CATALOG = {"id": "demo_client_tubes", "name": "Demo tubes (invented)", "members": [
    {"designation": "T60x3", "family": "round_tube",
     "dimensions": {"outer_diameter": "60 mm", "wall": "3 mm"}}]}

# operationId -> (path parameters, body, query parameters, If-Match of a stored item),
# in the order they are called (creations before reads, updates and deletions).
CALLS: list[tuple[str, dict, dict | None, dict]] = [
    ("getHealth", {}, None, {}),
    ("getMaterials", {}, None, {"family": ["steel"]}),
    ("getMaterialById", {"material_id": "s355j2"}, None, {}),
    ("getSections", {}, None, {}),
    ("postSectionProperties", {}, {"family": "round_tube",
                                   "dimensions": {"outer_diameter": "50 mm", "wall": "3 mm"}},
     {}),
    ("postRankings", {}, {"loading": "bending", "limit": "stiffness", "objective": "mass",
                          "top": 5}, {}),
    ("postDesigns", {}, DESIGN, {}),
    ("postSweeps", {}, SWEEP, {}),
    ("postTeamMaterials", {}, MATERIAL, {}),
    ("putTeamMaterialById", {"material_id": MATERIAL["id"]}, MATERIAL, {}),
    ("getCatalogs", {}, None, {}),
    ("postCatalogs", {}, CATALOG, {}),
    ("getCatalogById", {"catalog_id": CATALOG["id"]}, None, {}),
    ("putCatalogById", {"catalog_id": CATALOG["id"]}, CATALOG, {}),
    ("postPropertyChart", {}, {"x": "density", "y": "youngs_modulus"}, {}),
    ("postDesignChart", {}, {"request": DESIGN}, {}),
    ("postSectionDrawing", {}, {"family": "round_tube",
                                "dimensions": {"outer_diameter": "50 mm", "wall": "3 mm"}},
     {}),
    ("postSweepChart", {}, {"request": SWEEP, "x": "load_case.span"}, {}),
    ("postStudies", {}, {"kind": "designs", "request": DESIGN}, {}),
    ("getStudies", {}, None, {}),
    ("getStudyById", {"study_id": "<study>"}, None, {}),
    ("postStudyRerun", {"study_id": "<study>"}, None, {}),
    ("deleteStudyById", {"study_id": "<study>"}, None, {}),
    ("postJobs", {}, {"kind": "sweeps", "request": SWEEP}, {}),
    ("getJobs", {}, None, {}),
    ("getJobById", {"job_id": "<job>"}, None, {}),
    ("getJobResult", {"job_id": "<job>"}, None, {}),
    ("deleteJobById", {"job_id": "<job>"}, None, {}),
    ("deleteCatalogById", {"catalog_id": CATALOG["id"]}, None, {}),
    ("deleteTeamMaterialById", {"material_id": MATERIAL["id"]}, None, {}),
]


def _snake(operation_id: str) -> str:
    return re.sub(r"(?<!^)(?=[A-Z])", "_", operation_id).lower()


@pytest.fixture(scope="module")
def generated(tmp_path_factory):
    """The generated package's operation modules, by operationId."""
    folder = tmp_path_factory.mktemp("client")
    config = folder / "config.json"
    # No formatter is needed to import it; pictures, CSV and Parquet are read as bytes (the
    # generator's own setting for media types it does not model).
    config.write_text(json.dumps({"post_hooks": [], "content_type_overrides": {
        media: "application/octet-stream" for media in BINARY_MEDIA}}))
    result = subprocess.run(
        [sys.executable, "-m", "openapi_python_client", "generate", "--path", str(DOCUMENT),
         "--meta", "none", "--output-path", str(folder / PACKAGE), "--config", str(config)],
        capture_output=True, text=True, timeout=300, check=False)
    assert result.returncode == 0, result.stdout + result.stderr
    sys.path.insert(0, str(folder))
    try:
        package = importlib.import_module(PACKAGE)
        api = importlib.import_module(f"{PACKAGE}.api")
        modules = {}
        for info in pkgutil.walk_packages(api.__path__, f"{PACKAGE}.api."):
            module = importlib.import_module(info.name)
            if hasattr(module, "sync_detailed"):
                modules[info.name.rsplit(".", 1)[1]] = module
        yield package, modules
    finally:
        sys.path.remove(str(folder))
        for name in [n for n in sys.modules if n.startswith(PACKAGE)]:
            del sys.modules[name]


def _operation_ids() -> list[str]:
    document = json.loads(DOCUMENT.read_text())
    return [operation["operationId"] for methods in document["paths"].values()
            for operation in methods.values()
            if isinstance(operation, dict) and "operationId" in operation]


def test_every_operation_is_called():
    assert sorted(_operation_ids()) == sorted(entry[0] for entry in CALLS)


def test_the_generated_client_calls_every_operation(generated, tmp_path):
    package, modules = generated
    app = create_app({"TESTING": True, "DATABASE_URL": f"sqlite:///{tmp_path}/team.db",
                      "DATABASE_SCHEMA": None, "JOBS_WORKER": False,
                      "QUEUE_URL": str(tmp_path / "queue.db")})
    client = package.Client(base_url="http://formwise.test", raise_on_unexpected_status=False,
                            httpx_args={"transport": httpx.WSGITransport(app=app)})
    ids: dict[str, str] = {}
    etags: dict[str, str] = {}
    answers = {}
    try:
        for operation_id, path, body, query in CALLS:
            module = modules[_snake(operation_id)]
            hints = typing.get_type_hints(module.sync_detailed, vars(module))
            arguments = {name: ids.get(value, value) for name, value in path.items()}
            arguments.update(query)
            if body is not None:
                arguments["body"] = _model(hints["body"]).from_dict(json.loads(json.dumps(body)))
            calling = client
            stored = next(iter(path.values()), None)
            if operation_id.startswith(("put", "delete")) and stored in etags:
                calling = client.with_headers({"If-Match": etags[stored]})
            response = module.sync_detailed(client=calling, **arguments)
            assert 200 <= response.status_code < 300, (operation_id, response.content[:500])
            answers[operation_id] = response
            _remember(operation_id, response, ids, etags, path)
            if operation_id == "postJobs":
                _run_queued_jobs(app)
    finally:
        app.extensions["formwise_jobs"].stop()
        app.extensions["formwise_storage"].dispose()
    # The typed answers carry what a plugin reads.
    designs = answers["postDesigns"].parsed
    assert designs.designs and designs.caution
    first = designs.designs[0]
    assert first.currency == "USD" and first.mass_per_length > 0
    assert first.section.properties.area > 0
    sweep = answers["postSweeps"].parsed
    assert "reason" in sweep.columns and len(sweep.rows) == 2
    assert answers["getHealth"].parsed.status == "ok"
    assert answers["postSectionDrawing"].content.startswith(b"<?xml")


def _model(hint):
    """The model class of a body annotation (``Model`` or ``Model | Unset``)."""
    candidates = [hint, *typing.get_args(hint)]
    return next(c for c in candidates if hasattr(c, "from_dict"))


def _remember(operation_id, response, ids, etags, path) -> None:
    """Ids of what a call created (studies, jobs) and ETags of stored items."""
    body = json.loads(response.content) if response.content[:1] == b"{" else {}
    if operation_id == "postStudies":
        ids["<study>"] = body["id"]
    if operation_id == "postJobs":
        ids["<job>"] = body["id"]
    etag = response.headers.get("ETag")
    if etag and operation_id in ("postTeamMaterials", "putTeamMaterialById"):
        etags[MATERIAL["id"]] = etag
    if etag and operation_id in ("postCatalogs", "putCatalogById", "getCatalogById"):
        etags[CATALOG["id"]] = etag
    if operation_id == "postTeamMaterials":
        etags[MATERIAL["id"]] = etag


def _run_queued_jobs(app) -> None:
    """Run the queued jobs the way a consumer does, without its threads."""
    queue = app.extensions["formwise_jobs"]
    while (task := queue.huey.dequeue()) is not None:
        queue.huey.execute(task)
