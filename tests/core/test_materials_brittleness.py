"""The brittle rule: both a small strain at break and a low fracture toughness.

Thresholds: 5 % strain (Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed.,
sec. 5-1, from memory) and 20 MPa m^0.5 (common practice); values below are demo data.
"""

import numpy as np
import pytest

from service.core.materials import BRITTLE_ELONGATION, BRITTLE_TOUGHNESS
from service.core.materials.brittleness import brittle, brittle_reason

NAN = float("nan")


@pytest.mark.parametrize(
    ("elongation", "toughness", "family", "expected"),
    [
        (0.001, 4e6, "steel", True),  # both low: brittle whatever the family
        (0.30, 4e6, "ceramic", False),  # stretches: ductile whatever the family
        (0.01, 40e6, "glass", False),  # stops cracks: ductile
        (BRITTLE_ELONGATION, 1e6, "polymer", False),  # on the line counts as ductile
        (0.01, BRITTLE_TOUGHNESS, "polymer", False),
        (0.01, NAN, "steel", True),  # one low, the other unknown: the safe side
        (NAN, 4e6, "steel", True),
        (0.30, NAN, "glass", False),  # one known and ductile decides
        (NAN, 60e6, "ceramic", False),
        (NAN, NAN, "ceramic", True),  # nothing known: by family
        (NAN, NAN, "glass", True),
        (NAN, NAN, "aluminium", False),
        (NAN, NAN, "foam", False),
    ],
)
def test_rule(elongation, toughness, family, expected):
    flags = brittle(np.array([elongation]), np.array([toughness]), [family])
    assert flags.dtype == bool and flags.tolist() == [expected]


def test_rule_is_elementwise_over_arrays():
    flags = brittle(np.array([0.3, 0.001, NAN]), np.array([100e6, 3e6, NAN]), ["a", "b", "glass"])
    assert flags.tolist() == [False, True, True]


def test_reason_names_the_values_under_the_thresholds():
    both = brittle_reason(0.001, 3.5e6, "ceramic")
    assert "0.1 %" in both and "3.5 MPa m^0.5" in both and "without warning" in both
    assert "strain" not in brittle_reason(0.30, 4e6, "polymer")
    assert "a glass without ductility data" in brittle_reason(NAN, NAN, "glass")
    assert "stated brittle" in brittle_reason(NAN, NAN, "aluminium")
    assert "stated brittle" in brittle_reason(0.30, 60e6, "steel")
