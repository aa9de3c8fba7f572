"""The blueprint every resource uses: flask-smorest's, with a stricter request parser.

- A body nested too deeply to parse (recursion) is a 400 like any other unreadable JSON.
- A body that is not ``application/json`` (or ``+json``) is a 415: browsers and curl send
  ``text/plain`` or form data by default, and such a body would otherwise read as "missing".
- An unknown query parameter, or a repeated one where only one value makes sense, is a 400
  naming the parameter; a silently dropped filter would give a wrong answer.
- An Accept header that allows none of the media types a view can produce is a 406 (a view
  produces JSON unless it says otherwise with :func:`produces`).
- Every operation gets an ``operationId`` (``getMaterials``, ``postDesigns``...) unless its
  view documents one, so generated clients get readable method names.
"""

from __future__ import annotations

import json
from collections.abc import Callable, Sequence

import flask_smorest
import marshmallow as ma
from flask import current_app, request
from flask_smorest import abort
from webargs.flaskparser import FlaskParser
from werkzeug.exceptions import NotAcceptable, UnsupportedMediaType

JSON = "application/json"


class BodyParser(FlaskParser):
    def _raw_load_json(self, req):
        if not req.is_json and (req.mimetype or req.content_length):
            raise UnsupportedMediaType(
                f"send the body as JSON with Content-Type: application/json "
                f"(got {req.mimetype or 'no content type'})"
            )
        try:
            return super()._raw_load_json(req)
        except RecursionError:
            self._handle_invalid_json_error(
                json.JSONDecodeError("nested too deeply", "", 0), req)

    def load_querystring(self, req, schema):
        errors = query_problems(req.args, schema)
        if errors:
            abort(400, messages={"query": errors})
        return super().load_querystring(req, schema)


def query_problems(args, schema: ma.Schema) -> dict[str, list[str]]:
    """Unknown parameters and repeats of single-valued ones, by parameter name.

    A schema may list name prefixes it checks itself in ``OWN_NAME_PREFIXES``.
    """
    fields = {field.data_key or name: field for name, field in schema.fields.items()}
    own_prefixes = getattr(schema, "OWN_NAME_PREFIXES", ())
    known = [n for n in sorted(fields) if not n.startswith(own_prefixes)]
    known += [f"{prefix}<property>" for prefix in own_prefixes]
    problems: dict[str, list[str]] = {}
    for name in args:
        field = fields.get(name)
        if field is None and name.startswith(own_prefixes):
            continue  # the schema names what is wrong with it more precisely
        if field is None:
            problems[name] = [f"unknown query parameter; known: {', '.join(known)}"]
        elif len(args.getlist(name)) > 1 and not isinstance(field, ma.fields.List):
            problems[name] = ["given more than once; this parameter takes one value"]
    return problems


def produces(*media_types: str) -> Callable:
    """Declare the media types a view method can answer with (the first is its default)."""

    def mark(method: Callable) -> Callable:
        method.produces = tuple(media_types)  # type: ignore[attr-defined]
        return method

    return mark


def view_produces() -> Sequence[str]:
    """The media types the view handling this request declared (JSON by default)."""
    view = current_app.view_functions.get(request.endpoint or "")
    view_class = getattr(view, "view_class", None)
    method = getattr(view_class, request.method.lower(), view)
    return getattr(method, "produces", (JSON,))


def negotiated() -> str:
    """The media type to answer with: the best the Accept header allows, else the default."""
    types = view_produces()
    return request.accept_mimetypes.best_match(types, default=types[0]) or types[0]


def _require_acceptable() -> None:
    types = view_produces()
    accept = request.accept_mimetypes
    if request.headers.get("Accept") and accept.best_match(types) is None:
        raise NotAcceptable(f"this endpoint answers with {', '.join(types)}")


def _operation_name(endpoint: str) -> str:
    """``MaterialById`` -> ``MaterialById``; a ``View`` suffix is dropped."""
    name = endpoint.removesuffix("View")
    return name[:1].upper() + name[1:]


class Blueprint(flask_smorest.Blueprint):
    ARGUMENTS_PARSER = BodyParser()

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self.before_request(_require_acceptable)

    def register_views_in_doc(self, api, app, spec, *, name, parameters):
        for endpoint, methods in self._docs.items():
            for method, info in methods.items():
                if method != "parameters":
                    info.setdefault("manual_doc", {}).setdefault(
                        "operationId", f"{method}{_operation_name(endpoint)}"
                    )
        super().register_views_in_doc(api, app, spec, name=name, parameters=parameters)
