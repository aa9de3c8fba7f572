"""Client materials: the contract's Material objects of a request body, as a table."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

import numpy as np

from service.core.errors import InputError
from service.core.materials.form_limits import (
    NUMBER_FIELDS,
    TEXT_FIELDS,
    FormLimit,
    limit_from,
    limit_problems,
)
from service.core.materials.table import MaterialTable
from service.core.materials.validation import Rows, check, to_table
from service.core.materials.vocabulary import (
    ALL_PROPERTIES,
    ANISOTROPIC_FAMILIES,
    ENDS,
    FORMS,
    UNITS,
)

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


_RECORD_KEYS = frozenset(
    {
        "id",
        "name",
        "family",
        "properties",
        "forms",
        "sources",
        "isotropic",
        "price_year",
        "notes",
        "brittle",
        "fatigue_cycles",
        "form_limits",
    }
)
_RANGE_KEYS = frozenset({"low", "high", "typical", "unit"})


def is_number(value) -> bool:
    """Whether a JSON value is a number (a bool is not)."""
    return isinstance(value, int | float) and not isinstance(value, bool)


def from_records(records: Sequence[Mapping]) -> MaterialTable:
    """Client materials in the contract's Material shape, values in SI units.

    ``typical`` defaults to the geometric mean of low and high; ``unit``, when given, must be
    the SI unit of :data:`UNITS` (the API converts other units before calling);
    ``isotropic`` defaults to False for the families in :data:`ANISOTROPIC_FAMILIES`;
    ``brittle`` defaults to the rule of :mod:`~service.core.materials.brittleness` on the
    material's elongation and fracture toughness; ``fatigue_cycles`` goes with
    ``fatigue_strength``; ``form_limits`` (family id -> {process, min_wall, max_wall_ratio,
    min_size, max_size, source}, metres) may be given for the material's forms. See
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
    values = {p: {end: np.full(n, np.nan) for end in ENDS} for p in ALL_PROPERTIES}
    rows = Rows(
        ids=[],
        names=[],
        families=[],
        isotropic=[],
        forms=[],
        values=values,
        price_years=[],
        sources=[],
        notes=[],
        fatigue_cycles=np.full(n, np.nan),
        brittle=[],
        form_limits=[],
    )
    for k, record in enumerate(records):
        if isinstance(record, Mapping):
            _parse_record(record, k, rows, add)
        else:
            add(str(k), "must be an object")
            _parse_record({}, k, rows, lambda path, message: None)
    for problem in check(rows, CLIENT_REQUIRED_PROPERTIES):
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
    return to_table(rows)


def _overlap(path: str, other: str) -> bool:
    """Whether one dotted path is the other or lies inside it."""
    return path == other or path.startswith(other + ".") or other.startswith(path + ".")


def _parse_record(record: Mapping, k: int, rows: Rows, add) -> None:
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
    brittle = record.get("brittle")
    if brittle is not None and not isinstance(brittle, bool):
        add(f"{k}.brittle", "must be true or false")
        brittle = None
    rows.brittle.append(brittle)
    cycles = record.get("fatigue_cycles")
    if cycles is not None:
        if is_number(cycles):
            rows.fatigue_cycles[k] = float(cycles)
        else:
            add(f"{k}.fatigue_cycles", "must be a number")
    rows.form_limits.append(_form_limits(record.get("form_limits"), rows.forms[-1], k, add))
    _record_properties(record.get("properties"), k, rows.values, add)


def _form_limits(given, forms: tuple[str, ...], k: int, add) -> tuple[FormLimit, ...]:
    """A record's form limits, in :data:`FORMS` order; problems at their paths."""
    if given is None:
        return ()
    if not isinstance(given, Mapping):
        add(f"{k}.form_limits", "must be an object of section family id -> limits")
        return ()
    limits = {}
    for form, values in given.items():
        path = f"{k}.form_limits.{form}"
        if form not in FORMS:
            add(path, f"unknown section family; known: {', '.join(FORMS)}")
            continue
        if form not in forms:
            add(path, "the material is not made into this form (add it to forms)")
            continue
        if not isinstance(values, Mapping):
            add(path, "must be an object with process, min_wall, max_wall_ratio, min_size, "
                "max_size and source")
            continue
        for key in values.keys() - {*NUMBER_FIELDS, *TEXT_FIELDS}:
            add(f"{path}.{key}", "unknown field")
        loaded: dict[str, object] = {f: values.get(f) for f in TEXT_FIELDS}
        malformed = set()
        for field in NUMBER_FIELDS:
            value = values.get(field)
            if value is not None and not is_number(value):
                add(f"{path}.{field}", "must be a number")
                malformed.add(field)
            loaded[field] = float(value) if value is not None and is_number(value) else math.nan
        problems = [p for p in limit_problems(form, loaded) if p[0] not in malformed]
        for field, message in problems:
            add(f"{path}.{field}", message)
        if not problems and not malformed:
            limits[form] = limit_from(form, loaded)
    return tuple(limits[form] for form in FORMS if form in limits)


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
        for end in ENDS:
            value = given.get(end)
            if value is None:
                continue
            if is_number(value):
                values[prop][end][k] = float(value)
            else:
                add(f"{path}.{end}", "must be a number")
    # The ultimate strength is never below the design strength, so it is a safe default.
    if "tensile_strength" not in properties and isinstance(properties.get("strength"), Mapping):
        for end in ENDS:
            values["tensile_strength"][end][k] = values["strength"][end][k]
