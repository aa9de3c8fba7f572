"""POST /v1/materials, PUT and DELETE /v1/materials/{id}: the calling team's own materials.

They are validated exactly like ``custom_materials`` (the same schema and core checks), may
not take a built-in id, and join the built-in table in every request of the team
(``state().materials``). Each change is a new version; GET gives the version as ETag.
"""

from __future__ import annotations

from flask import abort
from flask.views import MethodView

from service.api import items as item_http
from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.errors import problem
from service.api.materials.schemas import MaterialResponseSchema, MaterialSchema
from service.core import materials as core
from service.core.errors import InputError
from service.storage.items import MATERIAL

blp = Blueprint("team_materials", __name__, url_prefix="/v1/materials",
                description="The team's own materials")

_ETAG = {"ETag": {"description": "the version, for If-Match", "schema": {"type": "string"}}}


def _checked(body: dict) -> dict:
    """The record as stored, after the checks custom materials get; the built-in ids are
    taken."""
    builtin = state().builtin
    try:
        builtin.concat(core.from_records([body]))
    except InputError as error:
        raise InputError({path.partition(".")[2]: m for path, m in error.errors.items()}) from None
    return body


def _not_found(material_id: str):
    def answer() -> None:
        if material_id in state().builtin.ids:
            abort(problem(409, f"{material_id!r} is a built-in material; give yours its own id."))
        abort(problem(404, f"no material {material_id!r} of your team"))
    return answer


def _answer(body: dict, version: int, status: int):
    record = core.from_records([body]).material(body["id"]).record()
    headers = {"ETag": item_http.etag(version)}
    if status == 201:
        headers["Location"] = f"/v1/materials/{body['id']}"
    return record, status, headers


@blp.route("")
class TeamMaterials(MethodView):
    @blp.arguments(MaterialSchema)
    @blp.response(201, MaterialResponseSchema, headers={
        **_ETAG, "Location": {"description": "the new material", "schema": {"type": "string"}}})
    @blp.alt_response(409, response="CONFLICT")
    def post(self, body):
        """Add a material to the team, validated like ``custom_materials``.

        It is usable by id in designs, rankings and sweeps of the team at once.
        """
        body = _checked(body)
        return _answer(body, item_http.create(MATERIAL, body["id"], body), 201)


@blp.route("/<string:material_id>")
class TeamMaterialById(MethodView):
    @blp.arguments(MaterialSchema)
    @blp.response(200, MaterialResponseSchema, headers=_ETAG)
    @item_http.write_responses(blp)
    def put(self, body, material_id):
        """Replace a team material; send If-Match with the ETag from GET."""
        if body["id"] != material_id:
            raise InputError.single("id", f"must equal the id in the address, {material_id!r}")
        body = _checked(body)
        version = item_http.replace(MATERIAL, material_id, body, _not_found(material_id))
        return _answer(body, version, 200)

    @blp.response(204)
    @item_http.write_responses(blp)
    def delete(self, material_id):
        """Remove a team material; send If-Match with the ETag from GET. Studies keep the
        version they used."""
        item_http.replace(MATERIAL, material_id, None, _not_found(material_id))
