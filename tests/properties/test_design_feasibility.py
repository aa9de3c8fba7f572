"""Every returned design meets every requirement, checked independently from its dimensions.

Hypothesis draws valid requests (any load case, limits, envelope, min_wall, self-weight,
property basis) and a handful of built-in materials. Each design is then re-checked here with
the section property functions and the beam and shaft formulas written out below (Roark's
Formulas for Stress and Strain, 8th ed., table 8.1, from memory) - nothing from the sizing
engine. Tolerance 1e-9 relative: the engine recomputes from the same rounded dimensions, so
only round-off separates the two.
"""

from __future__ import annotations

import csv
import dataclasses
import math
from pathlib import Path

import numpy as np
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from service.core.errors import InputError
from service.core.materials import load_builtin
from service.core.sections import FAMILIES, bearing, flexure_shear
from service.core.sections.base import Elastic
from service.core.sections.orthotropic import OrthotropicElastic
from service.core.sizing import DIMENSION_RESOLUTION, DesignRequest, size_designs
from tests.properties.bearing_check import bearing_ratio, material, shorthand_forces

GRAVITY = 9.80665  # ISO 80000-3 standard acceleration of gravity, m/s^2

# case -> (moment coefficient, deflection coefficient, uniform partner) for P (or total W):
# M = c_M P L, delta = c_D P L^3 / (E I) (Roark 8th ed. table 8.1, from memory)
FORMULAS = {
    "cantilever_end_load": (1.0, 1 / 3, "cantilever_uniform_load"),
    "cantilever_uniform_load": (1 / 2, 1 / 8, "cantilever_uniform_load"),
    "simply_supported_center_load": (1 / 4, 1 / 48, "simply_supported_uniform_load"),
    "simply_supported_uniform_load": (1 / 8, 5 / 384, "simply_supported_uniform_load"),
    "fixed_fixed_center_load": (1 / 8, 1 / 192, "fixed_fixed_uniform_load"),
    "fixed_fixed_uniform_load": (1 / 12, 1 / 384, "fixed_fixed_uniform_load"),
}
SOLID_AND_THIN = ("solid_round", "solid_rectangle", "round_tube", "rectangular_tube",
                  "i_section")
TABLE = load_builtin()
CANDIDATES = [i for i, forms in enumerate(TABLE.forms)
              if set(forms) & set(SOLID_AND_THIN) and TABLE.families[i] != "foam"]


def optional(strategy):
    return st.one_of(st.none(), strategy)


def log_uniform(low, high):
    return st.floats(math.log(low), math.log(high)).map(math.exp)


@st.composite
def requests(draw):
    case = draw(st.sampled_from([*FORMULAS, "torsion"]))
    span = draw(log_uniform(0.2, 5.0))
    bending = case != "torsion"
    return DesignRequest(
        load_case=case,
        span=span,
        load=draw(log_uniform(10.0, 1e5)) if bending else None,
        torque=None if bending else draw(log_uniform(1.0, 1e4)),
        max_deflection=draw(optional(log_uniform(span / 2000, span / 20))) if bending else None,
        max_twist=None if bending else draw(optional(log_uniform(0.002, 0.2))),
        safety_factor=draw(st.floats(1.0, 3.0)),
        local_buckling=draw(st.booleans()),
        self_weight=draw(st.booleans()) if bending else False,
        max_depth=draw(optional(log_uniform(0.01, 0.5))),
        max_width=draw(optional(log_uniform(0.01, 0.5))),
        min_wall=draw(optional(log_uniform(2e-4, 0.01))),
        property_basis=draw(st.sampled_from(["typical", "conservative"])),
        bearing_length=draw(st.sampled_from([0.0, 0.0, 0.01, 0.1])),
        core_direction=draw(st.sampled_from(["weak", "strong"])),
        sections=SOLID_AND_THIN,
    )


PROPORTION_RULES = {
    "solid_rectangle": {("width", "depth"): (0.1, 10.0)},
    "round_tube": {("wall", "outer_diameter"): (0.005, 0.5)},
    "rectangular_tube": {("width", "depth"): (0.25, 4.0), ("wall", "depth"): (0.005, 0.5)},
    "i_section": {("flange_width", "depth"): (0.2, 1.0),
                  ("flange_thickness", "depth"): (0.01, 0.2),
                  ("web_thickness", "depth"): (0.005, 0.1)},
    "sandwich_panel": {("face_thickness", "core_thickness"): (0.005, 1.0)},
}
"""The families' proportion rules as the contract publishes them (GET /v1/sections), written
out here: a design with free proportions keeps every one."""

SHEAR_DEFLECTION = {"cantilever_end_load": 1.0, "cantilever_uniform_load": 0.5,
                    "simply_supported_center_load": 0.25, "simply_supported_uniform_load": 0.125,
                    "fixed_fixed_center_load": 0.25, "fixed_fixed_uniform_load": 0.125}
"""Timoshenko shear deflection c_S P L / (k G A) of each case: the integral of V / (k G A)
from a section of zero shear deflection (Timoshenko & Gere, Mechanics of Materials, sec. 9.11,
from memory)."""


def cowper_shear_area(family: str, dims: dict, nu: float) -> float:
    """k A with Cowper's shear coefficients (The shear coefficient in Timoshenko's beam
    theory, J. Appl. Mech. 33, 1966, table 1, from memory), written out here; thin-walled
    sections on their wall mid-lines."""
    if family == "solid_round":
        d = dims["diameter"]
        return 6 * (1 + nu) / (7 + 6 * nu) * math.pi * d**2 / 4
    if family == "solid_rectangle":
        return 10 * (1 + nu) / (12 + 11 * nu) * dims["depth"] * dims["width"]
    if family == "round_tube":
        outer, wall = dims["outer_diameter"], dims["wall"]
        m2 = ((outer - 2 * wall) / outer) ** 2
        k = 6 * (1 + nu) * (1 + m2) ** 2 / ((7 + 6 * nu) * (1 + m2) ** 2 + (20 + 12 * nu) * m2)
        return k * math.pi * (outer**2 - (outer - 2 * wall) ** 2) / 4
    if family == "rectangular_tube":
        h, b, t = dims["depth"], dims["width"], dims["wall"]
        m = n = (b - t) / (h - t)
        k = 10 * (1 + nu) * (1 + 3 * m) ** 2 / (
            12 + 72 * m + 150 * m**2 + 90 * m**3
            + nu * (11 + 66 * m + 135 * m**2 + 90 * m**3)
            + 10 * n**2 * ((3 + nu) * m + 3 * m**2))
        return k * (b * h - (b - 2 * t) * (h - 2 * t))
    h, b = dims["depth"], dims["flange_width"]
    tf, tw = dims["flange_thickness"], dims["web_thickness"]
    m, n = 2 * b * tf / ((h - tf) * tw), b / (h - tf)
    k = 10 * (1 + nu) * (1 + 3 * m) ** 2 / (
        12 + 72 * m + 150 * m**2 + 90 * m**3 + nu * (11 + 66 * m + 135 * m**2 + 90 * m**3)
        + 30 * n**2 * (m + m**2) + 5 * nu * n**2 * (8 * m + 9 * m**2))
    return k * (2 * b * tf + (h - 2 * tf) * tw)


BEARING_FAMILIES = ("i_section", "rectangular_tube", "round_tube")
"""The families whose webs or walls are checked for bearing (bearing_check)."""

SHEAR = {"cantilever_end_load": 1.0, "cantilever_uniform_load": 1.0,
         "simply_supported_center_load": 0.5, "simply_supported_uniform_load": 0.5,
         "fixed_fixed_center_load": 0.5, "fixed_fixed_uniform_load": 0.5}
"""Peak shear force / load of each case (reactions; Roark table 8.1, from memory)."""


def independent_check(design, request, table) -> list[str]:
    """Every requirement recomputed from the design's own dimensions (messages if broken)."""
    basis = request.property_basis
    row = design.material_index

    def value(name):
        return float(table.values(name, basis)[row])

    family = FAMILIES[design.family]
    dims = {k: np.asarray(v) for k, v in design.dimensions.items()}
    family.validate(dims)
    props = family.properties(dims)
    # walls of a material with a transverse modulus buckle as orthotropic plates and shells
    # (the section library's orthotropic formulas, checked against published solutions in
    # tests/validation/test_orthotropic_plate_reference.py)
    transverse = value("transverse_modulus")
    buckling = family.local_buckling(dims, Elastic(
        value("youngs_modulus"), value("shear_modulus"), value("poisson_ratio"))
        if math.isnan(transverse) else OrthotropicElastic(
            value("youngs_modulus"), transverse, value("shear_modulus"),
            value("poisson_ratio")))
    area = float(props.area)
    span, factor = request.span, request.safety_factor
    problems = []

    def at_most(name, actual, limit):
        if actual > limit * (1 + 1e-9):
            problems.append(f"{name}: {actual:.6g} > {limit:.6g}")

    shear_strength = float(table.values("shear_strength", basis)[row])
    if math.isnan(shear_strength):
        shear_strength = value("strength") / math.sqrt(3.0)  # von Mises
    if request.load_case == "torsion":
        stress = request.torque / float(props.torsion_modulus)
        if request.max_twist is not None:
            angle = request.torque * span / (value("shear_modulus") * float(props.torsion_constant))
            at_most("twist", angle, request.max_twist)
        at_most("shear stress x SF", stress * factor, shear_strength)
        critical = float(buckling.torsion)
    else:
        c_moment, c_deflection, partner = FORMULAS[request.load_case]
        u_moment, u_deflection, _ = FORMULAS[partner]
        weight = value("density") * area * GRAVITY * span if request.self_weight else 0.0
        moment = (c_moment * request.load + u_moment * weight) * span
        deflection = (c_deflection * request.load + u_deflection * weight) * span**3 / (
            value("youngs_modulus") * float(props.second_moment_major))
        # Timoshenko: plus the shear deflection, with the material's own G and nu
        deflection += (SHEAR_DEFLECTION[request.load_case] * request.load
                       + SHEAR_DEFLECTION[partner] * weight) * span / (
            value("shear_modulus") * cowper_shear_area(design.family, design.dimensions,
                                                       value("poisson_ratio")))
        stress = moment / float(props.section_modulus_major)
        if request.max_deflection is not None:
            at_most("deflection", deflection, request.max_deflection)
        # both fibres carry M / Z: the tension side against the strength, the compression
        # side against the compressive strength where the data give one
        at_most("bending stress x SF", stress * factor, value("strength"))
        compressive = value("compressive_strength")
        if not math.isnan(compressive):
            at_most("bending stress x SF vs compressive strength", stress * factor,
                    compressive)
        # Peak transverse shear (shear coefficients: Roark table 8.1, from memory).
        shear_force = SHEAR[request.load_case] * request.load + SHEAR[partner] * weight
        # the peak shear stress: the exact flexure solution of solid sections and round
        # tubes at the material's own nu (Timoshenko & Goodier sec. 123-124, the section
        # library's flexure_shear, checked against their table and sectionproperties), the
        # elementary V S / (I t) of the thin-walled ones
        if design.family == "solid_rectangle":
            peak_area = flexure_shear.solid_rectangle_peak_shear_area(dims, value("poisson_ratio"))
        elif design.family == "solid_round":
            peak_area = flexure_shear.solid_round_peak_shear_area(dims, value("poisson_ratio"))
        elif design.family == "round_tube":
            peak_area = flexure_shear.round_tube_peak_shear_area(dims, value("poisson_ratio"))
        else:
            peak_area = family.shear_area(dims)
        transverse = shear_force / float(peak_area)
        at_most("transverse shear x SF", transverse * factor, shear_strength)
        if request.local_buckling:
            at_most("transverse shear x SF vs web buckling", transverse * factor,
                    float(buckling.shear))
        critical = float(buckling.bending)
        if design.family in BEARING_FAMILIES:
            # bearing of the webs and walls under the point load and at the supports
            forces, reactions = shorthand_forces(request.load_case, span, request.load, weight)
            at_most("bearing: F x SF / F_R", bearing_ratio(
                design.family, design.dimensions, material(table, row, basis),
                request.bearing_length, factor, forces, reactions), 1.0)
    if request.local_buckling:
        at_most("stress x SF vs local buckling", stress * factor, critical)
    if request.max_depth is not None:
        at_most("depth", float(family.overall_depth(dims)), request.max_depth)
    if request.max_width is not None:
        at_most("width", float(family.overall_width(dims)), request.max_width)
    if request.min_wall is not None and family.wall_dimensions:
        at_most("min_wall", request.min_wall, float(family.wall_thickness(dims)))
    if not math.isclose(design.mass, value("density") * area * span, rel_tol=1e-9):
        problems.append(f"mass {design.mass} is not rho A L")
    if not math.isclose(design.max_stress, stress, rel_tol=1e-9):
        problems.append(f"max_stress {design.max_stress} differs from {stress}")
    limits: dict[str, list[float]] = {}   # a round tube's diameter has both limits
    for name, limit in ((family.depth_dimension, request.max_depth),
                        (family.width_dimension, request.max_width)):
        if limit is not None:
            limits.setdefault(name, []).append(limit)
    for name, dimension in design.dimensions.items():
        if dimension in limits.get(name, []):
            continue  # at the envelope: the envelope's own size
        for limit in limits.get(name, []):
            if dimension >= limit - DIMENSION_RESOLUTION * (1 + 1e-6):
                problems.append(f"{name} {dimension!r} is within a rounding step of its "
                                f"envelope {limit!r} but not equal to it")
        steps = dimension / DIMENSION_RESOLUTION
        if abs(steps - round(steps)) > 1e-6:
            problems.append(f"{name} {dimension} is not a multiple of {DIMENSION_RESOLUTION} m")
        if dimension != round(dimension, 6):
            problems.append(f"{name} {dimension!r} carries binary noise beyond 0.001 mm")
    problems.extend(rule_problems(design))
    problems.extend(utilization_problems(design, request))
    problems += reported_problems(design, request)
    return problems


def reported_problems(design, request) -> list[str]:
    """The design as answers report it (mass, cost, carbon to 4 significant digits, the
    mechanics to 6; results.REPORTED_DIGITS): still within every limit. A utilization of at
    most 1 stays at most 1; a deflection or twist that meets its limit reads at most half a
    unit of its 6th digit above it."""
    reported = design.reported()
    problems = []
    if max(u for u in reported.utilization.values() if u is not None) > 1.0:
        problems.append(f"reported utilization {reported.utilization} above 1")
    for name, limit in (("deflection", request.max_deflection), ("twist", request.max_twist)):
        value = getattr(reported, name)
        if value is not None and limit is not None and value > limit * (1 + 5e-6):
            problems.append(f"reported {name} {value} above {limit}")
    for name, digits in (("mass", 4), ("cost", 4), ("carbon", 4), ("max_stress", 6)):
        value = getattr(reported, name)
        if float(f"{value:.{digits}g}") != value:
            problems.append(f"reported {name} {value!r} has more than {digits} digits")
        if not math.isclose(value, getattr(design, name), rel_tol=10.0 ** (1 - digits)):
            problems.append(f"reported {name} {value} is not {getattr(design, name)}")
    return problems


def rule_problems(design) -> list[str]:
    """Every proportion rule of the design's family kept (round-off aside)."""
    problems = []
    for (dimension, scale), (low, high) in PROPORTION_RULES.get(design.family, {}).items():
        ratio = design.dimensions[dimension] / design.dimensions[scale]
        if not low * (1 - 1e-9) <= ratio <= high * (1 + 1e-9):
            problems.append(f"{dimension}/{scale} = {ratio:.6g} outside [{low}, {high}]")
    return problems


def utilization_problems(design, request) -> list[str]:
    """The reported utilization: an entry for every check and limit, null exactly where the
    request does not ask for it, each <= 1, and ``governing`` the largest (a geometric limit
    first among entries within 0.1 % of it: the documented rule)."""
    family = FAMILIES[design.family]
    bending = request.max_twist is None and request.torque is None
    utilization = design.utilization
    requested = {
        "stiffness": (request.max_deflection if bending else request.max_twist) is not None,
        "strength": True,
        "local_buckling": request.local_buckling,
        # lateral-torsional buckling of an unbraced beam (the default) in a family that can
        # buckle laterally (Trahair, Flexural-Torsional Buckling of Structures, 1993, sec.
        # 3.8: none for I_minor = I_major, the round sections); its value is checked in
        # tests/properties/test_member_buckling_designs.py
        "member_buckling": bending and request.lateral_restraint != "continuous" and (
            design.family in ("i_section", "solid_rectangle", "rectangular_tube",
                              "sandwich_panel")),
        # a sandwich panel's width is max_width itself: only its depth is a limit
        "envelope": request.max_depth is not None or (
            request.max_width is not None and design.family != "sandwich_panel"),
        "min_wall": request.min_wall is not None and bool(family.wall_dimensions),
        "proportions": design.family in PROPORTION_RULES,
        # the material's process limits in this form (data/form_limits.csv): checked against
        # the data in tests/properties/test_manufacturing_limits.py; here only its place
        "manufacturing": utilization.get("manufacturing") is not None,
        # general-member checks (tests/properties/test_member_feasibility.py)
        "frequency": False,
        "fatigue": False,
        # I-sections and boxes in bending (its value: tests/properties/
        # test_interaction_designs.py)
        "interaction": bending and design.family in ("i_section", "rectangular_tube"),
        # webs and walls under point loads and at supports (null for solid sections)
        "bearing": bending and design.family in (*BEARING_FAMILIES, "sandwich_panel"),
    }
    problems = []
    if set(utilization) != set(requested):
        return [f"utilization keys {sorted(utilization)}"]
    for name, asked in requested.items():
        if asked != (utilization[name] is not None):
            problems.append(f"utilization {name} = {utilization[name]} (asked for: {asked})")
    given = {name: u for name, u in utilization.items() if u is not None}
    if max(given.values()) > 1.0:
        problems.append(f"reported utilization {utilization}")
    largest = max(given.values())
    if given[design.governing] < largest * (1 - 1e-3):
        problems.append(f"governing {design.governing} is not the largest of {given}")
    geometric = [n for n in ("envelope", "min_wall", "proportions", "manufacturing")
                 if given.get(n, 0) >= largest * (1 - 1e-3)]
    if geometric and design.governing != geometric[0]:
        problems.append(f"governing {design.governing}, expected {geometric[0]} of {given}")
    return problems


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(request=requests(), picks=st.lists(st.sampled_from(CANDIDATES), min_size=1, max_size=6,
                                          unique=True))
def test_every_design_meets_every_requirement(request, picks):
    materials = TABLE.take(picks)
    try:
        result = size_designs(request, materials)
    except InputError as error:
        # Refused only when a named hollow family cannot have its walls inside the envelope:
        # a wall must stay below half the smallest outside size it may reach.
        assert list(error.errors) == ["min_wall"], error.errors
        limits = [v for v in (request.max_depth, request.max_width) if v is not None]
        assert limits and 2 * request.min_wall >= min(limits) - 1e-12, error.errors
        return
    problems = {f"{d.material_id}/{d.family}": independent_check(d, request, materials)
                for d in result.designs}
    problems = {k: v for k, v in problems.items() if v}
    assert not problems, problems
    # sorted best first, and every material x family accounted for exactly once
    masses = [d.mass for d in result.designs]
    assert masses == sorted(masses)
    seen = [(d.material_id, d.family) for d in result.designs]
    seen += [(r.material_id, r.family) for r in result.rejected]
    assert len(seen) == len(set(seen)) == len(picks) * len(SOLID_AND_THIN)


with (Path(__file__).resolve().parents[2] / "data" / "core_directions.csv").open() as handle:
    HONEYCOMB_DIRECTIONS = {row["id"]: {name: float(value) for name, value in row.items()
                                        if name not in ("id", "source")}
                            for row in csv.DictReader(handle)}
"""Honeycomb core id -> its W (weak) and L (strong) shear modulus and strength, Pa."""

FACES = [i for i, forms in enumerate(TABLE.forms) if "sandwich_panel" in forms]
CORES = [i for i, family in enumerate(TABLE.families) if family == "foam"]


def sandwich_check(design, request, faces, cores) -> list[str]:
    """Classical sandwich beam theory written out (Allen 1969, Analysis and Design of
    Structural Sandwich Panels, ch. 2 and 8, from memory; shear deflection coefficients
    B_2 = 1, 2, 4, 8, 4, 8 for the six bending cases, Allen / Zenkert 1997, from memory)."""
    basis = request.property_basis

    def value(table, row, name):
        return float(table.values(name, basis)[row])

    f, k = design.material_index, design.core_material_index
    e_f, sigma_f, rho_f = (value(faces, f, n) for n in ("youngs_modulus", "strength", "density"))
    e_c, g_c, rho_c = (value(cores, k, n) for n in ("youngs_modulus", "shear_modulus",
                                                      "density"))
    tau_c = float(cores.shear_strength(basis)[k])
    directional = HONEYCOMB_DIRECTIONS.get(cores.ids[k])
    if directional is not None:
        # a honeycomb's W or L values (data/core_directions.csv), their low end (nominal
        # less 15 %, data/README.md "Cores") on a basis that takes the low end
        low = {"typical": (1.0, 1.0), "design": (1.0, 0.85), "conservative": (0.85, 0.85)}
        g_c = directional[f"shear_modulus_{request.core_direction}"] * low[basis][0]
        tau_c = directional[f"shear_strength_{request.core_direction}"] * low[basis][1]
    b, c, t = (design.dimensions[n] for n in ("width", "core_thickness", "face_thickness"))
    d, span, factor = c + t, request.span, request.safety_factor
    shear_b2 = {"cantilever_end_load": 1, "cantilever_uniform_load": 2,
                "simply_supported_center_load": 4, "simply_supported_uniform_load": 8,
                "fixed_fixed_center_load": 4, "fixed_fixed_uniform_load": 8}
    shear_c = {"cantilever_end_load": 1.0, "cantilever_uniform_load": 1.0}
    mass = (2 * rho_f * t + rho_c * c) * b * span
    weight = mass * GRAVITY if request.self_weight else 0.0
    c_moment, c_deflection, partner = FORMULAS[request.load_case]
    u_moment, u_deflection, _ = FORMULAS[partner]
    rigidity = e_f * b * (t * d**2 / 2 + t**3 / 6) + e_c * b * c**3 / 12
    stiffness = g_c * b * d**2 / c
    moment = (c_moment * request.load + u_moment * weight) * span
    shear = (shear_c.get(request.load_case, 0.5) * request.load
             + shear_c.get(partner, 0.5) * weight)
    deflection = ((c_deflection * request.load + u_deflection * weight) * span**3 / rigidity
                  + (request.load / shear_b2[request.load_case] + weight / shear_b2[partner])
                  * span / stiffness)
    face = moment * e_f * (c / 2 + t) / rigidity
    problems = []
    face_compressive = value(faces, f, "compressive_strength")   # the compressed face's
    checks = [("face stress x SF", face * factor, sigma_f),
              ("face stress x SF vs compressive strength", face * factor,
               math.inf if math.isnan(face_compressive) else face_compressive),
              ("core shear x SF", shear / (b * d) * factor, tau_c),
              ("width", b, request.max_width)]
    if request.max_deflection is not None:
        checks.append(("deflection", deflection, request.max_deflection))
    if request.local_buckling:
        wrinkling = 0.5 * (e_f * e_c * g_c) ** (1 / 3)
        checks.append(("wrinkling", moment * e_f * d / 2 / rigidity * factor, wrinkling))
    if request.max_depth is not None:
        checks.append(("depth", c + 2 * t, request.max_depth))
    if request.min_wall is not None:
        checks.append(("min_wall", request.min_wall, t))
    # core indentation under the point load and at the supports (Steeves & Fleck 2004, the
    # section library's sandwich_indentation): the compressed face's strength, the core's
    # compressive strength (its ``strength``)
    forces, reactions = shorthand_forces(request.load_case, span, request.load, weight)
    face_strength = sigma_f if math.isnan(face_compressive) else min(sigma_f, face_compressive)
    indentation = float(bearing.sandwich_indentation(
        design.dimensions, face_strength, value(cores, k, "strength"), request.bearing_length,
        bool(faces.brittle[f])))
    checks.append(("indentation F x SF", max([abs(p) for p, _ in forces] + reactions) * factor,
                   indentation))
    for name, actual, limit in checks:
        if actual > limit * (1 + 1e-9):
            problems.append(f"{name}: {actual:.6g} > {limit:.6g}")
    if not math.isclose(design.mass, mass, rel_tol=1e-9):
        problems.append(f"mass {design.mass} is not (2 rho_f t + rho_c c) b L = {mass}")
    problems.extend(rule_problems(design))
    problems.extend(utilization_problems(design, request))
    return problems


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(request=requests(), picks=st.lists(st.sampled_from(FACES), min_size=1, max_size=3,
                                          unique=True),
       core_picks=st.lists(st.sampled_from(CORES), min_size=1, max_size=3, unique=True),
       width=log_uniform(0.05, 1.0))
def test_every_sandwich_design_meets_every_requirement(request, picks, core_picks, width):
    assume(request.load_case != "torsion")
    request = dataclasses.replace(request, sections=("sandwich_panel",), max_width=width)
    faces, cores = TABLE.take(picks), TABLE.take(core_picks)
    try:
        result = size_designs(request, faces, cores)
    except InputError as error:
        # Refused only when two faces of min_wall leave no room for a core in max_depth.
        assert list(error.errors) == ["min_wall"], error.errors
        assert request.max_depth is not None, error.errors
        assert 2 * request.min_wall >= request.max_depth - 1e-12, error.errors
        return
    problems = {d.material_id: sandwich_check(d, request, faces, cores) for d in result.designs}
    problems = {k: v for k, v in problems.items() if v}
    assert not problems, problems
    assert len(result.designs) + len(result.rejected) == len(picks)
