"""Material values on one property basis as arrays."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from service.core.loading.fatigue import surface_factor
from service.core.materials.vocabulary import FAMILIES
from service.core.sections.base import Elastic
from service.core.sections.orthotropic import OrthotropicElastic

ENDURANCE_FAMILIES = ("steel", "cast_iron", "titanium")
"""Material families whose S-N curve levels off (an endurance limit) beyond their
fatigue_cycles: ferrous and titanium alloys (Shigley's Mechanical Engineering Design, 10th
ed., section 6-4, from memory); every other family keeps falling on the S-N line."""

SURFACE_FINISH_FAMILIES = ("steel", "cast_iron")
"""Families given Shigley's machined-surface factor k_a (10th ed., table 6-2, fitted to
steels; from memory); others take k_a = 1 (no published fit of that form)."""

if TYPE_CHECKING:
    from service.core.materials import MaterialTable


@dataclass(frozen=True)
class MaterialValues:
    """Material properties on one basis, arrays of shape (M,) (SI units).

    Attributes:
        density: kg/m^3. youngs_modulus, shear_modulus, strength, shear_strength: Pa.
        poisson_ratio: dimensionless. price: per kg. embodied_carbon: kg CO2e per kg.
        brittle: 1 for a brittle material (maximum principal stress rule), else 0.
        ultimate_strength: S_ut for fatigue, Pa: the tensile strength where the table gives
            one, else ``strength`` (lower: the Goodman line on the safe side).
        fatigue_strength: fully reversed fatigue strength of smooth specimens, Pa (NaN: none
            known). fatigue_cycles: its cycle count (NaN: none).
        endurance_limit: 1 where the S-N curve levels off beyond ``fatigue_cycles``
            (:data:`service.core.sizing.member.ENDURANCE_FAMILIES`), else 0.
        surface_factor: Marin's k_a of a machined surface (1 where no fit applies;
            :data:`service.core.sizing.member.SURFACE_FINISH_FAMILIES`).
        family: each material's family as its position in
            :data:`service.core.materials.vocabulary.FAMILIES` (integers), which picks its
            member buckling curves (:mod:`service.core.stability.buckling_curves`; a lookup
            by position, where one by name sorted the names on every call); None where
            unknown (the most conservative curve applies).
        compressive_strength: the compression-side strength, Pa, where the material gives
            one (composites, wood, polymers, magnesium, brittle materials); NaN where it
            equals ``strength`` (what the checks read: :attr:`compression_strength`).
        transverse_modulus: E2 across the member of an orthotropic material (unidirectional
            laminates, pultrusions, wood, bamboo), Pa; NaN for an in-plane isotropic one
            (``youngs_modulus`` is then E1 along the member and ``shear_modulus`` G12).
        (The last nine default to values that never take part: a table always gives them.)
    """

    density: np.ndarray
    youngs_modulus: np.ndarray
    shear_modulus: np.ndarray
    poisson_ratio: np.ndarray
    strength: np.ndarray
    shear_strength: np.ndarray
    price: np.ndarray
    embodied_carbon: np.ndarray
    brittle: np.ndarray | float = 0.0
    ultimate_strength: np.ndarray | float = np.nan
    fatigue_strength: np.ndarray | float = np.nan
    fatigue_cycles: np.ndarray | float = np.nan
    endurance_limit: np.ndarray | float = 0.0
    surface_factor: np.ndarray | float = 1.0
    family: np.ndarray | None = None
    compressive_strength: np.ndarray | float = np.nan
    transverse_modulus: np.ndarray | float = np.nan

    @property
    def compression_strength(self) -> np.ndarray:
        """The strength of a fibre in compression, Pa: ``compressive_strength`` where the
        material gives a lower one than ``strength`` (composites at 0.2-0.9 of their tension,
        wood, wrought magnesium; see data/README.md), else ``strength``. A compressive
        strength above the tensile one (the compressive yield of polymers, the crushing
        strength of brittle materials) is not credited: the safe default. Every section
        family here is symmetric about its bending axis, so in bending this is the weaker
        fibre's strength; it is a column's squash stress too."""
        compressive = np.asarray(self.compressive_strength, dtype=float)
        return np.fmin(self.strength, compressive)

    def axial_strength(self, loading: str) -> np.ndarray:
        """The normal-stress strength of a shorthand case, Pa: :attr:`compression_strength`
        in bending (the weaker fibre) and for a column, ``strength`` for a tie."""
        if loading in ("compression", "bending"):
            return self.compression_strength
        return np.asarray(self.strength, dtype=float)

    @classmethod
    def from_table(cls, table: MaterialTable, basis: str) -> MaterialValues:
        """The table's values on ``basis`` (see MaterialTable.values)."""
        names = ("density", "youngs_modulus", "shear_modulus", "poisson_ratio", "strength",
                 "price", "embodied_carbon")
        values = {name: np.asarray(table.values(name, basis), dtype=float) for name in names}
        tensile = np.asarray(table.values("tensile_strength", basis), dtype=float)
        ultimate = np.where(np.isnan(tensile), values["strength"], tensile)
        families = np.asarray(table.families)
        finished = np.isin(families, SURFACE_FINISH_FAMILIES)
        return cls(
            shear_strength=np.asarray(table.shear_strength(basis), dtype=float),
            brittle=np.asarray(table.brittle, dtype=float),
            ultimate_strength=ultimate,
            fatigue_strength=np.asarray(table.values("fatigue_strength", basis), dtype=float),
            fatigue_cycles=np.asarray(table.fatigue_cycles, dtype=float),
            endurance_limit=np.isin(families, ENDURANCE_FAMILIES).astype(float),
            surface_factor=np.where(finished, surface_factor(ultimate), 1.0),
            family=np.array([FAMILIES.index(name) for name in table.families], dtype=np.intp),
            compressive_strength=np.asarray(table.values("compressive_strength", basis),
                                            dtype=float),
            transverse_modulus=np.asarray(table.values("transverse_modulus", basis),
                                          dtype=float),
            **values)

    def map(self, function) -> MaterialValues:
        """``function`` applied to every array (scalar defaults and an absent ``family``
        stay as they are)."""
        mapped: dict[str, Any] = {k: function(v) if getattr(v, "ndim", 0) else v
                                  for k, v in vars(self).items()}
        return MaterialValues(**mapped)

    def column(self) -> MaterialValues:
        """The same values as (M, 1) columns, to broadcast against a proportions axis."""
        return self.map(lambda v: v[:, None])

    def elastic(self) -> Elastic:
        """E, G and nu as an Elastic."""
        return Elastic(self.youngs_modulus, self.shear_modulus, self.poisson_ratio)

    @property
    def orthotropic(self) -> np.ndarray:
        """True for a material with a transverse modulus (its walls buckle as orthotropic
        plates and shells), shaped like its arrays."""
        return ~np.isnan(np.asarray(self.transverse_modulus, dtype=float))

    def wall_elastic(self) -> OrthotropicElastic:
        """E1, E2, G12 and nu12 of walls with the fibres along the member (E2 = E1 where the
        material gives no transverse modulus; only the orthotropic rows read it)."""
        transverse = np.asarray(self.transverse_modulus, dtype=float)
        return OrthotropicElastic(self.youngs_modulus,
                                  np.where(np.isnan(transverse), self.youngs_modulus,
                                           transverse),
                                  self.shear_modulus, self.poisson_ratio)

    def take(self, index) -> MaterialValues:
        """The values of the materials ``index``."""
        return self.map(lambda v: v[index])
