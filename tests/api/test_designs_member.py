"""POST /v1/designs and /v1/sweeps with a general member (contract: "General member loading"):
the load case, its units, its problems by JSON path, frequency and diagrams in the response.

The sizing numbers are checked in tests/core/test_sizing_member.py and
tests/properties/test_member_feasibility.py; here the HTTP layer must carry them faithfully.
"""

from __future__ import annotations

import copy

import pytest

from service.core.loading.actions import Action
from service.core.materials import load_builtin, select
from service.core.sizing import DesignRequest, size_designs

MEMBER = {
    "load_case": {
        "type": "member", "span": "1.2 m", "supports": "simply_supported",
        "actions": [
            {"kind": "force", "at": "300 mm", "value": "1.5 kN"},
            {"kind": "distributed", "from": 0.5, "to": 1.1, "value": "200 N/m"},
            {"kind": "torque", "at": 0.7, "value": "40 N*m", "cyclic": "reversed"},
            {"kind": "mass", "at": 0.6, "value": "1.2 kg"},
        ],
    },
    "requirements": {"max_deflection": 0.004, "safety_factor": 1.5, "min_frequency": 30,
                     "fatigue_cycles": 1e6},
    "sections": ["round_tube", "solid_round"],
    "materials": {"ids": ["s355j2", "al_6061_t6"]},
    "diagrams": True,
}


def _with(path: str, value):
    body = copy.deepcopy(MEMBER)
    node = body
    *parents, leaf = path.split(".")
    for key in parents:
        node = node[int(key)] if key.isdigit() else node[key]
    if value is None:
        del node[int(leaf) if leaf.isdigit() else leaf]
    else:
        node[int(leaf) if leaf.isdigit() else leaf] = value
    return body


def test_a_member_request_is_sized_with_its_units_and_returns_frequency_and_diagrams(client):
    response = client.post("/v1/designs", json=MEMBER)
    assert response.status_code == 200, response.get_json()
    body = response.get_json()
    assert body["designs"]
    # the same request in SI through the core gives the same designs
    request = DesignRequest(
        "member", span=1.2, supports="simply_supported",
        actions=(Action("force", 1500.0, at=0.3),
                 Action("distributed", 200.0, start=0.5, end=1.1),
                 Action("torque", 40.0, at=0.7, cyclic="reversed"),
                 Action("mass", 1.2, at=0.6)),
        max_deflection=0.004, safety_factor=1.5, min_frequency=30.0, fatigue_cycles=1e6,
        sections=("round_tube", "solid_round"), diagrams=True)
    table = select(load_builtin(), ids=["s355j2", "al_6061_t6"])
    expected = size_designs(request, table).designs
    # the response reports masses to 4 significant digits
    assert [(d["material"]["id"], d["section"]["family"]) for d in body["designs"]] \
        == [(d.material_id, d.family) for d in expected]
    assert [d["mass"] for d in body["designs"]] == pytest.approx(
        [d.mass for d in expected], rel=1e-3)
    for design in body["designs"]:
        assert design["frequency"] >= 30.0
        assert set(design["utilization"]) >= {"frequency", "fatigue"}
        assert max(u for u in design["utilization"].values() if u is not None) <= 1.0
        lines = design["diagrams"]
        assert set(lines) == {"x", "shear", "moment", "torque", "axial", "deflection"}
        assert lines["x"][0] == 0.0 and lines["x"][-1] == pytest.approx(1.2)
        assert max(abs(t) for t in lines["torque"]) > 0


@pytest.mark.parametrize(("path", "value", "where"), [
    ("load_case.actions.0.at", 1.5, "load_case.actions.0.at"),          # outside the span
    ("load_case.actions.3.value", -1.0, "load_case.actions.3.value"),   # a negative mass
    ("load_case.actions.1.to", 0.2, "load_case.actions.1.to"),          # ends before it starts
    ("load_case.actions.2.at", None, "load_case.actions.2.at"),         # a torque needs at
    ("load_case.actions.0.kind", "moment", "load_case.actions.0.kind"),
    ("load_case.actions.2.cyclic", "sometimes", "load_case.actions.2.cyclic"),
    ("load_case.supports", "floating", "load_case.supports"),           # unstable/unknown
    ("load_case.supports", None, "load_case.supports"),
    ("requirements.fatigue_cycles", 0.5, "requirements.fatigue_cycles"),  # below 1
    ("requirements.min_frequency", -5, "requirements.min_frequency"),
    ("load_case.actions.0.value", "3 kg", "load_case.actions.0.value"),   # wrong unit
])
def test_bad_member_input_is_a_422_naming_the_field(client, path, value, where):
    response = client.post("/v1/designs", json=_with(path, value))
    assert response.status_code == 422
    problem = response.get_json()
    assert where in problem["errors"], problem["errors"]


def test_a_shorthand_field_on_a_member_case_is_named(client):
    body = _with("load_case.load", 100.0)
    response = client.post("/v1/designs", json=body)
    assert response.status_code == 422
    assert "load_case.load" in response.get_json()["errors"]


def test_naming_sandwich_panels_for_a_member_is_refused(client):
    body = _with("sections", ["sandwich_panel"])
    body["envelope"] = {"max_width": 0.3}
    response = client.post("/v1/designs", json=body)
    assert response.status_code == 422
    assert "sections.0" in response.get_json()["errors"]


def test_sweeps_vary_the_span_and_the_frequency_of_a_member(client):
    base = copy.deepcopy(MEMBER)
    del base["diagrams"]
    response = client.post("/v1/sweeps", json={
        "base": base, "grid": {"load_case.span": [1.2, 1.4],
                               "requirements.min_frequency": [10, 40]}})
    assert response.status_code == 200, response.get_json()
    table = response.get_json()
    assert table["cases"] == 4
    columns = table["columns"]
    frequency_column = columns.index("requirements.min_frequency")
    governing = columns.index("governing")
    assert {row[frequency_column] for row in table["rows"]} == {10.0, 40.0}
    assert all(row[governing] for row in table["rows"])


def test_a_sweep_that_moves_the_span_below_an_action_names_it(client):
    base = copy.deepcopy(MEMBER)
    del base["diagrams"]
    response = client.post("/v1/sweeps", json={"base": base,
                                               "grid": {"load_case.span": [1.0]}})
    assert response.status_code == 422
    assert "base.load_case.actions.1.to" in response.get_json()["errors"]


def test_sweeps_vary_an_actions_position_and_value_with_units(client):
    base = copy.deepcopy(MEMBER)
    del base["diagrams"]
    response = client.post("/v1/sweeps", json={
        "base": base, "cases": [{"load_case.actions.0.at": "0.2 m",
                                 "load_case.actions.0.value": "1 kN"},
                                {"load_case.actions.0.at": 0.9,
                                 "load_case.actions.3.value": "3 kg"}]})
    assert response.status_code == 200, response.get_json()
    table = response.get_json()
    columns = table["columns"]
    assert columns[1:4] == ["load_case.actions.0.at", "load_case.actions.0.value",
                            "load_case.actions.3.value"]
    first, second = (next(row for row in table["rows"] if row[0] == case) for case in (0, 1))
    assert first[1:4] == [0.2, 1000.0, 1.2]
    assert second[1:4] == [0.9, 1500.0, 3.0]
    # the second case, sized alone as a design, gives the same best design
    single = copy.deepcopy(base)
    single["load_case"]["actions"][0]["at"] = 0.9
    single["load_case"]["actions"][3]["value"] = 3.0
    best = client.post("/v1/designs", json=single).get_json()["designs"][0]
    mass = columns.index("mass")
    assert second[mass] == best["mass"]


def test_a_swept_action_outside_the_span_is_named_in_the_grid(client):
    base = copy.deepcopy(MEMBER)
    del base["diagrams"]
    response = client.post("/v1/sweeps", json={
        "base": base, "grid": {"load_case.actions.0.at": [0.5, 2.0]}})
    assert response.status_code == 422
    assert "grid.load_case.actions.0.at" in response.get_json()["errors"]
    response = client.post("/v1/sweeps", json={
        "base": base, "grid": {"load_case.actions.9.at": [0.5]}})
    assert response.status_code == 422
