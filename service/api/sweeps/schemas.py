"""Schemas of POST /v1/sweeps: a /v1/designs body plus a grid or a list of cases."""

from __future__ import annotations

from collections.abc import Mapping

import marshmallow as ma

from service.api.designs.schemas import ACTION_UNITS, ACTION_VALUE_CAP, DesignRequestSchema
from service.api.fields import Quantity
from service.core.sizing.fields import SWEEPABLE_PATHS, action_path
from service.core.sweeps import COLUMNS

_PATH_DESCRIPTION = ("dotted path of a base request field: " + ", ".join(SWEEPABLE_PATHS)
                     + ", or load_case.actions.<i>.value | at | from | to of a member's "
                     "action")


def path_field(path: str) -> ma.fields.Field:
    """The DesignRequestSchema field at a dotted path (used to convert varied values)."""
    schema: ma.Schema = DesignRequestSchema()
    *parents, leaf = path.split(".")
    for name in parents:
        schema = schema.fields[name].schema
    return schema.fields[leaf]


def _convert(path: str, value: object, actions: list) -> object:
    located = action_path(path)
    if located is None:
        return path_field(path).deserialize(value)
    index, name = located
    unit = ACTION_UNITS[actions[index].kind] if name == "value" else "m"
    return Quantity(unit, minimum=-ACTION_VALUE_CAP, maximum=ACTION_VALUE_CAP).deserialize(value)


class SweepRequestSchema(ma.Schema):
    base = ma.fields.Nested(DesignRequestSchema, required=True, metadata={
        "description": "a complete /v1/designs request every case starts from"})
    grid = ma.fields.Dict(
        keys=ma.fields.String(metadata={"description": _PATH_DESCRIPTION}),
        values=ma.fields.List(ma.fields.Raw()),
        metadata={"description": "path -> values; the cases are their cartesian product"},
    )
    cases = ma.fields.List(
        ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Raw()),
        validate=ma.validate.Length(min=1),
        metadata={"description": "explicit cases, each path -> value (unset paths: the base's)"},
    )
    top = ma.fields.Integer(strict=True, load_default=1, validate=ma.validate.Range(min=1),
                            metadata={"description": "designs kept per case"})

    @ma.validates_schema(skip_on_field_errors=False)
    def _check(self, data, **kwargs):
        """Exactly one of grid and cases; every varied value valid for its field (checked even
        when other fields have errors, so that every bad field is listed at once)."""
        if ("grid" in data) == ("cases" in data):
            raise ma.ValidationError("give either grid or cases, not both and not neither",
                                     field_name="grid")
        _, errors = _varied_values(data)
        base = data.get("base") or {}
        for name, message in (("top", "a sweep keeps the sweep's top designs per case"),
                              ("pareto", "is not available in sweeps; use /v1/designs")):
            if name in base:
                errors.setdefault("base", {})[name] = [message]
        if errors:
            raise ma.ValidationError(errors)

    @ma.post_load
    def _convert(self, data, **kwargs):
        """Varied values take units like the fields they replace."""
        converted, _ = _varied_values(data)
        return {**data, **converted}


def _varied_values(data: Mapping) -> tuple[dict, dict]:
    """The grid or cases with every value converted by its field, and the errors by path."""
    errors: dict = {}
    base = data.get("base") or {}
    actions = list((base.get("load_case") or {}).get("actions") or [])
    if "grid" in data:
        grid = {
            path: [_value(path, v, errors, ("grid", path, k), actions)
                   for k, v in enumerate(values)]
            for path, values in data["grid"].items()
        }
        return {"grid": grid}, errors
    cases = [
        {path: _value(path, v, errors, ("cases", i, path), actions)
         for path, v in case.items()}
        for i, case in enumerate(data.get("cases") or [])
    ]
    return {"cases": cases}, errors


def _value(path: str, value: object, errors: dict, where: tuple, actions: list) -> object:
    located = action_path(path)
    if path not in SWEEPABLE_PATHS and (located is None or located[0] >= len(actions)):
        _nest(errors, where[:-1] if where[0] == "grid" else where,
              [f"cannot be varied; use one of {', '.join(SWEEPABLE_PATHS)} or "
               "load_case.actions.<i>.value | at | from | to of a member's action"])
        return value
    try:
        return _convert(path, value, actions)
    except ma.ValidationError as error:
        _nest(errors, where, error.messages)
        return value


def _nest(errors: dict, where: tuple, messages) -> None:
    node = errors
    for key in where[:-1]:
        node = node.setdefault(key, {})
    node[where[-1]] = messages if not isinstance(messages, Mapping) else dict(messages)


def columns_description() -> str:
    """The sweep table's columns, in order, with their types and units (Markdown)."""
    lines = ["The table's columns, in this order (every format: JSON, CSV, NDJSON, Parquet):",
             "", "| column | type | meaning |", "| --- | --- | --- |"]
    entries = list(COLUMNS.items())
    lines += [f"| `{name}` | {kind} | {meaning} |" for name, (kind, meaning) in entries[:1]]
    lines.append("| `<path>` | as the field | one column per varied path, named by the path "
                 "(`load_case.span`...), its SI value |")
    lines += [f"| `{name}` | {kind} | {meaning} |" for name, (kind, meaning) in entries[1:]]
    lines += ["", "A case without a design gives one row: `case`, its varied values and "
                  "`reason`, every other cell empty (null). Empty cells are null in JSON and "
                  "NDJSON, empty in CSV, null in Parquet (where `case` and `rank` are integer "
                  "columns)."]
    return "\n".join(lines)


class SweepTableSchema(ma.Schema):
    cases = ma.fields.Integer(required=True, metadata={"description": "number of cases"})
    columns = ma.fields.List(ma.fields.String(), required=True,
                             metadata={"description": columns_description()})
    rows = ma.fields.List(
        ma.fields.List(ma.fields.Raw(allow_none=True, metadata={
            "description": "a cell: number, string or null, by its column"})),
        required=True, metadata={"description": "one list of cells per row, in the order of "
                                                "`columns`"})
    caution = ma.fields.String(required=True)
