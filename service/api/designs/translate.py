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
from service.core.errors import InputError
from service.core.materials import CORE_FAMILY, MaterialTable
from service.core.sizing import DesignRequest, DesignResult, size_designs
from service.core.sizing.catalog import catalog_members
from service.core.sizing.fields import at_contract_paths, request_values
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
    sections = body.get("sections")
    request = DesignRequest(
        **request_values(body),
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
    """Size the request; the Pareto front is taken over all designs, before ``top`` cuts.
    Raises InputError at the request's contract paths."""
    try:
        return _answer(inputs)
    except InputError as error:
        raise at_contract_paths(error) from None


def _answer(inputs: DesignInputs) -> DesignAnswer:
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
