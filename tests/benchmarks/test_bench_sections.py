"""Speed of the section library: 10^6 geometries of each family in one vectorised call.

Run with ``make bench`` (``pytest tests/benchmarks --benchmark-only``). Each benchmark also
checks that the result has one value per geometry, so a broken call cannot pass as fast.
"""

from __future__ import annotations

import numpy as np
import pytest

from service.core.sections import FAMILIES, shape_factors
from service.core.sections.base import Elastic

COUNT = 1_000_000


def random_geometries(family_id: str, rng: np.random.Generator) -> dict[str, np.ndarray]:
    """COUNT valid geometries inside the family's ratio bounds."""
    family = FAMILIES[family_id]
    scale = rng.uniform(0.01, 0.5, COUNT)
    dims = {family.scale_dimension: scale}
    for bound in family.ratio_bounds:
        dims[bound.dimension] = scale * rng.uniform(bound.low, 0.99 * bound.high, COUNT)
    for name in family.fixed_dimensions:
        dims[name] = rng.uniform(0.1, 1.0, COUNT)
    if family_id == "rectangular_tube":
        dims["wall"] = np.minimum(dims["wall"], 0.49 * np.minimum(dims["depth"], dims["width"]))
    family.validate(dims)
    return dims


@pytest.fixture(scope="module", params=list(FAMILIES))
def family_geometries(request):
    return request.param, random_geometries(request.param, np.random.default_rng(20240601))


@pytest.mark.benchmark(group="section properties, 1e6 geometries")
def test_properties_and_shape_factors(benchmark, family_geometries):
    family_id, dims = family_geometries
    family = FAMILIES[family_id]
    factors = benchmark.pedantic(
        lambda: shape_factors(family.properties(dims)), rounds=5, warmup_rounds=1
    )
    assert factors.torsion_strength.shape == (COUNT,)


@pytest.mark.benchmark(group="local buckling, 1e6 geometries")
def test_local_buckling(benchmark, family_geometries):
    family_id, dims = family_geometries
    family = FAMILIES[family_id]
    material = Elastic(youngs_modulus=70e9, shear_modulus=26e9, poisson_ratio=0.33)
    core = Elastic(youngs_modulus=60e6, shear_modulus=22e6, poisson_ratio=0.3)
    result = benchmark.pedantic(
        lambda: family.local_buckling(dims, material, core), rounds=5, warmup_rounds=1
    )
    assert result.bending.shape == (COUNT,)


@pytest.mark.benchmark(group="validation, 1e6 geometries")
def test_validation(benchmark, family_geometries):
    family_id, dims = family_geometries
    benchmark.pedantic(lambda: FAMILIES[family_id].validate(dims), rounds=5, warmup_rounds=1)
