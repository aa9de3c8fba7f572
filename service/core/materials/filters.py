"""The contract's MaterialFilter over a material table."""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import numpy as np

from service.core.errors import InputError
from service.core.materials.records import is_number
from service.core.materials.table import MaterialTable
from service.core.materials.vocabulary import ALL_PROPERTIES, FAMILIES


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
            if id_ not in table:
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
        if not all(is_number(v) for v in bounds.values()):
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


def sort_by(table: MaterialTable, prop: str, descending: bool = False) -> MaterialTable:
    """The table ordered by the typical value of ``prop`` (ties keep table order); materials
    without the property come last either way.

    Raises:
        InputError: unknown property, at path ``"sort"``.
    """
    if prop not in ALL_PROPERTIES:
        raise InputError.single("sort", f"unknown property; known: {', '.join(ALL_PROPERTIES)}")
    values = table.typical[prop]
    return table.take(np.argsort(-values if descending else values, kind="stable"))
