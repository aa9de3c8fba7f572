"""Material CSV files (layout in data/README.md): reading, locating problems, the built-in file."""

from __future__ import annotations

import math
from collections.abc import Sequence
from functools import cache
from pathlib import Path

import numpy as np
import pandas as pd

from service.core.errors import DataError
from service.core.materials.form_limits import FORM_LIMITS_CSV, load_form_limits
from service.core.materials.table import MaterialTable
from service.core.materials.validation import Problem, Rows, check, to_table
from service.core.materials.vocabulary import (
    ALL_PROPERTIES,
    ENDS,
    PROPERTIES,
    STRUCTURAL_PROPERTIES,
)

BUILTIN_CSV = Path(__file__).resolve().parents[3] / "data" / "materials.csv"

_SOURCE_COLUMNS = ("source_properties", "source_price", "source_embodied_carbon")
_SOURCE_LABELS = {
    "source_properties": "properties",
    "source_price": "price",
    "source_embodied_carbon": "embodied carbon",
    "source_toughness": "fracture toughness and elongation",
    "source_fatigue": "fatigue strength",
    "source_compression": "compressive strength and transverse modulus",
}
_SOURCES_OF: dict[str, tuple[str, ...]] = {
    "source_toughness": ("fracture_toughness", "elongation"),
    "source_fatigue": ("fatigue_strength",),
    "source_compression": ("compressive_strength", "transverse_modulus"),
}
"""Source columns required only of rows that give one of their properties."""
_TEXT_COLUMNS = ("id", "name", "family", "isotropic", "forms")
CSV_COLUMNS = (
    _TEXT_COLUMNS
    + tuple(f"{prop}_{end}" for prop in ALL_PROPERTIES for end in ENDS)
    + ("fatigue_cycles", "price_year")
    + _SOURCE_COLUMNS
    + tuple(_SOURCES_OF)
    + ("notes",)
)


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


def load_csv(path: str | Path, form_limits: str | Path | None = None) -> MaterialTable:
    """Read and validate a material CSV and its form limits (layouts in data/README.md).

    ``form_limits`` is the form-limits CSV; by default ``form_limits.csv`` beside ``path``
    if there is one (the materials then have no form limits if not).

    Raises:
        MaterialDataError: listing every problem with its row (1-based, header is row 0)
            and column; the error's own ``row``/``column`` are the first problem's.
    """
    file = str(path)
    try:
        frame = pd.read_csv(path, dtype=str, keep_default_na=False)
    except (OSError, ValueError) as error:
        raise MaterialDataError([DataError(file, None, None, f"cannot read: {error}")]) from error
    missing = [c for c in CSV_COLUMNS if c not in frame.columns]
    unknown = [c for c in frame.columns if c not in CSV_COLUMNS]
    if missing or unknown:
        raise MaterialDataError(
            [DataError(file, None, c, "missing column") for c in missing]
            + [DataError(file, None, c, "unknown column") for c in unknown]
        )
    frame = frame.apply(lambda column: column.str.strip())
    problems: list[Problem] = []
    values = {
        prop: {end: _numbers(frame, f"{prop}_{end}", prop, end, problems) for end in ENDS}
        for prop in ALL_PROPERTIES
    }
    years = _numbers(frame, "price_year", "price_year", None, problems)
    for i in np.flatnonzero(np.isnan(years) | (years != np.round(years))):
        problems.append(Problem(int(i), "price_year", None, "price_year must be a whole year"))
    isotropic = frame["isotropic"].str.lower()
    for i in np.flatnonzero(~isotropic.isin(["true", "false"]).to_numpy()):
        problems.append(Problem(int(i), "isotropic", None, "isotropic must be true or false"))
    for column in _SOURCE_COLUMNS:
        for i in np.flatnonzero((frame[column] == "").to_numpy()):
            problems.append(Problem(int(i), column, None, "a source is required"))
    for column, props in _SOURCES_OF.items():
        given = np.any([~np.isnan(values[p]["low"]) for p in props], axis=0)
        for i in np.flatnonzero(given & (frame[column] == "").to_numpy()):
            problems.append(Problem(int(i), column, None, f"a source is required for {props[0]}"))
    sources = [
        tuple(f"{_SOURCE_LABELS[c]}: {text}" for c, text in row.items() if text)
        for row in frame[[*_SOURCE_COLUMNS, *_SOURCES_OF]].to_dict("records")
    ]
    rows = Rows(
        ids=frame["id"].tolist(),
        names=frame["name"].tolist(),
        families=frame["family"].tolist(),
        isotropic=(isotropic == "true").tolist(),
        forms=[tuple(f.strip() for f in cell.split(";") if f.strip()) for cell in frame["forms"]],
        values=values,
        price_years=[None if math.isnan(y) or y != round(y) else int(y) for y in years],
        sources=sources,
        notes=frame["notes"].tolist(),
        fatigue_cycles=_numbers(frame, "fatigue_cycles", "fatigue_cycles", None, problems),
        brittle=[None] * len(frame),
        form_limits=[()] * len(frame),
    )
    problems += check(rows, PROPERTIES, STRUCTURAL_PROPERTIES)
    located = _located(file, problems)
    limits_file = Path(path).with_name("form_limits.csv") if form_limits is None else form_limits
    if form_limits is not None or Path(limits_file).is_file():
        limits, limit_problems = load_form_limits(limits_file, rows.ids, rows.families, rows.forms)
        located += limit_problems
        rows.form_limits = list(limits)
    if located:
        raise MaterialDataError(located)
    return to_table(rows)


def _numbers(
    frame: pd.DataFrame, column: str, field: str, end: str | None, problems: list[Problem]
) -> np.ndarray:
    """The column as floats, NaN where blank; a problem for each cell that is not a number."""
    text = frame[column]
    numbers = pd.to_numeric(text.where(text != ""), errors="coerce").to_numpy(
        dtype=float, copy=True
    )
    for i in np.flatnonzero(np.isnan(numbers) & (text != "").to_numpy()):
        problems.append(Problem(int(i), field, end, f"not a number: {text.iloc[i]!r}"))
    return numbers


def _located(file: str, problems: list[Problem]) -> list[DataError]:
    """One DataError per cell (the first message for a cell wins), sorted by row."""
    seen: dict[tuple[int, str], DataError] = {}
    for p in problems:
        column = f"{p.field}_{p.end or 'low'}" if p.field in ALL_PROPERTIES else p.field
        seen.setdefault((p.row, column), DataError(file, p.row + 1, column, p.message))
    order = {c: k for k, c in enumerate(CSV_COLUMNS)}
    return sorted(seen.values(), key=lambda e: (e.row, order.get(e.column or "", len(order))))


@cache
def load_builtin() -> MaterialTable:
    """The validated built-in table (``data/materials.csv`` with ``data/form_limits.csv``),
    loaded once per process."""
    return load_csv(BUILTIN_CSV, FORM_LIMITS_CSV)
