"""Schemas of POST /v1/designs (contract in schemas/README.md; adds ``catalog``)."""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import TYPE_CHECKING

import marshmallow as ma

from service.api.fields import Quantity
from service.api.materials.schemas import (
    MaterialFilterSchema,
    MaterialSchema,
    PropertyBoundsSchema,
)
from service.api.rankings.schemas import MaterialRefSchema, material_ref
from service.api.sections.schemas import (
    RatioRuleSchema,
    SectionPropertiesSchema,
    properties_body,
    ratio_rules,
)
from service.api.teamdata import team_catalog
from service.core import CAUTION
from service.core.indices import OBJECTIVES
from service.core.loading.actions import ACTION_KINDS, CYCLIC_PARTS, Action
from service.core.materials import BASES, MaterialTable
from service.core.materials.vocabulary import FAMILIES as MATERIAL_FAMILIES
from service.core.materials.vocabulary import PRICE_CURRENCY, UNITS
from service.core.sections import FAMILIES, FAMILY_IDS
from service.core.sizing.checks import CHECK_NAMES
from service.core.sizing.fields import REQUEST_FIELDS, RequestField
from service.core.sizing.limits import GOVERNING, UTILIZATION_KEYS
from service.core.sizing.results import (
    REPORTED_DIGITS,
    Design,
    Rejection,
    grouped_rejections,
    significant,
)
from service.core.sizing.rules import family_for

if TYPE_CHECKING:
    from service.usecases import DesignAnswer, DesignInputs

_LOWER = {"positive": {"exclusive_minimum": 0.0}, "non_negative": {"minimum": 0.0},
          "at_least_one": {"minimum": 1.0}}


def schema_field(field: RequestField) -> ma.fields.Field:
    """The marshmallow field of a declared request field (see service.core.sizing.fields)."""
    options: dict = {"required": True} if field.required else {}
    if field.default is not None:
        options["load_default"] = field.default
    if field.description:
        options["metadata"] = {"description": field.description}
    if field.unit is not None:
        lower = ({"minimum": -field.cap} if field.lower == "signed" and field.cap is not None
                 else _LOWER.get(field.lower or "", {}))
        return Quantity(field.unit, **lower, maximum=field.cap, **options)
    if field.choices is not None:
        return ma.fields.String(validate=ma.validate.OneOf(field.choices), **options)
    return ma.fields.Boolean(**options)


def declared_fields(group: str) -> dict[str, ma.fields.Field]:
    """The fields declared under the contract object ``group`` (``""``: the top level), in
    declaration order."""
    return {f.key: schema_field(f) for f in REQUEST_FIELDS if f.group == group}


def declared_defaults(group: str) -> dict[str, object]:
    """The defaults of the fields declared under ``group``."""
    return {f.key: f.default for f in REQUEST_FIELDS if f.group == group
            and f.default is not None}


ACTION_UNITS = {"force": "N", "distributed": "N/m", "torque": "N*m", "axial": "N", "mass": "kg"}
"""The SI unit of an action's value, by kind (contract: "General member loading")."""

ACTION_VALUE_CAP = 1e8
"""Largest magnitude of an action's value (N, N/m, N m or kg): far beyond any light member,
as the caps of service.core.sizing.fields (common practice)."""


class ActionValue(ma.fields.Field):
    """An action's value: a number (SI) or a string with a unit; converted to its kind's
    unit in :meth:`ActionSchema._convert`, once the kind is known."""

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, bool) or not isinstance(value, int | float | str):
            raise ma.ValidationError("must be a number or a string with a unit")
        return value


class ActionSchema(ma.Schema):
    kind = ma.fields.String(required=True, validate=ma.validate.OneOf(ACTION_KINDS))
    at = Quantity("m", metadata={"description": "position from x = 0 (force, torque, mass)"})
    start = Quantity("m", data_key="from", metadata={
        "description": "start of a distributed load"})
    end = Quantity("m", data_key="to", metadata={"description": "end of a distributed load"})
    value = ActionValue(required=True, metadata={
        "description": "N (force, positive down; axial, positive tension), N/m (distributed), "
                       "N*m (torque) or kg (mass)"})
    cyclic = ma.fields.String(load_default="steady", validate=ma.validate.OneOf(
        tuple(CYCLIC_PARTS)), metadata={
        "description": "steady, reversed (amplitude = value) or pulsating (0 to value)"})

    @staticmethod
    def _value(data) -> float:
        """The value in its kind's SI unit (raises ValidationError)."""
        return Quantity(ACTION_UNITS[data["kind"]], minimum=-ACTION_VALUE_CAP,
                        maximum=ACTION_VALUE_CAP).deserialize(data["value"])

    @ma.validates_schema(skip_on_field_errors=True)
    def _check_value(self, data, **kwargs):
        """The value must be a quantity of its kind (a force in N, a mass in kg...)."""
        try:
            self._value(data)
        except ma.ValidationError as error:
            raise ma.ValidationError(error.messages, field_name="value") from None

    @ma.post_load
    def _convert(self, data, **kwargs):
        """An Action of the core, in SI."""
        return Action(data["kind"], self._value(data), at=data.get("at"),
                      start=data.get("start"), end=data.get("end"), cyclic=data["cyclic"])


LoadCaseSchema = type("LoadCaseSchema", (ma.Schema,), {
    **declared_fields("load_case"),
    "actions": ma.fields.List(ma.fields.Nested(ActionSchema), metadata={
        "description": "member case: what acts on the member (force, distributed, torque, "
                       "axial, mass), positions in m from x = 0"}),
})
RequirementsSchema = type("RequirementsSchema", (ma.Schema,), {
    **declared_fields("requirements"),
    "property_limits": ma.fields.Nested(PropertyBoundsSchema, metadata={
        "description": "property -> {min, max}, with units, on the request's property_basis; "
                       "a material that fails one (or has no value of it) is rejected with "
                       "the limit it failed",
        "example": {"fracture_toughness": {"min": "20 MPa*m^0.5"}, "elongation": {"min": 0.05}},
    }),
})
EnvelopeSchema = type("EnvelopeSchema", (ma.Schema,), declared_fields("envelope"))


class CatalogMemberSchema(ma.Schema):
    designation = ma.fields.String(required=True)
    family = ma.fields.String(required=True, validate=ma.validate.OneOf(FAMILY_IDS))
    dimensions = ma.fields.Dict(keys=ma.fields.String(), values=Quantity("m"), required=True)
    material_families = ma.fields.List(
        ma.fields.String(validate=ma.validate.OneOf(MATERIAL_FAMILIES)),
        metadata={"description": "the material families the member is made in (e.g. "
                                 '["steel"] for a rolled steel series); it is sized only in '
                                 "materials of these families. Absent or empty: any material"})


class Catalog(ma.fields.Field):
    """A catalogue's name (built-in or the team's), or a list of members (dimensions
    unit-aware)."""

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, str):
            return team_catalog(value) or value  # a team catalogue's members, by its id
        if isinstance(value, list):
            return CatalogMemberSchema(many=True).load(value)
        raise ma.ValidationError("must be a catalogue name or a list of members")


class RatioLimitsSchema(ma.Schema):
    min = Quantity("", exclusive_minimum=0.0,
                   metadata={"description": "smallest ratio (default: the family's)"})
    max = Quantity("", exclusive_minimum=0.0,
                   metadata={"description": "largest ratio (default: the family's)"})


ProportionsField = ma.fields.Dict(
    keys=ma.fields.String(validate=ma.validate.OneOf(FAMILY_IDS)),
    values=ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Nested(RatioLimitsSchema)),
    metadata={"description": (
        "the request's own proportion rules, "
        '{"<family>": {"<ratio>": {"min", "max"}}}, ratios named as in GET /v1/sections '
        '(e.g. "width/depth"): narrow a rule, or widen '
        "it as far as the family's physics holds (the listing's `widest`)")})


DesignRequestSchema = type("DesignRequestSchema", (ma.Schema,), {
    "load_case": ma.fields.Nested(LoadCaseSchema, required=True),
    "requirements": ma.fields.Nested(RequirementsSchema,
                                     load_default=lambda: declared_defaults("requirements")),
    "envelope": ma.fields.Nested(EnvelopeSchema, load_default=dict),
    **declared_fields(""),
    "sections": ma.fields.List(ma.fields.String(validate=ma.validate.OneOf(FAMILY_IDS)),
                               metadata={"description": "default: every family that carries "
                                                        "the loading"}),
    "materials": ma.fields.Nested(MaterialFilterSchema),
    "custom_materials": ma.fields.List(ma.fields.Nested(MaterialSchema)),
    "core_materials": ma.fields.Nested(MaterialFilterSchema, metadata={
        "description": "sandwich cores (default: the foam family)"}),
    "top": ma.fields.Integer(strict=True, validate=ma.validate.Range(min=1)),
    "pareto": ma.fields.List(
        ma.fields.String(validate=ma.validate.OneOf(OBJECTIVES)),
        validate=ma.validate.Length(equal=2),
        metadata={"description": 'two objectives, e.g. ["mass", "cost"]: the response adds the '
                                 "non-dominated designs across all materials and families"},
    ),
    "proportions": ProportionsField,
    "catalog": Catalog(metadata={
        "description": 'discrete sections to choose from: a built-in catalogue name (e.g. '
                       '"chs_en10219"), or a list of {designation, family, dimensions}'}),
})
"""POST /v1/designs: the declared request fields (service.core.sizing.fields) in their
contract objects, and the lists and filters around them."""


class SectionRefSchema(ma.Schema):
    family = ma.fields.String(required=True)
    dimensions = ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Float(),
                                required=True, metadata={"description": "metres"})
    designation = ma.fields.String(allow_none=True, metadata={
        "description": "the catalogue member's name, when sized from a catalogue"})
    properties = ma.fields.Nested(SectionPropertiesSchema, required=True, metadata={
        "description": "the section's properties from its rounded dimensions, as POST "
                       "/v1/sections/properties gives them (sandwich panels: the two faces), "
                       f"to {REPORTED_DIGITS['section_properties']} significant digits"})


UtilizationSchema = type("UtilizationSchema", (ma.Schema,), {
    name: ma.fields.Float(required=True, allow_none=True, metadata={
        "description": ("a check: what the member carries over what it may carry"
                        if name in CHECK_NAMES else
                        "a geometric limit: a dimension over its bound")})
    for name in UTILIZATION_KEYS})
"""One ratio per check and geometric limit (service.core.sizing.limits), null when the
request does not ask for it."""



class DiagramsSchema(ma.Schema):
    x = ma.fields.List(ma.fields.Float(), required=True, metadata={"description": "m"})
    shear = ma.fields.List(ma.fields.Float(), required=True, metadata={"description": "N"})
    moment = ma.fields.List(ma.fields.Float(), required=True, metadata={
        "description": "N*m, sagging positive"})
    torque = ma.fields.List(ma.fields.Float(), required=True, metadata={"description": "N*m"})
    axial = ma.fields.List(ma.fields.Float(), required=True, metadata={
        "description": "N, positive tension"})
    deflection = ma.fields.List(ma.fields.Float(), required=True, metadata={
        "description": "m, positive down"})


def _digits(unit: str, name: str) -> str:
    return f"{unit}; to {REPORTED_DIGITS[name]} significant digits"


USED_PROPERTIES = ("density", "youngs_modulus", "shear_modulus", "poisson_ratio", "strength",
                   "shear_strength", "tensile_strength", "compressive_strength",
                   "transverse_modulus", "fatigue_strength", "price", "embodied_carbon")
"""The material properties a design reports the values of (``material_values``)."""


class DesignSchema(ma.Schema):
    rank = ma.fields.Integer(required=True)
    material = ma.fields.Nested(MaterialRefSchema, required=True)
    section = ma.fields.Nested(SectionRefSchema, required=True)
    core_material = ma.fields.Nested(MaterialRefSchema, allow_none=True, required=True)
    mass = ma.fields.Float(required=True, metadata={"description": _digits("kg", "mass")})
    mass_per_length = ma.fields.Float(required=True, metadata={
        "description": _digits("kg/m: mass / span (faces and core of a sandwich panel)",
                               "mass_per_length")})
    cost = ma.fields.Float(required=True, metadata={
        "description": _digits("price x mass, in `currency`", "cost")})
    currency = ma.fields.String(required=True, metadata={
        "description": "the currency of `cost`: that of every price in the service (the "
                       f"materials' `price` unit, {UNITS['price']}; data/README.md gives "
                       "each built-in price's year and source)", "example": PRICE_CURRENCY})
    carbon = ma.fields.Float(required=True, metadata={"description": _digits("kg CO2e",
                                                                              "carbon")})
    deflection = ma.fields.Float(allow_none=True, required=True, metadata={
        "description": _digits("m", "deflection")})
    twist = ma.fields.Float(allow_none=True, required=True, metadata={
        "description": _digits("rad", "twist")})
    max_stress = ma.fields.Float(required=True, metadata={
        "description": _digits("Pa", "max_stress")})
    utilization = ma.fields.Nested(UtilizationSchema, required=True, metadata={
        "description": "one entry per check and geometric limit, each <= 1; null for one "
                       "the request does not ask for (manufacturing: a limit of what the "
                       "material's usual process makes in this form)"})
    governing = ma.fields.String(required=True, validate=ma.validate.OneOf(GOVERNING),
                                 metadata={"description": (
                                     "the utilization entry with the largest value (among "
                                     "entries within 0.1 % of it, a geometric limit first)")})
    basis = ma.fields.String(required=True, validate=ma.validate.OneOf(BASES), metadata={
        "description": "the property basis of the material values the design used"})
    material_values = ma.fields.Dict(
        keys=ma.fields.String(validate=ma.validate.OneOf(USED_PROPERTIES)),
        values=ma.fields.Float(allow_none=True), required=True, metadata={
            "description": "the material's values the sizing used, on `basis`, SI units "
                           "(the units of GET /v1/materials; shear_strength is the "
                           "material's own or strength / sqrt(3)); null where the material "
                           "gives none"})
    frequency = ma.fields.Float(allow_none=True, metadata={
        "description": "Hz: first bending natural frequency (Dunkerley's estimate, on the "
                       "safe side), where a frequency is required; to "
                       f"{REPORTED_DIGITS['frequency']} significant digits"})
    diagrams = ma.fields.Nested(DiagramsSchema, metadata={
        "description": "with diagrams: true, the member's lines sampled along it"})


class RejectionSchema(ma.Schema):
    """A rejection: with ``"rejections": "grouped"`` (the default) one entry per reason
    (``reason``, ``materials``, ``sections``, ``count``); with ``"all"`` one entry per
    material and family (``material``, ``section``, ``reason``)."""

    reason = ma.fields.String(required=True, metadata={
        "description": "why there is no design; grouped: the reason without the values of "
                       "each material (rejections: all gives them)"})
    materials = ma.fields.List(ma.fields.String(), metadata={
        "description": "grouped: the ids of the materials the reason applies to"})
    sections = ma.fields.List(ma.fields.String(), metadata={
        "description": "grouped: the section families the reason applies to"})
    count = ma.fields.Integer(metadata={
        "description": "grouped: how many material and family pairs the reason stands for"})
    material = ma.fields.Nested(MaterialRefSchema, metadata={
        "description": "all: the material without a design"})
    section = ma.fields.String(metadata={"description": "all: its section family"})


class DesignResponseSchema(ma.Schema):
    designs = ma.fields.List(ma.fields.Nested(DesignSchema), required=True)
    rules = ma.fields.Dict(
        keys=ma.fields.String(), values=ma.fields.List(ma.fields.Nested(RatioRuleSchema)),
        required=True, metadata={"description": (
            "the proportion rules applied to each family sized with free proportions (the "
            "family's own, or the request's where it gave them)")})
    rejected = ma.fields.List(ma.fields.Nested(RejectionSchema), required=True, metadata={
        "description": "the materials and families without a design, as the request's "
                       "`rejections` asks: grouped by reason (default), all (one entry per "
                       "material and family, the shape before `rejections` existed) or none "
                       "(empty); reasons a designer can act on come first, \"not made in "
                       "this form\" last"})
    warnings = ma.fields.List(ma.fields.String(), required=True, metadata={
        "description": "what the request left open that the designs depend on (for example "
                       "no stiffness requirement: the deflection is whatever strength gives); "
                       "empty when nothing"})
    pareto = ma.fields.List(ma.fields.Nested(DesignSchema), metadata={
        "description": "with a pareto request: the non-dominated designs, best first in the "
                       "first objective (ranks are positions on the front)"})
    caution = ma.fields.String(required=True)


def _material_values(table: MaterialTable, index: int, basis: str) -> dict[str, float | None]:
    """The values of :data:`USED_PROPERTIES` of material ``index`` on ``basis``."""
    values: dict[str, float | None] = {}
    for name in USED_PROPERTIES:
        column = (table.shear_strength(basis) if name == "shear_strength"
                  else table.values(name, basis))
        value = float(column[index])
        values[name] = (significant(value, REPORTED_DIGITS["material_values"])
                        if math.isfinite(value) else None)
    return values


def _designs(designs: Sequence[Design], inputs: DesignInputs) -> list[dict]:
    return [_design(rank, design, inputs) for rank, design in enumerate(designs, start=1)]


def _design(rank: int, design: Design, inputs: DesignInputs) -> dict:
    family = FAMILIES[design.family]
    d = design.reported()
    return {
        "rank": rank,
        "material": material_ref(inputs.materials, d.material_index),
        "section": {"family": d.family, "dimensions": d.dimensions,
                    "designation": d.designation,
                    "properties": properties_body(family.properties(design.dimensions),
                                                  REPORTED_DIGITS["section_properties"])},
        "core_material": None if d.core_material_index is None
        else material_ref(inputs.cores, d.core_material_index),
        "mass": d.mass,
        "mass_per_length": significant(design.mass / inputs.request.span,
                                       REPORTED_DIGITS["mass_per_length"]),
        "cost": d.cost, "currency": PRICE_CURRENCY, "carbon": d.carbon,
        "deflection": d.deflection, "twist": d.twist, "max_stress": d.max_stress,
        "utilization": d.utilization,
        "governing": d.governing,
        "basis": inputs.request.property_basis,
        "material_values": _material_values(inputs.materials, d.material_index,
                                            inputs.request.property_basis),
        **({} if d.frequency is None else {"frequency": d.frequency}),
        **({} if d.diagrams is None else {"diagrams": d.diagrams}),
    }


def applied_rules(inputs: DesignInputs) -> dict[str, list[dict]]:
    """The proportion rules of every family the request sized with free proportions."""
    request = inputs.request
    in_catalog = {member.family for member in request.catalog}
    return {family_id: ratio_rules(family_for(family_id, request.proportions))
            for family_id in request.families if family_id not in in_catalog}


def _rejected(rejections: Sequence[Rejection], inputs: DesignInputs) -> list[dict]:
    """The rejections as the request's ``rejections`` asks (the engine lists reasons a
    designer can act on first, "not made in this form" last; groups keep that order)."""
    mode = inputs.request.rejections
    if mode == "all":
        return [{"material": material_ref(inputs.materials, r.material_index),
                 "section": r.family, "reason": r.reason} for r in rejections]
    if mode == "grouped":
        return [{"reason": group.reason, "materials": list(group.material_ids),
                 "sections": list(group.families), "count": group.count}
                for group in grouped_rejections(rejections)]
    return []


def design_response(found: DesignAnswer, inputs: DesignInputs) -> dict:
    """The /v1/designs response body."""
    body = {
        "designs": _designs(found.result.designs, inputs),
        "rejected": _rejected(found.result.rejected, inputs),
        "rules": applied_rules(inputs),
        "warnings": list(found.warnings),
        "caution": CAUTION,
    }
    if found.pareto is not None:
        body["pareto"] = _designs(found.pareto, inputs)
    return body
