"""Demo material rows and records shared by the material tests.

Every value here is demo data (invented for the tests, not real materials).
"""

import csv

import pytest

from service.core import materials as m
from service.core.errors import DataError

COLUMNS = list(m.CSV_COLUMNS)


def demo_row(id_="demo_metal", **changes) -> dict:
    """A valid isotropic row (invented values, SI), with ``changes`` applied to its cells."""
    row = {column: "" for column in COLUMNS}
    row.update(
        id=id_,
        name="Demo metal",
        family="steel",
        isotropic="true",
        forms="solid_round;round_tube",
        price_year="2024",
        source_properties="demo data",
        source_price="demo data",
        source_embodied_carbon="demo data",
        source_toughness="demo data",
    )
    ranges = {
        "density": (7800, 7900, 7850),
        "youngs_modulus": (2.0e11, 2.1e11, 2.05e11),
        "shear_modulus": (7.6e10, 8.2e10, 7.9e10),  # 2.05e11 / (2 x 1.3) = 7.88e10
        "poisson_ratio": (0.28, 0.31, 0.30),
        "strength": (3.0e8, 4.0e8, ""),
        "tensile_strength": (4.5e8, 5.5e8, ""),
        "price": (1.0, 2.0, ""),
        "embodied_carbon": (1.5, 2.5, ""),
        "max_service_temperature": (600, 700, ""),
        "fracture_toughness": (5e7, 1.5e8, ""),
        "elongation": (0.2, 0.3, ""),
    }
    for prop, ends in ranges.items():
        for end, value in zip(("low", "high", "typical"), ends, strict=True):
            row[f"{prop}_{end}"] = str(value)
    row.update({key: str(value) for key, value in changes.items()})
    return row


def write(tmp_path, rows, columns=COLUMNS):
    path = tmp_path / "materials.csv"
    with open(path, "w", newline="") as f:
        writer = csv.DictWriter(f, fieldnames=columns, extrasaction="ignore")
        writer.writeheader()
        writer.writerows(rows)
    return path


def load_error(tmp_path, rows, columns=COLUMNS) -> m.MaterialDataError:
    path = write(tmp_path, rows, columns)
    with pytest.raises(m.MaterialDataError) as caught:
        m.load_csv(path)
    error = caught.value
    assert isinstance(error, DataError)
    assert error.file == str(path)
    return error


def demo_table(tmp_path) -> m.MaterialTable:
    """Three demo materials: a steel, an aluminium with its own shear strength, a polymer."""
    rows = [
        demo_row("a"),
        demo_row("b", family="aluminium", shear_strength_low="1e8", shear_strength_high="2e8"),
        demo_row("c", family="polymer", forms="solid_round"),
    ]
    return m.load_csv(write(tmp_path, rows))


def record(id_="custom", **changes) -> dict:
    """A valid client material (invented values, SI)."""
    rec = {
        "id": id_,
        "name": "Custom polymer",
        "family": "polymer",
        "properties": {
            "density": {"low": 900.0, "high": 1100.0, "typical": 1000.0},
            "youngs_modulus": {"low": 2.0e9, "high": 3.0e9, "unit": "Pa"},
            "shear_modulus": {"low": 0.75e9, "high": 1.1e9},
            "poisson_ratio": {"low": 0.35, "high": 0.38},
            "strength": {"low": 40e6, "high": 60e6},
            "price": {"low": 2.0, "high": 3.0},
            "embodied_carbon": {"low": 3.0, "high": 4.0},
        },
        "forms": ["solid_round"],
        "sources": ["demo data"],
    }
    rec.update(changes)
    return rec


def with_property(prop, value, **changes):
    rec = record(**changes)
    rec["properties"] = dict(rec["properties"], **{prop: value})
    return rec
