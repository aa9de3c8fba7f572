"""Speed of sizing a general member against the same request written as a shorthand case.

Target (issue "Real loading on a member"): a general case with up to ten actions, sizing every
built-in material in the five non-sandwich families, within 1.5x of the same request written
as the equivalent shorthand case, measured in one run. The general case here is the
shorthand's uniform load cut into ten distributed loads end to end (the same loading, so the
same designs: checked), sized alternately with the shorthand, medians compared.
Run with ``make bench``.
"""

from __future__ import annotations

import statistics
import time

import pytest

from service.core.loading.actions import Action
from service.core.materials import load_builtin
from service.core.sizing import DesignRequest, size_designs

FIVE = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube", "i_section")
SPAN, TOTAL = 2.0, 5000.0
COMMON = dict(span=SPAN, max_deflection=0.005, safety_factor=1.5, max_depth=0.1,
              sections=FIVE)
SHORTHAND = DesignRequest("simply_supported_uniform_load", load=TOTAL, **COMMON)
GENERAL = DesignRequest(
    "member", supports="simply_supported", actions=tuple(
        Action("distributed", TOTAL / SPAN, start=SPAN * i / 10, end=SPAN * (i + 1) / 10)
        for i in range(10)), **COMMON)


@pytest.mark.benchmark
def test_bench_general_member_against_its_shorthand(benchmark):
    table = load_builtin()
    shorthand, general = size_designs(SHORTHAND, table), size_designs(GENERAL, table)
    expected = {(d.material_id, d.family): d.mass for d in shorthand.designs}
    assert {(d.material_id, d.family) for d in general.designs} == set(expected)
    assert all(abs(d.mass / expected[(d.material_id, d.family)] - 1) < 5e-3
               for d in general.designs)
    times: dict[str, list[float]] = {"shorthand": [], "general": []}

    def both():
        for name, request in (("shorthand", SHORTHAND), ("general", GENERAL)):
            start = time.perf_counter()
            size_designs(request, table)
            times[name].append(time.perf_counter() - start)

    benchmark.pedantic(both, rounds=20, warmup_rounds=3)
    medians = {name: statistics.median(values[3:]) for name, values in times.items()}
    ratio = medians["general"] / medians["shorthand"]
    print(f"\nshorthand {medians['shorthand'] * 1e3:.1f} ms, general (10 actions) "
          f"{medians['general'] * 1e3:.1f} ms: {ratio:.2f}x")
    assert ratio < 1.5
