"""Invariants of member buckling under hypothesis-generated members (exact laws, no outside data).

- Never above the elastic critical value: chi lambda^2 <= 1 on every Ayrton-Perry curve, so
  M_b <= M_cr and N_b <= N_cr; never above the cross-section: M_b <= Z f, N_b <= A f.
- A load on the top flange never raises M_cr above the shear-centre value.
- Dimensional analysis: scaling every dimension and the span by s leaves lambda_LT, lambda
  and the reductions unchanged (M_cr and Z f both scale as s^3, N_cr and A f as s^2).
  Checked to 1e-9 relative.
- The minimum scale at fixed proportions is the smallest feasible one: the member check
  holds there and fails a relative 1e-9 below (to 1e-6 in the utilisation).
"""

from __future__ import annotations

import numpy as np
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from service.core.sections import FAMILIES
from service.core.stability.buckling_curves import STEEL_C, STEEL_D
from service.core.stability.columns import EFFECTIVE_LENGTH_FACTORS, column_resistance
from service.core.stability.critical_moment import MOMENT_FACTORS
from service.core.stability.lateral_properties import (
    LATERAL_TORSIONAL_FAMILIES,
    lateral_torsional_properties,
)
from service.core.stability.lateral_torsional import lateral_torsional_resistance
from service.core.stability.member import (
    MemberMaterial,
    MemberSection,
    material_curves,
    member_utilization,
)
from service.core.stability.scaling import minimum_scale
from tests.properties.test_section_invariants import geometries

COLUMN_FAMILIES = [fid for fid, family in FAMILIES.items() if "compression" in family.loadings]


@st.composite
def members(draw, family_ids):
    family_id = draw(st.sampled_from(family_ids))
    dims = draw(geometries(family_id))
    depth = float(FAMILIES[family_id].overall_depth(dims))
    span = depth * draw(st.floats(min_value=2.0, max_value=500.0))
    youngs = draw(st.floats(min_value=1e9, max_value=4e11))
    material = (youngs, youngs * draw(st.floats(min_value=0.02, max_value=0.45)),
                youngs * draw(st.floats(min_value=1e-4, max_value=2e-2)))
    return family_id, dims, span, material


def _beam(family_id, dims, span, material, case_id, position):
    family = FAMILIES[family_id]
    youngs, shear, strength = material
    return lateral_torsional_resistance(
        MOMENT_FACTORS[case_id], span, youngs, shear, strength,
        family.properties(dims).section_modulus_major,
        lateral_torsional_properties(family, dims), STEEL_D.imperfection, STEEL_D.plateau,
        load_position=position)


@settings(max_examples=300, deadline=None)
@given(members(list(LATERAL_TORSIONAL_FAMILIES)), st.sampled_from(sorted(MOMENT_FACTORS)),
       st.floats(min_value=0.01, max_value=100.0))
def test_beam_resistance_bounds_and_scaling(member, case_id, factor):
    family_id, dims, span, material = member
    centre = _beam(family_id, dims, span, material, case_id, "shear_centre")
    top = _beam(family_id, dims, span, material, case_id, "top")
    elastic = float(FAMILIES[family_id].properties(dims).section_modulus_major) * material[2]
    for result in (centre, top):
        assert float(result.moment_resistance) <= elastic * (1 + 1e-12)
        assert float(result.moment_resistance) <= float(result.critical_moment) * (1 + 1e-12)
    assert float(top.critical_moment) <= float(centre.critical_moment) * (1 + 1e-12)
    scaled = _beam(family_id, {k: v * factor for k, v in dims.items()}, span * factor,
                   material, case_id, "top")
    np.testing.assert_allclose(scaled.relative_slenderness, top.relative_slenderness,
                               rtol=1e-9)
    np.testing.assert_allclose(scaled.reduction, top.reduction, rtol=1e-9)


@settings(max_examples=300, deadline=None)
@given(members(COLUMN_FAMILIES), st.sampled_from(sorted(EFFECTIVE_LENGTH_FACTORS)),
       st.floats(min_value=0.01, max_value=100.0))
def test_column_resistance_bounds_and_scaling(member, ends, factor):
    family_id, dims, span, (youngs, _, strength) = member
    family = FAMILIES[family_id]

    def column(dims, span):
        props = family.properties(dims)
        weaker = np.minimum(props.second_moment_major, props.second_moment_minor)
        return props, column_resistance(span, EFFECTIVE_LENGTH_FACTORS[ends], youngs, strength,
                                        props.area, weaker, STEEL_C.imperfection,
                                        STEEL_C.plateau)

    props, result = column(dims, span)
    assert float(result.resistance) <= float(props.area) * strength * (1 + 1e-12)
    assert float(result.resistance) <= float(result.critical_load) * (1 + 1e-12)
    _, scaled = column({k: v * factor for k, v in dims.items()}, span * factor)
    np.testing.assert_allclose(scaled.reduction, result.reduction, rtol=1e-9)


@settings(max_examples=200, deadline=None)
@given(members(list(LATERAL_TORSIONAL_FAMILIES)), st.sampled_from(sorted(MOMENT_FACTORS)),
       st.floats(min_value=1.0, max_value=1e6), st.floats(min_value=0.0, max_value=1e5),
       st.floats(min_value=-1e6, max_value=1e6), st.sampled_from(["shear_centre", "top"]))
def test_minimum_scale_is_where_the_member_check_reaches_one(member, case_id, moment, weight,
                                                             axial, position):
    """u <= 1 at the returned scale and u > 1 just below it (the smallest feasible scale)."""
    family_id, dims, span, (youngs, shear, strength) = member
    material = MemberMaterial(youngs, shear, strength,
                              material_curves(["steel"], family_id).reshaped(()))
    unit = MemberSection.of(FAMILIES[family_id], dims)
    actions = {"moment": moment, "axial_force": axial, "load_position": position}
    scale = float(minimum_scale(unit, material, case_id, span, self_weight_moment=weight,
                                **actions))
    assume(0.0 < scale < np.inf)

    def utilization(s):
        return float(member_utilization(unit.scaled(s), material, case_id, span,
                                        **{**actions, "moment": moment + weight * s**2}))
    assert utilization(scale) <= 1.0
    assert utilization(scale * (1.0 - 1e-9)) > 1.0 - 1e-6
