"""Minimum-mass (cost, carbon) sizing of material and section designs for a load case.

``size_designs(request, materials, core_materials)`` is the entry point; see
:mod:`service.core.sizing.engine` for the method.
"""

from service.core.sizing.catalog import catalog_members, catalog_names, load_catalog
from service.core.sizing.designs import size_designs
from service.core.sizing.pareto import pareto_front
from service.core.sizing.request import (
    DIMENSION_RESOLUTION,
    CatalogMember,
    DesignRequest,
    validate_request,
)
from service.core.sizing.results import Design, DesignResult, Rejection

__all__ = [
    "DIMENSION_RESOLUTION",
    "CatalogMember",
    "Design",
    "DesignRequest",
    "DesignResult",
    "Rejection",
    "catalog_members",
    "catalog_names",
    "load_catalog",
    "pareto_front",
    "size_designs",
    "validate_request",
]
