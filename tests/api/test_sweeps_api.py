"""POST /v1/sweeps: formats, equality with per-case /v1/designs, validation and caps."""

import json

import pytest

from service import create_app
from service.formats import read_csv_table

BASE = {
    "load_case": {"type": "simply_supported_uniform_load", "span": "1.2 m", "load": "600 N"},
    "requirements": {"max_deflection": "3 mm", "safety_factor": 1.5},
    "envelope": {"max_depth": "60 mm", "max_width": "60 mm"},
    "sections": ["round_tube", "rectangular_tube"],
    "materials": {"families": ["aluminium", "steel"]},
}
GRID = {"load_case.span": ["0.8 m", "1.6 m"], "load_case.load": [200, "1 kN"]}


def _post(client, body, accept="application/json"):
    # json.dumps keeps the grid's key order (the test client's json= would sort the keys).
    return client.post(
        "/v1/sweeps", data=json.dumps(body), content_type="application/json",
        headers={"Accept": accept},
    )


@pytest.fixture(scope="module")
def table(app):
    response = _post(app.test_client(), {"base": BASE, "grid": GRID, "top": 2})
    assert response.status_code == 200, response.get_json()
    return response.get_json()


def test_json_table_shape(table):
    assert table["cases"] == 4
    assert table["columns"][:3] == ["case", "load_case.span", "load_case.load"]
    assert len(table["rows"]) == 8
    assert "qualified engineer" in table["caution"]


def test_rows_equal_per_case_designs(client, table):
    columns = table["columns"]
    spans = {"0.8 m": 0.8, "1.6 m": 1.6}
    for row in table["rows"]:
        record = dict(zip(columns, row, strict=True))
        span_text = next(text for text, value in spans.items() if value == record["load_case.span"])
        load_text = 200 if record["load_case.load"] == 200 else "1 kN"
        body = json.loads(json.dumps(BASE))
        body["load_case"].update(span=span_text, load=load_text)
        design = client.post("/v1/designs", json=body).get_json()["designs"][record["rank"] - 1]
        assert (record["material_id"], record["family"]) == (
            design["material"]["id"],
            design["section"]["family"],
        )
        assert record["mass"] == design["mass"]
        assert record["governing"] == design["governing"]
        for name in ("deflection", "twist", "max_stress"):
            assert record[name] == design[name]
        for name, value in design["utilization"].items():
            assert record[f"utilization.{name}"] == value
        assert record["designation"] == design["section"]["designation"]
        assert record["core_material_id"] is None and record["reason"] is None
        for name, value in design["section"]["dimensions"].items():
            assert record[f"dimensions.{name}"] == value


def test_csv_parses_back_to_the_same_table(client, table):
    response = _post(client, {"base": BASE, "grid": GRID, "top": 2}, accept="text/csv")
    assert response.status_code == 200
    assert response.mimetype == "text/csv"
    assert "qualified engineer" in response.headers["Formwise-Caution"]
    columns, rows = read_csv_table(response.get_data(as_text=True))
    assert columns == table["columns"]
    assert len(rows) == len(table["rows"])
    for text_row, row in zip(rows, table["rows"], strict=True):
        for text, value in zip(text_row, row, strict=True):
            if value is None:
                assert text == ""
            elif isinstance(value, float):
                assert float(text) == value
            else:
                assert text == str(value)


def test_ndjson_parses_back_to_the_same_table(client, table):
    response = _post(client, {"base": BASE, "grid": GRID, "top": 2}, accept="application/x-ndjson")
    assert response.mimetype == "application/x-ndjson"
    assert response.is_streamed
    records = [json.loads(line) for line in response.get_data(as_text=True).splitlines()]
    assert [list(r) for r in records] == [table["columns"]] * len(records)
    assert [list(r.values()) for r in records] == table["rows"]


def test_explicit_cases(client):
    body = {"base": BASE, "cases": [{"load_case.span": "0.5 m"}, {"envelope.max_depth": 0.04}]}
    result = _post(client, body).get_json()
    assert result["columns"][1:3] == ["load_case.span", "envelope.max_depth"]
    assert [row[1:3] for row in result["rows"]] == [[0.5, 0.06], [1.2, 0.04]]


def test_infeasible_case_row(client):
    body = {"base": BASE, "grid": {"envelope.max_depth": ["1 mm"]}}
    result = _post(client, body).get_json()
    (row,) = result["rows"]
    record = dict(zip(result["columns"], row, strict=True))
    assert record["rank"] is None and record["material_id"] is None
    assert record["governing"] is None
    assert record["reason"].startswith("no feasible design; closest: ")


def test_parquet_is_the_same_table_with_typed_columns(client, table):
    """Read back with pandas (pyarrow): the same cells, ``rank`` an integer column even with
    an empty cell, and a column empty in every row still numeric."""
    import io

    import pandas as pd

    body = {"base": BASE, "cases": [{"load_case.span": "0.8 m"},
                                    {"envelope.max_depth": "1 mm"}], "top": 2}
    response = _post(client, body, accept="application/vnd.apache.parquet")
    assert response.status_code == 200
    assert response.mimetype == "application/vnd.apache.parquet"
    assert "qualified engineer" in response.headers["Formwise-Caution"]
    frame = pd.read_parquet(io.BytesIO(response.get_data()))
    expected = _post(client, body).get_json()
    assert list(frame.columns) == expected["columns"]
    assert str(frame["rank"].dtype) == "Int64" and str(frame["case"].dtype) == "Int64"
    assert frame["twist"].dtype == "float64" and frame["twist"].isna().all()
    assert frame["rank"].tolist()[:2] == [1, 2] and pd.isna(frame["rank"].iloc[-1])
    assert frame["reason"].iloc[-1].startswith("no feasible design")
    for k, row in enumerate(expected["rows"]):
        for column, value in zip(expected["columns"], row, strict=True):
            cell = frame[column].iloc[k]
            assert (pd.isna(cell) if value is None else cell == value), (k, column)


@pytest.mark.parametrize(
    ("body", "path"),
    [
        ({"base": BASE}, "grid"),
        ({"base": BASE, "grid": GRID, "cases": [{}]}, "grid"),
        ({"base": BASE, "grid": {"load_case.span": ["2 kg"]}}, "grid.load_case.span.0"),
        ({"base": BASE, "grid": {"load_case.span": []}}, "grid.load_case.span"),
        ({"base": BASE, "grid": {"custom_materials": [1]}}, "grid.custom_materials"),
        ({"base": BASE, "cases": [{"load_case.load": "3 m"}]}, "cases.0.load_case.load"),
        ({"base": {**BASE, "load_case": {"type": "torsion", "span": 1}},
          "grid": {"load_case.span": [1]}},
         "base.load_case.torque"),
        ({"base": BASE, "grid": GRID, "top": 0}, "top"),
        ({"grid": GRID}, "base"),
        ({"base": {**BASE, "top": 3}, "grid": GRID}, "base.top"),
        ({"base": {**BASE, "pareto": ["mass", "cost"]}, "grid": GRID}, "base.pareto"),
    ],
)
def test_bad_sweeps_are_422_naming_the_field(client, body, path):
    response = _post(client, body)
    assert response.status_code == 422
    assert response.mimetype == "application/problem+json"
    assert path in response.get_json()["errors"], response.get_json()["errors"]


def test_case_cap_is_configurable():
    small = create_app({"TESTING": True, "SWEEP_MAX_CASES": 3}).test_client()
    response = _post(small, {"base": BASE, "grid": GRID})
    assert response.status_code == 422
    assert "at most 3" in response.get_json()["errors"]["grid"][0]


def test_a_sweep_varies_the_bearing_length_and_reports_the_bearing(client):
    """requirements.bearing_length is sweepable (fields.py): a knife edge and a 100 mm
    bearing, each case with its utilization.bearing column; the longer bearing is lighter
    or equal (within the search's 0.5 % exactness: every resistance grows with it)."""
    base = {**BASE, "sections": ["rectangular_tube"], "materials": {"ids": ["al_6061_t6"]}}
    body = {"base": base, "grid": {"requirements.bearing_length": ["0 mm", "100 mm"]}}
    response = _post(client, body)
    assert response.status_code == 200, response.get_json()
    table = response.get_json()
    rows = [dict(zip(table["columns"], row, strict=True)) for row in table["rows"]]
    knife, saddle = ([r for r in rows if r["case"] == case] for case in (0, 1))
    assert knife and saddle
    assert all(r["utilization.bearing"] is not None for r in knife + saddle)
    assert saddle[0]["mass"] <= knife[0]["mass"] * 1.005
