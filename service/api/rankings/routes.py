"""POST /v1/rankings: every candidate material in every section family, best index first."""

from __future__ import annotations

import numpy as np
from flask import jsonify
from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.materials.schemas import select_materials, with_custom_materials
from service.api.rankings.schemas import RankingRequestSchema, RankingResponseSchema
from service.core import CAUTION
from service.core.errors import InputError
from service.core.indices import Ranking, RankingRequest, rank, ranked_families
from service.core.materials import MaterialTable
from service.core.materials.brittleness import brittle_reason
from service.core.materials.limits import PropertyLimit, failed_limits

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
        selected = select_materials(
            with_custom_materials(state().materials, body.get("custom_materials")),
            body.get("materials"),
        )
        limits = tuple(PropertyLimit(prop, bounds.get("min"), bounds.get("max"))
                       for prop, bounds in (body.get("property_limits") or {}).items())
        failed = failed_limits(selected, limits, body["property_basis"], "property_limits")
        failing = np.array([reason is not None for reason in failed], dtype=bool)
        brittle = selected.brittle & (not body["allow_brittle"]) & ~failing
        if (brittle | failing).all():
            raise InputError.single(
                "materials", "every selected material is brittle or fails property_limits; "
                "set allow_brittle to true or widen the limits to rank them")
        table = selected.take(~(brittle | failing))
        sections = body.get("sections")
        ranking = rank(
            RankingRequest(
                loading=body["loading"],
                limit=body["limit"],
                objective=body["objective"],
                sections=None if sections is None else tuple(sections),
                proportions=body.get("proportions", {}),
                custom_index=body.get("custom_index"),
                property_basis=body["property_basis"],
                top=body.get("top"),
                chart=body["chart"],
            ),
            table,
        )
        # Built in the response schema's shape (tests/api check that dumping it through
        # RankingResponseSchema changes nothing): sent as it is, without a second pass.
        response = _response(ranking, table)
        ranked = set(ranked_families(body["loading"]) if sections is None else sections)
        response["excluded"] += _brittle_exclusions(selected, np.flatnonzero(brittle), ranked)
        response["excluded"] += [
            {"material": _material(selected, int(i)), "section": section, "reason": failed[i]}
            for i in np.flatnonzero(failing) for section in sorted(ranked & selected.forms[i])]
        return jsonify(response)


def _brittle_exclusions(table: MaterialTable, rows: np.ndarray, ranked: set[str]) -> list[dict]:
    """One exclusion per brittle material and ranked section family it is made into."""
    return [
        {
            "material": _material(table, int(i)),
            "section": section,
            "reason": brittle_reason(
                float(table.typical["elongation"][i]),
                float(table.typical["fracture_toughness"][i]),
                table.families[i],
            ) + "; set allow_brittle to true to include it",
        }
        for i in rows
        for section in sorted(ranked & table.forms[i])
    ]


def _material(table: MaterialTable, index: int) -> dict:
    return {"id": table.ids[index], "name": table.names[index], "family": table.families[index]}


def _response(ranking: Ranking, table: MaterialTable) -> dict:
    definition = ranking.index
    response = {
        "index": {
            "exponents": dict(definition.exponents),
            "shape_factor": definition.shape_factor,
            "shape_factor_exponent": definition.shape_factor_exponent,
            "description": definition.description,
        },
        "results": [
            {
                "rank": r.rank,
                "material": _material(table, r.material_index),
                "section": r.section,
                "shape_factor": r.shape_factor,
                "proportions": r.proportions,
                "index": r.index,
                "relative": r.relative,
            }
            for r in ranking.results
        ],
        "excluded": [
            {"material": _material(table, e.material_index), "section": e.section,
             "reason": e.reason}
            for e in ranking.excluded
        ],
        "caution": CAUTION,
    }
    chart = ranking.chart
    if chart is not None:
        response["chart"] = {
            "x": vars(chart.x),
            "y": vars(chart.y),
            "points": [
                {
                    "rank": p.rank,
                    "material": {"id": p.material_id, "name": p.material_name,
                                 "family": p.material_family},
                    "section": p.section,
                    "x": {"low": p.x_low, "high": p.x_high, "value": p.x},
                    "y": {"low": p.y_low, "high": p.y_high, "value": p.y},
                }
                for p in chart.points
            ],
            "guide_line": {"slope": chart.slope, "intercept": chart.intercept,
                           "through": chart.through},
        }
    return response
