"""The command line and the gunicorn command line that `make serve` and docker/Dockerfile use."""

import json
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

from service.cli import gunicorn_argv, main

ROOT = Path(__file__).resolve().parent.parent


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


def test_gunicorn_serves_health_with_two_workers():
    port = _free_port()
    process = subprocess.Popen(
        gunicorn_argv("127.0.0.1", port, 2),
        cwd=ROOT,
        stdout=subprocess.PIPE,
        stderr=subprocess.STDOUT,
    )
    try:
        deadline = time.monotonic() + 60
        body = None
        while time.monotonic() < deadline and body is None:
            try:
                with urllib.request.urlopen(
                    f"http://127.0.0.1:{port}/v1/health", timeout=2
                ) as reply:
                    body = json.load(reply)
            except OSError:
                if process.poll() is not None:
                    break
                time.sleep(0.3)
        assert body is not None, (
            process.stdout.read().decode() if process.poll() is not None else "no answer"
        )
        assert body["status"] == "ok"
    finally:
        process.terminate()
        process.communicate(timeout=30)


def test_dockerfile_runs_the_same_gunicorn_entry_point():
    dockerfile = (ROOT / "docker" / "Dockerfile").read_text()
    assert "service.wsgi:app" in dockerfile
    # Same worker model and limits as `formwise serve`.
    options = gunicorn_argv("h", 1, 1)
    for flag in ("--worker-class", "--threads", "--timeout"):
        assert f"{flag} {options[options.index(flag) + 1]}" in dockerfile
    assert "HEALTHCHECK" in dockerfile and "/v1/health" in dockerfile
    assert "USER " in dockerfile


def test_validate_data_accepts_builtin(capsys):
    assert main(["validate-data"]) == 0
    assert capsys.readouterr().out.startswith("ok: ")


def test_validate_data_reports_bad_file(tmp_path, capsys):
    bad = tmp_path / "bad.csv"
    bad.write_text("id,name\nx,y\n")
    assert main(["validate-data", str(bad)]) == 1
    assert "bad.csv" in capsys.readouterr().err


def test_validate_data_checks_the_form_limits_beside_the_file(tmp_path, capsys):
    from service.core.materials import BUILTIN_CSV, FORM_LIMITS_CSV

    (tmp_path / "materials.csv").write_text(BUILTIN_CSV.read_text())
    limits = FORM_LIMITS_CSV.read_text().replace("steel,i_section,rolled,",
                                                 "steel,i_section,forged,")
    (tmp_path / "form_limits.csv").write_text(limits)
    assert main(["validate-data", str(tmp_path / "materials.csv")]) == 1
    err = capsys.readouterr().err
    assert "form_limits.csv" in err and "unknown process" in err


def test_unknown_command_is_usage_error():
    with pytest.raises(SystemExit) as caught:
        main(["frobnicate"])
    assert caught.value.code == 2


def test_module_entry_point_shows_help():
    result = subprocess.run(
        [sys.executable, "-m", "service", "--help"], capture_output=True, text=True
    )
    assert result.returncode == 0 and "serve" in result.stdout


def test_schemas_prints_the_document_to_standard_output(capsys):
    """`formwise schemas` no longer rewrites the package's own copy unless told to."""
    assert main(["schemas"]) == 0
    printed = json.loads(capsys.readouterr().out)
    from service.cli import SCHEMA_PATH

    assert printed == json.loads(SCHEMA_PATH.read_text())


def test_schemas_writes_a_file_with_o(tmp_path, capsys):
    target = tmp_path / "openapi.json"
    assert main(["schemas", "-o", str(target)]) == 0
    assert json.loads(target.read_text())["openapi"].startswith("3.1")
    assert capsys.readouterr().out == ""
