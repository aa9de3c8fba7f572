"""Sizing checked against outside references: scipy SLSQP, handbook closed forms, indices.

Every expected value here is computed independently of service.core.sizing: by scipy's SLSQP
optimiser over all dimensions (slsqp_reference.py), or by the textbook formulas written out
in the test with our own numbers.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from slsqp_reference import checks, slsqp_size

from service.core.materials import load_builtin
from service.core.sections import FAMILIES
from service.core.sizing import DIMENSION_RESOLUTION, DesignRequest, size_designs

FIVE = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube", "i_section")


def typical_request(*args, **kwargs) -> DesignRequest:
    """A request on typical values: the references here take each material's typical values
    (material_dict), so the comparison is of the physics and the search alone."""
    return DesignRequest(*args, property_basis="typical", **kwargs)


@pytest.fixture(scope="module")
def table():
    """The built-in materials without their manufacturing limits: the SLSQP reference and
    the handbook formulas size free proportions (the limits are checked against their own
    data in tests/properties/test_manufacturing_limits.py)."""
    return dataclasses.replace(load_builtin(), form_limits=None)


def material_dict(table, material_id, basis="typical"):
    index = table.ids.index(material_id)
    values = {name: float(table.values(name, basis)[index])
              for name in ("density", "youngs_modulus", "shear_modulus", "poisson_ratio",
                           "strength")}
    # the compressive strength where the data give a lower one (the compressed fibre's and
    # a column's), and E2 of an orthotropic material (NaN for an isotropic one)
    compressive = float(table.values("compressive_strength", basis)[index])
    values["compression_strength"] = (values["strength"] if math.isnan(compressive)
                                      else min(values["strength"], compressive))
    values["transverse_modulus"] = float(table.values("transverse_modulus", basis)[index])
    # the shear strength the engine uses (the material's own, else strength / sqrt 3)
    return {**values, "shear_strength": float(table.shear_strength(basis)[index]),
            "family": table.families[index], "brittle": bool(table.brittle[index])}


EXACTNESS_CASES = [
    # (request, material ids, families): our own numbers, chosen so that stiffness,
    # strength, local buckling, the envelope and min_wall each bind somewhere.
    (typical_request("simply_supported_center_load", span=2.0, load=5000.0, max_deflection=0.005,
                   safety_factor=1.5, max_depth=0.1),
     ("s355j2", "al_6061_t6", "cfrp_qi_sm"), FIVE),
    (typical_request("cantilever_end_load", span=1.5, load=20000.0, max_deflection=0.01,
                   safety_factor=1.5),
     ("s355j2", "al_7075_t6", "douglas_fir"), ("round_tube", "rectangular_tube", "i_section")),
    (typical_request("fixed_fixed_uniform_load", span=4.0, load=50000.0, max_deflection=0.008,
                   safety_factor=2.0, max_depth=0.2, max_width=0.1, min_wall=0.004),
     ("s355j2", "al_6082_t6"), ("rectangular_tube", "i_section", "solid_rectangle")),
    (typical_request("torsion", span=1.0, torque=2000.0, max_twist=0.02, safety_factor=1.5,
                   max_depth=0.08),
     ("s355j2", "ti_6al_4v_annealed"), ("round_tube", "rectangular_tube", "solid_round")),
    # strength-governed in a two-sided envelope (the optimum is a vertex of both limits),
    # with a UD composite whose own low shear strength governs its tubes
    (typical_request("fixed_fixed_uniform_load", span=3.0, load=40000.0, safety_factor=1.5,
                   max_depth=0.15, max_width=0.12),
     ("ss_304_annealed", "al_7050_t7451", "cfrp_ud_hm"),
     ("round_tube", "rectangular_tube", "i_section")),
    # small, light members where min_wall shapes the tube
    (typical_request("simply_supported_uniform_load", span=0.5, load=50.0, max_deflection=0.01,
                   safety_factor=1.5, min_wall=0.001),
     ("cfrp_ud_sm", "brass_c26000_h02", "ti_6al_4v_annealed"),
     ("round_tube", "rectangular_tube")),
    # self-weight in a tight envelope
    (typical_request("cantilever_end_load", span=1.2, load=800.0, max_deflection=0.004,
                   safety_factor=2.0, max_depth=0.06, max_width=0.05, self_weight=True),
     ("al_6061_t6", "cfrp_qi_sm", "gfrp_pultruded_e23"), ("rectangular_tube", "i_section")),
    # unbraced spans where lateral-torsional buckling sets the proportions: the issue's
    # simply supported centre load (span/250, SF 1.5, 400 x 300 mm), a top load, and a
    # cantilever with self-weight
    (typical_request("simply_supported_center_load", span=4.0, load=5000.0, max_deflection=0.016,
                   safety_factor=1.5, max_depth=0.4, max_width=0.3),
     ("s355j2", "al_6061_t6"), ("i_section", "solid_rectangle", "rectangular_tube")),
    (typical_request("simply_supported_uniform_load", span=6.0, load=8000.0, max_deflection=0.024,
                   safety_factor=1.5, max_depth=0.4, max_width=0.3, load_position="top"),
     ("s355j2", "al_6082_t6"), ("i_section", "solid_rectangle")),
    (typical_request("cantilever_end_load", span=2.0, load=1500.0, max_deflection=0.02,
                   safety_factor=1.5, max_depth=0.3, max_width=0.2, self_weight=True),
     ("s355j2", "al_6061_t6"), ("i_section", "solid_rectangle")),
]


@pytest.mark.parametrize("request_, material_ids, families", EXACTNESS_CASES)
def test_mass_within_half_a_percent_of_multistart_slsqp(table, request_, material_ids, families):
    """Our (rounded) mass <= 1.005 x the lightest of 6 SLSQP starts, and every one of our
    designs passes the reference's own checks. 0.5 % is the issue's exactness target; it
    covers the search tolerance and the rounding of dimensions up to 0.001 mm."""
    request_ = dataclasses.replace(request_, sections=families)
    subset = table.take([table.ids.index(i) for i in material_ids])
    result = size_designs(request_, subset)
    problems = []
    compared = 0
    for design in result.designs:
        family = FAMILIES[design.family]
        material = material_dict(subset, design.material_id)
        dims = {k: np.asarray(v) for k, v in design.dimensions.items()}
        failed = {k: u for k, u in checks(family, dims, material, request_).items()
                  if u > 1 + 1e-9}
        if failed:
            problems.append(f"{design.material_id}/{design.family} fails {failed}")
        reference = slsqp_size(family, material, request_, starts=6)
        if reference is None:
            continue
        compared += 1
        if design.mass > reference[0] * 1.005:
            problems.append(f"{design.material_id}/{design.family}: ours {design.mass:.5g} kg,"
                            f" SLSQP {reference[0]:.5g} kg")
    assert compared >= len(result.designs) // 2, "SLSQP found too few references to compare"
    assert not problems, problems


def test_shaft_diameter_matches_the_torsion_sizing_formula(table):
    """Solid shaft for strength: d = (16 T SF / (pi tau_allow))^(1/3), tau = sigma/sqrt(3)
    (Saint-Venant torsion of a circle with the von Mises shear strength, as in any shaft
    design text, e.g. Budynas & Nisbett, Shigley's Mechanical Engineering Design, ch. 7, from
    memory). Our numbers: 800 N m, SF 2, S355 steel. Tolerance: one rounding step."""
    request_ = typical_request("torsion", span=0.6, torque=800.0, safety_factor=2.0,
                             sections=("solid_round",))
    subset = table.take([table.ids.index("s355j2")])
    (design,) = size_designs(request_, subset).designs
    tau = material_dict(subset, "s355j2")["strength"] / math.sqrt(3.0)
    expected = (16.0 * 800.0 * 2.0 / (math.pi * tau)) ** (1.0 / 3.0)
    assert expected <= design.dimensions["diameter"] <= expected + DIMENSION_RESOLUTION + 1e-12
    assert design.governing == "strength"


def test_hollow_shaft_stress_and_twist_match_the_tube_formulas(table):
    """Reported stress and twist of a sized round tube against tau = 16 T D / (pi (D^4 - d^4))
    and theta = T L / (G pi (D^4 - d^4) / 32) (Gere & Goodno, Mechanics of Materials, ch. 3,
    from memory), evaluated by hand here. Tolerance 1e-9 relative (same exact formula)."""
    request_ = typical_request("torsion", span=1.2, torque=1500.0, max_twist=0.03,
                             safety_factor=1.5, max_depth=0.08, sections=("round_tube",))
    subset = table.take([table.ids.index("al_6061_t6")])
    (design,) = size_designs(request_, subset).designs
    outer = design.dimensions["outer_diameter"]
    inner = outer - 2.0 * design.dimensions["wall"]
    polar = math.pi * (outer**4 - inner**4) / 32.0
    shear_modulus = material_dict(subset, "al_6061_t6")["shear_modulus"]
    assert math.isclose(design.max_stress, 1500.0 * (outer / 2.0) / polar, rel_tol=1e-9)
    assert math.isclose(design.twist, 1500.0 * 1.2 / (shear_modulus * polar), rel_tol=1e-9)
    assert outer <= 0.08 + 1e-12


def test_stiffness_limited_rectangular_beam_matches_the_deflection_formula(table):
    """Simply supported beam under a uniform load, deflection 5 W L^3 / (384 E I) (Roark's
    Formulas for Stress and Strain, 8th ed., table 8.1 case 2e, from memory) plus the
    Timoshenko shear deflection W L / (8 k G A) (Timoshenko & Gere, Mechanics of Materials,
    sec. 9.11; Cowper's k = 10 (1 + nu) / (12 + 11 nu), J. Appl. Mech. 1966; from memory):
    the lightest stiff-enough solid rectangle is the narrowest allowed (width = 0.1 depth,
    the family's ratio limit), since for fixed I the area b h falls as b^(2/3) (the shear
    term reads the area alone); with I = 0.1 h^4 / 12 and A = 0.1 h^2 the limit is a
    quadratic in h^2. The 10:1 rule stopped it, so it governs (stiffness sets the
    scale at those proportions, at utilization 1 too). Our numbers: 3 m, 12 kN, 6 mm, S235.
    Tolerance: rounding."""
    request_ = typical_request("simply_supported_uniform_load", span=3.0, load=12000.0,
                             max_deflection=0.006, safety_factor=1.0,
                             sections=("solid_rectangle",))
    subset = table.take([table.ids.index("s235jr")])
    (design,) = size_designs(request_, subset).designs
    steel = material_dict(subset, "s235jr")
    nu = steel["poisson_ratio"]
    k = 10 * (1 + nu) / (12 + 11 * nu)
    linear = 12000.0 * 3.0 / (8 * k * steel["shear_modulus"] * 0.1)
    constant = 5.0 * 12000.0 * 3.0**3 * 120 / (384.0 * steel["youngs_modulus"])
    depth = math.sqrt((linear + math.sqrt(linear**2 + 4 * 0.006 * constant)) / (2 * 0.006))
    assert design.governing == "proportions"
    assert design.utilization["stiffness"] == pytest.approx(1.0, abs=1e-3)
    assert design.utilization["proportions"] == pytest.approx(1.0, abs=1e-3)
    # either way by a rounding step (the width may round up and the depth down)
    assert depth - DIMENSION_RESOLUTION <= design.dimensions["depth"] <= (
        depth * 1.001 + DIMENSION_RESOLUTION)
    assert design.deflection <= 0.006


def _timoshenko_round_mass(material, load, span, limit) -> float:
    """Mass of the solid round cantilever whose tip deflection (bending plus shear) is
    ``limit``: with u = d^2, limit u^2 - 4 P L / (k G pi) u - 64 P L^3 / (3 pi E) = 0."""
    nu = material["poisson_ratio"]
    k = 6 * (1 + nu) / (7 + 6 * nu)
    linear = 4 * load * span / (k * material["shear_modulus"] * math.pi)
    constant = 64 * load * span**3 / (3 * math.pi * material["youngs_modulus"])
    u = (linear + math.sqrt(linear**2 + 4 * limit * constant)) / (2 * limit)
    return material["density"] * math.pi * u / 4 * span


@pytest.mark.parametrize("limit", ["stiffness", "strength"])
def test_mass_ratio_follows_the_material_index(table, limit):
    """At fixed proportions (a solid round) the mass of a strength-limited beam scales as
    rho / sigma^(2/3), the classical material index (Ashby-style index derivation, any
    materials-selection text, from memory), sigma the weaker fibre's strength (timber's
    compression parallel to the grain). A stiffness-limited one is a Timoshenko beam: the
    tip deflection 64 P L^3 / (3 pi E d^4) + 4 P L / (k G pi d^2) (Timoshenko & Gere,
    Mechanics of Materials, sec. 9.11; Cowper's k = 6 (1 + nu) / (7 + 6 nu) for a circle,
    J. Appl. Mech. 1966, from memory) at the limit is a quadratic in d^2, solved here; the
    index rho / E^(1/2) is its bending-only limit. Tolerance 0.1 %: the only departure is
    the 0.001 mm rounding of ~40 mm diameters."""
    ids = ("s355j2", "al_6061_t6", "ti_6al_4v_annealed", "douglas_fir")
    subset = table.take([table.ids.index(i) for i in ids])
    stiffness = limit == "stiffness"
    request_ = typical_request(
        "cantilever_end_load", span=1.0, load=2000.0,
        max_deflection=0.002 if stiffness else None, safety_factor=1.0,
        sections=("solid_round",), allow_brittle=True,  # the physics, timber included
    )
    designs = {d.material_id: d for d in size_designs(request_, subset).designs}
    assert set(designs) == set(ids)
    for design in designs.values():
        assert design.governing == limit
    reference = ids[0]
    for material_id in ids[1:]:
        a, b = material_dict(subset, reference), material_dict(subset, material_id)
        if stiffness:
            index_ratio = _timoshenko_round_mass(a, 2000.0, 1.0, 0.002) / (
                _timoshenko_round_mass(b, 2000.0, 1.0, 0.002))
        else:
            index_ratio = (b["compression_strength"] ** (2 / 3) / b["density"]) / (
                a["compression_strength"] ** (2 / 3) / a["density"])
        mass_ratio = designs[material_id].mass / designs[reference].mass
        assert math.isclose(mass_ratio, 1.0 / index_ratio, rel_tol=1e-3), material_id


@pytest.mark.parametrize("catalog, designation, area_cm2, second_moment_cm4, low", [
    # published section tables (EN 10365 IPE; EN 10219-2 CHS), from memory
    ("ipe_en10365", "IPE 200", 28.5, 1943.0, 0.92),
    ("ipe_en10365", "IPE 300", 53.8, 8356.0, 0.92),
    ("chs_en10219", "CHS 168.3x5", 25.7, 856.0, 0.99),
])
def test_catalogue_members_match_published_section_tables(catalog, designation, area_cm2,
                                                          second_moment_cm4, low):
    """Our sharp-cornered model of a catalogue member against the published A and I.
    IPE tables include the root fillets our model omits, so ours may be up to 8 % lower
    (never higher, tolerance 0.5 %); a CHS has no fillets: within 1 %."""
    from service.core.sizing import load_catalog

    member = next(m for m in load_catalog(catalog) if m.designation == designation)
    props = FAMILIES[member.family].properties(
        {k: np.asarray(v) for k, v in member.dimensions.items()})
    for ours, published in ((float(props.area) * 1e4, area_cm2),
                            (float(props.second_moment_major) * 1e8, second_moment_cm4)):
        assert low * published <= ours <= 1.005 * published, (designation, ours, published)


AXIAL_CASES = [
    # (request, material ids, families): our own numbers. Ties set by strength or by their
    # extension; columns short (squash load), slender (flexural buckling) and thin-walled
    # (local buckling), each end condition once.
    (typical_request("tie", span=3.0, load=80000.0, safety_factor=1.5, min_wall=0.002,
                   max_depth=0.1),
     ("s355j2", "al_6061_t6"), ("round_tube", "rectangular_tube", "i_section", "solid_round")),
    (typical_request("tie", span=5.0, load=20000.0, max_extension=0.002, safety_factor=1.5),
     ("s355j2", "cfrp_ud_sm"), ("round_tube", "solid_rectangle")),
    (typical_request("column", span=0.3, load=200000.0, end_conditions="fixed_fixed",
                   safety_factor=1.5),
     ("s355j2", "al_6082_t6"), ("solid_round", "solid_rectangle")),
    (typical_request("column", span=3.0, load=50000.0, end_conditions="pinned_pinned",
                   safety_factor=1.5, max_depth=0.2, max_width=0.2),
     ("s355j2", "al_6061_t6", "cfrp_qi_sm"), ("round_tube", "rectangular_tube", "i_section")),
    (typical_request("column", span=2.0, load=20000.0, end_conditions="fixed_free",
                   safety_factor=2.0, max_depth=0.15, max_width=0.1, min_wall=0.002),
     ("s355j2", "al_6061_t6"), ("rectangular_tube", "i_section", "solid_rectangle")),
    (typical_request("column", span=4.0, load=100000.0, end_conditions="fixed_pinned",
                   safety_factor=1.5),
     ("s355j2", "douglas_fir"), ("round_tube", "solid_round", "solid_rectangle")),
    # slender walls: chi A_eff f (A / A_eff 1.04-1.34 at the optimum), the square box where
    # the weaker axis changes and I-sections where a wall's rho leaves 1
    (typical_request("column", span=1.0, load=200000.0, end_conditions="pinned_pinned",
                   safety_factor=1.5),
     ("s355j2", "al_6082_t6"), ("rectangular_tube", "i_section")),
    (typical_request("column", span=3.0, load=300000.0, end_conditions="pinned_pinned",
                   safety_factor=1.5, max_depth=0.3, max_width=0.3),
     ("s355j2", "al_6061_t6"), ("rectangular_tube", "i_section")),
]


@pytest.mark.parametrize("request_, material_ids, families", AXIAL_CASES)
def test_ties_and_columns_within_half_a_percent_of_multistart_slsqp(
        table, request_, material_ids, families):
    """As for bending: our mass <= 1.005 x the lightest of 6 SLSQP starts under the same
    checks written out in slsqp_reference.py (Hooke's law, squash load, Euler load about the
    weaker axis with AISC effective lengths and the Perry-Robertson column curve), and every
    design passes them."""
    test_mass_within_half_a_percent_of_multistart_slsqp(
        table, dataclasses.replace(request_, allow_brittle=True), material_ids, families)


BEAM_COLUMN_CASES = [
    # (request, material ids, families): our own numbers; a compression that amplifies the
    # moment and the deflection, restrained and not, and a tension.
    (typical_request("simply_supported_center_load", span=4.0, load=5000.0, axial_force=-50000.0,
                   max_deflection=0.016, safety_factor=1.5, max_depth=0.4, max_width=0.3),
     ("s355j2", "al_6061_t6"), ("i_section", "round_tube", "rectangular_tube")),
    (typical_request("cantilever_end_load", span=2.0, load=2000.0, axial_force=-20000.0,
                   max_deflection=0.02, safety_factor=1.5, max_depth=0.3,
                   lateral_restraint="continuous"),
     ("s355j2", "al_6082_t6"), ("i_section", "solid_rectangle", "round_tube")),
    (typical_request("fixed_fixed_uniform_load", span=3.0, load=20000.0, axial_force=80000.0,
                   safety_factor=1.5, max_depth=0.2, max_width=0.15),
     ("s355j2", "al_6061_t6"), ("i_section", "rectangular_tube", "solid_round")),
    # a heavy compression on slender walls: the column term chi A_eff f (A / A_eff 1.3-1.7
    # at the optimum) sets the boxes
    (typical_request("simply_supported_uniform_load", span=3.0, load=3000.0,
                   axial_force=-150000.0, max_deflection=0.012, safety_factor=1.5,
                   max_depth=0.25, max_width=0.25),
     ("s355j2", "al_6061_t6"), ("i_section", "rectangular_tube")),
]


@pytest.mark.parametrize("request_, material_ids, families", BEAM_COLUMN_CASES)
def test_beam_columns_within_half_a_percent_of_multistart_slsqp(
        table, request_, material_ids, families):
    """As for bending, with the beam-column interaction and the amplified deflection
    written out in slsqp_reference.py."""
    test_mass_within_half_a_percent_of_multistart_slsqp(table, request_, material_ids,
                                                          families)
