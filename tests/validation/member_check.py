"""Member buckling of a sized design recomputed outside the sizing engine.

The elastic critical moment comes from the finite element solution of the buckling energy
equation (``ltb_reference``: no C1, C2 or three-factor formula), for the design's own moment
diagram (the load case plus, with self-weight, the uniform load on the same supports, as one
diagram); the reduction from the Perry-Robertson equation solved by brentq
(``ltb_reference.perry_robertson``). Section constants: I_z, I_t and Z from the family's
property functions (compared with sectionproperties in test_sections_reference.py), and
I_w = t_f b^3 (h - t_f)^2 / 24 for the I-section (Timoshenko & Gere, Theory of Elastic
Stability, 2nd ed. 1961, sec. 5.5, from memory), 0 for the rectangles (conservative: it
only lowers M_cr). Only the buckling curve (alpha_LT, lambda_0) is read from the project: it is
a choice of standard, not physics.
"""

from __future__ import annotations

import math

import numpy as np

from service.core.loadcases import LOAD_CASES, STANDARD_GRAVITY
from service.core.sections import FAMILIES
from service.core.stability.buckling_curves import lateral_torsional_curve
from tests.validation.ltb_reference import CASES, critical_load_factor, perry_robertson

FE_TOLERANCE = 1e-2
"""The three-factor formula may exceed the finite element M_cr by up to 1 % (its factors
have three figures, the FE converges from above; test_critical_moment.py)."""


def effective_area(family_id: str, dims: dict, youngs: float, poisson: float,
                   strength: float) -> float | None:
    """A_eff of an I-section or a box in uniform compression, written out here from
    EN 1993-1-5:2006 4.4 (from memory): each wall's clear width c (the I's outstands
    (b - t_w) / 2 and web h - 2 t_f, the box's walls b - 2t and h - 2t), sigma_cr = k pi^2 E
    / (12 (1 - nu^2)) (t / c)^2 with k 4.0 internal and 0.43 outstand (tables 4.1 and 4.2,
    psi = 1), lambda_p = sqrt(f / sigma_cr), rho = 1 up to 0.673 (internal) or 0.748
    (outstand), else (lambda_p - 0.22) / lambda_p^2 or (lambda_p - 0.188) / lambda_p^2
    (eq. 4.2, 4.3), at most 1; None for another family."""
    plate = math.pi**2 * youngs / (12.0 * (1.0 - poisson**2))

    def kept(width, thickness, outstand):     # rho c, the width that carries stress
        k, limit, offset = (0.43, 0.748, 0.188) if outstand else (4.0, 0.673, 0.22)
        slenderness = math.sqrt(strength / (k * plate * (thickness / width) ** 2))
        rho = 1.0 if slenderness <= limit else min(1.0, (slenderness - offset)
                                                   / slenderness**2)
        return rho * width

    d = {name: float(value) for name, value in dims.items()}
    if family_id == "i_section":
        tf, tw = d["flange_thickness"], d["web_thickness"]
        outstand, web = 0.5 * (d["flange_width"] - tw), d["depth"] - 2.0 * tf
        return 2.0 * tf * (tw + 2.0 * kept(outstand, tf, True)) + kept(web, tw, False) * tw
    if family_id == "rectangular_tube":
        t = d["wall"]
        return 2.0 * t * (2.0 * t + kept(d["width"] - 2.0 * t, t, False)
                          + kept(d["depth"] - 2.0 * t, t, False))
    return None


def squash_area(design, request, values: dict) -> float:
    """The area of a compressed design's squash load: A_eff (:func:`effective_area`) where
    the effective width applies (local buckling checked, a ductile in-plane isotropic
    material: ``values`` "brittle" and "orthotropic" false), else the gross A (EN 1993-1-1
    6.3.1.1 eq. 6.48: A f for classes 1-3, A_eff f for class 4)."""
    dims = {k: np.asarray(v) for k, v in design.dimensions.items()}
    area = float(FAMILIES[design.family].properties(dims).area)
    if not request.local_buckling or values.get("brittle") or values.get("orthotropic"):
        return area
    effective = effective_area(design.family, dims, values["youngs_modulus"],
                               values["poisson_ratio"], values["compression_strength"])
    return area if effective is None else effective


def column_resistance(design, values: dict, squash_area: float, length: float) -> float:
    """N_b = chi A f (A the squash area) about the weaker axis: the Euler load pi^2 E I_min /
    (K L)^2 and the Perry-Robertson equation (``ltb_reference.perry_robertson``) with the
    material family's column curve (f the compressive strength)."""
    from service.core.stability.buckling_curves import column_curve

    props = FAMILIES[design.family].properties(
        {k: np.asarray(v) for k, v in design.dimensions.items()})
    weaker = min(float(props.second_moment_major), float(props.second_moment_minor))
    euler = math.pi**2 * values["youngs_modulus"] * weaker / length**2
    squash = squash_area * values["compression_strength"]
    curve = column_curve(values["family"], design.family)
    return perry_robertson(math.sqrt(squash / euler), curve.imperfection,
                           curve.plateau) * squash


def beam_column_ratio(design, request, values: dict, end_length_factor: float) -> float:
    """The beam-column interaction of a bending design with ``request.axial_force``:
    N SF / (A f) (tension) or P SF / N_b (compression, :func:`column_resistance` on the
    effective length ``end_length_factor`` L with the squash area of :func:`squash_area`),
    plus M SF / (1 - P SF / P_cr) / M_b with P_cr the Euler load in the plane of bending
    (Timoshenko & Gere 1961 sec. 1.11-1.13; linear sum, EN 1993-1-1 6.2.1(7), from memory);
    M_b as in :func:`member_moment_and_resistance` (Z f when restrained continuously)."""
    family = FAMILIES[design.family]
    props = family.properties({k: np.asarray(v) for k, v in design.dimensions.items()})
    moment, resistance = member_moment_and_resistance(design, request, values)
    if request.lateral_restraint == "continuous":
        resistance = float(props.section_modulus_major) * values["strength"]
    axial = request.axial_force * request.safety_factor
    squash = float(props.area) * values["strength"]
    if axial >= 0:
        return axial / squash + moment / resistance
    length = end_length_factor * request.span
    column = column_resistance(design, values, squash_area(design, request, values), length)
    in_plane = (math.pi**2 * values["youngs_modulus"] * float(props.second_moment_major)
                / length**2)
    if -axial >= in_plane:
        return math.inf
    return -axial / column + moment / (1.0 + axial / in_plane) / resistance


def member_moment_and_resistance(design, request, values: dict) -> tuple[float, float]:
    """(factored peak moment M SF, buckling resistance M_b) of a bending design, N m.

    ``values``: density, youngs_modulus, shear_modulus, strength and family of its material.
    M_b = Z f where the section cannot buckle laterally (I_z >= I_y).
    """
    family = FAMILIES[design.family]
    dims = {k: np.asarray(v) for k, v in design.dimensions.items()}
    props = family.properties(dims)
    span = request.span
    weight = (values["density"] * float(props.area) * STANDARD_GRAVITY * span
              if request.self_weight else 0.0)
    case = LOAD_CASES[request.load_case]
    uniform = case.uniform
    moment = (case.moment_coefficient * request.load + uniform.moment_coefficient * weight) * span
    elastic = float(props.section_modulus_major) * values["strength"]
    minor, major = float(props.second_moment_minor), float(props.second_moment_major)
    if minor >= major:
        return moment * request.safety_factor, elastic
    warping = 0.0
    if design.family == "i_section":
        tf, b, h = (design.dimensions[n] for n in ("flange_thickness", "flange_width", "depth"))
        warping = tf * b**3 * (h - tf) ** 2 / 24.0
    supports, shape, points, q = CASES[request.load_case]
    _, uniform_shape, uniform_points, uniform_q = CASES[uniform.id]
    load = request.load
    height = 0.5 * float(family.overall_depth(dims)) if request.load_position == "top" else 0.0
    factor = critical_load_factor(
        span=span, lateral_stiffness=values["youngs_modulus"] * minor,
        torsion_stiffness=values["shear_modulus"] * float(props.torsion_constant),
        warping_stiffness=values["youngs_modulus"] * warping,
        moment=lambda x: load * shape(x, span) + weight * uniform_shape(x, span),
        supports=supports,
        point_loads=[(x, load * w) for x, w in points(span)]
        + [(x, weight * w) for x, w in uniform_points(span)],
        distributed_load=(load * q + weight * uniform_q) / span, load_height=height)
    critical = factor * moment
    curve = lateral_torsional_curve(values["family"], design.family)
    chi = perry_robertson(math.sqrt(elastic / critical), curve.imperfection, curve.plateau)
    return moment * request.safety_factor, chi * elastic
