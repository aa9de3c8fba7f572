"""Property limits of a request (service/core/materials/limits.py) and the design basis.

Values quoted are those of the built-in rows (data/materials.csv names their sources).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.materials import DESIGN_END, load_builtin
from service.core.materials.limits import PropertyLimit, failed_limits, limit_problems

TABLE = load_builtin()


def test_a_limit_fails_below_min_and_above_max_and_names_itself():
    steel, iron = TABLE.ids.index("s355j2"), TABLE.ids.index("grey_iron_gjl_250")
    toughness = TABLE.typical["fracture_toughness"]
    between = 0.5 * (toughness[steel] + toughness[iron])
    assert toughness[iron] < between < toughness[steel]
    reasons = failed_limits(TABLE, [PropertyLimit("fracture_toughness", min=between)],
                            "typical")
    assert reasons[steel] is None
    assert "requirements.property_limits.fracture_toughness.min" in reasons[iron]
    reasons = failed_limits(TABLE, [PropertyLimit("fracture_toughness", max=between)],
                            "typical", path="property_limits")
    assert reasons[iron] is None
    assert reasons[steel].startswith("fracture_toughness") and "property_limits." in reasons[steel]


def test_a_material_without_the_value_fails_the_limit():
    """fatigue_strength is optional: a material that does not give it is not known to meet
    a bound on it (the safe default)."""
    missing = np.flatnonzero(np.isnan(TABLE.typical["fatigue_strength"]))
    assert len(missing)
    reasons = failed_limits(TABLE, [PropertyLimit("fatigue_strength", min=1.0)], "typical")
    assert all("no fatigue_strength value" in reasons[i] for i in missing)


def test_limits_on_the_design_basis_use_the_low_strength():
    """A limit between a material's low and typical strength passes on typical values and
    fails on design values (low strength)."""
    row = TABLE.ids.index("al_6061_t6")
    low, typical = TABLE.low["strength"][row], TABLE.typical["strength"][row]
    assert low < typical
    limit = [PropertyLimit("strength", min=0.5 * (low + typical))]
    assert failed_limits(TABLE, limit, "typical")[row] is None
    assert failed_limits(TABLE, limit, "design")[row] is not None


@pytest.mark.parametrize(("limit", "path"), [
    (PropertyLimit("toughness", min=1.0), "property_limits.toughness"),
    (PropertyLimit("elongation"), "property_limits.elongation"),
    (PropertyLimit("elongation", min=0.5, max=0.1), "property_limits.elongation.max"),
    (PropertyLimit("strength", min=math.inf), "property_limits.strength.min"),
])
def test_bad_limits_are_reported_at_their_path(limit, path):
    assert path in limit_problems([limit])


def test_the_design_basis_takes_low_strength_and_typical_stiffness_and_density():
    """Characteristic strength, mean stiffness and density (EN 1990 4.2, Annex D)."""
    for prop in ("strength", "shear_strength", "compressive_strength", "fatigue_strength"):
        assert DESIGN_END[prop] == "low"
        np.testing.assert_array_equal(TABLE.values(prop, "design"), TABLE.low[prop])
    for prop in ("youngs_modulus", "shear_modulus", "density", "fracture_toughness"):
        np.testing.assert_array_equal(TABLE.values(prop, "design"), TABLE.typical[prop])
