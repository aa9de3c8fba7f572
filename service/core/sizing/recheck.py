"""Rounding and rechecking: every requirement recomputed from a member's actual dimensions.

:func:`evaluate` recomputes every check of given dimensions with the family's property
functions; :func:`round_dimensions` rounds to multiples of 0.001 mm (each dimension down or up,
whichever lightest combination passes; the envelope's dimensions never above its limits,
and equal to a limit they are within a rounding step of); :func:`finalise` rounds, rechecks
and scales up slightly whatever fails (a few times), so the engine never returns a design
that fails a check. :func:`make_design` turns a checked row into a
:class:`~service.core.sizing.results.Design`.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from typing import cast

import numpy as np

from service.core.loadcases import (
    bending_response,
    self_weight_load,
    shear_deflection,
    torsion_stress,
    twist,
)
from service.core.sections.base import SectionFamily
from service.core.sizing.checks import CHECKS, Actions
from service.core.sizing.checks.interaction import web_section
from service.core.sizing.checks.member_buckling import applies, has_axial_force
from service.core.sizing.demand import Demand
from service.core.sizing.limits import design_utilization, within_rules
from service.core.sizing.limits import governing as governing_of
from service.core.sizing.manufacturing import made_fits, never_fits
from service.core.sizing.member import MemberDemand, member_actions, member_diagrams
from service.core.sizing.request import DIMENSION_RESOLUTION, STEPS_PER_METRE
from service.core.sizing.results import Design
from service.core.sizing.unit_bounds import (
    member_unit,
    peak_shear_area,
    pressed,
    timoshenko_area,
)
from service.core.sizing.values import MaterialValues
from service.core.sizing.walls import compression_buckling
from service.core.sizing.walls import local_buckling as wall_buckling
from service.core.stability.beam_column import amplification
from service.core.stability.columns import BENDING_END_CONDITIONS, EFFECTIVE_LENGTH_FACTORS
from service.core.stability.member import MemberSection

BUMP_ATTEMPTS = 6
"""How many times a rounded design that fails a check is scaled up before it is dropped."""


@dataclass(frozen=True)
class Evaluation:
    """Every requirement recomputed from actual dimensions (arrays of one shape).

    Attributes:
        mass: kg. deflection: m (bending; a tie's or column's extension or shortening;
            NaN for torsion). twist: rad (NaN unless torsion).
        max_stress: Pa. utilization: requirement -> ratio (0 where not asked for).
        fits: envelope, min_wall and the material's manufacturing limits met.
        feasible: ``fits`` and every utilization <= 1.
        frequency: first bending frequency, Hz (NaN where not computed).
    """

    mass: np.ndarray
    deflection: np.ndarray
    twist: np.ndarray
    max_stress: np.ndarray
    utilization: dict[str, np.ndarray]
    fits: np.ndarray
    feasible: np.ndarray
    frequency: np.ndarray

    def take(self, index: np.ndarray) -> Evaluation:
        """Elements ``index`` along the last axis (index has the leading shape)."""
        def along(array):
            array = np.broadcast_to(array, self.feasible.shape)
            return np.take_along_axis(array, index[..., None], axis=-1)[..., 0]
        return Evaluation(
            along(self.mass), along(self.deflection), along(self.twist), along(self.max_stress),
            {name: along(u) for name, u in self.utilization.items()}, along(self.fits),
            along(self.feasible), along(self.frequency),
        )


def evaluate(family: SectionFamily, dims: dict, materials: MaterialValues, demand: Demand,
             free: bool = True) -> Evaluation:
    """Recompute every requirement of ``dims`` for ``materials`` (all arrays broadcast).

    ``free``: the proportions are the sizing's choice, so the family's proportion rules
    apply (not to a catalogue member, whose proportions are given)."""
    if demand.member is not None:
        return _evaluate_member(family, dims, materials, demand, free)
    # Rows without a design carry non-finite dimensions; their values are never reported.
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        # I and Z (bending) or K and Q (torsion), with the area (axial members: A alone)
        area, stiffness_modulus, strength_modulus = family.sizing_properties(
            dims, "bending" if demand.axial else demand.case.loading)
        buckling = wall_buckling(family, dims, materials)
        compression = (compression_buckling(family, dims, materials)
                       if demand.case.loading == "compression" or pressed(demand) else np.inf)
        web = (web_section(family, dims, materials, buckling, compression)
               if demand.bending or demand.case.loading == "compression" else None)
    weight = (self_weight_load(materials.density, area, demand.span)
              if demand.self_weight else 0.0)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        shear: np.ndarray | float
        if demand.axial:
            # stress P / A; a tie's extension P L / (E A) (a column's shortening has no limit)
            stress = demand.action / area
            deflection = demand.action * demand.span / (materials.youngs_modulus * area)
            angle, shear = np.full_like(stress, np.nan), 0.0
        elif demand.bending:
            response = bending_response(demand.case, demand.action, demand.span,
                                        materials.youngs_modulus, stiffness_modulus, weight)
            stress = response.moment / strength_modulus
            shear = response.shear / peak_shear_area(family, dims, materials.poisson_ratio)
            # Timoshenko: the shear deflection c_S P L / (G k A) of the case and of the
            # self-weight adds to the bending deflection (both peak at one section)
            shear_stiffness = materials.shear_modulus * timoshenko_area(
                family, dims, materials.poisson_ratio)
            deflection = (response.deflection
                          + shear_deflection(demand.case, demand.action, demand.span,
                                             shear_stiffness)
                          + shear_deflection(demand.case.uniform, weight, demand.span,
                                             shear_stiffness))
            angle = np.full_like(stress, np.nan)
            if has_axial_force(demand):   # amplified by a compression (stability.beam_column)
                length = EFFECTIVE_LENGTH_FACTORS[BENDING_END_CONDITIONS[demand.case.id]] * (
                    np.asarray(demand.span))
                deflection = deflection * amplification(
                    -np.asarray(demand.axial_force),
                    np.pi**2 * materials.youngs_modulus * stiffness_modulus / length**2)
        else:
            stress = torsion_stress(demand.action, strength_modulus)
            angle = twist(demand.action, demand.span, materials.shear_modulus,
                          stiffness_modulus)
            deflection, shear = np.full_like(stress, np.nan), 0.0
        moment = response.moment if demand.bending else 0.0
        member = (MemberSection.of(family, dims)
                  if applies(demand) and "compression" in family.loadings else None)
        actions = Actions(stress, shear, deflection, angle, buckling, moment=moment,
                          member_section=member, section_family=family.id,
                          compression_buckling=compression,
                          axial_stress=(np.asarray(demand.axial_force) / area
                                        if demand.bending else 0.0),
                          web=web, dimensions=dims, area=area)
        return _evaluation(family, dims, materials, demand, actions, area, free)


def _evaluate_member(family: SectionFamily, dims: dict, materials: MaterialValues,
                     demand: Demand, free: bool) -> Evaluation:
    """:func:`evaluate` of a general member: every check along the member, exactly
    (:func:`service.core.sizing.member.member_actions`)."""
    general = cast(MemberDemand, demand.member)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        area, second_moment, modulus = family.sizing_properties(dims, "bending")
        unit = member_unit(family, dims, (area, second_moment, modulus),
                           "torque" in general.flags, poisson_ratio=materials.poisson_ratio)
        buckling = wall_buckling(family, dims, materials)
        member = member_actions(unit, materials, demand)
        section = (MemberSection.of(family, dims)
                   if applies(demand) and "compression" in family.loadings else None)
        compression = (compression_buckling(family, dims, materials)
                       if "compression" in general.flags else np.inf)
        web = web_section(family, dims, materials, buckling, compression,
                          torsion="torque" in general.flags)
    actions = Actions(stress=member.equivalent_stress, shear=0.0, deflection=member.deflection,
                      twist=member.twist, buckling=buckling, member=member,
                      member_section=section, section_family=family.id,
                      compression_buckling=compression, web=web, dimensions=dims,
                      area=area)
    return _evaluation(family, dims, materials, demand, actions, area, free)


def _evaluation(family: SectionFamily, dims: dict, materials: MaterialValues, demand: Demand,
                actions: Actions, area, free: bool) -> Evaluation:
    """Every check of ``actions``, the fit in the envelope, the mass."""
    stress, deflection, angle = actions.stress, actions.deflection, actions.twist
    with np.errstate(divide="ignore", invalid="ignore"):
        ratios = {check.name: check.utilization(actions, materials, demand)
                  for check in CHECKS}
    shape = np.broadcast_shapes(np.shape(stress), *(np.shape(u) for u in ratios.values()))
    utilization = {name: np.broadcast_to(u, shape) for name, u in ratios.items()}
    frequency = (np.full(shape, np.nan) if actions.member is None
                 else np.broadcast_to(actions.member.frequency, shape))
    fits = (
        (family.overall_depth(dims) <= demand.max_depth * (1.0 + 1e-9))
        & (family.overall_width(dims) <= demand.max_width * (1.0 + 1e-9))
        & (family.wall_thickness(dims) >= demand.min_wall * (1.0 - 1e-9))
        & family.holds(dims)
        & made_fits(family, dims, demand)
    )
    if free and family.ratio_bounds:
        fits = fits & within_rules(family, dims)
    feasible = fits & np.logical_and.reduce([u <= 1.0 for u in utilization.values()])
    mass = materials.density * area * demand.span

    def full(array):
        return np.broadcast_to(array, np.broadcast_shapes(np.shape(array), shape))
    return Evaluation(full(mass), full(deflection), full(angle), full(stress), utilization,
                      full(fits), full(feasible), full(frequency))


def round_dimensions(family: SectionFamily, dims: dict, materials: MaterialValues,
                     demand: Demand, free: bool = True) -> tuple[dict, Evaluation]:
    """The lightest feasible rounding of each row's dimensions to multiples of 0.001 mm.

    Every dimension goes down or up to the grid (2^n combinations, evaluated at once); the
    envelope's dimensions never exceed its limits, and one that would end within a rounding
    step of its limit is the limit exactly (a design at the envelope reports the envelope's
    size). Rows where no combination passes every check keep the all-up rounding (and fail,
    for :func:`finalise` to scale up). With ``free`` proportions, a combination must also
    keep the proportion rules.
    """
    names = list(dims)
    steps = {name: np.asarray(value, dtype=float) * STEPS_PER_METRE
             for name, value in dims.items()}
    ends = {name: np.stack([np.floor(v + 1e-6), np.ceil(v - 1e-6)], axis=-1)
            / STEPS_PER_METRE for name, v in steps.items()}
    for name, limit in ((family.depth_dimension, demand.max_depth),
                        (family.width_dimension, demand.max_width)):
        if np.isfinite(limit).any():
            # At most the limit itself, and an end within a step of it is the limit exactly
            # (30 mm for a 30 mm envelope, not 29.999 mm). The limit broadcasts against the
            # ends' last axis, as the dimensions do.
            near = ends[name] * STEPS_PER_METRE >= limit * STEPS_PER_METRE - 1.0 - 1e-6
            ends[name] = np.where(near, limit, ends[name])
    combos = np.array(list(itertools.product((0, 1), repeat=len(names))))     # (K, n), last: all up
    candidates = {name: ends[name][..., combos[:, j]] for j, name in enumerate(names)}
    check = evaluate(family, candidates, materials.column(), demand, free)
    lightest = np.argmin(np.where(check.feasible, check.mass, np.inf), axis=-1)
    pick = np.where(check.feasible.any(axis=-1), lightest, len(combos) - 1)
    return ({name: np.take_along_axis(v, pick[..., None], axis=-1)[..., 0]
             for name, v in candidates.items()}, check.take(pick))


def finalise(family: SectionFamily, dims: dict, materials: MaterialValues, demand: Demand,
             wanted: np.ndarray, free: bool = True) -> tuple[dict, Evaluation]:
    """Round, recheck, and scale up whatever fails, a few times (arrays (M,)).

    ``wanted`` marks the rows with a feasible optimum; only those are bumped, unless their
    process's smallest size cannot fit the envelope (:func:`~service.core.sizing
    .manufacturing.never_fits`: scaling up cannot help).
    """
    current = dims
    rounded, check = round_dimensions(family, current, materials, demand, free)
    bumped = wanted & ~never_fits(demand)
    for _ in range(BUMP_ATTEMPTS):
        failing = ~check.feasible & bumped
        if not failing.any():
            break
        worst = np.maximum.reduce(
            [np.nan_to_num(u, nan=np.inf) for u in check.utilization.values()]
        )
        # Stresses fall like s^-3 and deflections like s^-4: the cube root is enough, plus a hair.
        growth = np.where(failing, np.clip(worst, 1.0, 1.1) ** (1.0 / 3.0) * 1.0005, 1.0)
        # A wall rounded up against its geometric limit (a tube wall at half the width) needs
        # the outside dimensions to grow by a rounding step or two instead.
        misfit = np.where(failing & ~family.holds(rounded), 2 * DIMENSION_RESOLUTION, 0)
        current = {
            name: np.asarray(value) * growth
            + (0.0 if name in family.wall_dimensions else misfit)
            for name, value in current.items()
        }
        rounded, check = round_dimensions(family, current, materials, demand, free)
    return rounded, check


def make_design(family: SectionFamily, material_index: int, material_id: str, row: int,
                dims: dict, check: Evaluation, values: MaterialValues, demand: Demand,
                designation: str | None = None) -> Design:
    """The :class:`Design` of row ``row`` of checked dimensions ``dims`` (arrays (R,)), with
    that row's material ``values``; cost and carbon are the mass times their per-kg values.
    Its utilization has every entry of :mod:`service.core.sizing.limits` (the proportion
    rules apply unless it is a catalogue member, ``designation``), and ``governing`` names
    the largest."""
    mass = float(check.mass[row])
    frequency = float(check.frequency[row])
    dimensions = {name: float(np.asarray(dims[name])[row]) for name in family.dimension_names}
    utilization = design_utilization(
        family, dimensions, {name: float(u[row]) for name, u in check.utilization.items()},
        demand, free=designation is None)
    general = demand.member is not None
    diagrams = (member_diagrams(family, dimensions, values, row, demand)
                if demand.member is not None and demand.member.diagrams else None)
    return Design(
        material_index=material_index,
        material_id=material_id,
        family=family.id,
        dimensions=dimensions,
        core_material_index=None,
        core_material_id=None,
        designation=designation,
        mass=mass,
        cost=mass * float(values.price[row]),
        carbon=mass * float(values.embodied_carbon[row]),
        deflection=float(check.deflection[row]) if demand.bending or general else None,
        twist=(float(check.twist[row]) if general and np.isfinite(check.twist[row])
               else float(check.twist[row]) if demand.torsion and not general else None),
        max_stress=float(check.max_stress[row]),
        utilization=utilization,
        governing=governing_of(utilization),
        frequency=frequency if np.isfinite(frequency) else None,
        diagrams=diagrams,
    )
