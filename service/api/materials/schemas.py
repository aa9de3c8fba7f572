"""Material schemas, reused by every endpoint that takes or returns materials.

- :class:`MaterialSchema`: one client material (``custom_materials`` items) in the contract's
  Material shape; every value may carry a unit, and a range's ``unit`` applies to its bare
  numbers. Loads to the core's record dict in SI units, validated by
  :func:`service.core.materials.from_records`.
- :class:`MaterialFilterSchema`: the contract's MaterialFilter, bounds unit-aware.
- :class:`MaterialResponseSchema`, :class:`MaterialListSchema`: what GET /v1/materials returns.
- :class:`MaterialQuerySchema`: the query of GET /v1/materials.
- :func:`with_custom_materials`, :func:`select_materials`: call the core and place its
  errors under the request field they came from.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import marshmallow as ma
import numpy as np

from service.api.fields import Quantity, to_si
from service.core import materials as core
from service.core.errors import InputError

QUANTITY_UNITS: Mapping[str, str] = {
    "density": "kg/m^3",
    "youngs_modulus": "Pa",
    "shear_modulus": "Pa",
    "poisson_ratio": "",
    "strength": "Pa",
    "tensile_strength": "Pa",
    "price": "1/kg",
    "embodied_carbon": "",
    "max_service_temperature": "K",
    "shear_strength": "Pa",
    "fracture_toughness": "Pa*m^0.5",
    "elongation": "",
    "fatigue_strength": "Pa",
    "compressive_strength": "Pa",
    "transverse_modulus": "Pa",
}
"""The unit a property's input values convert to. Equal to ``core.UNITS`` except where pint
has no such unit: currency (price: a number of US dollars per kg) and kg CO2e per kg
(dimensionless)."""

_ENDS = ("low", "high", "typical")


def _camel(name: str) -> str:
    return "".join(part.capitalize() for part in name.split("_"))


def _quantity(prop: str, description: str, **kwargs) -> Quantity:
    return Quantity(
        QUANTITY_UNITS[prop],
        metadata={"description": description, "x-unit": core.UNITS[prop]},
        **kwargs,
    )


def _range_schema(prop: str) -> type[ma.Schema]:
    """Schema of one property's {low, high, typical, unit} in a client material."""
    si_unit = core.UNITS[prop]

    @ma.pre_load
    def numbers_in_unit(self, data, **kwargs):
        # A range's "unit" applies to its bare numbers; strings with units keep their own.
        if not isinstance(data, Mapping) or data.get("unit") in (None, si_unit):
            return data
        unit = data["unit"]
        if not isinstance(unit, str):
            raise ma.ValidationError({"unit": ["must be a string"]})
        try:
            to_si(f"1 {unit}", QUANTITY_UNITS[prop])
        except ValueError as error:
            raise ma.ValidationError({"unit": [str(error)]}) from None
        return {
            key: f"{value!r} {unit}"
            if key in _ENDS and isinstance(value, int | float) and not isinstance(value, bool)
            else value
            for key, value in data.items()
        }

    @ma.post_load
    def drop_unit(self, data, **kwargs):
        data.pop("unit", None)
        return data

    fields = {
        "low": _quantity(prop, "low end of the range", required=True),
        "high": _quantity(prop, "high end of the range", required=True),
        "typical": _quantity(prop, "typical value (default: geometric mean of low and high)"),
        "unit": ma.fields.String(
            metadata={"description": f"unit of the bare numbers (default {si_unit!r}, SI)"}
        ),
    }
    return type(
        f"{_camel(prop)}RangeSchema",
        (ma.Schema,),
        {**fields, "numbers_in_unit": numbers_in_unit, "drop_unit": drop_unit},
    )


MaterialPropertiesSchema = type(
    "MaterialPropertiesSchema",
    (ma.Schema,),
    {
        prop: ma.fields.Nested(
            _range_schema(prop), required=prop in core.CLIENT_REQUIRED_PROPERTIES
        )
        for prop in core.ALL_PROPERTIES
    },
)


class FormLimitSchema(ma.Schema):
    """What the usual process makes of a material in one section family (lengths in m)."""

    process = ma.fields.String(
        required=True,
        validate=ma.validate.OneOf(core.PROCESSES),
        metadata={"description": "the usual process for this material and form"},
    )
    min_wall = Quantity("m", allow_none=True, metadata={
        "description": "thinnest wall, flange, web, face or (solid_rectangle) thickness, m; "
                       "none for solid_round"})
    max_wall_ratio = Quantity("", allow_none=True, metadata={
        "description": "largest outer dimension / wall; none for solid_round and "
                       "sandwich_panel"})
    min_size = Quantity("m", required=True, metadata={
        "description": "smallest outer dimension (diameter, larger of depth and width, "
                       "panel thickness), m"})
    max_size = Quantity("m", required=True, metadata={"description": "largest outer dimension, m"})
    source = ma.fields.String(required=True)

    @ma.post_load
    def drop_nulls(self, data, **kwargs):
        return {key: value for key, value in data.items() if value is not None}


class MaterialSchema(ma.Schema):
    """A client material: the contract's Material object, values SI or with units."""

    id = ma.fields.String(
        required=True,
        validate=ma.validate.Regexp(core.ID_PATTERN),
        metadata={"description": "slug, must not collide with a built-in material id"},
    )
    name = ma.fields.String(required=True)
    family = ma.fields.String(required=True, validate=ma.validate.OneOf(core.FAMILIES))
    properties = ma.fields.Nested(MaterialPropertiesSchema, required=True)
    forms = ma.fields.List(
        ma.fields.String(validate=ma.validate.OneOf(core.FORMS)),
        metadata={"description": "section families it is made into (empty for cores)"},
    )
    sources = ma.fields.List(ma.fields.String())
    isotropic = ma.fields.Boolean(
        metadata={"description": "G = E/(2(1+nu)) holds (default: false for composite, wood, foam)"}
    )
    price_year = ma.fields.Integer(allow_none=True)
    notes = ma.fields.String()
    brittle = ma.fields.Boolean(
        allow_none=True,
        metadata={"description": "default: derived from elongation and fracture_toughness "
                                 "(rule in data/README.md, \"Brittle\")"},
    )
    fatigue_cycles = Quantity(
        "", allow_none=True, minimum=1.0,
        metadata={"description": "the cycle count of fatigue_strength (required with it)"},
    )
    form_limits = ma.fields.Dict(
        keys=ma.fields.String(validate=ma.validate.OneOf(core.FORMS)),
        values=ma.fields.Nested(FormLimitSchema),
        metadata={"description": "section family id (one of forms) -> what its usual process "
                                 "makes; optional"},
    )

    @ma.post_load
    def validate_in_core(self, data, **kwargs):
        """The core's checks (ranges, Poisson's ratio, isotropic G), errors at field paths."""
        try:
            core.from_records([data])
        except InputError as error:
            raise ma.ValidationError(
                {
                    path.partition(".")[2] or ma.exceptions.SCHEMA: messages
                    for path, messages in error.errors.items()
                }
            ) from None
        return data


class PropertyRangeSchema(ma.Schema):
    low = ma.fields.Float(required=True)
    high = ma.fields.Float(required=True)
    typical = ma.fields.Float(required=True)
    unit = ma.fields.String(required=True, metadata={"description": "SI unit of the values"})


class FormLimitResponseSchema(ma.Schema):
    process = ma.fields.String(required=True)
    min_wall = ma.fields.Float(required=True, allow_none=True, metadata={"description": "m"})
    max_wall_ratio = ma.fields.Float(required=True, allow_none=True)
    min_size = ma.fields.Float(required=True, metadata={"description": "m"})
    max_size = ma.fields.Float(required=True, metadata={"description": "m"})
    source = ma.fields.String(required=True)


class MaterialResponseSchema(ma.Schema):
    """The contract's Material object, plain SI numbers."""

    id = ma.fields.String(required=True)
    name = ma.fields.String(required=True)
    family = ma.fields.String(required=True)
    properties = ma.fields.Dict(
        keys=ma.fields.String(validate=ma.validate.OneOf(core.ALL_PROPERTIES)),
        values=ma.fields.Nested(PropertyRangeSchema),
        required=True,
    )
    forms = ma.fields.List(ma.fields.String(), required=True)
    sources = ma.fields.List(ma.fields.String(), required=True)
    isotropic = ma.fields.Boolean(required=True)
    price_year = ma.fields.Integer(required=True, allow_none=True)
    notes = ma.fields.String(required=True)
    brittle = ma.fields.Boolean(
        required=True,
        metadata={"description": "breaks with little strain and low toughness (rule in "
                                 "data/README.md, \"Brittle\")"},
    )
    fatigue_cycles = ma.fields.Float(
        required=True, allow_none=True,
        metadata={"description": "the cycle count of fatigue_strength; null without one"},
    )
    form_limits = ma.fields.Dict(
        keys=ma.fields.String(),
        values=ma.fields.Nested(FormLimitResponseSchema),
        required=True,
        metadata={"description": "section family id -> what its usual process makes"},
    )


class MaterialListSchema(ma.Schema):
    count = ma.fields.Integer(required=True)
    materials = ma.fields.List(ma.fields.Nested(MaterialResponseSchema), required=True)


def material_list(table: core.MaterialTable, query: Mapping) -> dict:
    """The GET /v1/materials body (:class:`MaterialListSchema`): the materials of ``table``
    that a query loaded by :class:`MaterialQuerySchema` selects, in its order."""
    table = select_materials(table, {"families": query["families"], "where": query["where"]},
                             allow_empty=True)
    if query["search"]:
        search = query["search"].lower()
        table = table.take(np.array([search in name.lower() for name in table.names],
                                    dtype=bool))
    if query["sort"]:
        table = core.sort_by(table, query["sort"].lstrip("-"), query["sort"].startswith("-"))
    return {"count": len(table), "materials": table.records()}


def _bounds_schema(prop: str) -> type[ma.Schema]:
    @ma.validates_schema
    def ordered(self, data, **kwargs):
        if not data:
            raise ma.ValidationError('give "min", "max" or both')
        if data.get("min", -float("inf")) > data.get("max", float("inf")):
            raise ma.ValidationError("min is above max", "max")

    fields = {
        "min": _quantity(prop, "smallest typical value kept"),
        "max": _quantity(prop, "largest typical value kept"),
    }
    return type(f"{_camel(prop)}BoundsSchema", (ma.Schema,), {**fields, "ordered": ordered})


PropertyBoundsSchema = type(
    "PropertyBoundsSchema",
    (ma.Schema,),
    {prop: ma.fields.Nested(_bounds_schema(prop)) for prop in core.ALL_PROPERTIES},
)


class MaterialFilterSchema(ma.Schema):
    """The contract's MaterialFilter; loads to keyword arguments of ``core.select``."""

    families = ma.fields.List(ma.fields.String(validate=ma.validate.OneOf(core.FAMILIES)))
    ids = ma.fields.List(ma.fields.String(), metadata={"description": "keep only these"})
    exclude = ma.fields.List(ma.fields.String(), metadata={"description": "drop these"})
    where = ma.fields.Nested(
        PropertyBoundsSchema,
        metadata={"description": "property -> {min, max} on typical values"},
    )


def _known_families(families: list[str]) -> None:
    """The query names the parameter, not an index into it (``family``, not ``family.1``)."""
    unknown = sorted(set(families) - set(core.FAMILIES))
    if unknown:
        raise ma.ValidationError(
            f"Must be one of: {', '.join(core.FAMILIES)} (got {', '.join(unknown)})."
        )


def _query_fields() -> dict[str, ma.fields.Field]:
    fields: dict[str, ma.fields.Field] = {
        "family": ma.fields.List(
            ma.fields.String(),
            validate=_known_families,
            metadata={"description": "keep these material families (repeat for several)"},
        ),
        "search": ma.fields.String(
            metadata={"description": "case-insensitive substring of the name"}
        ),
        "sort": ma.fields.String(
            validate=ma.validate.OneOf(
                [*core.ALL_PROPERTIES, *(f"-{prop}" for prop in core.ALL_PROPERTIES)]
            ),
            metadata={"description": "order by a property's typical value, e.g. "
                                     "sort=-fracture_toughness for the toughest first "
                                     "(materials without it last); default: data file order"},
        ),
    }
    for prop in core.ALL_PROPERTIES:
        fields[f"min_{prop}"] = _quantity(prop, f"smallest typical {prop} kept", bare_strings=True)
        fields[f"max_{prop}"] = _quantity(prop, f"largest typical {prop} kept", bare_strings=True)
    return fields


class MaterialQuerySchema(ma.Schema.from_dict(_query_fields(), name="MaterialQueryFields")):
    """Query of GET /v1/materials; loads to {"families", "search", "where", "sort"}."""

    OWN_NAME_PREFIXES = ("min_", "max_")
    """Parameter names the schema checks itself (``known_properties`` names the property)."""

    @ma.pre_load
    def known_properties(self, data, **kwargs):
        unknown = {
            key: [f"unknown property {key[4:]!r}; known: {', '.join(core.ALL_PROPERTIES)}"]
            for key in data
            if key.startswith(("min_", "max_")) and key[4:] not in core.ALL_PROPERTIES
        }
        if unknown:
            raise ma.ValidationError(unknown)
        return data

    @ma.validates_schema
    def ordered(self, data, **kwargs):
        for prop in core.ALL_PROPERTIES:
            low, high = data.get(f"min_{prop}"), data.get(f"max_{prop}")
            if low is not None and high is not None and low > high:
                raise ma.ValidationError(f"below min_{prop}", f"max_{prop}")

    @ma.post_load
    def as_filter(self, data, **kwargs):
        where: dict[str, dict[str, float]] = {}
        for prop in core.ALL_PROPERTIES:
            for bound in ("min", "max"):
                if f"{bound}_{prop}" in data:
                    where.setdefault(prop, {})[bound] = data[f"{bound}_{prop}"]
        return {
            "families": data.get("family"),
            "search": data.get("search"),
            "where": where,
            "sort": data.get("sort"),
        }


def with_custom_materials(
    table: core.MaterialTable,
    records: Sequence[Mapping] | None,
    field: str = "custom_materials",
) -> core.MaterialTable:
    """``table`` followed by the client materials ``records`` (as MaterialSchema loads them).

    Raises:
        InputError: at ``<field>.<k>...`` paths (an id that collides with the table's).
    """
    if not records:
        return table
    try:
        return table.concat(core.from_records(records))
    except InputError as error:
        raise error.prefixed(field) from None


def select_materials(
    table: core.MaterialTable,
    material_filter: Mapping | None,
    field: str = "materials",
    allow_empty: bool = False,
) -> core.MaterialTable:
    """Apply a MaterialFilter (as MaterialFilterSchema loads it) to ``table``.

    ``allow_empty`` is for listings; sizing or ranking nothing is never what a client meant.

    Raises:
        InputError: at ``<field>.ids.<k>``-style paths (an id not in the table), or at
            ``<field>`` when the filter selects nothing.
    """
    try:
        selected = core.select(table, **(material_filter or {}))
    except InputError as error:
        raise error.prefixed(field) from None
    if not len(selected) and not allow_empty:
        raise InputError.single(field, "selects no material: widen the filter")
    return selected
