"""Speed of the general member: 1000 cases of 10 actions each, in one vectorised call.

Measured side by side in one run (ratios are what to read on a shared machine): the critical
sections of all cases at once, against the same function called case by case (the plain
alternative an engine would otherwise write), and the diagrams (101 stations plus the
breakpoints) of all cases. Each benchmark checks that the answer has one value per case and
that the vectorised and per-case answers agree, so a broken call cannot pass as fast.
Run with ``make bench``.
"""

from __future__ import annotations

import time

import numpy as np
import pytest

from service.core.loading.actions import Action, member_loading
from service.core.loading.critical import critical_sections
from service.core.loading.frequency import attached_mass_terms
from service.core.loading.internal import diagram_stations, internal_actions

CASES = 1000


def _cases(rng):
    spans = rng.uniform(0.5, 4.0, CASES)
    actions = []
    for span in spans:
        case = [Action("force", rng.uniform(-2e3, 2e3), at=rng.uniform(0, span))
                for _ in range(4)]
        for _ in range(2):
            start, end = np.sort(rng.uniform(0, span, 2))
            case.append(Action("distributed", rng.uniform(-1e3, 1e3), start=start, end=end))
        case += [Action("torque", rng.uniform(-200, 200), at=rng.uniform(0, span))
                 for _ in range(2)]
        case += [Action("axial", rng.uniform(-1e4, 1e4)), Action("mass", 1.0, at=span / 2)]
        actions.append(case)
    return spans, actions


@pytest.fixture(scope="module", params=["cantilever", "fixed_fixed"])
def loading(request):
    spans, actions = _cases(np.random.default_rng(13))
    return member_loading(request.param, spans, actions), spans, actions


@pytest.mark.benchmark(group="general member, 1000 cases x 10 actions")
def test_critical_sections_vectorised_against_case_by_case(benchmark, loading):
    member, spans, actions = loading
    result = benchmark.pedantic(critical_sections, args=(member,), rounds=10, warmup_rounds=2)
    assert result.moment.shape == (CASES,)
    started = time.perf_counter()
    one_by_one = [critical_sections(member_loading(member.supports, [span], [case])).moment[0]
                  for span, case in zip(spans, actions, strict=True)]
    loop_seconds = time.perf_counter() - started
    np.testing.assert_allclose(result.moment, one_by_one, rtol=1e-12)
    ratio = loop_seconds / benchmark.stats.stats.median
    print(f"\n{member.supports}: case by case {loop_seconds * 1e3:.0f} ms, vectorised "
          f"{benchmark.stats.stats.median * 1e3:.1f} ms median: {ratio:.0f}x")
    assert ratio > 1


@pytest.mark.benchmark(group="general member, 1000 cases x 10 actions")
def test_diagrams(benchmark, loading):
    member, _, _ = loading
    x, from_left = diagram_stations(member)
    lines = benchmark.pedantic(internal_actions, args=(member, x, from_left), rounds=10,
                               warmup_rounds=2)
    assert lines.moment.shape == x.shape == (CASES, 101 + 2 * 13)


@pytest.mark.benchmark(group="general member, 1000 cases x 10 actions")
def test_attached_mass_terms(benchmark, loading):
    member, _, _ = loading
    terms = benchmark.pedantic(attached_mass_terms, args=(member,), rounds=5, warmup_rounds=1)
    assert terms.flexibility_mass.shape == (CASES,)
