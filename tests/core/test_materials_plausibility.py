"""Plausible property ranges (service/core/materials/plausibility.py): every property has one,
every built-in material lies inside, and unit slips in client materials are refused with a
hint. Reference values: CRC Handbook of Chemistry and Physics (densities of osmium,
22.59 g/cm^3, and of common metals; diamond's modulus about 1.1 TPa), from memory."""

import numpy as np
import pytest

from service.core import materials as core
from service.core.errors import InputError
from service.core.materials.plausibility import PLAUSIBLE, implausible


def test_every_property_has_a_range_with_a_source():
    for prop in core.ALL_PROPERTIES:
        bounds = PLAUSIBLE[prop]
        assert 0 < bounds.low < bounds.high and bounds.source


def test_every_builtin_value_is_plausible():
    table = core.load_builtin()
    for prop in core.ALL_PROPERTIES:
        for ends in (table.low, table.high, table.typical):
            assert implausible(prop, ends[prop]) == {}, prop


@pytest.mark.parametrize(
    ("prop", "value", "inside"),
    [
        ("density", 22590.0, True),      # osmium, the densest element (CRC)
        ("density", 7850.0, True),       # structural steel (EN 1991-1-1 table A.4: 77-78.5 kN/m^3)
        ("density", 0.5, False),         # below the lightest aerogels
        ("density", 7.85e6, False),      # steel in g/m^3
        ("youngs_modulus", 1.1e12, True),   # diamond (CRC)
        ("youngs_modulus", 200.0, False),   # steel with its GPa left off
        ("youngs_modulus", 2e15, False),    # steel in mPa
        ("max_service_temperature", 5000.0, False),
    ],
)
def test_ranges_hold_real_values_and_refuse_slips(prop, value, inside):
    assert (implausible(prop, np.array([value])) == {}) is inside


def test_a_slip_names_the_value_that_would_be_possible():
    message = implausible("youngs_modulus", np.array([np.nan, 200.0]))[1]
    assert message.startswith("200 is outside") and "2e+11" in message and "unit" in message


def test_a_client_material_with_e_in_pascals_by_mistake_is_refused_at_its_path():
    record = {
        "id": "slip", "name": "Unit slip (test data)", "family": "steel",
        "properties": {
            "density": {"low": 7800.0, "high": 7900.0},
            "youngs_modulus": {"low": 200.0, "high": 210.0},
            "shear_modulus": {"low": 78e9, "high": 82e9},
            "poisson_ratio": {"low": 0.28, "high": 0.3},
            "strength": {"low": 250e6, "high": 350e6},
            "price": {"low": 0.8, "high": 1.2},
            "embodied_carbon": {"low": 1.5, "high": 2.5},
        },
        "forms": ["round_tube"],
    }
    with pytest.raises(InputError) as caught:
        core.from_records([record])
    assert list(caught.value.errors) == ["0.properties.youngs_modulus"]
    assert "possible range" in caught.value.errors["0.properties.youngs_modulus"][0]
