"""Data of a log-log property chart of a ranking, with the index guide line."""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from service.core.indices.derivation import IndexDefinition, property_range, property_values
from service.core.materials import UNITS, MaterialTable

if TYPE_CHECKING:
    from service.core.indices.ranking import RankedResult


@dataclass(frozen=True)
class ChartAxis:
    """One axis of a log-log property chart: the quantity prod(name^power).

    Attributes:
        label: the quantity in words, e.g. ``"shape_factor * youngs_modulus"``.
        exponents: property (or ``"shape_factor"``) -> power in the quantity.
        unit: SI unit of the quantity.
    """

    label: str
    exponents: dict[str, float]
    unit: str


@dataclass(frozen=True)
class ChartPoint:
    """One ranked result on the chart; x and y in their axes' units.

    Attributes:
        rank: the result's rank.
        material_id, material_name, material_family: the material.
        section: section family id.
        x_low, x_high, x: the x quantity from the properties' low and high ends, and the value
            the index used.
        y_low, y_high, y: the same for y.
    """

    rank: int
    material_id: str
    material_name: str
    material_family: str
    section: str
    x_low: float
    x_high: float
    x: float
    y_low: float
    y_high: float
    y: float


@dataclass(frozen=True)
class Chart:
    """Data for a log-log chart of y against x with the index guide line.

    With index = y^a / x^b, every point of equal index lies on
    ``log10 y = slope log10 x + intercept``, slope = b / a, intercept = log10(index) / a;
    the line given passes through the best result.

    Attributes:
        x, y: the axes.
        points: one per ranked result.
        slope: b / a, dimensionless.
        intercept: log10(best index) / a, in log10 of the y unit.
        through: rank of the result the line passes through (1).
    """

    x: ChartAxis
    y: ChartAxis
    points: tuple[ChartPoint, ...]
    slope: float
    intercept: float
    through: int




def chartable(definition: IndexDefinition) -> bool:
    """Whether the index has a positive and a negative property exponent (an x and a y)."""
    exponents = definition.exponents.values()
    return any(e > 0 for e in exponents) and any(e < 0 for e in exponents)


def _axis(exponents: Mapping[str, float], scale: float) -> ChartAxis:
    powers = {name: exponent / scale for name, exponent in exponents.items()}
    label = " * ".join(name if p == 1 else f"{name}^{p:g}" for name, p in powers.items())
    units = [
        (UNITS.get(name, ""), p) for name, p in powers.items() if name != "shape_factor"
    ]
    unit = " ".join(u if p == 1 else f"({u})^{p:g}" for u, p in units if u not in ("", "1"))
    return ChartAxis(label=label, exponents=powers, unit=unit or "1")


def index_chart(definition: IndexDefinition, table: MaterialTable, basis: str,
           results: tuple[RankedResult, ...]) -> Chart:
    """Chart data: x the negative-exponent properties, y the positive ones times phi^s."""
    rising = {n: e for n, e in definition.exponents.items() if e > 0}
    falling = {n: -e for n, e in definition.exponents.items() if e < 0}
    if definition.shape_factor is not None:
        rising = {"shape_factor": definition.shape_factor_exponent, **rising}
    # Normalising by the largest exponent keeps every power on an axis within [-1, 1].
    a = max(abs(e) for e in rising.values())
    b = max(falling.values())
    x_axis, y_axis = _axis(falling, b), _axis(rising, a)
    rows = np.asarray([r.material_index for r in results])
    phi = np.asarray([r.shape_factor for r in results])

    def quantity(axis: ChartAxis, which: str) -> np.ndarray:
        total = np.ones(len(rows))
        for name, power in axis.exponents.items():
            if name == "shape_factor":
                values = phi
            elif which == "value":
                values = property_values(table, name, basis)[rows]
            else:
                values = property_range(table, name)[which == "high"][rows]
            total = total * values**power
        return total

    x = {which: quantity(x_axis, which) for which in ("low", "high", "value")}
    y = {which: quantity(y_axis, which) for which in ("low", "high", "value")}
    points = tuple(
        ChartPoint(
            rank=r.rank, material_id=r.material_id, material_name=r.material_name,
            material_family=r.material_family, section=r.section,
            x_low=float(x["low"][k]), x_high=float(x["high"][k]), x=float(x["value"][k]),
            y_low=float(y["low"][k]), y_high=float(y["high"][k]), y=float(y["value"][k]),
        )
        for k, r in enumerate(results)
    )
    return Chart(x=x_axis, y=y_axis, points=points, slope=b / a,
                 intercept=math.log10(results[0].index) / a, through=results[0].rank)
