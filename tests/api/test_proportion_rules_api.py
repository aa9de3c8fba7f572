"""Proportion rules over HTTP: GET /v1/sections lists them, a designs request narrows or
widens them (``proportions``), and the answer lists the rules it applied (``rules``).

The numbers checked against the sizing come from Roark's Formulas for Stress and Strain,
8th ed., table 8.1 (from memory), as in tests/core/test_sizing_rules.py.
"""

from __future__ import annotations

import pytest

from service.api.errors import PROBLEM_CONTENT_TYPE

FLAT_BAR = {
    "load_case": {"type": "simply_supported_uniform_load", "span": 3.0, "load": "12 kN"},
    "requirements": {"max_deflection": "6 mm"},
    "sections": ["solid_rectangle"],
    "materials": {"ids": ["s235jr"]},
}


def test_every_family_lists_its_rules(client):
    families = {f["id"]: f for f in client.get("/v1/sections").get_json()["families"]}
    assert families["solid_round"]["rules"] == []
    (rule,) = families["solid_rectangle"]["rules"]
    assert rule["ratio"] == "width/depth"
    assert (rule["min"], rule["max"]) == (0.1, 10.0)
    assert rule["source"]
    assert (rule["widest"]["min"], rule["widest"]["max"]) == (0.1, 10.0)
    assert [r["ratio"] for r in families["i_section"]["rules"]] == [
        "flange_width/depth", "flange_thickness/depth", "web_thickness/depth"]
    for family in families.values():
        dimensions = [d["name"] for d in family["dimensions"]]
        for rule in family["rules"]:
            dimension, scale = rule["ratio"].split("/")
            assert dimension in dimensions and scale in dimensions
            assert rule["widest"]["min"] <= rule["min"] < rule["max"] <= rule["widest"]["max"]


def test_the_answer_lists_the_rules_applied(client):
    body = client.post("/v1/designs", json=FLAT_BAR).get_json()
    assert body["rules"]["solid_rectangle"][0]["min"] == 0.1
    (design,) = body["designs"]
    assert design["governing"] == "proportions"
    assert design["utilization"]["proportions"] == pytest.approx(1.0, abs=1e-3)

    narrowed = {**FLAT_BAR, "proportions": {"solid_rectangle": {"width/depth": {"min": 0.3}}}}
    body = client.post("/v1/designs", json=narrowed).get_json()
    (rule,) = body["rules"]["solid_rectangle"]
    assert (rule["min"], rule["max"]) == (0.3, 10.0)
    assert rule["source"].startswith("the request")
    (design,) = body["designs"]
    dims = design["section"]["dimensions"]
    assert dims["width"] / dims["depth"] == pytest.approx(0.3, rel=1e-3)
    assert design["governing"] == "proportions"


def test_a_catalogue_family_lists_no_rules(client):
    body = client.post("/v1/designs", json={
        "load_case": {"type": "cantilever_end_load", "span": 1.0, "load": 500},
        "sections": ["round_tube"], "materials": {"ids": ["s355j2"]},
        "catalog": [{"designation": "test tube", "family": "round_tube",
                     "dimensions": {"outer_diameter": "60 mm", "wall": "3 mm"}}]}).get_json()
    assert body["rules"] == {}
    (design,) = body["designs"]
    assert design["utilization"]["proportions"] is None


@pytest.mark.parametrize("proportions, path", [
    ({"solid_rectangle": {"width/depth": {"min": 0.01}}},
     "proportions.solid_rectangle.width/depth.min"),
    ({"solid_rectangle": {"depth/width": {"min": 0.2}}},
     "proportions.solid_rectangle.depth/width"),
    ({"solid_rectangle": {"width/depth": {"min": "0.5 m"}}},
     "proportions.solid_rectangle.width/depth.min"),
    ({"solid_rectangle": {"width/depth": {"min": -1}}},
     "proportions.solid_rectangle.width/depth.min"),
    ({"hexagon": {"width/depth": {"min": 0.2}}}, "proportions.hexagon"),
])
def test_bad_rules_are_a_422_naming_the_field(client, proportions, path):
    response = client.post("/v1/designs", json={**FLAT_BAR, "proportions": proportions})
    assert response.status_code == 422
    assert response.content_type == PROBLEM_CONTENT_TYPE
    errors = response.get_json()["errors"]
    assert any(key.startswith(path) for key in errors), errors
