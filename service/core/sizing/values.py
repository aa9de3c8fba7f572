"""Material values on one property basis as arrays."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from service.core.sections.base import Elastic

if TYPE_CHECKING:
    from service.core.materials import MaterialTable


@dataclass(frozen=True)
class MaterialValues:
    """Material properties on one basis, arrays of shape (M,) (SI units).

    Attributes:
        density: kg/m^3. youngs_modulus, shear_modulus, strength, shear_strength: Pa.
        poisson_ratio: dimensionless. price: per kg. embodied_carbon: kg CO2e per kg.
        family: each material's family id (``"steel"``, ...), which picks its member
            buckling curves (:mod:`service.core.stability.buckling_curves`); None where
            unknown (the most conservative curve applies).
    """

    density: np.ndarray
    youngs_modulus: np.ndarray
    shear_modulus: np.ndarray
    poisson_ratio: np.ndarray
    strength: np.ndarray
    shear_strength: np.ndarray
    price: np.ndarray
    embodied_carbon: np.ndarray
    family: np.ndarray | None = None

    @classmethod
    def from_table(cls, table: MaterialTable, basis: str) -> MaterialValues:
        """The table's values on ``basis`` (see MaterialTable.values)."""
        names = ("density", "youngs_modulus", "shear_modulus", "poisson_ratio", "strength",
                 "price", "embodied_carbon")
        values = {name: np.asarray(table.values(name, basis), dtype=float) for name in names}
        return cls(shear_strength=np.asarray(table.shear_strength(basis), dtype=float),
                   family=np.asarray(table.families, dtype=object), **values)

    def map(self, function) -> MaterialValues:
        """``function`` applied to every array (an absent ``family`` stays None)."""
        mapped: dict[str, Any] = {k: None if v is None else function(v)
                                  for k, v in vars(self).items()}
        return MaterialValues(**mapped)

    def column(self) -> MaterialValues:
        """The same values as (M, 1) columns, to broadcast against a proportions axis."""
        return self.map(lambda v: v[:, None])

    def elastic(self) -> Elastic:
        """E, G and nu as an Elastic."""
        return Elastic(self.youngs_modulus, self.shear_modulus, self.poisson_ratio)

    def take(self, index) -> MaterialValues:
        """The values of the materials ``index``."""
        return self.map(lambda v: v[index])
