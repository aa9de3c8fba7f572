"""Material data: the built-in table from data/, client materials, and array access.

Every material carries a low, high and typical value of each property in :data:`PROPERTIES`
(and optionally of :data:`OPTIONAL_PROPERTIES`), in SI units (:data:`UNITS`). The values are
held by a frozen :class:`MaterialTable` as one numpy array per property and end, so the
sizing and ranking code works over all materials at once.

- :func:`load_builtin` validates ``data/materials.csv`` once per process; :func:`load_csv`
  validates any file of the same layout (documented in ``data/README.md``) and raises
  :class:`MaterialDataError`, a :class:`~service.core.errors.DataError` located at the first
  problem that also lists every other problem.
- :func:`from_records` turns client materials (the contract's Material shape, values already
  SI) into a table, validated by the same checks, raising
  :class:`~service.core.errors.InputError` with paths like ``"3.properties.density"``.
- :func:`select` applies the contract's MaterialFilter.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from functools import cache
from pathlib import Path
from types import MappingProxyType

import numpy as np
import pandas as pd

from service.core.errors import DataError, InputError, UnknownResource

PROPERTIES: tuple[str, ...] = (
    "density",
    "youngs_modulus",
    "shear_modulus",
    "poisson_ratio",
    "strength",
    "tensile_strength",
    "price",
    "embodied_carbon",
    "max_service_temperature",
)
"""Properties every built-in material has. ``strength`` is the design strength: yield or 0.2%
proof for metals and polymers, tensile for composites, modulus of rupture for ceramics, glass
and wood (compressive strength for sandwich cores)."""

OPTIONAL_PROPERTIES: tuple[str, ...] = ("shear_strength",)
"""Properties a material may have; absent values are NaN in the table's arrays."""

ALL_PROPERTIES: tuple[str, ...] = PROPERTIES + OPTIONAL_PROPERTIES

CLIENT_REQUIRED_PROPERTIES: tuple[str, ...] = (
    "density",
    "youngs_modulus",
    "shear_modulus",
    "poisson_ratio",
    "strength",
    "price",
    "embodied_carbon",
)
"""The properties the contract makes compulsory for a client material. A client material
without ``tensile_strength`` takes its ``strength`` (the ultimate is never below the design
strength); without ``max_service_temperature`` the value is NaN (unknown), which no
``where`` bound accepts."""

UNITS: Mapping[str, str] = MappingProxyType(
    {
        "density": "kg/m^3",
        "youngs_modulus": "Pa",
        "shear_modulus": "Pa",
        "poisson_ratio": "1",
        "strength": "Pa",
        "tensile_strength": "Pa",
        "price": "USD/kg",
        "embodied_carbon": "kg/kg",
        "max_service_temperature": "K",
        "shear_strength": "Pa",
    }
)
"""Property -> SI unit of its values (price: US dollars of the row's ``price_year`` per kg;
embodied carbon: kg CO2e per kg)."""

FAMILIES: tuple[str, ...] = (
    "steel",
    "cast_iron",
    "aluminium",
    "titanium",
    "magnesium",
    "copper",
    "nickel",
    "polymer",
    "composite",
    "wood",
    "ceramic",
    "glass",
    "foam",
)
"""Material family ids. Sandwich cores (foams and honeycombs) are the ``"foam"`` family."""

CORE_FAMILY = "foam"
"""The family of sandwich core materials; its members are made into no section (forms empty)."""

ANISOTROPIC_FAMILIES: frozenset[str] = frozenset({"composite", "wood", "foam"})
"""Families whose client materials default to ``isotropic = False``."""

FORMS: tuple[str, ...] = (
    "solid_round",
    "solid_rectangle",
    "round_tube",
    "rectangular_tube",
    "i_section",
    "sandwich_panel",
)
"""The contract's section family ids a material may be made into (``sandwich_panel``: usable
as a face)."""

BASES: tuple[str, ...] = ("typical", "conservative")

CONSERVATIVE_END: Mapping[str, str] = MappingProxyType(
    {
        "youngs_modulus": "low",
        "shear_modulus": "low",
        "strength": "low",
        "shear_strength": "low",
        "density": "high",
    }
)
"""The end of the range the ``"conservative"`` basis takes; other properties use typical."""

SHEAR_MODULUS_TOLERANCE = 0.10
"""Largest relative difference between an isotropic material's typical G and
E / (2 (1 + nu)). Handbooks measure E, G and nu in separate tests and round each, and wrought
products are slightly textured, so published triples disagree by a few per cent; 10% accepts
that scatter and still catches a copying slip (G typed for E, a wrong unit prefix)."""

BUILTIN_CSV = Path(__file__).resolve().parents[2] / "data" / "materials.csv"

ID_PATTERN = r"^[a-z0-9][a-z0-9_-]*$"
"""What a material id looks like (a slug)."""

_ID = re.compile(ID_PATTERN)
_ENDS = ("low", "high", "typical")
_SOURCE_COLUMNS = ("source_properties", "source_price", "source_embodied_carbon")
_SOURCE_LABELS = {
    "source_properties": "properties",
    "source_price": "price",
    "source_embodied_carbon": "embodied carbon",
}
_TEXT_COLUMNS = ("id", "name", "family", "isotropic", "forms")
_CSV_COLUMNS = (
    _TEXT_COLUMNS
    + tuple(f"{prop}_{end}" for prop in ALL_PROPERTIES for end in _ENDS)
    + ("price_year",)
    + _SOURCE_COLUMNS
    + ("notes",)
)
_PRICE_YEARS = (1990, 2100)


class MaterialDataError(DataError):
    """Every problem found in a material data file.

    ``file``, ``row``, ``column`` and ``message`` locate the first problem (rows in file
    order); ``problems`` holds all of them, each a :class:`DataError`.
    """

    def __init__(self, problems: Sequence[DataError]):
        first = problems[0]
        super().__init__(first.file, first.row, first.column, first.message)
        self.problems = tuple(problems)

    def __str__(self) -> str:
        lines = [f"{len(self.problems)} problem(s) in material data:"]
        lines += [f"  {problem}" for problem in self.problems]
        return "\n".join(lines)


@dataclass(frozen=True)
class PropertyRange:
    """One property of one material.

    Attributes:
        low: low end of the range, in ``unit``.
        high: high end, in ``unit``.
        typical: the source's typical value, else the geometric mean of low and high.
        unit: the SI unit (:data:`UNITS`).
    """

    low: float
    high: float
    typical: float
    unit: str


@dataclass(frozen=True)
class Material:
    """One material, as the contract's Material object describes it.

    Attributes:
        id: slug, unique in its table.
        name: display name.
        family: one of :data:`FAMILIES`.
        properties: property name -> :class:`PropertyRange` (optional properties only when
            present).
        forms: section family ids it is commonly made into, in :data:`FORMS` order.
        sources: where the values come from.
        isotropic: whether E, G and nu obey G = E / (2 (1 + nu)).
        price_year: the year the price refers to, or None if unknown.
        notes: what is special about the row's values (may be empty).
    """

    id: str
    name: str
    family: str
    properties: Mapping[str, PropertyRange]
    forms: tuple[str, ...]
    sources: tuple[str, ...]
    isotropic: bool
    price_year: int | None
    notes: str

    def record(self) -> dict:
        """The contract's Material dict (plus ``isotropic``, ``price_year`` and ``notes``)."""
        return {
            "id": self.id,
            "name": self.name,
            "family": self.family,
            "properties": {
                prop: {"low": r.low, "high": r.high, "typical": r.typical, "unit": r.unit}
                for prop, r in self.properties.items()
            },
            "forms": list(self.forms),
            "sources": list(self.sources),
            "isotropic": self.isotropic,
            "price_year": self.price_year,
            "notes": self.notes,
        }


def _frozen(array: np.ndarray) -> np.ndarray:
    array = np.array(array, dtype=float)
    array.flags.writeable = False
    return array


@dataclass(frozen=True, eq=False)
class MaterialTable:
    """Materials as arrays: element ``i`` of every array and tuple is material ``i``.

    Attributes:
        ids: material ids, unique.
        names: display names.
        families: family ids (:data:`FAMILIES`).
        forms: for each material the frozenset of section family ids it is made into.
        isotropic: bool array, shape (n,).
        low, high, typical: property -> float array of shape (n,) in SI units (:data:`UNITS`),
            read-only; NaN where an optional property is absent (and for a client
            material's unknown max_service_temperature).
        sources: for each material, its source strings.
        price_years: for each material, the year of its price or None.
        notes: for each material, its notes ("" when none).
    """

    ids: tuple[str, ...]
    names: tuple[str, ...]
    families: tuple[str, ...]
    forms: tuple[frozenset[str], ...]
    isotropic: np.ndarray
    low: Mapping[str, np.ndarray]
    high: Mapping[str, np.ndarray]
    typical: Mapping[str, np.ndarray]
    sources: tuple[tuple[str, ...], ...]
    price_years: tuple[int | None, ...]
    notes: tuple[str, ...]

    def __post_init__(self):
        isotropic = np.array(self.isotropic, dtype=bool)
        isotropic.flags.writeable = False
        object.__setattr__(self, "isotropic", isotropic)
        for end in _ENDS:
            arrays = {prop: _frozen(getattr(self, end)[prop]) for prop in ALL_PROPERTIES}
            object.__setattr__(self, end, MappingProxyType(arrays))
        object.__setattr__(self, "_positions", {id_: i for i, id_ in enumerate(self.ids)})

    def __len__(self) -> int:
        return len(self.ids)

    def values(self, prop: str, basis: str = "typical") -> np.ndarray:
        """Values of ``prop`` for every material, shape (n,), SI units.

        ``basis="conservative"`` takes the end named in :data:`CONSERVATIVE_END` (low
        stiffness and strength, high density) and typical values for the other properties.
        """
        if prop not in ALL_PROPERTIES:
            raise UnknownResource("material property", prop)
        if basis == "typical":
            return self.typical[prop]
        if basis == "conservative":
            return getattr(self, CONSERVATIVE_END.get(prop, "typical"))[prop]
        raise UnknownResource("property basis", basis)

    def shear_strength(self, basis: str = "typical") -> np.ndarray:
        """Shear strength, Pa, shape (n,): the material's own value where it gives one, else
        strength / sqrt(3) (von Mises)."""
        own = self.values("shear_strength", basis)
        return np.where(np.isnan(own), self.values("strength", basis) / math.sqrt(3.0), own)

    def take(self, indices: Sequence[int] | np.ndarray) -> MaterialTable:
        """The materials at ``indices`` (integer positions or a boolean mask), in that order."""
        indices = np.asarray(indices)
        if indices.dtype == bool:
            indices = np.flatnonzero(indices)
        indices = indices.astype(int)
        pick = indices.tolist()
        return MaterialTable(
            ids=tuple(self.ids[i] for i in pick),
            names=tuple(self.names[i] for i in pick),
            families=tuple(self.families[i] for i in pick),
            forms=tuple(self.forms[i] for i in pick),
            isotropic=self.isotropic[indices],
            low={prop: values[indices] for prop, values in self.low.items()},
            high={prop: values[indices] for prop, values in self.high.items()},
            typical={prop: values[indices] for prop, values in self.typical.items()},
            sources=tuple(self.sources[i] for i in pick),
            price_years=tuple(self.price_years[i] for i in pick),
            notes=tuple(self.notes[i] for i in pick),
        )

    def concat(self, other: MaterialTable) -> MaterialTable:
        """This table followed by ``other``.

        Raises:
            InputError: an id of ``other`` is already in this table; paths are positions in
                ``other`` (``"2.id"``), so the API can prefix ``custom_materials.``.
        """
        clashes = {
            f"{k}.id": [f"id {id_!r} is already used by a built-in material"]
            for k, id_ in enumerate(other.ids)
            if id_ in self._positions
        }
        if clashes:
            raise InputError(clashes)
        return MaterialTable(
            ids=self.ids + other.ids,
            names=self.names + other.names,
            families=self.families + other.families,
            forms=self.forms + other.forms,
            isotropic=np.concatenate([self.isotropic, other.isotropic]),
            low={p: np.concatenate([self.low[p], other.low[p]]) for p in ALL_PROPERTIES},
            high={p: np.concatenate([self.high[p], other.high[p]]) for p in ALL_PROPERTIES},
            typical={
                p: np.concatenate([self.typical[p], other.typical[p]]) for p in ALL_PROPERTIES
            },
            sources=self.sources + other.sources,
            price_years=self.price_years + other.price_years,
            notes=self.notes + other.notes,
        )

    def position(self, material_id: str) -> int:
        """Index of ``material_id`` in the arrays; UnknownResource if absent."""
        try:
            return self._positions[material_id]
        except KeyError:
            raise UnknownResource("material", material_id) from None

    def material(self, material_id: str) -> Material:
        """The material with this id; UnknownResource if absent."""
        i = self.position(material_id)
        properties = {
            prop: PropertyRange(
                low=float(self.low[prop][i]),
                high=float(self.high[prop][i]),
                typical=float(self.typical[prop][i]),
                unit=UNITS[prop],
            )
            for prop in ALL_PROPERTIES
            if not np.isnan(self.typical[prop][i])
        }
        return Material(
            id=self.ids[i],
            name=self.names[i],
            family=self.families[i],
            properties=MappingProxyType(properties),
            forms=tuple(form for form in FORMS if form in self.forms[i]),
            sources=self.sources[i],
            isotropic=bool(self.isotropic[i]),
            price_year=self.price_years[i],
            notes=self.notes[i],
        )

    def records(self) -> list[dict]:
        """Every material as the contract's Material dict, in table order."""
        return [self.material(id_).record() for id_ in self.ids]


# --------------------------------------------------------------------------- validation


@dataclass(frozen=True)
class _Problem:
    """One problem: 0-based row, the field (a property or a column such as ``family``),
    the end of a property (``low``/``high``/``typical``) or None, and the message."""

    row: int
    field: str
    end: str | None
    message: str


@dataclass
class _Rows:
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


def _check(rows: _Rows, required: Iterable[str]) -> list[_Problem]:
    """Every problem of ``rows`` (ids, families, forms, property values); fills blank
    typical values with the geometric mean of low and high in place."""
    problems: list[_Problem] = []

    def flag(i: int, field: str, message: str) -> None:
        problems.append(_Problem(i, field, None, message))

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
        if year is not None and not _PRICE_YEARS[0] <= year <= _PRICE_YEARS[1]:
            flag(i, "price_year", f"price year {year} outside {_PRICE_YEARS[0]}..{_PRICE_YEARS[1]}")
    required = set(required)
    for prop in ALL_PROPERTIES:
        problems += _check_property(prop, rows.values[prop], prop in required)
    problems += _check_shear_modulus(rows)
    return problems


def _check_property(prop: str, ends: dict[str, np.ndarray], required: bool) -> list[_Problem]:
    low, high, typical = (ends[end] for end in _ENDS)
    problems: list[_Problem] = []

    def report(mask: np.ndarray, end: str | None, message) -> None:
        for i in np.flatnonzero(mask):
            problems.append(_Problem(int(i), prop, end, message(int(i))))

    given = {end: ~np.isnan(ends[end]) for end in _ENDS}
    if required:
        for end in ("low", "high"):
            report(~given[end], end, lambda i: "missing value")
    else:
        partial = (given["low"] != given["high"]) | (given["typical"] & ~given["low"])
        report(partial, None, lambda i: "give both low and high, or neither")
    bad = {}
    for end in _ENDS:
        values = ends[end]
        bad[end] = given[end] & ~(np.isfinite(values) & (values > 0))
        report(bad[end], end, lambda i, v=values: f"must be positive and finite, got {v[i]:g}")
        if prop == "poisson_ratio":
            over = given[end] & ~bad[end] & (values > 0.5)
            report(
                over, end, lambda i, v=values: f"Poisson's ratio must be in (0, 0.5], got {v[i]:g}"
            )
            bad[end] |= over
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


def _check_shear_modulus(rows: _Rows) -> list[_Problem]:
    """G = E / (2 (1 + nu)) for isotropic materials (theory of isotropic elasticity)."""
    e, g, nu = (
        rows.values[p]["typical"] for p in ("youngs_modulus", "shear_modulus", "poisson_ratio")
    )
    expected = e / (2.0 * (1.0 + nu))
    with np.errstate(invalid="ignore"):
        off = np.abs(g / expected - 1.0)
    mask = np.asarray(rows.isotropic, dtype=bool) & (off > SHEAR_MODULUS_TOLERANCE)
    return [
        _Problem(
            int(i),
            "shear_modulus",
            "typical",
            f"isotropic material: G {g[i]:g} Pa differs from E/(2(1+nu)) = {expected[i]:g} Pa by "
            f"{100 * off[i]:.0f}% (tolerance {100 * SHEAR_MODULUS_TOLERANCE:.0f}%); "
            "mark the row isotropic false if it is not isotropic",
        )
        for i in np.flatnonzero(mask)
    ]


def _table(rows: _Rows) -> MaterialTable:
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
    )


# --------------------------------------------------------------------------- CSV files


def load_csv(path: str | Path) -> MaterialTable:
    """Read and validate a material CSV (layout in data/README.md).

    Raises:
        MaterialDataError: listing every problem with its row (1-based, header is row 0)
            and column; the error's own ``row``/``column`` are the first problem's.
    """
    file = str(path)
    try:
        frame = pd.read_csv(path, dtype=str, keep_default_na=False)
    except (OSError, ValueError) as error:
        raise MaterialDataError([DataError(file, None, None, f"cannot read: {error}")]) from error
    missing = [c for c in _CSV_COLUMNS if c not in frame.columns]
    unknown = [c for c in frame.columns if c not in _CSV_COLUMNS]
    if missing or unknown:
        raise MaterialDataError(
            [DataError(file, None, c, "missing column") for c in missing]
            + [DataError(file, None, c, "unknown column") for c in unknown]
        )
    frame = frame.apply(lambda column: column.str.strip())
    problems: list[_Problem] = []
    values = {
        prop: {end: _numbers(frame, f"{prop}_{end}", prop, end, problems) for end in _ENDS}
        for prop in ALL_PROPERTIES
    }
    years = _numbers(frame, "price_year", "price_year", None, problems)
    for i in np.flatnonzero(np.isnan(years) | (years != np.round(years))):
        problems.append(_Problem(int(i), "price_year", None, "price_year must be a whole year"))
    isotropic = frame["isotropic"].str.lower()
    for i in np.flatnonzero(~isotropic.isin(["true", "false"]).to_numpy()):
        problems.append(_Problem(int(i), "isotropic", None, "isotropic must be true or false"))
    for column in _SOURCE_COLUMNS:
        for i in np.flatnonzero((frame[column] == "").to_numpy()):
            problems.append(_Problem(int(i), column, None, "a source is required"))
    rows = _Rows(
        ids=frame["id"].tolist(),
        names=frame["name"].tolist(),
        families=frame["family"].tolist(),
        isotropic=(isotropic == "true").tolist(),
        forms=[tuple(f.strip() for f in cell.split(";") if f.strip()) for cell in frame["forms"]],
        values=values,
        price_years=[None if math.isnan(y) or y != round(y) else int(y) for y in years],
        sources=[
            tuple(f"{_SOURCE_LABELS[c]}: {row[c]}" for c in _SOURCE_COLUMNS)
            for row in frame[list(_SOURCE_COLUMNS)].to_dict("records")
        ],
        notes=frame["notes"].tolist(),
    )
    problems += _check(rows, PROPERTIES)
    if problems:
        raise MaterialDataError(_located(file, problems))
    return _table(rows)


def _numbers(
    frame: pd.DataFrame, column: str, field: str, end: str | None, problems: list[_Problem]
) -> np.ndarray:
    """The column as floats, NaN where blank; a problem for each cell that is not a number."""
    text = frame[column]
    numbers = pd.to_numeric(text.where(text != ""), errors="coerce").to_numpy(
        dtype=float, copy=True
    )
    for i in np.flatnonzero(np.isnan(numbers) & (text != "").to_numpy()):
        problems.append(_Problem(int(i), field, end, f"not a number: {text.iloc[i]!r}"))
    return numbers


def _located(file: str, problems: list[_Problem]) -> list[DataError]:
    """One DataError per cell (the first message for a cell wins), sorted by row."""
    seen: dict[tuple[int, str], DataError] = {}
    for p in problems:
        column = f"{p.field}_{p.end or 'low'}" if p.field in ALL_PROPERTIES else p.field
        seen.setdefault((p.row, column), DataError(file, p.row + 1, column, p.message))
    order = {c: k for k, c in enumerate(_CSV_COLUMNS)}
    return sorted(seen.values(), key=lambda e: (e.row, order.get(e.column, len(order))))


@cache
def load_builtin() -> MaterialTable:
    """The validated built-in table (``data/materials.csv``), loaded once per process."""
    return load_csv(BUILTIN_CSV)


# --------------------------------------------------------------------------- client materials

_RECORD_KEYS = frozenset(
    {"id", "name", "family", "properties", "forms", "sources", "isotropic", "price_year", "notes"}
)
_RANGE_KEYS = frozenset({"low", "high", "typical", "unit"})


def _is_number(value) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def from_records(records: Sequence[Mapping]) -> MaterialTable:
    """Client materials in the contract's Material shape, values in SI units.

    ``typical`` defaults to the geometric mean of low and high; ``unit``, when given, must be
    the SI unit of :data:`UNITS` (the API converts other units before calling);
    ``isotropic`` defaults to False for the families in :data:`ANISOTROPIC_FAMILIES`. See
    :data:`CLIENT_REQUIRED_PROPERTIES` for the compulsory properties.

    Raises:
        InputError: every problem, at paths relative to the list (``"3.properties.density"``,
            ``"0.family"``).
    """
    if isinstance(records, str | bytes | Mapping) or not isinstance(records, Sequence):
        raise InputError.single("_schema", "must be a list of materials")
    errors: dict[str, list[str]] = {}

    def add(path: str, message: str) -> None:
        errors.setdefault(path, []).append(message)

    n = len(records)
    values = {p: {end: np.full(n, np.nan) for end in _ENDS} for p in ALL_PROPERTIES}
    rows = _Rows(
        ids=[],
        names=[],
        families=[],
        isotropic=[],
        forms=[],
        values=values,
        price_years=[],
        sources=[],
        notes=[],
    )
    for k, record in enumerate(records):
        if isinstance(record, Mapping):
            _parse_record(record, k, rows, add)
        else:
            add(str(k), "must be an object")
            _parse_record({}, k, rows, lambda path, message: None)
    for problem in _check(rows, CLIENT_REQUIRED_PROPERTIES):
        field = problem.field
        path = (
            f"{problem.row}.properties.{field}"
            if field in ALL_PROPERTIES
            else f"{problem.row}.{field}"
        )
        # A value already reported as malformed (or a record that is not an object) is not
        # reported again as missing or invalid.
        if not any(_overlap(path, reported) for reported in errors):
            add(path, problem.message)
    if errors:
        raise InputError(errors)
    return _table(rows)


def _overlap(path: str, other: str) -> bool:
    """Whether one dotted path is the other or lies inside it."""
    return path == other or path.startswith(other + ".") or other.startswith(path + ".")


def _parse_record(record: Mapping, k: int, rows: _Rows, add) -> None:
    """Append record ``k`` to ``rows``, reporting fields of the wrong type."""
    for key in record.keys() - _RECORD_KEYS:
        add(f"{k}.{key}", "unknown field")
    rows.ids.append(_text(record, "id", k, add, required=True))
    rows.names.append(_text(record, "name", k, add, required=True))
    family = _text(record, "family", k, add, required=True)
    rows.families.append(family)
    rows.forms.append(_strings(record, "forms", k, add))
    rows.sources.append(_strings(record, "sources", k, add))
    rows.notes.append(_text(record, "notes", k, add, required=False))
    isotropic = record.get("isotropic", family not in ANISOTROPIC_FAMILIES)
    if not isinstance(isotropic, bool):
        add(f"{k}.isotropic", "must be true or false")
        isotropic = False
    rows.isotropic.append(isotropic)
    year = record.get("price_year")
    if year is not None and (not isinstance(year, int) or isinstance(year, bool)):
        add(f"{k}.price_year", "must be a whole year")
        year = None
    rows.price_years.append(year)
    _record_properties(record.get("properties"), k, rows.values, add)


def _text(record: Mapping, key: str, k: int, add, required: bool) -> str:
    value = record.get(key)
    if value is None:
        if required:
            add(f"{k}.{key}", "missing")
        return ""
    if not isinstance(value, str):
        add(f"{k}.{key}", "must be a string")
        return ""
    return value


def _strings(record: Mapping, key: str, k: int, add) -> tuple[str, ...]:
    value = record.get(key, [])
    if isinstance(value, str) or not isinstance(value, Sequence):
        add(f"{k}.{key}", "must be a list of strings")
        return ()
    for j, item in enumerate(value):
        if not isinstance(item, str):
            add(f"{k}.{key}.{j}", "must be a string")
    return tuple(item for item in value if isinstance(item, str))


def _record_properties(properties, k: int, values: dict, add) -> None:
    """Copy one record's property ranges into ``values`` (row ``k``), reporting shape errors."""
    if not isinstance(properties, Mapping):
        add(f"{k}.properties", "missing" if properties is None else "must be an object")
        return
    for prop in properties.keys() - set(ALL_PROPERTIES):
        add(f"{k}.properties.{prop}", f"unknown property; known: {', '.join(ALL_PROPERTIES)}")
    for prop in ALL_PROPERTIES:
        given = properties.get(prop)
        if given is None:
            continue
        path = f"{k}.properties.{prop}"
        if not isinstance(given, Mapping):
            add(path, "must be an object with low, high and optional typical")
            continue
        for key in given.keys() - _RANGE_KEYS:
            add(f"{path}.{key}", "unknown field")
        unit = given.get("unit")
        if unit is not None and unit != UNITS[prop]:
            add(f"{path}.unit", f"values must be given in {UNITS[prop]!r}")
        for end in _ENDS:
            value = given.get(end)
            if value is None:
                continue
            if _is_number(value):
                values[prop][end][k] = float(value)
            else:
                add(f"{path}.{end}", "must be a number")
    # The ultimate strength is never below the design strength, so it is a safe default.
    if "tensile_strength" not in properties and isinstance(properties.get("strength"), Mapping):
        for end in _ENDS:
            values["tensile_strength"][end][k] = values["strength"][end][k]


# --------------------------------------------------------------------------- filters


def select(
    table: MaterialTable,
    families: Sequence[str] | None = None,
    ids: Sequence[str] | None = None,
    exclude: Sequence[str] | None = None,
    where: Mapping[str, Mapping[str, float]] | None = None,
) -> MaterialTable:
    """The contract's MaterialFilter: the materials that pass every given criterion.

    Args:
        families: keep these families.
        ids: keep these materials.
        exclude: drop these materials.
        where: property -> {"min": x, "max": y} (either bound optional, SI units), applied to
            typical values; a material without the property (NaN) fails any bound.

    Returns:
        The passing materials in table order (possibly none).

    Raises:
        InputError: unknown family (``"families.<k>"``), id (``"ids.<k>"``,
            ``"exclude.<k>"``) or property (``"where.<property>"``), or a bad bound.
    """
    errors: dict[str, list[str]] = {}
    keep = np.ones(len(table), dtype=bool)
    if families is not None:
        for k, family in enumerate(families):
            if family not in FAMILIES:
                errors[f"families.{k}"] = [f"unknown family {family!r}"]
        keep &= np.isin(np.array(table.families, dtype=object), list(families))
    for key, chosen, wanted in (("ids", ids, True), ("exclude", exclude, False)):
        if chosen is None:
            continue
        for k, id_ in enumerate(chosen):
            if id_ not in table._positions:
                errors[f"{key}.{k}"] = [f"unknown material {id_!r}"]
        member = np.isin(np.array(table.ids, dtype=object), list(chosen))
        keep &= member if wanted else ~member
    for prop, bounds in (where or {}).items():
        path = f"where.{prop}"
        if prop not in ALL_PROPERTIES:
            errors[path] = [f"unknown property; known: {', '.join(ALL_PROPERTIES)}"]
            continue
        if not isinstance(bounds, Mapping) or not bounds or bounds.keys() - {"min", "max"}:
            errors[path] = ['must be an object with "min" and/or "max"']
            continue
        if not all(_is_number(v) for v in bounds.values()):
            errors[path] = ["bounds must be numbers"]
            continue
        low, high = bounds.get("min", -np.inf), bounds.get("max", np.inf)
        if low > high:
            errors[path] = [f"min {low:g} is above max {high:g}"]
            continue
        typical = table.typical[prop]
        with np.errstate(invalid="ignore"):
            keep &= (typical >= low) & (typical <= high)
    if errors:
        raise InputError(errors)
    return table.take(keep)
