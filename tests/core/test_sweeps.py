"""Sweep expansion, validation and the row table (service.core.sweeps)."""

import itertools

import pytest

from service.core.errors import InputError
from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, DesignResult, Rejection, size_designs
from service.core.sizing.limits import UTILIZATION_KEYS
from service.core.sweeps import (
    DETAIL_COLUMNS,
    RESULT_COLUMNS,
    build_sweep,
    grid_size,
    infeasible_reason,
    sweep_rows,
)

BASE = DesignRequest(
    load_case="simply_supported_center_load",
    span=1.0,
    load=500.0,
    max_deflection=0.004,
    safety_factor=1.5,
    sections=("round_tube", "rectangular_tube"),
)


@pytest.fixture(scope="module")
def metals():
    table = load_builtin()
    return table.take([i for i, f in enumerate(table.families) if f in {"aluminium", "steel"}])


def test_grid_is_the_cartesian_product_in_order():
    grid = {"load_case.span": [0.5, 1.0, 2.0], "load_case.load": [100.0, 200.0]}
    sweep = build_sweep(BASE, grid=grid)
    assert grid_size(grid) == 6
    assert sweep.cases == tuple(itertools.product([0.5, 1.0, 2.0], [100.0, 200.0]))
    assert sweep.request(3).span == 1.0 and sweep.request(3).load == 200.0
    assert sweep.request(3).max_deflection == BASE.max_deflection


def test_explicit_cases_fill_missing_paths_from_the_base():
    sweep = build_sweep(BASE, cases=[{"load_case.span": 2.0}, {"load_case.load": 50.0}])
    assert sweep.paths == ("load_case.span", "load_case.load")
    assert sweep.cases == ((2.0, 500.0), (1.0, 50.0))


def test_columns_follow_the_contract_order():
    sweep = build_sweep(BASE, grid={"load_case.span": [1.0]})
    columns = sweep.columns()
    assert columns[:2] == ["case", "load_case.span"]
    assert tuple(columns[2 : 2 + len(RESULT_COLUMNS)]) == RESULT_COLUMNS
    # Dimensions of the two families involved, each name once, in family order.
    assert columns[2 + len(RESULT_COLUMNS) : -len(DETAIL_COLUMNS)] == [
        "dimensions.outer_diameter", "dimensions.wall", "dimensions.depth", "dimensions.width",
    ]
    # The details follow, so the contract's columns keep their positions.
    assert columns[-len(DETAIL_COLUMNS):] == [
        "core_material_id", "designation", "deflection", "twist", "max_stress",
        *(f"utilization.{name}" for name in UTILIZATION_KEYS), "reason",
    ]
    assert UTILIZATION_KEYS[:5] == ("stiffness", "strength", "local_buckling", "frequency",
                                    "fatigue")


@pytest.mark.parametrize(
    ("kwargs", "path"),
    [
        ({}, "grid"),
        ({"grid": {"load_case.span": [1.0]}, "cases": [{}]}, "grid"),
        ({"grid": {"materials.ids": [1]}}, "grid.materials.ids"),
        ({"grid": {"load_case.span": []}}, "grid.load_case.span"),
        ({"cases": []}, "cases"),
        ({"cases": [{"load_case.span": 1.0}, {"load_case.span": -1.0}]}, "cases.1.load_case.span"),
        ({"grid": {"load_case.span": [1.0]}, "top": 0}, "top"),
    ],
)
def test_bad_sweeps_name_the_field(kwargs, path):
    with pytest.raises(InputError) as caught:
        build_sweep(BASE, **kwargs)
    assert path in caught.value.errors, caught.value.errors


def test_case_cap_is_enforced_before_expansion():
    grid = {"load_case.span": [1.0] * 1000, "load_case.load": [1.0] * 1000}
    with pytest.raises(InputError) as caught:
        build_sweep(BASE, grid=grid, max_cases=100_000)
    assert "1000000 cases" in caught.value.errors["grid"][0]


def test_rows_equal_per_case_designs(metals):
    """Each row is the same design /v1/designs returns for that case alone."""
    sweep = build_sweep(
        BASE, grid={"load_case.span": [0.6, 1.2], "load_case.load": [200.0, 800.0]}, top=2
    )
    columns = sweep.columns()
    rows = list(
        sweep_rows(sweep, lambda reqs: [size_designs(r, metals) for r in reqs], chunk_size=3)
    )
    assert len(rows) == 4 * 2
    for row in rows:
        record = dict(zip(columns, row, strict=True))
        alone = size_designs(sweep.request(record["case"]), metals).designs[record["rank"] - 1]
        reported = alone.reported()
        assert isinstance(record["rank"], int)
        assert record["material_id"] == alone.material_id
        assert record["family"] == alone.family
        for name in ("mass", "cost", "carbon", "governing", "core_material_id", "designation",
                     "deflection", "twist", "max_stress"):
            assert record[name] == getattr(reported, name), name
        for name, value in reported.utilization.items():
            assert record[f"utilization.{name}"] == value
        for name, value in alone.dimensions.items():
            assert record[f"dimensions.{name}"] == value
        assert record["reason"] is None
        assert record["mass"] == pytest.approx(alone.mass, rel=5e-4)   # 4 significant digits


def test_infeasible_case_gives_one_row_with_the_reason(metals):
    impossible = build_sweep(BASE, grid={"envelope.max_depth": [0.001]})
    (row,) = sweep_rows(impossible, lambda reqs: [size_designs(r, metals) for r in reqs])
    record = dict(zip(impossible.columns(), row, strict=True))
    assert record["rank"] is None and record["material_id"] is None
    assert record["governing"] is None
    assert record["reason"].startswith("no feasible design")
    assert "max_depth" in record["reason"] or "envelope" in record["reason"]


def test_infeasible_reason_names_the_material_closest_to_a_design(metals):
    """Every material's own reason (POST /v1/designs lists them all) says the depth it
    needs; the case's one reason names the material that needs the least, whatever the
    table order."""
    impossible = build_sweep(BASE, grid={"envelope.max_depth": [0.004]})
    (row,) = sweep_rows(impossible, lambda reqs: [size_designs(r, metals) for r in reqs])
    reason = dict(zip(impossible.columns(), row, strict=True))["reason"]
    every = size_designs(impossible.request(0), metals).rejected
    needs = {(r.material_id, r.family): float(r.reason.rsplit("at least ", 1)[1].split()[0])
             for r in every if "needs at least" in r.reason}
    assert len(needs) > 10
    closest, family = min(needs, key=needs.get)
    assert f"closest: {closest} as {family}:" in reason
    first_in_file = next(r for r in every if "needs at least" in r.reason)
    assert needs[(first_in_file.material_id, first_in_file.family)] >= needs[(closest, family)]


def test_infeasible_reason_prefers_a_requirement_over_a_form():
    result = DesignResult(
        designs=(),
        rejected=(
            Rejection(0, "a", "round_tube", "not made in this form"),
            Rejection(1, "b", "round_tube", "envelope max_depth 0.01 m is too small", 3.0),
        ),
    )
    assert infeasible_reason(result) == (
        "no feasible design; closest: b as round_tube: envelope max_depth 0.01 m is too small"
    )


def test_infeasible_reason_takes_the_smallest_shortfall_not_the_first():
    result = DesignResult(designs=(), rejected=(
        Rejection(0, "a", "round_tube", "needs 3 times the depth", 3.0),
        Rejection(1, "b", "i_section", "needs 1.2 times the depth", 1.2),
        Rejection(2, "c", "round_tube", "brittle"),
    ))
    assert "closest: b as i_section: needs 1.2" in infeasible_reason(result)
