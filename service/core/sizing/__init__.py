"""Minimum-mass (cost, carbon) sizing of material and section designs for a load case.

``size_cases(requests, materials, core_materials)`` is the one entry point, and
``size_designs(request, ...)`` a batch of one case through it; see
:mod:`service.core.sizing.engine` for the method.
"""

from service.core.sizing.catalog import catalog_members, catalog_names, load_catalog
from service.core.sizing.engine import CaseSizer, size_cases, size_designs
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
    "CaseSizer",
    "Rejection",
    "catalog_members",
    "catalog_names",
    "load_catalog",
    "pareto_front",
    "size_cases",
    "size_designs",
    "validate_request",
]
