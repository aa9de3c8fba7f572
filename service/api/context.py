"""Per-application state the views share: the material table and section families.

Loaded once in :func:`service.create_app` (bad data fails the start-up, not a request) and
read by views through :func:`state`.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from flask import current_app

from service.core import materials as core_materials
from service.core.sections import FAMILIES, SectionFamily


@dataclass(frozen=True)
class FormwiseState:
    """What the views need from the core.

    Attributes:
        materials: the validated material table (built-in data unless MATERIALS_FILE is set).
        families: section family id -> family object.
    """

    materials: core_materials.MaterialTable
    families: Mapping[str, SectionFamily]

    @classmethod
    def load(cls, config: Mapping[str, object]) -> FormwiseState:
        path = config.get("MATERIALS_FILE")
        table = core_materials.load_csv(str(path)) if path else core_materials.load_builtin()
        return cls(materials=table, families=FAMILIES)


def state() -> FormwiseState:
    return current_app.extensions["formwise"]
