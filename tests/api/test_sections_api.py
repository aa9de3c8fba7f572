"""GET /v1/sections and POST /v1/sections/properties, as in the contract (schemas/README.md).

Numbers are checked against EN 10210-2 hot-finished CHS tables (from memory; exact formulas,
so table rounding is the tolerance) and the inch's definition (25.4 mm exactly, NIST SP 811),
shapes and error paths against the contract.
"""

from __future__ import annotations

import math

import pytest

from service.api.errors import PROBLEM_CONTENT_TYPE

CONTRACT_FAMILIES = {
    "solid_round": ["diameter"],
    "solid_rectangle": ["depth", "width"],
    "round_tube": ["outer_diameter", "wall"],
    "rectangular_tube": ["depth", "width", "wall"],
    "i_section": ["depth", "flange_width", "flange_thickness", "web_thickness"],
    "sandwich_panel": ["width", "core_thickness", "face_thickness"],
}

EXAMPLES = {
    "solid_round": {"diameter": "40 mm"},
    "solid_rectangle": {"depth": "60 mm", "width": "20 mm"},
    "round_tube": {"outer_diameter": "60 mm", "wall": "2 mm"},
    "rectangular_tube": {"depth": 0.1, "width": 0.05, "wall": 0.003},
    "i_section": {
        "depth": "200 mm",
        "flange_width": "100 mm",
        "flange_thickness": "8.5 mm",
        "web_thickness": "5.6 mm",
    },
    "sandwich_panel": {"width": "300 mm", "core_thickness": "20 mm", "face_thickness": "1 mm"},
}

RESPONSE_KEYS = {
    "family",
    "dimensions",
    "area",
    "second_moment",
    "section_modulus",
    "torsion_constant",
    "torsion_modulus",
    "shape_factors",
}


def post(client, body):
    return client.post("/v1/sections/properties", json=body)


def problem_errors(response):
    assert response.status_code == 422, response.get_json()
    assert response.mimetype == PROBLEM_CONTENT_TYPE
    return response.get_json()["errors"]


def test_list_has_every_contract_family_with_its_dimensions(client):
    response = client.get("/v1/sections")
    assert response.status_code == 200
    families = response.get_json()["families"]
    assert [family["id"] for family in families] == list(CONTRACT_FAMILIES)
    for family in families:
        assert {"id", "description", "dimensions", "loadings"} <= family.keys()
        assert [d["name"] for d in family["dimensions"]] == CONTRACT_FAMILIES[family["id"]]
        assert all(d["description"] for d in family["dimensions"])
        assert "bending" in family["loadings"]
        assert set(family["loadings"]) <= {"bending", "torsion", "tension", "compression"}


@pytest.mark.parametrize("family_id", CONTRACT_FAMILIES)
def test_properties_shape_for_every_family(client, family_id):
    response = post(client, {"family": family_id, "dimensions": EXAMPLES[family_id]})
    assert response.status_code == 200, response.get_json()
    body = response.get_json()
    assert RESPONSE_KEYS <= body.keys()
    assert body["family"] == family_id
    assert set(body["dimensions"]) == set(CONTRACT_FAMILIES[family_id])
    assert set(body["second_moment"]) == {"major", "minor"}
    assert set(body["section_modulus"]) == {"major", "minor"}
    assert set(body["shape_factors"]) == {
        "bending_stiffness",
        "bending_strength",
        "torsion_stiffness",
        "torsion_strength",
    }
    numbers = [body["area"], body["torsion_constant"], body["torsion_modulus"]]
    numbers += [*body["second_moment"].values(), *body["section_modulus"].values()]
    numbers += list(body["shape_factors"].values())
    assert all(isinstance(n, float) and math.isfinite(n) and n > 0 for n in numbers)


def test_chs_168_3x5_matches_en_10210_table(client):
    # EN 10210-2 CHS 168.3 x 5.0 (from memory): A 25.7 cm^2, I 856 cm^4, Wel 102 cm^3,
    # It 1710 cm^4, Ct 203 cm^3; three printed figures, so 0.5 % tolerance.
    response = post(
        client,
        {"family": "round_tube", "dimensions": {"outer_diameter": "168.3 mm", "wall": "5 mm"}},
    )
    body = response.get_json()
    assert body["dimensions"] == {
        "outer_diameter": pytest.approx(0.1683),
        "wall": pytest.approx(0.005),
    }
    assert body["area"] == pytest.approx(25.7e-4, rel=5e-3)
    assert body["second_moment"]["major"] == pytest.approx(856e-8, rel=5e-3)
    assert body["section_modulus"]["major"] == pytest.approx(102e-6, rel=5e-3)
    assert body["torsion_constant"] == pytest.approx(1710e-8, rel=5e-3)
    assert body["torsion_modulus"] == pytest.approx(203e-6, rel=5e-3)


def test_units_are_converted_to_si(client):
    # 1 in = 25.4 mm exactly (NIST SP 811 appendix B); a 2 in square bar is a solid square.
    in_inches = post(
        client, {"family": "solid_rectangle", "dimensions": {"depth": "2 in", "width": "2 in"}}
    )
    in_metres = post(
        client, {"family": "solid_rectangle", "dimensions": {"depth": 0.0508, "width": 0.0508}}
    )
    assert in_inches.get_json()["area"] == pytest.approx(0.0508**2, rel=1e-12)
    assert in_inches.get_json() == in_metres.get_json()
    assert in_inches.get_json()["shape_factors"]["torsion_stiffness"] == pytest.approx(
        1.0, rel=1e-12
    )


def test_geometry_error_is_422_on_the_dimension(client):
    errors = problem_errors(
        post(client, {"family": "round_tube", "dimensions": {"outer_diameter": 0.05, "wall": 0.03}})
    )
    assert set(errors) == {"dimensions.wall"}


def test_every_bad_dimension_is_listed_together(client):
    body = {
        "family": "i_section",
        "dimensions": {
            "depth": "200 kg",  # wrong dimension
            "flange_width": -0.1,  # not positive
            "web_thickness": "abc",  # not a quantity
            "root_radius": 0.01,  # not a dimension of the family
        },  # flange_thickness missing
    }
    errors = problem_errors(post(client, body))
    assert set(errors) == {
        "dimensions.depth",
        "dimensions.flange_width",
        "dimensions.web_thickness",
        "dimensions.root_radius",
        "dimensions.flange_thickness",
    }
    assert "missing" in errors["dimensions.flange_thickness"][0]


def test_unknown_family_is_422_on_family(client):
    errors = problem_errors(post(client, {"family": "hexagonal_tube", "dimensions": {"a": 1}}))
    assert "family" in errors


@pytest.mark.parametrize(
    "body",
    [
        {},
        {"family": "round_tube"},
        {"family": ["round_tube"], "dimensions": {}},
        {"family": "round_tube", "dimensions": [0.05, 0.002]},
        {"family": "round_tube", "dimensions": {"outer_diameter": True, "wall": None}},
        {"family": "round_tube", "dimensions": {"outer_diameter": 1e300, "wall": 1e-300}},
        {"family": "round_tube", "dimensions": {"outer_diameter": 0.05, "wall": 0.002}, "x": 1},
    ],
)
def test_malformed_requests_are_422_not_500(client, body):
    errors = problem_errors(post(client, body))
    assert errors


def test_dimension_range_limits_are_reported(client):
    errors = problem_errors(
        post(client, {"family": "solid_round", "dimensions": {"diameter": "2 km"}})
    )
    assert list(errors) == ["dimensions.diameter"]


def test_wrong_method_is_405(client):
    assert client.get("/v1/sections/properties").status_code == 405
    assert client.post("/v1/sections", json={}).status_code == 405
