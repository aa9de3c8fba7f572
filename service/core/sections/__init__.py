"""Cross-section families: the registry and the shape factors.

``FAMILIES`` maps each contract family id to its :class:`~.base.SectionFamily`, in the
contract's order. Adding a family is one module with one subclass, listed here.
"""

from __future__ import annotations

import numpy as np

from service.core.errors import UnknownResource
from service.core.sections.base import SectionFamily, SectionProperties, ShapeFactors
from service.core.sections.i_section import ISection
from service.core.sections.saint_venant import SQUARE_TORSION_CONSTANT, SQUARE_TORSION_MODULUS
from service.core.sections.sandwich import SandwichPanel
from service.core.sections.solid import SolidRectangle, SolidRound
from service.core.sections.tubes import RectangularTube, RoundTube

FAMILIES: dict[str, SectionFamily] = {
    family.id: family
    for family in (
        SolidRound(),
        SolidRectangle(),
        RoundTube(),
        RectangularTube(),
        ISection(),
        SandwichPanel(),
    )
}

FAMILY_IDS: tuple[str, ...] = tuple(FAMILIES)
"""Every section family id, in registry order."""


def get_family(family_id: str) -> SectionFamily:
    """The family with this contract id.

    Raises:
        UnknownResource: ``("section family", family_id)`` when there is none.
    """
    try:
        return FAMILIES[family_id]
    except (KeyError, TypeError):
        raise UnknownResource("section family", str(family_id)) from None


def shape_factors(props: SectionProperties) -> ShapeFactors:
    """Shape factors against a solid square of the same area A (side a = sqrt(A)).

    The square has I = A^2/12, Z = A^1.5/6 and, from the Saint-Venant series,
    K = 0.1406 A^2 and Q = 0.2082 A^1.5, so every factor is 1 for it. Arrays of the
    properties' shape, dimensionless.
    """
    area = np.asarray(props.area, dtype=float)
    return ShapeFactors(
        bending_stiffness=12.0 * props.second_moment_major / area**2,
        bending_strength=6.0 * props.section_modulus_major / area**1.5,
        torsion_stiffness=props.torsion_constant / (SQUARE_TORSION_CONSTANT * area**2),
        torsion_strength=props.torsion_modulus / (SQUARE_TORSION_MODULUS * area**1.5),
    )


__all__ = ["FAMILIES", "FAMILY_IDS", "SectionFamily", "get_family", "shape_factors"]
