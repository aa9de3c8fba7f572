"""Speed of POST /v1/designs through the whole Flask stack (in-process test client: request
parsing with units, sizing, the JSON body), against the core call alone in the same run.

The full answer to the sizing benchmark's request (84 materials x 5 families: 188 designs and
232 rejections, about 135 kB of JSON) is the heaviest common response. The HTTP layer only
translates, so it should add a fraction of the sizing time, not a multiple. Run with
``make bench`` (``--benchmark-only``).
"""

from __future__ import annotations

import statistics
import time

import pytest
from test_bench_sizing import FIVE, REQUEST  # the sizing benchmark's request (same directory)

from service import create_app
from service.core.materials import load_builtin
from service.core.sizing import size_designs

BODY = {
    "load_case": {"type": REQUEST.load_case, "span": "2 m", "load": "5 kN"},
    "requirements": {"max_deflection": "5 mm", "safety_factor": REQUEST.safety_factor},
    "envelope": {"max_depth": "100 mm"},
    "sections": list(FIVE),
    "rejections": "all",  # every rejection, one entry each: the heaviest answer
}


@pytest.fixture(scope="module")
def client():
    return create_app({"TESTING": True}).test_client()


def test_bench_http_designs_against_the_core_call(benchmark, client):
    def post():
        response = client.post("/v1/designs", json=BODY)
        assert response.status_code == 200
        return response

    response = benchmark.pedantic(post, rounds=30, warmup_rounds=3)
    http = benchmark.stats.stats.median
    table = load_builtin()
    core = []
    for _ in range(30):
        start = time.perf_counter()
        result = size_designs(REQUEST, table)
        core.append(time.perf_counter() - start)
    core = statistics.median(core)
    body = response.get_json()
    assert len(body["designs"]) == len(result.designs)
    assert len(body["rejected"]) == len(result.rejected)
    print(f"\nPOST /v1/designs median {http * 1e3:.1f} ms ({len(response.data) / 1e3:.0f} kB), "
          f"size_designs alone {core * 1e3:.1f} ms: the HTTP layer adds "
          f"{(http - core) * 1e3:.1f} ms ({http / core:.2f}x)")
    assert http / core < 2.0
