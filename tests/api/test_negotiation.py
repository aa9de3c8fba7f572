"""Strict requests (issue 20, schemas/README.md "Answers a client can trust"): 415 for a body
that is not JSON, 406 for an Accept an endpoint cannot produce, 400 for unknown or repeated
query parameters, an operationId on every operation. Statuses as RFC 9110 sections 15.5.7
(406), 15.5.16 (415) and 15.5.1 (400) define them."""

import pytest
from test_problems import assert_problem

DESIGN = {
    "load_case": {"type": "cantilever_end_load", "span": 0.5, "load": 100.0},
    "requirements": {"max_deflection": 0.002},
    "sections": ["round_tube"],
    "materials": {"ids": ["al_6061_t6"]},
    "top": 1,
}


@pytest.mark.parametrize("path", ["/v1/designs", "/v1/rankings", "/v1/sweeps",
                                  "/v1/sections/properties"])
@pytest.mark.parametrize(
    "content_type", ["text/plain", "application/x-www-form-urlencoded", "application/xml"]
)
def test_a_body_that_is_not_json_is_415_saying_so(client, path, content_type):
    response = client.post(path, data='{"a": 1}', content_type=content_type)
    body = assert_problem(response, 415)
    assert "application/json" in body["detail"] and content_type in body["detail"]


def test_json_with_a_suffix_media_type_is_read(client):
    response = client.post(
        "/v1/designs", data=__import__("json").dumps(DESIGN),
        content_type="application/merge-patch+json",
    )
    assert response.status_code == 200, response.get_json()


@pytest.mark.parametrize(
    ("method", "path", "body"),
    [("get", "/v1/health", None), ("get", "/v1/materials", None),
     ("post", "/v1/designs", DESIGN)],
)
def test_json_endpoints_answer_406_to_an_accept_they_cannot_produce(client, method, path, body):
    response = client.open(path, method=method.upper(), json=body,
                           headers={"Accept": "text/csv"})
    problem = assert_problem(response, 406)
    assert "application/json" in problem["detail"]


@pytest.mark.parametrize("accept", ["*/*", "application/*", "application/json",
                                    "text/html,application/xhtml+xml,*/*;q=0.8"])
def test_accept_headers_that_allow_json_get_json(client, accept):
    response = client.get("/v1/health", headers={"Accept": accept})
    assert response.status_code == 200 and response.mimetype == "application/json"


def test_sweeps_answer_406_to_a_table_format_they_do_not_write(client):
    base = {key: value for key, value in DESIGN.items() if key != "top"}
    sweep = {"base": base, "grid": {"load_case.load": [50.0, 100.0]}}
    response = client.post("/v1/sweeps", json=sweep, headers={"Accept": "application/pdf"})
    assert_problem(response, 406)
    csv = client.post("/v1/sweeps", json=sweep, headers={"Accept": "text/csv"})
    assert csv.status_code == 200 and csv.mimetype == "text/csv"


def test_unknown_query_parameters_are_400_naming_them(client):
    response = client.get("/v1/materials", query_string={"familly": "steel"})
    body = assert_problem(response, 400)
    assert list(body["errors"]) == ["familly"]
    assert "unknown query parameter" in body["errors"]["familly"][0]
    assert "family" in body["errors"]["familly"][0] and "familly" in body["detail"]


def test_a_repeated_single_valued_parameter_is_400(client):
    response = client.get("/v1/materials?search=steel&search=alloy")
    body = assert_problem(response, 400)
    assert list(body["errors"]) == ["search"]


def test_family_may_repeat_and_keeps_every_family(client):
    both = client.get("/v1/materials?family=steel&family=titanium").get_json()["materials"]
    steel = client.get("/v1/materials?family=steel").get_json()["materials"]
    titanium = client.get("/v1/materials?family=titanium").get_json()["materials"]
    assert steel and titanium
    assert {m["id"] for m in both} == {m["id"] for m in steel} | {m["id"] for m in titanium}


def test_query_strings_still_read_bare_numbers_as_si(client):
    dense = client.get("/v1/materials", query_string={"min_density": "7000"}).get_json()
    assert dense["count"] and all(
        m["properties"]["density"]["typical"] >= 7000 for m in dense["materials"]
    )


def test_a_json_string_without_a_unit_is_422_naming_the_unit(client):
    request = {**DESIGN, "requirements": {"max_deflection": "5"}}
    body = assert_problem(client.post("/v1/designs", json=request), 422)
    assert list(body["errors"]) == ["requirements.max_deflection"]
    assert "no unit" in body["errors"]["requirements.max_deflection"][0]
    assert '"5 m"' in body["errors"]["requirements.max_deflection"][0]


def test_every_operation_has_a_unique_operation_id(client):
    document = client.get("/v1/openapi.json").get_json()
    ids = [
        operation["operationId"]
        for operations in document["paths"].values()
        for method, operation in operations.items()
        if method in {"get", "post", "put", "patch", "delete"}
    ]
    assert len(ids) >= 8 and len(ids) == len(set(ids))
    assert "postDesigns" in ids and "getMaterialById" in ids


def test_a_client_material_with_a_unit_slip_is_422_at_its_path(client):
    """E = 200 (GPa meant, Pa sent) once sized a 21.7-tonne tube for a 10 N load (issue 20)."""
    slip = {
        "id": "demo-slip", "name": "Demo steel with E in GPa by mistake (test data)",
        "family": "steel", "forms": ["round_tube"],
        "properties": {
            "density": {"low": 7800, "high": 7900}, "youngs_modulus": {"low": 200, "high": 210},
            "shear_modulus": {"low": "78 GPa", "high": "82 GPa"},
            "poisson_ratio": {"low": 0.28, "high": 0.3},
            "strength": {"low": "250 MPa", "high": "350 MPa"},
            "price": {"low": 0.8, "high": 1.2}, "embodied_carbon": {"low": 1.5, "high": 2.5},
        },
    }
    request = {**DESIGN, "custom_materials": [slip], "materials": {"ids": ["demo-slip"]}}
    body = assert_problem(client.post("/v1/designs", json=request), 422)
    assert list(body["errors"]) == ["custom_materials.0.properties.youngs_modulus"]
