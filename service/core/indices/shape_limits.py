"""The largest shape factor each material reaches in a section family (its shape limit).

A material cannot be made into arbitrarily efficient sections: thinner walls buckle locally.
:func:`shape_limits` finds, per material and family, the largest shape factor over the family's
manufacturable proportions (:class:`~service.core.sections.base.RatioBound`) whose local
buckling stress (:class:`~service.core.sections.base.LocalBuckling`) is at least the material's
strength: the section can be loaded to its strength before a wall buckles.

The same criterion serves stiffness-limited design. A stiffness-limited member's working stress
depends on the load and span, so it has no material-only value; the criterion asks that the
section, like a strength-limited one, reach the strength of the material before a wall buckles,
so a section used at any stress up to its strength does not buckle locally first. Local
buckling at the failure stress is the condition that bounds the shape factor in Weaver and
Ashby, "The optimal selection of material and section-shape", Progress in Materials Science
41 (1996) (from memory); here it is evaluated with the section library's own buckling
models. The strength compared is ``strength`` (bending, compression) or the shear strength
(torsion: the material's own ``shear_strength`` or strength / sqrt(3), von Mises).

Columns (compression, stiffness) use the bending-stiffness shape factor about the weaker axis,
12 min(I_major, I_minor) / A^2, because an Euler column buckles about its weakest axis, and
the local buckling of walls in uniform compression that the member checks use
(:func:`service.core.stability.wall_compression.compression_buckling_stress`: every wall of a
column, the web included, carries the full stress P / A).

Tension and compression strength (crushing) have no shape effect: shape factor 1, exponent 0.

Only self-similar single-material families are ranked (:func:`ranks_in_rankings`): the sandwich
panel's width is set by the envelope and its mass includes a core of another material, so no
single-material index describes it; POST /v1/designs sizes it.

A request may fix some or all of a family's proportions, each as the ratio of a dimension to
the family's scale dimension (``{"round_tube": {"wall": 0.05}}``: wall / outer_diameter =
0.05, D/t = 20); the other ratios are searched as above, and a material that buckles before
reaching its strength at the fixed proportions is excluded with the reason.

The search is the ratio-box search of :mod:`service.core.search`, as in the sizing: one
vectorised grid over the free proportion ratios (materials x proportions arrays), refined by
zooming each material's grid around its best point.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from service.core.indices.derivation import IndexDefinition
from service.core.materials.form_limits import measures
from service.core.search import RatioBox, rounds_to, zoom
from service.core.sections import shape_factors
from service.core.sections.base import Elastic, SectionFamily, SectionProperties
from service.core.stability.wall_compression import compression_buckling_stress

SHAPE_GRID_POINTS = {1: 129, 2: 33, 3: 17}
"""Points per free ratio axis of the first (shared) grid, by the number of free ratios."""

SHAPE_STENCIL_POINTS = 5
"""Points per free ratio axis of each local refinement grid (odd: the centre is kept)."""

REFINE_TOLERANCE = 1e-4
"""Final grid step in log(ratio): the shape factor then moves by ~1e-4 relative or less."""


@dataclass(frozen=True)
class ShapeLimit:
    """The shape factor each material reaches in one family, arrays of shape (M,).

    Attributes:
        family: section family id.
        shape_factor: the shape factor at :attr:`proportions`, dimensionless.
        proportions: ratio dimension -> its value / the scale dimension at the chosen point
            (fixed ratios included), dimensionless.
        buckling_stress: the local buckling stress there, Pa (``inf``: no mode).
        feasible: True where some proportions meet the criterion (buckling stress at least
            the limiting strength); elsewhere the other fields describe the least-violating
            proportions found.
    """

    family: str
    shape_factor: np.ndarray
    proportions: dict[str, np.ndarray]
    buckling_stress: np.ndarray
    feasible: np.ndarray


def shape_factor_values(name: str, props: SectionProperties) -> np.ndarray:
    """One named shape factor (see :attr:`GoverningRelation.shape_factor`), dimensionless.

    ``column_stiffness`` is 12 min(I_major, I_minor) / A^2: an Euler column buckles about its
    weaker axis.
    """
    if name == "column_stiffness":
        weaker = np.minimum(props.second_moment_major, props.second_moment_minor)
        return 12.0 * weaker / np.asarray(props.area, dtype=float) ** 2
    return getattr(shape_factors(props), name)


def local_buckling_stress(family: SectionFamily, dims, elastic: Elastic, mode: str
                          ) -> np.ndarray:
    """The local buckling stress of ``mode`` (see :attr:`GoverningRelation.buckling_mode`),
    Pa, against the peak stress of that loading."""
    if mode == "compression":
        return compression_buckling_stress(family, dims, elastic)
    return getattr(family.local_buckling(dims, elastic), mode)


def ranks_in_rankings(family: SectionFamily) -> bool:
    """True for self-similar single-material families, the ones an index describes.

    A family with :attr:`~SectionFamily.fixed_dimensions` (the sandwich panel, whose width is
    set by the envelope and whose mass includes a core of another material) is not: its merit
    depends on the panel width and the core, which POST /v1/designs sizes.
    """
    return not family.fixed_dimensions


def shape_limits(
    family: SectionFamily,
    definition: IndexDefinition,
    elastic: Elastic,
    limiting_strength: np.ndarray,
    fixed: Mapping[str, float] | None = None,
    max_wall_ratio: np.ndarray | None = None,
) -> ShapeLimit:
    """The proportions that maximise each material's shape part phi^s of the index.

    Feasible proportions lie within the family's ratio bounds, describe a real section (the
    family's rules) and have a local buckling stress of at least ``limiting_strength`` (see
    the module docstring); ``fixed`` ratios are held at their values. One log-spaced grid over
    the free ratios for every material at once (arrays materials x proportions), then rounds
    of a finer grid around each material's best point, halving the step until it is below
    :data:`REFINE_TOLERANCE`. A material with no feasible grid point refines towards its
    least-violating one (highest buckling stress / strength).

    Args:
        family: a self-similar family (:func:`ranks_in_rankings`).
        definition: supplies the shape factor, its exponent s and the buckling mode.
        elastic: E, G (Pa) and nu of the materials, arrays (M,).
        limiting_strength: the strength the buckling stress must reach, Pa, shape (M,).
        fixed: ratio dimension -> fixed value / scale dimension.
        max_wall_ratio: the largest outer dimension / wall each material's usual process
            makes in this family (its manufacturing limit, see
            :func:`~service.core.materials.form_limits.measures`), shape (M,); NaN or None
            for no limit. Proportions beyond it are not achievable.

    Returns:
        A :class:`ShapeLimit` of arrays (M,).
    """
    shape_factor, mode = definition.shape_factor, definition.relation.buckling_mode
    if shape_factor is None or mode is None:
        raise ValueError(f"{definition.description}: no shape factor to search")
    fixed = dict(fixed or {})
    free = [bound for bound in family.ratio_bounds if bound.dimension not in fixed]
    columns = Elastic(*(np.asarray(v, dtype=float)[:, None] for v in
                        (elastic.youngs_modulus, elastic.shear_modulus, elastic.poisson_ratio)))
    strength = np.asarray(limiting_strength, dtype=float)[:, None]
    most = (np.full(len(strength), np.nan) if max_wall_ratio is None
            else np.asarray(max_wall_ratio, dtype=float))[:, None]

    def evaluate(log_ratios: np.ndarray):
        """Shape factor, buckling stress, real and feasible at log ratios (..., n_free),
        each of shape (M, ...) without the last axis."""
        dims = {family.scale_dimension: np.ones(log_ratios.shape[:-1])}
        dims.update({name: np.full(log_ratios.shape[:-1], value) for name, value in fixed.items()})
        dims.update({b.dimension: np.exp(log_ratios[..., j]) for j, b in enumerate(free)})
        # Grid points that break a family rule may divide by zero; they are masked out below.
        with np.errstate(divide="ignore", invalid="ignore"):
            phi = shape_factor_values(shape_factor, family.properties(dims))
            buckling = local_buckling_stress(family, dims, columns, mode)
            phi, buckling = np.broadcast_arrays(phi, buckling)
            _, wall_ratio, _ = measures(family.id, dims)
            # NaN (no such ratio, or no limit) compares False: no limit
            made = ~(wall_ratio > most)
            real = family.holds(dims) & made & np.isfinite(phi) & (phi > 0)
            feasible = real & (buckling >= strength)
        return phi, buckling, real, feasible

    def pick(candidates: np.ndarray) -> np.ndarray:
        """Each material's best of candidates (Q, n_free) or (M, Q, n_free) -> (M, n_free)."""
        phi, buckling, real, feasible = evaluate(candidates)
        with np.errstate(divide="ignore", invalid="ignore"):
            shape_part = np.where(feasible, definition.shape_factor_exponent * np.log(phi), -np.inf)
            violation = np.where(real, np.log(buckling / strength), -np.inf)
        best = np.where(feasible.any(axis=-1), np.argmax(shape_part, axis=-1),
                        np.argmax(np.nan_to_num(violation, nan=-np.inf), axis=-1))
        if candidates.ndim == 2:
            return candidates[best]
        return np.take_along_axis(candidates, best[:, None, None], axis=-2)[:, 0, :]

    n_free = len(free)
    if n_free:
        box = RatioBox.of(free)
        points = SHAPE_GRID_POINTS[n_free]
        step = box.spacing(points)
        center = zoom(box, pick(box.grid(points)), step, pick, points=SHAPE_STENCIL_POINTS,
                      shrink=0.5, rounds=rounds_to(step, REFINE_TOLERANCE, 0.5))
        chosen = center[:, None, :]
    else:
        chosen = np.zeros((len(strength), 1, 0))
    phi, buckling, _, feasible = evaluate(chosen)
    proportions = {name: np.full(len(strength), value) for name, value in fixed.items()}
    proportions.update({b.dimension: np.exp(chosen[:, 0, j]) for j, b in enumerate(free)})
    return ShapeLimit(
        family=family.id,
        shape_factor=phi[:, 0],
        proportions={b.dimension: proportions[b.dimension] for b in family.ratio_bounds},
        buckling_stress=buckling[:, 0],
        feasible=feasible[:, 0],
    )
