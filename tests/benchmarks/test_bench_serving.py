"""The service as it is deployed: gunicorn on loopback (``formwise serve``'s command line, two
workers), measured from a client. Run with ``make bench`` (``--benchmark-only``), or one at a
time with ``-k``; the README's "Performance" section gives the figures and the machine.

- The README's worked request (all materials, every family, top 5): the median of sequential
  requests over one kept-alive connection, against the same request in-process, side by side.
- Under load: ``wrk`` (Debian package ``wrk``; skipped without it) at 32 connections for 60 s
  against the README request; every request must be answered (no socket error, timeout or
  non-2xx), and the latency percentiles are printed.
- A sweep of 10,000 cases x every built-in material x four families through POST /v1/sweeps
  as NDJSON: the time to the first row, the total time and the peak memory of the server's
  process tree (workers and sweep processes), against a sweep of a tenth of the cases
  (memory flat in the number of cases: rows stream, chunks are bounded).

Targets from issue 16: first row within 1 s, the 10,000 cases within 20 s (the engine's speed
decides the total; this measures what the serving adds), zero errors under wrk.
"""

from __future__ import annotations

import http.client
import json
import re
import shutil
import statistics
import subprocess
import time
from pathlib import Path
from urllib.parse import urlsplit

import numpy as np
import pytest
from serving import gunicorn, peak_tree_rss  # the benchmarks' helper (same directory)
from test_bench_sweeps import machine

from service import create_app
from tests.readme import README_REQUEST

WRK_CONNECTIONS = 32
WRK_SECONDS = 60
WRK_TIMEOUT = "30s"
"""wrk counts an answer slower than this as a timeout error (its default, 2 s, is shorter
than a queue of 32 requests takes on two cores)."""

FOUR = ["solid_round", "round_tube", "rectangular_tube", "i_section"]
SWEEP = {  # 25 x 20 x 20 = 10,000 cases of a cantilever, every built-in material
    "base": {"load_case": {"type": "cantilever_end_load", "span": "1 m", "load": "100 N"},
             "requirements": {"max_deflection": "5 mm"}, "sections": FOUR},
    "grid": {"load_case.span": np.round(np.linspace(0.3, 2.7, 25), 3).tolist(),
             "load_case.load": np.round(np.geomspace(10.0, 500.0, 20), 2).tolist(),
             "requirements.max_deflection": np.round(np.geomspace(0.001, 0.05, 20), 5
                                                     ).tolist()},
    "top": 1,
}


def _post(connection: http.client.HTTPConnection, path: str, body: dict,
          headers: dict | None = None) -> http.client.HTTPResponse:
    connection.request("POST", path, json.dumps(body),
                       {"Content-Type": "application/json", **(headers or {})})
    return connection.getresponse()


def _connection(url: str) -> http.client.HTTPConnection:
    parts = urlsplit(url)
    return http.client.HTTPConnection(parts.hostname, parts.port, timeout=600)


def test_bench_readme_request_through_gunicorn(benchmark):
    client = create_app({"TESTING": True}).test_client()
    with gunicorn() as server:
        connection = _connection(server.url)

        def post() -> bytes:
            response = _post(connection, "/v1/designs", README_REQUEST)
            body = response.read()
            assert response.status == 200
            return body

        # each worker starts its design processes on its first request: a few requests on
        # new connections reach both workers, and the pause lets the processes start (it
        # outlasts gunicorn's keep-alive, so the timed requests use a new connection)
        for _ in range(6):
            connection.close()
            connection.connect()
            post()
        time.sleep(5.0)
        connection.close()
        connection.connect()
        body = benchmark.pedantic(post, rounds=30, warmup_rounds=3)
        served = benchmark.stats.stats.median
        connection.close()
    local = []
    for _ in range(30):
        start = time.perf_counter()
        assert client.post("/v1/designs", json=README_REQUEST).status_code == 200
        local.append(time.perf_counter() - start)
    in_process = statistics.median(local)
    print(f"\n{machine()}; README request through gunicorn: median {served * 1e3:.0f} ms "
          f"({len(body) / 1e3:.1f} kB); in-process (Flask test client) {in_process * 1e3:.0f}"
          f" ms: serving adds {(served - in_process) * 1e3:.0f} ms")
    assert json.loads(body)["designs"]


def _wrk_figures(output: str) -> dict[str, object]:
    """Requests, errors and latency percentiles (ms) from wrk's ``--latency`` report."""
    def ms(text: str) -> float:
        value, unit = re.fullmatch(r"([\d.]+)(us|ms|s|m)", text).groups()
        return float(value) * {"us": 1e-3, "ms": 1.0, "s": 1e3, "m": 6e4}[unit]

    percentiles = {f"p{p}": ms(v) for p, v in re.findall(r"^\s+(\d+)%\s+(\S+)$", output, re.M)}
    socket = re.search(r"Socket errors: connect (\d+), read (\d+), write (\d+), timeout (\d+)",
                       output)
    non_2xx = re.search(r"Non-2xx or 3xx responses: (\d+)", output)
    return {
        "requests": int(re.search(r"(\d+) requests in", output).group(1)),
        "per_second": float(re.search(r"Requests/sec:\s+([\d.]+)", output).group(1)),
        "errors": (sum(map(int, socket.groups())) if socket else 0)
        + (int(non_2xx.group(1)) if non_2xx else 0),
        **percentiles,
    }


@pytest.mark.skipif(shutil.which("wrk") is None, reason="wrk is not installed (apt-get "
                                                          "install wrk)")
def test_bench_readme_request_under_load_with_wrk(benchmark, tmp_path):
    script = tmp_path / "readme.lua"
    script.write_text('wrk.method = "POST"\n'
                      'wrk.headers["Content-Type"] = "application/json"\n'
                      f"wrk.body = {json.dumps(json.dumps(README_REQUEST))}\n")
    with gunicorn() as server:
        command = ["wrk", "-t2", f"-c{WRK_CONNECTIONS}", f"-d{WRK_SECONDS}s",
                   f"--timeout={WRK_TIMEOUT}", "--latency", "-s", str(script),
                   f"{server.url}/v1/designs"]
        output = benchmark.pedantic(
            lambda: subprocess.run(command, capture_output=True, text=True, check=True).stdout,
            rounds=1, iterations=1)
        load = Path("/proc/loadavg").read_text().split()[:3]
    figures = _wrk_figures(output)
    print(f"\n{machine()}; load average {' '.join(load)} after the run\n$ {' '.join(command)}"
          f"\n{output}\nfigures: {figures}")
    assert figures["requests"] > 0
    assert figures["errors"] == 0, figures


def _stream_sweep(url: str, spec: dict) -> tuple[float, float, list[dict]]:
    """(seconds to the first row, seconds in all, the rows) of a sweep streamed as NDJSON."""
    connection = _connection(url)
    start = time.perf_counter()
    response = _post(connection, "/v1/sweeps", spec, {"Accept": "application/x-ndjson"})
    assert response.status == 200
    first, rows = None, []
    for line in response:
        if first is None:
            first = time.perf_counter() - start
        rows.append(json.loads(line))
    total = time.perf_counter() - start
    connection.close()
    return first, total, rows


def test_bench_ten_thousand_case_sweep_streamed_through_gunicorn(benchmark):
    tenth = {**SWEEP, "grid": {**SWEEP["grid"],
                               "load_case.span": SWEEP["grid"]["load_case.span"][:5],
                               "load_case.load": SWEEP["grid"]["load_case.load"][:10]}}
    with gunicorn(workers=1) as server:
        with peak_tree_rss(server.pid) as small_peak:
            _, small_total, small_rows = _stream_sweep(server.url, tenth)
        with peak_tree_rss(server.pid) as peak:
            first, total, rows = benchmark.pedantic(
                lambda: _stream_sweep(server.url, SWEEP), rounds=1, iterations=1)
    assert [row["case"] for row in rows] == list(range(10_000))
    assert [row["case"] for row in small_rows] == list(range(1_000))
    load = Path("/proc/loadavg").read_text().split()[:3]
    print(f"\n{machine()}; load average {' '.join(load)} after the run; 10,000 cases x every "
          f"built-in material x 4 families, NDJSON through gunicorn (1 worker, "
          f"FORMWISE_SWEEP_WORKERS = one per CPU): first row {first:.2f} s, all rows "
          f"{total:.1f} s ({total / 10:.2f} ms/case); peak RSS of the server's process tree "
          f"{peak[0] / 2**20:.0f} MB; 1,000 cases: {small_total:.1f} s, peak "
          f"{small_peak[0] / 2**20:.0f} MB")
    assert first < 1.0
    assert peak[0] < 1.5 * small_peak[0]  # flat: ten times the cases, not ten times the memory
