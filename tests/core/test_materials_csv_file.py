"""Material CSV files: reading, locating every problem, the built-in file."""

import math

import numpy as np
import pytest
from material_rows import COLUMNS, demo_row, load_error, write

from service.core import materials as m


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
