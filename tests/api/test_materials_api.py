"""GET /v1/materials, GET /v1/materials/{id} and the reusable material schemas.

Unit conversions are checked against pint's own registry (an independent reference for the
SI definitions: 1 g/cm^3 = 1000 kg/m^3, 0 degC = 273.15 K, 1 psi = 6894.757 Pa).
"""

import math

import marshmallow as ma
import pint
import pytest

from service.api.errors import PROBLEM_CONTENT_TYPE, flatten_messages
from service.api.materials.schemas import (
    MaterialFilterSchema,
    MaterialSchema,
    select_materials,
    with_custom_materials,
)
from service.core import materials as core
from service.core.errors import InputError

UNITS = pint.UnitRegistry()
CONTRACT_PROPERTIES = {
    "density",
    "youngs_modulus",
    "shear_modulus",
    "poisson_ratio",
    "strength",
    "price",
    "embodied_carbon",
}


def si(text: str, unit: str) -> float:
    return UNITS.Quantity(text).to(unit).magnitude


def listing(client, **query):
    response = client.get("/v1/materials", query_string=query)
    assert response.status_code == 200, response.get_json()
    body = response.get_json()
    assert body["count"] == len(body["materials"])
    return body["materials"]


def problem(response, status):
    assert response.status_code == status
    assert response.mimetype == PROBLEM_CONTENT_TYPE
    return response.get_json()


# --------------------------------------------------------------------------- GET /v1/materials


def test_list_returns_every_built_in_material_in_the_contract_shape(client):
    materials = listing(client)
    assert len(materials) == len(core.load_builtin())
    for material in materials:
        assert {"id", "name", "family", "properties", "forms", "sources"} <= material.keys()
        assert CONTRACT_PROPERTIES <= material["properties"].keys()
        for prop, values in material["properties"].items():
            assert values["low"] <= values["typical"] <= values["high"]
            assert values["unit"] == core.UNITS[prop]


def test_family_and_case_insensitive_search(client):
    woods = listing(client, family="wood")
    assert woods and {m["family"] for m in woods} == {"wood"}
    found = listing(client, search="SPRUCE")
    assert [m["id"] for m in found] == ["spruce_sitka"]
    assert listing(client, search="no such name") == []


def test_property_bounds_accept_units_and_plain_si(client):
    # pint: 1 g/cm^3 = 1000 kg/m^3.
    dense = listing(client, min_density="1 g/cm^3")
    threshold = si("1 g/cm^3", "kg/m^3")
    assert dense and all(m["properties"]["density"]["typical"] >= threshold for m in dense)
    assert len(dense) == len(listing(client, min_density=str(threshold)))
    light = listing(client, max_density="0.3 g/cm^3", family="foam")
    assert light and all(m["properties"]["density"]["typical"] <= 300 for m in light)
    # pint: 150 degC = 423.15 K.
    hot = listing(client, min_max_service_temperature="150 degC")
    assert all(m["properties"]["max_service_temperature"]["typical"] >= 423.15 for m in hot)
    stiff = listing(client, min_youngs_modulus="100 GPa", max_youngs_modulus="30e6 psi")
    upper = si("30e6 psi", "Pa")
    assert stiff and all(
        100e9 <= m["properties"]["youngs_modulus"]["typical"] <= upper for m in stiff
    )


@pytest.mark.parametrize(
    ("query", "path", "words"),
    [
        ({"min_hardness": "3"}, "min_hardness", "unknown property"),
        ({"max_colour": "red"}, "max_colour", "unknown property"),
        ({"min_density": "3 m"}, "min_density", "wrong dimension"),
        ({"min_strength": "strong"}, "min_strength", "cannot read"),
        ({"min_density": "2000", "max_density": "1000"}, "max_density", "min_density"),
        ({"family": "unobtainium"}, "family", "Must be one of"),
    ],
)
def test_bad_queries_are_422_naming_the_parameter(client, query, path, words):
    body = problem(client.get("/v1/materials", query_string=query), 422)
    assert list(body["errors"]) == [path]
    assert words in " ".join(body["errors"][path])


def test_one_material_by_id(client):
    response = client.get("/v1/materials/al_6061_t6")
    assert response.status_code == 200
    body = response.get_json()
    assert body == core.load_builtin().material("al_6061_t6").record()
    assert body["family"] == "aluminium"


def test_unknown_material_is_404_problem(client):
    body = problem(client.get("/v1/materials/unobtainium"), 404)
    assert "unobtainium" in body["detail"]


# --------------------------------------------------------------------------- MaterialSchema


def custom(**changes) -> dict:
    """A client material with units (invented values, demo data)."""
    material = {
        "id": "demo_polymer",
        "name": "Demo polymer",
        "family": "polymer",
        "properties": {
            "density": {"low": "1.1 g/cm^3", "high": "1.3 g/cm^3"},
            "youngs_modulus": {"low": 2.0, "high": 3.0, "unit": "GPa"},
            "shear_modulus": {"low": "0.75 GPa", "high": "1.1 GPa"},
            "poisson_ratio": {"low": 0.35, "high": 0.38},
            "strength": {"low": "40 MPa", "high": "60 MPa", "typical": "50 MPa"},
            "price": {"low": 2, "high": 3, "unit": "USD/kg"},
            "embodied_carbon": {"low": 3, "high": 4},
            "max_service_temperature": {"low": "80 degC", "high": "100 degC"},
        },
        "forms": ["solid_round"],
        "sources": ["demo data"],
    }
    material.update(changes)
    return material


def test_material_schema_converts_units_to_si():
    loaded = MaterialSchema().load(custom())
    props = loaded["properties"]
    assert props["density"]["low"] == pytest.approx(1100.0, rel=1e-12)
    assert props["youngs_modulus"] == {"low": 2.0e9, "high": 3.0e9}
    assert props["strength"]["typical"] == pytest.approx(50e6, rel=1e-12)
    assert props["price"] == {"low": 2.0, "high": 3.0}
    # pint: 80 degC = 353.15 K.
    assert props["max_service_temperature"]["low"] == pytest.approx(353.15, rel=1e-12)
    table = core.from_records([loaded])
    assert table.typical["density"][0] == pytest.approx(math.sqrt(1100 * 1300), rel=1e-12)


def with_property(prop, value, **changes):
    material = custom(**changes)
    material["properties"] = dict(material["properties"], **{prop: value})
    return material


@pytest.mark.parametrize(
    ("bad", "path", "words"),
    [
        (
            with_property("density", {"low": "1 m", "high": 1300}),
            "properties.density.low",
            "dimension",
        ),
        (
            with_property("density", {"low": 1, "high": 2, "unit": "m"}),
            "properties.density.unit",
            "dimension",
        ),
        (with_property("density", {"low": 1300, "high": 1100}), "properties.density", "above high"),
        (
            with_property("poisson_ratio", {"low": 0.3, "high": 0.7}),
            "properties.poisson_ratio",
            "(0, 0.5]",
        ),
        (
            with_property("shear_modulus", {"low": "3 GPa", "high": "4 GPa"}),
            "properties.shear_modulus",
            "E/(2(1+nu))",
        ),
        (with_property("hardness", {"low": 1, "high": 2}), "properties.hardness", "Unknown field"),
        ({k: v for k, v in custom().items() if k != "properties"}, "properties", "required"),
        (custom(family="unobtainium"), "family", "Must be one of"),
        (custom(forms=["hollow_star"]), "forms.0", "Must be one of"),
        (custom(family="foam"), "forms", "core"),
        (custom(id="Not A Slug"), "id", "String does not match"),
        (with_property("fracture_toughness", {"low": "5 kg", "high": "6 MPa*m^0.5"}),
         "properties.fracture_toughness.low", "dimension"),
        (with_property("fracture_toughness", {"low": "40 MPa*m^0.5", "high": "30 MPa*m^0.5"}),
         "properties.fracture_toughness", "above high"),
        (with_property("elongation", {"low": 26, "high": 30}), "properties.elongation",
         "possible range"),
        (with_property("fatigue_strength", {"low": "10 MPa", "high": "20 MPa"}),
         "fatigue_cycles", "cycle count"),
        (custom(form_limits={"solid_round": {"process": "forged", "min_size": 0.003,
                                             "max_size": 0.3, "source": "demo data"}}),
         "form_limits.solid_round.process", "Must be one of"),
        (custom(form_limits={"round_tube": {"process": "extruded", "min_wall": 0.001,
                                            "max_wall_ratio": 40, "min_size": 0.003,
                                            "max_size": 0.3, "source": "demo data"}}),
         "form_limits.round_tube", "not made"),
        (custom(form_limits={"solid_round": {"process": "extruded", "min_size": "3 kg",
                                             "max_size": 0.3, "source": "demo data"}}),
         "form_limits.solid_round.min_size", "dimension"),
        (custom(brittle="sometimes"), "brittle", "boolean"),
    ],
)
def test_material_schema_errors_name_the_field(bad, path, words):
    with pytest.raises(ma.ValidationError) as caught:
        MaterialSchema().load(bad)
    flat = flatten_messages(caught.value.messages)
    assert list(flat) == [path], flat
    assert words in " ".join(flat[path])


def test_every_built_in_record_is_a_valid_client_material(client):
    # A client may echo what GET returns (units are the SI ones) as custom_materials.
    records = [MaterialSchema().load(m) for m in listing(client)]
    table = core.from_records(records)
    builtin = core.load_builtin()
    assert table.ids == builtin.ids
    for prop in core.ALL_PROPERTIES:
        assert list(table.typical[prop]) == pytest.approx(list(builtin.typical[prop]), nan_ok=True)


def test_custom_materials_join_the_table_and_may_not_reuse_built_in_ids():
    builtin = core.load_builtin()
    loaded = [MaterialSchema().load(custom())]
    combined = with_custom_materials(builtin, loaded)
    assert combined.ids[-1] == "demo_polymer" and len(combined) == len(builtin) + 1
    assert with_custom_materials(builtin, None) is builtin
    clash = [MaterialSchema().load(custom()), MaterialSchema().load(custom(id="al_6061_t6"))]
    with pytest.raises(InputError) as caught:
        with_custom_materials(builtin, clash)
    assert list(caught.value.errors) == ["custom_materials.1.id"]


# --------------------------------------------------------------------------- MaterialFilterSchema


def test_material_filter_schema_loads_unit_aware_bounds():
    loaded = MaterialFilterSchema().load(
        {
            "families": ["aluminium", "titanium"],
            "exclude": ["al_2024_t3"],
            "where": {"density": {"max": "3 g/cm^3"}, "youngs_modulus": {"min": "60 GPa"}},
        }
    )
    assert loaded["where"] == {
        "density": {"max": pytest.approx(3000.0, rel=1e-12)},
        "youngs_modulus": {"min": pytest.approx(60e9, rel=1e-12)},
    }
    selected = select_materials(core.load_builtin(), loaded)
    assert selected.ids and set(selected.families) == {"aluminium"}
    assert "al_2024_t3" not in selected.ids


@pytest.mark.parametrize(
    ("bad", "path"),
    [
        ({"where": {"hardness": {"min": 1}}}, "where.hardness"),
        ({"where": {"density": {"min": "2 g/cm^3", "max": "1 g/cm^3"}}}, "where.density.max"),
        ({"where": {"density": {}}}, "where.density"),
        ({"where": {"density": {"min": "3 m"}}}, "where.density.min"),
        ({"families": ["adamantium"]}, "families.0"),
    ],
)
def test_material_filter_schema_errors_name_the_field(bad, path):
    with pytest.raises(ma.ValidationError) as caught:
        MaterialFilterSchema().load(bad)
    assert list(flatten_messages(caught.value.messages)) == [path]


def test_select_materials_places_core_errors_under_the_request_field():
    with pytest.raises(InputError) as caught:
        select_materials(core.load_builtin(), {"ids": ["s235jr", "unobtainium"]}, "core_materials")
    assert list(caught.value.errors) == ["core_materials.ids.1"]


# --------------------------------------------------------------------------- toughness, forms

FORM_LIMIT_KEYS = {"process", "min_wall", "max_wall_ratio", "min_size", "max_size", "source"}


def test_materials_carry_brittle_fatigue_cycles_and_form_limits(client):
    for material in listing(client):
        assert isinstance(material["brittle"], bool)
        has_fatigue = "fatigue_strength" in material["properties"]
        assert (material["fatigue_cycles"] is not None) == has_fatigue
        assert set(material["form_limits"]) == set(material["forms"])
        for limit in material["form_limits"].values():
            assert set(limit) == FORM_LIMIT_KEYS
        if material["family"] != "foam":
            assert {"fracture_toughness", "elongation"} <= material["properties"].keys()
    tube = client.get("/v1/materials/sic_sintered").get_json()
    assert tube["brittle"] is True
    assert tube["properties"]["fracture_toughness"]["unit"] == "Pa*m^0.5"
    assert tube["form_limits"]["round_tube"]["process"] == "sintered"


def test_new_property_bounds_accept_units(client):
    # pint: 1 ksi*in^0.5 = 1.0988 MPa*m^0.5; "5 %" = 0.05.
    tough = listing(client, min_fracture_toughness="20 MPa*m^0.5")
    assert tough and all(
        m["properties"]["fracture_toughness"]["typical"] >= 20e6 for m in tough
    )
    assert [m["id"] for m in listing(client, min_fracture_toughness="18.2 ksi*in^0.5")] == [
        m["id"] for m in tough
    ]
    stiff_strained = listing(client, max_elongation="5 %")
    assert stiff_strained and all(
        m["properties"]["elongation"]["typical"] <= 0.05 for m in stiff_strained
    )
    assert "sic_sintered" in [m["id"] for m in stiff_strained]
    fatigue = listing(client, min_fatigue_strength="20 ksi")
    threshold = si("20 ksi", "Pa")
    assert fatigue and all(m["properties"]["fatigue_strength"]["typical"] >= threshold
                           for m in fatigue)
    # A bound on a property a material lacks leaves it out (no compressive strength: steels).
    crushing = [m["id"] for m in listing(client, min_compressive_strength="1 MPa")]
    assert "s355j2" not in crushing and "timber_c24" in crushing
    orthotropic = listing(client, max_transverse_modulus="1 GPa")
    assert {m["family"] for m in orthotropic} == {"wood"}


@pytest.mark.parametrize(
    ("query", "path"),
    [
        ({"min_fracture_toughness": "5 kg"}, "min_fracture_toughness"),
        ({"max_elongation": "5 m"}, "max_elongation"),
        ({"min_fatigue_strength": "2 MPa", "max_fatigue_strength": "1 MPa"},
         "max_fatigue_strength"),
    ],
)
def test_bad_bounds_on_new_properties_are_422(client, query, path):
    body = problem(client.get("/v1/materials", query_string=query), 422)
    assert list(body["errors"]) == [path]


def tough_custom(**changes):
    material = custom(**changes)
    material["properties"] = dict(
        material["properties"],
        fracture_toughness={"low": "2 MPa*m^0.5", "high": "4 MPa*m^0.5"},
        elongation={"low": "20 %", "high": "60 %"},
        fatigue_strength={"low": "12 MPa", "high": "20 MPa"},
        compressive_strength={"low": "60 MPa", "high": "80 MPa"},
    )
    material["fatigue_cycles"] = 1e7
    material["form_limits"] = {
        "solid_round": {"process": "extruded", "min_size": "3 mm", "max_size": "0.3 m",
                        "source": "demo data"},
    }
    return material


def test_client_materials_take_the_new_fields_with_units():
    table = core.from_records([MaterialSchema().load(tough_custom())])
    assert table.typical["fracture_toughness"][0] == pytest.approx(math.sqrt(8) * 1e6)
    assert table.low["elongation"][0] == pytest.approx(0.2)
    assert table.fatigue_cycles[0] == 1e7
    assert not table.brittle[0]  # stretches 20-60 %: ductile by the rule
    (limit,) = table.form_limits[0]
    assert (limit.min_size, limit.max_size) == (pytest.approx(0.003), 0.3)


def test_rankings_take_custom_materials_with_the_new_fields(client):
    response = client.post("/v1/rankings", json={
        "loading": "bending", "limit": "stiffness", "custom_materials": [tough_custom()],
        "materials": {"ids": ["demo_polymer", "al_6061_t6"]},
    })
    assert response.status_code == 200, response.get_json()
    ranked = {r["material"]["id"] for r in response.get_json()["results"]}
    assert ranked == {"demo_polymer", "al_6061_t6"}
    bad = tough_custom()
    bad["properties"]["fracture_toughness"] = {"low": "5 kg", "high": "6 MPa*m^0.5"}
    body = problem(client.post("/v1/rankings", json={
        "loading": "bending", "limit": "stiffness", "custom_materials": [bad]}), 422)
    assert list(body["errors"]) == ["custom_materials.0.properties.fracture_toughness.low"]


def test_sort_by_a_property_either_way_with_materials_lacking_it_last(client):
    tough_first = listing(client, sort="-fracture_toughness")
    values = [m["properties"].get("fracture_toughness", {}).get("typical") for m in tough_first]
    known = [v for v in values if v is not None]
    assert known == sorted(known, reverse=True)
    assert values[: len(known)] == known  # cores (no toughness) come last
    assert tough_first[0]["family"] in ("steel", "nickel")
    light_woods = listing(client, family="wood", sort="density")
    densities = [m["properties"]["density"]["typical"] for m in light_woods]
    assert densities == sorted(densities) and light_woods[0]["id"] == "balsa"
    body = problem(client.get("/v1/materials", query_string={"sort": "hardness"}), 422)
    assert list(body["errors"]) == ["sort"]
