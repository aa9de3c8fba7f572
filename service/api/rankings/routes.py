"""POST /v1/rankings: every candidate material in every section family, best index first."""

from __future__ import annotations

from flask import jsonify
from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.rankings.schemas import (
    RankingRequestSchema,
    RankingResponseSchema,
    ranking_response,
)
from service.usecases import rank_materials

blp = Blueprint(
    "rankings", __name__, url_prefix="/v1/rankings",
    description="Material index x shape factor rankings",
)


@blp.route("")
class Rankings(MethodView):
    @blp.arguments(RankingRequestSchema)
    @blp.response(200, RankingResponseSchema)
    def post(self, body):
        """Rank materials and section families by a material index combined with shape.

        The index is derived from the loading and limit (its exponents and derivation are in
        the response), combined with the largest shape factor each material reaches in each
        family before its walls buckle locally (or the shape factor at fixed ``proportions``).
        The ``materials`` filter applies to the built-in and the custom materials alike.
        Brittle materials are left out (listed in ``excluded`` with the reason) unless
        ``allow_brittle`` is true; so are materials that fail a ``property_limits`` bound.
        """
        # Built in the response schema's shape (tests/api check that dumping it through
        # RankingResponseSchema changes nothing): sent as it is, without a second pass.
        return jsonify(ranking_response(rank_materials(body, state().materials)))
