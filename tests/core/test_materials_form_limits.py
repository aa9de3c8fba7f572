"""Manufacturing limits: the measures of each family, the check, and the limits file.

Rows written here are demo data (invented for the tests) unless a source is named.
"""

import math

import numpy as np
import pytest
from material_rows import demo_row, load_error, write

from service.core import materials as m
from service.core.materials.form_limits import load_form_limits

COLUMNS = ["applies_to", "form", "process", "min_wall", "max_wall_ratio", "min_size",
           "max_size", "source"]


@pytest.mark.parametrize(
    ("form", "dimensions", "expected"),
    [
        ("solid_round", {"diameter": 0.02}, (math.nan, math.nan, 0.02)),
        ("solid_rectangle", {"depth": 0.01, "width": 0.04}, (0.01, 4.0, 0.04)),
        ("round_tube", {"outer_diameter": 0.05, "wall": 0.002}, (0.002, 25.0, 0.05)),
        ("rectangular_tube", {"depth": 0.06, "width": 0.03, "wall": 0.002}, (0.002, 30.0, 0.06)),
        (
            "i_section",
            {"depth": 0.1, "flange_width": 0.05, "flange_thickness": 0.006,
             "web_thickness": 0.004},
            (0.004, 25.0, 0.1),
        ),
        (
            "sandwich_panel",
            {"width": 0.3, "core_thickness": 0.02, "face_thickness": 0.001},
            (0.001, math.nan, 0.022),
        ),
    ],
)
def test_measures_follow_the_documented_definitions(form, dimensions, expected):
    got = [float(value) for value in m.measures(form, dimensions)]
    np.testing.assert_allclose(got, expected, rtol=1e-12)


def test_measures_broadcast_over_arrays():
    wall, ratio, size = m.measures(
        "round_tube", {"outer_diameter": np.array([0.02, 0.04]), "wall": 0.001}
    )
    assert wall.shape == ratio.shape == size.shape == (2,)
    assert ratio.tolist() == pytest.approx([20.0, 40.0])


def test_within_checks_every_limit():
    limit = m.FormLimit("round_tube", "drawn", 0.001, 40.0, 0.01, 0.1, "demo data")
    dims = {
        "outer_diameter": np.array([0.05, 0.05, 0.05, 0.005, 0.2]),
        "wall": np.array([0.002, 0.0009, 0.001, 0.001, 0.005]),
    }
    # ok; wall too thin; D/t 50 above 40; too small; too large.
    assert m.within(limit, dims).tolist() == [True, False, False, False, False]
    solid = m.FormLimit("solid_round", "rolled", None, None, 0.01, 0.1, "demo data")
    assert m.within(solid, {"diameter": np.array([0.005, 0.05])}).tolist() == [False, True]


def limits_file(tmp_path, rows):
    path = tmp_path / "form_limits.csv"
    lines = [",".join(COLUMNS)] + [",".join(str(v) for v in row) for row in rows]
    path.write_text("\n".join(lines) + "\n")
    return path


STEEL_ROWS = [
    ("steel", "solid_round", "rolled", "", "", 0.005, 0.25, "demo data"),
    ("steel", "round_tube", "welded", 0.002, 100, 0.02, 0.5, "demo data"),
]


def test_a_material_row_overrides_its_family_row(tmp_path):
    rows = STEEL_ROWS + [("b", "round_tube", "drawn", 0.0005, 60, 0.005, 0.15, "demo data")]
    limits, problems = load_form_limits(
        limits_file(tmp_path, rows), ["a", "b"], ["steel", "steel"],
        [("solid_round", "round_tube"), ("round_tube",)],
    )
    assert problems == []
    assert [(x.form, x.process) for x in limits[0]] == [("solid_round", "rolled"),
                                                         ("round_tube", "welded")]
    assert [(x.form, x.process, x.min_wall) for x in limits[1]] == [("round_tube", "drawn",
                                                                     0.0005)]
    assert limits[0][0].min_wall is None


@pytest.mark.parametrize(
    ("row", "column", "words"),
    [
        (("steel", "round_tube", "forged", 0.002, 100, 0.02, 0.5, "demo data"), "process",
         "unknown process"),
        (("steel", "round_tube", "welded", "", 100, 0.02, 0.5, "demo data"), "min_wall",
         "required"),
        (("a", "solid_round", "rolled", 0.002, "", 0.005, 0.25, "demo data"), "min_wall",
         "does not apply"),
        (("steel", "round_tube", "welded", -0.002, 100, 0.02, 0.5, "demo data"), "min_wall",
         "positive"),
        (("steel", "round_tube", "welded", 0.002, 0.5, 0.02, 0.5, "demo data"),
         "max_wall_ratio", "never below"),
        (("steel", "round_tube", "welded", 0.002, 100, 0.6, 0.5, "demo data"), "min_size",
         "above max_size"),
        (("steel", "round_tube", "welded", 0.002, "thin", 0.02, 0.5, "demo data"),
         "max_wall_ratio", "not a number"),
        (("steel", "round_tube", "welded", 0.002, 100, 0.02, 0.5, ""), "source", "source"),
        (("steel", "hollow_star", "welded", 0.002, 100, 0.02, 0.5, "demo data"), "form",
         "unknown form"),
        (("unobtainium", "round_tube", "welded", 0.002, 100, 0.02, 0.5, "demo data"),
         "applies_to", "no material or family"),
    ],
)
def test_each_bad_cell_is_reported_at_its_row_and_column(tmp_path, row, column, words):
    rows = [STEEL_ROWS[0], row]
    _, problems = load_form_limits(
        limits_file(tmp_path, rows), ["a"], ["steel"], [("solid_round",)]
    )
    located = [(p.row, p.column) for p in problems if p.row == 2]
    assert located == [(2, column)], [str(p) for p in problems]
    assert words in next(p.message for p in problems if p.row == 2)


def test_uncovered_forms_unused_rows_and_duplicates_are_reported(tmp_path):
    rows = STEEL_ROWS + [STEEL_ROWS[1]] + [
        ("aluminium", "round_tube", "extruded", 0.001, 60, 0.006, 0.3, "demo data")
    ]
    _, problems = load_form_limits(
        limits_file(tmp_path, rows), ["a", "core"], ["steel", "foam"],
        [("solid_round", "round_tube", "i_section"), ()],
    )
    messages = [(p.row, p.message) for p in problems]
    assert (3, "a second row for steel round_tube") in messages
    assert (4, "aluminium round_tube: no material uses this row") in messages
    assert (None, "no limits for material 'a' made as i_section") in messages
    assert len(problems) == 3


def test_load_csv_reads_limits_beside_the_materials_file(tmp_path):
    limits_file(tmp_path, STEEL_ROWS)
    table = m.load_csv(write(tmp_path, [demo_row("a")]))
    assert [limit.form for limit in table.form_limits[0]] == ["solid_round", "round_tube"]
    values = table.form_limit_values("round_tube")
    assert values["min_wall"].tolist() == [0.002] and values["max_size"].tolist() == [0.5]
    assert np.isnan(table.form_limit_values("i_section")["min_size"]).all()


def test_load_csv_reports_limit_problems_with_the_material_problems(tmp_path):
    limits_file(tmp_path, STEEL_ROWS[:1])
    error = load_error(tmp_path, [demo_row("a", density_low="")])
    where = [(p.file.rsplit("/", 1)[-1], p.row, p.column) for p in error.problems]
    assert where == [("materials.csv", 1, "density_low"), ("form_limits.csv", None, "applies_to")]


def test_builtin_limits_cover_every_structural_material():
    table = m.load_builtin()
    for i, forms in enumerate(table.forms):
        assert {limit.form for limit in table.form_limits[i]} == set(forms), table.ids[i]
