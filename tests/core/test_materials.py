"""Material table: CSV validation, client materials, filters and array access.

Rows written here are demo data (invented for the tests, not real materials) unless a
source is named beside them.
"""

import csv
import math

import numpy as np
import pytest

from service.core import materials as m
from service.core.errors import DataError, InputError, UnknownResource

COLUMNS = list(m._CSV_COLUMNS)


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


# --------------------------------------------------------------------------- loader


def test_valid_demo_file_loads_and_fills_typical_with_geometric_mean(tmp_path):
    table = m.load_csv(write(tmp_path, [demo_row("a"), demo_row("b", family="aluminium")]))
    assert table.ids == ("a", "b")
    assert table.families == ("steel", "aluminium")
    assert table.forms[0] == frozenset({"solid_round", "round_tube"})
    # Blank typical -> sqrt(low x high).
    assert table.typical["strength"][0] == pytest.approx(math.sqrt(3.0e8 * 4.0e8), rel=1e-12)
    # Given typical is kept.
    assert table.typical["youngs_modulus"][0] == 2.05e11
    # Optional property absent -> NaN in every end.
    assert np.isnan(table.low["shear_strength"]).all()
    assert table.price_years == (2024, 2024)


BAD_CELLS = [
    # (cell changes, column reported, words expected in the message)
    ({"density_low": ""}, "density_low", "missing"),
    ({"youngs_modulus_high": ""}, "youngs_modulus_high", "missing"),
    ({"strength_low": "0"}, "strength_low", "positive"),
    ({"price_high": "-2"}, "price_high", "positive"),
    ({"density_typical": "abc"}, "density_typical", "not a number"),
    ({"embodied_carbon_low": "inf"}, "embodied_carbon_low", "finite"),
    ({"strength_low": "5e8"}, "strength_low", "above high"),
    ({"density_typical": "9000"}, "density_typical", "outside"),
    ({"poisson_ratio_high": "0.52"}, "poisson_ratio_high", "(0, 0.5]"),
    ({"poisson_ratio_low": "0", "poisson_ratio_typical": "0.29"}, "poisson_ratio_low", "positive"),
    # G typed for E/(2(1+nu)) x 1.25: beyond the 10% tolerance.
    (
        {"shear_modulus_typical": "9.8e10", "shear_modulus_high": "1e11"},
        "shear_modulus_typical",
        "E/(2(1+nu))",
    ),
    ({"family": "unobtainium"}, "family", "unknown family"),
    ({"forms": "solid_round;hollow_star"}, "forms", "unknown form"),
    ({"family": "foam"}, "forms", "core"),
    ({"shear_strength_low": "1e8"}, "shear_strength_low", "both low and high"),
    ({"isotropic": "maybe"}, "isotropic", "true or false"),
    ({"price_year": ""}, "price_year", "whole year"),
    ({"price_year": "2024.5"}, "price_year", "whole year"),
    ({"source_price": ""}, "source_price", "source"),
    ({"id": "Bad Id"}, "id", "slug"),
    ({"name": ""}, "name", "empty"),
]


@pytest.mark.parametrize(("changes", "column", "words"), BAD_CELLS)
def test_loader_rejects_each_kind_of_bad_cell_at_its_row_and_column(
    tmp_path, changes, column, words
):
    error = load_error(tmp_path, [demo_row("good"), demo_row("bad", **changes)])
    assert (error.row, error.column) == (2, column)
    assert words in error.message
    assert len(error.problems) == 1, [str(p) for p in error.problems]


def test_isotropic_false_skips_the_shear_modulus_check(tmp_path):
    row = demo_row(
        isotropic="false",
        shear_modulus_low="4e9",
        shear_modulus_high="6e9",
        shear_modulus_typical="5e9",
    )
    table = m.load_csv(write(tmp_path, [row]))
    assert not table.isotropic[0]


def test_shear_modulus_within_tolerance_is_accepted(tmp_path):
    # 7.88e10 x 1.09 = 8.59e10: 9% off, inside the documented 10%.
    row = demo_row(shear_modulus_typical="8.59e10", shear_modulus_high="8.7e10")
    assert len(m.load_csv(write(tmp_path, [row]))) == 1


def test_duplicate_ids_are_reported_at_the_second_row(tmp_path):
    error = load_error(tmp_path, [demo_row("same"), demo_row("other"), demo_row("same")])
    assert (error.row, error.column) == (3, "id")
    assert "duplicate" in error.message


def test_every_problem_is_reported_in_row_order(tmp_path):
    rows = [
        demo_row("a", density_low=""),
        demo_row("b"),
        demo_row("c", family="unobtainium", strength_low="5e8"),
    ]
    error = load_error(tmp_path, rows)
    assert [(p.row, p.column) for p in error.problems] == [
        (1, "density_low"),
        (3, "family"),
        (3, "strength_low"),
    ]
    text = str(error)
    assert "3 problem(s)" in text and "row 3, column 'family'" in text


def test_missing_and_unknown_columns_are_file_level_problems(tmp_path):
    columns = [c for c in COLUMNS if c != "price_low"] + ["densty_low"]
    error = load_error(tmp_path, [demo_row()], columns)
    assert {(p.row, p.column, p.message) for p in error.problems} == {
        (None, "price_low", "missing column"),
        (None, "densty_low", "unknown column"),
    }


def test_unreadable_file_is_a_data_error(tmp_path):
    with pytest.raises(m.MaterialDataError) as caught:
        m.load_csv(tmp_path / "absent.csv")
    assert caught.value.row is None and "cannot read" in caught.value.message


def test_builtin_table_is_loaded_once_and_is_large_enough():
    table = m.load_builtin()
    assert m.load_builtin() is table
    assert len(table) >= 60
    assert len(set(table.families)) >= 8
    assert set(table.families) <= set(m.FAMILIES)


def test_arrays_are_read_only():
    table = m.load_builtin()
    with pytest.raises(ValueError, match="read-only"):
        table.typical["density"][0] = 1.0


# --------------------------------------------------------------------------- table access


@pytest.fixture()
def table(tmp_path):
    rows = [
        demo_row("a"),
        demo_row("b", family="aluminium", shear_strength_low="1e8", shear_strength_high="2e8"),
        demo_row("c", family="polymer", forms="solid_round"),
    ]
    return m.load_csv(write(tmp_path, rows))


def test_conservative_basis_takes_low_stiffness_and_strength_and_high_density(table):
    for prop in ("youngs_modulus", "shear_modulus", "strength", "shear_strength"):
        np.testing.assert_array_equal(table.values(prop, "conservative"), table.low[prop])
    np.testing.assert_array_equal(table.values("density", "conservative"), table.high["density"])
    for prop in ("poisson_ratio", "tensile_strength", "price", "embodied_carbon"):
        np.testing.assert_array_equal(table.values(prop, "conservative"), table.typical[prop])
    np.testing.assert_array_equal(table.values("density"), table.typical["density"])


def test_values_rejects_unknown_property_and_basis(table):
    with pytest.raises(UnknownResource):
        table.values("hardness")
    with pytest.raises(UnknownResource):
        table.values("density", "optimistic")


def test_shear_strength_is_own_value_else_von_mises(table):
    for basis in m.BASES:
        shear = table.shear_strength(basis)
        strength = table.values("strength", basis)
        # von Mises: yield in pure shear = yield / sqrt(3).
        assert shear[0] == pytest.approx(strength[0] / math.sqrt(3), rel=1e-12)
        assert shear[1] == table.values("shear_strength", basis)[1]
    assert table.shear_strength("conservative")[1] == 1e8


def test_take_accepts_positions_and_masks(table):
    picked = table.take([2, 0])
    assert picked.ids == ("c", "a")
    assert picked.typical["density"].tolist() == [
        table.typical["density"][2],
        table.typical["density"][0],
    ]
    assert table.take(np.array([False, True, False])).ids == ("b",)
    assert len(table.take([])) == 0


def test_concat_appends_and_rejects_colliding_ids(table):
    extra = m.from_records([record("d")])
    combined = table.concat(extra)
    assert combined.ids == ("a", "b", "c", "d")
    assert combined.typical["density"][-1] == 1000.0
    with pytest.raises(InputError) as caught:
        table.concat(m.from_records([record("d"), record("b")]))
    assert list(caught.value.errors) == ["1.id"]


def test_material_and_records_round_trip(table):
    material = table.material("b")
    assert material.family == "aluminium"
    assert material.properties["shear_strength"].low == 1e8
    assert material.properties["density"].unit == "kg/m^3"
    assert material.forms == ("solid_round", "round_tube")  # contract order
    assert "shear_strength" not in table.material("a").properties
    with pytest.raises(UnknownResource):
        table.material("nope")
    again = m.from_records(table.records())
    assert again.ids == table.ids
    for prop in m.ALL_PROPERTIES:
        for end in ("low", "high", "typical"):
            np.testing.assert_array_equal(getattr(again, end)[prop], getattr(table, end)[prop])


# --------------------------------------------------------------------------- client materials


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


def test_client_material_defaults():
    table = m.from_records([record()])
    # tensile_strength defaults to the strength range; temperature unknown (NaN).
    np.testing.assert_array_equal(table.low["tensile_strength"], table.low["strength"])
    assert np.isnan(table.typical["max_service_temperature"][0])
    assert table.typical["youngs_modulus"][0] == pytest.approx(math.sqrt(6e18), rel=1e-12)
    assert table.isotropic[0]
    assert not m.from_records([record(family="composite")]).isotropic[0]
    assert len(m.from_records([])) == 0


BAD_RECORDS = [
    (with_property("density", {"low": -1.0, "high": 1100.0}), "0.properties.density", "positive"),
    (
        with_property("density", {"low": 1200.0, "high": 1100.0}),
        "0.properties.density",
        "above high",
    ),
    (
        with_property("density", {"low": "heavy", "high": 1100.0}),
        "0.properties.density.low",
        "number",
    ),
    (
        with_property("density", {"low": 900.0, "high": 1100.0, "unit": "g/cm^3"}),
        "0.properties.density.unit",
        "kg/m^3",
    ),
    (with_property("density", 1000.0), "0.properties.density", "object"),
    (
        with_property("hardness", {"low": 1.0, "high": 2.0}),
        "0.properties.hardness",
        "unknown property",
    ),
    (
        with_property("poisson_ratio", {"low": 0.35, "high": 0.6}),
        "0.properties.poisson_ratio",
        "(0, 0.5]",
    ),
    (
        with_property("shear_modulus", {"low": 2e9, "high": 3e9}),
        "0.properties.shear_modulus",
        "E/(2(1+nu))",
    ),
    (with_property("shear_strength", {"high": 3e7}), "0.properties.shear_strength", "both"),
    ({k: v for k, v in record().items() if k != "family"}, "0.family", "missing"),
    (record(family="unobtainium"), "0.family", "unknown family"),
    (record(forms=["solid_round", 3]), "0.forms.1", "string"),
    (record(forms=["hollow_star"]), "0.forms", "unknown form"),
    (record(family="foam", isotropic=False), "0.forms", "core"),
    (record(id="Not A Slug"), "0.id", "slug"),
    (record(isotropic="yes"), "0.isotropic", "true or false"),
    (record(colour="red"), "0.colour", "unknown field"),
    ("not an object", "0", "object"),
]


@pytest.mark.parametrize(("bad", "path", "words"), BAD_RECORDS)
def test_from_records_reports_each_problem_at_its_path(bad, path, words):
    with pytest.raises(InputError) as caught:
        m.from_records([bad])
    errors = caught.value.errors
    assert list(errors) == [path], errors
    assert any(words in message for message in errors[path])


def test_from_records_reports_missing_properties_and_duplicates_together():
    missing = record("x")
    del missing["properties"]["strength"]
    with pytest.raises(InputError) as caught:
        m.from_records([record("a"), missing, record("a")])
    assert set(caught.value.errors) == {"1.properties.strength", "2.id"}
    prefixed = caught.value.prefixed("custom_materials")
    assert "custom_materials.1.properties.strength" in prefixed.errors


def test_from_records_needs_a_list():
    with pytest.raises(InputError):
        m.from_records({"id": "x"})


# --------------------------------------------------------------------------- select


def test_select_by_family_ids_exclude_and_where(table):
    assert m.select(table).ids == table.ids
    assert m.select(table, families=["steel", "polymer"]).ids == ("a", "c")
    assert m.select(table, ids=["c", "a"]).ids == ("a", "c")  # table order
    assert m.select(table, exclude=["b"]).ids == ("a", "c")
    assert m.select(table, families=["steel", "aluminium"], exclude=["a"]).ids == ("b",)
    strength = table.typical["strength"][0]
    assert len(m.select(table, where={"strength": {"min": strength}})) == 3
    assert len(m.select(table, where={"strength": {"max": strength * 0.99}})) == 0
    # Only b has a shear strength; a NaN never passes a bound.
    assert m.select(table, where={"shear_strength": {"min": 0.0}}).ids == ("b",)


@pytest.mark.parametrize(
    ("kwargs", "path"),
    [
        ({"families": ["steel", "adamantium"]}, "families.1"),
        ({"ids": ["a", "zz"]}, "ids.1"),
        ({"exclude": ["zz"]}, "exclude.0"),
        ({"where": {"hardness": {"min": 1.0}}}, "where.hardness"),
        ({"where": {"density": {"min": 2.0, "max": 1.0}}}, "where.density"),
        ({"where": {"density": {"least": 2.0}}}, "where.density"),
        ({"where": {"density": {"min": "heavy"}}}, "where.density"),
    ],
)
def test_select_rejects_unknown_names_and_bad_bounds(table, kwargs, path):
    with pytest.raises(InputError) as caught:
        m.select(table, **kwargs)
    assert list(caught.value.errors) == [path]
