"""The member buckling check: each load case takes the right resistance, and arrays broadcast."""

from __future__ import annotations

import numpy as np
import pytest

from service.core.sections import FAMILIES
from service.core.stability import columns
from service.core.stability.buckling_curves import STEEL_C, STEEL_D
from service.core.stability.member import (
    MemberMaterial,
    material_curves,
    member_buckling_utilization,
)

STEEL = MemberMaterial(210e9, 81e9, 355e6, material_curves(["steel"], "i_section").reshaped(()))
I_DIMS = {"depth": 0.3, "flange_width": 0.15, "flange_thickness": 0.01, "web_thickness": 0.006}


def test_material_curves_follow_the_material_family():
    curves = material_curves(["steel", "aluminium", "wood", "polymer"], "solid_rectangle")
    np.testing.assert_array_equal(curves.column_imperfection, [0.49, 0.32, 0.2, 0.76])
    np.testing.assert_array_equal(curves.lateral_plateau, [0.2, 0.4, 0.3, 0.2])
    assert curves.reshaped((-1, 1)).column_plateau.shape == (4, 1)


def test_tie_and_sandwich_have_no_member_buckling():
    assert member_buckling_utilization(FAMILIES["solid_round"], {"diameter": 0.01}, STEEL,
                                       "tie", 2.0, axial_force=1e3) is None
    panel = {"width": 0.5, "core_thickness": 0.02, "face_thickness": 0.001}
    assert member_buckling_utilization(FAMILIES["sandwich_panel"], panel, STEEL,
                                       "simply_supported_uniform_load", 2.0, moment=1e3) is None


def test_column_uses_its_end_conditions_and_the_weaker_axis():
    family = FAMILIES["i_section"]
    props = family.properties(I_DIMS)
    weaker = float(props.second_moment_minor)
    for ends, factor in columns.EFFECTIVE_LENGTH_FACTORS.items():
        utilization = member_buckling_utilization(family, I_DIMS, STEEL, "column", 3.0,
                                                  axial_force=-1e5, end_conditions=ends)
        expected = columns.column_resistance(3.0, factor, 210e9, 355e6, props.area, weaker,
                                             STEEL_D.imperfection, STEEL_D.plateau)
        assert float(utilization) == pytest.approx(1e5 / float(expected.resistance))
    with pytest.raises(ValueError, match="end conditions"):
        member_buckling_utilization(family, I_DIMS, STEEL, "column", 3.0, axial_force=-1.0)


def test_beam_utilization_grows_with_span_and_drops_with_continuous_restraint():
    family = FAMILIES["i_section"]
    spans = np.array([1.0, 2.0, 4.0, 8.0])
    free = member_buckling_utilization(family, I_DIMS, STEEL, "simply_supported_center_load",
                                       spans, moment=50e3, load_position="top")
    restrained = member_buckling_utilization(family, I_DIMS, STEEL,
                                             "simply_supported_center_load", spans,
                                             moment=50e3, restraint="continuous")
    modulus = float(family.properties(I_DIMS).section_modulus_major)
    np.testing.assert_allclose(restrained, 50e3 / (modulus * 355e6))
    assert np.all(np.diff(free) > 0)
    assert np.all(free >= restrained)


def test_axial_compression_raises_the_beam_utilization_more_than_it_adds():
    family = FAMILIES["rectangular_tube"]
    dims = {"depth": 0.1, "width": 0.1, "wall": 0.004}
    curves = material_curves(["steel"], "rectangular_tube").reshaped(())
    steel = MemberMaterial(210e9, 81e9, 355e6, curves)
    bending = float(member_buckling_utilization(family, dims, steel, "cantilever_end_load", 2.0,
                                                moment=5e3))
    both = float(member_buckling_utilization(family, dims, steel, "cantilever_end_load", 2.0,
                                             moment=5e3, axial_force=-5e4))
    props = family.properties(dims)
    column = columns.column_resistance(2.0, 2.1, 210e9, 355e6, props.area,
                                       props.second_moment_minor, STEEL_C.imperfection,
                                       STEEL_C.plateau)
    assert both > bending + 5e4 / float(column.resistance)


def test_member_check_broadcasts_materials_by_sections_by_cases():
    family = FAMILIES["solid_rectangle"]
    dims = {"depth": np.array([0.05, 0.1, 0.2])[None, :, None],
            "width": np.array([0.01, 0.02, 0.05])[None, :, None]}
    curves = material_curves(["steel", "aluminium"], "solid_rectangle").reshaped((-1, 1, 1))
    material = MemberMaterial(np.array([210e9, 70e9])[:, None, None],
                              np.array([81e9, 26e9])[:, None, None],
                              np.array([355e6, 240e6])[:, None, None], curves)
    spans = np.array([1.0, 2.0, 4.0, 8.0])[None, None, :]
    result = member_buckling_utilization(family, dims, material, "cantilever_uniform_load",
                                         spans, moment=1e3, axial_force=-1e3)
    assert result.shape == (2, 3, 4)
    single = member_buckling_utilization(
        family, {"depth": 0.1, "width": 0.02},
        MemberMaterial(70e9, 26e9, 240e6,
                       material_curves(["aluminium"], "solid_rectangle").reshaped(())),
        "cantilever_uniform_load", 4.0, moment=1e3, axial_force=-1e3)
    assert float(single) == pytest.approx(result[1, 1, 2])
