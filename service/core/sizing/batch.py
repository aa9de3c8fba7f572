"""Sizing many requests at once (sweeps): the same results as one :func:`size_designs` each."""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

from service.core.sizing.designs import size_designs
from service.core.sizing.request import DesignRequest
from service.core.sizing.results import DesignResult

if TYPE_CHECKING:
    from service.core.materials import MaterialTable


def size_cases(
    requests: Sequence[DesignRequest],
    materials: MaterialTable,
    core_materials: MaterialTable | None = None,
) -> list[DesignResult]:
    """One result per request, in order."""
    return [size_designs(request, materials, core_materials) for request in requests]
