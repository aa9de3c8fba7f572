"""The scale bounds of self-similar sections at fixed proportions: every check's smallest
scale, the walls' and the envelope's.

Fix the dimensionless proportions p of a section (every dimension but the scale dimension is a
ratio of it). Each check of :data:`~service.core.sizing.checks.CHECKS` then bounds the scale
s from below (its ``scale_bound``, in its own module: a closed form where the check scales as
a power of s, :mod:`service.core.sizing.closed_forms`, else a root found over the arrays), a
minimum wall t_min asks wall_ratio(p) s >= t_min, and the envelope an upper bound
s <= max_depth / depth_ratio(p) (and width). :func:`scale_bounds` assembles them.

Arrays: every array argument broadcasts to one shape; the engine uses (materials, proportions)
and a :class:`Demand` whose fields may carry a leading case axis of shape (C, 1, 1), or a row
axis of shape (R, 1) when the material rows are (case, material) pairs (sweeps).
"""

from __future__ import annotations

import functools
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from service.core.sizing.checks import CHECK_NAMES, CHECKS
from service.core.sizing.checks.base import Found
from service.core.sizing.checks.interaction import WebSection
from service.core.sizing.demand import Demand
from service.core.sizing.limits import MIN_WALL
from service.core.sizing.member import MemberUnit
from service.core.sizing.values import MaterialValues
from service.core.stability.member import MemberSection

REQUIREMENTS = (*CHECK_NAMES, MIN_WALL.name)
"""The requirements behind the lower bounds on the scale: :attr:`ScaleBounds.lower` holds
them in this order, with one ``min_wall`` row per wall dimension (see :func:`requirement`)."""

WALL_ROW = len(CHECK_NAMES)
"""The first lower-bound row of the walls (one per wall dimension)."""


def requirement(row) -> np.ndarray:
    """The requirement name of lower-bound row(s) ``row`` (rows from :data:`WALL_ROW` on are
    min_wall)."""
    return np.array(REQUIREMENTS)[np.minimum(row, len(REQUIREMENTS) - 1)]


@dataclass(frozen=True)
class UnitSection:
    """Properties of sections at scale 1 (arrays of one broadcast shape), see the module doc.

    Attributes:
        area: a, m^2 per m^2 of scale.
        stiffness_modulus: i (bending) or k (torsion), m^4 at scale 1 m.
        strength_modulus: z (bending) or q (torsion), m^3 at scale 1 m.
        buckling_stress: sigma_cr or tau_cr against the peak stress, Pa (``inf``: no mode).
        depth_ratio: depth dimension / scale.
        width_ratio: width dimension / scale.
        wall_ratio: each wall dimension / scale, stacked on a first axis (one row of ``inf``
            for solid sections).
        shear_area: a_s, the transverse shear area at scale 1 (peak shear V / (a_s s^2));
            ``inf`` where no transverse shear is checked (torsion).
        shear_buckling_stress: web shear buckling against that peak, Pa (``inf``: no mode).
        buckling_modes: the separate modes whose minimum is ``buckling_stress`` (see
            :attr:`LocalBuckling.bending_modes`); empty for one mode.
        member_section: the constants member buckling reads at scale 1 (None: not checked).
        section_family: the family id (it picks the buckling curves).
        outer_wall_ratio: the outer size / wall of the proportions (NaN where the family
            has none), against a demand's ``max_wall_ratio``.
        member: the properties a general member reads (bending and torsion together), or
            None for a shorthand case (:mod:`service.core.sizing.member`).
        torsion_buckling_stress: local buckling under torsion against the peak torsional
            shear stress, Pa (general members; ``inf``: no mode).
        shear_stiffness_area: k a, the Timoshenko shear area at scale 1 (Cowper's k at the
            material's Poisson's ratio): the shear deflection c_S P L / (G k a s^2) of a
            bending case; ``inf`` for none.
        compression_buckling_stress: the walls' local buckling stress in uniform
            compression, Pa (general members with an axial compression; ``inf``: none).
        web: what the interaction check reads of an I-section or a box in bending
            (:class:`~service.core.sizing.checks.interaction.WebSection`); None otherwise.
        dimensions: the sections' dimensions at scale 1, m (local checks read them:
            bearing, :func:`service.core.sizing.checks.bearing.bearing_scale`); None where
            not given.
    """

    area: np.ndarray
    stiffness_modulus: np.ndarray
    strength_modulus: np.ndarray
    buckling_stress: np.ndarray
    depth_ratio: np.ndarray
    width_ratio: np.ndarray
    wall_ratio: np.ndarray
    shear_area: np.ndarray | float = np.inf
    shear_buckling_stress: np.ndarray | float = np.inf
    buckling_modes: tuple[np.ndarray, ...] = ()
    member_section: MemberSection | None = None
    section_family: str = ""
    outer_wall_ratio: np.ndarray | float = np.nan
    member: MemberUnit | None = None
    torsion_buckling_stress: np.ndarray | float = np.inf
    shear_stiffness_area: np.ndarray | float = np.inf
    compression_buckling_stress: np.ndarray | float = np.inf
    web: WebSection | None = None
    dimensions: dict | None = None


@dataclass(frozen=True)
class ScaleBounds:
    """The scale limits of every (case, material, proportion) element.

    Attributes:
        lower: stacked lower bounds, shape (checks + walls, ...) in :data:`REQUIREMENTS`
            order, m (0 for a check the request does not ask for).
        upper_depth: the bound max_depth sets, m (``inf`` for none).
        upper_width: the bound max_width sets, m (``inf`` for none).
        scale: the smallest admissible scale, max of ``lower``, m.
        feasible: ``scale <= upper``.
        mass: rho a s^2 L at ``scale``, kg.
        parts: the smooth terms behind ``lower``, stacked on a first axis (stiffness; the
            bending or torsion strength and the transverse shear strength; each local
            buckling mode and web shear buckling; the walls): ``lower`` holds maxima of
            them, which have kinks where two terms cross; a gradient search follows the
            terms themselves. Where none follows them (``scale_bounds``' ``exact_parts``
            False), ``lower`` itself.
        layout: how many of ``parts`` (the first rows, the walls' follow) each check gives,
            in :data:`~service.core.sizing.checks.CHECK_NAMES` order (not an array: every
            element shares it); empty where ``parts`` is ``lower``.
    """

    lower: np.ndarray
    upper_depth: np.ndarray
    upper_width: np.ndarray
    scale: np.ndarray
    feasible: np.ndarray
    mass: np.ndarray
    parts: np.ndarray
    layout: tuple[int, ...] = ()

    @property
    def upper(self) -> np.ndarray:
        """The envelope's upper bound on the scale, m (``inf`` for none)."""
        return np.minimum(self.upper_depth, self.upper_width)

    @property
    def depth_limited(self) -> np.ndarray:
        """True where max_depth (not max_width) sets :attr:`upper`."""
        return self.upper_depth <= self.upper_width

    def _map(self, function) -> ScaleBounds:
        return ScaleBounds(**{name: function(getattr(self, name)) for name in BOUND_FIELDS},
                           layout=self.layout)

    def take(self, index: np.ndarray) -> ScaleBounds:
        """Elements ``index`` along the last axis (``index`` has the leading shape)."""
        where = (Ellipsis, *np.indices(index.shape, sparse=True), index)
        return self._map(lambda a: a[where])

    def every(self, stride: int) -> ScaleBounds:
        """Every ``stride``-th element along the last axis."""
        return self._map(lambda a: a[..., ::stride])

    def put(self, index: np.ndarray, part: ScaleBounds) -> ScaleBounds:
        """These bounds with their elements ``index`` (last axis) those of ``part``."""
        def put(name: str) -> np.ndarray:
            array = np.array(getattr(self, name), copy=True)
            array[..., index] = getattr(part, name)
            return array
        return ScaleBounds(**{name: put(name) for name in BOUND_FIELDS}, layout=self.layout)

    def where(self, condition: np.ndarray, other: ScaleBounds) -> ScaleBounds:
        """These bounds where ``condition`` holds, ``other``'s elsewhere."""
        return ScaleBounds(**{name: np.where(condition, getattr(self, name), getattr(other, name))
                              for name in BOUND_FIELDS}, layout=self.layout)


BOUND_FIELDS = ("lower", "upper_depth", "upper_width", "scale", "feasible", "mass", "parts")
"""The array fields of :class:`ScaleBounds` (all but ``layout``)."""


def scale_bounds(unit: UnitSection, materials: MaterialValues, demand: Demand,
                 exact_parts: bool = True, threshold=None,
                 skip: Mapping[str, int] | None = None) -> ScaleBounds:
    """Lower and upper scale bounds for every element (see the module docstring): each
    check's ``scale_bound`` in :data:`~service.core.sizing.checks.CHECKS` order (its row the
    largest of its parts, 0 where it does not bound the scale), then one row per wall.

    Args:
        unit: the sections at scale 1.
        materials: the material values (arrays broadcasting with ``unit``).
        demand: loads and limits.
        exact_parts: every part exact, as a gradient search following them needs (the
            polish). False where only the scale and what follows from it are read (a grid,
            a stencil): each check is then given the floor the checks before it set
            (:meth:`~service.core.sizing.checks.base.Found.floor`), and may return a lower
            bound at most that floor instead of its exact part where it cannot set the
            scale (member buckling skips its search there).
        threshold: with ``exact_parts`` False, a mass (kg, broadcasting with the elements)
            above which no exact scale is wanted: where the checks before one already give
            a heavier section, that check's lower bound may be anything up to its exact
            one (:meth:`~service.core.sizing.checks.base.Found.floor`), so such an
            element's scale and mass may come out below the exact ones, its mass still
            above the threshold; every other element's are exact. None: every element
            exact.
        skip: checks not evaluated, by name, each with the number of parts it gives
            (:attr:`ScaleBounds.layout`): NaN stands in for them, and for every bound
            that reads them (a search that reads some parts alone: the polish's trial
            points); a check that another one evaluated here reads (``Check.reads``) is
            evaluated all the same.
    """
    span = np.asarray(demand.span, dtype=float)
    density = materials.density

    def mass_at(scale):
        return density * unit.area * scale**2 * span

    def heavy(scale):
        return mass_at(scale) > threshold

    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        named: dict[str, list[np.ndarray]] = {}
        # each check sees the checks before it
        found = Found(named, exact_parts, None if threshold is None else heavy)
        skip = skipped(skip)
        for check in CHECKS:
            if skip and check.name in skip:
                named[check.name] = [np.array(np.nan)] * skip[check.name]
            elif check.scale_bound is not None:
                named[check.name] = list(check.scale_bound(unit, materials, demand, found)
                                         or ())
        # one lower-bound row per check, in CHECK_NAMES order (0 for one not asked for)
        groups = [named.get(name, []) for name in CHECK_NAMES]
        # One row per wall dimension (the first axis of wall_ratio), whatever min_wall's shape.
        walls = [np.asarray(demand.min_wall, dtype=float) / ratio for ratio in unit.wall_ratio]
        terms = (*(term for group in groups for term in group), *walls)
        shape = np.broadcast_shapes(*(np.shape(term) for term in terms),
                                    np.shape(unit.area), np.shape(density))
        lower = np.empty((WALL_ROW + len(walls),) + shape)
        if exact_parts:
            parts = np.empty((len(terms),) + shape)
            for row, term in enumerate(terms):
                parts[row] = term
            end = 0
            for row, group in enumerate(groups):
                start, end = end, end + len(group)
                # (a group of one part is that part: no reduction)
                lower[row] = (parts[start] if len(group) == 1
                              else parts[start:end].max(axis=0) if group else 0.0)
            lower[WALL_ROW:] = parts[end:]
        else:
            # no search follows the parts: ``lower`` stands for them (one copy less)
            for row, group in enumerate(groups):
                lower[row] = functools.reduce(np.maximum, group) if group else 0.0
            for row, wall in enumerate(walls, start=WALL_ROW):
                lower[row] = wall
            parts = lower
        scale = lower.max(axis=0)
        mass = mass_at(scale)
        depth_upper = _shaped(demand.max_depth / unit.depth_ratio, shape)
        width_upper = _shaped(demand.max_width / unit.width_ratio, shape)
        feasible = (
            (scale <= np.minimum(depth_upper, width_upper) * (1.0 + 1e-12))
            & np.isfinite(mass) & (scale > 0)
        )
    return ScaleBounds(lower, depth_upper, width_upper, scale, feasible, mass, parts,
                       tuple(len(group) for group in groups) if exact_parts else ())


def skipped(skip: Mapping[str, int] | None) -> dict[str, int]:
    """The checks of ``skip`` (as for :func:`scale_bounds`) that no check evaluated reads
    (``Check.reads``): those :func:`scale_bounds` leaves out."""
    if not skip:
        return {}
    return {name: count for name, count in skip.items()
            if not any(name in check.reads for check in CHECKS if check.name not in skip)}


def _shaped(value: np.ndarray, shape: tuple[int, ...]) -> np.ndarray:
    """``value`` broadcast to ``shape`` (itself where it has that shape: ``np.broadcast_to``
    costs as much as several steps of arithmetic at the sizes of a polish)."""
    return value if np.shape(value) == shape else np.broadcast_to(value, shape)
