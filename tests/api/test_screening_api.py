"""Materials a practitioner would accept, over HTTP: property limits in requests, the design
property basis by default, manufacturing limits named in designs, rejections and materials.

Handbook values quoted beside the checks are from memory (Ashby, Materials Selection in
Mechanical Design, 4th ed., fracture toughness and elongation charts; ASM Handbook vol. 1);
the limits in data/form_limits.csv name their own sources.
"""

from __future__ import annotations

import copy

import pytest

URL = "/v1/designs"
BOOM = {
    # The README's camera boom (demo numbers of our own).
    "load_case": {"type": "cantilever_end_load", "span": "0.9 m", "load": "44 N"},
    "requirements": {"max_deflection": "4 mm", "safety_factor": 2},
    "envelope": {"max_depth": "30 mm", "max_width": "30 mm"},
    "min_wall": "0.5 mm",
    "materials": {"ids": ["s355j2", "al_6061_t6", "grey_iron_gjl_250", "pc", "sic_sintered"]},
    "sections": ["round_tube", "solid_round"],
}


def _with(**requirements):
    body = copy.deepcopy(BOOM)
    body["requirements"].update(requirements)
    return body


def test_a_toughness_limit_rejects_the_materials_below_it_and_names_the_limit(client):
    """K_IC: structural steel about 50-150, aluminium 6061-T6 about 25-30, grey cast iron
    about 10-20, polycarbonate about 2-3 MPa m^0.5 (Ashby, from memory): a 20 MPa m^0.5
    minimum keeps the steel and the aluminium and rejects the iron and the polymer."""
    body = client.post(URL, json=_with(property_limits={
        "fracture_toughness": {"min": "20 MPa*m^0.5"}})).get_json()
    kept = {d["material"]["id"] for d in body["designs"]}
    assert {"s355j2", "al_6061_t6"} <= kept
    assert not kept & {"grey_iron_gjl_250", "pc", "sic_sintered"}
    reasons = {r["material"]["id"]: r["reason"] for r in body["rejected"]}
    for material in ("grey_iron_gjl_250", "pc"):
        assert "requirements.property_limits.fracture_toughness.min" in reasons[material]


def test_an_elongation_limit_is_a_plain_fraction(client):
    """Elongation at break: polycarbonate about 1.1 (110 %), structural steel about 0.2,
    grey cast iron under 0.01 (ASM Handbook vol. 1, from memory): a 0.5 minimum keeps only
    the polymer from the limit (its stiffness then fails the 30 mm fairing on its own); a
    maximum works the same way."""
    body = client.post(URL, json=_with(property_limits={"elongation": {"min": 0.5}})
                       ).get_json()
    assert not body["designs"]
    for rejection in body["rejected"]:
        by_limit = "requirements.property_limits.elongation.min" in rejection["reason"]
        assert by_limit == (rejection["material"]["id"] != "pc"), rejection
    body = client.post(URL, json=_with(property_limits={"elongation": {"max": 0.5}})
                       ).get_json()
    assert "pc" not in {d["material"]["id"] for d in body["designs"]}
    assert any("elongation" in r["reason"] and ".max" in r["reason"] for r in body["rejected"]
               if r["material"]["id"] == "pc")


@pytest.mark.parametrize(("limits", "path"), [
    ({"toughness": {"min": 1}}, "requirements.property_limits.toughness"),
    ({"fracture_toughness": {"min": "5 kg"}},
     "requirements.property_limits.fracture_toughness.min"),
    ({"elongation": {"min": 0.5, "max": 0.1}}, "requirements.property_limits.elongation.max"),
    ({"strength": {"min": "300"}}, "requirements.property_limits.strength.min"),
])
def test_bad_limits_are_422_at_their_path(client, limits, path):
    response = client.post(URL, json=_with(property_limits=limits))
    assert response.status_code == 422
    assert path in response.get_json()["errors"]


def test_designs_use_design_values_by_default_and_say_so(client):
    """Members are sized to the minimum strength (characteristic values, EN 1990 4.2 and
    Annex D): by default each design says basis "design"; asked for, "typical"."""
    body = client.post(URL, json=BOOM).get_json()
    assert body["designs"] and {d["basis"] for d in body["designs"]} == {"design"}
    typical = copy.deepcopy(BOOM) | {"property_basis": "typical"}
    body = client.post(URL, json=typical).get_json()
    assert {d["basis"] for d in body["designs"]} == {"typical"}


def test_each_design_gives_the_material_values_it_used(client):
    """The values a design reports are the data's low strength on the design basis (its
    characteristic value) and typical stiffness and density; on the typical basis, the
    typical strength. Checked against the material's own GET /v1/materials record."""
    body = {"load_case": {"type": "cantilever_end_load", "span": "0.3 m", "load": "5 kN"},
            "requirements": {"safety_factor": 1.5}, "sections": ["solid_round"],
            "materials": {"ids": ["al_6061_t6"]}}
    record = client.get("/v1/materials/al_6061_t6").get_json()["properties"]
    design = client.post(URL, json=body).get_json()["designs"][0]
    used = design["material_values"]
    assert used["strength"] == pytest.approx(record["strength"]["low"])
    assert used["youngs_modulus"] == pytest.approx(record["youngs_modulus"]["typical"])
    assert used["density"] == pytest.approx(record["density"]["typical"])
    typical = client.post(URL, json=body | {"property_basis": "typical"}).get_json()
    assert typical["designs"][0]["material_values"]["strength"] == pytest.approx(
        record["strength"]["typical"])


def test_a_strength_limited_design_is_heavier_on_design_values(client):
    """A short, heavily loaded member with no stiffness limit is sized by strength; the low
    strength of the design basis needs more section than the typical one."""
    body = {"load_case": {"type": "cantilever_end_load", "span": "0.3 m", "load": "5 kN"},
            "requirements": {"safety_factor": 1.5}, "sections": ["solid_round"],
            "materials": {"ids": ["al_6061_t6"]}}
    design = client.post(URL, json=body).get_json()["designs"][0]
    typical = client.post(URL, json=body | {"property_basis": "typical"}).get_json()
    assert design["governing"] == "strength"
    assert design["mass"] > typical["designs"][0]["mass"]


def test_rankings_take_property_limits_too(client):
    limited = client.post("/v1/rankings", json={
        "loading": "bending", "limit": "stiffness", "objective": "mass",
        "property_limits": {"fracture_toughness": {"min": "20 MPa*m^0.5"}}}).get_json()
    excluded = {e["material"]["id"]: e["reason"] for e in limited["excluded"]}
    assert "property_limits.fracture_toughness.min" in excluded["grey_iron_gjl_250"]
    assert "grey_iron_gjl_250" not in {r["material"]["id"] for r in limited["results"]}


def test_a_design_stopped_by_its_process_says_manufacturing(client):
    """Sintered silicon carbide tube (brittle, allowed here): the 30 mm fairing would take a
    thin-walled tube, but sintered tube is made up to D/t about 15 (data/form_limits.csv)."""
    body = _with(allow_brittle=True)
    body["materials"] = {"ids": ["sic_sintered"]}
    body["sections"] = ["round_tube"]
    (design,) = client.post(URL, json=body).get_json()["designs"]
    dims = design["section"]["dimensions"]
    assert design["governing"] == "manufacturing"
    assert dims["outer_diameter"] / dims["wall"] <= 15


def test_a_brittle_design_carries_its_own_caution(client):
    """Allowed in, a sintered ceramic (brittle by the rule of materials/brittleness.py) comes
    with a warning naming it; the ductile answer of the same request has none."""
    body = _with(allow_brittle=True)
    body["materials"] = {"ids": ["sic_sintered", "al_6061_t6"]}
    body["sections"] = ["round_tube"]
    answer = client.post(URL, json=body).get_json()
    assert {d["material"]["id"] for d in answer["designs"]} == {"sic_sintered", "al_6061_t6"}
    (brittle,) = [w for w in answer["warnings"] if "brittle" in w]
    assert "sic_sintered" in brittle and "al_6061_t6" not in brittle
    assert "maximum principal stress" in brittle
    body["materials"] = {"ids": ["al_6061_t6"]}
    ductile = client.post(URL, json=body).get_json()
    assert not [w for w in ductile.get("warnings", []) if "brittle" in w]


def test_materials_carry_their_form_limits(client):
    body = client.get("/v1/materials/s355j2").get_json()
    tube = body["form_limits"]["round_tube"]
    assert tube["process"] == "welded" and tube["min_size"] == pytest.approx(0.0213)
    assert "EN 10219" in tube["source"]


def test_rankings_exclude_fixed_proportions_that_are_not_made(client):
    """D/t = 50 is a welded steel tube (EN 10219-2 goes to about 100) but no sintered
    ceramic tube (D/t about 5-15): the ceramic is excluded, saying why."""
    body = client.post("/v1/rankings", json={
        "loading": "bending", "limit": "stiffness", "objective": "mass", "allow_brittle": True,
        "sections": ["round_tube"], "proportions": {"round_tube": {"wall": 0.02}},
        "materials": {"ids": ["sic_sintered", "s355j2"]}}).get_json()
    assert [r["material"]["id"] for r in body["results"]] == ["s355j2"]
    (excluded,) = body["excluded"]
    assert excluded["material"]["id"] == "sic_sintered" and "form_limits" in excluded["reason"]
