"""The minimum member scale at fixed proportions: the utilisation is 1 there, and the same
root comes out of scipy.optimize.brentq on the family's own properties at scaled dimensions."""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import brentq

from service.core.sections import FAMILIES
from service.core.stability.member import (
    FlatTake,
    MemberMaterial,
    MemberSection,
    material_curves,
    member_buckling_utilization,
    member_utilization,
)
from service.core.stability.scaling import minimum_scale

UNIT_I = {"depth": 1.0, "flange_width": 0.25, "flange_thickness": 0.012, "web_thickness": 0.008}


def _steel(family_id):
    return MemberMaterial(210e9, 81e9, 355e6, material_curves(["steel"], family_id).reshaped(()))


@pytest.mark.parametrize(("case", "actions"), [
    ("simply_supported_center_load", {"moment": 2e4, "load_position": "top"}),
    ("cantilever_uniform_load", {"moment": 5e3, "self_weight_moment": 3e5}),
    ("fixed_fixed_uniform_load", {"moment": 1e4, "axial_force": -2e4}),
    ("column", {"axial_force": -5e4, "end_conditions": "fixed_free"}),
])
def test_minimum_scale_is_the_root_of_the_utilization(case, actions):
    family = FAMILIES["i_section"]
    material = _steel("i_section")
    span = 3.0
    scale = float(minimum_scale(MemberSection.of(family, UNIT_I), material, case, span,
                                **actions))
    weight = actions.pop("self_weight_moment", 0.0)

    def excess(s):
        dims = {name: value * s for name, value in UNIT_I.items()}
        moment = actions.get("moment", 0.0) + weight * s**2
        rest = {k: v for k, v in actions.items() if k != "moment"}
        return float(member_buckling_utilization(family, dims, material, case, span,
                                                 moment=moment, **rest)) - 1.0

    reference = brentq(excess, 1e-4, 10.0, xtol=1e-14, rtol=1e-13)
    assert scale == pytest.approx(reference, rel=1e-9)
    assert excess(scale) <= 1e-12


def test_minimum_scale_broadcasts_and_is_zero_without_load():
    family = FAMILIES["solid_rectangle"]
    unit = MemberSection.of(family, {"depth": 1.0, "width": np.array([0.1, 0.3])[None, :]})
    curves = material_curves(["steel", "wood"], "solid_rectangle").reshaped((-1, 1))
    material = MemberMaterial(np.array([[210e9], [11e9]]), np.array([[81e9], [0.7e9]]),
                              np.array([[355e6], [24e6]]), curves)
    scales = minimum_scale(unit, material, "simply_supported_uniform_load", 4.0,
                           moment=np.array([0.0, 1e3, 1e4])[:, None, None])
    assert scales.shape == (3, 2, 2)
    assert np.all(scales[0] == 0.0)
    assert np.all(np.diff(scales, axis=0) > 0)
    at_root = member_utilization(unit.scaled(scales[2]), material,
                                 "simply_supported_uniform_load", 4.0, moment=1e4)
    np.testing.assert_allclose(at_root, 1.0, rtol=1e-9)


@pytest.mark.parametrize("excess", [1, 2, 8])
def test_minimum_scale_when_the_start_fails_by_a_few_ulps(excess):
    """A moment a few ulps above the elastic resistance Z f of a section that cannot buckle
    laterally (a square, M_b = Z f exactly, chi_LT = 1): the root is s = 1 to double
    precision (M / (Z f s^3) = 1 at s = (1 + eps)^(1/3)), and the search must find it rather
    than report the member as failing at every scale (a first step shorter than the
    rounding of s would not move it)."""
    family = FAMILIES["solid_rectangle"]
    unit = MemberSection.of(family, {"depth": 1.0, "width": 1.0})
    material = _steel("solid_rectangle")
    moment = float(unit.section_modulus_major) * 355e6 * (1.0 + excess * np.finfo(float).eps)
    scale = float(minimum_scale(unit, material, "simply_supported_center_load", 3.0,
                                moment=moment))
    assert scale == pytest.approx(1.0, rel=1e-9)
    at_root = member_utilization(unit.scaled(scale), material, "simply_supported_center_load",
                                 3.0, moment=moment)
    assert at_root <= 1.0


def test_flat_take_reads_each_value_as_its_broadcast_would():
    """FlatTake gathers a value broadcast to the shape at flat positions: the same elements
    as flattening the broadcast view, for values of the shape, smaller ones (a materials
    column, a proportions row, a leading case axis) and scalars; a value that does not
    broadcast is refused."""
    shape = (3, 4, 5)
    rng = np.random.default_rng(2)
    for index in (np.flatnonzero(np.random.default_rng(1).random(shape) < 0.4),
                  np.arange(60)):     # some elements; every element
        take = FlatTake(shape, index)
        for value in (rng.random(shape), rng.random((4, 1)), rng.random((5,)),
                      rng.random((3, 1, 1)), rng.random((1, 4, 5)), rng.random((3, 4, 1)),
                      np.array(2.5), 7.0):
            expected = np.broadcast_to(value, shape).reshape(-1)[index]
            np.testing.assert_array_equal(take(value), expected)
            np.testing.assert_array_equal(take(value), expected)     # its positions kept
        with pytest.raises(ValueError):
            take(np.ones((2, 1)))

