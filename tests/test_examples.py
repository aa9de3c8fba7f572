"""The example exploration script, run against a live server on loopback."""

import csv
import importlib.util
from pathlib import Path

import pytest

EXAMPLE = Path(__file__).resolve().parent.parent / "examples" / "camera_crane_boom.py"


def _load_example():
    spec = importlib.util.spec_from_file_location("camera_crane_boom", EXAMPLE)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_camera_crane_example_writes_a_row_per_case_and_rank(live_url, tmp_path):
    example = _load_example()
    output = tmp_path / "crane.csv"
    assert example.main(["--url", live_url, "-o", str(output)]) == 0
    with output.open() as handle:
        rows = list(csv.DictReader(handle))
    cases = len(example.REACHES_M) * len(example.PAYLOADS_N)
    assert {int(row["case"]) for row in rows} == set(range(cases))
    feasible = [row for row in rows if row["rank"]]
    assert feasible, "at least some crane cases have a design"
    for row in feasible:
        # The sag limit of each case follows its reach, as the script asks.
        assert float(row["requirements.max_deflection"]) == pytest.approx(
            float(row["load_case.span"]) / 200
        )
        assert float(row["dimensions.depth"] or row["dimensions.outer_diameter"]) <= 0.08


def test_example_reports_an_unreachable_server(tmp_path, capsys):
    example = _load_example()
    assert example.main(["--url", "http://127.0.0.1:9", "-o", str(tmp_path / "x.csv")]) == 1
    assert "cannot reach" in capsys.readouterr().err
