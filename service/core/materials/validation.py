"""The checks every material passes, whether it comes from a CSV file or a client record.

Both loaders fill :class:`Rows` (column-wise, NaN where a value is absent) and call
:func:`check`, which returns every :class:`Problem` at its 0-based row and field; each loader
locates the problems its own way (a file's row and column, a request's JSON path).
"""

from __future__ import annotations

import re
from collections.abc import Iterable
from dataclasses import dataclass

import numpy as np

from service.core.materials.brittleness import brittle as brittle_rule
from service.core.materials.form_limits import FormLimit
from service.core.materials.plausibility import implausible
from service.core.materials.table import MaterialTable
from service.core.materials.vocabulary import (
    ALL_PROPERTIES,
    CORE_FAMILY,
    ENDS,
    FAMILIES,
    FORMS,
    ID_PATTERN,
)

SHEAR_MODULUS_TOLERANCE = 0.10
"""Largest relative difference between an isotropic material's typical G and
E / (2 (1 + nu)). Handbooks measure E, G and nu in separate tests and round each, and wrought
products are slightly textured, so published triples disagree by a few per cent; 10% accepts
that scatter and still catches a copying slip (G typed for E, a wrong unit prefix)."""

PRICE_YEARS = (1990, 2100)
"""Oldest and newest year a price may refer to."""

_ID = re.compile(ID_PATTERN)


@dataclass(frozen=True)
class Problem:
    """One problem: 0-based row, the field (a property or a column such as ``family``),
    the end of a property (``low``/``high``/``typical``) or None, and the message."""

    row: int
    field: str
    end: str | None
    message: str


@dataclass
class Rows:
    """Materials being validated, column-wise. Property arrays are NaN where absent."""

    ids: list[str]
    names: list[str]
    families: list[str]
    isotropic: list[bool]
    forms: list[tuple[str, ...]]
    values: dict[str, dict[str, np.ndarray]]
    price_years: list[int | None]
    sources: list[tuple[str, ...]]
    notes: list[str]
    fatigue_cycles: np.ndarray
    brittle: list[bool | None]
    form_limits: list[tuple[FormLimit, ...]]


def check(
    rows: Rows, required: Iterable[str], structural: Iterable[str] = ()
) -> list[Problem]:
    """Every problem of ``rows`` (ids, families, forms, property values, fatigue cycles);
    fills blank typical values with the geometric mean of low and high in place.

    ``required`` properties must be given by every row, ``structural`` ones by every row
    outside the core family."""
    problems: list[Problem] = []

    def flag(i: int, field: str, message: str) -> None:
        problems.append(Problem(i, field, None, message))

    seen: set[str] = set()
    for i, id_ in enumerate(rows.ids):
        if not _ID.match(id_):
            flag(i, "id", f"id {id_!r} must be a slug of a-z, 0-9, _ and -")
        elif id_ in seen:
            flag(i, "id", f"duplicate id {id_!r}")
        seen.add(id_)
    for i, (name, family, forms, year) in enumerate(
        zip(rows.names, rows.families, rows.forms, rows.price_years, strict=True)
    ):
        if not name.strip():
            flag(i, "name", "name must not be empty")
        if family not in FAMILIES:
            flag(i, "family", f"unknown family {family!r}; known: {', '.join(FAMILIES)}")
        unknown = ", ".join(repr(form) for form in forms if form not in FORMS)
        if unknown:
            flag(i, "forms", f"unknown form(s) {unknown}; known: {', '.join(FORMS)}")
        elif forms and family == CORE_FAMILY:
            flag(i, "forms", f"a {CORE_FAMILY!r} material is a sandwich core: forms must be empty")
        if year is not None and not PRICE_YEARS[0] <= year <= PRICE_YEARS[1]:
            flag(i, "price_year", f"price year {year} outside {PRICE_YEARS[0]}..{PRICE_YEARS[1]}")
    required, structural = set(required), set(structural)
    is_structural = np.array([family != CORE_FAMILY for family in rows.families], dtype=bool)
    for prop in ALL_PROPERTIES:
        needed = (
            np.ones(len(rows.ids), dtype=bool)
            if prop in required
            else is_structural & (prop in structural)
        )
        problems += _check_property(prop, rows.values[prop], needed)
    problems += _check_shear_modulus(rows)
    problems += _check_fatigue_cycles(rows)
    return problems


def _check_property(prop: str, ends: dict[str, np.ndarray], required: np.ndarray) -> list[Problem]:
    """The problems of one property; ``required``: bool (n,), the rows that must give it."""
    low, high, typical = (ends[end] for end in ENDS)
    problems: list[Problem] = []

    def report(mask: np.ndarray, end: str | None, message) -> None:
        for i in np.flatnonzero(mask):
            problems.append(Problem(int(i), prop, end, message(int(i))))

    given = {end: ~np.isnan(ends[end]) for end in ENDS}
    for end in ("low", "high"):
        report(required & ~given[end], end, lambda i: "missing value")
    partial = (given["low"] != given["high"]) | (given["typical"] & ~given["low"])
    report(~required & partial, None, lambda i: "give both low and high, or neither")
    bad = {}
    for end in ENDS:
        values = ends[end]
        bad[end] = given[end] & ~(np.isfinite(values) & (values > 0))
        report(bad[end], end, lambda i, v=values: f"must be positive and finite, got {v[i]:g}")
        if prop == "poisson_ratio":
            over = given[end] & ~bad[end] & (values > 0.5)
            report(
                over, end, lambda i, v=values: f"Poisson's ratio must be in (0, 0.5], got {v[i]:g}"
            )
            bad[end] |= over
        for i, message in implausible(prop, np.where(bad[end], np.nan, values)).items():
            problems.append(Problem(i, prop, end, message))
            bad[end][i] = True
    both = given["low"] & given["high"] & ~bad["low"] & ~bad["high"]
    report(both & (low > high), "low", lambda i: f"low {low[i]:g} is above high {high[i]:g}")
    ordered = both & (low <= high)
    outside = ordered & given["typical"] & ~bad["typical"] & ((typical < low) | (typical > high))
    report(
        outside, "typical", lambda i: f"typical {typical[i]:g} is outside [{low[i]:g}, {high[i]:g}]"
    )
    fill = ordered & ~given["typical"]
    typical[fill] = np.sqrt(low[fill] * high[fill])
    # A row with any problem in this property must not feed later checks.
    invalid = ~ordered | bad["typical"] | outside
    typical[invalid & (given["low"] | given["high"] | given["typical"])] = np.nan
    return problems


def _check_shear_modulus(rows: Rows) -> list[Problem]:
    """G = E / (2 (1 + nu)) for isotropic materials (theory of isotropic elasticity)."""
    e, g, nu = (
        rows.values[p]["typical"] for p in ("youngs_modulus", "shear_modulus", "poisson_ratio")
    )
    expected = e / (2.0 * (1.0 + nu))
    with np.errstate(invalid="ignore"):
        off = np.abs(g / expected - 1.0)
    mask = np.asarray(rows.isotropic, dtype=bool) & (off > SHEAR_MODULUS_TOLERANCE)
    return [
        Problem(
            int(i),
            "shear_modulus",
            "typical",
            f"isotropic material: G {g[i]:g} Pa differs from E/(2(1+nu)) = {expected[i]:g} Pa by "
            f"{100 * off[i]:.0f}% (tolerance {100 * SHEAR_MODULUS_TOLERANCE:.0f}%); "
            "mark the row isotropic false if it is not isotropic",
        )
        for i in np.flatnonzero(mask)
    ]


def _check_fatigue_cycles(rows: Rows) -> list[Problem]:
    """A fatigue strength needs its cycle count, and a cycle count its fatigue strength."""
    cycles = rows.fatigue_cycles
    strength = ~np.isnan(rows.values["fatigue_strength"]["low"])
    given = ~np.isnan(cycles)
    with np.errstate(invalid="ignore"):
        bad = given & ~(np.isfinite(cycles) & (cycles >= 1))
    problems = [
        Problem(int(i), "fatigue_cycles", None, "fatigue_strength needs its cycle count")
        for i in np.flatnonzero(strength & ~given)
    ]
    problems += [
        Problem(int(i), "fatigue_cycles", None, "a cycle count without a fatigue_strength")
        for i in np.flatnonzero(~strength & given)
    ]
    problems += [
        Problem(int(i), "fatigue_cycles", None, f"must be at least 1, got {cycles[i]:g}")
        for i in np.flatnonzero(strength & bad)
    ]
    return problems


def to_table(rows: Rows) -> MaterialTable:
    """The validated records as a MaterialTable."""
    return MaterialTable(
        ids=tuple(rows.ids),
        names=tuple(rows.names),
        families=tuple(rows.families),
        forms=tuple(frozenset(forms) for forms in rows.forms),
        isotropic=np.array(rows.isotropic, dtype=bool),
        low={p: rows.values[p]["low"] for p in ALL_PROPERTIES},
        high={p: rows.values[p]["high"] for p in ALL_PROPERTIES},
        typical={p: rows.values[p]["typical"] for p in ALL_PROPERTIES},
        sources=tuple(rows.sources),
        price_years=tuple(rows.price_years),
        notes=tuple(rows.notes),
        brittle=_brittle(rows),
        fatigue_cycles=rows.fatigue_cycles,
        form_limits=tuple(rows.form_limits),
    )


def _brittle(rows: Rows) -> np.ndarray:
    """The rule's flag (:mod:`~service.core.materials.brittleness`) where a row gives none."""
    derived = brittle_rule(
        rows.values["elongation"]["typical"],
        rows.values["fracture_toughness"]["typical"],
        rows.families,
    )
    flags = [
        bool(rule) if given is None else given
        for rule, given in zip(derived, rows.brittle, strict=True)
    ]
    return np.array(flags, dtype=bool)
