"""The natural-frequency index of /v1/rankings (limit "frequency", bending) against its
published form and against the sizing.

Sources (from memory):
- ASHBY: M. F. Ashby, Materials Selection in Mechanical Design, 4th ed. (2011), ch. 5-6 and
  the appendix of material indices: a beam of minimum mass with a prescribed first natural
  frequency is selected by E^(1/2)/rho, the index of the light stiff beam, and with the
  section's shape by (phi_B^e E)^(1/2)/rho (WEAVER_ASHBY: Weaver & Ashby, Prog. Mater. Sci.
  41 (1996) 61-128); on the log E - log rho chart its guide lines have slope 2. With cost,
  minimum cost C_m rho A L at the frequency gives (phi E)^(1/2) / (rho C_m^(1/2)) (the
  area goes as rho / (phi E), so the cost as C_m rho^2 / (phi E)).
- BLEVINS: R. D. Blevins, Formulas for Natural Frequency and Mode Shape (1979), table 8-1:
  f_1 = (beta L)^2 / (2 pi L^2) sqrt(E I / (rho A)), beta L = pi for pinned ends. A solid
  round of diameter d has I / A = d^2 / 16, so the lightest round that reaches f has
  d = 8 f L^2 sqrt(rho / E) / pi and a mass rho pi d^2 L / 4 proportional to rho^2 / E:
  the masses of two materials are in the inverse ratio of their indices squared.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.errors import InputError
from service.core.indices import RankingRequest, material_index, rank
from service.core.materials import load_builtin, select
from service.core.sizing import DesignRequest, size_designs


@pytest.fixture(scope="module")
def table():
    return load_builtin()


def test_the_published_index_and_its_shape_factor():
    """ASHBY / WEAVER_ASHBY: (phi_B^e E)^(1/2) / rho for mass, C_m^(-1/2) more for cost
    (exact fractions)."""
    mass = material_index("bending", "frequency", "mass")
    assert mass.exponents == {"youngs_modulus": 0.5, "density": -1.0}
    assert (mass.shape_factor, mass.shape_factor_exponent) == ("bending_stiffness", 0.5)
    cost = material_index("bending", "frequency", "cost")
    assert cost.exponents == {"youngs_modulus": 0.5, "density": -1.0, "price": -0.5}


def test_index_values_are_e_to_the_half_over_rho(table):
    """The ranked index of a solid square bar (phi = 1) is E^(1/2) / rho of each material,
    relative to 1e-12, every mismatch reported; for a 210 GPa, 7850 kg/m^3 steel that is
    58.4 Pa^(1/2) m^3 / kg, ASHBY's 1.85 GPa^(1/2) m^3 / Mg (sqrt(210) / 7.85) in SI."""
    results = rank(RankingRequest("bending", "frequency", sections=("solid_rectangle",),
                                  proportions={"solid_rectangle": {"width": 1.0}}),
                   table).results
    mismatches = []
    for result in results:
        index = table.position(result.material_id)
        expected = (math.sqrt(float(table.values("youngs_modulus")[index]))
                    / float(table.values("density")[index]))
        if result.index != pytest.approx(expected, rel=1e-12):
            mismatches.append((result.material_id, result.index, expected))
    assert not mismatches


def test_chart_guide_line_has_slope_two(table):
    chart = rank(RankingRequest("bending", "frequency", chart=True, top=5), table).chart
    assert chart.slope == pytest.approx(2.0, rel=1e-15)


def test_sized_masses_are_in_the_inverse_ratio_of_the_squared_indices(table):
    """BLEVINS: solid rounds sized by /v1/designs for a first frequency alone (simply
    supported, no attached mass, self-weight off: the member's own mass is its vibrating
    mass) weigh in the inverse ratio of their indices squared. Tolerance 0.2 %: the sizing
    rounds diameters to 0.001 mm and its search is exact to 0.5 % at worst; the Timoshenko
    terms of the frequency (shear deformation, rotary inertia) depend on E / G and rho / E,
    which barely differ between these metals, and move the ratio by under 0.1 % here."""
    ids = ["s355j2", "al_6061_t6", "ti_6al_4v_annealed"]
    chosen = select(table, ids=ids)
    request = DesignRequest("simply_supported_uniform_load", span=2.0, load=1.0,
                            min_frequency=60.0, sections=("solid_round",),
                            lateral_restraint="continuous", property_basis="typical",
                            local_buckling=False)
    masses = {d.material_id: d.mass for d in size_designs(request, chosen).designs}
    assert set(masses) == set(ids)
    assert all(d.governing == "frequency" for d in size_designs(request, chosen).designs)
    ranked = {r.material_id: r.index for r in rank(
        RankingRequest("bending", "frequency", sections=("solid_round",)), chosen).results}
    reference = ids[0]
    mismatches = []
    for material in ids[1:]:
        ratio = masses[material] / masses[reference]
        expected = (ranked[reference] / ranked[material]) ** 2
        if abs(ratio / expected - 1.0) > 2e-3:
            mismatches.append((material, ratio, expected))
    assert not mismatches
    # and the diameter is the closed form of BLEVINS, f_b = (pi / L)^2 / (2 pi) sqrt(E d^2 /
    # (16 rho)) = c d, with Timoshenko's first-order correction for shear deformation and
    # rotary inertia of a simply supported member (Timoshenko, Vibration Problems in
    # Engineering, 3rd ed. 1955, sec. 62, from memory): 1 / f^2 = (1 + (pi r / L)^2
    # (1 + E / (k G))) / f_b^2, r = d / 4, Cowper's k = 6 (1 + nu) / (7 + 6 nu) for a circle
    # (J. Appl. Mech. 1966), solved for d (the unit load's own checks are met far below it)
    steel = chosen.position("s355j2")
    e, rho, g, nu = (float(chosen.values(name, "typical")[steel]) for name in (
        "youngs_modulus", "density", "shear_modulus", "poisson_ratio"))
    frequency, span = 60.0, 2.0
    c = (math.pi / span) ** 2 / (2.0 * math.pi) * math.sqrt(e / (16.0 * rho))
    correction = (math.pi / (4.0 * span)) ** 2 * (1.0 + e / (6 * (1 + nu) / (7 + 6 * nu) * g))
    diameter = 1.0 / (c * math.sqrt(1.0 / frequency**2 - correction / c**2))
    euler_bernoulli = 8.0 * frequency * span**2 * math.sqrt(rho / e) / math.pi
    assert diameter > euler_bernoulli * 1.003   # the correction is not negligible here
    (design,) = [d for d in size_designs(request, chosen).designs
                 if d.material_id == "s355j2"]
    assert design.dimensions["diameter"] == pytest.approx(diameter, abs=2e-6)
    assert np.isfinite(design.frequency)


def test_frequency_applies_to_bending_only():
    with pytest.raises(InputError) as caught:
        material_index("torsion", "frequency", "mass")
    assert list(caught.value.errors) == ["limit"]
