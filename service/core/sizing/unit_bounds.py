"""Scale bounds at given proportions: a family's sections at scale 1, and picking among them.

Proportions are the ratio dimensions of :attr:`SectionFamily.ratio_bounds`, each a ratio of
its dimension to the scale dimension. :func:`bounds_at` evaluates the closed-form scale bounds
of :mod:`service.core.sizing.scale` at ratios (..., Q, n_ratios) for (M, 1) material columns,
giving arrays (..., M, Q); :func:`pick_point` and :func:`along` choose among the Q points.
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pandas as pd

from service.core.materials.form_limits import measures
from service.core.sections.base import SectionFamily
from service.core.sizing.checks.member_buckling import applies, member_material
from service.core.sizing.demand import Demand
from service.core.sizing.scale import ScaleBounds, UnitSection, scale_bounds
from service.core.sizing.values import MaterialValues
from service.core.stability.member import MemberSection
from service.core.stability.wall_compression import compression_buckling_stress


def unit_dimensions(family: SectionFamily, ratios: np.ndarray) -> dict[str, np.ndarray]:
    """Dimensions at scale 1 from ratios of shape (..., n_ratios)."""
    dims = {family.scale_dimension: np.ones(ratios.shape[:-1])}
    for j, bound in enumerate(family.ratio_bounds):
        dims[bound.dimension] = ratios[..., j]
    return dims


def unit_section(family: SectionFamily, ratios, materials: MaterialValues, loading: str,
                 member: bool = False) -> tuple[UnitSection, np.ndarray]:
    """The family's sections at scale 1 for ratios (..., n_ratios) under ``loading``
    (``"bending"``, ``"torsion"``, ``"tension"``, ``"compression"``), and where they hold;
    with ``member``, also the constants member buckling reads (for a family that has it).
    An axial member's stiffness and strength "moduli" are its area (A s^2 carries P)."""
    dims = unit_dimensions(family, ratios)
    bending = loading == "bending"
    axial = loading in ("tension", "compression")
    # Grid points outside the family's geometry divide by zero; family.holds drops them.
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if axial:
            area = _unit_properties(family, ratios, dims, "bending")[0]
            stiffness = strength = area
        else:
            area, stiffness, strength = _unit_properties(family, ratios, dims, loading)
        buckling = family.local_buckling(dims, materials.elastic())
        if loading == "compression":
            compression = compression_buckling_stress(family, dims, materials.elastic())
        shear_area = family.shear_area(dims) if bending else np.inf
        members = (MemberSection.of(family, dims)
                   if member and "compression" in family.loadings else None)
        outer_wall_ratio = measures(family.id, dims)[1]
    unit = UnitSection(
        area=area,
        stiffness_modulus=stiffness,
        strength_modulus=strength,
        buckling_stress=(compression if loading == "compression"
                         else np.full(np.shape(area), np.inf) if loading == "tension"
                         else buckling.bending if bending else buckling.torsion),
        depth_ratio=family.overall_depth(dims),
        width_ratio=family.overall_width(dims),
        wall_ratio=_wall_ratios(family, dims),
        shear_area=shear_area,
        shear_buckling_stress=buckling.shear if bending else np.inf,
        buckling_modes=() if axial else buckling.modes(loading),
        member=members,
        section_family=family.id,
        outer_wall_ratio=outer_wall_ratio,
    )
    return unit, family.holds(dims)


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


def bounds_at(family, ratios, materials: MaterialValues, demand: Demand) -> ScaleBounds:
    """Scale bounds for ratios (..., Q, n_ratios) and (M, 1) material columns -> (..., M, Q)."""
    return section_bounds(unit_section(family, ratios, materials, demand.case.loading,
                                       applies(demand)), materials, demand)


def section_bounds(section: tuple[UnitSection, np.ndarray], materials: MaterialValues,
                   demand: Demand) -> ScaleBounds:
    """:func:`bounds_at` from the unit sections already computed (and where they hold)."""
    unit, valid = section
    bounds = scale_bounds(
        unit,
        materials.density,
        materials.shear_modulus if demand.torsion else materials.youngs_modulus,
        materials.shear_strength if demand.torsion else materials.strength,
        demand,
        shear_strength=materials.shear_strength,
        member_material=None if unit.member is None else member_material(
            materials, unit.section_family),
    )
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
