"""Between a loaded /v1/designs body and the sizing core, both ways.

Shared by POST /v1/designs, POST /v1/sweeps and the command line, so that a request means the
same thing wherever it comes from.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from service.api.materials.schemas import select_materials, with_custom_materials
from service.core import CAUTION
from service.core.materials import CORE_FAMILY, MaterialTable
from service.core.sizing import DesignRequest, DesignResult, size_designs
from service.core.sizing.catalog import catalog_members
from service.core.sizing.pareto import pareto_front
from service.core.sizing.results import Design


@dataclass(frozen=True)
class DesignInputs:
    """What the sizing core needs for one request.

    Attributes:
        request: the sizing request, SI.
        materials: candidate materials (built-in plus custom, filtered).
        cores: sandwich core candidates.
    """

    request: DesignRequest
    materials: MaterialTable
    cores: MaterialTable
    pareto: tuple[str, str] | None = None


def design_inputs(body: Mapping, builtin: MaterialTable) -> DesignInputs:
    """Translate a body loaded by DesignRequestSchema; raises InputError at request paths."""
    table = select_materials(
        with_custom_materials(builtin, body.get("custom_materials")), body.get("materials")
    )
    cores = select_materials(
        builtin, body.get("core_materials") or {"families": [CORE_FAMILY]}, field="core_materials"
    )
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
    pareto = body.get("pareto")
    return DesignInputs(request, table, cores, None if pareto is None else tuple(pareto))


@dataclass(frozen=True)
class DesignAnswer:
    """A sizing result and, when asked for, its Pareto front over every design."""

    result: DesignResult
    pareto: tuple[Design, ...] | None


def answer(inputs: DesignInputs) -> DesignAnswer:
    """Size the request; the Pareto front is taken over all designs, before ``top`` cuts."""
    if inputs.pareto is None:
        return DesignAnswer(size_designs(inputs.request, inputs.materials, inputs.cores), None)
    full = size_designs(dataclasses.replace(inputs.request, top=None), inputs.materials,
                        inputs.cores)
    front = pareto_front(full.designs, inputs.pareto)
    top = inputs.request.top
    kept = full.designs if top is None else full.designs[:top]
    return DesignAnswer(DesignResult(kept, full.rejected), front)


def _material(table: MaterialTable, index: int) -> dict:
    return {"id": table.ids[index], "name": table.names[index], "family": table.families[index]}


def _designs(designs: Sequence[Design], inputs: DesignInputs) -> list[dict]:
    table, cores = inputs.materials, inputs.cores
    return [
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
        for rank, d in enumerate(designs, start=1)
    ]


def design_response(found: DesignAnswer, inputs: DesignInputs) -> dict:
    """The /v1/designs response body."""
    body = {
        "designs": _designs(found.result.designs, inputs),
        # The engine lists reasons a designer can act on first, "not made in this form" last.
        "rejected": [
            {"material": _material(inputs.materials, r.material_index), "section": r.family,
             "reason": r.reason}
            for r in found.result.rejected
        ],
        "caution": CAUTION,
    }
    if found.pareto is not None:
        body["pareto"] = _designs(found.pareto, inputs)
    return body
