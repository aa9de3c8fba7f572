"""Discrete sizing: the lightest member of a section catalogue that meets every requirement.

Built-in catalogues are the CSV files of ``data/catalogs/`` (see data/README.md,
"Catalogues"); a client may pass its own members inline. Every (material, member) pair is
evaluated at once with the same checks as continuous designs
(:func:`service.core.sizing.recheck.evaluate`), and each material keeps its lightest passing
member. Catalogue dimensions are used as they are (no rounding). A member may name the
material families it is made in (the built-in steel series: ``steel``); it is then sized only
in materials of those families.
"""

from __future__ import annotations

import csv
import math
from collections.abc import Mapping, Sequence
from functools import cache
from pathlib import Path
from typing import TYPE_CHECKING, cast

import numpy as np

from service.core.errors import DataError, InputError
from service.core.materials.vocabulary import FAMILIES as MATERIAL_FAMILIES
from service.core.sections import FAMILIES
from service.core.sizing.demand import Demand
from service.core.sizing.recheck import evaluate, make_design
from service.core.sizing.request import CatalogMember
from service.core.sizing.results import Design, Rejection
from service.core.sizing.values import MaterialValues

if TYPE_CHECKING:
    from service.core.materials import MaterialTable
    from service.core.sections.base import SectionFamily

CATALOG_DIRECTORY = Path(__file__).resolve().parents[3] / "data" / "catalogs"


def catalog_names() -> tuple[str, ...]:
    """The built-in catalogues (file stems of data/catalogs/*.csv)."""
    return tuple(sorted(path.stem for path in CATALOG_DIRECTORY.glob("*.csv")))


@cache
def load_catalog(name: str) -> tuple[CatalogMember, ...]:
    """A built-in catalogue's members (dimensions in metres), validated.

    Raises:
        DataError: a malformed file (row and column named).
    """
    path = CATALOG_DIRECTORY / f"{name}.csv"
    members = []
    with path.open(newline="") as handle:
        for row_number, row in enumerate(csv.DictReader(handle), start=1):
            family = FAMILIES.get(row.get("family", ""))
            if family is None:
                raise DataError(str(path), row_number, "family", "unknown section family")
            try:
                dims = {name: float(row[name]) for name in family.dimension_names}
            except (KeyError, TypeError, ValueError):
                raise DataError(str(path), row_number, None,
                                f"needs numeric {', '.join(family.dimension_names)}") from None
            try:
                family.validate(dims)
            except InputError as error:
                column = next(iter(error.errors))
                raise DataError(str(path), row_number, column,
                                "; ".join(error.errors[column])) from None
            made_in = _families(row.get("material_families"))
            unknown = [name for name in made_in if name not in MATERIAL_FAMILIES]
            if unknown:
                raise DataError(str(path), row_number, "material_families",
                                f"unknown material family {', '.join(unknown)}")
            members.append(CatalogMember(row["designation"], family.id, dims, made_in))
    return tuple(members)


def _families(value: object) -> tuple[str, ...]:
    """Material families from a CSV cell (``steel;aluminium``) or a list; empty: any."""
    if value is None:
        return ()
    names = value.split(";") if isinstance(value, str) else list(cast(Sequence, value))
    return tuple(str(name).strip() for name in names if str(name).strip())


def catalog_members(value: str | Sequence[Mapping] | None) -> tuple[CatalogMember, ...]:
    """A request's ``catalog``: a built-in catalogue name, inline members, or None.

    Raises:
        InputError: at ``catalog`` for an unknown name or a value of the wrong kind.
    """
    if value is None:
        return ()
    if isinstance(value, str):
        if value not in catalog_names():
            raise InputError.single(
                "catalog", f"unknown catalogue {value!r}; built-in: {', '.join(catalog_names())}")
        return load_catalog(value)
    if isinstance(value, Sequence) and all(isinstance(m, Mapping) for m in value):
        members = cast(Sequence[Mapping], value)   # a str returned above
        return tuple(CatalogMember(str(m["designation"]), str(m["family"]),
                                   {k: float(v) for k, v in m["dimensions"].items()},
                                   _families(m.get("material_families")))
                     for m in members)
    raise InputError.single("catalog", "must be a catalogue name or a list of members")


def made_in_family(members: Sequence[CatalogMember], material_families: Sequence[str]
                   ) -> np.ndarray:
    """True where member k may be made in material m's family, shape (M, K)."""
    return np.array([[not member.material_families or family in member.material_families
                      for member in members] for family in material_families], dtype=bool
                    ).reshape(len(material_families), len(members))


def size_catalog(family: SectionFamily, members: Sequence[CatalogMember], indices: np.ndarray,
                 values: MaterialValues, table: MaterialTable, demand: Demand
                 ) -> tuple[list[Design], list[Rejection]]:
    """The lightest passing member for each material ``indices`` (arrays materials x members);
    a member that names its material families is sized only in materials of those
    families."""
    materials = values.take(indices)
    dims = {name: np.array([m.dimensions[name] for m in members])[None, :]
            for name in family.dimension_names}
    check = evaluate(family, dims, materials.column(), demand, free=False)
    made = made_in_family(members, [table.families[i] for i in indices])
    feasible = check.feasible & made
    lightest = np.argmin(np.where(feasible, check.mass, np.inf), axis=-1)
    found = np.asarray(feasible.any(axis=-1))
    chosen = check.take(lightest)
    chosen_dims = {name: value[0, lightest] for name, value in dims.items()}
    designs, rejections = [], []
    for row, material_index in enumerate(indices):
        material_id = table.ids[material_index]
        if not made[row].any():
            named = sorted({f for m in members for f in m.material_families})
            rejections.append(Rejection(
                int(material_index), material_id, family.id,
                f"the catalogue's {family.id} members are made only in {', '.join(named)}"))
            continue
        if not found[row]:
            utilization = {name: u[row] for name, u in check.utilization.items()}
            best = min(np.flatnonzero(made[row]).tolist(), key=lambda k: max(
                max(float(u[k]) for u in utilization.values()),
                0.0 if check.fits[row, k] else np.inf))
            limits = {name: float(u[best]) for name, u in utilization.items()}
            worst = max(limits, key=lambda name: limits[name])
            reason = (f"no member of the catalogue meets every requirement: the closest, "
                      f"{members[best].designation}, is at {limits[worst]:.3g} of its "
                      f"{worst.replace('_', ' ')} limit")
            shortfall = max(limits[worst], 1.0)
            if not np.isfinite(limits[worst]) or not (check.fits[row] & made[row]).any():
                reason = ("no member of the catalogue fits the envelope, min_wall and what the "
                          "material's process makes in this form (its form_limits)")
                shortfall = math.inf
            rejections.append(Rejection(int(material_index), material_id, family.id, reason,
                                        shortfall))
            continue
        designs.append(make_design(
            family, int(material_index), material_id, row, chosen_dims, chosen, materials,
            demand, designation=members[int(lightest[row])].designation,
        ))
    return designs, rejections
