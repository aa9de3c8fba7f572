"""Speed of sweeps: batched sizing against the per-request loop, and a 10,000-case sweep.

Targets (from the sweeps issue): 10,000 cases x every built-in material x four families
(round_tube, rectangular_tube, i_section, solid_rectangle) in under 60 s on the project's
2-core machine, with memory bounded by chunking. Each benchmark also checks a sample of its
cases against one size_designs call each (the contract: a sweep row equals the design
POST /v1/designs gives for that case alone). Run with ``make bench`` (``--benchmark-only``).
"""

from __future__ import annotations

import os
import resource
import time
import tracemalloc
from pathlib import Path

import numpy as np
import pytest

from service.core.materials import load_builtin
from service.core.sizing import CaseSizer, DesignRequest, size_cases, size_designs
from service.core.sweeps import build_sweep, sweep_rows

FOUR = ("round_tube", "rectangular_tube", "i_section", "solid_rectangle")
BASE = DesignRequest("simply_supported_center_load", span=2.0, load=5000.0,
                     max_deflection=0.005, safety_factor=1.5, sections=FOUR)
# Ten values on each of four axes: light to heavy members, loose to tight limits; a handful
# of the 10,000 cases (long, heavily loaded, shallow) have no design at all.
GRID = {
    "load_case.span": np.linspace(0.5, 3.0, 10).tolist(),
    "load_case.load": np.geomspace(100.0, 20_000.0, 10).tolist(),
    "requirements.max_deflection": np.geomspace(0.004, 0.04, 10).tolist(),
    "envelope.max_depth": np.geomspace(0.05, 0.5, 10).tolist(),
}
RATIO_CASES = 200
TARGET_SECONDS = 60.0


@pytest.fixture(scope="module")
def table():
    return load_builtin()


@pytest.fixture(scope="module")
def sweep():
    return build_sweep(BASE, grid=GRID, top=1)


def machine() -> str:
    models = [line.split(":", 1)[1].strip()
              for line in Path("/proc/cpuinfo").read_text().splitlines()
              if line.startswith("model name")] if Path("/proc/cpuinfo").exists() else []
    return f"{os.cpu_count()} CPUs, {models[0] if models else 'unknown CPU model'}"


def same_designs(batched, alone) -> bool:
    return [(d.material_id, d.family, d.mass, d.dimensions, d.governing)
            for d in batched.designs] == [
        (d.material_id, d.family, d.mass, d.dimensions, d.governing) for d in alone.designs]


def test_bench_batched_against_the_per_request_loop(benchmark, table, sweep):
    """200 cases spread over the whole grid, in one process: size_cases against the loop of
    size_designs that sweeps used before, timed side by side."""
    step = len(sweep.cases) // RATIO_CASES
    requests = [sweep.request(i) for i in range(0, len(sweep.cases), step)][:RATIO_CASES]
    batched = benchmark.pedantic(size_cases, args=(requests, table), rounds=3,
                                 warmup_rounds=1)
    ours = benchmark.stats.stats.median
    start = time.perf_counter()
    alone = [size_designs(request, table) for request in requests]
    loop = time.perf_counter() - start
    print(f"\n{machine()}; {len(requests)} cases x {len(table)} materials x 4 families: "
          f"batched {ours:.2f} s ({ours / len(requests) * 1e3:.1f} ms/case), per-request loop "
          f"{loop:.2f} s ({loop / len(requests) * 1e3:.1f} ms/case): {loop / ours:.1f}x")
    mismatched = [r for r, b, a in zip(requests, batched, alone, strict=True)
                  if not same_designs(b, a)]
    assert not mismatched, mismatched
    assert loop / ours >= 3.0


def test_bench_ten_thousand_case_sweep(benchmark, table, sweep):
    """The issue's target: the whole grid, every built-in material, in worker processes (one
    per CPU, as ``formwise sweep`` runs it), timed once."""
    assert len(sweep.cases) == 10_000
    sizer = CaseSizer(table)
    # Memory per chunk of 256 cases, in this process (numpy's arrays are traced): what each
    # worker holds at most, whatever the number of cases.
    chunk = [sweep.request(i) for i in range(0, len(sweep.cases), 39)][:256]
    tracemalloc.start()
    sizer(chunk)
    chunk_peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    workers = os.cpu_count() or 1
    rows = benchmark.pedantic(lambda: list(sweep_rows(sweep, sizer, workers=workers)),
                              rounds=1, iterations=1)
    elapsed = benchmark.stats.stats.max
    parent = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    worker = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024
    cases = {row[0] for row in rows}
    infeasible = sum(1 for row in rows if row[len(sweep.paths) + 1] is None)
    print(f"\n{machine()}; {len(cases)} cases x {len(table)} materials x 4 families, "
          f"{workers} workers: {elapsed:.1f} s ({elapsed / len(cases) * 1e3:.2f} ms/case), "
          f"{infeasible} cases without a design; peak memory: sizing one 256-case chunk "
          f"{chunk_peak / 2**20:.0f} MB traced, largest worker {worker:.0f} MB RSS, "
          f"parent {parent:.0f} MB RSS")
    assert cases == set(range(len(sweep.cases)))
    columns = sweep.columns()
    first_rows = {}
    for row in rows:
        first_rows.setdefault(row[0], dict(zip(columns, row, strict=True)))
    mismatched = []
    for case in range(0, len(sweep.cases), 997):
        alone = size_designs(sweep.request(case), table).designs[0]
        record = first_rows[case]
        if (record["material_id"], record["family"], record["mass"]) != (
                alone.material_id, alone.family, alone.mass):
            mismatched.append((case, record, alone))
    assert not mismatched, mismatched
    assert elapsed < TARGET_SECONDS
