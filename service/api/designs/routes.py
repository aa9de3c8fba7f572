"""POST /v1/designs: the lightest (cheapest, lowest-carbon) feasible design of every material
in every section family, sized for one load case."""

from __future__ import annotations

from flask import current_app, jsonify
from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.designs.schemas import (
    DesignRequestSchema,
    DesignResponseSchema,
    design_response,
)
from service.usecases import answer, design_inputs

blp = Blueprint("designs", __name__, url_prefix="/v1/designs",
                description="Sized material and section designs")


@blp.route("")
class Designs(MethodView):
    @blp.arguments(DesignRequestSchema)
    @blp.response(200, DesignResponseSchema)
    def post(self, body):
        """Size every candidate material in every requested section family.

        Each design is the lightest (or cheapest, or lowest-carbon) one of its material and
        family that meets every requirement, recomputed from its own rounded dimensions.
        Materials and families without one are listed in ``rejected`` with the reason.
        """
        inputs = design_inputs(body, state().materials)
        # The body is built in the response schema's shape (tests/api check that dumping it
        # through DesignResponseSchema changes nothing), so it is sent as it is: marshmallow's
        # dump of a few hundred designs costs about as much as sizing them.
        found = answer(inputs, int(current_app.config["DESIGN_WORKERS"]))
        return jsonify(design_response(found, inputs))
