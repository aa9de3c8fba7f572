"""`formwise sweep` and `formwise design` on spec files, and the dask path."""

import json

import pandas as pd
import pytest

from service import create_app
from service.cli import main
from service.core import sweeps
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
    assert str(frame["rank"].dtype) == "Int64" and frame["twist"].dtype == "float64"
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
    assert "warning:" not in out
    loose = {**BASE, "top": 1, "requirements": {
        k: v for k, v in BASE.get("requirements", {}).items() if k != "max_deflection"}}
    request.write_text(json.dumps(loose))
    assert main(["design", str(request)]) == 0
    assert "warning: no stiffness requirement given" in capsys.readouterr().out


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


def test_worker_processes_give_the_same_rows_through_http_the_cli_and_dask(
        spec_file, tmp_path, monkeypatch):
    """Six cases in chunks of two: the first case sized in the calling process, the others by
    two worker processes (POST /v1/sweeps streaming NDJSON, ``formwise sweep --workers 2``),
    or by dask tasks; every way gives the table of one process sizing all six together."""
    distributed = pytest.importorskip("dask.distributed")
    pooled = []
    in_processes = sweeps._in_processes
    monkeypatch.setattr(sweeps, "_in_processes",
                        lambda *args: pooled.append(len(args[2])) or in_processes(*args))
    monkeypatch.setattr(sweeps, "CHUNK_CASES", 2)

    def records(path):
        return [json.loads(line) for line in path.read_text().splitlines()]

    alone = tmp_path / "alone.jsonl"
    assert main(["sweep", str(spec_file), "-o", str(alone), "--workers", "1"]) == 0
    expected = records(alone)
    client = create_app({"TESTING": True, "SWEEP_WORKERS": 2}).test_client()
    served = client.post("/v1/sweeps", data=json.dumps(SPEC), content_type="application/json",
                         headers={"Accept": "application/x-ndjson"})  # the grid's order kept
    assert served.status_code == 200
    assert [json.loads(line) for line in served.get_data(as_text=True).splitlines()] == expected
    pooled_cli = tmp_path / "pooled.jsonl"
    assert main(["sweep", str(spec_file), "-o", str(pooled_cli), "--workers", "2"]) == 0
    assert records(pooled_cli) == expected
    assert pooled == [4, 4]  # chunks of 1, 2, 2 and 1 cases, both times in worker processes
    remote = tmp_path / "dask.jsonl"
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=False,
                                  dashboard_address=None) as cluster:
        assert main(
            ["sweep", str(spec_file), "-o", str(remote), "--dask", cluster.scheduler_address]
        ) == 0
    assert records(remote) == expected
    # six cases, top 2 (one row for a case with fewer designs): a test that compares something
    assert sorted({row["case"] for row in expected}) == list(range(6))
    assert sum(row["rank"] is not None for row in expected) >= 9


# ------------------------------------------------------------- exit codes, streams, overrides
# Exit codes as documented in service/cli.py; argparse's 2 for usage errors (Python docs,
# argparse "exit_on_error").

INFEASIBLE = {**BASE, "envelope": {"max_depth": "1 mm", "max_width": "1 mm"}}


def test_sweep_to_standard_output_is_csv(spec_file, api_table, capsys):
    assert main(["sweep", str(spec_file), "-o", "-"]) == 0
    captured = capsys.readouterr()
    columns, rows = read_csv_table(captured.out)
    assert columns == api_table["columns"] and len(rows) == len(api_table["rows"])
    assert "wrote 6 cases (6 with a design) to standard output" in captured.err


def test_sweep_format_option_overrides_the_suffix(spec_file, tmp_path, api_table):
    out = tmp_path / "table.txt"
    assert main(["sweep", str(spec_file), "-o", str(out), "--format", "jsonl"]) == 0
    records = [json.loads(line) for line in out.read_text().splitlines()]
    assert [list(r.values()) for r in records] == api_table["rows"]


def test_sweep_into_a_missing_folder_is_an_io_error_without_traceback(spec_file, tmp_path,
                                                                      capsys):
    target = tmp_path / "no" / "such" / "out.csv"
    assert main(["sweep", str(spec_file), "-o", str(target)]) == 4
    err = capsys.readouterr().err
    assert err.startswith("formwise: cannot write") and "Traceback" not in err


def test_every_case_infeasible_is_exit_3_with_the_table_written(tmp_path, capsys):
    spec = tmp_path / "spec.json"
    spec.write_text(json.dumps({"base": INFEASIBLE, "grid": {"load_case.load": [50, 200]}}))
    out = tmp_path / "out.csv"
    assert main(["sweep", str(spec), "-o", str(out)]) == 3
    columns, rows = read_csv_table(out.read_text())
    assert len(rows) == 2 and all(row[columns.index("rank")] == "" for row in rows)
    assert "(0 with a design)" in capsys.readouterr().err


def test_design_with_no_feasible_design_is_exit_3(tmp_path, capsys):
    request = tmp_path / "request.json"
    request.write_text(json.dumps(INFEASIBLE))
    assert main(["design", str(request)]) == 3
    printed = capsys.readouterr().out
    assert "no feasible design" in printed
    assert "envelope max_depth 0.001 m is too small (" in printed  # a group of its reason
    request.write_text(json.dumps({**INFEASIBLE, "rejections": "all"}))
    assert main(["design", str(request)]) == 3
    assert "al_6061_t6 round_tube: envelope max_depth" in capsys.readouterr().out


def test_top_and_objective_override_the_file(spec_file, tmp_path, app):
    out = tmp_path / "out.jsonl"
    assert main(["sweep", str(spec_file), "-o", str(out), "--top", "1",
                 "--objective", "cost"]) == 0
    rows = [json.loads(line) for line in out.read_text().splitlines()]
    served = app.test_client().post(  # data=, not json=: Flask's json= sorts the grid's keys
        "/v1/sweeps", data=json.dumps({**SPEC, "top": 1, "base": {**BASE, "objective": "cost"}}),
        content_type="application/json", headers={"Accept": "application/x-ndjson"},
    ).get_data(as_text=True)
    assert rows == [json.loads(line) for line in served.splitlines()]
    assert len(rows) == 6


def test_an_override_is_validated_like_the_file(spec_file, tmp_path, capsys):
    assert main(["sweep", str(spec_file), "-o", str(tmp_path / "o.csv"), "--top", "0"]) == 2
    assert f"{spec_file}: top:" in capsys.readouterr().err


def test_a_closed_pipe_ends_quietly(spec_file):
    """`formwise sweep ... -o - | head -1`: no traceback when the reader goes away."""
    import subprocess
    import sys

    script = (
        f"{sys.executable} -m service sweep {spec_file} -o - --top 2 | head -c 10 >/dev/null; "
        "exit ${PIPESTATUS[0]}"
    )
    result = subprocess.run(["bash", "-c", script], capture_output=True, text=True, timeout=120)
    assert "Traceback" not in result.stderr, result.stderr
    assert result.returncode in (0, 4)
