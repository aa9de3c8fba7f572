"""The frozen material table: one numpy array per property and end, and per-material views.

:class:`MaterialTable` holds every material as arrays (element ``i`` of each is material
``i``), so the sizing and ranking code works over all materials at once; :class:`Material`
and :class:`PropertyRange` are one material as the contract's Material object describes it.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from functools import cached_property
from types import MappingProxyType
from typing import cast

import numpy as np

from service.core.errors import InputError, UnknownResource
from service.core.materials.brittleness import brittle as brittle_rule
from service.core.materials.form_limits import NUMBER_FIELDS, FormLimit
from service.core.materials.vocabulary import ALL_PROPERTIES, BASIS_ENDS, ENDS, FORMS, UNITS


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
        brittle: whether it is brittle (:mod:`~service.core.materials.brittleness`).
        fatigue_cycles: the cycle count of ``fatigue_strength``, or None without one.
        form_limits: section family id -> :class:`FormLimit` of its usual process, for the
            forms whose limits are known.
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
    brittle: bool
    fatigue_cycles: float | None
    form_limits: Mapping[str, FormLimit]

    def record(self) -> dict:
        """The contract's Material dict (with ``isotropic``, ``price_year`` and ``notes``)."""
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
            "brittle": self.brittle,
            "fatigue_cycles": self.fatigue_cycles,
            "form_limits": {form: limit.record() for form, limit in self.form_limits.items()},
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
        brittle: bool array, shape (n,); by default derived from typical elongation and
            fracture toughness (:func:`~service.core.materials.brittleness.brittle`).
        fatigue_cycles: float array, shape (n,): the cycle count of each material's
            ``fatigue_strength``, NaN without one; by default all NaN.
        form_limits: for each material, the :class:`FormLimit` of each form whose limits
            are known (in :data:`FORMS` order); by default none.
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
    brittle: np.ndarray | None = None
    fatigue_cycles: np.ndarray | None = None
    form_limits: tuple[tuple[FormLimit, ...], ...] | None = None

    def __post_init__(self):
        isotropic = np.array(self.isotropic, dtype=bool)
        isotropic.flags.writeable = False
        object.__setattr__(self, "isotropic", isotropic)
        for end in ENDS:
            arrays = {prop: _frozen(getattr(self, end)[prop]) for prop in ALL_PROPERTIES}
            object.__setattr__(self, end, MappingProxyType(arrays))
        n = len(self.ids)
        if self.brittle is None:
            flags = brittle_rule(
                self.typical["elongation"], self.typical["fracture_toughness"], self.families
            )
        else:
            flags = np.array(self.brittle, dtype=bool).reshape(n)
        flags.flags.writeable = False
        object.__setattr__(self, "brittle", flags)
        cycles = np.full(n, np.nan) if self.fatigue_cycles is None else self.fatigue_cycles
        object.__setattr__(self, "fatigue_cycles", _frozen(np.reshape(cycles, n)))
        limits = ((),) * n if self.form_limits is None else tuple(map(tuple, self.form_limits))
        object.__setattr__(self, "form_limits", limits)

    # brittle, fatigue_cycles and form_limits may be None only as constructor inputs:
    # __post_init__ always sets them; these views say so to the type checker.
    @property
    def _brittle(self) -> np.ndarray:
        return cast(np.ndarray, self.brittle)

    @property
    def _fatigue_cycles(self) -> np.ndarray:
        return cast(np.ndarray, self.fatigue_cycles)

    @property
    def _form_limits(self) -> tuple[tuple[FormLimit, ...], ...]:
        return cast(tuple[tuple[FormLimit, ...], ...], self.form_limits)

    @cached_property
    def _positions(self) -> dict[str, int]:
        """Material id -> row (computed once; a cached property works on a frozen table)."""
        return {id_: i for i, id_ in enumerate(self.ids)}

    def __len__(self) -> int:
        return len(self.ids)

    def __contains__(self, material_id: object) -> bool:
        """Whether a material with this id is in the table."""
        return material_id in self._positions

    def values(self, prop: str, basis: str = "typical") -> np.ndarray:
        """Values of ``prop`` for every material, shape (n,), SI units.

        ``basis="conservative"`` takes the end named in :data:`CONSERVATIVE_END` (low
        stiffness and strength, high density), ``basis="design"`` the end named in
        :data:`DESIGN_END` (low strength), and typical values for the other properties.
        """
        if prop not in ALL_PROPERTIES:
            raise UnknownResource("material property", prop)
        if basis not in BASIS_ENDS:
            raise UnknownResource("property basis", basis)
        return getattr(self, BASIS_ENDS[basis].get(prop, "typical"))[prop]

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
            brittle=self._brittle[indices],
            fatigue_cycles=self._fatigue_cycles[indices],
            form_limits=tuple(self._form_limits[i] for i in pick),
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
            brittle=np.concatenate([self._brittle, other._brittle]),
            fatigue_cycles=np.concatenate([self._fatigue_cycles, other._fatigue_cycles]),
            form_limits=self._form_limits + other._form_limits,
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
        cycles = self._fatigue_cycles[i]
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
            brittle=bool(self._brittle[i]),
            fatigue_cycles=None if np.isnan(cycles) else float(cycles),
            form_limits=MappingProxyType({limit.form: limit for limit in self._form_limits[i]}),
        )

    def form_limit_values(self, form: str) -> Mapping[str, np.ndarray]:
        """The limits of section family ``form`` over all materials: each of
        ``min_wall``, ``max_wall_ratio``, ``min_size``, ``max_size`` -> float array of shape
        (n,), NaN where a material has no such limit (or no limits for that form)."""
        values = {field: np.full(len(self), np.nan) for field in NUMBER_FIELDS}
        for i, limits in enumerate(self._form_limits):
            for limit in limits:
                if limit.form == form:
                    for field in NUMBER_FIELDS:
                        value = getattr(limit, field)
                        values[field][i] = np.nan if value is None else value
        return MappingProxyType({field: _frozen(array) for field, array in values.items()})

    def records(self) -> list[dict]:
        """Every material as the contract's Material dict, in table order."""
        return [self.material(id_).record() for id_ in self.ids]


