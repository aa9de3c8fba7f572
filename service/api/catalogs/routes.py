"""/v1/catalogs: the built-in section catalogues and the team's own (create, read, replace,
delete). A design or sweep request names one in ``catalog``; a team catalogue is versioned
like a team material (ETag / If-Match)."""

from __future__ import annotations

from flask import abort
from flask.views import MethodView

from service.api import items as item_http
from service.api.blueprint import Blueprint
from service.api.catalogs.schemas import CatalogListSchema, CatalogResponseSchema, CatalogSchema
from service.api.errors import problem
from service.api.teamdata import team_versions
from service.core.errors import InputError
from service.core.sizing.catalog import catalog_names, load_catalog
from service.storage.items import CATALOG

blp = Blueprint("catalogs", __name__, url_prefix="/v1/catalogs",
                description="Section catalogues, built-in and the team's")

_ETAG = {"ETag": {"description": "the version, for If-Match", "schema": {"type": "string"}}}


def _builtin(name: str) -> dict:
    return {"id": name, "name": name, "builtin": True, "members": [
        {"designation": m.designation, "family": m.family, "dimensions": dict(m.dimensions),
         "material_families": list(m.material_families)}
        for m in load_catalog(name)]}


def _team(body: dict) -> dict:
    return {**body, "builtin": False}


def _checked(body: dict) -> dict:
    if body["id"] in catalog_names():
        raise InputError.single("id", f"{body['id']!r} is a built-in catalogue's name")
    return body


def _not_found(catalog_id: str):
    def answer() -> None:
        if catalog_id in catalog_names():
            abort(problem(409, f"{catalog_id!r} is a built-in catalogue; give yours its own id."))
        abort(problem(404, f"no catalogue {catalog_id!r}"))
    return answer


@blp.route("")
class Catalogs(MethodView):
    @blp.response(200, CatalogListSchema)
    def get(self):
        """The built-in catalogues, then the team's."""
        found = [_builtin(name) for name in catalog_names()]
        found += [_team(v.body) for v in team_versions(CATALOG)]
        return {"count": len(found), "catalogs": found}

    @blp.arguments(CatalogSchema)
    @blp.response(201, CatalogResponseSchema, headers={
        **_ETAG, "Location": {"description": "the new catalogue", "schema": {"type": "string"}}})
    @blp.alt_response(409, response="CONFLICT")
    def post(self, body):
        """Add a catalogue to the team; design requests may name it in ``catalog``."""
        body = _checked(body)
        version = item_http.create(CATALOG, body["id"], body)
        return _team(body), 201, {"ETag": item_http.etag(version),
                                  "Location": f"/v1/catalogs/{body['id']}"}


@blp.route("/<string:catalog_id>")
class CatalogById(MethodView):
    @blp.response(200, CatalogResponseSchema, headers=_ETAG)
    @blp.alt_response(404, response="NOT_FOUND")
    def get(self, catalog_id):
        """One catalogue (a team catalogue's ETag is its version, for If-Match)."""
        if catalog_id in catalog_names():
            return _builtin(catalog_id)
        version = item_http.current_version(CATALOG, catalog_id)
        if version is None:
            _not_found(catalog_id)()
        return _team(version.body), {"ETag": item_http.etag(version.version)}

    @blp.arguments(CatalogSchema)
    @blp.response(200, CatalogResponseSchema, headers=_ETAG)
    @item_http.write_responses(blp)
    def put(self, body, catalog_id):
        """Replace a team catalogue; send If-Match with the ETag from GET."""
        if body["id"] != catalog_id:
            raise InputError.single("id", f"must equal the id in the address, {catalog_id!r}")
        version = item_http.replace(CATALOG, catalog_id, _checked(body), _not_found(catalog_id))
        return _team(body), {"ETag": item_http.etag(version)}

    @blp.response(204)
    @item_http.write_responses(blp)
    def delete(self, catalog_id):
        """Remove a team catalogue; send If-Match with the ETag from GET."""
        item_http.replace(CATALOG, catalog_id, None, _not_found(catalog_id))
