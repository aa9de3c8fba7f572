"""POST /v1/designs: the lightest (cheapest, lowest-carbon) feasible design of every material
in every section family, sized for one load case."""

from __future__ import annotations

from flask.views import MethodView
from flask_smorest import Blueprint

from service.api.context import state
from service.api.designs.schemas import DesignRequestSchema, DesignResponseSchema
from service.api.materials.schemas import select_materials, with_custom_materials
from service.core import CAUTION
from service.core.materials import MaterialTable
from service.core.sizing import DesignRequest, DesignResult, size_designs
from service.core.sizing.catalog import catalog_members

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
        builtin = state().materials
        table = select_materials(with_custom_materials(builtin, body.get("custom_materials")),
                                 body.get("materials"))
        cores = select_materials(builtin, body.get("core_materials") or {"families": ["foam"]},
                                 field="core_materials")
        load_case = body["load_case"]
        requirements = body["requirements"]
        envelope = body["envelope"]
        sections = body.get("sections")
        request = DesignRequest(
            load_case=load_case["type"],
            span=load_case["span"],
            load=load_case.get("load"),
            torque=load_case.get("torque"),
            max_deflection=requirements.get("max_deflection"),
            max_twist=requirements.get("max_twist"),
            safety_factor=requirements.get("safety_factor", 1.0),
            local_buckling=requirements.get("local_buckling", True),
            self_weight=requirements.get("self_weight", False),
            max_depth=envelope.get("max_depth"),
            max_width=envelope.get("max_width"),
            min_wall=body.get("min_wall"),
            objective=body["objective"],
            property_basis=body["property_basis"],
            sections=None if sections is None else tuple(sections),
            top=body.get("top"),
            catalog=catalog_members(body.get("catalog")),
        )
        return _response(size_designs(request, table, cores), table, cores)


def _material(table: MaterialTable, index: int) -> dict:
    return {"id": table.ids[index], "name": table.names[index], "family": table.families[index]}


def _response(result: DesignResult, table: MaterialTable, cores: MaterialTable) -> dict:
    return {
        "designs": [
            {
                "rank": rank,
                "material": _material(table, d.material_index),
                "section": {"family": d.family, "dimensions": d.dimensions,
                            "designation": d.designation},
                "core_material": None if d.core_material_index is None
                else _material(cores, d.core_material_index),
                "mass": d.mass, "cost": d.cost, "carbon": d.carbon,
                "deflection": d.deflection, "twist": d.twist, "max_stress": d.max_stress,
                "utilization": d.utilization,
                "governing": d.governing,
            }
            for rank, d in enumerate(result.designs, start=1)
        ],
        "rejected": [
            {"material": _material(table, r.material_index), "section": r.family,
             "reason": r.reason}
            for r in result.rejected
        ],
        "caution": CAUTION,
    }
