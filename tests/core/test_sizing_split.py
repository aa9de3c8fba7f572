"""One design request on two CPUs (service.core.sizing.split): its families sized in shares.

The reference is :func:`size_designs` on the whole request, itself checked against published
formulas, SLSQP and brute force in tests/validation and tests/properties. Split, a request
must give exactly its result: the same designs in the same order (dataclass equality: every
dimension, mass and utilization equal to the bit) and the same rejections in the same order,
whether a share is sized in a worker process or, when that worker dies, in this one.
"""

from __future__ import annotations

import dataclasses
import itertools
import os
import signal

import pytest

from service.core.loading.actions import Action
from service.core.materials import load_builtin
from service.core.materials.limits import PropertyLimit
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.split import FAMILY_COST, FamilySplit, merge_results, shares

TABLE = load_builtin()

README = DesignRequest("cantilever_end_load", span=0.9, load=44.0, max_deflection=0.004,
                       safety_factor=2.0, max_depth=0.03, max_width=0.03, min_wall=0.0005,
                       objective="mass", top=5)
"""README.md's worked request."""

REQUESTS = {
    "readme": README,
    "every design": dataclasses.replace(README, top=None),
    "cost, brittle allowed, a property limit": dataclasses.replace(
        README, objective="cost", allow_brittle=True,
        property_limits=(PropertyLimit("fracture_toughness", min=20e6),)),
    "column": DesignRequest("column", span=1.5, load=20e3, safety_factor=1.5,
                            end_conditions="pinned_pinned", max_depth=0.08, max_width=0.08),
    "general member": DesignRequest(
        "member", span=0.8, supports="simply_supported", safety_factor=1.5,
        max_deflection=0.002, actions=(Action("force", 500.0, at=0.4),
                                       Action("torque", 20.0, at=0.4))),
    "two families": dataclasses.replace(README, sections=("i_section", "round_tube")),
}


@pytest.fixture(scope="module")
def split():
    split = FamilySplit(2)
    assert split.ready(timeout=120.0)
    yield split
    split.close()


def test_shares_hold_each_family_once_in_the_requests_order():
    families = tuple(FAMILY_COST)
    for count in (1, 2, 3, 6, 9):
        parts = shares(families, count)
        assert len(parts) == min(count, len(families))
        assert sorted(f for part in parts for f in part) == sorted(families)
        for part in parts:
            assert part and list(part) == sorted(part, key=families.index)
    two = shares(families, 2)
    costs = [sum(FAMILY_COST[f] for f in part) for part in two]
    # the greedy split of the six measured costs is as even as any split of them (every
    # subset tried), the costliest share first
    total = sum(FAMILY_COST.values())
    even = min(max(cost := sum(FAMILY_COST[f] for f in subset), total - cost)
               for size in range(len(families) + 1)
               for subset in itertools.combinations(families, size))
    assert costs[0] >= costs[1] > 0
    assert costs[0] == pytest.approx(even)


@pytest.mark.parametrize("name", list(REQUESTS))
def test_a_split_request_is_the_whole_requests_result(split, name):
    request = REQUESTS[name]
    whole = size_designs(request, TABLE)
    assert len(shares(request.families, 2)) == 2
    found = split(request, TABLE)
    assert found.designs == whole.designs
    assert found.rejected == whole.rejected
    assert whole.designs or whole.rejected      # the comparison compares something


def test_merging_the_shares_by_hand_gives_the_whole_result():
    """Without worker processes: each share through size_designs, then merge_results."""
    request = REQUESTS["cost, brittle allowed, a property limit"]
    parts = [size_designs(dataclasses.replace(request, sections=part), TABLE)
             for part in shares(request.families, 3)]
    assert merge_results(request, parts) == size_designs(request, TABLE)


def test_a_killed_worker_loses_nothing_and_the_next_request_starts_a_new_one():
    split = FamilySplit(2)
    try:
        assert split.ready(timeout=120.0)
        for pid in split.worker_pids():
            os.kill(pid, signal.SIGKILL)
        whole = size_designs(README, TABLE)
        assert split(README, TABLE) == whole          # the share sized here instead
        assert split.ready(timeout=120.0)              # a new pool, started afresh
        assert split(README, TABLE) == whole
    finally:
        split.close()


def test_one_worker_or_a_catalogue_is_sized_here():
    one = FamilySplit(1)
    assert not one.ready(timeout=0.0)
    assert one(README, TABLE) == size_designs(README, TABLE)
