"""POST /v1/rankings over HTTP: contract shape, units, filters, custom data, errors, chart.

The numbers behind the rankings are checked in tests/core/test_indices.py and
tests/validation/test_index_reference.py; here the HTTP layer must carry them faithfully.
"""

import math

import pytest

from service.core.indices import RankingRequest, rank
from service.core.materials import load_builtin

URL = "/v1/rankings"


def _post(client, body):
    return client.post(URL, json=body)


def _custom_material(material_id="test_alloy", forms=("round_tube",)):
    """A client material with unit strings; invented numbers (test data)."""
    def value(low, high, unit=None):
        result = {"low": low, "high": high}
        if unit:
            result["unit"] = unit
        return result

    return {
        "id": material_id, "name": "Test alloy", "family": "aluminium",
        "properties": {
            "density": value(2.6, 2.8, "g/cm^3"),
            "youngs_modulus": value("68 GPa", "72 GPa"),
            "shear_modulus": value(25.5, 27.0, "GPa"),
            "poisson_ratio": value(0.32, 0.34),
            "strength": value(240, 280, "MPa"),
            "price": value(2.0, 3.0),
            "embodied_carbon": value(8.0, 12.0),
        },
        "forms": list(forms),
        "sources": ["invented test data"],
    }


def test_contract_shape_best_first_relative_exact(client):
    """Every contract field; relative is index / best exactly after the JSON round trip."""
    response = _post(client, {"loading": "bending", "limit": "stiffness", "top": 10})
    assert response.status_code == 200
    body = response.get_json()
    assert body["index"]["exponents"] == {"youngs_modulus": 0.5, "density": -1.0}
    assert body["index"]["shape_factor_exponent"] == 0.5
    assert "A^2" in body["index"]["description"]
    assert body["caution"]
    assert "chart" not in body
    results = body["results"]
    assert len(results) == 10
    best = results[0]["index"]
    for position, result in enumerate(results, start=1):
        assert set(result) >= {"rank", "material", "section", "shape_factor", "index",
                               "relative"}
        assert set(result["material"]) == {"id", "name", "family"}
        assert result["rank"] == position
        assert result["relative"] == result["index"] / best
    assert [r["index"] for r in results] == sorted((r["index"] for r in results), reverse=True)


def test_http_results_equal_the_core_ranking(client):
    """The endpoint returns exactly what the core computes for the same request (brittle
    materials allowed, as the core ranks every material it is given)."""
    body = _post(client, {"loading": "torsion", "limit": "strength", "objective": "carbon",
                          "property_basis": "conservative", "allow_brittle": True}).get_json()
    core = rank(RankingRequest("torsion", "strength", objective="carbon",
                               property_basis="conservative"), load_builtin())
    assert [(r["material"]["id"], r["section"], r["index"]) for r in body["results"]] == [
        (r.material_id, r.section, r.index) for r in core.results]


def test_default_sections_skip_the_sandwich_panel_and_naming_it_is_422(client):
    body = _post(client, {"loading": "bending", "limit": "strength"}).get_json()
    assert {r["section"] for r in body["results"]} == {
        "solid_round", "solid_rectangle", "round_tube", "rectangular_tube", "i_section"}
    response = _post(client, {"loading": "bending", "limit": "strength",
                              "sections": ["sandwich_panel"]})
    assert response.status_code == 422
    assert "sections.0" in response.get_json()["errors"]


def test_where_bounds_accept_units(client):
    """"1.85 g/cm^3" is 1850 kg/m^3: the same candidates as the SI bound, all below it.
    (1850 is no material's density: pint's conversion may land one ulp off a round value.)"""
    def ranked(bound):
        body = _post(client, {"loading": "tension", "limit": "stiffness",
                              "materials": {"where": {"density": {"max": bound}}}}).get_json()
        return [(r["material"]["id"], r["section"]) for r in body["results"]]

    with_unit, in_si = ranked("1.85 g/cm^3"), ranked(1850)
    assert with_unit == in_si and with_unit
    table = load_builtin()
    assert all(table.values("density")[table.position(m)] <= 1850 for m, _ in with_unit)


def test_family_and_id_filters(client):
    body = _post(client, {"loading": "bending", "limit": "stiffness",
                          "materials": {"families": ["aluminium", "steel"],
                                        "exclude": ["s235jr"]}}).get_json()
    families = {r["material"]["family"] for r in body["results"]}
    assert families == {"aluminium", "steel"}
    assert "s235jr" not in {r["material"]["id"] for r in body["results"]}


def test_fixed_proportions_with_a_percentage(client):
    """"5 %" is the ratio 0.05: the same shape factor for every material, reported back."""
    body = _post(client, {"loading": "bending", "limit": "stiffness",
                          "sections": ["round_tube"],
                          "proportions": {"round_tube": {"wall": "5 %"}}}).get_json()
    factors = {r["shape_factor"] for r in body["results"]}
    assert len(factors) == 1
    assert all(r["proportions"] == {"wall": 0.05} for r in body["results"])


def test_custom_material_with_units_is_ranked_in_its_forms_only(client):
    """A client material appears for its forms only, its values converted from units: its
    tie index E/rho is 70e9 / 2700 (typical = geometric mean of low and high)."""
    body = _post(client, {"loading": "tension", "limit": "stiffness",
                          "custom_materials": [_custom_material()]}).get_json()
    mine = [r for r in body["results"] if r["material"]["id"] == "test_alloy"]
    assert [r["section"] for r in mine] == ["round_tube"]
    expected = math.sqrt(68e9 * 72e9) / math.sqrt(2600 * 2800)
    assert mine[0]["index"] == pytest.approx(expected, rel=1e-12)


def test_filter_applies_to_custom_materials_too(client):
    body = _post(client, {"loading": "tension", "limit": "stiffness",
                          "custom_materials": [_custom_material()],
                          "materials": {"ids": ["test_alloy", "s355j2"]}}).get_json()
    assert {r["material"]["id"] for r in body["results"]} == {"test_alloy", "s355j2"}


def test_custom_index(client):
    body = _post(client, {"loading": "bending", "limit": "stiffness", "top": 5,
                          "custom_index": {"youngs_modulus": 1, "price": -1, "density": -1}}
                 ).get_json()
    assert body["index"]["exponents"] == {"youngs_modulus": 1.0, "price": -1.0, "density": -1.0}
    assert body["index"]["shape_factor"] is None
    assert all(r["shape_factor"] == 1.0 for r in body["results"])


def test_every_bad_field_is_listed_by_path(client):
    response = _post(client, {
        "loading": "bending", "limit": "stiffness", "objective": "speed", "top": 0,
        "custom_index": {"hardness": 1, "density": "-1", "__import__('os')": 1},
        "proportions": {"round_tube": {"wall": "3 mm"}, "i_section": {"web": 0.01},
                        "hexagon": {"side": 1}},
        "materials": {"ids": ["nope"]},
    })
    assert response.status_code == 422
    assert response.mimetype == "application/problem+json"
    errors = response.get_json()["errors"]
    assert set(errors) >= {
        "objective", "top", "custom_index.hardness", "custom_index.density",
        "custom_index.__import__('os')", "proportions.round_tube.wall",
        "proportions.i_section.web", "proportions.hexagon",
    }


@pytest.mark.parametrize(
    ("body", "path"),
    [
        ({"loading": "bending", "limit": "stiffness", "materials": {"ids": ["nope"]}},
         "materials.ids.0"),
        ({"loading": "bending", "limit": "stiffness",
          "custom_materials": [_custom_material("s235jr")]}, "custom_materials.0.id"),
        ({"loading": "bending", "limit": "stiffness", "sections": ["round_tube"],
          "proportions": {"i_section": {"web_thickness": 0.02}}}, "proportions.i_section"),
        ({"loading": "bending", "limit": "stiffness", "chart": True,
          "custom_index": {"youngs_modulus": 1}}, "chart"),
        ({"loading": "bending", "limit": "stiffness", "custom_index": {"shape_factor": 1}},
         "custom_index"),
        ({"loading": "bending", "limit": "stiffness", "unknown": 1}, "unknown"),
    ],
)
def test_cross_field_and_core_errors(client, body, path):
    response = _post(client, body)
    assert response.status_code == 422
    assert path in response.get_json()["errors"]


def test_chart_data_and_guide_line(client):
    """Light stiff beam: x = density, y = shape_factor * youngs_modulus, slope 2; the line
    passes through the best point (1e-12 in log10)."""
    body = _post(client, {"loading": "bending", "limit": "stiffness", "chart": True,
                          "top": 20}).get_json()
    chart = body["chart"]
    assert chart["x"]["exponents"] == {"density": 1.0}
    assert chart["y"]["exponents"] == {"shape_factor": 1.0, "youngs_modulus": 1.0}
    assert chart["guide_line"]["slope"] == 2.0
    assert len(chart["points"]) == len(body["results"])
    best = chart["points"][0]
    assert best["rank"] == chart["guide_line"]["through"] == 1
    line = chart["guide_line"]
    assert math.log10(best["y"]["value"]) == pytest.approx(
        line["slope"] * math.log10(best["x"]["value"]) + line["intercept"], abs=1e-12)
    for point in chart["points"]:
        for axis in ("x", "y"):
            assert point[axis]["low"] <= point[axis]["value"] <= point[axis]["high"]


def test_a_filter_that_leaves_nothing_gives_no_results(client):
    response = _post(client, {"loading": "bending", "limit": "stiffness",
                              "materials": {"families": ["foam"]}})
    assert response.status_code == 200
    assert response.get_json()["results"] == []


@pytest.mark.parametrize(
    ("field", "value", "path"),
    [
        ("custom_index", {"density": 10**400}, "custom_index.density"),
        ("proportions", {"round_tube": {"wall": 10**400}}, "proportions.round_tube.wall"),
        ("proportions", {"round_tube": {"wall": None}}, "proportions.round_tube.wall"),
        ("custom_index", [1], "custom_index"),
        ("proportions", [1], "proportions"),
    ],
)
def test_out_of_range_json_numbers_are_422_not_500(client, field, value, path):
    """JSON integers beyond double precision and wrong JSON types are input errors."""
    response = _post(client, {"loading": "bending", "limit": "stiffness", field: value})
    assert response.status_code == 422
    assert path in response.get_json()["errors"]


@pytest.mark.parametrize("body", [
    {"loading": "bending", "limit": "stiffness"},
    {"loading": "torsion", "limit": "strength", "objective": "cost", "top": 5, "chart": True},
    {"loading": "bending", "limit": "stiffness", "proportions": {"round_tube": {"wall": "5 %"}},
     "sections": ["round_tube"]},
])
def test_the_body_sent_is_what_the_response_schema_documents(client, body):
    """Sent without marshmallow's dump: dumping it through RankingResponseSchema must change
    nothing."""
    from service.api.rankings.schemas import RankingResponseSchema

    response = _post(client, body)
    assert response.status_code == 200, response.get_json()
    sent = response.get_json()
    assert RankingResponseSchema().dump(sent) == sent


# --------------------------------------------------------------------------- brittle screening

BRITTLE_IDS = {m for m, flag in zip(load_builtin().ids, load_builtin().brittle, strict=True)
               if flag}


def test_brittle_materials_are_left_out_by_default_and_say_why(client):
    # The safe default (house rules): ceramics, glasses, grey iron, wood... are not ranked;
    # each appears in `excluded` with its values and how to include it.
    body = _post(client, {"loading": "bending", "limit": "stiffness"}).get_json()
    ranked = {r["material"]["id"] for r in body["results"]}
    assert ranked and not ranked & BRITTLE_IDS
    reasons = {(e["material"]["id"], e["section"]): e["reason"] for e in body["excluded"]
               if e["material"]["id"] in BRITTLE_IDS}
    assert {material for material, _ in reasons} == BRITTLE_IDS
    sic = reasons[("sic_sintered", "round_tube")]
    assert "brittle" in sic and "allow_brittle" in sic and "MPa m^0.5" in sic


def test_allow_brittle_ranks_them_like_any_other(client):
    body = _post(client, {"loading": "bending", "limit": "stiffness",
                          "sections": ["solid_round"], "top": 5,
                          "allow_brittle": True}).get_json()
    # Silicon carbide's sqrt(E)/rho (E 410 GPa, 3100 kg/m^3) is among the five best of the
    # built-in materials, with the along-grain woods and unidirectional CFRP, so it ranks
    # there once brittle materials are allowed (in tubes its shape factor stops at the D/t
    # of about 15 that sintered tube is made to, data/form_limits.csv).
    assert "sic_sintered" in {r["material"]["id"] for r in body["results"]}
    assert not [e for e in body["excluded"] if "brittle" in e["reason"]]


def test_a_selection_of_brittle_materials_only_is_a_422_that_says_how(client):
    response = _post(client, {"loading": "bending", "limit": "strength",
                              "materials": {"families": ["glass", "ceramic"]}})
    assert response.status_code == 422
    errors = response.get_json()["errors"]
    assert list(errors) == ["materials"] and "allow_brittle" in errors["materials"][0]


def test_custom_materials_are_screened_by_the_same_rule(client):
    brittle = dict(_custom_material("stated_brittle"), brittle=True)
    ductile = _custom_material("plain_alloy")
    ductile["properties"]["elongation"] = {"low": "8 %", "high": "12 %"}
    body = _post(client, {"loading": "bending", "limit": "stiffness",
                          "custom_materials": [brittle, ductile],
                          "materials": {"ids": ["stated_brittle", "plain_alloy"]}}).get_json()
    assert [r["material"]["id"] for r in body["results"]] == ["plain_alloy"]
    (excluded,) = body["excluded"]
    assert excluded["material"]["id"] == "stated_brittle"
    assert "stated brittle" in excluded["reason"]
