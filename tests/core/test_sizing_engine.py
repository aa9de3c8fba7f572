"""The sizing engine (service.core.sizing.engine): each case of a batch equals its own call.

The reference here is a batch of one, :func:`size_designs`, whose designs are checked
against published formulas and independent section properties in tests/validation and
tests/properties. A batch of many cases must give each case the same designs to the bit: the
same materials, families and order, dimensions exactly equal, masses within 1e-12 relative
(the contract of POST /v1/sweeps: a row equals what POST /v1/designs returns for that case
alone), the same governing requirement, and for a case without a design the same reason.
Rows the engine leaves out (they cannot be among a case's best) never change that.
"""

from __future__ import annotations

import dataclasses
import math
import pickle

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from sizing_cases import BENDING, numbers

from service.core.errors import InputError
from service.core.materials import load_builtin
from service.core.sizing import (
    CaseSizer,
    CatalogMember,
    DesignRequest,
    size_cases,
    size_designs,
    validate_request,
)
from service.core.sizing import selfsimilar as selfsimilar_module
from service.core.sizing.engine import made_in, screened_out
from service.core.sizing.fields import at_contract_paths
from service.core.sweeps import build_sweep, infeasible_reason, sweep_rows

MASS_TOLERANCE = 1e-12
"""Relative: the two paths run the same arithmetic on the same inputs; only the order of
independent rows in the arrays differs, which changes nothing at all."""

TABLE = load_builtin()
# Metals, composites, polymers, a wood and a ceramic: several forms are missing among them,
# so "not made in this form" rejections occur too.
IDS = ("s355j2", "al_6061_t6", "ti_6al_4v_annealed", "cfrp_qi_sm", "gfrp_pultruded_e23", "pa6",
       "pom")
MATERIALS = TABLE.take([TABLE.ids.index(i) for i in IDS]
                       + [TABLE.families.index(family) for family in ("wood", "ceramic")])
FOUR = ("round_tube", "rectangular_tube", "i_section", "solid_rectangle")

FIVE = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube", "i_section")


def assert_same(batched, alone, request):
    """The batch's result equals size_designs' for ``request``, every mismatch listed."""
    problems = []
    if len(batched.designs) != len(alone.designs):
        problems.append(f"{len(batched.designs)} designs, expected {len(alone.designs)}")
    for rank, (ours, theirs) in enumerate(zip(batched.designs, alone.designs, strict=False)):
        if (ours.material_id, ours.family) != (theirs.material_id, theirs.family):
            problems.append(f"rank {rank}: {ours.material_id} {ours.family}, expected "
                            f"{theirs.material_id} {theirs.family}")
            continue
        if not math.isclose(ours.mass, theirs.mass, rel_tol=MASS_TOLERANCE):
            problems.append(f"rank {rank}: mass {ours.mass!r}, expected {theirs.mass!r}")
        if ours.dimensions != theirs.dimensions:
            problems.append(f"rank {rank}: {ours.dimensions}, expected {theirs.dimensions}")
        if ours.governing != theirs.governing:
            problems.append(f"rank {rank}: {ours.governing}, expected {theirs.governing}")
        if ours != theirs:
            problems.append(f"rank {rank}: {ours}, expected {theirs}")
    if not alone.designs and infeasible_reason(batched) != infeasible_reason(alone):
        problems.append(f"reason {infeasible_reason(batched)!r}, "
                        f"expected {infeasible_reason(alone)!r}")
    assert not problems, f"{request}: " + "; ".join(problems)


@st.composite
def batches(draw):
    """A few groups (shared everything but the numbers), several cases each, shuffled."""
    requests = []
    for _ in range(draw(st.integers(1, 3))):
        load_case = draw(st.sampled_from([*BENDING, "torsion"]))
        bending = load_case != "torsion"
        shared = {
            "load_case": load_case,
            "self_weight": bending and draw(st.booleans()),
            "local_buckling": draw(st.booleans()),
            "objective": draw(st.sampled_from(["mass", "cost", "carbon"])),
            "property_basis": draw(st.sampled_from(["typical", "conservative"])),
            "sections": (FOUR if bending else ("round_tube", "rectangular_tube",
                                               "solid_rectangle")),
            "top": draw(st.sampled_from([1, 2, 3, None])),
        }
        for _ in range(draw(st.integers(1, 3))):
            request = DesignRequest(**shared, **draw(numbers(load_case)))
            try:
                validate_request(request)
            except InputError:
                continue          # an impossible combination: sweeps refuse it up front
            requests.append(request)
    return draw(st.permutations(requests))


@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(batches())
def test_batches_equal_per_request_designs(requests):
    results = size_cases(requests, MATERIALS)
    assert len(results) == len(requests)
    for request, batched in zip(requests, results, strict=True):
        assert_same(batched, size_designs(request, MATERIALS), request)


def spread(count, **fixed):
    """``count`` cases of one group, from feasible to impossible (max_depth down to 2 mm)."""
    base = {"load_case": "simply_supported_center_load", "sections": FOUR, "top": 2,
            "safety_factor": 1.5, **fixed}
    return [DesignRequest(**base, span=0.4 + 0.3 * (k % 7), load=150.0 * (1 + k),
                          max_deflection=0.002 + 0.001 * (k % 5),
                          max_depth=[0.002, 0.03, 0.08, None][k % 4]) for k in range(count)]


def test_blocks_split_inside_cases(monkeypatch):
    # Blocks of a few rows cut through cases and families; rows stay independent.
    monkeypatch.setattr(selfsimilar_module, "BLOCK_ELEMENTS", 3000)
    requests = spread(9, self_weight=True)
    for request, batched in zip(requests, size_cases(requests, MATERIALS), strict=True):
        assert_same(batched, size_designs(request, MATERIALS), request)
    assert not size_cases(requests[:1], MATERIALS)[0].designs   # the 2 mm case has none


def test_every_design_when_top_is_none():
    requests = spread(3, top=None)
    for request, batched in zip(requests, size_cases(requests, MATERIALS), strict=True):
        alone = size_designs(request, MATERIALS)
        assert_same(batched, alone, request)
        assert len(batched.designs) == len(alone.designs)


def test_sandwich_and_catalogue_requests_fall_back_per_case():
    # Default sections include the sandwich panel (sized case by case inside its group); a
    # catalogue request goes through size_designs whole. Core: the built-in foams.
    panels = [DesignRequest("cantilever_end_load", span=span, load=400.0, max_deflection=0.01,
                            max_width=0.2, max_depth=0.05) for span in (0.5, 1.0)]
    member = CatalogMember("CHS 48.3x3.2", "round_tube",
                           {"outer_diameter": 0.0483, "wall": 0.0032})
    catalogue = DesignRequest("cantilever_end_load", span=1.0, load=400.0, top=2,
                              sections=("round_tube",), catalog=(member,))
    requests = [*panels, catalogue]
    results = size_cases(requests, MATERIALS)
    for request, batched in zip(requests, results, strict=True):
        assert_same(batched, size_designs(request, MATERIALS), request)
    assert results[-1].designs[0].designation == "CHS 48.3x3.2"
    assert any(d.family == "sandwich_panel" for r in results[:2] for d in r.designs)


def test_an_impossible_request_is_refused_like_size_designs():
    bad = dataclasses.replace(spread(1)[0], safety_factor=0.5)
    with pytest.raises(InputError) as caught:
        size_cases([*spread(2), bad], MATERIALS)
    assert "requirements.safety_factor" in at_contract_paths(caught.value).errors


def test_rows_equal_per_case_designs_in_worker_processes():
    """The sweep table from two worker processes, chunk by chunk, equals one size_designs
    call per case (the contract's equality, through pickling both ways)."""
    base = DesignRequest("cantilever_uniform_load", span=1.0, load=300.0,
                         max_deflection=0.005, sections=FOUR)
    sweep = build_sweep(base, grid={"load_case.span": [0.5, 1.5, 3.0],
                                    "envelope.max_depth": [0.002, 0.04]}, top=2)
    sizer = pickle.loads(pickle.dumps(CaseSizer(MATERIALS)))
    rows = list(sweep_rows(sweep, sizer, chunk_size=2, workers=2))
    columns = sweep.columns()
    expected = []
    for case in range(len(sweep.cases)):
        alone = size_designs(sweep.request(case), MATERIALS)
        if not alone.designs:
            expected.append((case, None, None, infeasible_reason(alone)))
        expected.extend((case, rank, d.material_id, d.governing, d.reported().mass,
                         d.dimensions) for rank, d in enumerate(alone.designs, start=1))
    got = []
    for row in rows:
        record = dict(zip(columns, row, strict=True))
        if record["rank"] is None:
            assert record["governing"] is None
            got.append((record["case"], None, None, record["reason"]))
            continue
        dims = {k.removeprefix("dimensions."): v for k, v in record.items()
                if k.startswith("dimensions.") and v is not None}
        got.append((record["case"], record["rank"], record["material_id"], record["governing"],
                    record["mass"], dims))
    assert got == expected
    assert any(entry[1] is None for entry in got)          # the 2 mm envelope has no design


@settings(max_examples=6, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(numbers("simply_supported_uniform_load"), min_size=2, max_size=4),
       st.sampled_from([1, 3]), st.sampled_from(["mass", "cost", "carbon"]))
def test_rows_left_out_never_change_the_best_designs(cases, top, objective):
    """With every built-in material (84, most of which cannot be among a case's best), the
    batch leaves rows out and still gives exactly size_designs' designs."""
    requests = []
    for values in cases:
        request = DesignRequest("simply_supported_uniform_load", sections=FOUR, top=top,
                                objective=objective, **values)
        try:
            validate_request(request)
        except InputError:
            continue
        requests.append(request)
    for request, batched in zip(requests, size_cases(requests, TABLE), strict=True):
        assert_same(batched, size_designs(request, TABLE), request)


def recorded_sizing(monkeypatch) -> list[int]:
    """The number of rows of each call that refines and rounds rows of a batch."""
    sized_rows = []
    original = selfsimilar_module.SelfSimilarRun.size

    def recording(run, rows):
        sized_rows.append(len(rows))
        return original(run, rows)

    monkeypatch.setattr(selfsimilar_module.SelfSimilarRun, "size", recording)
    return sized_rows


def test_rows_left_out_by_a_wrong_estimate_are_sized_after_all(monkeypatch):
    """The grid's estimate only decides what is sized first: with an estimate far too
    optimistic almost every row is left out, and the check against the designs found sizes
    the ones that could still be among the best."""
    monkeypatch.setattr(selfsimilar_module.SelfSimilarRun, "estimate",
                        lambda self: self.reshape(self.start.lightest) * 1e-3)
    sized_rows = recorded_sizing(monkeypatch)
    requests = spread(6)
    results = size_cases(requests, TABLE)
    passes = len(sized_rows)              # before size_designs (which sizes every row) adds
    for request, batched in zip(requests, results, strict=True):
        assert_same(batched, size_designs(request, TABLE), request)
    assert passes > len(FOUR), "the second pass never ran"


@pytest.mark.parametrize(("changes", "everything"), [
    ({}, False), ({"top": None}, True), ({"self_weight": True}, False)])
def test_rows_are_left_out_only_with_a_top(monkeypatch, changes, everything):
    sized_rows = recorded_sizing(monkeypatch)
    requests = [dataclasses.replace(r, **changes) for r in spread(8, max_width=0.1)]
    results = size_cases(requests, TABLE)
    sized = sum(sized_rows)               # before size_designs (which sizes every row) adds
    for request, batched in zip(requests, results, strict=True):
        assert_same(batched, size_designs(request, TABLE), request)
    kept = ~screened_out(TABLE, requests[0])
    made = sum(int((made_in(TABLE, family) & kept).sum()) for family in FOUR) * len(requests)
    assert (sized == made) is everything, (sized, made)


def test_not_made_in_this_form(table, pick):
    glass = pick(table, "glass_soda_lime")
    assert "i_section" not in glass.forms[0]
    result = size_designs(DesignRequest("cantilever_end_load", span=1.0, load=100.0,
                                        sections=("i_section",)), glass)
    assert [r.reason for r in result.rejected] == ["not made in this form"]


def test_self_weight_makes_designs_heavier(table, pick):
    request = DesignRequest("simply_supported_uniform_load", span=6.0, load=2000.0,
                            max_deflection=0.02, sections=FIVE)
    materials = pick(table, "s355j2", "douglas_fir")
    light = {(d.material_id, d.family): d.mass for d in size_designs(request, materials).designs}
    heavy = size_designs(dataclasses.replace(request, self_weight=True), materials).designs
    assert heavy and all(d.mass > light[(d.material_id, d.family)] for d in heavy)


def test_designs_sorted_by_the_objective_and_cut_to_top(table, pick):
    materials = pick(table, "s355j2", "al_6061_t6", "cfrp_qi_sm", "douglas_fir")
    base = DesignRequest("cantilever_end_load", span=1.0, load=500.0, max_deflection=0.005,
                         sections=("round_tube",))
    for objective in ("mass", "cost", "carbon"):
        designs = size_designs(dataclasses.replace(base, objective=objective), materials).designs
        values = [getattr(d, objective) for d in designs]
        assert values == sorted(values)
    by_cost = size_designs(dataclasses.replace(base, objective="cost"), materials).designs
    by_mass = size_designs(base, materials).designs
    assert [d.material_id for d in by_cost] != [d.material_id for d in by_mass]
    top = size_designs(dataclasses.replace(base, top=2), materials).designs
    assert [d.material_id for d in top] == [d.material_id for d in by_mass[:2]]


def test_conservative_basis_is_heavier(table, pick):
    request = DesignRequest("cantilever_end_load", span=1.0, load=500.0, max_deflection=0.005,
                            sections=("solid_round",))
    materials = pick(table, "s355j2", "al_6061_t6")
    typical = size_designs(request, materials).designs
    conservative = size_designs(dataclasses.replace(request, property_basis="conservative"),
                                materials).designs
    by_id = {d.material_id: d.mass for d in typical}
    assert all(d.mass >= by_id[d.material_id] for d in conservative)


def test_no_feasible_design_returns_reasons_not_an_error(table, pick):
    request = DesignRequest("cantilever_end_load", span=3.0, load=1e5, max_deflection=0.001,
                            max_depth=0.01, max_width=0.01, sections=FIVE)
    result = size_designs(request, pick(table, "s355j2", "al_6061_t6"))
    assert result.designs == ()
    assert len(result.rejected) == 10
    assert all(r.reason for r in result.rejected)


def test_brittle_materials_are_left_out_by_default_with_the_way_to_include_them(table):
    """Brittle materials (service/core/materials/brittleness.py) are rejected unless the
    request allows them; allowed, they are sized like the rest (the house's safe default)."""
    ids = ["sic_sintered", "al_6061_t6"]
    materials = table.take([table.position(m) for m in ids])
    assert materials.brittle.tolist() == [True, False]
    request = DesignRequest("cantilever_end_load", 0.9, load=44.0, max_deflection=4e-3,
                            safety_factor=2.0, sections=("round_tube",), max_depth=0.03)
    default = size_designs(request, materials)
    assert {d.material_id for d in default.designs} == {"al_6061_t6"}
    allowed = size_designs(dataclasses.replace(request, allow_brittle=True), materials)
    assert {d.material_id for d in allowed.designs} == set(ids)
    every = size_cases([dataclasses.replace(request, top=None)], materials,
                       every_rejection=True)[0]
    reasons = [r.reason for r in every.rejected if r.material_id == "sic_sintered"]
    assert len(reasons) == 1 and reasons[0].startswith("brittle (")
    assert "requirements.allow_brittle" in reasons[0]
