"""Proportion rules: declared once by the families, read by the sizing, narrowed or widened by
a request within the physics, and named ``governing`` when they stop the search."""

from __future__ import annotations

import dataclasses
import math

import pytest

from service.core.errors import InputError
from service.core.materials import load_builtin
from service.core.sections import FAMILIES
from service.core.sizing import DIMENSION_RESOLUTION, DesignRequest, size_designs
from service.core.sizing.rules import RuleOverride, family_for, rules_of


@pytest.fixture(scope="module")
def table():
    """The built-in materials without their manufacturing limits: these tests are about the
    families' proportion rules, which a process's wall-ratio limit would otherwise cut
    (tests/properties/test_manufacturing_limits.py checks those)."""
    return dataclasses.replace(load_builtin(), form_limits=None)

STIFF_FLAT_BAR = dict(load_case="simply_supported_uniform_load", span=3.0, load=12000.0,
                      max_deflection=0.006, sections=("solid_rectangle",))
"""A stiffness-limited solid rectangle: the narrowest allowed is the lightest (see below)."""


def only(table, material_id):
    return table.take([table.ids.index(material_id)])


def test_rule_names_follow_the_scale_dimension():
    names = {family_id: list(rules_of(family)) for family_id, family in FAMILIES.items()}
    assert names == {
        "solid_round": [],
        "solid_rectangle": ["width/depth"],
        "round_tube": ["wall/outer_diameter"],
        "rectangular_tube": ["width/depth", "wall/depth"],
        "i_section": ["flange_width/depth", "flange_thickness/depth", "web_thickness/depth"],
        "sandwich_panel": ["face_thickness/core_thickness"],
    }
    for family in FAMILIES.values():
        for bound in family.ratio_bounds:
            assert bound.widest_low <= bound.low < bound.high <= bound.widest_high
            assert bound.source and bound.widest_source


def rectangle_depth(subset, ratio: float) -> float:
    """Depth h of the solid rectangle b = ratio h of :data:`STIFF_FLAT_BAR` at its deflection
    limit: 5 W L^3 12 / (384 E ratio h^4) + W L / (8 k G ratio h^2) = delta, a quadratic in
    h^2, with Cowper's k = 10 (1 + nu) / (12 + 11 nu) (J. Appl. Mech. 1966, from memory)."""
    e, g, nu = (float(subset.values(name, "typical")[0])
                for name in ("youngs_modulus", "shear_modulus", "poisson_ratio"))
    k = 10 * (1 + nu) / (12 + 11 * nu)
    linear = 12000.0 * 3.0 / (8 * k * g * ratio)
    constant = 5.0 * 12000.0 * 3.0**3 * 12 / (384.0 * e * ratio)
    return math.sqrt((linear + math.sqrt(linear**2 + 4 * 0.006 * constant)) / (2 * 0.006))


@pytest.mark.parametrize("narrowest", [0.1, 0.25, 0.5])
def test_a_narrowed_flat_bar_sits_on_the_request_rule(table, narrowest):
    """Simply supported uniform load: deflection 5 W L^3 / (384 E I) (Roark's Formulas for
    Stress and Strain, 8th ed., table 8.1 case 2e, from memory) plus the Timoshenko shear
    deflection W L / (8 k G A) (:func:`rectangle_depth`). The lightest stiff-enough bar is the
    narrowest its rule allows, b = r h (the area b h at a fixed I = b h^3 / 12 falls as
    b^(2/3); the shear term reads the area alone). The rule, not stiffness, stopped the
    search: governing says "proportions". Tolerance: the 0.001 mm rounding."""
    proportions = () if narrowest == 0.1 else (
        RuleOverride("solid_rectangle", "width/depth", low=narrowest),)
    request = DesignRequest(**STIFF_FLAT_BAR, proportions=proportions)
    subset = only(table, "s235jr")
    (design,) = size_designs(request, subset).designs
    depth = rectangle_depth(subset, narrowest)
    assert depth * (1 - 1e-3) <= design.dimensions["depth"] <= depth * 1.001
    assert design.dimensions["width"] / design.dimensions["depth"] == pytest.approx(
        narrowest, abs=2 * DIMENSION_RESOLUTION / design.dimensions["depth"])
    assert design.governing == "proportions"
    assert design.utilization["proportions"] == pytest.approx(1.0, abs=1e-3)


def test_widening_a_rule_within_the_physics_gives_a_lighter_design(table):
    """A lightly loaded steel tube sits on the 0.005 wall/outer_diameter rule (the wall it
    would like is thinner). Widening the rule to 0.002 (inside the SP-8007 range) lets the
    wall thin until another check stops it: lighter, and no longer governed by the rule.
    The load is small and the tube sits on 300 mm saddles, so that the wall's bearing under
    the load and at the supports (which sets a wall whatever the diameter) stays below the
    rule's."""
    base = dict(load_case="simply_supported_center_load", span=1.0, load=30.0,
                max_deflection=0.004, safety_factor=1.5, sections=("round_tube",),
                bearing_length=0.3)
    subset = only(table, "s355j2")
    (fixed,) = size_designs(DesignRequest(**base), subset).designs
    assert fixed.governing == "proportions"
    # within the 0.001 mm rounding of a wall of about 0.125 mm (0.8 %)
    assert fixed.dimensions["wall"] / fixed.dimensions["outer_diameter"] == pytest.approx(
        0.005, rel=1e-2)
    widened = DesignRequest(**base, proportions=(
        RuleOverride("round_tube", "wall/outer_diameter", low=0.002),))
    (free,) = size_designs(widened, subset).designs
    assert free.mass < fixed.mass * 0.95
    assert free.dimensions["wall"] / free.dimensions["outer_diameter"] >= 0.002 * (1 - 1e-9)
    assert free.governing != "proportions"


@pytest.mark.parametrize("override, path, words", [
    (RuleOverride("round_tube", "wall/outer_diameter", low=1e-4),
     "proportions.round_tube.wall/outer_diameter.min", "beyond where the physics holds"),
    (RuleOverride("solid_rectangle", "width/depth", high=20.0),
     "proportions.solid_rectangle.width/depth.max", "beyond where the physics holds"),
    (RuleOverride("solid_rectangle", "width/depth", low=2.0, high=1.0),
     "proportions.solid_rectangle.width/depth.max", "less than max"),
    (RuleOverride("solid_rectangle", "wall/depth", low=0.1),
     "proportions.solid_rectangle.wall/depth", "no proportion rule"),
    (RuleOverride("hexagon", "width/depth", low=0.1), "proportions.hexagon", "unknown"),
    (RuleOverride("solid_rectangle", "width/depth", low=math.nan),
     "proportions.solid_rectangle.width/depth.min", "finite number"),
])
def test_bad_rules_are_refused_at_their_path(table, override, path, words):
    request = DesignRequest(**STIFF_FLAT_BAR, proportions=(override,))
    with pytest.raises(InputError) as caught:
        size_designs(request, only(table, "s235jr"))
    assert list(caught.value.errors) == [path]
    assert words in caught.value.errors[path][0]


def test_a_request_rule_says_where_it_came_from():
    family = family_for("rectangular_tube", (RuleOverride("rectangular_tube", "width/depth",
                                                          high=8.0),))
    width, wall = family.ratio_bounds
    assert (width.low, width.high) == (0.25, 8.0)
    assert width.source.startswith("the request (the family's rule: 0.25 to 4")
    assert wall == FAMILIES["rectangular_tube"].ratio_bounds[1]
    assert FAMILIES["rectangular_tube"].ratio_bounds[0].high == 4.0   # the registry is intact
    assert family_for("round_tube", ()) is FAMILIES["round_tube"]
