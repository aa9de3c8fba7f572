"""Schemas of POST /v1/rankings (contract in schemas/README.md; adds proportions, custom_index,
property_basis, chart, excluded and caution)."""

from __future__ import annotations

from collections.abc import Mapping

import marshmallow as ma

from service.api.fields import Quantity
from service.api.materials.schemas import (
    MaterialFilterSchema,
    MaterialSchema,
    PropertyBoundsSchema,
)
from service.core.indices import (
    LIMITS,
    LOADINGS,
    MAX_CUSTOM_EXPONENT,
    OBJECTIVES,
    exponent_errors,
    proportion_errors,
)
from service.core.materials import ALL_PROPERTIES, BASES
from service.core.sections import FAMILIES, FAMILY_IDS


def _keyed(errors: Mapping[str, list[str]]) -> dict[str, list[str]]:
    """Core errors keyed by name, "" (the whole object) as marshmallow's schema key."""
    return {name or ma.exceptions.SCHEMA: messages for name, messages in errors.items()}


class CustomIndex(ma.fields.Dict):
    """``{property or "shape_factor": exponent}``, plain JSON numbers only (never evaluated).

    Every bad entry is reported under its own name (``custom_index.<name>``) by the core's
    :func:`~service.core.indices.exponent_errors`.
    """

    def __init__(self, **kwargs):
        super().__init__(keys=ma.fields.String(), values=ma.fields.Float(), **kwargs)

    def _deserialize(self, value, attr, data, **kwargs) -> dict[str, float]:
        if not isinstance(value, Mapping):
            raise ma.ValidationError("must be an object of property -> exponent")
        errors = exponent_errors(value, ALL_PROPERTIES)
        if errors:
            raise ma.ValidationError(_keyed(errors))
        return {str(name): float(exponent) for name, exponent in value.items()}


class Proportions(ma.fields.Dict):
    """``{family id: {dimension: ratio to the scale dimension}}``, ratios unit-aware
    (dimensionless: ``0.05``, ``"5 %"``), checked by the core's
    :func:`~service.core.indices.proportion_errors`; every bad entry is reported under
    ``proportions.<family>.<dimension>``."""

    def __init__(self, **kwargs):
        self.ratio = Quantity("", exclusive_minimum=0.0)
        super().__init__(
            keys=ma.fields.String(validate=ma.validate.OneOf(FAMILY_IDS)),
            values=ma.fields.Dict(keys=ma.fields.String(), values=self.ratio),
            **kwargs,
        )

    def _deserialize(self, value, attr, data, **kwargs) -> dict[str, dict[str, float]]:
        if not isinstance(value, Mapping):
            raise ma.ValidationError("must be an object of family id -> {dimension: ratio}")
        loaded: dict[str, dict[str, float]] = {}
        errors: dict[str, object] = {}
        for family_id, ratios in value.items():
            family = FAMILIES.get(family_id) if isinstance(family_id, str) else None
            if family is None:
                errors[str(family_id)] = [f"unknown section family; one of {', '.join(FAMILY_IDS)}"]
                continue
            if not isinstance(ratios, Mapping):
                errors[family_id] = ["must be an object of dimension -> ratio"]
                continue
            converted: dict[str, float] = {}
            family_errors: dict[str, list[str]] = {}
            for name, raw in ratios.items():
                try:
                    converted[str(name)] = self.ratio.deserialize(raw)
                except ma.ValidationError as error:
                    family_errors[str(name)] = error.messages
            core_errors = proportion_errors(family, converted)
            if family_errors:
                core_errors.pop("", None)  # "no real section" needs every value to be good
            family_errors.update(_keyed(core_errors))
            if family_errors:
                errors[family_id] = family_errors
            loaded[family_id] = converted
        if errors:
            raise ma.ValidationError(errors)
        return loaded


class RankingRequestSchema(ma.Schema):
    loading = ma.fields.String(required=True, validate=ma.validate.OneOf(LOADINGS))
    limit = ma.fields.String(
        required=True,
        validate=ma.validate.OneOf(LIMITS),
        metadata={"description": "what sizes the member: its stiffness, its strength, or "
                                 "(bending only) its first natural frequency, whose index "
                                 "is the published (phi E)^(1/2) / rho (the mass goes as "
                                 "its inverse square)"},
    )
    objective = ma.fields.String(
        load_default="mass",
        validate=ma.validate.OneOf(OBJECTIVES),
        metadata={"description": "minimise mass, cost (price x mass) or carbon"},
    )
    sections = ma.fields.List(
        ma.fields.String(validate=ma.validate.OneOf(FAMILY_IDS)),
        validate=ma.validate.Length(min=1),
        metadata={
            "description": "section families to rank (default: every self-similar family that "
            "carries the loading; sandwich_panel is sized by POST /v1/designs, not ranked)"
        },
    )
    proportions = Proportions(
        metadata={
            "description": "fix proportions instead of using the best a material reaches: "
            "family -> {dimension: dimension / the family's scale dimension}, e.g. "
            '{"round_tube": {"wall": 0.05}} is wall / outer_diameter = 0.05 (D/t = 20). '
            "Scale dimensions: depth (solid_rectangle, rectangular_tube, i_section), "
            "outer_diameter (round_tube). Ratios not given are still searched.",
            "example": {"round_tube": {"wall": 0.05}},
        },
    )
    materials = ma.fields.Nested(
        MaterialFilterSchema,
        metadata={"description": "which candidates, built-in and custom, to rank"},
    )
    custom_materials = ma.fields.List(ma.fields.Nested(MaterialSchema))
    custom_index = CustomIndex(
        metadata={
            "description": "rank by prod(property^exponent) instead of the derived index: "
            f"property ({', '.join(ALL_PROPERTIES)}) -> exponent, each within "
            f"+-{MAX_CUSTOM_EXPONENT:g}; the optional key shape_factor is the exponent of "
            "the loading and limit's shape factor (default 0). Numbers only: nothing is "
            "evaluated.",
            "example": {"youngs_modulus": 0.5, "density": -1, "shape_factor": 0.5},
        },
    )
    property_basis = ma.fields.String(
        load_default="typical",
        validate=ma.validate.OneOf(BASES),
        metadata={"description": "typical values (the default of rankings), conservative "
                                 "(low stiffness and strength, high density) or design (low "
                                 "strength, typical stiffness and density)"},
    )
    top = ma.fields.Integer(
        strict=True,
        validate=ma.validate.Range(min=1),
        metadata={"description": "keep the best `top` results (default: all)"},
    )
    chart = ma.fields.Boolean(
        load_default=False,
        metadata={"description": "also return the data of a log-log property chart"},
    )
    allow_brittle = ma.fields.Boolean(
        load_default=False,
        metadata={"description": "rank brittle materials too (default false: they are left "
                                 "out and listed in excluded with the reason); rule in "
                                 "data/README.md, \"Brittle\""},
    )
    property_limits = ma.fields.Nested(PropertyBoundsSchema, metadata={
        "description": "property -> {min, max}, with units, on property_basis; a material "
                       "that fails one (or has no value of it) is listed in excluded with the "
                       "limit it failed",
        "example": {"fracture_toughness": {"min": "20 MPa*m^0.5"}},
    })


class MaterialRefSchema(ma.Schema):
    id = ma.fields.String(required=True)
    name = ma.fields.String(required=True)
    family = ma.fields.String(required=True)


class IndexSchema(ma.Schema):
    exponents = ma.fields.Dict(
        keys=ma.fields.String(),
        values=ma.fields.Float(),
        required=True,
        metadata={"description": "material property -> exponent in the index"},
    )
    shape_factor = ma.fields.String(
        required=True,
        allow_none=True,
        metadata={"description": "the shape factor the index multiplies (bending_stiffness, "
                                 "bending_strength, torsion_stiffness, torsion_strength, "
                                 "column_stiffness), null where shape has no effect"},
    )
    shape_factor_exponent = ma.fields.Float(required=True)
    description = ma.fields.String(
        required=True, metadata={"description": "the derivation: objective, constraint, index"}
    )


class RankedResultSchema(ma.Schema):
    rank = ma.fields.Integer(required=True)
    material = ma.fields.Nested(MaterialRefSchema, required=True)
    section = ma.fields.String(required=True)
    shape_factor = ma.fields.Float(
        required=True,
        metadata={"description": "shape factor used: the largest this material reaches in "
                                 "the family before local buckling, or at fixed proportions "
                                 "(1 where shape has no effect)"},
    )
    proportions = ma.fields.Dict(
        keys=ma.fields.String(),
        values=ma.fields.Float(),
        required=True,
        metadata={"description": "dimension / scale dimension where the shape factor was taken"},
    )
    index = ma.fields.Float(required=True, metadata={"description": "bigger is better (SI)"})
    relative = ma.fields.Float(required=True, metadata={"description": "index / best index"})


class ExclusionSchema(ma.Schema):
    material = ma.fields.Nested(MaterialRefSchema, required=True)
    section = ma.fields.String(required=True)
    reason = ma.fields.String(required=True)


class ChartAxisSchema(ma.Schema):
    label = ma.fields.String(required=True)
    exponents = ma.fields.Dict(
        keys=ma.fields.String(),
        values=ma.fields.Float(),
        required=True,
        metadata={"description": "the axis quantity is prod(name^power)"},
    )
    unit = ma.fields.String(required=True)


class ChartRangeSchema(ma.Schema):
    low = ma.fields.Float(required=True, metadata={"description": "from the properties' low ends"})
    high = ma.fields.Float(required=True, metadata={"description": "from their high ends"})
    value = ma.fields.Float(required=True, metadata={"description": "the value the index used"})


class ChartPointSchema(ma.Schema):
    rank = ma.fields.Integer(required=True)
    material = ma.fields.Nested(MaterialRefSchema, required=True)
    section = ma.fields.String(required=True)
    x = ma.fields.Nested(ChartRangeSchema, required=True)
    y = ma.fields.Nested(ChartRangeSchema, required=True)


class GuideLineSchema(ma.Schema):
    slope = ma.fields.Float(required=True, metadata={"description": "in log10 y per log10 x"})
    intercept = ma.fields.Float(
        required=True, metadata={"description": "log10 y at x = 1 (log10 space)"}
    )
    through = ma.fields.Integer(
        required=True, metadata={"description": "rank of the result the line passes through"}
    )


class ChartSchema(ma.Schema):
    x = ma.fields.Nested(ChartAxisSchema, required=True)
    y = ma.fields.Nested(ChartAxisSchema, required=True)
    points = ma.fields.List(ma.fields.Nested(ChartPointSchema), required=True)
    guide_line = ma.fields.Nested(
        GuideLineSchema,
        required=True,
        metadata={"description": "points of equal index: log10 y = slope log10 x + intercept"},
    )


class RankingResponseSchema(ma.Schema):
    index = ma.fields.Nested(IndexSchema, required=True)
    results = ma.fields.List(
        ma.fields.Nested(RankedResultSchema), required=True, metadata={"description": "best first"}
    )
    excluded = ma.fields.List(
        ma.fields.Nested(ExclusionSchema),
        required=True,
        metadata={"description": "materials made in a family that get no result there"},
    )
    chart = ma.fields.Nested(ChartSchema, metadata={"description": "when asked for"})
    caution = ma.fields.String(required=True)
