"""Invariants of every section family under hypothesis-generated geometries.

Dimensional analysis (no outside data needed, the laws are exact): scaling every dimension by
s scales A by s^2, I and K by s^4, Z, plastic modulus and Q by s^3, and leaves shape factors
and local buckling stresses unchanged (they depend on proportions and the material only).
Checked to 1e-9 relative, far above round-off and far below any formula error.
Validation must name exactly the dimensions that were spoiled.
"""

from __future__ import annotations

import math

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from service.core.errors import GeometryError
from service.core.sections import FAMILIES, shape_factors
from service.core.sections.base import Elastic

SCALE_POWER = {
    "area": 2,
    "second_moment_major": 4,
    "second_moment_minor": 4,
    "section_modulus_major": 3,
    "section_modulus_minor": 3,
    "plastic_modulus_major": 3,
    "torsion_constant": 4,
    "torsion_modulus": 3,
}

MATERIAL = Elastic(youngs_modulus=70e9, shear_modulus=26e9, poisson_ratio=0.33)
CORE = Elastic(youngs_modulus=60e6, shear_modulus=22e6, poisson_ratio=0.3)

ratio = st.floats(min_value=0.0, max_value=1.0)


@st.composite
def geometries(draw, family_id):
    """A valid geometry of the family, drawn inside its practical ratio bounds."""
    family = FAMILIES[family_id]
    scale = draw(st.floats(min_value=1e-3, max_value=1.0))
    dims = {family.scale_dimension: scale}
    for bound in family.ratio_bounds:
        # geometric interpolation between the bounds; keep strictly inside the upper one
        position = draw(ratio)
        dims[bound.dimension] = scale * bound.low * (0.99 * bound.high / bound.low) ** position
    for name in family.fixed_dimensions:
        dims[name] = draw(st.floats(min_value=1e-2, max_value=2.0))
    if family_id == "rectangular_tube":
        # the wall must also be under half the narrower side
        dims["wall"] = min(dims["wall"], 0.49 * min(dims["depth"], dims["width"]))
    family.validate(dims)
    return dims


family_ids = st.sampled_from(list(FAMILIES))


@st.composite
def family_and_geometry(draw):
    family_id = draw(family_ids)
    return family_id, draw(geometries(family_id))


@settings(max_examples=300, deadline=None)
@given(family_and_geometry(), st.floats(min_value=0.01, max_value=100.0))
def test_scaling_laws(case, factor):
    family_id, dims = case
    family = FAMILIES[family_id]
    scaled = {name: value * factor for name, value in dims.items()}
    base, grown = family.properties(dims), family.properties(scaled)
    for name, power in SCALE_POWER.items():
        np.testing.assert_allclose(
            getattr(grown, name), getattr(base, name) * factor**power, rtol=1e-9, err_msg=name
        )
    base_factors, grown_factors = shape_factors(base), shape_factors(grown)
    for name in base_factors.__dataclass_fields__:
        np.testing.assert_allclose(
            getattr(grown_factors, name), getattr(base_factors, name), rtol=1e-9, err_msg=name
        )
    base_buckling = family.local_buckling(dims, MATERIAL, CORE)
    grown_buckling = family.local_buckling(scaled, MATERIAL, CORE)
    for name in ("bending", "torsion"):
        np.testing.assert_allclose(
            getattr(grown_buckling, name), getattr(base_buckling, name), rtol=1e-9, err_msg=name
        )


@settings(max_examples=200, deadline=None)
@given(family_and_geometry())
def test_properties_are_positive_and_finite_and_buckling_positive(case):
    family_id, dims = case
    family = FAMILIES[family_id]
    props = family.properties(dims)
    for name in SCALE_POWER:
        value = getattr(props, name)
        assert np.all(np.isfinite(value) & (value > 0)), name
    lb = family.local_buckling(dims, MATERIAL, CORE)
    assert np.all(lb.bending > 0) and np.all(lb.torsion > 0)


@settings(max_examples=100, deadline=None)
@given(family_and_geometry())
def test_array_call_equals_scalar_calls(case):
    # Vectorised evaluation of 3 variants in one call gives the same numbers as 3 scalar calls.
    family_id, dims = case
    family = FAMILIES[family_id]
    factors = np.array([1.0, 0.5, 2.0])
    arrays = {name: value * factors for name, value in dims.items()}
    together = family.properties(arrays)
    for index, factor in enumerate(factors):
        alone = family.properties({name: value * factor for name, value in dims.items()})
        for name in SCALE_POWER:
            # equal to round-off: numpy's SIMD loops may round the last bit differently,
            # and differences of powers of nearly equal sizes (a thin tube's D^4 - d^4)
            # magnify it a hundredfold or so (seen: 1.03e-14)
            np.testing.assert_allclose(
                getattr(together, name)[index], getattr(alone, name), rtol=1e-12
            )


BAD_VALUES = st.sampled_from([0.0, -1e-3, -1.0, math.nan, math.inf, -math.inf, "wide"])


@settings(max_examples=300, deadline=None)
@given(st.data())
def test_validation_names_every_spoiled_dimension(data):
    family_id = data.draw(family_ids)
    dims = data.draw(geometries(family_id))
    names = list(FAMILIES[family_id].dimension_names)
    spoiled = data.draw(st.sets(st.sampled_from(names), min_size=1))
    as_array = data.draw(st.booleans())
    for name in spoiled:
        bad = data.draw(BAD_VALUES)
        if as_array and not isinstance(bad, str):
            # one bad element among good ones: the whole dimension is reported
            dims[name] = np.array([dims[name], bad, dims[name]])
        else:
            dims[name] = bad
    try:
        FAMILIES[family_id].validate(dims)
    except GeometryError as error:
        assert set(error.errors) == spoiled
        assert all(error.errors[name] for name in spoiled)
    else:
        raise AssertionError(f"{family_id}: {sorted(spoiled)} spoiled but accepted")


@settings(max_examples=200, deadline=None)
@given(family_and_geometry())
def test_buckling_modes_are_the_terms_of_the_minimum(case):
    # The separate modes a gradient search follows must give back the reported minimum.
    family_id, dims = case
    family = FAMILIES[family_id]
    buckling = family.local_buckling(dims, MATERIAL, CORE)
    for loading in ("bending", "torsion"):
        modes = buckling.modes(loading)
        assert modes
        np.testing.assert_allclose(np.minimum.reduce(modes), getattr(buckling, loading),
                                   rtol=1e-12, err_msg=loading)


@settings(max_examples=200, deadline=None)
@given(family_and_geometry())
def test_sizing_properties_are_those_of_properties(case):
    # The shortcut sizing reads (skipping torsion series in bending) equals the full set.
    family_id, dims = case
    family = FAMILIES[family_id]
    props = family.properties(dims)
    expected = {
        "bending": (props.area, props.second_moment_major, props.section_modulus_major),
        "torsion": (props.area, props.torsion_constant, props.torsion_modulus),
    }
    for loading, terms in expected.items():
        for got, want in zip(family.sizing_properties(dims, loading), terms, strict=True):
            np.testing.assert_allclose(got, want, rtol=1e-12, err_msg=loading)
