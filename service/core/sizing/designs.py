"""The entry point: size every material in every requested family for one request."""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from service.core import materials as materials_module
from service.core.sections import FAMILIES
from service.core.sizing.catalog import size_catalog
from service.core.sizing.engine import size_family
from service.core.sizing.request import DesignRequest, validate_request
from service.core.sizing.results import Design, DesignResult, Rejection
from service.core.sizing.sandwich import SANDWICH_FAMILY, size_sandwich
from service.core.sizing.values import MaterialValues, demand_of

if TYPE_CHECKING:
    from service.core.materials import MaterialTable


def default_cores() -> MaterialTable:
    """The built-in foam family: sandwich cores when the request names none."""
    return materials_module.select(materials_module.load_builtin(), families=["foam"])


def size_designs(request: DesignRequest, materials: MaterialTable,
                 core_materials: MaterialTable | None = None) -> DesignResult:
    """The best design of every material in every requested section family.

    Args:
        request: what to size (validated here: raises InputError for an impossible request).
        materials: candidate materials (already filtered by the caller).
        core_materials: sandwich core candidates; None for the built-in foam family.

    Returns:
        Designs sorted by the request's objective (best first, cut to ``top``) and a rejection
        for every material and family without one. A request nothing can meet returns no
        designs and the reasons.
    """
    validate_request(request)
    demand = demand_of(request)
    values = MaterialValues.from_table(materials, request.property_basis)
    designs: list[Design] = []
    rejected: list[Rejection] = []
    loading = request.case.loading
    for family_id in request.families:
        family = FAMILIES[family_id]
        made = np.array([family_id in forms for forms in materials.forms], dtype=bool)
        rejected.extend(
            Rejection(int(i), materials.ids[i], family_id, "not made in this form")
            for i in np.flatnonzero(~made)
        )
        indices = np.flatnonzero(made)
        if loading not in family.loadings:
            rejected.extend(
                Rejection(int(i), materials.ids[i], family_id,
                          f"this section family does not carry {loading}")
                for i in indices
            )
            continue
        if not len(indices):
            continue
        members = [m for m in request.catalog if m.family == family_id]
        if members:
            found, lost = size_catalog(family, members, indices, values, materials, demand)
        elif family_id == SANDWICH_FAMILY:
            cores = core_materials if core_materials is not None else default_cores()
            found, lost = size_sandwich(family, indices, values, materials, cores, demand,
                                        request.objective, request.property_basis)
        else:
            found, lost = size_family(family, indices, values, materials, demand)
        designs.extend(found)
        rejected.extend(lost)
    designs.sort(key=lambda d: (d.objective_value(request.objective), d.material_id, d.family))
    if request.top is not None:
        designs = designs[: request.top]
    return DesignResult(tuple(designs), tuple(rejected))
