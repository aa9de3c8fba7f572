"""GET /v1/materials (filtered list) and GET /v1/materials/{id}."""

from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.items import current_version, etag
from service.api.materials.schemas import (
    MaterialListSchema,
    MaterialQuerySchema,
    MaterialResponseSchema,
    material_list,
)
from service.storage.items import MATERIAL

blp = Blueprint(
    "materials", __name__, url_prefix="/v1/materials", description="Built-in material data"
)


@blp.route("")
class Materials(MethodView):
    @blp.arguments(MaterialQuerySchema, location="query")
    @blp.response(200, MaterialListSchema)
    def get(self, query):
        """List the built-in materials, filtered by family, name and property bounds.

        ``min_<property>`` and ``max_<property>`` bound the typical value and accept units,
        e.g. ``min_density=1 g/cm^3``; ``sort=<property>`` (``-<property>`` descending)
        orders the list by it.
        """
        return material_list(state().materials, query)


@blp.route("/<string:material_id>")
class MaterialById(MethodView):
    @blp.response(200, MaterialResponseSchema)
    @blp.alt_response(404, response="NOT_FOUND")
    def get(self, material_id):
        """One material by id (a team material's ETag is its version, for If-Match)."""
        record = state().materials.material(material_id).record()
        version = current_version(MATERIAL, material_id)
        return record, {} if version is None else {"ETag": etag(version.version)}
