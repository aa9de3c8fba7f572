"""Honeycomb cores by ribbon direction (contract: ``requirements.core_direction``).

A hexagonal honeycomb is about twice as stiff and 1.6-1.8 times as strong in transverse
shear along its ribbon (L) as across it (W): W/L is about 0.4-0.6 for the modulus and
0.55-0.65 for the strength (Bitzer, Honeycomb Technology, 1997, ch. 3 and the property
tables; measured by plate shear, ASTM C273, from memory). ``data/core_directions.csv``
gives both directions of each built-in honeycomb with its source; a panel whose span runs
along W (``"weak"``, the default: the safe assumption when the orientation is not known)
takes the W values, one along L (``"strong"``) the L values. Other cores (foams, balsa,
team materials without a row there) keep their own values in both directions.
"""

from __future__ import annotations

import csv
import dataclasses
from functools import cache
from pathlib import Path

import numpy as np

from service.core.materials.vocabulary import BASIS_ENDS

CORE_DIRECTIONS = ("weak", "strong")
"""The honeycomb ribbon direction along the span: W (weak, default) or L (strong)."""

CORE_DIRECTIONS_CSV = Path(__file__).resolve().parents[3] / "data" / "core_directions.csv"


@cache
def directional_values() -> dict[str, dict[str, float]]:
    """Material id -> {shear_modulus_weak, shear_modulus_strong, shear_strength_weak,
    shear_strength_strong} (Pa) of ``data/core_directions.csv``, read once."""
    with CORE_DIRECTIONS_CSV.open(newline="", encoding="utf-8") as handle:
        return {row["id"]: {name: float(value) for name, value in row.items()
                            if name not in ("id", "source")}
                for row in csv.DictReader(handle)}


CORE_SPREAD = 0.15
"""The nominal values of a core class less this fraction are its low end (data/README.md,
"Cores": low/high = nominal -/+ 15 %, common practice): a basis that takes the low end of a
property (``BASIS_ENDS``) takes the directional nominal value times 0.85."""


def directed(values, ids, direction: str, basis: str = "typical"):
    """Core values (a :class:`~service.core.sizing.values.MaterialValues` of the materials
    ``ids`` on ``basis``, arrays (N,)) with the shear modulus and shear strength of
    ``direction`` where ``data/core_directions.csv`` gives them (nominal values, taken at
    the low end of :data:`CORE_SPREAD` where the basis takes a low end)."""
    table = directional_values()
    known = [table.get(material_id) for material_id in ids]
    ends = BASIS_ENDS[basis]

    def pick(name: str, own) -> np.ndarray:
        own = np.asarray(own, dtype=float)
        low = 1.0 - CORE_SPREAD if ends.get(name) == "low" else 1.0
        given = np.array([np.nan if row is None else row[f"{name}_{direction}"] * low
                          for row in known])
        return np.where(np.isnan(given), own, given)

    return dataclasses.replace(values, shear_modulus=pick("shear_modulus", values.shear_modulus),
                               shear_strength=pick("shear_strength", values.shear_strength))
