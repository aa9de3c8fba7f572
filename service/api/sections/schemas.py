"""Schemas of GET /v1/sections and POST /v1/sections/properties (schemas/README.md)."""

from __future__ import annotations

from collections.abc import Iterable, Mapping

import marshmallow as ma

from service.api.fields import Quantity
from service.core.errors import GeometryError
from service.core.sections import FAMILIES, FAMILY_IDS, shape_factors
from service.core.sections.base import SectionFamily
from service.core.sizing.results import significant

# Bounds that keep fourth powers of every dimension and their ratios well inside double
# precision (no overflow to inf, no underflow to 0); any real section lies far inside them.
SMALLEST_DIMENSION = 1e-9
LARGEST_DIMENSION = 1e3


class DimensionSchema(ma.Schema):
    name = ma.fields.String(required=True, metadata={"description": "JSON key in `dimensions`"})
    description = ma.fields.String(required=True)


class WidestSchema(ma.Schema):
    min = ma.fields.Float(required=True)
    max = ma.fields.Float(required=True)
    source = ma.fields.String(required=True, metadata={
        "description": "why the physics stops holding beyond them"})


class RatioRuleSchema(ma.Schema):
    ratio = ma.fields.String(required=True, metadata={
        "description": 'dimension/scale dimension, e.g. "width/depth"', "example": "width/depth"})
    min = ma.fields.Float(required=True, metadata={"description": "smallest ratio"})
    max = ma.fields.Float(required=True, metadata={"description": "largest ratio"})
    source = ma.fields.String(required=True, metadata={"description": "where the rule comes from"})
    widest = ma.fields.Nested(WidestSchema, required=True, metadata={
        "description": "how far a design request may widen the rule (its `proportions`)"})


def ratio_rules(family: SectionFamily) -> list[dict]:
    """A family's proportion rules as GET /v1/sections lists them."""
    return [{"ratio": family.ratio_name(bound), "min": bound.low, "max": bound.high,
             "source": bound.source,
             "widest": {"min": bound.widest_low, "max": bound.widest_high,
                        "source": bound.widest_source or "the rule may only be narrowed"}}
            for bound in family.ratio_bounds]


class FamilySchema(ma.Schema):
    id = ma.fields.String(required=True, metadata={"description": "section family id"})
    description = ma.fields.String(required=True)
    dimensions = ma.fields.List(
        ma.fields.Nested(DimensionSchema),
        required=True,
        metadata={"description": "the family's dimensions (all metres), in order"},
    )
    loadings = ma.fields.List(
        ma.fields.String(
            validate=ma.validate.OneOf(["bending", "torsion", "tension", "compression"])
        ),
        required=True,
        metadata={"description": "loadings the family is offered for"},
    )
    rules = ma.fields.List(ma.fields.Nested(RatioRuleSchema), required=True, metadata={
        "description": "proportion rules the sizing keeps (a ratio of each free dimension "
                       "to the scale dimension)"})


class FamilyListSchema(ma.Schema):
    families = ma.fields.List(ma.fields.Nested(FamilySchema), required=True)


def family_list(families: Iterable[SectionFamily]) -> dict:
    """The GET /v1/sections body (:class:`FamilyListSchema`) of ``families``."""
    return {
        "families": [
            {
                "id": family.id,
                "description": family.description,
                "dimensions": [
                    {"name": d.name, "description": d.description} for d in family.dimensions
                ],
                "loadings": list(family.loadings),
                "rules": ratio_rules(family),
            }
            for family in families
        ]
    }


class FamilyDimensions(ma.fields.Dict):
    """``{dimension name: length}`` for the family named by the request's ``family``.

    Each value is a :class:`~service.api.fields.Quantity` in metres, between 1 nm and 1 km
    (:data:`SMALLEST_DIMENSION`, :data:`LARGEST_DIMENSION`). Unit problems, missing
    and unknown names and impossible geometry (the core's
    :meth:`~service.core.sections.base.SectionFamily.validate`) are all reported together,
    each under its own dimension name, so the 422 lists every bad field as
    ``dimensions.<name>``.
    """

    def __init__(self, **kwargs):
        super().__init__(
            keys=ma.fields.String(),
            values=Quantity("m", minimum=SMALLEST_DIMENSION, maximum=LARGEST_DIMENSION),
            **kwargs,
        )

    def _deserialize(self, value, attr, data, **kwargs) -> dict[str, float]:
        if not isinstance(value, Mapping):
            raise ma.ValidationError("must be an object of dimension name -> length")
        converted: dict[str, float] = {}
        unit_errors: dict[str, list[str]] = {}
        for name, raw in value.items():
            try:
                converted[str(name)] = self.value_field.deserialize(raw)
            except ma.ValidationError as error:
                unit_errors[str(name)] = error.messages
        family_id = data.get("family") if isinstance(data, Mapping) else None
        family = FAMILIES.get(family_id) if isinstance(family_id, str) else None
        geometry_errors: dict[str, list[str]] = {}
        if family is not None:
            try:
                family.validate(converted)
            except GeometryError as error:
                geometry_errors = error.errors
        errors = {**geometry_errors, **unit_errors}
        if errors:
            raise ma.ValidationError(errors)
        return converted


class PropertiesRequestSchema(ma.Schema):
    family = ma.fields.String(
        required=True,
        validate=ma.validate.OneOf(FAMILY_IDS),
        metadata={"description": "section family id"},
    )
    dimensions = FamilyDimensions(
        required=True,
        metadata={
            "description": 'the family\'s dimensions, metres or strings with units ("25 mm")',
        },
    )


class MajorMinorSchema(ma.Schema):
    major = ma.fields.Float(required=True, metadata={"description": "about the major axis"})
    minor = ma.fields.Float(required=True, metadata={"description": "about the minor axis"})


class MajorSchema(ma.Schema):
    major = ma.fields.Float(required=True, metadata={"description": "about the major axis"})


class ShapeFactorsSchema(ma.Schema):
    bending_stiffness = ma.fields.Float(required=True, metadata={"description": "12 I / A^2"})
    bending_strength = ma.fields.Float(required=True, metadata={"description": "6 Z / A^1.5"})
    torsion_stiffness = ma.fields.Float(
        required=True, metadata={"description": "K / K of the solid square of equal area"}
    )
    torsion_strength = ma.fields.Float(
        required=True, metadata={"description": "Q / Q of the solid square of equal area"}
    )


class SectionPropertiesSchema(ma.Schema):
    """The section properties of one section (also each design's ``section.properties``)."""

    area = ma.fields.Float(
        required=True,
        metadata={
            "description": "A, m^2 (sandwich panels: the two faces; the core carries no "
            "bending stress)"
        },
    )
    second_moment = ma.fields.Nested(
        MajorMinorSchema, required=True, metadata={"description": "I, m^4"}
    )
    section_modulus = ma.fields.Nested(
        MajorMinorSchema, required=True, metadata={"description": "elastic Z = I / c, m^3"}
    )
    plastic_modulus = ma.fields.Nested(
        MajorSchema, required=True, metadata={"description": "plastic section modulus, m^3"}
    )
    torsion_constant = ma.fields.Float(
        required=True, metadata={"description": "K, m^4: twist rate = T / (G K)"}
    )
    torsion_modulus = ma.fields.Float(
        required=True, metadata={"description": "Q, m^3: peak shear stress = T / Q"}
    )


def properties_body(props, digits: int | None = None) -> dict:
    """The :class:`SectionPropertiesSchema` fields of ``props``
    (:class:`~service.core.sections.base.SectionProperties` of one section), rounded to
    ``digits`` significant digits when given."""
    def number(value) -> float:
        value = float(value)
        return value if digits is None else float(significant(value, digits))
    return {
        "area": number(props.area),
        "second_moment": {"major": number(props.second_moment_major),
                          "minor": number(props.second_moment_minor)},
        "section_modulus": {"major": number(props.section_modulus_major),
                            "minor": number(props.section_modulus_minor)},
        "plastic_modulus": {"major": number(props.plastic_modulus_major)},
        "torsion_constant": number(props.torsion_constant),
        "torsion_modulus": number(props.torsion_modulus),
    }


class PropertiesResponseSchema(SectionPropertiesSchema):
    family = ma.fields.String(required=True)
    dimensions = ma.fields.Dict(
        keys=ma.fields.String(),
        values=ma.fields.Float(),
        required=True,
        metadata={"description": "the dimensions used, m"},
    )
    shape_factors = ma.fields.Nested(
        ShapeFactorsSchema,
        required=True,
        metadata={"description": "against a solid square of the same area (1 for it)"},
    )


def properties_response(family: SectionFamily, dimensions: Mapping[str, float]) -> dict:
    """The POST /v1/sections/properties body (:class:`PropertiesResponseSchema`): the
    properties and shape factors of one section of ``family``, dimensions in m."""
    dims = {name: dimensions[name] for name in family.dimension_names}
    props = family.properties(dims)
    factors = shape_factors(props)
    return {
        "family": family.id,
        "dimensions": dims,
        **properties_body(props),
        "shape_factors": {
            name: float(getattr(factors, name)) for name in factors.__dataclass_fields__
        },
    }
