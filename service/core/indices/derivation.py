"""Material indices derived from governing relations.

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
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from fractions import Fraction

import numpy as np

from service.core.errors import InputError
from service.core.materials import MaterialTable

LOADINGS: tuple[str, ...] = ("tension", "compression", "bending", "torsion")
LIMITS: tuple[str, ...] = ("stiffness", "strength", "frequency")
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
        buckling_mode: the local buckling that limits phi: a
            :class:`~service.core.sections.base.LocalBuckling` field (``"bending"`` or
            ``"torsion"``), or ``"compression"`` (every wall in uniform compression, as in a
            column: :mod:`service.core.stability.wall_compression`), or None.
        limiting_strength: the strength the local buckling stress must reach
            (``"strength"`` or ``"shear_strength"``).
        source: where the relation comes from.
        index_power: the power the derived index is raised to, to give it its published
            form (1: the index is inversely proportional to the objective; 1/2 for the
            natural frequency, whose mass goes as rho^2 / (phi E): the published
            (phi E)^(1/2) / rho is the square root, with the same order).
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
    index_power: Fraction = Fraction(1)


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
            Fraction(2), (("youngs_modulus", _ONE),), "column_stiffness", _ONE, "compression",
            "strength", "Euler column buckling (Timoshenko & Gere, Theory of Elastic "
            "Stability, 2nd ed. 1961, ch. 2, from memory); the end conditions only scale the "
            "length (K L), the same for every material",
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
        GoverningRelation(
            "bending", "frequency", "beam, natural-frequency-limited",
            "first bending frequency f = (beta L)^2 / (2 pi L^2) (E I / (density A))^(1/2) "
            "with I = phi A^2 / 12, so f^2 = c phi E A / density and "
            "A = f^2 density / (c phi E) (A^1 phi^1 E^1 density^-1)",
            _ONE, (("youngs_modulus", _ONE), ("density", -_ONE)), "bending_stiffness", _ONE,
            "bending", "strength",
            "Euler-Bernoulli first mode of a uniform beam (Blevins, Formulas for Natural "
            "Frequency and Mode Shape, 1979, table 8-1, from memory; beta L belongs to the "
            "supports, the same for every material); the published form of the index is "
            "(phi E)^(1/2) / density, the E^(1/2) / rho family of light stiff beams (Ashby, "
            "Materials Selection in Mechanical Design, 4th ed. 2011, ch. 5-6, from memory): "
            "the mass goes as its inverse square",
            index_power=Fraction(1, 2),
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
    # the published form (GoverningRelation.index_power): the same order of materials
    powers = {name: power * relation.index_power for name, power in powers.items()}
    shape_exponent = relation.shape_power / relation.area_exponent * relation.index_power
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
    if relation.index_power != 1:
        description += (f" (the {objective} goes as the index to the power "
                        f"{-1 / relation.index_power})")
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
    if not errors and (loading, limit) not in RELATIONS:
        errors["limit"] = [f"{limit} applies to the "
                           f"{', '.join(sorted({lo for lo, li in RELATIONS if li == limit}))} "
                           "loading only"]
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
        low, high = (
            np.where(np.isnan(ends["shear_strength"]), ends["strength"] * fallback,
                     ends["shear_strength"])
            for ends in (table.low, table.high)
        )
        return low, high
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
