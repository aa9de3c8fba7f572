"""Table formats shared by the HTTP sweeps endpoint and the command line.

A table is a list of column names and an iterable of rows (lists of JSON-compatible values,
``None`` for empty cells). Each writer consumes rows as they come, so a long sweep streams.
"""

from __future__ import annotations

import csv
import io
import json
import math
from collections.abc import Callable, Iterable, Iterator, Sequence


def _cell(value: object) -> object:
    """JSON-safe cell: floats that are not finite become None."""
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def json_cells(row: Sequence[object]) -> list[object]:
    """A row as JSON-safe cells (what every format below writes for it)."""
    return [_cell(cell) for cell in row]


def csv_chunks(columns: Sequence[str], rows: Iterable[Sequence[object]]) -> Iterator[str]:
    """CSV text: a header line, then one line per row (empty cells for None)."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(columns)
    yield buffer.getvalue()
    for row in rows:
        buffer.seek(0)
        buffer.truncate()
        writer.writerow(["" if cell is None else _cell(cell) for cell in row])
        yield buffer.getvalue()


def ndjson_chunks(columns: Sequence[str], rows: Iterable[Sequence[object]]) -> Iterator[str]:
    """Newline-delimited JSON: one object per row, keys = columns."""
    for row in rows:
        yield json.dumps(dict(zip(columns, map(_cell, row), strict=True))) + "\n"


def json_table(columns: Sequence[str], rows: Iterable[Sequence[object]], cases: int) -> dict:
    """The JSON form: ``{"cases", "columns", "rows"}``."""
    return {
        "cases": cases,
        "columns": list(columns),
        "rows": [[_cell(c) for c in row] for row in rows],
    }


def read_csv_table(text: str) -> tuple[list[str], list[list[str]]]:
    """Parse CSV text back to columns and rows of strings (for tests and scripts)."""
    reader = csv.reader(io.StringIO(text))
    columns = next(reader)
    return columns, [row for row in reader]


PARQUET_DTYPES = {"integer": "Int64", "number": "float64", "string": "string"}
"""Column type (:func:`service.core.sweeps.column_type`) -> pandas dtype: integers stay
integers where some cells are empty (a nullable column), and a column with no value in any
row keeps its type."""


def parquet_bytes(columns: Sequence[str], rows: Iterable[Sequence[object]],
                  column_type: Callable[[str], str | None]) -> bytes:
    """An Apache Parquet file of the table, each column typed by ``column_type`` (None:
    inferred from its values). Needs pyarrow (a dependency of the service)."""
    import pandas as pd

    frame = pd.DataFrame([json_cells(row) for row in rows], columns=list(columns))
    dtypes = {column: PARQUET_DTYPES[kind] for column in columns
              if (kind := column_type(column)) is not None}
    buffer = io.BytesIO()
    frame.astype(dtypes).to_parquet(buffer, index=False)
    return buffer.getvalue()
