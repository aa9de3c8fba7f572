"""The explorer page at GET /: a form for a design request, the ranked designs, the section
drawing of the selected one, the trade-off and property charts, all through the JSON and chart
endpoints. Plain HTML, CSS and JavaScript; every file is served from ``static/`` here, and the
page's Content-Security-Policy forbids loading anything from elsewhere."""

from __future__ import annotations

from flask import Blueprint, Response

blp = Blueprint("explorer", __name__, static_folder="static",
                static_url_path="/explorer/static")

CONTENT_SECURITY_POLICY = (
    "default-src 'self'; img-src 'self' blob:; script-src 'self'; style-src 'self'; "
    "connect-src 'self'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'"
)


@blp.get("/")
def page() -> Response:
    """The explorer page (not part of the JSON API, so not in the OpenAPI document)."""
    response = blp.send_static_file("index.html")
    response.headers["Content-Security-Policy"] = CONTENT_SECURITY_POLICY
    return response
