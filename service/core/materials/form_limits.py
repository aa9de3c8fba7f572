"""What the usual process can make: manufacturing limits per material and section family.

A :class:`FormLimit` says, for one material made into one section family by its usual
process, the thinnest wall, the largest ratio of outer dimension to wall, and the smallest
and largest outer dimension. :func:`measures` defines those three quantities for each family
from its dimensions (all metres), so a check of a section against a limit is
:func:`within`. The built-in limits live in ``data/form_limits.csv`` (layout in
``data/README.md``), read by :func:`load_form_limits`.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd

from service.core.errors import DataError
from service.core.materials.vocabulary import CORE_FAMILY, FAMILIES, FORMS, PROCESSES

if TYPE_CHECKING:
    from service.core.materials.table import MaterialTable

FORM_LIMITS_CSV = Path(__file__).resolve().parents[3] / "data" / "form_limits.csv"

WALL_FORMS: frozenset[str] = frozenset(
    {"solid_rectangle", "round_tube", "rectangular_tube", "i_section", "sandwich_panel"}
)
"""Families with a wall (for a solid rectangle: its smaller side; for a sandwich panel: a
face), so with a ``min_wall``."""

RATIO_FORMS: frozenset[str] = frozenset(
    {"solid_rectangle", "round_tube", "rectangular_tube", "i_section"}
)
"""Families with a ``max_wall_ratio`` (outer dimension over wall)."""

NUMBER_FIELDS: tuple[str, ...] = ("min_wall", "max_wall_ratio", "min_size", "max_size")
TEXT_FIELDS: tuple[str, ...] = ("process", "source")
CSV_COLUMNS: tuple[str, ...] = ("applies_to", "form", "process", *NUMBER_FIELDS, "source")


@dataclass(frozen=True)
class FormLimit:
    """What the usual process makes of one material in one section family.

    Attributes:
        form: the section family id.
        process: one of :data:`~service.core.materials.vocabulary.PROCESSES`.
        min_wall: thinnest wall, flange, web or face, m (None for ``solid_round``).
        max_wall_ratio: largest outer dimension / wall (None for ``solid_round`` and
            ``sandwich_panel``).
        min_size: smallest outer dimension, m.
        max_size: largest outer dimension, m.
        source: where the limits come from ("from memory", "common practice" where so).
    """

    form: str
    process: str
    min_wall: float | None
    max_wall_ratio: float | None
    min_size: float
    max_size: float
    source: str

    def record(self) -> dict:
        """The contract's FormLimit dict (null where a limit does not apply)."""
        return {
            "process": self.process,
            **{f: getattr(self, f) for f in NUMBER_FIELDS},
            "source": self.source,
        }


def form_limit_of(materials: MaterialTable, index: int, form: str) -> FormLimit | None:
    """The limit of material ``index`` made as ``form``, or None when it gives none."""
    return next((limit for limit in materials.form_limits[index]  # type: ignore[index]
                 if limit.form == form), None)


def max_wall_ratios(materials: MaterialTable, indices: Sequence[int] | np.ndarray, form: str
                    ) -> np.ndarray:
    """The largest outer dimension / wall of each material ``indices`` made as ``form``,
    shape (K,); NaN where none applies."""
    ratios = []
    for index in indices:
        limit = form_limit_of(materials, int(index), form)
        ratios.append(math.nan if limit is None or limit.max_wall_ratio is None
                      else limit.max_wall_ratio)
    return np.array(ratios, dtype=float)


def measures(form: str, dimensions: Mapping[str, np.ndarray | float]
             ) -> tuple[np.ndarray, ...]:
    """The wall, wall ratio and outer size of sections of family ``form``, each an array of
    the dimensions' broadcast shape (NaN where the family has no such quantity).

    - wall: ``solid_rectangle`` the smaller side; tubes the wall; ``i_section`` the thinner
      of flange and web; ``sandwich_panel`` the face.
    - wall ratio: the outer size over the wall (for ``i_section``, the larger of depth and
      flange width over the thinner plate); not defined for ``solid_round`` and
      ``sandwich_panel``.
    - size: the largest outer dimension: diameter, the larger of depth and width (of depth
      and flange width), and for ``sandwich_panel`` the panel thickness (core + 2 faces).
    """
    d = {name: np.asarray(value, dtype=float) for name, value in dimensions.items()}
    if form == "solid_round":
        size = d["diameter"]
        wall = ratio = np.full_like(size, np.nan)
    elif form == "solid_rectangle":
        wall = np.minimum(d["depth"], d["width"])
        size = np.maximum(d["depth"], d["width"])
        ratio = size / wall
    elif form == "round_tube":
        wall, size = np.broadcast_arrays(d["wall"], d["outer_diameter"])
        ratio = size / wall
    elif form == "rectangular_tube":
        size = np.maximum(d["depth"], d["width"])
        wall = np.broadcast_to(d["wall"], size.shape)
        ratio = size / wall
    elif form == "i_section":
        wall = np.minimum(d["flange_thickness"], d["web_thickness"])
        size = np.maximum(d["depth"], d["flange_width"])
        wall, size = np.broadcast_arrays(wall, size)
        ratio = size / wall
    elif form == "sandwich_panel":
        wall = d["face_thickness"]
        size = d["core_thickness"] + 2.0 * d["face_thickness"]
        wall, size = np.broadcast_arrays(wall, size)
        ratio = np.full_like(size, np.nan)
    else:
        raise ValueError(f"unknown section family {form!r}")
    return wall, ratio, size


def within(limit: FormLimit, dimensions: Mapping[str, np.ndarray]) -> np.ndarray:
    """Whether each section of family ``limit.form`` is one the process makes, bool array."""
    wall, ratio, size = measures(limit.form, dimensions)
    ok = (size >= limit.min_size) & (size <= limit.max_size)
    if limit.min_wall is not None:
        ok &= wall >= limit.min_wall
    if limit.max_wall_ratio is not None:
        ok &= ratio <= limit.max_wall_ratio
    return ok


def limit_problems(form: str, values: Mapping[str, object]) -> list[tuple[str, str]]:
    """Every problem of one limit's values as (field, message); ``values`` holds
    :data:`TEXT_FIELDS` as strings and :data:`NUMBER_FIELDS` as floats (NaN when absent)."""
    problems: list[tuple[str, str]] = []
    if values.get("process") not in PROCESSES:
        problems.append(("process", f"unknown process; known: {', '.join(PROCESSES)}"))
    if not str(values.get("source") or "").strip():
        problems.append(("source", "a source is required"))
    for field in NUMBER_FIELDS:
        value = float(values.get(field, math.nan))  # type: ignore[arg-type]
        applies = (
            (field != "min_wall" or form in WALL_FORMS)
            and (field != "max_wall_ratio" or form in RATIO_FORMS)
        )
        if math.isnan(value):
            if applies:
                problems.append((field, f"required for {form}"))
        elif not applies:
            problems.append((field, f"does not apply to {form}; leave it empty"))
        elif not (math.isfinite(value) and value > 0):
            problems.append((field, f"must be positive and finite, got {value:g}"))
        elif field == "max_wall_ratio" and value < 1:
            problems.append((field, f"an outer dimension is never below its wall, got {value:g}"))
    low, high = (float(values.get(f, math.nan)) for f in ("min_size", "max_size"))  # type: ignore[arg-type]
    if low > high:
        problems.append(("min_size", f"min_size {low:g} is above max_size {high:g}"))
    return problems


def limit_from(form: str, values: Mapping[str, object]) -> FormLimit:
    """A :class:`FormLimit` from checked values (see :func:`limit_problems`); a limit that
    does not apply (NaN) becomes None."""
    numbers = {f: float(values.get(f, math.nan)) for f in NUMBER_FIELDS}  # type: ignore[arg-type]
    return FormLimit(
        form=form,
        process=str(values["process"]),
        source=str(values["source"]),
        **{f: None if math.isnan(v) else v for f, v in numbers.items()},  # type: ignore[arg-type]
    )


def load_form_limits(
    path: str | Path,
    ids: Sequence[str],
    families: Sequence[str],
    forms: Sequence[Sequence[str]],
) -> tuple[tuple[tuple[FormLimit, ...], ...], list[DataError]]:
    """The limits of each material (in ``forms`` order) from a form-limits CSV.

    A row applies to one material (``applies_to`` = its id) or to every material of a family
    (``applies_to`` = the family id); the material's own row wins. Every form of every
    material outside the core family must be covered, and every row must apply to some
    material's form.

    Returns:
        The limits per material, and every problem as a DataError located at the file's row
        (1-based, the header is row 0) and column (row None for a material left uncovered).
    """
    file = str(path)
    try:
        frame = pd.read_csv(path, dtype=str, keep_default_na=False)
    except (OSError, ValueError) as error:
        return (), [DataError(file, None, None, f"cannot read: {error}")]
    missing = [c for c in CSV_COLUMNS if c not in frame.columns]
    unknown = [c for c in frame.columns if c not in CSV_COLUMNS]
    if missing or unknown:
        return (), [DataError(file, None, c, "missing column") for c in missing] + [
            DataError(file, None, c, "unknown column") for c in unknown
        ]
    frame = frame.apply(lambda column: column.str.strip())
    problems: list[DataError] = []
    known = {*ids, *FAMILIES}
    rows: dict[tuple[str, str], tuple[int, FormLimit]] = {}
    for i, row in enumerate(frame.to_dict("records"), start=1):
        applies_to, form = row["applies_to"], row["form"]
        row_problems: list[tuple[str, str]] = []
        if applies_to not in known:
            row_problems.append(("applies_to", f"no material or family {applies_to!r}"))
        if form not in FORMS:
            row_problems.append(("form", f"unknown form {form!r}; known: {', '.join(FORMS)}"))
        values: dict[str, object] = {f: row[f] for f in TEXT_FIELDS}
        for field in NUMBER_FIELDS:
            text = row[field]
            try:
                values[field] = float(text) if text else math.nan
            except ValueError:
                row_problems.append((field, f"not a number: {text!r}"))
                values[field] = math.nan
        if form in FORMS:
            reported = dict(row_problems)
            row_problems += [p for p in limit_problems(form, values) if p[0] not in reported]
        if (applies_to, form) in rows:
            row_problems.append(("form", f"a second row for {applies_to} {form}"))
        problems += [DataError(file, i, column, message) for column, message in row_problems]
        if not row_problems:
            rows[(applies_to, form)] = (i, limit_from(form, values))
    used: set[tuple[str, str]] = set()
    limits = []
    for id_, family, material_forms in zip(ids, families, forms, strict=True):
        own = []
        for form in (f for f in FORMS if f in material_forms):
            key = (id_, form) if (id_, form) in rows else (family, form)
            if key in rows:
                used.add(key)
                own.append(rows[key][1])
            elif family != CORE_FAMILY:
                problems.append(DataError(
                    file, None, "applies_to", f"no limits for material {id_!r} made as {form}"
                ))
        limits.append(tuple(own))
    for key in rows.keys() - used:
        problems.append(DataError(
            file, rows[key][0], "applies_to", f"{key[0]} {key[1]}: no material uses this row"
        ))
    problems.sort(key=lambda e: (e.row if e.row is not None else math.inf, e.column or ""))
    return tuple(limits), problems
