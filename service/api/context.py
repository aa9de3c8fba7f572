"""Per-application state the views share: the material table and section families.

Loaded once in :func:`service.create_app` (bad data fails the start-up, not a request) and
read by views through :func:`state`. ``state().materials`` is the one place where a request's
material table is assembled: the built-in rows followed by the calling team's own
(see :mod:`service.api.teamdata`).
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
        builtin: the validated built-in material table (or MATERIALS_FILE's when set).
        families: section family id -> family object.
    """

    builtin: core_materials.MaterialTable
    families: Mapping[str, SectionFamily]

    @classmethod
    def load(cls, config: Mapping[str, object]) -> FormwiseState:
        path = config.get("MATERIALS_FILE")
        table = core_materials.load_csv(str(path)) if path else core_materials.load_builtin()
        return cls(builtin=table, families=FAMILIES)

    @property
    def materials(self) -> core_materials.MaterialTable:
        """The built-in materials, then the calling team's (none outside a request)."""
        from service.api.teamdata import with_team_materials

        return with_team_materials(self.builtin)


def state() -> FormwiseState:
    return current_app.extensions["formwise"]
