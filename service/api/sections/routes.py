"""GET /v1/sections and POST /v1/sections/properties."""

from __future__ import annotations

from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.sections.schemas import (
    FamilyListSchema,
    PropertiesRequestSchema,
    PropertiesResponseSchema,
    properties_body,
    ratio_rules,
)
from service.core.sections import shape_factors

blp = Blueprint(
    "sections", __name__, url_prefix="/v1/sections", description="Cross-section families"
)


@blp.route("")
class Sections(MethodView):
    @blp.response(200, FamilyListSchema)
    def get(self):
        """List the section families, their dimensions and the loadings they carry."""
        return {
            "families": [
                {
                    "id": family.id,
                    "description": family.description,
                    "dimensions": [
                        {"name": d.name, "description": d.description} for d in family.dimensions
                    ],
                    "loadings": list(family.loadings),
                    "rules": ratio_rules(family),
                }
                for family in state().families.values()
            ]
        }


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
        family = state().families[body["family"]]
        dims = {name: body["dimensions"][name] for name in family.dimension_names}
        props = family.properties(dims)
        factors = shape_factors(props)
        return {
            "family": family.id,
            "dimensions": dims,
            **properties_body(props),
            "shape_factors": {
                name: float(getattr(factors, name)) for name in factors.__dataclass_fields__
            },
        }
