"""Material indices, combined with the shape factors a material can reach in a section family.

Derivation
----------
Every loading x limit pair is written down as its governing relation, in the form

    constraint:  requirement = c * phi^s * prod(property_j^k_j) * A^n
    objective:   m = A * L * prod(q_i^b_i)      (q = density; price and density; or
                                                 embodied_carbon and density)

where A, the cross-section area, is the free variable, c collects loads, lengths and numbers
that do not depend on the material or the section, and phi is the section's shape factor.
Solving the constraint for A and putting it into the objective gives

    m = const * phi^(-s/n) * prod(property_j^(-k_j/n)) * prod(q_i^b_i)

so the material-and-shape combination to maximise ("bigger is better") is

    index = phi^(s/n) * prod(property_j^(k_j/n)) / prod(q_i^b_i).

:func:`derive` does exactly this with exact fractions from the (n, k, s, b) of each relation in
:data:`RELATIONS`; no exponent of any index is written anywhere else. The relations are those of
elementary mechanics (a tie's axial stiffness E A / L, beam bending stiffness C E I / L^3, Euler
column buckling pi^2 E I / L^2, Saint-Venant torsion G K / L and T / Q, with the shape factors
of :class:`service.core.sections.base.ShapeFactors`).

Shape limits
------------
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
the bending local-buckling model: the compression flange or wall of a section in bending carries
the peak stress uniformly, as every wall of a column does. It is optimistic for deep webs, which
in a column see the full stress the bending model spreads over a gradient (stated limitation).

Tension and compression strength (crushing) have no shape effect: shape factor 1, exponent 0.

Only self-similar single-material families are ranked (:func:`ranks_in_rankings`): the sandwich
panel's width is set by the envelope and its mass includes a core of another material, so no
single-material index describes it; POST /v1/designs sizes it.

A request may fix some or all of a family's proportions, each as the ratio of a dimension to
the family's scale dimension (``{"round_tube": {"wall": 0.05}}``: wall / outer_diameter =
0.05, D/t = 20); the other ratios are searched as above, and a material that buckles before
reaching its strength at the fixed proportions is excluded with the reason.

The search is one vectorised grid over the free proportion ratios (materials x proportions
arrays), refined by zooming each material's grid around its best point.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from fractions import Fraction

import numpy as np

from service.core.errors import InputError
from service.core.materials import ALL_PROPERTIES, BASES, UNITS, MaterialTable
from service.core.sections import FAMILIES, shape_factors
from service.core.sections.base import Elastic, SectionFamily, SectionProperties

LOADINGS: tuple[str, ...] = ("tension", "compression", "bending", "torsion")
LIMITS: tuple[str, ...] = ("stiffness", "strength")
OBJECTIVES: tuple[str, ...] = ("mass", "cost", "carbon")


@dataclass(frozen=True)
class GoverningRelation:
    """The constraint of one loading x limit pair as powers of the free area A.

    The constraint reads ``requirement = c * phi^s * prod(property^k) * A^n`` (see the module
    docstring).

    Attributes:
        loading: ``"tension"``, ``"compression"``, ``"bending"`` or ``"torsion"``.
        limit: ``"stiffness"`` or ``"strength"``.
        name: short name of the design problem, e.g. ``"beam, stiffness-limited"``.
        statement: the relation and how A enters it, in words and symbols.
        area_exponent: n, the power of A in the constraint.
        property_powers: (material property, k) pairs.
        shape_factor: the shape factor phi that multiplies A^n: ``"bending_stiffness"``,
            ``"bending_strength"``, ``"torsion_stiffness"``, ``"torsion_strength"``,
            ``"column_stiffness"`` (bending stiffness about the weaker axis), or None when the
            section's shape has no effect.
        shape_power: s, the power of phi in the constraint (0 when ``shape_factor`` is None).
        buckling_mode: the :class:`~service.core.sections.base.LocalBuckling` field that limits
            phi (``"bending"`` or ``"torsion"``), or None.
        limiting_strength: the strength the local buckling stress must reach
            (``"strength"`` or ``"shear_strength"``).
        source: where the relation comes from.
    """

    loading: str
    limit: str
    name: str
    statement: str
    area_exponent: Fraction
    property_powers: tuple[tuple[str, Fraction], ...]
    shape_factor: str | None
    shape_power: Fraction
    buckling_mode: str | None
    limiting_strength: str
    source: str


_ELEMENTARY = "elementary mechanics of materials (common practice)"
_TORSION = (
    "Saint-Venant torsion; square of side a: K = 0.1406 a^4, Q = 0.208 a^3 "
    "(Timoshenko & Goodier, Theory of Elasticity, torsion of rectangular bars, from memory)"
)
_ONE = Fraction(1)

RELATIONS: dict[tuple[str, str], GoverningRelation] = {
    (relation.loading, relation.limit): relation
    for relation in (
        GoverningRelation(
            "tension", "stiffness", "tie, stiffness-limited",
            "axial stiffness S = E A / L, so A = S L / E (A^1 E^1)",
            _ONE, (("youngs_modulus", _ONE),), None, Fraction(0), None, "strength",
            _ELEMENTARY,
        ),
        GoverningRelation(
            "tension", "strength", "tie, strength-limited",
            "axial force F = strength A, so A = F / strength (A^1 strength^1)",
            _ONE, (("strength", _ONE),), None, Fraction(0), None, "strength", _ELEMENTARY,
        ),
        GoverningRelation(
            "compression", "stiffness", "column, Euler buckling",
            "Euler load F = pi^2 E I / L^2 with I = phi A^2 / 12 (phi about the weaker axis), "
            "so A = (12 F L^2 / (pi^2 phi E))^(1/2) (A^2 phi^1 E^1)",
            Fraction(2), (("youngs_modulus", _ONE),), "column_stiffness", _ONE, "bending",
            "strength", "Euler column buckling, pin-ended (common practice)",
        ),
        GoverningRelation(
            "compression", "strength", "short strut, crushing",
            "crushing force F = strength A, so A = F / strength (A^1 strength^1)",
            _ONE, (("strength", _ONE),), None, Fraction(0), None, "strength", _ELEMENTARY,
        ),
        GoverningRelation(
            "bending", "stiffness", "beam, stiffness-limited",
            "bending stiffness S = C E I / L^3 with I = phi A^2 / 12, "
            "so A = (12 S L^3 / (C phi E))^(1/2) (A^2 phi^1 E^1)",
            Fraction(2), (("youngs_modulus", _ONE),), "bending_stiffness", _ONE, "bending",
            "strength", f"{_ELEMENTARY}; shape factor of the contract, 12 I / A^2",
        ),
        GoverningRelation(
            "bending", "strength", "beam, strength-limited",
            "moment M = strength Z with Z = phi A^(3/2) / 6, "
            "so A = (6 M / (phi strength))^(2/3) (A^(3/2) phi^1 strength^1)",
            Fraction(3, 2), (("strength", _ONE),), "bending_strength", _ONE, "bending",
            "strength", f"{_ELEMENTARY}; shape factor of the contract, 6 Z / A^1.5",
        ),
        GoverningRelation(
            "torsion", "stiffness", "shaft, stiffness-limited",
            "torsional stiffness T / theta = G K / L with K = phi K_square(A) and "
            "K_square = 0.1406 A^2, so A = (T L / (0.1406 phi G theta))^(1/2) (A^2 phi^1 G^1)",
            Fraction(2), (("shear_modulus", _ONE),), "torsion_stiffness", _ONE, "torsion",
            "shear_strength", _TORSION,
        ),
        GoverningRelation(
            "torsion", "strength", "shaft, strength-limited",
            "torque T = shear_strength Q with Q = phi Q_square(A) and Q_square = 0.208 A^(3/2), "
            "so A = (T / (0.208 phi shear_strength))^(2/3) (A^(3/2) phi^1 shear_strength^1)",
            Fraction(3, 2), (("shear_strength", _ONE),), "torsion_strength", _ONE, "torsion",
            "shear_strength", _TORSION,
        ),
    )
}
"""(loading, limit) -> its governing relation."""

OBJECTIVE_POWERS: dict[str, tuple[tuple[str, Fraction], ...]] = {
    "mass": (("density", _ONE),),
    "cost": (("price", _ONE), ("density", _ONE)),
    "carbon": (("embodied_carbon", _ONE), ("density", _ONE)),
}
"""Objective -> the (property, b) powers of its per-volume value: m = A L prod(q^b)."""

_OBJECTIVE_WORDS = {
    "mass": "mass m = A L density",
    "cost": "cost = A L density price",
    "carbon": "embodied carbon = A L density embodied_carbon",
}


@dataclass(frozen=True)
class IndexDefinition:
    """A power-law index: index = phi^shape_factor_exponent * prod(property^exponent).

    Attributes:
        exponents: material property -> exponent (dimensionless), non-zero entries only.
        shape_factor: which shape factor multiplies the material part (see
            :attr:`GoverningRelation.shape_factor`), or None.
        shape_factor_exponent: the exponent of that shape factor (0 when it has no effect).
        description: the derivation in words: objective, constraint, result.
        relation: the governing relation the shape factor and the local-buckling limit come
            from.
    """

    exponents: Mapping[str, float]
    shape_factor: str | None
    shape_factor_exponent: float
    description: str
    relation: GoverningRelation


def _power_text(name: str, exponent: Fraction) -> str:
    return name if exponent == 1 else f"{name}^({exponent})"


def derive(relation: GoverningRelation, objective: str) -> IndexDefinition:
    """The index of a governing relation for an objective, by eliminating the free area A.

    With the constraint ``requirement = c phi^s prod(p^k) A^n`` and the objective
    ``A L prod(q^b)``: A = (requirement / (c phi^s prod(p^k)))^(1/n), hence the objective is
    proportional to phi^(-s/n) prod(p^(-k/n)) prod(q^b), and the index (its reciprocal)
    has exponents k/n for each p, s/n for phi and -b for each q. Exact fractions throughout.
    """
    powers: dict[str, Fraction] = {}
    for name, power in relation.property_powers:
        powers[name] = powers.get(name, Fraction(0)) + power / relation.area_exponent
    for name, power in OBJECTIVE_POWERS[objective]:
        powers[name] = powers.get(name, Fraction(0)) - power
    shape_exponent = relation.shape_power / relation.area_exponent
    numerator = [
        _power_text(f"(phi {name})" if shape_exponent else name, p)
        for name, p in powers.items()
        if p > 0
    ]
    denominator = [_power_text(name, -p) for name, p in powers.items() if p < 0]
    description = (
        f"{relation.name}, minimum {objective}: minimise {_OBJECTIVE_WORDS[objective]} "
        f"subject to {relation.statement}; eliminating A gives the index "
        f"{' '.join(numerator)} / ({' '.join(denominator)}), bigger is better"
    )
    if relation.shape_factor is not None:
        description += f", with phi the {relation.shape_factor.replace('_', ' ')} shape factor"
    return IndexDefinition(
        exponents={name: float(p) for name, p in powers.items() if p != 0},
        shape_factor=relation.shape_factor,
        shape_factor_exponent=float(shape_exponent),
        description=description,
        relation=relation,
    )


def material_index(loading: str, limit: str, objective: str) -> IndexDefinition:
    """The derived index of one loading x limit pair and objective.

    Raises InputError naming ``loading``, ``limit`` or ``objective`` when one is unknown.
    """
    errors = {}
    for name, value, allowed in (
        ("loading", loading, LOADINGS),
        ("limit", limit, LIMITS),
        ("objective", objective, OBJECTIVES),
    ):
        if value not in allowed:
            errors[name] = [f"must be one of {', '.join(allowed)}"]
    if errors:
        raise InputError(errors)
    return derive(RELATIONS[(loading, limit)], objective)


MAX_CUSTOM_EXPONENT = 10.0
"""Largest |exponent| of a custom index: keeps every index well inside double precision."""


def exponent_errors(exponents: Mapping[str, object], allowed: tuple[str, ...]
                    ) -> dict[str, list[str]]:
    """Problems of a custom index's exponents, keyed by property name ("" for the whole map).

    A name must be one of ``allowed`` or ``"shape_factor"``; an exponent a finite number (not
    a boolean) within +-:data:`MAX_CUSTOM_EXPONENT`; at least one property exponent non-zero.
    """
    errors: dict[str, list[str]] = {}
    for name, exponent in exponents.items():
        if name != "shape_factor" and name not in allowed:
            errors[name] = [
                f"unknown property; expected one of {', '.join(allowed)} or shape_factor"
            ]
        elif not (
            isinstance(exponent, int | float)
            and not isinstance(exponent, bool)
            and abs(exponent) <= MAX_CUSTOM_EXPONENT  # False for NaN; exact for huge ints
        ):
            errors[name] = [
                f"must be a number from -{MAX_CUSTOM_EXPONENT:g} to {MAX_CUSTOM_EXPONENT:g}"
            ]
    if not errors and not any(e for name, e in exponents.items() if name != "shape_factor"):
        errors[""] = ["needs at least one property with a non-zero exponent"]
    return errors


def custom_index(
    exponents: Mapping[str, float], loading: str, limit: str, allowed: tuple[str, ...]
) -> IndexDefinition:
    """A client's power-law index ``phi^shape_factor * prod(property^exponent)``.

    The exponents are plain numbers; nothing a client sends is evaluated. The optional key
    ``"shape_factor"`` is the exponent of the shape factor of the ``loading`` x ``limit``
    relation (default 0: shape has no effect), and that relation's local-buckling limit
    applies to it.

    Args:
        exponents: property name (or ``"shape_factor"``) -> exponent.
        loading, limit: pick the shape factor, as for :func:`material_index`.
        allowed: the property names a material table carries.

    Raises:
        InputError: paths ``custom_index.<name>`` or ``custom_index`` (see
            :func:`exponent_errors`).
    """
    relation = material_index(loading, limit, "mass").relation
    errors = exponent_errors(exponents, allowed)
    if errors:
        raise InputError({".".join(filter(None, ("custom_index", name))): messages
                          for name, messages in errors.items()})
    properties = {name: float(e) for name, e in exponents.items() if name != "shape_factor" and e}
    shape_exponent = float(exponents.get("shape_factor", 0.0))
    shape = relation.shape_factor if shape_exponent else None
    terms = [f"{name}^({exponent:g})" for name, exponent in properties.items()]
    description = "custom power-law index " + " ".join(terms)
    if shape is not None:
        description += (
            f" times phi^({shape_exponent:g}), phi the {shape.replace('_', ' ')} shape factor"
        )
    return IndexDefinition(
        exponents=properties,
        shape_factor=shape,
        shape_factor_exponent=shape_exponent if shape is not None else 0.0,
        description=description + ", bigger is better",
        relation=relation,
    )


def property_values(table: MaterialTable, name: str, basis: str) -> np.ndarray:
    """Values (M,) of one property on a basis; ``shear_strength`` falls back to von Mises."""
    if name == "shear_strength":
        return np.asarray(table.shear_strength(basis), dtype=float)
    return np.asarray(table.values(name, basis), dtype=float)


def property_range(table: MaterialTable, name: str) -> tuple[np.ndarray, np.ndarray]:
    """(low, high) arrays (M,) of one property (``shear_strength``: own or strength/sqrt(3))."""
    if name == "shear_strength":
        fallback = 1.0 / math.sqrt(3.0)  # von Mises, as the contract states
        return tuple(
            np.where(np.isnan(ends["shear_strength"]), ends["strength"] * fallback,
                     ends["shear_strength"])
            for ends in (table.low, table.high)
        )
    return np.asarray(table.low[name], dtype=float), np.asarray(table.high[name], dtype=float)


def material_log_index(definition: IndexDefinition, table: MaterialTable, basis: str
                       ) -> np.ndarray:
    """log10 of the material part prod(property^exponent) of an index, shape (M,).

    Logarithms keep a custom index with large exponents from overflowing on the way.
    """
    total = np.zeros(len(table))
    # A missing (NaN) or non-positive value gives a non-finite log, which rank() reports.
    with np.errstate(divide="ignore", invalid="ignore"):
        for name, exponent in definition.exponents.items():
            total = total + exponent * np.log10(property_values(table, name, basis))
    return total


# ---------------------------------------------------------------------------------------------
# Shape limits: the best shape factor each material reaches in a family

GRID_POINTS = {1: 129, 2: 33, 3: 17}
"""Points per free ratio axis of the first (shared) grid, by the number of free ratios."""

REFINE_POINTS = 5
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

    Returns:
        A :class:`ShapeLimit` of arrays (M,).
    """
    fixed = dict(fixed or {})
    free = [bound for bound in family.ratio_bounds if bound.dimension not in fixed]
    columns = Elastic(*(np.asarray(v, dtype=float)[:, None] for v in
                        (elastic.youngs_modulus, elastic.shear_modulus, elastic.poisson_ratio)))
    strength = np.asarray(limiting_strength, dtype=float)[:, None]

    def evaluate(log_ratios: np.ndarray):
        """Shape factor, buckling stress, real and feasible at log ratios (..., n_free),
        each of shape (M, ...) without the last axis."""
        dims = {family.scale_dimension: np.ones(log_ratios.shape[:-1])}
        dims.update({name: np.full(log_ratios.shape[:-1], value) for name, value in fixed.items()})
        dims.update({b.dimension: np.exp(log_ratios[..., j]) for j, b in enumerate(free)})
        # Grid points that break a family rule may divide by zero; they are masked out below.
        with np.errstate(divide="ignore", invalid="ignore"):
            phi = shape_factor_values(definition.shape_factor, family.properties(dims))
            buckling = getattr(family.local_buckling(dims, columns),
                               definition.relation.buckling_mode)
            phi, buckling = np.broadcast_arrays(phi, buckling)
            real = family.holds(dims) & np.isfinite(phi) & (phi > 0)
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
        log_low = np.log([b.low for b in free])
        log_high = np.log([b.high for b in free])
        points = GRID_POINTS[n_free]
        axes = [np.linspace(lo, hi, points) for lo, hi in zip(log_low, log_high, strict=True)]
        grid = np.stack(np.meshgrid(*axes, indexing="ij"), axis=-1).reshape(-1, n_free)
        center = pick(grid)
        step = (log_high - log_low) / (points - 1)
        offsets = np.stack(
            np.meshgrid(*[np.linspace(-1.0, 1.0, REFINE_POINTS)] * n_free, indexing="ij"), axis=-1
        ).reshape(-1, n_free)
        while step.max() > REFINE_TOLERANCE:
            center = pick(np.clip(center[:, None, :] + offsets * step, log_low, log_high))
            step = step / 2.0
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


# ---------------------------------------------------------------------------------------------
# Rankings: every material in every family, best first


@dataclass(frozen=True)
class RankingRequest:
    """What to rank (SI floats; the API layer has converted units and applied the filter).

    Attributes:
        loading: ``"tension"``, ``"compression"``, ``"bending"`` or ``"torsion"``.
        limit: ``"stiffness"`` or ``"strength"``.
        objective: ``"mass"``, ``"cost"`` or ``"carbon"``.
        sections: family ids, or None for every self-similar family carrying the loading.
        proportions: family id -> {ratio dimension: value / the family's scale dimension},
            e.g. ``{"round_tube": {"wall": 0.05}}`` (wall / outer_diameter = 0.05, D/t = 20);
            fixed ratios are held, the others searched.
        custom_index: property (or ``"shape_factor"``) -> exponent, replacing the derived
            index (see :func:`custom_index`); None for the derived one.
        property_basis: ``"typical"`` or ``"conservative"`` material values.
        top: keep the best ``top`` results, or None for all.
        chart: also return the data of a log-log property chart.
    """

    loading: str
    limit: str
    objective: str = "mass"
    sections: tuple[str, ...] | None = None
    proportions: Mapping[str, Mapping[str, float]] = field(default_factory=dict)
    custom_index: Mapping[str, float] | None = None
    property_basis: str = "typical"
    top: int | None = None
    chart: bool = False


@dataclass(frozen=True)
class RankedResult:
    """One material in one section family.

    Attributes:
        rank: 1 for the best.
        material_index: row of the material in the table ranked.
        material_id, material_name, material_family: the material.
        section: section family id.
        shape_factor: the shape factor used (1 where shape has no effect), dimensionless.
        proportions: ratio dimension -> value / scale dimension where the shape factor was
            taken (empty where shape has no effect or the family has no ratios).
        index: the index value, in the units of prod(property^exponent) (SI); bigger is better.
        relative: index / the best index, dimensionless (1.0 for the best).
    """

    rank: int
    material_index: int
    material_id: str
    material_name: str
    material_family: str
    section: str
    shape_factor: float
    proportions: dict[str, float]
    index: float
    relative: float


@dataclass(frozen=True)
class Exclusion:
    """A material made in a family that gets no result there, and why.

    Attributes:
        material_index: row of the material in the table ranked.
        material_id: the material.
        section: section family id.
        reason: in words a designer can act on.
    """

    material_index: int
    material_id: str
    section: str
    reason: str


@dataclass(frozen=True)
class ChartAxis:
    """One axis of a log-log property chart: the quantity prod(name^power).

    Attributes:
        label: the quantity in words, e.g. ``"shape_factor * youngs_modulus"``.
        exponents: property (or ``"shape_factor"``) -> power in the quantity.
        unit: SI unit of the quantity.
    """

    label: str
    exponents: dict[str, float]
    unit: str


@dataclass(frozen=True)
class ChartPoint:
    """One ranked result on the chart; x and y in their axes' units.

    Attributes:
        rank: the result's rank.
        material_id, material_name, material_family: the material.
        section: section family id.
        x_low, x_high, x: the x quantity from the properties' low and high ends, and the value
            the index used.
        y_low, y_high, y: the same for y.
    """

    rank: int
    material_id: str
    material_name: str
    material_family: str
    section: str
    x_low: float
    x_high: float
    x: float
    y_low: float
    y_high: float
    y: float


@dataclass(frozen=True)
class Chart:
    """Data for a log-log chart of y against x with the index guide line.

    With index = y^a / x^b, every point of equal index lies on
    ``log10 y = slope log10 x + intercept``, slope = b / a, intercept = log10(index) / a;
    the line given passes through the best result.

    Attributes:
        x, y: the axes.
        points: one per ranked result.
        slope: b / a, dimensionless.
        intercept: log10(best index) / a, in log10 of the y unit.
        through: rank of the result the line passes through (1).
    """

    x: ChartAxis
    y: ChartAxis
    points: tuple[ChartPoint, ...]
    slope: float
    intercept: float
    through: int


@dataclass(frozen=True)
class Ranking:
    """A complete ranking.

    Attributes:
        index: the index ranked by, with its exponents and derivation.
        results: best first, cut to ``top``.
        excluded: materials made in a family that get no result there, with the reason.
        chart: chart data when asked for, else None.
    """

    index: IndexDefinition
    results: tuple[RankedResult, ...]
    excluded: tuple[Exclusion, ...]
    chart: Chart | None


def ranked_families(loading: str) -> tuple[str, ...]:
    """The default sections: self-similar families that carry ``loading``, registry order."""
    return tuple(
        fid for fid, family in FAMILIES.items()
        if loading in family.loadings and ranks_in_rankings(family)
    )


def validate_ranking(request: RankingRequest) -> IndexDefinition:
    """Check every field of the request; return the index to rank by.

    Raises:
        InputError: every bad field by its contract path (``loading``, ``sections.1``,
            ``proportions.round_tube.wall``, ``custom_index.hardness``, ``top``, ...).
    """
    errors: dict[str, list[str]] = {}
    definition = None
    try:
        definition = material_index(request.loading, request.limit, request.objective)
        if request.custom_index is not None:
            definition = custom_index(request.custom_index, request.loading, request.limit,
                                      ALL_PROPERTIES)
    except InputError as error:
        errors.update(error.errors)
        definition = None
    if definition is not None and request.chart and not _chartable(definition):
        errors["chart"] = [
            "a chart needs an index with a positive and a negative property exponent"
        ]
    if request.property_basis not in BASES:
        errors["property_basis"] = [f"must be one of {', '.join(BASES)}"]
    if request.top is not None and request.top < 1:
        errors["top"] = ["must be at least 1"]
    if request.sections is not None and not request.sections:
        errors["sections"] = ["must name at least one section family"]
    sections = request.sections or ()
    for position, family_id in enumerate(sections):
        family = FAMILIES.get(family_id)
        if family is None:
            errors[f"sections.{position}"] = [f"unknown section family {family_id!r}"]
        elif not ranks_in_rankings(family):
            errors[f"sections.{position}"] = [
                f"{family_id} is not ranked by index (its width is set by the envelope and its "
                "mass includes a core): size it with POST /v1/designs"
            ]
        elif request.loading in LOADINGS and request.loading not in family.loadings:
            errors[f"sections.{position}"] = [f"{family_id} does not carry {request.loading}"]
    ranked = sections if request.sections is not None else ranked_families(request.loading)
    for family_id, ratios in request.proportions.items():
        path = f"proportions.{family_id}"
        family = FAMILIES.get(family_id)
        if family is None or family_id not in ranked:
            errors[path] = ["not one of the section families being ranked"]
            continue
        errors.update({".".join(filter(None, (path, name))): messages
                       for name, messages in proportion_errors(family, ratios).items()})
    if errors:
        raise InputError(errors)
    return definition


def proportion_errors(family: SectionFamily, ratios: Mapping[str, float]
                      ) -> dict[str, list[str]]:
    """Problems of fixed proportions of one family, keyed by dimension ("" for the whole set).

    Each name must be a ratio dimension of the family, each value within its
    :class:`~service.core.sections.base.RatioBound`; when every ratio is fixed, they must
    describe a real section (the family's rules).
    """
    bounds = {bound.dimension: bound for bound in family.ratio_bounds}
    errors: dict[str, list[str]] = {}
    if not ratios:
        errors[""] = ["must fix at least one ratio"]
    for name, value in ratios.items():
        bound = bounds.get(name)
        if bound is None:
            names = ", ".join(bounds) or "none"
            errors[name] = [
                f"not a ratio dimension of {family.id} "
                f"(ratios to {family.scale_dimension}: {names})"
            ]
        elif not (math.isfinite(value) and bound.low <= value <= bound.high):
            errors[name] = [
                f"{name} / {family.scale_dimension} must lie from {bound.low:g} to {bound.high:g} "
                f"({bound.source})"
            ]
    if not errors and len(ratios) == len(bounds):
        dims = {family.scale_dimension: 1.0, **ratios}
        if not bool(family.holds(dims)):
            errors[""] = ["these ratios describe no real section: " + "; ".join(
                f"{rule.dimension} {rule.message}" for rule in family.rules
                if not bool(rule.holds(*(np.asarray(dims[n]) for n in rule.uses)))
            )]
    return errors


def rank(request: RankingRequest, table: MaterialTable) -> Ranking:
    """Rank every material of ``table`` in every requested family by the index.

    For each family the materials made in it (their ``forms``) get the shape factor of
    :func:`shape_limits` (or 1 where shape has no effect), and
    index = phi^s * prod(property^exponent); materials whose walls buckle before they reach
    their strength at every allowed proportion are listed in ``excluded``. Results are sorted
    by index, best first (ties: material id, then section order), and ``relative`` is each
    index divided by the best.

    Raises:
        InputError: see :func:`validate_ranking`.
    """
    definition = validate_ranking(request)
    basis = request.property_basis
    relation = definition.relation
    sections = request.sections or ranked_families(request.loading)
    material_log = material_log_index(definition, table, basis)
    elastic = [property_values(table, name, basis)
               for name in ("youngs_modulus", "shear_modulus", "poisson_ratio")]
    strength = property_values(table, relation.limiting_strength, basis)
    # Beyond 10^+-300 the index, its shape part and its ratios would leave double precision.
    known = np.isfinite(material_log) & (np.abs(material_log) < INDEX_LOG10_LIMIT)
    groups: list[_Group] = []
    excluded: list[Exclusion] = []
    for family_id in sections:
        family = FAMILIES[family_id]
        made = np.fromiter((family_id in forms for forms in table.forms), bool, count=len(table))
        excluded.extend(
            Exclusion(int(i), table.ids[i], family_id,
                      "the index cannot be evaluated: no positive value of "
                      + " or ".join(definition.exponents)
                      + ", or an index beyond double precision")
            for i in np.flatnonzero(made & ~known)
        )
        made = np.flatnonzero(made & known)
        if definition.shape_factor is None:
            groups.append(_Group(family_id, made, np.ones(len(made)), material_log[made], {}))
            continue
        fixed = request.proportions.get(family_id)
        limit = shape_limits(family, definition, Elastic(*(v[made] for v in elastic)),
                             strength[made], fixed)
        ok = limit.feasible
        log_index = material_log[made] + definition.shape_factor_exponent * np.log10(
            np.where(ok, limit.shape_factor, 1.0))
        groups.append(_Group(family_id, made[ok], limit.shape_factor[ok], log_index[ok],
                             {name: v[ok] for name, v in limit.proportions.items()}))
        excluded.extend(
            Exclusion(int(made[row]), table.ids[made[row]], family_id, _buckling_reason(
                family, relation, limit, row, strength[made[row]], fixed))
            for row in np.flatnonzero(~ok)
        )
    results = _ordered(groups, table, request.top)
    chart = _chart(definition, table, basis, results) if request.chart and results else None
    return Ranking(definition, results, tuple(excluded), chart)


INDEX_LOG10_LIMIT = 300.0
"""Largest |log10| of a material part of an index that is ranked."""


@dataclass(frozen=True)
class _Group:
    """The ranked candidates of one family (arrays of one length)."""

    section: str
    materials: np.ndarray
    shape_factor: np.ndarray
    log_index: np.ndarray
    proportions: dict[str, np.ndarray]


def _buckling_reason(family: SectionFamily, relation: GoverningRelation, limit: ShapeLimit,
                     row: int, strength: float, fixed: Mapping[str, float] | None) -> str:
    where = ("at the fixed proportions" if fixed and len(fixed) == len(family.ratio_bounds)
             else "at every allowed proportion")
    ratios = ", ".join(f"{name}/{family.scale_dimension} = {values[row]:.3g}"
                       for name, values in limit.proportions.items())
    return (
        f"local buckling precedes the {relation.limiting_strength.replace('_', ' ')} {where}: "
        f"at best {limit.buckling_stress[row]:.3g} Pa against {strength:.3g} Pa ({ratios})"
    )


def _ordered(groups: list[_Group], table: MaterialTable, top: int | None
             ) -> tuple[RankedResult, ...]:
    """Every group's candidates sorted best first (ties: material id, section order)."""
    group = np.concatenate([np.full(len(g.materials), k) for k, g in enumerate(groups)] or [[]])
    if not len(group):
        return ()
    member = np.concatenate([np.arange(len(g.materials)) for g in groups])
    material = np.concatenate([g.materials for g in groups])
    index = 10.0 ** np.concatenate([g.log_index for g in groups])
    ids = np.asarray(table.ids)[material]
    sequence = np.lexsort((group, ids, -index))[:top]
    best = index[sequence[0]]
    results = []
    for rank_number, k in enumerate(sequence, start=1):
        source, row, i = groups[group[k]], member[k], int(material[k])
        results.append(RankedResult(
            rank=rank_number,
            material_index=i,
            material_id=table.ids[i],
            material_name=table.names[i],
            material_family=table.families[i],
            section=source.section,
            shape_factor=float(source.shape_factor[row]),
            proportions={name: float(v[row]) for name, v in source.proportions.items()},
            index=float(index[k]),
            relative=float(index[k] / best),
        ))
    return tuple(results)


def _chartable(definition: IndexDefinition) -> bool:
    exponents = definition.exponents.values()
    return any(e > 0 for e in exponents) and any(e < 0 for e in exponents)


def _axis(exponents: Mapping[str, float], scale: float) -> ChartAxis:
    powers = {name: exponent / scale for name, exponent in exponents.items()}
    label = " * ".join(name if p == 1 else f"{name}^{p:g}" for name, p in powers.items())
    units = [
        (UNITS.get(name, ""), p) for name, p in powers.items() if name != "shape_factor"
    ]
    unit = " ".join(u if p == 1 else f"({u})^{p:g}" for u, p in units if u not in ("", "1"))
    return ChartAxis(label=label, exponents=powers, unit=unit or "1")


def _chart(definition: IndexDefinition, table: MaterialTable, basis: str,
           results: tuple[RankedResult, ...]) -> Chart:
    """Chart data: x the negative-exponent properties, y the positive ones times phi^s."""
    rising = {n: e for n, e in definition.exponents.items() if e > 0}
    falling = {n: -e for n, e in definition.exponents.items() if e < 0}
    if definition.shape_factor is not None:
        rising = {"shape_factor": definition.shape_factor_exponent, **rising}
    # Normalising by the largest exponent keeps every power on an axis within [-1, 1].
    a = max(abs(e) for e in rising.values())
    b = max(falling.values())
    x_axis, y_axis = _axis(falling, b), _axis(rising, a)
    rows = np.asarray([r.material_index for r in results])
    phi = np.asarray([r.shape_factor for r in results])

    def quantity(axis: ChartAxis, which: str) -> np.ndarray:
        total = np.ones(len(rows))
        for name, power in axis.exponents.items():
            if name == "shape_factor":
                values = phi
            elif which == "value":
                values = property_values(table, name, basis)[rows]
            else:
                values = property_range(table, name)[which == "high"][rows]
            total = total * values**power
        return total

    x = {which: quantity(x_axis, which) for which in ("low", "high", "value")}
    y = {which: quantity(y_axis, which) for which in ("low", "high", "value")}
    points = tuple(
        ChartPoint(
            rank=r.rank, material_id=r.material_id, material_name=r.material_name,
            material_family=r.material_family, section=r.section,
            x_low=float(x["low"][k]), x_high=float(x["high"][k]), x=float(x["value"][k]),
            y_low=float(y["low"][k]), y_high=float(y["high"][k]), y=float(y["value"][k]),
        )
        for k, r in enumerate(results)
    )
    return Chart(x=x_axis, y=y_axis, points=points, slope=b / a,
                 intercept=math.log10(results[0].index) / a, through=results[0].rank)
