"""Column rankings against Euler buckling, sized independently in this file.

Sources (from memory):
- EULER: the Euler load of a pin-ended column, P_cr = pi^2 E I / L^2, about the weaker axis
  (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 2.1).
- ROARK: second moments of a solid rectangle b h^3 / 12 and of a thin- or thick-walled box
  (h b^3 - (h - 2t)(b - 2t)^3) / 12 (Roark's Formulas for Stress and Strain, 8th ed.,
  appendix A).
- ASHBY: the light, stiff column's index E^(1/2) / rho, with the shape factor about the weaker
  axis entering as (phi E)^(1/2) / rho (Ashby, Materials Selection in Mechanical Design, 4th
  ed., ch. 5 and 11).
- PLATE: a long plate with both edges simply supported in uniform compression buckles at
  sigma = 4 pi^2 E / (12 (1 - nu^2)) (t / b)^2 (Timoshenko & Gere sec. 9.2).

The consistency asked of the rankings: at fixed proportions, the mass ratio of two materials'
columns that just carry the same load equals the inverse ratio of their indices. The columns
here are sized by bisection on the Euler load written out below, not by the ranking code.
The column load case of /v1/designs is not wired yet; when it is, the same comparison belongs
against its sizing in the slender (Euler) range.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.indices import RankingRequest, rank
from service.core.materials import load_builtin

LOAD = 20e3      # N, our numbers
LENGTH = 3.0     # m, pin-ended
MATERIALS = ("s355j2", "al_6061_t6", "ti_6al_4v_annealed", "cfrp_ud_sm")


def box_weaker_second_moment(depth, width, wall):
    """ROARK: both axes of a box; the column buckles about the smaller."""
    major = (width * depth**3 - (width - 2 * wall) * (depth - 2 * wall) ** 3) / 12
    minor = (depth * width**3 - (depth - 2 * wall) * (width - 2 * wall) ** 3) / 12
    return min(major, minor)


def box_area(depth, width, wall):
    return depth * width - (depth - 2 * wall) * (width - 2 * wall)


def euler_sized_depth(youngs, proportions):
    """The smallest depth whose Euler load about the weaker axis reaches LOAD (bisection in
    log depth; EULER)."""
    low, high = math.log(1e-4), math.log(10.0)
    for _ in range(200):
        middle = 0.5 * (low + high)
        depth = math.exp(middle)
        weaker = box_weaker_second_moment(depth, proportions["width"] * depth,
                                          proportions["wall"] * depth)
        if math.pi**2 * youngs * weaker / LENGTH**2 >= LOAD:
            high = middle
        else:
            low = middle
    return math.exp(high)


@pytest.fixture(scope="module")
def table():
    return load_builtin()


@pytest.mark.parametrize("proportions", [
    {"width": 0.5, "wall": 0.1},      # deep box: buckles about its width
    {"width": 2.0, "wall": 0.15},     # wide box: the other axis
    {"width": 1.0, "wall": 0.1},      # square
])
def test_mass_ratio_at_fixed_proportions_is_the_inverse_index_ratio(table, proportions):
    """ASHBY's consistency, checked on independent Euler columns. Tolerance 1e-9 relative:
    the bisection and the index are exact (no rounding of dimensions here)."""
    present = [m for m in MATERIALS if m in table.ids]
    assert len(present) >= 3
    result = rank(RankingRequest("compression", "stiffness", sections=("rectangular_tube",),
                                 proportions={"rectangular_tube": proportions}),
                  table.take([table.ids.index(m) for m in present]))
    index = {r.material_id: r.index for r in result.results}
    assert set(index) == set(present), "every material is ranked at these proportions"
    masses = {}
    for material_id in present:
        row = table.ids.index(material_id)
        youngs = float(table.values("youngs_modulus", "typical")[row])
        density = float(table.values("density", "typical")[row])
        depth = euler_sized_depth(youngs, proportions)
        area = box_area(depth, proportions["width"] * depth, proportions["wall"] * depth)
        masses[material_id] = density * area * LENGTH
    reference = present[0]
    mismatches = []
    for material_id in present[1:]:
        mass_ratio = masses[material_id] / masses[reference]
        index_ratio = index[reference] / index[material_id]
        if not math.isclose(mass_ratio, index_ratio, rel_tol=1e-9):
            mismatches.append((material_id, mass_ratio, index_ratio))
    assert not mismatches


def test_the_shape_factor_is_that_of_the_weaker_axis(table):
    """phi = 12 I_min / A^2 (ROARK); for a deep box it is the width's axis, well below the
    depth's (the bending shape factor)."""
    proportions = {"width": 0.5, "wall": 0.05}
    result = rank(RankingRequest("compression", "stiffness", sections=("rectangular_tube",),
                                 proportions={"rectangular_tube": proportions}),
                  table.take([table.ids.index("s355j2")]))
    (ranked,) = result.results
    depth, width, wall = 1.0, proportions["width"], proportions["wall"]
    expected = 12 * box_weaker_second_moment(depth, width, wall) / box_area(depth, width, wall)**2
    assert ranked.shape_factor == pytest.approx(expected, rel=1e-12)
    beam = rank(RankingRequest("bending", "stiffness", sections=("rectangular_tube",),
                               proportions={"rectangular_tube": proportions}),
                table.take([table.ids.index("s355j2")])).results[0]
    assert beam.shape_factor > 2 * ranked.shape_factor


def test_free_box_walls_reach_the_strength_before_buckling_in_uniform_compression(table):
    """The shape limit of a column: every wall carries the full P / A, so the wider wall of
    the chosen box reaches the strength before it buckles as a long plate (PLATE, the wall's
    mid-line width as b). Tolerance 1e-6: the search stops on that boundary."""
    picks = [table.ids.index(m) for m in ("s355j2", "al_6061_t6")]
    subset = table.take(picks)
    result = rank(RankingRequest("compression", "stiffness", sections=("rectangular_tube",)),
                  subset)
    problems = []
    for ranked in result.results:
        row = subset.ids.index(ranked.material_id)
        youngs = float(subset.values("youngs_modulus", "typical")[row])
        nu = float(subset.values("poisson_ratio", "typical")[row])
        strength = float(subset.values("strength", "typical")[row])
        width, wall = ranked.proportions["width"], ranked.proportions["wall"]
        plate = max(1.0, width) - wall
        critical = 4 * math.pi**2 * youngs / (12 * (1 - nu**2)) * (wall / plate) ** 2
        if critical < strength * (1 - 1e-6):
            problems.append((ranked.material_id, critical, strength))
    assert not problems
    assert np.isfinite([r.index for r in result.results]).all()
