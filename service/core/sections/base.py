"""The section family abstraction shared by every cross-section module.

A family is a small object: its dimension names, vectorised property functions and its local
buckling model. Every function takes a mapping of dimension name -> numpy array (or float), all
broadcastable to one shape ``S``, and returns arrays of shape ``S`` (or the broadcast of ``S``
with the material arrays' shape). All values are SI: metres, m^2, m^4, m^3, Pa.

Adding a family (channel, T, elliptical tube) means one module with one subclass of
:class:`SectionFamily`, registered in ``service/core/sections/__init__.py``.
"""

from __future__ import annotations

import copy
import math
from abc import ABC, abstractmethod
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any, ClassVar

import numpy as np

from service.core.errors import GeometryError
from service.core.sections.orthotropic import OrthotropicElastic

Dimensions = Mapping[str, np.ndarray | float]
"""Dimension name -> value in metres (arrays broadcast against each other)."""


@dataclass(frozen=True)
class Dimension:
    """One named dimension of a family.

    Attributes:
        name: the JSON key, e.g. ``"outer_diameter"`` (metres).
        description: one line for the API listing.
    """

    name: str
    description: str


@dataclass(frozen=True)
class Elastic:
    """Elastic constants of a material, as arrays that broadcast with the dimensions.

    Attributes:
        youngs_modulus: E, Pa.
        shear_modulus: G, Pa.
        poisson_ratio: nu, dimensionless.
    """

    youngs_modulus: np.ndarray | float
    shear_modulus: np.ndarray | float
    poisson_ratio: np.ndarray | float


def _as_float_arrays(result: Any) -> None:
    """Make every field of a frozen result an ndarray (numpy turns 0-d results into scalars)."""
    for name in result.__dataclass_fields__:
        object.__setattr__(result, name, np.asarray(getattr(result, name), dtype=float))


@dataclass(frozen=True)
class SectionProperties:
    """Geometric properties of sections, every field an array of the dimensions' shape.

    Attributes:
        area: A, m^2.
        second_moment_major: I about the major (bending) axis, m^4. "Major" is the axis of
            bending in the plane of ``depth`` for families that have a depth.
        second_moment_minor: I about the minor axis, m^4.
        section_modulus_major: elastic section modulus Z = I / c_max about the major axis, m^3.
        section_modulus_minor: elastic section modulus about the minor axis, m^3.
        plastic_modulus_major: plastic section modulus about the major axis, m^3.
        torsion_constant: K, m^4, with twist rate = T / (G K).
        torsion_modulus: Q, m^3, with peak shear stress = T / Q.
    """

    area: np.ndarray
    second_moment_major: np.ndarray
    second_moment_minor: np.ndarray
    section_modulus_major: np.ndarray
    section_modulus_minor: np.ndarray
    plastic_modulus_major: np.ndarray
    torsion_constant: np.ndarray
    torsion_modulus: np.ndarray

    def __post_init__(self) -> None:
        _as_float_arrays(self)


@dataclass(frozen=True)
class ShapeFactors:
    """Shape factors relative to a solid square of the same area (1 for that square).

    Attributes:
        bending_stiffness: 12 I / A^2 (major axis), dimensionless.
        bending_strength: 6 Z / A^1.5 (major axis), dimensionless.
        torsion_stiffness: K / K_square(A), dimensionless.
        torsion_strength: Q / Q_square(A), dimensionless.
    """

    bending_stiffness: np.ndarray
    bending_strength: np.ndarray
    torsion_stiffness: np.ndarray
    torsion_strength: np.ndarray

    def __post_init__(self) -> None:
        _as_float_arrays(self)


@dataclass(frozen=True)
class LocalBuckling:
    """Local (wall, flange, face) buckling limits expressed against the section's peak stress.

    Each field is the value of the *peak section stress* at which the first element buckles:
    for bending, compared with M / Z_major; for torsion, compared with T / Q. A family whose
    buckling element sees less than the peak (an I-section web) divides the element's critical
    stress by that element's stress ratio, so callers compare one number. ``np.inf`` where the
    family has no local buckling mode (solid sections).

    Attributes:
        bending: Pa, against the peak bending stress M / Z_major.
        torsion: Pa, against the peak shear stress T / Q.
        shear: Pa, against the peak transverse shear stress V / shear_area (web shear
            buckling); ``inf`` where the family has no such mode.
        bending_modes: the separate modes whose minimum is ``bending`` (the compression
            flange and the web, say), each against the same peak stress; empty when
            ``bending`` is one mode. Each mode is a smooth function of the dimensions where
            their minimum has kinks, which a gradient search over proportions needs.
        torsion_modes: likewise for ``torsion``.
    """

    bending: np.ndarray
    torsion: np.ndarray
    shear: np.ndarray | float = np.inf
    bending_modes: tuple[np.ndarray, ...] = ()
    torsion_modes: tuple[np.ndarray, ...] = ()

    def __post_init__(self) -> None:
        for name in ("bending", "torsion", "shear"):
            object.__setattr__(self, name, np.asarray(getattr(self, name), dtype=float))
        for name in ("bending_modes", "torsion_modes"):
            object.__setattr__(self, name, tuple(np.asarray(mode, dtype=float)
                                                 for mode in getattr(self, name)))

    def modes(self, loading: str) -> tuple[np.ndarray, ...]:
        """The separate modes of ``loading`` ("bending" or "torsion"), at least one."""
        modes = self.bending_modes if loading == "bending" else self.torsion_modes
        return modes or (self.bending if loading == "bending" else self.torsion,)


@dataclass(frozen=True)
class RatioBound:
    """Practical limits of one dimension as a multiple of the family's scale dimension: a
    proportion rule of the contract (GET /v1/sections lists it as ``"<dimension>/<scale>"``;
    a design request may narrow it, or widen it up to ``widest_low`` and ``widest_high``).

    Attributes:
        dimension: the dimension name, e.g. ``"wall"``.
        low: smallest ratio dimension / scale dimension (exclusive where geometry demands).
        high: largest ratio.
        source: where the limit comes from ("common practice" or a published reference).
        widest_low: the smallest ratio at which the family's physics (its property and
            buckling formulas, and the checks the sizing makes) still holds; ``low`` when
            the rule may only be narrowed.
        widest_high: likewise the largest ratio; ``high`` when it may only be narrowed.
        widest_source: why the physics stops holding beyond ``widest_low`` and
            ``widest_high``.
    """

    dimension: str
    low: float
    high: float
    source: str
    widest_low: float = math.nan
    widest_high: float = math.nan
    widest_source: str = ""

    def __post_init__(self) -> None:
        if math.isnan(self.widest_low):
            object.__setattr__(self, "widest_low", self.low)
        if math.isnan(self.widest_high):
            object.__setattr__(self, "widest_high", self.high)
        if not 0 < self.widest_low <= self.low < self.high <= self.widest_high:
            raise ValueError(f"ratio bound of {self.dimension}: need 0 < widest_low <= low "
                             "< high <= widest_high")


@dataclass(frozen=True)
class ProportionRule:
    """A geometric condition between dimensions that every real section of a family meets.

    Attributes:
        dimension: the dimension blamed when the rule fails (the error's field path).
        uses: the dimensions the rule reads, in the order ``holds`` takes them.
        holds: ``holds(*arrays) -> bool array``, True where the geometry is real.
        message: what the dimension must satisfy, e.g. ``"must be less than half of depth"``.
        margins: ``margins(*arrays) -> tuple of arrays``, log(limit / value) of each smooth
            piece of the rule, positive where ``holds``: the rule as constraints a gradient
            search over proportions can follow up to the boundary (where a thick-walled
            optimum lies). None: the search only filters on ``holds``.
    """

    dimension: str
    uses: tuple[str, ...]
    holds: Callable[..., np.ndarray]
    message: str
    margins: Callable[..., tuple[np.ndarray, ...]] | None = None


class SectionFamily(ABC):
    """One cross-section family.

    Class attributes:
        id: the contract's family id, e.g. ``"round_tube"``.
        description: one line for GET /v1/sections.
        dimensions: the family's dimensions in contract order.
        loadings: the loadings it carries, from {"bending", "torsion", "tension", "compression"}.
        scale_dimension: the dimension the sizing engine scales; every other dimension is a
            ratio of it (see :attr:`ratio_bounds`).
        ratio_bounds: practical proportion limits for the other dimensions.
        depth_dimension: the dimension compared with an envelope's max_depth.
        width_dimension: the dimension compared with max_width (may equal depth_dimension).
        wall_dimensions: the dimensions that a min_wall requirement applies to (empty for
            solid sections).
        fixed_dimensions: dimensions the sizing engine sets directly (from the envelope)
            instead of scaling with :attr:`scale_dimension` (the sandwich panel's width).
        rules: geometric conditions between dimensions, checked by :meth:`validate` after
            every dimension is a positive finite number.
        kinked_loadings: the loadings under which a property or a single buckling mode has
            a kink in the dimensions (a formula with branches); a gradient search over the
            proportions then samples around each point to see them. Elsewhere every term
            is smooth: :class:`LocalBuckling` keeps the modes whose minimum has kinks apart.
        lateral_edge: the ratio dimension and its value at which the section's minor
            second moment reaches its major one (None: no such edge within the ratio
            bounds). Beyond it the section cannot buckle laterally and the member buckling
            check of a bent member drops out (``stability.lateral_properties``), so the
            lightest design can sit on that edge, a step in the bounds that a gradient
            search does not see (:func:`~service.core.sizing.proportions.refine` tries it).
    """

    id: ClassVar[str]
    description: ClassVar[str]
    dimensions: ClassVar[tuple[Dimension, ...]]
    loadings: ClassVar[tuple[str, ...]]
    scale_dimension: ClassVar[str]
    ratio_bounds: ClassVar[tuple[RatioBound, ...]]
    depth_dimension: ClassVar[str]
    width_dimension: ClassVar[str]
    wall_dimensions: ClassVar[tuple[str, ...]]
    fixed_dimensions: ClassVar[tuple[str, ...]] = ()
    rules: ClassVar[tuple[ProportionRule, ...]] = ()
    kinked_loadings: ClassVar[tuple[str, ...]] = ()
    lateral_edge: ClassVar[tuple[str, float] | None] = None

    def ratio_name(self, bound: RatioBound) -> str:
        """The contract's name of a proportion rule: ``"<dimension>/<scale dimension>"``."""
        return f"{bound.dimension}/{self.scale_dimension}"

    def with_ratio_bounds(self, bounds: tuple[RatioBound, ...]) -> SectionFamily:
        """This family with other proportion rules (a request's narrowed or widened ones):
        a copy whose :attr:`ratio_bounds` are ``bounds``; everything else is shared."""
        if tuple(bound.dimension for bound in bounds) != tuple(
                bound.dimension for bound in self.ratio_bounds):
            raise ValueError(f"{self.id}: the rules must keep the family's ratio dimensions")
        clone = copy.copy(self)
        clone.__dict__["ratio_bounds"] = tuple(bounds)
        return clone

    @property
    def dimension_names(self) -> tuple[str, ...]:
        """Every dimension name of the family, in its order."""
        return tuple(d.name for d in self.dimensions)

    def validate(self, dims: Dimensions) -> None:
        """Raise :class:`~service.core.errors.GeometryError` naming every bad dimension.

        Checks every element of the arrays; the error's field paths are dimension names.
        A dimension is bad when it is missing, not one of the family's, not a number, not
        positive and finite, or breaks one of :attr:`rules` (rules are checked only between
        dimensions that are themselves good, so each message points at the real culprit).
        """
        errors: dict[str, list[str]] = {}
        expected = ", ".join(self.dimension_names)
        for name in dims:
            if name not in self.dimension_names:
                errors[name] = [f"not a dimension of {self.id} (expected {expected})"]
        good: dict[str, np.ndarray] = {}
        for name in self.dimension_names:
            if name not in dims:
                errors[name] = [f"missing: {self.id} needs {expected}"]
                continue
            try:
                value = np.asarray(dims[name], dtype=float)
            except (TypeError, ValueError):
                errors[name] = ["must be a number (metres)"]
                continue
            bad = ~(np.isfinite(value) & (value > 0))
            if bad.any():
                errors[name] = [_count("must be a positive finite length in metres", bad)]
            else:
                good[name] = value
        for rule in self.rules:
            if rule.dimension in errors or not all(name in good for name in rule.uses):
                continue
            try:
                bad = ~np.asarray(rule.holds(*(good[name] for name in rule.uses)))
            except ValueError:
                errors[rule.dimension] = [f"array shape does not match {', '.join(rule.uses)}"]
                continue
            if bad.any():
                errors[rule.dimension] = [_count(rule.message, bad)]
        if not errors:
            try:
                np.broadcast_shapes(*(value.shape for value in good.values()))
            except ValueError:
                errors = {name: ["array shapes do not broadcast together"] for name in good}
        if errors:
            raise GeometryError(errors)

    def arrays(self, dims: Dimensions) -> tuple[np.ndarray, ...]:
        """The dimensions as float arrays in contract order, broadcast to one shape ``S``."""
        values = tuple(np.asarray(dims[name], dtype=float) for name in self.dimension_names)
        shape = values[0].shape
        if all(value.shape == shape for value in values):   # one shape already: no views
            return values
        return tuple(np.broadcast_arrays(*values))

    def overall_depth(self, dims: Dimensions) -> np.ndarray:
        """Outside size in the plane of bending, compared with an envelope's max_depth, m."""
        return np.asarray(dims[self.depth_dimension], dtype=float)

    def overall_width(self, dims: Dimensions) -> np.ndarray:
        """Outside size across the plane of bending, compared with max_width, m."""
        return np.asarray(dims[self.width_dimension], dtype=float)

    @abstractmethod
    def properties(self, dims: Dimensions) -> SectionProperties:
        """Geometric properties; dims are assumed valid."""

    def sizing_properties(self, dims: Dimensions, loading: str
                          ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """What sizing reads of :meth:`properties` for ``loading``: A with I_major and
        Z_major ("bending") or K and Q ("torsion"). Families whose other properties cost a
        series (Saint-Venant torsion of a rectangle) override it to skip them."""
        props = self.properties(dims)
        if loading == "bending":
            return props.area, props.second_moment_major, props.section_modulus_major
        return props.area, props.torsion_constant, props.torsion_modulus

    @abstractmethod
    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """A_s, m^2, such that the peak transverse shear stress of a shear force V is V / A_s
        (elastic beam theory, tau = V Q / (I t), at the neutral axis); ``second_moment``:
        the sections' I about the major axis where the caller has it (a family whose A_s
        reads I does not compute it again)."""

    @abstractmethod
    def local_buckling(
        self, dims: Dimensions, material: Elastic | OrthotropicElastic,
        core: Elastic | None = None, shear_area=None
    ) -> LocalBuckling:
        """Critical peak stresses for local buckling (``core`` only for sandwich panels;
        ``shear_area``: the sections' :meth:`shear_area` where the caller has it, for a
        family whose web shear mode reads it)."""

    def holds(self, dims: Dimensions) -> np.ndarray:
        """True where the dimensions meet every one of :attr:`rules` (a real section), without
        raising: the array form of :meth:`validate`'s proportion checks, for searches."""
        shape = np.broadcast_shapes(*(np.shape(v) for v in dims.values()))
        holds = np.ones(shape, dtype=bool)
        for rule in self.rules:
            holds &= np.asarray(rule.holds(*(np.asarray(dims[name]) for name in rule.uses)))
        return holds

    def rule_margins(self, dims: Dimensions) -> list[np.ndarray]:
        """The smooth log-margins of every rule that has them (see :class:`ProportionRule`),
        each in the broadcast shape of the dimensions it uses."""
        return [margin for rule in self.rules if rule.margins is not None
                for margin in rule.margins(*(np.asarray(dims[name]) for name in rule.uses))]

    def wall_thickness(self, dims: Dimensions) -> np.ndarray:
        """The thinnest of :attr:`wall_dimensions` (``inf`` for solid sections), metres."""
        if not self.wall_dimensions:
            shape = np.broadcast(*[np.asarray(v) for v in dims.values()]).shape
            return np.full(shape, np.inf)
        return np.minimum.reduce(
            [np.asarray(dims[name], dtype=float) for name in self.wall_dimensions]
        )


def _count(message: str, bad: np.ndarray) -> str:
    """The message, with how many array elements fail it when there are several."""
    if bad.size == 1:
        return message
    return f"{message} ({int(bad.sum())} of {bad.size} values are not)"
