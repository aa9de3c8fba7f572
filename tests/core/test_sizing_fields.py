"""The request field declarations (service.core.sizing.fields) and what follows from them."""

from __future__ import annotations

import dataclasses

import pytest

from service.core.errors import InputError
from service.core.sizing import DesignRequest, validate_request
from service.core.sizing.fields import (
    DEMAND_FIELDS,
    REQUEST_FIELDS,
    SWEEPABLE_PATHS,
    at_contract_paths,
    request_values,
)


def test_every_declared_name_is_a_request_attribute():
    attributes = {f.name for f in dataclasses.fields(DesignRequest)}
    assert {f.name for f in REQUEST_FIELDS} <= attributes
    assert len({f.path for f in REQUEST_FIELDS}) == len(REQUEST_FIELDS)


def test_sweepable_paths_and_demand_fields_are_those_of_the_contract():
    # CONTRACT.md, POST /v1/sweeps: paths name fields of the base request.
    assert SWEEPABLE_PATHS == {
        "load_case.type": "load_case", "load_case.span": "span", "load_case.load": "load",
        "load_case.end_conditions": "end_conditions", "load_case.axial_force": "axial_force",
        "load_case.torque": "torque", "requirements.max_deflection": "max_deflection",
        "requirements.max_extension": "max_extension",
        "requirements.max_twist": "max_twist", "requirements.min_frequency": "min_frequency",
        "requirements.fatigue_cycles": "fatigue_cycles",
        "requirements.safety_factor": "safety_factor",
        "requirements.local_buckling": "local_buckling",
        "requirements.self_weight": "self_weight",
        "requirements.lateral_restraint": "lateral_restraint",
        "requirements.load_position": "load_position",
        "requirements.bearing_length": "bearing_length",
        "requirements.core_direction": "core_direction", "envelope.max_depth": "max_depth",
        "envelope.max_width": "max_width", "min_wall": "min_wall", "objective": "objective",
        "property_basis": "property_basis"}
    assert DEMAND_FIELDS == ("span", "load", "axial_force", "torque", "max_deflection",
                             "max_extension", "max_twist", "min_frequency", "fatigue_cycles",
                             "safety_factor", "bearing_length", "max_depth",
                             "max_width", "min_wall")


def test_request_values_read_contract_paths_and_defaults():
    body = {"load_case": {"type": "torsion", "span": 2.0, "torque": 40.0},
            "envelope": {"max_width": 0.05}, "min_wall": 0.001}
    values = request_values(body)
    assert values == {
        "load_case": "torsion", "span": 2.0, "load": None, "torque": 40.0,
        "end_conditions": None, "axial_force": None, "max_extension": None,
        "supports": None, "rotating": False, "twist_free_at_right_end": False,
        "max_deflection": None, "max_twist": None, "min_frequency": None,
        "fatigue_cycles": None, "safety_factor": 1.0,
        "local_buckling": True, "self_weight": False, "allow_brittle": False,
        "lateral_restraint": "none", "load_position": "shear_centre",
        "bearing_length": 0.0, "core_direction": "weak",
        "max_depth": None, "max_width": 0.05,
        "min_wall": 0.001, "objective": "mass", "diagrams": False, "rejections": "grouped",
        "property_basis": "design"}
    validate_request(DesignRequest(**values))


@pytest.mark.parametrize(("change", "name", "path"), [
    ({"span": -1.0}, "span", "load_case.span"),
    ({"load_case": "bridge"}, "load_case", "load_case.type"),
    ({"max_depth": 0.0}, "max_depth", "envelope.max_depth"),
    ({"sections": ("solid_round", "hexagon")}, "sections.1", "sections.1"),
])
def test_the_core_names_its_fields_and_the_declarations_place_them(change, name, path):
    request = DesignRequest(**{"load_case": "cantilever_end_load", "span": 1.0, "load": 10.0,
                               **change})
    with pytest.raises(InputError) as caught:
        validate_request(request)
    assert name in caught.value.errors
    assert list(at_contract_paths(caught.value).errors) == [path]
