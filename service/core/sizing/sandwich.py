"""Sizing of sandwich panels: face material x core material x face/core ratio, at once.

A panel's width is not scaled but set to the envelope's max_width, so the self-similar closed
forms of :mod:`service.core.sizing.scale` do not apply: at a fixed ratio r = t / c the
bending stiffness grows like c^3, the shear stiffness like c, the face stress falls like c^-2
and the core shear stress like c^-1, and self-weight adds terms that do not fall at all.
Every check is still monotone in c, so the smallest core thickness for each (face, core,
ratio) element is found by a vectorised bisection in log c on the exact classical sandwich
formulas (:mod:`service.core.sections.sandwich`: Allen 1969; Zenkert 1995):

- deflection c_D P L^3 / D + c_S P L / S <= max_deflection (bending plus core shear),
- face stress x SF <= face strength (the compressed face's where lower), and x SF <= the
  face wrinkling stress,
- core shear stress V / (b d) x SF <= core shear strength,
- face_thickness >= min_wall, overall depth c + 2t <= max_depth,
- lateral-torsional buckling of the panel (:func:`panel_member_buckling`), unless the
  request restrains it continuously: the usual wide panel (width above about 1.7 times its
  depth) has I_minor >= I_major and cannot buckle laterally at all, a narrow deep one can.

The ratio is searched on a log grid and refined like any one-ratio family; for each face
material the core and ratio with the lowest objective (mass, or cost and carbon of faces plus
core) is the design, which is then rounded and rechecked as every other design.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.search import RatioBox, zoom
from service.core.sections.sandwich import (
    core_shear_stress,
    face_stress,
    flexural_rigidity,
    shear_stiffness,
)
from service.core.sizing.checks.member_buckling import (
    applies,
    has_axial_force,
    member_material,
    moment_ratio,
)
from service.core.sizing.demand import Demand
from service.core.sizing.limits import design_utilization, governing, within_rules
from service.core.sizing.manufacturing import made_fits
from service.core.sizing.proportions import (
    FIRST_GRID_POINTS,
    REFINE_ROUNDS,
    STENCIL_POINTS,
)
from service.core.sizing.recheck import Evaluation
from service.core.sizing.request import STEPS_PER_METRE
from service.core.sizing.results import Design, Reason, Rejection
from service.core.sizing.values import MaterialValues
from service.core.stability.lateral_properties import LateralTorsionalProperties
from service.core.stability.member import MemberSection

if TYPE_CHECKING:
    from service.core.materials import MaterialTable
    from service.core.sections.base import SectionFamily

SANDWICH_FAMILY = "sandwich_panel"

BISECTION_STEPS = 48
"""Halvings of the log(core thickness) bracket: 2^-48 of ln(1e6) is far below 0.001 mm."""

CORE_BRACKET = (1e-5, 10.0)
"""m: the core thicknesses searched (0.01 mm to 10 m)."""


def evaluate_sandwich(family: SectionFamily, dims: dict, face: MaterialValues,
                      core: MaterialValues, demand: Demand, objective: str) -> tuple[
                          Evaluation, np.ndarray]:
    """Every check of panels ``dims`` (arrays broadcasting with the face and core values).

    Returns the evaluation (mass of faces plus core, kg) and the objective value.
    """
    width = np.asarray(dims["width"], dtype=float)
    core_thickness = np.asarray(dims["core_thickness"], dtype=float)
    face_thickness = np.asarray(dims["face_thickness"], dtype=float)
    span = demand.span
    face_mass = face.density * 2.0 * width * face_thickness * span
    core_mass = core.density * width * core_thickness * span
    weight = (face_mass + core_mass) * STANDARD_GRAVITY if demand.self_weight else 0.0
    case = demand.case
    uniform = case.uniform
    load = demand.action
    moment = (case.moment_coefficient * load + uniform.moment_coefficient * weight) * span
    shear = case.shear_coefficient * load + uniform.shear_coefficient * weight
    rigidity = flexural_rigidity(dims, face.youngs_modulus, core.youngs_modulus)
    deflection = (
        (case.deflection_coefficient * load + uniform.deflection_coefficient * weight)
        * span**3 / rigidity
        + (case.shear_deflection_coefficient * load
           + uniform.shear_deflection_coefficient * weight)
        * span / shear_stiffness(dims, core.shear_modulus)
    )
    stress = face_stress(moment, dims, face.youngs_modulus, core.youngs_modulus)
    factor = demand.safety_factor
    wrinkling = family.local_buckling(dims, face.elastic(), core.elastic()).bending
    strength = np.maximum(stress * factor / face.compression_strength,
                          core_shear_stress(shear, dims) * factor / core.shear_strength)
    local = stress * factor / wrinkling if demand.local_buckling else np.zeros_like(stress)
    member = (panel_member_buckling(family, dims, face, core, demand, moment, stress)
              if applies(demand) else np.zeros_like(stress))
    shape = np.broadcast_shapes(np.shape(stress), np.shape(deflection), np.shape(strength),
                                np.shape(member))
    utilization = {
        "stiffness": np.broadcast_to(deflection / demand.stiffness_limit, shape),
        "strength": np.broadcast_to(strength, shape),
        "local_buckling": np.broadcast_to(local, shape),
        "member_buckling": np.broadcast_to(member, shape),
        # sandwich panels take the shorthand cases only (no frequency or fatigue asked)
        "frequency": np.zeros(shape),
        "fatigue": np.zeros(shape),
    }
    fits = (
        (family.overall_depth(dims) <= demand.max_depth * (1.0 + 1e-9))
        & (width <= demand.max_width * (1.0 + 1e-9))
        & (face_thickness >= demand.min_wall * (1.0 - 1e-9))
        & family.holds(dims)
        & made_fits(family, dims, demand)
        & within_rules(family, dims)
    )
    feasible = np.broadcast_to(fits, shape) & np.logical_and.reduce(
        [u <= 1.0 for u in utilization.values()])
    mass = np.broadcast_to(face_mass + core_mass, shape)
    if objective == "mass":
        value = mass
    else:
        own = "price" if objective == "cost" else "embodied_carbon"
        value = np.broadcast_to(getattr(face, own) * face_mass + getattr(core, own) * core_mass,
                                shape)
    evaluation = Evaluation(mass, np.broadcast_to(deflection, shape), np.full(shape, np.nan),
                            np.broadcast_to(stress, shape), utilization, np.broadcast_to(
                                fits, shape), feasible, np.full(shape, np.nan))
    return evaluation, value


def panel_member_buckling(family: SectionFamily, dims: dict, face: MaterialValues,
                          core: MaterialValues, demand: Demand, moment, stress
                          ) -> np.ndarray:
    """M SF / M_b of panels: lateral-torsional buckling on the faces alone (``moment``, N m,
    and the peak face ``stress`` it causes, Pa, unfactored).

    The faces are taken as the flanges of an I-section without a web (the core adds
    torsional and lateral stiffness through its shear, which is left out: conservative):
    I_minor = t b^3 / 6, I_t = the two b x t strips (exact Saint-Venant rectangles), and
    I_w = t b^3 (c + t)^2 / 24, the doubly symmetric flange value of
    ``stability.lateral_properties`` with h_s = c + t between the face mid-planes. The
    elastic moment resistance is the moment at which the peak face stress reaches the face
    strength (:func:`face_stress`), reduced by the face material's lateral-torsional curve as
    for every other family (``checks.member_buckling``). A panel with I_minor >= I_major
    cannot buckle laterally (``stability.lateral_properties``), so its ratio is the bending
    part of the strength check.
    """
    width, core_thickness, face_thickness = family.arrays(dims)
    depth = core_thickness + 2.0 * face_thickness
    # I_minor < I_major (the properties' formulas), cheaply, before the torsion constants
    susceptible = face_thickness * width**2 / 6.0 < (depth**3 - core_thickness**3) / 12.0
    if not np.any(susceptible):      # M_b = the elastic moment resistance
        return stress * demand.safety_factor / face.compression_strength
    with np.errstate(divide="ignore", invalid="ignore"):
        modulus = 1.0 / face_stress(1.0, dims, face.youngs_modulus, core.youngs_modulus)
    props = family.properties(dims)
    warping = face_thickness * width**3 * (core_thickness + face_thickness) ** 2 / 24.0
    section = MemberSection(
        props.area, props.second_moment_major, modulus,
        LateralTorsionalProperties(
            minor_second_moment=props.second_moment_minor,
            torsion_constant=props.torsion_constant,
            warping_constant=warping,
            top_load_height=0.5 * depth,
            susceptible=props.second_moment_minor < props.second_moment_major))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        return moment_ratio(section, member_material(face, family.id), demand,
                            np.asarray(moment) * demand.safety_factor)


def _requirements_met(evaluation: Evaluation) -> np.ndarray:
    return np.logical_and.reduce([u <= 1.0 for u in evaluation.utilization.values()])


def _smallest_core(family, ratio, width, face, core, demand, objective):
    """Smallest core thickness meeting every check but the envelope, per element, by
    bisection in log c; NaN where even the largest fails (self-weight that never falls)."""
    low = np.full(np.broadcast_shapes(np.shape(ratio), np.shape(face.density),
                                      np.shape(core.density)), math.log(CORE_BRACKET[0]))
    high = np.full_like(low, math.log(CORE_BRACKET[1]))

    def met(log_core):
        thickness = np.exp(log_core)
        dims = {"width": width, "core_thickness": thickness, "face_thickness": ratio * thickness}
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            evaluation, _ = evaluate_sandwich(family, dims, face, core, demand, objective)
        return _requirements_met(evaluation)

    possible = met(high)
    for _ in range(BISECTION_STEPS):
        middle = 0.5 * (low + high)
        good = met(middle)
        high = np.where(good, middle, high)
        low = np.where(good, low, middle)
    thickness = np.exp(high)
    # min_wall sets a floor under the face, hence under the core at this ratio; the
    # thinnest panel made (min_size, c + 2 t) another
    thickness = np.maximum(np.maximum(thickness, demand.min_wall / ratio),
                           demand.min_size / (1.0 + 2.0 * ratio))
    return np.where(possible, thickness, np.nan)


def _objective_at(family, ratio, width, face, core, demand, objective):
    """(objective, core thickness, feasible) at each ratio element."""
    thickness = _smallest_core(family, ratio, width, face, core, demand, objective)
    dims = {"width": width, "core_thickness": thickness, "face_thickness": ratio * thickness}
    with np.errstate(invalid="ignore"):
        evaluation, value = evaluate_sandwich(family, dims, face, core, demand, objective)
    feasible = evaluation.feasible & np.isfinite(thickness)
    return np.where(feasible, value, np.inf), thickness, feasible


def size_sandwich(family: SectionFamily, indices: np.ndarray, values: MaterialValues,
                  table: MaterialTable, cores: MaterialTable, demand: Demand, objective: str,
                  basis: str) -> tuple[list[Design], list[Rejection]]:
    """The best (core, proportions) panel of every face material ``indices``."""
    if has_axial_force(demand):
        return [], [Rejection(int(i), table.ids[i], family.id,
                              "a sandwich panel under an axial force (a beam-column) is not "
                              "modelled") for i in indices]
    if not math.isfinite(demand.max_width):
        return [], [Rejection(int(i), table.ids[i], family.id,
                              "a sandwich panel needs envelope max_width (its width)")
                    for i in indices]
    if not len(cores):
        return [], [Rejection(int(i), table.ids[i], family.id, "no core material to use")
                    for i in indices]
    face = values.take(indices)
    # a demand's per-material fields are (M, 1) (manufacturing limits): (M, 1, 1) against
    # (faces, cores, ratios), (M, 1) against (faces, roundings), one float per face row
    rounding = demand
    demand = demand._map(lambda value: np.reshape(value, (-1, 1, 1)))
    core = MaterialValues.from_table(cores, basis)
    faces3 = face.map(lambda v: v[:, None, None])
    cores3 = core.map(lambda v: v[None, :, None])
    width = float(demand.max_width)   # the panel is as wide as the envelope, exactly
    box = RatioBox.of(family.ratio_bounds)                               # one ratio: t / c
    grid = box.grid(FIRST_GRID_POINTS[1])
    value, _, _ = _objective_at(family, np.exp(grid[:, 0]), width, faces3, cores3, demand,
                                objective)
    center = grid[np.argmin(value, axis=-1)]                             # (M, C, 1)

    def pick(candidates: np.ndarray) -> np.ndarray:
        value, _, _ = _objective_at(family, np.exp(candidates[..., 0]), width, faces3, cores3,
                                    demand, objective)
        best = np.argmin(value, axis=-1)
        return np.take_along_axis(candidates, best[..., None, None], axis=-2)[..., 0, :]

    center = zoom(box, center, box.spacing(FIRST_GRID_POINTS[1]), pick, points=STENCIL_POINTS,
                  shrink=0.25, rounds=REFINE_ROUNDS)
    ratio = np.exp(center)                                               # (M, C, 1)
    value, thickness, feasible = _objective_at(family, ratio, width, faces3, cores3, demand,
                                               objective)
    value, thickness, feasible = value[..., 0], thickness[..., 0], feasible[..., 0]
    best_core = np.argmin(value, axis=-1)                                 # (M,)
    rows = np.arange(len(indices))
    thickness = thickness[rows, best_core]
    ratio = ratio[rows, best_core, 0]
    chosen_core = core.take(best_core)
    dims = {"width": np.full(len(indices), width), "core_thickness": thickness,
            "face_thickness": ratio * thickness}
    rounded, check = _round(family, dims, face, chosen_core, rounding, objective)
    designs, rejections = [], []
    for row, material_index in enumerate(indices):
        material_id = table.ids[material_index]
        if not feasible[row].any():
            rejections.append(Rejection(int(material_index), material_id, family.id,
                                        *_reason(family, ratio[row], faces3, row, cores3,
                                                 width, rounding.row(row))))
            continue
        if not check.feasible[row]:
            rejections.append(Rejection(int(material_index), material_id, family.id,
                                        "no feasible design after rounding the dimensions to "
                                        "0.001 mm", 1.0))
            continue
        designs.append(_design(family, int(material_index), material_id, row, rounded, check,
                               face, chosen_core, cores, int(best_core[row]),
                               rounding.row(row)))
    return designs, rejections


def _round(family, dims, face, core, demand, objective):
    """The best feasible rounding of core and face to 0.001 mm steps: each goes down, up, or up
    one or two steps more (16 combinations at once); the lowest objective that passes wins,
    else the all-up-most one (which then fails and is rejected)."""
    width = dims["width"][:, None]
    base = {name: np.ceil(dims[name] * STEPS_PER_METRE - 1e-6)[:, None]
            for name in ("core_thickness", "face_thickness")}
    moves = np.array([-1, 0, 1, 2])
    core_steps = (base["core_thickness"] + moves[:, None].T).repeat(len(moves), axis=-1)
    face_steps = np.tile(base["face_thickness"] + moves, len(moves))
    candidates = {"width": width, "core_thickness": core_steps / STEPS_PER_METRE,
                  "face_thickness": face_steps / STEPS_PER_METRE}
    columns = face.column()
    core_columns = core.column()
    with np.errstate(invalid="ignore", divide="ignore"):
        check, value = evaluate_sandwich(family, candidates, columns, core_columns, demand,
                                         objective)
    usable = check.feasible & (candidates["face_thickness"] > 0) & (
        candidates["core_thickness"] > 0)
    best = np.argmin(np.where(usable, value, np.inf), axis=-1)
    pick = np.where(usable.any(axis=-1), best, core_steps.shape[-1] - 1)
    chosen = {name: np.take_along_axis(np.broadcast_to(v, core_steps.shape), pick[:, None],
                                       axis=-1)[:, 0] for name, v in candidates.items()}
    return chosen, check.take(pick)


def _reason(family, ratio, faces3, row, cores3, width, demand) -> Reason:
    """Why no core and ratio works for the face material in ``row``, and its shortfall (the
    depth it needs over max_depth)."""
    face = faces3.map(lambda v: v[row])
    thickness = _smallest_core(family, np.asarray(ratio)[None, None], width, face, cores3,
                               demand, "mass")[0]
    if not np.isfinite(thickness).any():
        return ("cannot carry its own weight: with every core, the self-weight alone exceeds "
                "a limit however thick the core"), math.inf
    depth = float(np.nanmin(thickness * (1.0 + 2.0 * ratio)))
    shortfall = max(depth / demand.max_depth, 1.0) if math.isfinite(demand.max_depth) else math.inf
    return (f"envelope max_depth {demand.max_depth:.3g} m is too small: the panel needs an "
            f"overall depth of at least {depth:.3g} m"), shortfall


def _design(family, material_index, material_id, row, dims, check, face, core, cores,
            core_index, demand) -> Design:
    width = dims["width"][row]
    face_mass = face.density[row] * 2.0 * width * dims["face_thickness"][row] * demand.span
    core_mass = core.density[row] * width * dims["core_thickness"][row] * demand.span
    dimensions = {name: float(dims[name][row]) for name in family.dimension_names}
    utilization = design_utilization(
        family, dimensions, {name: float(u[row]) for name, u in check.utilization.items()},
        demand, free=True)
    return Design(
        material_index=material_index,
        material_id=material_id,
        family=family.id,
        dimensions=dimensions,
        core_material_index=core_index,
        core_material_id=cores.ids[core_index],
        designation=None,
        mass=float(face_mass + core_mass),
        cost=float(face.price[row] * face_mass + core.price[row] * core_mass),
        carbon=float(face.embodied_carbon[row] * face_mass
                     + core.embodied_carbon[row] * core_mass),
        deflection=float(check.deflection[row]),
        twist=None,
        max_stress=float(check.max_stress[row]),
        utilization=utilization,
        governing=governing(utilization),
    )
