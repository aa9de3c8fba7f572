"""Schemas of the chart endpoints (POST /v1/charts/...).

Every chart request takes the options of :func:`options`: ``format`` (else the Accept header
decides), ``width`` and ``height`` in pixels, and ``title``. The designs and sweeps charts
wrap the body of the endpoint whose answer they draw under ``request``, so a client draws
exactly what it asked for.
"""

from __future__ import annotations

import math
from collections.abc import Mapping

import marshmallow as ma

from service.api.designs.schemas import DesignRequestSchema
from service.api.materials.schemas import MaterialFilterSchema, MaterialSchema
from service.api.sections.schemas import PropertiesRequestSchema
from service.api.sweeps.schemas import SweepRequestSchema
from service.charts.properties import MATERIAL_CLASSES
from service.charts.render import FORMATS
from service.charts.sweeps import INPUT_TEXT, SCALES, SERIES
from service.core.indices import LIMITS, LOADINGS, MAX_CUSTOM_EXPONENT, OBJECTIVES
from service.core.materials import ALL_PROPERTIES, BASES

MAX_PIXELS = 2400
MIN_PIXELS = 240
MAX_POWER = 4.0
"""Largest |power| of a property on a property chart axis."""


def options(width: int, height: int) -> dict[str, ma.fields.Field]:
    """The fields every chart request has, with this chart's default size."""
    size = ma.validate.Range(min=MIN_PIXELS, max=MAX_PIXELS)
    return {
        "format": ma.fields.String(validate=ma.validate.OneOf(list(FORMATS)), metadata={
            "description": "svg or png; when absent the Accept header decides (SVG unless "
                           "it asks for image/png)"}),
        "width": ma.fields.Integer(strict=True, load_default=width, validate=size, metadata={
            "description": f"pixels (PNG size; SVG at 72 points per 100 px), default {width}"}),
        "height": ma.fields.Integer(strict=True, load_default=height, validate=size,
                                    metadata={"description": f"pixels, default {height}"}),
        "title": ma.fields.String(validate=ma.validate.Length(max=120), metadata={
            "description": "replaces the chart's own title"}),
    }


class PropertyPowers(ma.fields.Field):
    """An axis quantity: a property name, or ``{property: power}`` for a product of powers.

    Every bad entry is reported under its own name (``x.<name>``).
    """

    def _deserialize(self, value, attr, data, **kwargs) -> dict[str, float]:
        if isinstance(value, str):
            value = {value: 1.0}
        if not isinstance(value, Mapping) or not value:
            raise ma.ValidationError(
                "must be a property name or an object of property -> power")
        errors: dict[str, list[str]] = {}
        powers: dict[str, float] = {}
        for name, power in value.items():
            if name not in ALL_PROPERTIES:
                errors[str(name)] = [
                    "unknown property; expected one of " + ", ".join(ALL_PROPERTIES)]
            elif not _number(power) or power == 0 or abs(power) > MAX_POWER:
                errors[str(name)] = [
                    f"power must be a non-zero number from -{MAX_POWER:g} to {MAX_POWER:g}"]
            else:
                powers[str(name)] = float(power)
        if errors:
            raise ma.ValidationError(errors)
        return powers


def _number(value: object) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool) and math.isfinite(
        value)


class IndexExponents(ma.fields.Dict):
    """``{property: exponent}`` of a custom index (plain numbers, never evaluated)."""

    def __init__(self, **kwargs):
        super().__init__(keys=ma.fields.String(), values=ma.fields.Float(), **kwargs)

    def _deserialize(self, value, attr, data, **kwargs) -> dict[str, float]:
        if not isinstance(value, Mapping) or not value:
            raise ma.ValidationError("must be an object of property -> exponent")
        errors = {}
        for name, exponent in value.items():
            if name not in ALL_PROPERTIES:
                errors[str(name)] = [
                    "unknown property; expected one of " + ", ".join(ALL_PROPERTIES)]
            elif not _number(exponent) or abs(exponent) > MAX_CUSTOM_EXPONENT:
                errors[str(name)] = [f"must be a number from -{MAX_CUSTOM_EXPONENT:g} to "
                                     f"{MAX_CUSTOM_EXPONENT:g}"]
        if not errors and not any(value.values()):
            raise ma.ValidationError("needs at least one non-zero exponent")
        if errors:
            raise ma.ValidationError(errors)
        return {str(n): float(e) for n, e in value.items() if e}


class GuideSchema(ma.Schema):
    loading = ma.fields.String(validate=ma.validate.OneOf(LOADINGS), metadata={
        "description": "with limit and objective: the derived index of POST /v1/rankings "
                       "(its material part)"})
    limit = ma.fields.String(validate=ma.validate.OneOf(LIMITS))
    objective = ma.fields.String(load_default="mass", validate=ma.validate.OneOf(OBJECTIVES))
    exponents = IndexExponents(metadata={
        "description": "instead of loading and limit: a custom index prod(property^exponent)",
        "example": {"youngs_modulus": 0.5, "density": -1}})
    through = ma.fields.String(metadata={
        "description": "material id the line passes through (default: the chosen material "
                       "with the highest index)"})

    @ma.validates_schema
    def _one_index(self, data, **kwargs):
        derived = "loading" in data or "limit" in data
        if derived == ("exponents" in data):
            raise ma.ValidationError("give loading and limit, or exponents", "exponents")
        if derived and not ("loading" in data and "limit" in data):
            raise ma.ValidationError("loading and limit go together",
                                     "limit" if "loading" in data else "loading")


class Limits(ma.fields.List):
    """``[low, high]`` of a log axis, SI, both above zero."""

    def __init__(self, **kwargs):
        super().__init__(ma.fields.Float(allow_nan=False), **kwargs)

    def _deserialize(self, value, attr, data, **kwargs) -> tuple[float, float]:
        values = super()._deserialize(value, attr, data, **kwargs)
        if len(values) != 2:
            raise ma.ValidationError("must be [low, high]")
        errors = {k: ["must be above zero: the axis is logarithmic"]
                  for k, v in enumerate(values) if v <= 0}
        if errors:
            raise ma.ValidationError(errors)
        if values[0] >= values[1]:
            raise ma.ValidationError("low must be below high")
        return values[0], values[1]


class PropertyChartSchema(ma.Schema.from_dict(options(800, 560), name="PropertyChartOptions")):
    x = PropertyPowers(metadata={
        "description": "x quantity: a property name or {property: power} (default: the "
                       "guide index's properties with negative exponents, else density)",
        "example": "density"})
    y = PropertyPowers(metadata={
        "description": "y quantity (default: the guide index's properties with positive "
                       "exponents, else youngs_modulus)",
        "example": {"youngs_modulus": 1}})
    guide = ma.fields.Nested(GuideSchema, metadata={
        "description": "draw the line of equal index through one material"})
    highlight = ma.fields.Nested(MaterialFilterSchema, metadata={
        "description": "the materials drawn in colour and labelled (default: all)"})
    top = ma.fields.Integer(strict=True, validate=ma.validate.Range(min=1), metadata={
        "description": "keep only the best `top` highlighted materials by the guide index"})
    labels = ma.fields.Integer(strict=True, load_default=12, validate=ma.validate.Range(
        min=0, max=60), metadata={"description": "label at most this many highlighted "
                                                 "materials, best first (default 12)"})
    series = ma.fields.String(load_default="class", validate=ma.validate.OneOf(
        ["class", "family"]), metadata={
        "description": "a colour and marker per material class ("
                       + ", ".join(dict.fromkeys(MATERIAL_CLASSES.values()))
                       + ") or per material family"})
    property_basis = ma.fields.String(load_default="typical",
                                      validate=ma.validate.OneOf(BASES))
    custom_materials = ma.fields.List(ma.fields.Nested(MaterialSchema))
    x_limits = Limits(metadata={"description": "[low, high] of x, SI"})
    y_limits = Limits(metadata={"description": "[low, high] of y, SI"})

    @ma.validates_schema
    def _axes_together(self, data, **kwargs):
        if ("x" in data) != ("y" in data):
            raise ma.ValidationError("give x and y together, or neither",
                                     "y" if "x" in data else "x")


class DesignChartSchema(ma.Schema.from_dict(options(800, 560), name="DesignChartOptions")):
    request = ma.fields.Nested(DesignRequestSchema, required=True, metadata={
        "description": "a POST /v1/designs request; its designs are drawn"})
    versus = ma.fields.String(load_default="cost", validate=ma.validate.OneOf(
        ["cost", "carbon"]), metadata={"description": "the y axis against mass"})


class SweepChartSchema(ma.Schema.from_dict(options(800, 520), name="SweepChartOptions")):
    request = ma.fields.Nested(SweepRequestSchema, required=True, metadata={
        "description": "a POST /v1/sweeps request (its top is not used: each line is the "
                       "best design of its series)"})
    x = ma.fields.String(validate=ma.validate.OneOf(list(INPUT_TEXT)), metadata={
        "description": "the varied path on x (default: the only one varied)"})
    y = ma.fields.String(load_default="mass", metadata={
        "description": "mass, cost, carbon or dimensions.<name>"})
    series = ma.fields.String(load_default="family", validate=ma.validate.OneOf(SERIES),
                              metadata={"description": "a line per section family or per "
                                                       "material (at most 7 lines)"})
    x_scale = ma.fields.String(load_default="linear", validate=ma.validate.OneOf(SCALES))
    y_scale = ma.fields.String(load_default="linear", validate=ma.validate.OneOf(SCALES))


class SectionChartSchema(PropertiesRequestSchema,
                         ma.Schema.from_dict(options(420, 420), name="SectionChartOptions")):
    caption = ma.fields.String(load_default="", validate=ma.validate.Length(max=120),
                               metadata={"description": "a line under the title, e.g. the "
                                                        "material"})
    property_basis = ma.fields.String(validate=ma.validate.OneOf(BASES), metadata={
        "description": "the basis of the design drawn, for the footnote"})
