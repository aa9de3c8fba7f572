"""A reference sizing by scipy.optimize SLSQP, one material and one family at a time.

It shares nothing with service.core.sizing but the section property functions (checked
against sectionproperties elsewhere; their orthotropic wall buckling and Timoshenko shear
areas against published solutions; the effective width and web stresses of the interaction
against EN 1993-1-5 and sectionproperties) and the handbook coefficients of service.core.loadcases:
every dimension is a free variable (in logarithms, scale-invariant), the objective is the mass
rho A L, and each requirement is a smooth inequality log(allowed / actual) >= 0. The geometry
conditions a real section needs are written out here per family. Several starts, each made
feasible first by bisection on a common scale factor, and the lightest converged result wins.
"""

from __future__ import annotations

import math

import numpy as np
from scipy.optimize import minimize

from service.core import loadcases
from service.core.sections import effective_width, web
from service.core.sections.base import Elastic
from service.core.sections.orthotropic import OrthotropicElastic
from service.core.sections.saint_venant import rectangle_torsion
from service.core.sections.shear_deformation import timoshenko_shear_deflection
from service.core.stability.buckling_curves import column_curve, lateral_torsional_curve
from service.core.stability.wall_compression import compression_buckling_stress
from tests.properties.bearing_check import bearing_ratio, shorthand_forces

# Lateral-torsional buckling, written out here: the three-factor formula for a doubly
# symmetric section (ENV 1993-1-1:1992 annex F eq. F.2; Timoshenko & Gere, Theory of Elastic
# Stability, 2nd ed. 1961, sec. 6.3-6.5, from memory) with (C1, C2, k = k_w) per case
# (NCCI SN003b table 3.2 for the simply supported cases; the conservative values checked
# against a finite element solution in test_critical_moment.py for the others), and the
# Perry-Robertson reduction solved by bisection. Families that can buckle laterally, and
# their warping constants (thin-walled I: t_f b^3 (h - t_f)^2 / 24; the rectangles 0), and the
# I-section's torsion constant as its three rectangles apart.
LTB_FACTORS = {
    "cantilever_end_load": (2.555, 1.0, 2.0),
    "cantilever_uniform_load": (4.090, 1.6, 2.0),
    "simply_supported_center_load": (1.348, 0.630, 1.0),
    "simply_supported_uniform_load": (1.127, 0.454, 1.0),
    "fixed_fixed_center_load": (1.565, 1.55, 1.0),
    "fixed_fixed_uniform_load": (2.575, 1.562, 1.0),
}
LATERAL_FAMILIES = ("i_section", "solid_rectangle", "rectangular_tube")


def _perry_robertson(slenderness, alpha, plateau):
    """chi: the smaller root of (1 - chi)(1 - chi l^2) = alpha (l - l0) chi, by bisection."""
    if slenderness <= plateau:
        return 1.0
    low, high = 0.0, min(1.0, 1.0 / slenderness**2)
    for _ in range(200):
        chi = 0.5 * (low + high)
        value = (1 - chi) * (1 - chi * slenderness**2) - alpha * (slenderness - plateau) * chi
        low, high = (chi, high) if value > 0 else (low, chi)
    return low


def lateral_torsional_ratio(family, dims, props, material, request, moment) -> float:
    """M SF / M_b of a member bent about its major axis (0 where it cannot buckle); with an
    axial force N, the beam-column interaction N/N_t (tension) or P/N_b (compression, about
    the weaker axis, N_b = chi A_eff f) + M / (1 - P/P_cr) / M_b (Timoshenko & Gere 1961
    sec. 1.11-1.13; the linear sum of EN 1993-1-1 6.2.1(7), from memory), P_cr in the plane
    of bending."""
    axial = (getattr(request, "axial_force", None) or 0.0) * request.safety_factor
    restrained = getattr(request, "lateral_restraint", "none") == "continuous"
    if not axial and (restrained or family.id not in LATERAL_FAMILIES or float(
            props.second_moment_minor) >= float(props.second_moment_major)):
        return 0.0
    factored = moment * request.safety_factor
    elastic = float(props.section_modulus_major) * material["compression_strength"]
    if restrained or family.id not in LATERAL_FAMILIES or float(
            props.second_moment_minor) >= float(props.second_moment_major):
        resistance = elastic
    else:
        resistance = min(_lateral_resistance(family, dims, props, material, request, case)
                         for case in _diagram_cases(request))
    squash = float(props.area) * material["compression_strength"]
    if axial >= 0:
        return axial / squash + factored / resistance
    compression = -axial
    length = EFFECTIVE_LENGTH[BENDING_SUPPORTS[request.load_case]] * request.span
    weaker = min(float(props.second_moment_major), float(props.second_moment_minor))
    column = _column_resistance(family, material, effective_area(
        family, dims, props, material, request) * material["compression_strength"],
        weaker, length)
    in_plane = (math.pi**2 * material["youngs_modulus"] * float(props.second_moment_major)
                / length**2)
    if compression >= in_plane:
        return math.inf
    return compression / column + factored / (1.0 - compression / in_plane) / resistance


BENDING_SUPPORTS = {
    "cantilever_end_load": "fixed_free", "cantilever_uniform_load": "fixed_free",
    "simply_supported_center_load": "pinned_pinned",
    "simply_supported_uniform_load": "pinned_pinned",
    "fixed_fixed_center_load": "fixed_fixed", "fixed_fixed_uniform_load": "fixed_fixed"}


def _diagram_cases(request):
    cases = [request.load_case]
    if request.self_weight:
        cases.append(loadcases.LOAD_CASES[request.load_case].self_weight_case)
    return cases


def _lateral_resistance(family, dims, props, material, request, case) -> float:
    """M_b = chi_LT Z f of one moment diagram's factors."""
    e, g = material["youngs_modulus"], material["shear_modulus"]
    minor, torsion = float(props.second_moment_minor), float(props.torsion_constant)
    depth = float(family.overall_depth(dims))
    warping = 0.0
    if family.id == "i_section":
        tf, b = float(dims["flange_thickness"]), float(dims["flange_width"])
        h, tw = float(dims["depth"]), float(dims["web_thickness"])
        warping = tf * b**3 * (h - tf) ** 2 / 24.0
        # I_t: the flanges and the web as separate Saint-Venant rectangles (a lower bound)
        torsion = float(2 * rectangle_torsion(b, tf)[0] + rectangle_torsion(h - 2 * tf, tw)[0])
    curve = lateral_torsional_curve(material.get("family", ""), family.id)
    elastic = float(props.section_modulus_major) * material["compression_strength"]
    c1, c2, k = LTB_FACTORS[case]
    height = c2 * depth / 2.0 if request.load_position == "top" else 0.0
    length = k * request.span
    critical = c1 * math.pi**2 * e * minor / length**2 * (
        math.sqrt(warping / minor + length**2 * g * torsion / (math.pi**2 * e * minor)
                  + height**2) - height)
    return _perry_robertson(math.sqrt(elastic / critical), curve.imperfection,
                            curve.plateau) * elastic

def wall_elastic(material: dict) -> Elastic | OrthotropicElastic:
    """The walls' elastic constants: orthotropic (fibres along the member) where the
    material has a transverse modulus, else isotropic."""
    if not math.isnan(material.get("transverse_modulus", math.nan)):
        return OrthotropicElastic(material["youngs_modulus"], material["transverse_modulus"],
                                  material["shear_modulus"], material["poisson_ratio"])
    return Elastic(material["youngs_modulus"], material["shear_modulus"],
                   material["poisson_ratio"])


# The geometry each family needs, as "margin >= 0" (from the family's geometry, common practice).
GEOMETRY = {
    "round_tube": lambda d: d["outer_diameter"] / 2.0 - d["wall"],
    "rectangular_tube": lambda d: min(d["depth"], d["width"]) / 2.0 - d["wall"],
    "i_section": lambda d: min(d["depth"] / 2.0 - d["flange_thickness"],
                               d["flange_width"] - d["web_thickness"]),
}


def bearing_modulus(material: dict) -> float:
    """E for the webs' bearing: E2 of an orthotropic material (the web's depth runs across
    the member), else E."""
    transverse = material.get("transverse_modulus", math.nan)
    return (material["youngs_modulus"] if math.isnan(transverse)
            else min(transverse, material["youngs_modulus"]))


def checks(family, dims: dict, material: dict, request) -> dict[str, float]:
    """Utilisations (<= 1 when met) of every requirement of ``request`` for scalar dims."""
    props = family.properties(dims)
    case = loadcases.LOAD_CASES[request.load_case]
    elastic = wall_elastic(material)
    buckling = family.local_buckling(dims, elastic)
    factor = request.safety_factor
    result = {}
    if case.loading in ("tension", "compression"):
        return _axial_checks(family, dims, props, elastic, material, request) | _envelope(
            family, dims, request)
    if case.loading == "bending":
        weight = (float(loadcases.self_weight_load(material["density"], props.area,
                                                   request.span))
                  if request.self_weight else 0.0)
        response = loadcases.bending_response(case, request.load, request.span,
                                              material["youngs_modulus"],
                                              props.second_moment_major, weight)
        stress = float(response.moment / props.section_modulus_major)
        if request.max_deflection is not None:
            # bending plus the Timoshenko shear deflection of the case and the self-weight
            deflection = float(response.deflection) + sum(float(timoshenko_shear_deflection(
                each, load, request.span, family.id, dims, material["shear_modulus"],
                material["poisson_ratio"])) for each, load in ((case, request.load),
                                                               (case.uniform, weight)))
            compression = -min(getattr(request, "axial_force", None) or 0.0, 0.0)
            if compression:   # amplified, 1 / (1 - P / P_cr) in the plane of bending
                length = EFFECTIVE_LENGTH[BENDING_SUPPORTS[request.load_case]] * request.span
                in_plane = (math.pi**2 * material["youngs_modulus"]
                            * float(props.second_moment_major) / length**2)
                deflection = (deflection / (1.0 - compression / in_plane)
                              if compression < in_plane else math.inf)
            result["stiffness"] = deflection / request.max_deflection
        # the compressed fibre against the compressive strength where it is lower
        result["strength"] = stress * factor / material["compression_strength"]
        if (getattr(request, "lateral_restraint", "none") == "none"
                or getattr(request, "axial_force", None)):
            result["member_buckling"] = lateral_torsional_ratio(
                family, dims, props, material, request, float(response.moment))
        # Transverse shear at the neutral axis, against strength / sqrt 3 (von Mises) unless
        # the material gives its own shear strength; and web shear buckling.
        shear = float(response.shear / family.shear_area(dims))
        shear_strength = material.get("shear_strength") or material["strength"] / math.sqrt(3.0)
        result["shear"] = shear * factor / shear_strength
        if request.local_buckling and math.isfinite(float(buckling.shear)):
            result["shear_buckling"] = shear * factor / float(buckling.shear)
        critical = float(buckling.bending)
        if family.id in INTERACTION_FAMILIES:
            result |= interaction_ratios(family, dims, props, buckling, elastic, material,
                                         request, float(response.moment),
                                         float(response.shear))
        if family.id in ("i_section", "rectangular_tube", "round_tube"):
            # bearing of webs and walls under the point load and at the supports
            # (tests/properties/bearing_check.py: the section library's resistances, the
            # forces from Roark's reactions)
            forces, reactions = shorthand_forces(request.load_case, request.span,
                                                 request.load, weight)
            result["bearing"] = bearing_ratio(
                family.id, dims, {"youngs": bearing_modulus(material),
                                  "strength": material["compression_strength"]
                                  * bearing_modulus(material) / material["youngs_modulus"],
                                  "brittle": material.get("brittle", False)},
                getattr(request, "bearing_length", 0.0), factor, forces, reactions)
    else:
        stress = float(loadcases.torsion_stress(request.torque, props.torsion_modulus))
        angle = float(loadcases.twist(request.torque, request.span, material["shear_modulus"],
                                      props.torsion_constant))
        if request.max_twist is not None:
            result["stiffness"] = angle / request.max_twist
        result["strength"] = stress * factor / (material["strength"] / math.sqrt(3.0))
        critical = float(buckling.torsion)
    if request.local_buckling and math.isfinite(critical):
        result["local_buckling"] = stress * factor / critical
    return result | _envelope(family, dims, request)


INTERACTION_FAMILIES = ("i_section", "rectangular_tube")


def interaction_ratios(family, dims, props, buckling, elastic, material, request, moment,
                       shear) -> dict[str, float]:
    """The interaction of buckling, bending and shear, three smooth parts, the peak moment
    taken with the peak shear (issue 19), each written out with the section library's
    effective width and web stresses:

    - effective width (EN 1993-1-5:2006 sec. 4.4, Winter; ductile isotropic materials only):
      SF (N_c / A_eff + N_t / A + M / W_eff) / f (EN 1993-1-1 6.2.9.3 eq. 6.44, e_N = 0;
      A_eff of the walls in uniform compression, EN 1993-1-5 4.3(3));
    - web bending with shear buckling, the circular interaction (Timoshenko & Gere, Theory
      of Elastic Stability, 1961, sec. 9.9, from memory), as its square root, an axial
      compression added linearly to the bending term (Bulson 1970, from memory);
    - von Mises (or, brittle, the largest principal stress) at the web-flange junction.
    """
    factor = request.safety_factor
    strength = material["compression_strength"]
    area = float(props.area)
    axial = (getattr(request, "axial_force", None) or 0.0) / area
    normal, tangential = web.junction_stresses(family.id, dims, moment, shear)
    normal = abs(axial) + float(normal)
    brittle = material.get("brittle", False)
    equivalent = float(web.max_principal(normal, tangential) if brittle
                       else web.von_mises(normal, tangential))
    result = {"junction": factor * equivalent / strength}
    if not request.local_buckling:
        return result
    if not brittle and math.isnan(material["transverse_modulus"]):
        effective = getattr(effective_width, family.id)(
            dims, material["youngs_modulus"], material["poisson_ratio"], strength)
        normal = (-axial * area / float(getattr(effective_width, family.id + "_area")(
            dims, material["youngs_modulus"], material["poisson_ratio"], strength).area)
            if axial < 0 else axial)
        result["effective_width"] = factor * (normal + moment / float(
            effective.section_modulus)) / strength
    bending = moment / float(props.section_modulus_major) / float(buckling.bending_modes[1])
    if axial < 0:
        bending -= axial / float(compression_buckling_stress(family, dims, elastic))
    result["web_buckling"] = math.sqrt(float(web.bending_shear_buckling_interaction(
        factor * bending, 1.0, factor * shear / float(family.shear_area(dims)),
        float(buckling.shear))))
    return result


def _envelope(family, dims, request) -> dict[str, float]:
    """min_wall, then the envelope last (the start-point search relies on this order)."""
    result = {}
    if request.min_wall is not None and family.wall_dimensions:
        result["min_wall"] = request.min_wall / float(family.wall_thickness(dims))
    if request.max_depth is not None:
        result["max_depth"] = float(family.overall_depth(dims)) / request.max_depth
    if request.max_width is not None:
        result["max_width"] = float(family.overall_width(dims)) / request.max_width
    return result


# Effective length factors, AISC 360-16 Commentary table C-A-7.1, recommended design values
# (from memory), and the Euler load about the weaker axis reduced by the Perry-Robertson
# column curve of the material family (EN 1993-1-1 6.3.1.2, from memory).
EFFECTIVE_LENGTH = {"pinned_pinned": 1.0, "fixed_free": 2.1, "fixed_pinned": 0.80,
                    "fixed_fixed": 0.65}


def _axial_checks(family, dims, props, elastic, material, request) -> dict[str, float]:
    """A tie: P SF / (A f) and the extension P L / (E A); a column: the squash load, the
    walls' local buckling in uniform compression and flexural buckling about the weaker
    axis."""
    area, load, factor = float(props.area), request.load, request.safety_factor
    tie = request.load_case == "tie"
    strength = material["strength"] if tie else material["compression_strength"]
    result = {"strength": load * factor / (area * strength)}
    if request.load_case == "tie":
        if request.max_extension is not None:
            result["stiffness"] = load * request.span / (
                material["youngs_modulus"] * area) / request.max_extension
        return result
    effective = effective_area(family, dims, props, material, request)
    if request.local_buckling:
        critical = float(compression_buckling_stress(family, dims, elastic))
        if math.isfinite(critical):
            result["local_buckling"] = load * factor / (area * critical)
        if _effective_width_applies(family, material):
            # a class 4 column's cross-section: N SF / (A_eff f) (EN 1993-1-1 6.2.4 eq. 6.11)
            result["effective_width"] = load * factor / (effective * strength)
    # flexural buckling about each axis apart (two smooth constraints where the weaker axis
    # changes), chi A_eff f (EN 1993-1-1 6.3.1.1 eq. 6.48, 6.3.1.2 eq. 6.50, class 4)
    for axis, second_moment in (("major", props.second_moment_major),
                                ("minor", props.second_moment_minor)):
        result["member_buckling_" + axis] = load * factor / _column_resistance(
            family, material, effective * strength, float(second_moment),
            EFFECTIVE_LENGTH[request.end_conditions] * request.span)
    return result


def _effective_width_applies(family, material: dict) -> bool:
    """Winter's effective width for ductile, in-plane isotropic I-sections and boxes."""
    return (family.id in INTERACTION_FAMILIES and not material.get("brittle", False)
            and math.isnan(material.get("transverse_modulus", math.nan)))


def effective_area(family, dims, props, material: dict, request) -> float:
    """A_eff of the walls in uniform compression (EN 1993-1-5 4.3(3), 4.4, by the section
    library) where Winter's effective width applies and local buckling is checked, else A."""
    if not (request.local_buckling and _effective_width_applies(family, material)):
        return float(props.area)
    return float(getattr(effective_width, family.id + "_area")(
        dims, material["youngs_modulus"], material["poisson_ratio"],
        material["compression_strength"]).area)


def _column_resistance(family, material: dict, squash: float, second_moment: float,
                       length: float) -> float:
    """chi N_pl: the Euler load pi^2 E I / (K L)^2 reduced by the Perry-Robertson column
    curve of the material family (EN 1993-1-1 6.3.1.2, from memory)."""
    euler = math.pi**2 * material["youngs_modulus"] * second_moment / length**2
    curve = column_curve(material.get("family", ""), family.id)
    return _perry_robertson(math.sqrt(squash / euler), curve.imperfection,
                            curve.plateau) * squash


def slsqp_size(family, material: dict, request, starts: int = 4, seed: int = 0):
    """Lightest design found by multi-start SLSQP: ``(mass, dims)``, or None if none found."""
    names = [family.scale_dimension] + [b.dimension for b in family.ratio_bounds]
    rng = np.random.default_rng(seed)
    geometry = GEOMETRY.get(family.id, lambda d: d[family.scale_dimension])

    def dims_of(x):
        scale = math.exp(x[0])
        return {family.scale_dimension: np.asarray(scale),
                **{name: np.asarray(scale * math.exp(r)) for name, r in zip(names[1:], x[1:],
                                                                              strict=True)}}

    def mass(x):
        return float(material["density"] * family.properties(dims_of(x)).area * request.span)

    def constraints(x):
        dims = dims_of(x)
        margins = [-math.log(max(u, 1e-300)) for u in checks(family, dims, material,
                                                           request).values()]
        margins.append(geometry({k: float(v) for k, v in dims.items()}) / float(
            dims[family.scale_dimension]))
        return np.array(margins)

    log_bounds = [(math.log(b.low), math.log(b.high)) for b in family.ratio_bounds]
    upper_count = (request.max_depth is not None) + (request.max_width is not None)
    best = None
    for _ in range(starts):
        ratios = [rng.uniform(lo + 0.05 * (hi - lo), hi - 0.05 * (hi - lo))
                  for lo, hi in log_bounds]
        x0 = _feasible_start(ratios, constraints, upper_count)
        if x0 is None:
            continue
        reference_mass = mass(x0)
        result = minimize(
            lambda x, reference=reference_mass: mass(x) / reference, x0, method="SLSQP",
            bounds=[(-12.0, 3.0)] + log_bounds,
            constraints=[{"type": "ineq", "fun": constraints}],
            options={"ftol": 1e-10, "maxiter": 300},
        )
        if np.all(constraints(result.x) >= -1e-7):
            candidate = (mass(result.x), {k: float(v) for k, v in dims_of(result.x).items()})
            if best is None or candidate[0] < best[0]:
                best = candidate
    return best


def _feasible_start(ratios, constraints, upper_count):
    """log-scale meeting every requirement at these ratios, or None if the envelope forbids.

    The requirement margins grow with the scale and the envelope margins (the last
    ``upper_count`` before the geometry margin) shrink, so bisection on the first finds the
    smallest admissible scale and the second only has to be checked there.
    """
    low, high = -12.0, 3.0

    def margins(log_scale):
        with np.errstate(all="ignore"):
            return constraints(np.array([log_scale, *ratios]))

    def requirements_met(log_scale):
        values = margins(log_scale)
        keep = np.ones(values.size, dtype=bool)
        keep[values.size - 1 - upper_count: values.size - 1] = False
        return bool(np.all(values[keep] >= 0))

    if not requirements_met(high):
        return None
    for _ in range(60):
        middle = 0.5 * (low + high)
        low, high = (low, middle) if requirements_met(middle) else (middle, high)
    if not np.all(margins(high) >= 0):
        return None
    return np.array([high, *ratios])
