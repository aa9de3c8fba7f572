"""Honeycomb cores by ribbon direction (service.core.materials.core_direction and
data/core_directions.csv): W below L, W/L within the range published for hexagonal
honeycombs (modulus 0.4-0.6, strength 0.55-0.65: Bitzer, Honeycomb Technology, 1997, ch. 3,
from memory), each value within the materials table's own range of the core (which runs
from W to L) widened by its 15 % spread, and a source on every row."""

from __future__ import annotations

import csv
from pathlib import Path

import numpy as np
import pytest

from service.core.materials import load_builtin
from service.core.materials.core_direction import directed, directional_values
from service.core.sizing.values import MaterialValues

TABLE = load_builtin()
ROWS = directional_values()


@pytest.mark.parametrize("material_id", sorted(ROWS))
def test_the_weak_direction_is_the_weaker_within_the_published_ratios(material_id):
    row = ROWS[material_id]
    modulus = row["shear_modulus_weak"] / row["shear_modulus_strong"]
    strength = row["shear_strength_weak"] / row["shear_strength_strong"]
    assert 0.4 <= modulus <= 0.6
    assert 0.55 <= strength <= 0.65
    index = TABLE.ids.index(material_id)
    for name in ("shear_modulus", "shear_strength"):
        low, high = TABLE.low[name][index], TABLE.high[name][index]
        for direction in ("weak", "strong"):
            assert low * 0.85 <= row[f"{name}_{direction}"] <= high * 1.15


def test_every_row_names_its_source():
    path = Path(__file__).resolve().parents[2] / "data" / "core_directions.csv"
    with path.open() as handle:
        rows = list(csv.DictReader(handle))
    assert rows and all(row["source"].strip() for row in rows)
    assert {row["id"] for row in rows} <= set(TABLE.ids)


def test_directed_values_replace_the_honeycombs_only_and_take_the_basis_low_end():
    ids = ["al_honeycomb_50", "pvc_foam_80"]
    cores = TABLE.take([TABLE.ids.index(i) for i in ids])
    for basis, strength_factor, modulus_factor in (("typical", 1.0, 1.0),
                                                   ("design", 0.85, 1.0),
                                                   ("conservative", 0.85, 0.85)):
        values = MaterialValues.from_table(cores, basis)
        for direction in ("weak", "strong"):
            got = directed(values, cores.ids, direction, basis)
            row = ROWS["al_honeycomb_50"]
            assert got.shear_modulus[0] == pytest.approx(
                row[f"shear_modulus_{direction}"] * modulus_factor, rel=1e-15)
            assert got.shear_strength[0] == pytest.approx(
                row[f"shear_strength_{direction}"] * strength_factor, rel=1e-15)
            np.testing.assert_array_equal(got.shear_modulus[1:], values.shear_modulus[1:])
            np.testing.assert_array_equal(got.shear_strength[1:], values.shear_strength[1:])
