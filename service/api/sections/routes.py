"""GET /v1/sections and POST /v1/sections/properties."""

from __future__ import annotations

from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.sections.schemas import (
    FamilyListSchema,
    PropertiesRequestSchema,
    PropertiesResponseSchema,
    family_list,
    properties_response,
)

blp = Blueprint(
    "sections", __name__, url_prefix="/v1/sections", description="Cross-section families"
)


@blp.route("")
class Sections(MethodView):
    @blp.response(200, FamilyListSchema)
    def get(self):
        """List the section families, their dimensions and the loadings they carry."""
        return family_list(state().families.values())


@blp.route("/properties")
class SectionPropertiesView(MethodView):
    @blp.arguments(PropertiesRequestSchema)
    @blp.response(200, PropertiesResponseSchema)
    def post(self, body):
        """Section properties and shape factors of one section.

        Dimensions are metres or strings with units. A 422 lists every bad dimension under
        `dimensions.<name>` (wrong unit, missing, unknown, or impossible geometry such as a
        wall thicker than half the tube). Sandwich panels report their faces' properties:
        the core is taken to carry no bending stress.
        """
        return properties_response(state().families[body["family"]], body["dimensions"])
