"""Closed-form minimum scale of a self-similar section for every requirement.

Fix the dimensionless proportions p of a section (every dimension but the scale dimension is a
ratio of it). At scale s the properties are A = a(p) s^2, I = i(p) s^4, Z = z(p) s^3,
K = k(p) s^4, Q = q(p) s^3, and the local buckling stress depends on p and the elastic
constants only. Each requirement then fixes a smallest s in closed form:

- bending stiffness  c_D P L^3 / (E i s^4) <= delta_max
- bending strength   M SF / (z s^3) <= sigma_f            (M = c_M P L)
- local buckling     M SF / (z s^3) <= sigma_cr(p, E, nu)
- torsion stiffness  T L / (G k s^4) <= theta_max
- torsion strength   T SF / (q s^3) <= tau_f, buckling likewise with tau_cr
- minimum wall       wall_ratio(p) s >= t_min

and the envelope an upper bound s <= max_depth / depth_ratio(p) (and width). Self-weight
adds the uniform load W = rho a g L s^2 on the same supports (superposition, see
:mod:`service.core.loadcases`): the stiffness condition becomes a quadratic in s^2, solved
exactly, and the moment conditions the cubic alpha s^3 - beta s^2 - gamma >= 0, which has a
single positive root (one sign change, Descartes' rule), given in closed form by Cardano's
formula (see :func:`cubic_scale`).

Arrays: every array argument broadcasts to one shape; the engine uses (materials, proportions)
and a :class:`Demand` whose fields may carry a leading case axis of shape (C, 1, 1), or a row
axis of shape (R, 1) when the material rows are (case, material) pairs (sweeps).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import cast

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sizing import bearing_scale as bearing_rows
from service.core.sizing.checks import CHECK_NAMES
from service.core.sizing.checks.interaction import WebSection, column_scale, interaction_scale
from service.core.sizing.checks.member_buckling import applies, buckling_cases, has_axial_force
from service.core.sizing.demand import Demand
from service.core.sizing.limits import MIN_WALL
from service.core.sizing.member import MemberUnit, member_scale_parts
from service.core.sizing.member_stability import general_member_scale
from service.core.sizing.values import MaterialValues
from service.core.stability.columns import BENDING_END_CONDITIONS, EFFECTIVE_LENGTH_FACTORS
from service.core.stability.member import MemberMaterial, MemberSection
from service.core.stability.scaling import minimum_scale

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
            bearing, :mod:`service.core.sizing.bearing_scale`); None where not given.
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
            terms themselves.
    """

    lower: np.ndarray
    upper_depth: np.ndarray
    upper_width: np.ndarray
    scale: np.ndarray
    feasible: np.ndarray
    mass: np.ndarray
    parts: np.ndarray

    @property
    def upper(self) -> np.ndarray:
        """The envelope's upper bound on the scale, m (``inf`` for none)."""
        return np.minimum(self.upper_depth, self.upper_width)

    @property
    def depth_limited(self) -> np.ndarray:
        """True where max_depth (not max_width) sets :attr:`upper`."""
        return self.upper_depth <= self.upper_width

    def _map(self, function) -> ScaleBounds:
        return ScaleBounds(**{name: function(getattr(self, name)) for name in BOUND_FIELDS})

    def take(self, index: np.ndarray) -> ScaleBounds:
        """Elements ``index`` along the last axis (``index`` has the leading shape)."""
        where = (Ellipsis, *np.indices(index.shape, sparse=True), index)
        return self._map(lambda a: a[where])

    def every(self, stride: int) -> ScaleBounds:
        """Every ``stride``-th element along the last axis."""
        return self._map(lambda a: a[..., ::stride])

    def where(self, condition: np.ndarray, other: ScaleBounds) -> ScaleBounds:
        """These bounds where ``condition`` holds, ``other``'s elsewhere."""
        return ScaleBounds(**{name: np.where(condition, getattr(self, name), getattr(other, name))
                              for name in BOUND_FIELDS})


BOUND_FIELDS = ("lower", "upper_depth", "upper_width", "scale", "feasible", "mass", "parts")


def cubic_scale(alpha, beta, gamma) -> np.ndarray:
    """Smallest s >= 0 with alpha s^3 - beta s^2 - gamma >= 0, for alpha > 0, beta, gamma >= 0.

    ``alpha = inf`` (an unlimited stress) gives 0. Cardano's formula: with b = beta / alpha,
    c = gamma / alpha and s = x + b / 3, the cubic is x^3 + p x + q = 0 (p = -b^2 / 3,
    q = -(2 b^3 / 27 + c)), whose discriminant (q/2)^2 + (p/3)^3 = c (b^3 / 27 + c / 4) is
    never negative: one real root, x = u + v with u = cbrt(-q/2 + sqrt(disc)) and
    v = b^2 / (9 u) (u v = -p / 3, which avoids the cancellation in the second cube root).
    Two Newton steps then take the root to round-off. Every element is computed on its own,
    so a root does not depend on which other elements share the array.
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if not np.any(beta):
            return np.cbrt(gamma / alpha)
        alpha, beta, gamma = np.broadcast_arrays(
            *(np.asarray(x, dtype=float) for x in (alpha, beta, gamma))
        )
        unlimited = ~np.isfinite(alpha)
        alpha = np.where(unlimited, 1.0, alpha)
        b, c = beta / alpha, gamma / alpha
        half_q = b**3 / 27.0 + c / 2.0                       # -q / 2
        u = np.cbrt(half_q + np.sqrt(c * (b**3 / 27.0 + c / 4.0)))
        scale = u + np.where(u > 0, b * b / (9.0 * u), 0.0) + b / 3.0
        for _ in range(2):
            value = (scale - b) * scale**2 - c
            slope = scale * (3.0 * scale - 2.0 * b)
            scale = scale - np.divide(value, slope, out=np.zeros_like(value), where=slope > 0)
    return np.where(unlimited, 0.0, scale)


def shear_scale(capacity, shear_per_scale2, shear):
    """Smallest s with V(s) / (a_s s^2) <= allowed, V(s) = V + V' s^2: s^2 (a_s allowed - V')
    >= V. ``capacity`` is a_s x allowed / SF; no scale works when V' reaches it."""
    with np.errstate(divide="ignore", invalid="ignore"):
        margin = capacity - shear_per_scale2
        return np.where(margin > 0, np.sqrt(shear / margin), np.inf)


def scale_bounds(unit: UnitSection, density, stiffness_modulus_material, strength, demand: Demand,
                 shear_strength=np.inf, materials: MaterialValues | None = None,
                 member_material: MemberMaterial | None = None, smooth: bool = True
                 ) -> ScaleBounds:
    """Lower and upper scale bounds for every element (see the module docstring).

    Args:
        unit: the sections at scale 1.
        density: rho, kg/m^3.
        stiffness_modulus_material: E (bending) or G (torsion), Pa.
        strength: sigma_f (bending) or tau_f (torsion), Pa.
        demand: loads and limits.
        shear_strength: tau_f for the transverse shear of bending cases, Pa. Shear joins the
            strength row, web shear buckling the local buckling row (each row is the larger
            of its two scales).
        materials: every material value (a general member reads them all:
            :func:`service.core.sizing.member.member_scale_parts`).
        member_material: E, G, f and buckling curves for member buckling (None: not
            checked; see :func:`member_scale`).
        smooth: every part exact, as a gradient search following them needs (the polish);
            False where only the scale and what follows from it are read (a grid, a
            stencil): member buckling is then searched only where it sets the scale (see
            :func:`member_scale`'s ``floor``), and its part elsewhere is a lower bound.
    """
    span = np.asarray(demand.span, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        named: dict[str, list]
        if demand.member is not None and unit.member is not None:
            named = member_scale_parts(
                unit.member, materials, demand, unit.buckling_modes or (unit.buckling_stress,),
                unit.shear_buckling_stress, unit.torsion_buckling_stress,
                unit.compression_buckling_stress)
            if unit.member_section is not None and member_material is not None and applies(
                    demand):
                named["member_buckling"] = [general_member_scale(
                    unit.member_section, density, member_material, demand,
                    np.maximum.reduce(named["strength"]))]
        else:
            scales = _weighted_scales if demand.self_weight else _unweighted_scales
            shear_flexibility = (
                0.0 if materials is None or not demand.bending
                else stiffness_modulus_material * unit.stiffness_modulus
                / (materials.shear_modulus * unit.shear_stiffness_area))
            stiffness, strength_parts, buckling_parts = scales(
                unit, stiffness_modulus_material, strength, demand, shear_strength, density,
                shear_flexibility)
            if not np.all(np.isfinite(demand.stiffness_limit)):
                stiffness = np.where(np.isfinite(demand.stiffness_limit), stiffness, 0.0)
            floor = None if smooth else np.maximum.reduce(
                [stiffness, *strength_parts, *buckling_parts])
            member = member_scale(unit, density, member_material, demand, strength_parts[0],
                                  floor)
            named = {"stiffness": [stiffness], "strength": strength_parts,
                     "local_buckling": buckling_parts,
                     "member_buckling": [] if member is None else [member]}
        if unit.web is not None and materials is not None:
            named["interaction"] = _interaction_scales(unit, materials, demand)
        if unit.dimensions is not None:
            bearing = bearing_rows.bearing_scale(unit.section_family, unit.dimensions, unit.area,
                                    materials, density, demand)
            if bearing is not None:
                named["bearing"] = [bearing]
        # one lower-bound row per check, in CHECK_NAMES order (0 for one not asked for)
        groups = [named.get(name, []) for name in CHECK_NAMES]
        # One row per wall dimension (the first axis of wall_ratio), whatever min_wall's shape.
        walls = [np.asarray(demand.min_wall, dtype=float) / ratio for ratio in unit.wall_ratio]
        terms = (*(term for group in groups for term in group), *walls)
        shape = np.broadcast_shapes(*(np.shape(term) for term in terms),
                                    np.shape(unit.area), np.shape(density))
        parts = np.empty((len(terms),) + shape)
        for row, term in enumerate(terms):
            parts[row] = term
        lower = np.empty((WALL_ROW + len(walls),) + shape)
        end = 0
        for row, group in enumerate(groups):
            start, end = end, end + len(group)
            lower[row] = parts[start:end].max(axis=0) if group else 0.0
        lower[WALL_ROW:] = parts[end:]
        scale = lower.max(axis=0)
        mass = density * unit.area * scale**2 * span
        depth_upper = np.broadcast_to(demand.max_depth / unit.depth_ratio, shape)
        width_upper = np.broadcast_to(demand.max_width / unit.width_ratio, shape)
        feasible = (
            (scale <= np.minimum(depth_upper, width_upper) * (1.0 + 1e-12))
            & np.isfinite(mass) & (scale > 0)
        )
    return ScaleBounds(lower, depth_upper, width_upper, scale, feasible, mass, parts)


def _interaction_scales(unit: UnitSection, materials: MaterialValues, demand: Demand
                        ) -> list[np.ndarray]:
    """The interaction check's scale parts (:func:`~service.core.sizing.checks.interaction
    .interaction_scale`) with the peaks of a general member (its M, V, T and N, the
    self-weight's per s^2) or of a shorthand case (its coefficients; a bending case's
    ``axial_force``)."""
    web = cast(WebSection, unit.web)
    weight = (materials.density * unit.area * STANDARD_GRAVITY) if demand.self_weight else 0.0
    if demand.member is not None and unit.member is not None:
        member, general = demand.member, unit.member
        return interaction_scale(
            web, general.section_modulus, general.shear_area, general.area,
            general.torsion_modulus, materials, demand.safety_factor, demand.local_buckling,
            member.moment, member.weight_moment * weight, member.shear,
            member.weight_shear * weight, member.torque, member.axial)
    case, span, action, factor = _case_values(demand)
    if case.loading == "compression":       # a column: its axial force alone
        return column_scale(web, unit.area, materials, factor, demand.local_buckling, action)
    return interaction_scale(
        web, unit.strength_modulus, unit.shear_area, unit.area, np.inf, materials, factor,
        demand.local_buckling, case.moment_coefficient * action * span,
        case.uniform.moment_coefficient * weight * span * span,
        case.shear_coefficient * action, case.uniform.shear_coefficient * weight * span,
        0.0, np.asarray(demand.axial_force, dtype=float))


def member_scale(unit: UnitSection, density, material: MemberMaterial | None, demand: Demand,
                 strength_scale, floor=None) -> np.ndarray | None:
    """The smallest scale whose member buckling check holds (lateral-torsional buckling of
    a bending case, flexural buckling of a column about its weaker axis:
    :mod:`service.core.sizing.checks.member_buckling`), or None where it is not asked for.

    No closed form exists (M_cr mixes powers of s under a root, chi_LT solves a quadratic):
    :func:`service.core.stability.scaling.minimum_scale` finds it for every element at once.
    It starts from the strength's scale ``strength_scale`` (chi = 1), where member buckling
    is never weaker, so the root lies at or above it and near it. 0 where a beam's section
    cannot buckle laterally (its M_b = Z f is the strength check already).

    With ``floor`` (m, the largest of the other checks' scales), the check is first made at
    the floor: where it holds there, member buckling cannot set the scale, and a lower bound
    at most the floor stands in for the root (``minimum_scale``'s ``ceiling``) without a
    search; elsewhere the search starts from the floor.
    """
    if unit.member_section is None or material is None or not applies(demand):
        return None
    case, span, action, factor = _case_values(demand)
    start = np.where(np.isfinite(strength_scale) & (strength_scale > 0), strength_scale, 1.0)
    column = case.loading == "compression"   # flexural buckling about the weaker axis
    moment = 0.0 if column else case.moment_coefficient * action * span * factor
    weight_moment = (case.uniform.moment_coefficient * density * unit.area * STANDARD_GRAVITY
                     * span * span * factor if demand.self_weight and not column else 0.0)
    axial = -action * factor if column else np.asarray(demand.axial_force) * factor
    shape = np.broadcast_shapes(np.shape(start), np.shape(unit.member_section.area),
                                np.shape(moment), np.shape(weight_moment), np.shape(axial),
                                np.shape(material.youngs_modulus))
    # Without an axial force only sections that can buckle laterally need the search (the
    # others' M_b = Z f is the strength row): it runs on those elements alone.
    chosen = (np.ones(shape, dtype=bool) if column or has_axial_force(demand)
              else np.broadcast_to(unit.member_section.lateral.susceptible, shape))
    scale = np.zeros(shape)
    if not chosen.any():
        return scale
    index = np.nonzero(chosen)

    def pick(array):
        return np.broadcast_to(array, shape)[index]

    begin = pick(start)
    ceiling = None if floor is None else pick(floor) / begin
    scales = [minimum_scale(unit.member_section.at(shape, index).scaled(begin),
                            material.at(shape, index), case_id, pick(span),
                            moment=pick(moment),
                            self_weight_moment=pick(np.asarray(weight_moment) * start**2),
                            axial_force=pick(axial), end_conditions=demand.end_conditions,
                            restraint=demand.lateral_restraint,
                            load_position=demand.load_position, ceiling=ceiling)
              for case_id in (("column",) if column else buckling_cases(demand))]
    scale[index] = begin * (np.maximum.reduce(scales) if len(scales) > 1 else scales[0])
    return scale


def root_scale(need, capacity, power: int) -> np.ndarray:
    """Smallest s >= 0 with capacity s^power >= need, for power 2, 3 or 4, as
    need^(1/power) x capacity^(-1/power): ``inf`` where the capacity is not positive, 0 where
    it is unlimited. The two roots are taken on their own arrays (a case's demand, a
    material's and proportion's capacity), so a grid over cases x materials x proportions
    takes them once per case and once per material and proportion."""
    with np.errstate(divide="ignore", invalid="ignore"):
        if power == 4:
            root, unit = np.sqrt(np.sqrt(need)), 1.0 / np.sqrt(np.sqrt(capacity))
        elif power == 3:
            root, unit = np.cbrt(need), np.cbrt(1.0 / capacity)
        else:
            root, unit = np.sqrt(need), 1.0 / np.sqrt(capacity)
        return root * np.where(capacity <= 0, np.inf, unit)


def _unweighted_scales(unit: UnitSection, stiffness_modulus_material, strength,
                       demand: Demand, shear_strength, density, shear_flexibility=0.0):
    """The stiffness scale and the strength and buckling scales without self-weight: each
    a root of (need of the case) / (capacity of the material and proportions), see
    :func:`root_scale`; a bending stiffness with shear deformation (``shear_flexibility``
    psi = E i / (G k a), m^2, > 0) a quadratic in s^2 (:func:`_timoshenko_scale`).
    ``density`` is not needed."""
    case, span, action, factor = _case_values(demand)
    limit = demand.stiffness_limit
    if demand.axial:
        # A s^2 carries P: extension P L / (E A) <= delta, P SF / A <= f, and a column's
        # walls P SF / A <= sigma_cr (uniform compression; stability.wall_compression)
        stiffness = root_scale(action * span / limit,
                               stiffness_modulus_material * unit.stiffness_modulus, 2)
        strength_parts = [root_scale(action * factor, unit.strength_modulus * strength, 2)]
        buckling_parts = ([root_scale(action * factor, unit.area * unit.buckling_stress, 2)]
                          if demand.local_buckling and demand.case.loading == "compression"
                          else [])
        return stiffness, strength_parts, buckling_parts
    if demand.bending:
        stiffness = _timoshenko_scale(
            stiffness_modulus_material * unit.stiffness_modulus * limit, 0.0,
            case.shear_deflection_coefficient * action * span * shear_flexibility,
            case.deflection_coefficient * action * span**3
            + limit * _amplification_term(demand, span))
        moment = case.moment_coefficient * action * span
        shear = case.shear_coefficient * action
    else:
        stiffness = root_scale(action * span / limit,
                               stiffness_modulus_material * unit.stiffness_modulus, 4)
        moment, shear = action, None
    strength_parts = [root_scale(moment * factor, unit.strength_modulus * strength, 3)]
    if shear is not None:
        strength_parts.append(root_scale(shear * factor, unit.shear_area * shear_strength, 2))
    buckling_parts = []
    if demand.local_buckling:
        modes = unit.buckling_modes or (unit.buckling_stress,)
        buckling_parts = [root_scale(moment * factor, unit.strength_modulus * mode, 3)
                          for mode in modes]
        if shear is not None:
            buckling_parts.append(root_scale(
                shear * factor, unit.shear_area * unit.shear_buckling_stress, 2))
    return stiffness, strength_parts, buckling_parts


def _weighted_scales(unit: UnitSection, stiffness_modulus_material, strength,
                     demand: Demand, shear_strength, density, shear_flexibility=0.0):
    """The stiffness scale and the strength and buckling scales with self-weight (see the
    module docstring): a quadratic in s^2 (with the shear deflection of
    ``shear_flexibility``, as :func:`_unweighted_scales`), cubics and shear roots."""
    case, span, action, factor = _case_values(demand)
    weight_per_scale2 = density * unit.area * STANDARD_GRAVITY * span
    if demand.bending:
        uniform = case.uniform
        # Quadratic in u = s^2: E i delta u^2 - c_Du W' L^3 u - c_D P L^3 >= 0, with the
        # shear deflection (c_S P + c_Su W' u) L psi u on the left (Timoshenko)
        stiffness = _timoshenko_scale(
            stiffness_modulus_material * unit.stiffness_modulus * demand.stiffness_limit,
            uniform.shear_deflection_coefficient * weight_per_scale2 * span * shear_flexibility,
            uniform.deflection_coefficient * weight_per_scale2 * span**3
            + case.shear_deflection_coefficient * action * span * shear_flexibility,
            case.deflection_coefficient * action * span**3
            + demand.stiffness_limit * _amplification_term(demand, span))
        moment = case.moment_coefficient * action * span
        moment_per_scale2 = uniform.moment_coefficient * weight_per_scale2 * span
        shear = case.shear_coefficient * action
        shear_per_scale2 = uniform.shear_coefficient * weight_per_scale2
    else:
        stiffness = (action * span / (stiffness_modulus_material * unit.stiffness_modulus
                                      * demand.stiffness_limit)) ** 0.25
        moment = action
        moment_per_scale2 = 0.0
        shear = shear_per_scale2 = 0.0
    # Stress x SF <= allowed: z s^3 allowed / SF - M'(s) s^2 - M >= 0.
    strength_parts = [
        cubic_scale(unit.strength_modulus * strength / factor, moment_per_scale2, moment)]
    if demand.bending:
        strength_parts.append(shear_scale(unit.shear_area * shear_strength / factor,
                                          shear_per_scale2, shear))
    buckling_parts = []
    if demand.local_buckling:
        modes = unit.buckling_modes or (unit.buckling_stress,)
        buckling_parts = [cubic_scale(unit.strength_modulus * mode / factor,
                                      moment_per_scale2, moment) for mode in modes]
        if demand.bending:
            buckling_parts.append(shear_scale(
                unit.shear_area * unit.shear_buckling_stress / factor,
                shear_per_scale2, shear))
    return stiffness, strength_parts, buckling_parts


def _timoshenko_scale(capacity, weight_shear, linear, constant) -> np.ndarray:
    """Smallest s with (capacity - weight_shear) u^2 - linear u - constant >= 0, u = s^2:
    the bending stiffness E i delta u^2 >= the bending deflection's terms (the case's
    c_D P L^3, the self-weight's c_Du W' L^3 u) plus the shear deflection's (Timoshenko:
    c_S P L psi u, and the self-weight's c_Su W' L psi u^2, ``weight_shear`` u^2, which does
    not fall with the size: no scale meets the limit where it reaches the capacity)."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        quadratic = capacity - weight_shear
        root = np.sqrt((linear + np.sqrt(linear**2 + 4.0 * quadratic * constant))
                       / (2.0 * quadratic))
        return np.where(quadratic > 0, root, np.inf)


def _amplification_term(demand: Demand, span) -> np.ndarray | float:
    """N_c L_e^2 / pi^2 (N m^2) of an axial compression N_c on a bending case, 0 without one.

    A compression amplifies the deflection by 1 / (1 - N_c / P_cr), P_cr = pi^2 E I / L_e^2
    in the plane of bending (``stability.beam_column``), so delta_0 / (1 - N_c L_e^2 /
    (pi^2 E I)) <= delta_max becomes delta_0 E I + delta_max N_c L_e^2 / pi^2 <= delta_max E I:
    the same polynomial in s with this term added to its constant (unfactored loads: a
    serviceability check)."""
    compression = np.maximum(-np.asarray(demand.axial_force, dtype=float), 0.0)
    if not np.any(compression):
        return 0.0
    factor = EFFECTIVE_LENGTH_FACTORS[BENDING_END_CONDITIONS[demand.case.id]]
    return compression * (factor * span) ** 2 / np.pi**2


def _case_values(demand: Demand):
    """The load case, span, action and safety factor of ``demand`` (floats as arrays)."""
    return (demand.case, *(np.asarray(value, dtype=float)
                           for value in (demand.span, demand.action, demand.safety_factor)))
