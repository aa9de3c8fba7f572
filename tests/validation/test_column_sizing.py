"""Columns and ties sized by the engine, against classical closed forms and a textbook example.

- A long slender pin-ended column reaches the Euler load pi^2 E I / L^2 (Euler 1744;
  Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 2.1, from memory): at a
  relative slenderness above 10 the column curve's chi lambda^2 is above 0.95, so the sized
  member carries between 95 % and 100 % of its own Euler load.
- A stocky column reaches the squash load A f: chi = 1 on the curve's plateau, so the sized
  solid round has exactly the area P SF / f (to one rounding step).
- A tie's area is P SF / f or P L / (E delta_max), whichever is larger (Hooke's law).
- Worked example: Hibbeler, Mechanics of Materials, 8th ed., Example 13.1 (from memory): a
  pin-ended W8x31 column 12 ft long buckles about its weak axis (I_y = 37.1 in^4) at
  P_cr = 512 kip, so with A-36 steel it yields first (P = 329 kip). Its sharp-cornered outline
  (AISC Manual nominal dimensions, from memory) as a one-member catalogue: our weak-axis
  second moment and Euler load must match the example's within 1 % (the fillets are left out),
  and the engine's member utilisation must equal P SF / (chi A f) with chi solved from the
  Perry-Robertson equation on the example's P_cr.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.materials import load_builtin
from service.core.sections import FAMILIES
from service.core.sizing import DIMENSION_RESOLUTION, CatalogMember, DesignRequest, size_designs
from service.core.stability.buckling_curves import column_curve
from tests.validation.ltb_reference import perry_robertson

INCH = 0.0254       # m (exact, by definition)
KIP = 4448.2216     # N (1000 lbf, lbf = 4.4482216152605 N exactly)


@pytest.fixture(scope="module")
def steel():
    table = load_builtin()
    return table.take([table.ids.index("s235jr")])


def values(table) -> tuple[float, float]:
    return float(table.values("youngs_modulus")[0]), float(table.values("strength")[0])


def test_long_slender_pin_ended_column_reaches_its_euler_load(steel):
    request = DesignRequest("column", property_basis="typical",
                            span=10.0, load=1000.0, end_conditions="pinned_pinned",
                            sections=("solid_round",))
    (design,) = size_designs(request, steel).designs
    youngs, strength = values(steel)
    diameter = design.dimensions["diameter"]
    euler = math.pi**2 * youngs * math.pi * diameter**4 / 64.0 / 10.0**2
    squash = strength * math.pi * diameter**2 / 4.0
    assert math.sqrt(squash / euler) > 10.0
    assert 0.95 * euler <= 1000.0 <= euler
    assert design.governing == "member_buckling"
    # one rounding step less would fail: the design is the smallest that carries the load
    smaller = diameter - DIMENSION_RESOLUTION
    curve = column_curve("steel", "solid_round")
    chi = perry_robertson(math.sqrt(squash / euler) * diameter / smaller,
                          curve.imperfection, curve.plateau)
    assert chi * strength * math.pi * smaller**2 / 4.0 < 1000.0


def test_stocky_column_reaches_the_squash_load(steel):
    request = DesignRequest("column", property_basis="typical",
                            span=0.2, load=200000.0, end_conditions="fixed_fixed",
                            safety_factor=1.5, sections=("solid_round",))
    (design,) = size_designs(request, steel).designs
    _, strength = values(steel)
    expected = math.sqrt(4.0 * 200000.0 * 1.5 / (math.pi * strength))
    assert expected <= design.dimensions["diameter"] <= expected + DIMENSION_RESOLUTION
    assert design.governing == "strength"
    assert design.utilization["member_buckling"] == pytest.approx(
        design.utilization["strength"], rel=1e-12)


@pytest.mark.parametrize(("extension", "governing"), [(None, "strength"), (0.001, "stiffness")])
def test_tie_area_is_the_larger_of_strength_and_extension(steel, extension, governing):
    request = DesignRequest("tie", property_basis="typical",
                            span=4.0, load=50000.0, max_extension=extension,
                            safety_factor=1.5, sections=("solid_round",))
    (design,) = size_designs(request, steel).designs
    youngs, strength = values(steel)
    area = 50000.0 * 1.5 / strength
    if extension is not None:
        area = max(area, 50000.0 * 4.0 / (youngs * extension))
    expected = math.sqrt(4.0 * area / math.pi)
    assert expected <= design.dimensions["diameter"] <= expected + DIMENSION_RESOLUTION
    assert design.governing == governing


W8X31 = {"depth": 8.00 * INCH, "flange_width": 7.995 * INCH, "flange_thickness": 0.435 * INCH,
         "web_thickness": 0.285 * INCH}
"""AISC Steel Construction Manual, W8x31 nominal dimensions (from memory)."""


def test_hibbeler_example_13_1_w8x31_pinned_column(steel):
    span = 12.0 * 12.0 * INCH
    props = FAMILIES["i_section"].properties({k: np.asarray(v) for k, v in W8X31.items()})
    assert float(props.second_moment_minor) == pytest.approx(37.1 * INCH**4, rel=0.01)
    youngs_example = 29.0e3 * 6.894757e6      # 29,000 ksi, Pa (1 psi = 6894.757 Pa)
    euler = math.pi**2 * youngs_example * float(props.second_moment_minor) / span**2
    assert euler == pytest.approx(512.0 * KIP, rel=0.01)
    # the engine, with the section as a one-member catalogue and S235 steel
    load, factor = 100.0 * KIP, 1.5
    request = DesignRequest("column", property_basis="typical",
                            span=span, load=load, end_conditions="pinned_pinned",
                            safety_factor=factor, sections=("i_section",),
                            catalog=(CatalogMember("W8x31", "i_section", W8X31),))
    (design,) = size_designs(request, steel).designs
    youngs, strength = values(steel)
    squash = float(props.area) * strength
    critical = 512.0 * KIP * youngs / youngs_example     # the example's P_cr, our E
    curve = column_curve("steel", "i_section")
    chi = perry_robertson(math.sqrt(squash / critical), curve.imperfection, curve.plateau)
    # 1 %: our sharp-cornered I_y against the example's 37.1 in^4
    assert design.utilization["member_buckling"] == pytest.approx(
        load * factor / (chi * squash), rel=0.01)
    assert squash < critical          # the example's conclusion: it yields before it buckles
