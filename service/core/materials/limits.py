"""Property limits a request sets on materials: ``{"fracture_toughness": {"min": 20e6}}``.

A :class:`PropertyLimit` bounds one property of the material table (SI, on the request's
property basis); :func:`failed_limits` says, per material, which limit it fails, in words that
name the limit by its contract path. A material without a value of a limited property fails
it (the safe default: nothing is known to meet the limit).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from service.core.materials.vocabulary import ALL_PROPERTIES, UNITS

if TYPE_CHECKING:
    from service.core.materials.table import MaterialTable

LIMITS_PATH = "requirements.property_limits"
"""The contract path of the limits in a design request."""


@dataclass(frozen=True)
class PropertyLimit:
    """Bounds on one material property.

    Attributes:
        prop: a property of :data:`~service.core.materials.vocabulary.ALL_PROPERTIES`.
        min: the smallest accepted value, SI (None: no lower bound).
        max: the largest accepted value, SI (None: no upper bound).
    """

    prop: str
    min: float | None = None
    max: float | None = None


def limit_problems(limits: Sequence[PropertyLimit], path: str = "property_limits"
                   ) -> dict[str, list[str]]:
    """Every problem of ``limits`` by field path (``property_limits.<prop>[.min|.max]``)."""
    problems: dict[str, list[str]] = {}
    for limit in limits:
        where = f"{path}.{limit.prop}"
        if limit.prop not in ALL_PROPERTIES:
            problems[where] = [f"unknown property; known: {', '.join(ALL_PROPERTIES)}"]
            continue
        if limit.min is None and limit.max is None:
            problems[where] = ['give "min", "max" or both']
        for end in ("min", "max"):
            value = getattr(limit, end)
            if value is not None and not math.isfinite(value):
                problems[f"{where}.{end}"] = ["must be a finite number"]
        if limit.min is not None and limit.max is not None and limit.min > limit.max:
            problems[f"{where}.max"] = [f"is below min ({limit.min:g})"]
    return problems


def failed_limits(table: MaterialTable, limits: Sequence[PropertyLimit], basis: str,
                  path: str = LIMITS_PATH) -> list[str | None]:
    """Per material, the first limit it fails in words naming the limit at ``path`` (the
    contract path of the limits), None where it meets every one.

    Values are the table's on ``basis`` (see :meth:`MaterialTable.values`)."""
    reasons: list[str | None] = [None] * len(table)
    for limit in limits:
        values = np.asarray(table.values(limit.prop, basis), dtype=float)
        unit = UNITS[limit.prop]
        unit = "" if unit == "1" else f" {unit}"
        for index, value in enumerate(values):
            if reasons[index] is not None:
                continue
            if math.isnan(value):
                reasons[index] = (f"no {limit.prop} value is known, and "
                                  f"{path}.{limit.prop} sets a limit on it")
            elif limit.min is not None and value < limit.min:
                reasons[index] = (f"{limit.prop} {value:.4g}{unit} is below "
                                  f"{path}.{limit.prop}.min {limit.min:.4g}{unit}")
            elif limit.max is not None and value > limit.max:
                reasons[index] = (f"{limit.prop} {value:.4g}{unit} is above "
                                  f"{path}.{limit.prop}.max {limit.max:.4g}{unit}")
    return reasons
