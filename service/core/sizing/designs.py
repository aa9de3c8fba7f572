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
from service.core.sizing.scale import Demand
from service.core.sizing.values import MaterialValues, demand_of

if TYPE_CHECKING:
    from service.core.materials import MaterialTable


def default_cores() -> MaterialTable:
    """The built-in foam family: sandwich cores when the request names none."""
    return materials_module.select(materials_module.load_builtin(), families=["foam"])


NOT_MADE_IN_FORM = "not made in this form"
"""The reason given to a material that is not made in a family's form."""


def actionable_first(rejected) -> list[Rejection]:
    """Rejections with a reason a designer can act on first, "not made in this form" last
    (each group keeps its order)."""
    return sorted(rejected, key=lambda rejection: rejection.reason == NOT_MADE_IN_FORM)


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
    for family_id in request.families:
        found, lost = size_in_family(request, family_id, values, materials, core_materials,
                                     demand)
        designs.extend(found)
        rejected.extend(lost)
    return DesignResult(tuple(best_designs(designs, request)), tuple(rejected))


def best_designs(designs: list[Design], request: DesignRequest) -> list[Design]:
    """Sorted by the request's objective (ties by material id, then family), cut to ``top``."""
    ordered = sorted(designs, key=lambda d: (d.objective_value(request.objective),
                                             d.material_id, d.family))
    return ordered if request.top is None else ordered[: request.top]


def made_in(materials: MaterialTable, family_id: str) -> np.ndarray:
    """True for the materials commonly made in the family's form, shape (M,)."""
    return np.array([family_id in forms for forms in materials.forms], dtype=bool)


def size_in_family(request: DesignRequest, family_id: str, values: MaterialValues,
                   materials: MaterialTable, core_materials: MaterialTable | None,
                   demand: Demand) -> tuple[list[Design], list[Rejection]]:
    """The designs and rejections of one family, in the order :func:`size_designs` lists
    them (``values`` and ``demand`` are those of ``materials`` and ``request``)."""
    family = FAMILIES[family_id]
    made = made_in(materials, family_id)
    rejected = [Rejection(int(i), materials.ids[i], family_id, NOT_MADE_IN_FORM)
                for i in np.flatnonzero(~made)]
    indices = np.flatnonzero(made)
    loading = request.case.loading
    if loading not in family.loadings:
        rejected.extend(Rejection(int(i), materials.ids[i], family_id,
                                  f"this section family does not carry {loading}")
                        for i in indices)
        return [], rejected
    if not len(indices):
        return [], rejected
    members = [m for m in request.catalog if m.family == family_id]
    if members:
        found, lost = size_catalog(family, members, indices, values, materials, demand)
    elif family_id == SANDWICH_FAMILY:
        cores = core_materials if core_materials is not None else default_cores()
        found, lost = size_sandwich(family, indices, values, materials, cores, demand,
                                    request.objective, request.property_basis)
    else:
        found, lost = size_family(family, indices, values, materials, demand)
    return found, rejected + lost
