"""Material values on one property basis as arrays, and the request's loads and limits."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from service.core.sections.base import Elastic
from service.core.sizing.request import DesignRequest
from service.core.sizing.scale import Demand

if TYPE_CHECKING:
    from service.core.materials import MaterialTable


@dataclass(frozen=True)
class MaterialValues:
    """Material properties on one basis, arrays of shape (M,) (SI units).

    Attributes:
        density: kg/m^3. youngs_modulus, shear_modulus, strength, shear_strength: Pa.
        poisson_ratio: dimensionless. price: per kg. embodied_carbon: kg CO2e per kg.
    """

    density: np.ndarray
    youngs_modulus: np.ndarray
    shear_modulus: np.ndarray
    poisson_ratio: np.ndarray
    strength: np.ndarray
    shear_strength: np.ndarray
    price: np.ndarray
    embodied_carbon: np.ndarray

    @classmethod
    def from_table(cls, table: MaterialTable, basis: str) -> MaterialValues:
        names = ("density", "youngs_modulus", "shear_modulus", "poisson_ratio", "strength",
                 "price", "embodied_carbon")
        values = {name: np.asarray(table.values(name, basis), dtype=float) for name in names}
        return cls(shear_strength=np.asarray(table.shear_strength(basis), dtype=float), **values)

    def column(self) -> MaterialValues:
        """The same values as (M, 1) columns, to broadcast against a proportions axis."""
        return MaterialValues(**{k: v[:, None] for k, v in vars(self).items()})

    def elastic(self) -> Elastic:
        return Elastic(self.youngs_modulus, self.shear_modulus, self.poisson_ratio)

    def take(self, index) -> MaterialValues:
        return MaterialValues(**{k: v[index] for k, v in vars(self).items()})


def demand_of(request: DesignRequest) -> Demand:
    """The scalar :class:`Demand` of a validated request."""
    bending = request.case.loading == "bending"
    limit = request.max_deflection if bending else request.max_twist
    return Demand(
        case=request.case,
        span=request.span,
        action=request.load if bending else request.torque,
        stiffness_limit=math.inf if limit is None else limit,
        safety_factor=request.safety_factor,
        max_depth=math.inf if request.max_depth is None else request.max_depth,
        max_width=math.inf if request.max_width is None else request.max_width,
        min_wall=0.0 if request.min_wall is None else request.min_wall,
        self_weight=request.self_weight,
        local_buckling=request.local_buckling,
    )
