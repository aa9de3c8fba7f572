"""RFC 9457 problem details for every kind of error (RFC 9457 section 3 members checked)."""

import json

import marshmallow as ma
import pytest

from service import create_app
from service.api.errors import PROBLEM_CONTENT_TYPE, flatten_messages

PROBLEM_MEMBERS = {"type", "title", "status", "detail"}


def assert_problem(response, status):
    assert response.status_code == status
    assert response.mimetype == PROBLEM_CONTENT_TYPE
    body = response.get_json(force=True)
    assert PROBLEM_MEMBERS <= body.keys(), body
    assert body["status"] == status
    assert "Traceback" not in response.get_data(as_text=True)
    return body


def test_unknown_path_is_404_problem(client):
    assert_problem(client.get("/v1/no-such-thing"), 404)


def test_wrong_method_is_405_problem_with_allow_header(client):
    response = client.delete("/v1/health")
    assert_problem(response, 405)
    assert "GET" in response.headers["Allow"]


@pytest.fixture(scope="module")
def faulty_app():
    """An app with extra routes that fail on purpose (added before the first request)."""
    app = create_app({"TESTING": False, "MAX_CONTENT_LENGTH": 1024})

    @app.post("/v1/_test/boom")
    def boom():
        raise RuntimeError("secret internal detail /etc/passwd")

    @app.post("/v1/_test/echo")
    def echo():
        from flask import request

        return {"length": len(request.get_data())}

    return app


def test_unhandled_exception_is_500_problem_without_leak(faulty_app, caplog):
    client = faulty_app.test_client()
    with caplog.at_level("ERROR", logger="service.errors"):
        response = client.post("/v1/_test/boom", headers={"X-Request-Id": "req-42"})
    body = assert_problem(response, 500)
    text = response.get_data(as_text=True)
    assert "secret internal detail" not in text and "RuntimeError" not in text
    assert body["request_id"] == "req-42"
    assert response.headers["X-Request-Id"] == "req-42"
    # The log keeps what the response hides, with the request id to join them.
    assert any("req-42" in record.getMessage() and record.exc_info for record in caplog.records)


def test_body_over_limit_is_413_problem(faulty_app):
    client = faulty_app.test_client()
    response = client.post("/v1/_test/echo", data=b"x" * 2048, content_type="application/json")
    assert_problem(response, 413)
    assert client.post("/v1/_test/echo", data=b"x" * 100).status_code == 200


def test_default_body_limit_is_2_mib(app):
    assert app.config["MAX_CONTENT_LENGTH"] == 2 * 1024 * 1024


def test_body_limit_from_environment(monkeypatch):
    monkeypatch.setenv("FORMWISE_MAX_BODY_BYTES", "4096")
    assert create_app({"TESTING": True}).config["MAX_CONTENT_LENGTH"] == 4096


def test_request_id_is_generated_when_absent_or_unsafe(client):
    generated = client.get("/v1/health").headers["X-Request-Id"]
    assert len(generated) == 32
    unsafe = client.get("/v1/health", headers={"X-Request-Id": "bad id; <script>"})
    assert unsafe.headers["X-Request-Id"] != "bad id; <script>"


@pytest.mark.parametrize(
    ("messages", "expected"),
    [
        ({"a": ["m"]}, {"a": ["m"]}),
        ({"a": {"b": ["m1", "m2"]}}, {"a.b": ["m1", "m2"]}),
        ({"items": {0: {"x": ["bad"]}, 3: ["gone"]}}, {"items.0.x": ["bad"], "items.3": ["gone"]}),
        ({"_schema": ["whole"]}, {"$": ["whole"]}),
        ({"a": {"_schema": ["inner"]}}, {"a": ["inner"]}),
        # marshmallow Dict entries: {"<key>": {"value": [...]}} is the entry's own path
        ({"grid": {"load_case.span": {"value": ["bad"]}}}, {"grid.load_case.span": ["bad"]}),
        ({"dims": {"x": {"key": ["bad key"]}}}, {"dims.x": ["bad key"]}),
    ],
)
def test_flatten_messages_to_json_paths(messages, expected):
    assert flatten_messages(messages) == expected


def test_flatten_marshmallow_nested_error():
    class Inner(ma.Schema):
        amount = ma.fields.Float(required=True)

    class Outer(ma.Schema):
        items = ma.fields.List(ma.fields.Nested(Inner))

    with pytest.raises(ma.ValidationError) as caught:
        Outer().load({"items": [{"amount": 1}, {"amount": "x"}, {}]})
    flat = flatten_messages(caught.value.messages)
    assert set(flat) == {"items.1.amount", "items.2.amount"}


def test_malformed_json_is_400_problem(app):
    """Any endpoint that reads a JSON body answers 400 to text that is not JSON."""
    json_endpoints = [
        (path, method)
        for path, operations in (
            app.test_client().get("/v1/openapi.json").get_json()["paths"].items()
        )
        for method, operation in operations.items()
        if "requestBody" in operation and "{" not in path
    ]
    assert {path for path, _ in json_endpoints} >= {"/v1/designs", "/v1/sweeps", "/v1/rankings"}
    client = app.test_client()
    for path, method in json_endpoints:
        response = client.open(
            path, method=method.upper(), data="{not json", content_type="application/json"
        )
        body = assert_problem(response, 400)
        assert body["detail"]
        json.dumps(body)


def test_json_nested_beyond_recursion_is_400_problem(client):
    depth = 100_000
    body = "[" * depth + "]" * depth
    response = client.post("/v1/designs", data=body, content_type="application/json")
    assert_problem(response, 400)
