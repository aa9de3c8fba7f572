"""`formwise sweep` and `formwise design` on spec files, and the dask path."""

import json

import pandas as pd
import pytest

from service.cli import main
from service.formats import read_csv_table

BASE = {
    "load_case": {"type": "cantilever_uniform_load", "span": "0.7 m", "load": "120 N"},
    "requirements": {"max_deflection": "5 mm", "safety_factor": 2},
    "envelope": {"max_depth": "40 mm"},
    "sections": ["round_tube", "i_section"],
    "materials": {"families": ["aluminium", "composite"]},
}
SPEC = {"base": BASE,
        "grid": {"load_case.span": ["0.5 m", "1 m", "1.5 m"], "load_case.load": [50, 200]},
        "top": 2}


@pytest.fixture()
def spec_file(tmp_path):
    path = tmp_path / "spec.json"
    path.write_text(json.dumps(SPEC))
    return path


@pytest.fixture(scope="module")
def api_table(app):
    response = app.test_client().post(
        "/v1/sweeps", data=json.dumps(SPEC), content_type="application/json"
    )
    assert response.status_code == 200
    return response.get_json()


def test_sweep_to_csv_equals_the_api_table(spec_file, tmp_path, api_table, capsys):
    out = tmp_path / "out.csv"
    assert main(["sweep", str(spec_file), "-o", str(out)]) == 0
    columns, rows = read_csv_table(out.read_text())
    assert columns == api_table["columns"]
    assert len(rows) == len(api_table["rows"])
    mass = columns.index("mass")
    assert [float(r[mass]) for r in rows] == [r[mass] for r in api_table["rows"]]
    assert "wrote 6 cases" in capsys.readouterr().err


def test_sweep_to_jsonl_and_parquet(spec_file, tmp_path, api_table):
    jsonl = tmp_path / "out.jsonl"
    assert main(["sweep", str(spec_file), "-o", str(jsonl)]) == 0
    records = [json.loads(line) for line in jsonl.read_text().splitlines()]
    assert [list(r.values()) for r in records] == api_table["rows"]
    parquet = tmp_path / "out.parquet"
    assert main(["sweep", str(spec_file), "-o", str(parquet)]) == 0
    frame = pd.read_parquet(parquet)
    assert list(frame.columns) == api_table["columns"]
    assert frame["mass"].tolist() == [
        r[api_table["columns"].index("mass")] for r in api_table["rows"]
    ]


def test_progress_bar_on_stderr(spec_file, tmp_path, capsys):
    assert main(["sweep", str(spec_file), "-o", str(tmp_path / "o.csv"), "--progress"]) == 0
    err = capsys.readouterr().err
    assert "6/6 cases" in err and "[" in err


def test_bad_spec_gets_field_messages_and_exit_2(tmp_path, capsys):
    bad = tmp_path / "bad.json"
    bad.write_text(
        json.dumps({"base": {**BASE, "min_wall": "3 kg"}, "grid": {"load_case.span": [-1]}})
    )
    assert main(["sweep", str(bad), "-o", str(tmp_path / "o.csv")]) == 2
    err = capsys.readouterr().err
    assert f"{bad}: base.min_wall:" in err
    assert f"{bad}: grid.load_case.span.0:" in err


@pytest.mark.parametrize("content", ["{not json", "[1, 2]"])
def test_malformed_spec_exit_2(tmp_path, capsys, content):
    bad = tmp_path / "bad.json"
    bad.write_text(content)
    assert main(["sweep", str(bad), "-o", str(tmp_path / "o.csv")]) == 2
    assert str(bad) in capsys.readouterr().err


def test_unknown_output_format_is_usage_error(spec_file, tmp_path):
    assert main(["sweep", str(spec_file), "-o", str(tmp_path / "o.xlsx")]) == 2


def test_missing_spec_file(tmp_path, capsys):
    assert main(["sweep", str(tmp_path / "none.json"), "-o", str(tmp_path / "o.csv")]) == 2
    assert "cannot read" in capsys.readouterr().err


def test_design_prints_a_table_with_the_caution(tmp_path, capsys):
    request = tmp_path / "request.json"
    request.write_text(json.dumps({**BASE, "top": 3}))
    assert main(["design", str(request)]) == 0
    out = capsys.readouterr().out
    lines = out.splitlines()
    assert lines[0].split()[:3] == ["rank", "material", "section"]
    assert [line.split()[0] for line in lines[1:4]] == ["1", "2", "3"]
    assert "qualified engineer" in out


def test_design_json_equals_the_api(tmp_path, capsys, app):
    request = tmp_path / "request.json"
    request.write_text(json.dumps({**BASE, "top": 3}))
    assert main(["design", str(request), "--json"]) == 0
    printed = json.loads(capsys.readouterr().out)
    served = app.test_client().post("/v1/designs", json={**BASE, "top": 3}).get_json()
    assert printed == served


def test_dask_path_equals_the_local_path(spec_file, tmp_path):
    distributed = pytest.importorskip("dask.distributed")
    local = tmp_path / "local.csv"
    remote = tmp_path / "dask.csv"
    assert main(["sweep", str(spec_file), "-o", str(local)]) == 0
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=False,
                                  dashboard_address=None) as cluster:
        assert main(
            ["sweep", str(spec_file), "-o", str(remote), "--dask", cluster.scheduler_address]
        ) == 0
    assert remote.read_text() == local.read_text()
