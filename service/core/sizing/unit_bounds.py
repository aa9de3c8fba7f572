"""Scale bounds at given proportions: a family's sections at scale 1, and picking among them.

Proportions are the ratio dimensions of :attr:`SectionFamily.ratio_bounds`, each a ratio of
its dimension to the scale dimension. :func:`bounds_at` evaluates the closed-form scale bounds
of :mod:`service.core.sizing.scale` at ratios (..., Q, n_ratios) for (M, 1) material columns,
giving arrays (..., M, Q); :func:`pick_point` and :func:`along` choose among the Q points.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping

import numpy as np
import pandas as pd

from service.core.materials.form_limits import measures
from service.core.sections.base import LocalBuckling, SectionFamily
from service.core.sections.flexure_shear import (
    round_tube_peak_shear_area,
    solid_rectangle_peak_shear_area,
    solid_round_peak_shear_area,
)
from service.core.sections.shear_deformation import TIMOSHENKO_SHEAR_AREA
from service.core.sizing.checks.interaction import web_section
from service.core.sizing.checks.member_buckling import applies
from service.core.sizing.demand import Demand
from service.core.sizing.member import MemberDemand, MemberUnit
from service.core.sizing.scale import ScaleBounds, UnitSection, scale_bounds, skipped
from service.core.sizing.values import MaterialValues
from service.core.sizing.walls import compression_buckling
from service.core.sizing.walls import local_buckling as wall_buckling
from service.core.stability.member import MemberSection


def unit_dimensions(family: SectionFamily, ratios: np.ndarray) -> dict[str, np.ndarray]:
    """Dimensions at scale 1 from ratios of shape (..., n_ratios)."""
    dims = {family.scale_dimension: np.ones(ratios.shape[:-1])}
    for j, bound in enumerate(family.ratio_bounds):
        dims[bound.dimension] = ratios[..., j]
    return dims


def unit_section(family: SectionFamily, ratios, materials: MaterialValues, loading: str,
                 lateral: bool = False, member: MemberDemand | None = None,
                 pressed: bool = False, web: bool = True, walls: bool = True
                 ) -> tuple[UnitSection, np.ndarray]:
    """The family's sections at scale 1 for ratios (..., n_ratios) under ``loading``
    (``"bending"``, ``"torsion"``, ``"tension"``, ``"compression"``), and where they hold;
    with ``lateral``, also the constants member buckling reads (for a family that has it);
    with ``member``, also everything a general member reads (bending and torsion); with
    ``pressed`` (a bending case with an axial compression), the walls' buckling in uniform
    compression for the interaction check; without ``web``, no :class:`WebSection`, and
    without ``walls`` NaN for the walls' buckling stresses too (for bounds that skip the
    checks reading them: local buckling, and the interaction and member buckling through the
    web section). An axial member's stiffness and strength "moduli" are its area (A s^2
    carries P)."""
    dims = unit_dimensions(family, ratios)
    if member is not None:
        loading = "bending"
    bending = loading == "bending"
    axial = loading in ("tension", "compression")
    # Grid points outside the family's geometry divide by zero; family.holds drops them.
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if axial:
            area = _unit_properties(family, ratios, dims, "bending")[0]
            stiffness = strength = area
        else:
            area, stiffness, strength = _unit_properties(family, ratios, dims, loading)
        # (in bending the stiffness modulus is I, which the shear area reads)
        shear_area = (peak_shear_area(family, dims, materials.poisson_ratio, stiffness)
                      if bending else np.inf)
        # the walls' web shear mode reads the family's own shear area: this one, where no
        # exact solution stands in for it
        own_shear_area = (shear_area if bending and family.id not in PEAK_SHEAR_AREA
                          else None)
        buckling = (wall_buckling(family, dims, materials, own_shear_area) if walls
                    else LocalBuckling(np.array(np.nan), np.array(np.nan), np.nan))
        compression: np.ndarray | float = np.inf
        if (loading == "compression" or (member is not None and "compression" in member.flags)
                or (pressed and bending)):
            compression = compression_buckling(family, dims, materials) if walls else np.nan
        webs = (web_section(family, dims, materials, buckling, compression,
                            torsion=member is not None and "torque" in member.flags,
                            known=(stiffness, strength, shear_area) if bending else None)
                if web and walls and (bending or loading == "compression") else None)
        timoshenko = (timoshenko_area(family, dims, materials.poisson_ratio) if bending
                      else np.inf)
        members = (MemberSection.of(family, dims)
                   if lateral and "compression" in family.loadings else None)
        outer_wall_ratio = measures(family.id, dims)[1]
    depth_ratio, width_ratio = family.overall_depth(dims), family.overall_width(dims)
    general = None
    if member is not None:
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            general = member_unit(family, dims, (area, stiffness, strength),
                                  "torque" in member.flags,
                                  known=(shear_area, depth_ratio, width_ratio, timoshenko))
    unit = UnitSection(
        area=area,
        stiffness_modulus=stiffness,
        strength_modulus=strength,
        buckling_stress=(np.asarray(compression) if loading == "compression"
                         else np.full(np.shape(area), np.inf) if loading == "tension"
                         else buckling.bending if bending else buckling.torsion),
        depth_ratio=depth_ratio,
        width_ratio=width_ratio,
        wall_ratio=_wall_ratios(family, dims),
        shear_area=shear_area,
        shear_buckling_stress=buckling.shear if bending else np.inf,
        buckling_modes=() if axial else buckling.modes(loading),
        member_section=members,
        section_family=family.id,
        outer_wall_ratio=outer_wall_ratio,
        member=general,
        torsion_buckling_stress=np.inf if member is None else buckling.torsion,
        shear_stiffness_area=timoshenko,
        compression_buckling_stress=(compression if member is not None
                                     and "compression" in member.flags else np.inf),
        web=webs,
        dimensions=dims if bending else None,
    )
    return unit, family.holds(dims)


def member_unit(family: SectionFamily, dims: dict, bending_properties, torsion: bool = True,
                known=None, poisson_ratio=0.3) -> MemberUnit:
    """What a general member reads of sections ``dims`` (bending properties given, and
    ``known`` shear area, overall depth and width and Timoshenko shear area when already
    computed, else from the material's ``poisson_ratio``): torsion properties where the
    member has a torque and the family carries torsion (else none: K and Q infinite, which
    only a member without torque may use)."""
    area, second_moment, section_modulus = bending_properties
    shear_area, depth, width, timoshenko = known if known is not None else (
        peak_shear_area(family, dims, poisson_ratio), family.overall_depth(dims),
        family.overall_width(dims), timoshenko_area(family, dims, poisson_ratio))
    torsion_constant: np.ndarray | float = np.inf
    torsion_modulus: np.ndarray | float = np.inf
    if torsion and "torsion" in family.loadings:
        _, torsion_constant, torsion_modulus = family.sizing_properties(dims, "torsion")
    return MemberUnit(
        area=area, second_moment=second_moment, section_modulus=section_modulus,
        torsion_constant=torsion_constant, torsion_modulus=torsion_modulus,
        shear_area=shear_area, depth_ratio=depth, width_ratio=width,
        round=family.id in ROUND_FAMILIES, shear_stiffness_area=timoshenko)


def timoshenko_area(family: SectionFamily, dims: dict, poisson_ratio) -> np.ndarray:
    """k A, m^2: the family's Timoshenko shear area with Cowper's shear coefficient at the
    material's Poisson's ratio (:data:`~service.core.sections.shear_deformation
    .TIMOSHENKO_SHEAR_AREA`); ``inf`` (no shear deformation here) for a family without one
    (the sandwich panel checks its own core shear)."""
    area = TIMOSHENKO_SHEAR_AREA.get(family.id)
    if area is None:
        return np.asarray(np.inf)
    return area(dims, np.asarray(poisson_ratio, dtype=float))


PEAK_SHEAR_AREA = {
    "solid_rectangle": solid_rectangle_peak_shear_area,
    "solid_round": solid_round_peak_shear_area,
    "round_tube": round_tube_peak_shear_area,
}
"""Family id -> A_s (dims, nu): the exact flexure solution's peak shear of solid sections and
round tubes at the material's own Poisson's ratio (:mod:`service.core.sections.flexure_shear`;
Timoshenko & Goodier sec. 123-124): for a wide rectangle the peak at the ends of the neutral
axis is up to twice 3 V / (2 A)."""


def peak_shear_area(family: SectionFamily, dims: dict, poisson_ratio, second_moment=None
                    ) -> np.ndarray:
    """A_s, m^2: the peak transverse shear stress of a shear force V is V / A_s; the solid
    sections' from the exact flexure solution at the material's Poisson's ratio
    (:data:`PEAK_SHEAR_AREA`), every other family's ``shear_area`` (with the sections'
    ``second_moment`` where the caller has it)."""
    exact = PEAK_SHEAR_AREA.get(family.id)
    if exact is None:
        return family.shear_area(dims, second_moment)
    return exact(dims, np.asarray(poisson_ratio, dtype=float))


ROUND_FAMILIES = ("solid_round", "round_tube")
"""Round sections: Marin's size factor of a round applies (else that of a rectangle)."""


def _unit_properties(family: SectionFamily, ratios: np.ndarray, dims: dict, loading: str
                     ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """:meth:`SectionFamily.sizing_properties` at ``dims`` (scale 1, from ``ratios``).

    A one-ratio family's candidates repeat across material rows (other loads of the same
    material reach the same proportions), so its properties are computed once per distinct
    ratio; each property is a function of the ratio alone, so the values are the same.
    """
    if ratios.shape[-1] != 1 or ratios.ndim < 2:
        return family.sizing_properties(dims, loading)
    codes, distinct = pd.factorize(ratios[..., 0].ravel())
    terms = family.sizing_properties(unit_dimensions(family, distinct[:, None]), loading)
    return tuple(np.asarray(term)[codes].reshape(ratios.shape[:-1]) for term in terms)


def _wall_ratios(family: SectionFamily, dims: dict) -> np.ndarray:
    """Each wall dimension at scale 1, stacked (separate rows keep the polish smooth)."""
    if not family.wall_dimensions:
        return family.wall_thickness(dims)[None]
    return np.stack(np.broadcast_arrays(*(np.asarray(dims[name], dtype=float)
                                          for name in family.wall_dimensions)))


def bounds_at(family, ratios, materials: MaterialValues, demand: Demand,
              exact_parts: bool = True, skip: Mapping[str, int] | None = None) -> ScaleBounds:
    """Scale bounds for ratios (..., Q, n_ratios) and (M, 1) material columns -> (..., M, Q);
    ``exact_parts`` and ``skip`` as for :func:`~service.core.sizing.scale.scale_bounds`
    (without member buckling the sections carry no member constants, without it and the
    interaction no web section, without those and local buckling no walls' buckling
    stresses: only those checks read them)."""
    skip = skipped(skip)

    def reads(*names: str) -> bool:
        return any(name not in skip for name in names)

    return section_bounds(unit_section(family, ratios, materials, demand.case.loading,
                                       reads("member_buckling") and applies(demand),
                                       demand.member, pressed(demand),
                                       web=reads("interaction", "member_buckling"),
                                       walls=reads("local_buckling", "interaction",
                                                   "member_buckling")),
                          materials, demand, exact_parts, skip=skip)


def pressed(demand: Demand) -> bool:
    """Whether a bending case carries an axial compression (``axial_force`` < 0)."""
    return demand.bending and bool(np.any(np.asarray(demand.axial_force) < 0.0))


def section_bounds(section: tuple[UnitSection, np.ndarray], materials: MaterialValues,
                   demand: Demand, exact_parts: bool = True, threshold=None,
                   skip: Mapping[str, int] | None = None) -> ScaleBounds:
    """:func:`bounds_at` from the unit sections already computed (and where they hold);
    ``threshold`` and ``skip`` as for :func:`~service.core.sizing.scale.scale_bounds`."""
    unit, valid = section
    bounds = scale_bounds(unit, materials, demand, exact_parts, threshold, skip)
    # proportions beyond the wall ratio a material's process makes are not sections of it
    with np.errstate(invalid="ignore"):
        made = ~(unit.outer_wall_ratio > demand.max_wall_ratio)
    return dataclasses.replace(bounds, feasible=bounds.feasible & valid & made)


def violation(bounds: ScaleBounds) -> np.ndarray:
    """How far the smallest admissible scale exceeds the envelope's bound (> 1 where it
    does); ``inf`` where the mass is not finite (no section there)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(np.isfinite(bounds.mass), bounds.scale / bounds.upper, np.inf)


def pick_point(bounds: ScaleBounds) -> np.ndarray:
    """Index (last axis) of the lightest feasible element, else of the least violating one."""
    lightest = np.argmin(np.where(bounds.feasible, bounds.mass, np.inf), axis=-1)
    least_violating = np.argmin(violation(bounds), axis=-1)
    return np.where(bounds.feasible.any(axis=-1), lightest, least_violating)


def along(points: np.ndarray, index: np.ndarray) -> np.ndarray:
    """points[..., index, :] for points (..., Q, n) and index (...)."""
    return np.take_along_axis(points, index[..., None, None], axis=-2)[..., 0, :]


def dimensions_at(family: SectionFamily, ratios: np.ndarray, scale: np.ndarray) -> dict:
    """Dimensions, m, from ratios (..., n_ratios) and the scale (...)."""
    dims = {family.scale_dimension: scale}
    for j, bound in enumerate(family.ratio_bounds):
        dims[bound.dimension] = ratios[..., j] * scale
    return dims
