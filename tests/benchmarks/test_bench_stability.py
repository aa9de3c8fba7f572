"""Speed of the member buckling check against the section properties it reads, in one run.

10^6 geometries of each family that can buckle as a member, one vectorised call each. The
member check (lateral-torsional buckling with the beam-column interaction) reads the
family's properties and adds the critical moment, two Ayrton-Perry curves and the
interaction; its time is compared with the properties alone in the same run (ratios measured
together are more trustworthy than absolute times on a shared machine). Each benchmark checks
the result's shape, so a broken call cannot pass as fast.
"""

from __future__ import annotations

import numpy as np
import pytest

from service.core.sections import FAMILIES
from service.core.stability.member import (
    MemberMaterial,
    material_curves,
    member_buckling_utilization,
)
from tests.benchmarks.test_bench_sections import COUNT, random_geometries

MEMBER_FAMILIES = ["solid_rectangle", "rectangular_tube", "i_section"]


@pytest.fixture(scope="module", params=MEMBER_FAMILIES)
def member_geometries(request):
    return request.param, random_geometries(request.param, np.random.default_rng(20240612))


@pytest.mark.benchmark(group="member buckling, 1e6 geometries")
def test_section_properties_alone(benchmark, member_geometries):
    family_id, dims = member_geometries
    props = benchmark.pedantic(lambda: FAMILIES[family_id].properties(dims), rounds=5,
                               warmup_rounds=1)
    assert props.area.shape == (COUNT,)


@pytest.mark.benchmark(group="member buckling, 1e6 geometries")
def test_member_buckling_beam_column(benchmark, member_geometries):
    family_id, dims = member_geometries
    material = MemberMaterial(210e9, 81e9, 355e6,
                              material_curves(["steel"], family_id).reshaped(()))
    result = benchmark.pedantic(
        lambda: member_buckling_utilization(
            FAMILIES[family_id], dims, material, "simply_supported_uniform_load", 3.0,
            moment=1e3, axial_force=-1e4, load_position="top"),
        rounds=5, warmup_rounds=1)
    assert result.shape == (COUNT,)
