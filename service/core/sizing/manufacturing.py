"""Manufacturing limits in the sizing: what the usual process makes of a material in a form.

A material's :class:`~service.core.materials.FormLimit` for a section family (from
``data/form_limits.csv`` or a client material's ``form_limits``) bounds its sections four ways
(:func:`service.core.materials.form_limits.measures` defines the quantities):

- the largest outer dimension / wall is a condition on the proportions alone: proportions
  beyond it are not sections of that material (the scale bounds' ``feasible``), and its smooth
  log-margins (:func:`wall_ratio_margins`) let the proportion search follow it up to its
  boundary, as it does the family's own geometry rules;
- the thinnest wall and the largest size tighten the request's ``min_wall`` and envelope, per
  material (:func:`limited_demand`), which the search already treats exactly;
- the smallest size (and the thinnest side of a solid rectangle) is met by scaling the searched
  optimum up at fixed proportions (:func:`raise_to_limits`): every strength, stiffness and
  buckling requirement only improves with size, so the design stays feasible unless the
  envelope stops it.

Every limit travels in the :class:`Demand`, per material, so one run sizes every material of a
family. The recheck of every design tests the rounded dimensions against all four
(:func:`made_fits` and the demand's ``min_wall`` and envelope), so no design leaves its
process's limits.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

import numpy as np

from service.core.materials.form_limits import FormLimit, measures
from service.core.sections.base import SectionFamily
from service.core.sizing.demand import Demand

RATIO_PAIRS: dict[str, tuple[tuple[str, str], ...]] = {
    "solid_rectangle": (("depth", "width"), ("width", "depth")),
    "round_tube": (("outer_diameter", "wall"),),
    "rectangular_tube": (("depth", "wall"), ("width", "wall")),
    "i_section": (("depth", "flange_thickness"), ("depth", "web_thickness"),
                  ("flange_width", "flange_thickness"), ("flange_width", "web_thickness")),
}
"""The (outer dimension, wall) pairs whose ratio the ``max_wall_ratio`` bounds, per family: the
smooth pieces of :func:`~service.core.materials.form_limits.measures`' wall ratio (the larger
outer dimension over the thinner wall)."""

WIDTH_SIZED = frozenset({"solid_round", "solid_rectangle", "round_tube", "rectangular_tube",
                         "i_section"})
"""Families whose width dimension counts in their size (a sandwich panel's size is its
thickness; its width is the panel's)."""

ACTIVE_TOLERANCE = 1e-3
"""Relative closeness of the searched wall ratio to its limit that counts as binding (the
sizing's ``BINDING_TOLERANCE``)."""

SIZE_TOLERANCE = 1e-9
"""Relative margin by which :func:`raise_to_limits` overshoots the smallest size, so the
rounding (which keeps the lightest combination that passes) never lands below it by a bit."""


def wall_ratio_margins(family: SectionFamily, unit_dims: dict, demand: Demand
                       ) -> list[np.ndarray]:
    """log(max_wall_ratio x wall / outer) of each (outer, wall) pair of the family
    (:data:`RATIO_PAIRS`), positive where the proportions are made: the wall-ratio limit as
    smooth constraints the proportion search follows up to the boundary (``inf`` where a
    material has no limit). ``unit_dims`` are arrays (R, ...) of the rows of ``demand``
    (fields (R, 1) or floats)."""
    pairs = RATIO_PAIRS.get(family.id, ())
    if not pairs:
        return []
    ratio = np.asarray(demand.max_wall_ratio, dtype=float)
    if ratio.ndim:
        any_dims = np.asarray(unit_dims[pairs[0][0]])
        ratio = ratio.reshape(ratio.shape[:-1] + (1,) * (any_dims.ndim - ratio.ndim + 1))
    with np.errstate(divide="ignore", invalid="ignore"):
        return [np.log(ratio * np.asarray(unit_dims[wall]) / np.asarray(unit_dims[outer]))
                for outer, wall in pairs]


def limited_demand(demand: Demand, family: SectionFamily,
                   limits: Sequence[FormLimit | None]) -> Demand:
    """``demand`` with the manufacturing limits of materials in ``family`` folded in: the
    thinnest wall raises ``min_wall`` (families with walls), the largest size lowers the
    envelope, and the smallest size (side) fills ``min_size`` (``min_side``).

    One limit gives a demand of that material (floats stay floats, and ``form_limit`` is
    set); several give per-material fields of shape (..., K, 1) against the demand's
    (..., 1, 1) (the self-similar run's materials axis), or (K, 1) against floats (a run
    sized case by case: catalogue members, sandwich panels).
    """
    if all(limit is None for limit in limits):
        return demand
    walls = bool(family.wall_dimensions)
    zeros = np.zeros_like(demand.span)
    # one row per limit, one column per quantity of _made; against the demand's shape:
    # (...) + (Q,) for one limit, (..., 1, 1) + (Q, K, 1) -> (Q, ..., K, 1) for several
    table = np.array([_made(limit, walls) for limit in limits], dtype=float).T
    per_material = table[:, 0] if len(limits) == 1 else table[:, :, None]
    padding = (1,) * max(zeros.ndim - per_material.ndim + 1, 0)
    made_min_wall, made_max_size, min_size, min_side, max_wall_ratio = (
        per_material.reshape(per_material.shape[:1] + padding + per_material.shape[1:])
        + zeros)
    numbers = {
        "max_depth": np.minimum(demand.max_depth, made_max_size),
        "min_wall": np.maximum(demand.min_wall, made_min_wall),
        "min_size": min_size,
        "min_side": min_side,
        "made_min_wall": made_min_wall,
        "made_max_size": made_max_size,
        "max_wall_ratio": max_wall_ratio,
    }
    if family.id in WIDTH_SIZED:
        numbers["max_width"] = np.minimum(demand.max_width, made_max_size)
    # numpy scalars or arrays, each; a scalar becomes a float, as the demand's own are
    changes: dict[str, Any] = {name: float(value) if value.ndim == 0 else value
                               for name, value in numbers.items()}
    changes["form_limit"] = limits[0] if len(limits) == 1 else None
    changes["asked"] = demand if demand.asked is None else demand.asked
    return demand.replace(**changes)


def _made(limit: FormLimit | None, walls: bool) -> tuple[float, float, float, float, float]:
    """What a material's process makes in a form (``walls``: the family has walls): its
    thinnest wall, largest size, smallest size, thinnest side (a solid rectangle's) and
    largest wall ratio; for a material without a limit, none of them (0 or ``inf``)."""
    if limit is None:
        return 0.0, math.inf, 0.0, 0.0, math.inf
    thinnest = 0.0 if limit.min_wall is None else limit.min_wall
    return (thinnest if walls else 0.0, limit.max_size, limit.min_size,
            0.0 if walls else thinnest,
            math.inf if limit.max_wall_ratio is None else limit.max_wall_ratio)


def raise_to_limits(family: SectionFamily, dims: dict, demand: Demand
                    ) -> tuple[dict, np.ndarray]:
    """Dimensions (arrays (R,)) scaled up at fixed proportions until each section reaches the
    smallest size its process makes (and, for a solid rectangle, the thinnest side), with
    the demand's fields (R, 1) or floats; and where that scaled them up (R,)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        wall, _, size = measures(family.id, dims)
        factor = np.fmax(np.ravel(demand.min_size) / size, np.ravel(demand.min_side) / wall)
    raised = np.isfinite(factor) & (factor > 1.0)
    grow = np.where(raised, factor * (1.0 + SIZE_TOLERANCE), 1.0)
    return {name: np.asarray(value) * grow for name, value in dims.items()}, raised


def made_fits(family: SectionFamily, dims: dict, demand: Demand) -> np.ndarray:
    """Whether each section reaches the smallest size (side) its process makes and stays
    within its largest outer size / wall; the other limits are the demand's ``min_wall`` and
    envelope."""
    with np.errstate(divide="ignore", invalid="ignore"):
        wall, ratio, size = measures(family.id, dims)
        return ((size >= demand.min_size) & ~(wall < demand.min_side)
                & ~(ratio > demand.max_wall_ratio))


def never_fits(demand: Demand) -> np.ndarray:
    """Rows (demand fields (R, 1) or floats) whose process's smallest size is above both
    envelope limits: no rounding of theirs fits, however far it is scaled up (rounding
    keeps the envelope's dimensions within their limits, so the outer size, the larger of
    them, stays within the larger limit), (R,) or (1,)."""
    return np.ravel(np.asarray(demand.min_size) > np.maximum(demand.max_depth,
                                                             demand.max_width))


def set_by_limit(demand: Demand, governing: str, depth_limited: np.ndarray | bool
                 ) -> np.ndarray:
    """Whether the ``min_wall`` or ``envelope`` that governs (per row) is the process's limit
    rather than the request's own (``depth_limited``: max_depth, not max_width, bounds the
    size)."""
    if governing == "min_wall":
        made = np.ravel(demand.made_min_wall)
        return (made > 0) & (np.ravel(demand.min_wall) == made)
    bound = np.where(depth_limited, np.ravel(demand.max_depth), np.ravel(demand.max_width))
    return bound == np.ravel(demand.made_max_size)


def wall_ratio_active(family: SectionFamily, unit_dims: dict, demand: Demand) -> np.ndarray:
    """Whether sections of the searched proportions (rows (R,), demand fields (R, 1)) sit on
    their material's largest wall ratio (within :data:`ACTIVE_TOLERANCE`): the limit stopped
    the proportions short of thinner walls."""
    with np.errstate(divide="ignore", invalid="ignore"):
        _, ratio, _ = measures(family.id, unit_dims)
        return ratio >= np.ravel(demand.max_wall_ratio) * (1.0 - ACTIVE_TOLERANCE)


def failed_limits(limit: FormLimit, dims: dict) -> list[str]:
    """The limits a section (scalar dimensions) breaks, in words naming each limit."""
    with np.errstate(divide="ignore", invalid="ignore"):
        wall, ratio, size = (float(np.asarray(v).reshape(-1)[0])
                             for v in measures(limit.form, dims))
    failed = []
    if size < limit.min_size:
        failed.append(f"min_size {limit.min_size:.4g} m (outer size {size:.4g} m)")
    if size > limit.max_size:
        failed.append(f"max_size {limit.max_size:.4g} m (outer size {size:.4g} m)")
    if limit.min_wall is not None and wall < limit.min_wall:
        failed.append(f"min_wall {limit.min_wall:.4g} m (wall {wall:.4g} m)")
    if limit.max_wall_ratio is not None and ratio > limit.max_wall_ratio:
        failed.append(f"max_wall_ratio {limit.max_wall_ratio:.4g} (ratio {ratio:.4g})")
    return failed


def limit_words(limit: FormLimit) -> str:
    """The limit as a clause: what the usual process makes."""
    return f"the manufacturing limits of {limit.form} ({limit.process})"
