"""Rankings: every material in every family by index x shape factor, best first."""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field

import numpy as np

from service.core.errors import InputError
from service.core.indices.chart import Chart, chartable, index_chart
from service.core.indices.derivation import (
    LOADINGS,
    GoverningRelation,
    IndexDefinition,
    custom_index,
    material_index,
    material_log_index,
    property_values,
)
from service.core.indices.shape_limits import ShapeLimit, ranks_in_rankings, shape_limits
from service.core.materials import ALL_PROPERTIES, BASES, MaterialTable
from service.core.materials.form_limits import max_wall_ratios, measures
from service.core.sections import FAMILIES
from service.core.sections.base import Elastic, SectionFamily


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
    if definition is not None and request.chart and not chartable(definition):
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
    if errors or definition is None:
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
        most = max_wall_ratios(table, made, family_id)
        limit = shape_limits(family, definition, Elastic(*(v[made] for v in elastic)),
                             strength[made], fixed, most)
        ok = limit.feasible
        log_index = material_log[made] + definition.shape_factor_exponent * np.log10(
            np.where(ok, limit.shape_factor, 1.0))
        groups.append(_Group(family_id, made[ok], limit.shape_factor[ok], log_index[ok],
                             {name: v[ok] for name, v in limit.proportions.items()}))
        excluded.extend(
            Exclusion(int(made[row]), table.ids[made[row]], family_id,
                      _unmade_reason(family, limit, int(row), float(most[row]))
                      or _buckling_reason(family, relation, limit, int(row),
                                          strength[made[row]], fixed))
            for row in np.flatnonzero(~ok)
        )
    results = _ordered(groups, table, request.top)
    chart = index_chart(definition, table, basis, results) if request.chart and results else None
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


def _unmade_reason(family: SectionFamily, limit: ShapeLimit, row: int, most: float
                   ) -> str | None:
    """Why fixed proportions are not made (outer dimension / wall beyond what the material's
    process makes), or None when they are."""
    dims = {family.scale_dimension: 1.0,
            **{name: float(values[row]) for name, values in limit.proportions.items()}}
    with np.errstate(divide="ignore", invalid="ignore"):
        _, ratio, _ = measures(family.id, dims)
    if not float(ratio) > most:
        return None
    return (f"outer dimension / wall {float(ratio):.3g} is beyond the {most:g} its process "
            f"makes in this form (its form_limits)")


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
    group = np.concatenate([np.full(len(g.materials), k) for k, g in enumerate(groups)]
                           or [np.zeros(0, dtype=int)])
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
