"""Every error becomes an RFC 9457 problem details response, here and only here.

Sources of errors and what they become:
- werkzeug HTTP errors (Flask's 404/405/413, webargs' 400 for malformed JSON and 422 for
  validation) -> their status, with webargs' nested messages flattened to dotted JSON paths;
- core :class:`~service.core.errors.InputError` -> 422 with its field paths;
- core :class:`~service.core.errors.UnknownResource` -> 404;
- anything else -> 500, logged with the request id, with no detail of the exception.
"""

from __future__ import annotations

import logging
from collections.abc import Mapping
from http import HTTPStatus

import flask_smorest
import marshmallow as ma
from flask import Flask, Response, g, json, request
from flask_smorest.utils import prepare_response
from werkzeug.exceptions import HTTPException, InternalServerError, NotFound

from service.core.errors import InputError, UnknownResource

PROBLEM_CONTENT_TYPE = "application/problem+json"
PROBLEM_TYPE_BASE = "https://formwise.invalid/problems/"
"""Problem type URIs; they identify the kind of problem and need not resolve."""

_log = logging.getLogger("service.errors")

_DETAILS = {
    400: "The request body is not valid JSON or not the kind of document expected.",
    404: "No resource exists at this address.",
    405: "This address does not accept that HTTP method.",
    406: "This endpoint cannot answer in any media type the Accept header allows.",
    413: "The request body is larger than this service accepts.",
    415: "The request body must be JSON, sent with Content-Type: application/json.",
    422: "One or more fields are invalid; see errors.",
    500: "The service failed while handling the request. Quote the request id when reporting it.",
}


class ProblemSchema(ma.Schema):
    """RFC 9457 problem details (documentation only; responses are built by :func:`problem`)."""

    type = ma.fields.String(metadata={"description": "URI identifying the problem type"})
    title = ma.fields.String(metadata={"description": "short summary of the problem type"})
    status = ma.fields.Integer(metadata={"description": "HTTP status code"})
    detail = ma.fields.String(metadata={"description": "explanation of this occurrence"})
    instance = ma.fields.String(metadata={"description": "the request path"})
    request_id = ma.fields.String(metadata={"description": "id of the request, for reports"})
    errors = ma.fields.Dict(
        keys=ma.fields.String(),
        values=ma.fields.List(ma.fields.String()),
        metadata={"description": "JSON path of each bad field -> messages"},
    )


def problem(
    status: int,
    detail: str | None = None,
    errors: Mapping[str, list[str]] | None = None,
    headers: Mapping[str, str] | None = None,
) -> Response:
    """A problem details response."""
    title = _title(status)
    body: dict[str, object] = {
        "type": PROBLEM_TYPE_BASE + title.lower().replace(" ", "-"),
        "title": title,
        "status": status,
        "detail": detail or _DETAILS.get(status, title),
        "instance": request.path,
    }
    request_id = g.get("request_id")
    if request_id:
        body["request_id"] = request_id
    if errors:
        body["errors"] = {path: list(messages) for path, messages in errors.items()}
    response = Response(json.dumps(body), status=status, mimetype=PROBLEM_CONTENT_TYPE)
    for name, value in (headers or {}).items():
        response.headers[name] = value
    return response


def _title(status: int) -> str:
    try:
        return HTTPStatus(status).phrase
    except ValueError:
        return "Error"


_DICT_PARTS = ("key", "value")


def flatten_messages(messages: object, prefix: str = "") -> dict[str, list[str]]:
    """Flatten marshmallow's nested error messages to ``{"a.0.b": [msg, ...]}``.

    Schema-level messages (marshmallow's ``_schema`` key) are attached to the enclosing path,
    or to ``"$"`` at the top of the document.
    """
    flat: dict[str, list[str]] = {}
    if isinstance(messages, Mapping):
        for key, value in messages.items():
            # marshmallow's Dict field files errors of an entry under "key" or "value"; the
            # entry's own path names the field. An item of a list (a member's action) is a
            # schema whose "value" is a field of its own.
            dict_entry = (key in _DICT_PARTS and prefix
                          and not prefix.rpartition(".")[2].isdigit())
            part = "" if key == ma.exceptions.SCHEMA or dict_entry else str(key)
            path = ".".join(p for p in (prefix, part) if p)
            for sub_path, sub_messages in flatten_messages(value, path).items():
                flat.setdefault(sub_path, []).extend(sub_messages)
    elif isinstance(messages, list | tuple):
        for item in messages:
            if isinstance(item, Mapping | list | tuple):
                for sub_path, sub_messages in flatten_messages(item, prefix).items():
                    flat.setdefault(sub_path, []).extend(sub_messages)
            else:
                flat.setdefault(prefix or "$", []).append(str(item))
    else:
        flat.setdefault(prefix or "$", []).append(str(messages))
    return flat


def _webargs_errors(error: HTTPException) -> dict[str, list[str]] | None:
    """webargs stores {"<location>": {...}} under data["messages"]; drop the location level."""
    data = getattr(error, "data", None) or {}
    messages = data.get("errors") or data.get("messages")
    if not messages:
        return None
    flat: dict[str, list[str]] = {}
    if isinstance(messages, Mapping):
        for location_messages in messages.values():
            for path, texts in flatten_messages(location_messages).items():
                flat.setdefault(path, []).extend(texts)
    else:
        flat = flatten_messages(messages)
    return flat


class ProblemApi(flask_smorest.Api):
    """flask-smorest Api whose errors, served and documented, are problem details."""

    ERROR_SCHEMA = ProblemSchema

    def handle_http_exception(self, error: HTTPException) -> Response:
        return http_problem(error)

    def _register_responses(self) -> None:
        # Same as flask-smorest's, documented with the problem+json media type.
        for status in HTTPStatus:
            response: dict[str, object] = {"description": status.phrase}
            if not (100 <= status < 200) and status not in (204, 304):
                response["schema"] = self.ERROR_SCHEMA
            prepare_response(response, self.spec, PROBLEM_CONTENT_TYPE)
            self.spec.components.response(status.name, response, lazy=True)
        response = {"description": "Problem details", "schema": self.ERROR_SCHEMA}
        prepare_response(response, self.spec, PROBLEM_CONTENT_TYPE)
        self.spec.components.response(self.DEFAULT_ERROR_RESPONSE_NAME, response, lazy=True)


def http_problem(error: HTTPException) -> Response:
    if error.response is not None:  # abort(problem(...)): already a problem response
        return error.response
    status = error.code or 500
    if status >= 500:
        return _internal_error(error)
    errors = _webargs_errors(error)
    detail = None
    if status == 400 and errors:
        detail = "; ".join(
            msg if path == "$" else f"{path}: {msg}"
            for path, msgs in errors.items()
            for msg in msgs
        )
        if set(errors) == {"$"}:  # the document as a whole (unreadable JSON)
            errors = None
    elif status in (406, 415) and error.description != type(error).description:
        detail = error.description
    headers = {}
    if status == 405 and error.valid_methods:  # type: ignore[attr-defined]
        headers["Allow"] = ", ".join(error.valid_methods)  # type: ignore[attr-defined]
    return problem(status, detail=detail, errors=errors, headers=headers)


def _internal_error(error: BaseException) -> Response:
    original = getattr(error, "original_exception", None) or error
    _log.error(
        "unhandled error in request %s", g.get("request_id", "-"), exc_info=original
    )
    return problem(500)


def register_error_handlers(app: Flask) -> None:
    """Translate core errors and unexpected exceptions; flask-smorest handles HTTP errors."""

    @app.errorhandler(InputError)
    def _input_error(error: InputError) -> Response:
        return problem(422, errors=error.errors)

    @app.errorhandler(UnknownResource)
    def _unknown(error: UnknownResource) -> Response:
        return problem(404, detail=str(error))

    @app.errorhandler(NotFound)
    def _not_found(error: NotFound) -> Response:
        return http_problem(error)

    @app.errorhandler(InternalServerError)
    def _server_error(error: InternalServerError) -> Response:
        return _internal_error(error)

    @app.errorhandler(Exception)
    def _unexpected(error: Exception) -> Response:
        if isinstance(error, HTTPException):
            return http_problem(error)
        return _internal_error(error)
