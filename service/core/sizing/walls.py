"""Local buckling of a member's walls with each material's own wall model.

A material with a transverse modulus (``MaterialValues.orthotropic``: unidirectional
laminates, pultrusions, wood and bamboo, fibres along the member) has walls far weaker across
the member than along it; treating them as isotropic with E1 overstates their buckling stress
several times (the high-modulus carbon box 30 x 18.93 x 1 mm the README's request returned
before: local buckling at 0.04 as isotropic walls, 0.39 as orthotropic plates). Its walls take
the orthotropic plate and shell formulas of :mod:`service.core.sections.orthotropic`
(Lekhnitskii, Whitney, Kollár, Seydel, NASA SP-8007 for orthotropic cylinders; each named
there) through the families' own ``local_buckling``, which accepts an
:class:`~service.core.sections.orthotropic.OrthotropicElastic`; the other materials keep the
isotropic formulas. Both are powers of the wall ratios at fixed proportions, so the closed-form
scales of :mod:`service.core.sizing.scale` hold for either.

A form whose walls have no sound formula for an orthotropic material is not offered for it
(:data:`UNSOUND_FORMS`, with the reason a rejection gives).
"""

from __future__ import annotations

import numpy as np

from service.core.sections.base import Dimensions, LocalBuckling, SectionFamily
from service.core.sizing.values import MaterialValues
from service.core.stability.wall_compression import compression_buckling_stress

UNSOUND_FORMS = {
    "sandwich_panel": (
        "no sound face wrinkling formula is checked here for faces of an orthotropic material "
        "(it has a transverse modulus): the wrinkling stress of the sizing (Allen 1969, "
        "Hoff and Mautner) is that of isotropic faces, so this form is not offered for it"),
}
"""Family id -> why an orthotropic material is not offered in that form."""


def unsound_form(family_id: str, materials: MaterialValues) -> np.ndarray:
    """True for the materials (shape (M,)) that the form is not offered in: orthotropic ones
    where :data:`UNSOUND_FORMS` names the family."""
    if family_id not in UNSOUND_FORMS:
        return np.zeros(np.shape(materials.youngs_modulus), dtype=bool)
    return np.asarray(materials.orthotropic, dtype=bool)


def _mixed(family: SectionFamily, materials: MaterialValues) -> bool:
    """Whether any material here has orthotropic walls (a solid section has none)."""
    return bool(family.wall_dimensions) and bool(np.any(materials.orthotropic))


def local_buckling(family: SectionFamily, dims: Dimensions, materials: MaterialValues,
                   shear_area=None) -> LocalBuckling:
    """The family's local buckling with each material's wall model (see the module doc);
    arrays broadcast as ``family.local_buckling``'s (``shear_area`` as there)."""
    isotropic = family.local_buckling(dims, materials.elastic(), shear_area=shear_area)
    if not _mixed(family, materials):
        return isotropic
    orthotropic = family.local_buckling(dims, materials.wall_elastic(), shear_area=shear_area)
    mask = materials.orthotropic

    def pick(ortho, iso):
        return np.where(mask, ortho, iso)
    return LocalBuckling(
        bending=pick(orthotropic.bending, isotropic.bending),
        torsion=pick(orthotropic.torsion, isotropic.torsion),
        shear=pick(orthotropic.shear, isotropic.shear),
        bending_modes=tuple(pick(o, i) for o, i in zip(
            orthotropic.bending_modes, isotropic.bending_modes, strict=True)),
        torsion_modes=tuple(pick(o, i) for o, i in zip(
            orthotropic.torsion_modes, isotropic.torsion_modes, strict=True)))


def compression_buckling(family: SectionFamily, dims: Dimensions, materials: MaterialValues
                         ) -> np.ndarray:
    """The walls' critical mean stress in uniform compression
    (:func:`~service.core.stability.wall_compression.compression_buckling_stress`) with each
    material's wall model, Pa."""
    isotropic = compression_buckling_stress(family, dims, materials.elastic())
    if not _mixed(family, materials):
        return isotropic
    return np.where(materials.orthotropic,
                    compression_buckling_stress(family, dims, materials.wall_elastic()),
                    isotropic)
