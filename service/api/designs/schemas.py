"""Schemas of POST /v1/designs (contract in schemas/README.md; adds ``catalog``)."""

from __future__ import annotations

import marshmallow as ma

from service.api.fields import Quantity
from service.api.materials.schemas import MaterialFilterSchema, MaterialSchema
from service.api.rankings.schemas import MaterialRefSchema
from service.core.loadcases import LOAD_CASES
from service.core.sections import FAMILIES
from service.core.sizing.request import BASES, OBJECTIVES

FAMILY_IDS = list(FAMILIES)

LIMITS = {
    "span": 1e3,            # m
    "load": 1e8,            # N
    "torque": 1e8,          # N m
    "max_deflection": 10.0,  # m
    "max_twist": 100.0,     # rad
    "safety_factor": 100.0,
    "envelope": 100.0,      # m
    "min_wall": 1.0,        # m
}
"""Largest accepted values: far beyond any light member (common practice for the scope of a
preliminary sizing service), and small enough that no intermediate result overflows."""


class LoadCaseSchema(ma.Schema):
    type = ma.fields.String(required=True, validate=ma.validate.OneOf(list(LOAD_CASES)))
    span = Quantity("m", exclusive_minimum=0.0, maximum=LIMITS["span"], required=True,
                    metadata={"description": "member length, m"})
    load = Quantity("N", minimum=0.0, maximum=LIMITS["load"], metadata={
        "description": "point load, or the total load of a uniform case, N (bending cases)"})
    torque = Quantity("N*m", exclusive_minimum=0.0, maximum=LIMITS["torque"],
                      metadata={"description": "applied torque, N m (torsion case)"})


class RequirementsSchema(ma.Schema):
    max_deflection = Quantity("m", exclusive_minimum=0.0, maximum=LIMITS["max_deflection"],
                              metadata={"description": "allowed peak deflection (bending)"})
    max_twist = Quantity("rad", exclusive_minimum=0.0, maximum=LIMITS["max_twist"],
                         metadata={"description": "allowed angle of twist (torsion)"})
    safety_factor = Quantity("", minimum=1.0, maximum=LIMITS["safety_factor"], load_default=1.0,
                             metadata={
        "description": "divides the strength and the local buckling stress (default 1)"})
    local_buckling = ma.fields.Boolean(load_default=True)
    self_weight = ma.fields.Boolean(load_default=False, metadata={
        "description": "add the member's own weight as a uniform load"})


class EnvelopeSchema(ma.Schema):
    max_depth = Quantity("m", exclusive_minimum=0.0, maximum=LIMITS["envelope"])
    max_width = Quantity("m", exclusive_minimum=0.0, maximum=LIMITS["envelope"], metadata={
        "description": "also the panel width of sandwich panels (required for them)"})


class CatalogMemberSchema(ma.Schema):
    designation = ma.fields.String(required=True)
    family = ma.fields.String(required=True, validate=ma.validate.OneOf(FAMILY_IDS))
    dimensions = ma.fields.Dict(keys=ma.fields.String(), values=Quantity("m"), required=True)


class Catalog(ma.fields.Field):
    """A built-in catalogue's name, or a list of members (dimensions unit-aware)."""

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, str):
            return value
        if isinstance(value, list):
            return CatalogMemberSchema(many=True).load(value)
        raise ma.ValidationError("must be a catalogue name or a list of members")


class DesignRequestSchema(ma.Schema):
    load_case = ma.fields.Nested(LoadCaseSchema, required=True)
    requirements = ma.fields.Nested(RequirementsSchema, load_default=lambda: {
        "safety_factor": 1.0, "local_buckling": True, "self_weight": False})
    envelope = ma.fields.Nested(EnvelopeSchema, load_default=dict)
    min_wall = Quantity("m", exclusive_minimum=0.0, maximum=LIMITS["min_wall"], metadata={
        "description": "smallest wall, flange, web or face thickness"})
    objective = ma.fields.String(load_default="mass", validate=ma.validate.OneOf(OBJECTIVES))
    property_basis = ma.fields.String(load_default="typical", validate=ma.validate.OneOf(BASES))
    sections = ma.fields.List(ma.fields.String(validate=ma.validate.OneOf(FAMILY_IDS)),
                              metadata={"description": "default: every family that carries "
                                                       "the loading"})
    materials = ma.fields.Nested(MaterialFilterSchema)
    custom_materials = ma.fields.List(ma.fields.Nested(MaterialSchema))
    core_materials = ma.fields.Nested(MaterialFilterSchema, metadata={
        "description": "sandwich cores (default: the foam family)"})
    top = ma.fields.Integer(strict=True, validate=ma.validate.Range(min=1))
    pareto = ma.fields.List(
        ma.fields.String(validate=ma.validate.OneOf(OBJECTIVES)),
        validate=ma.validate.Length(equal=2),
        metadata={"description": 'two objectives, e.g. ["mass", "cost"]: the response adds the '
                                 "non-dominated designs across all materials and families"},
    )
    catalog = Catalog(metadata={
        "description": 'discrete sections to choose from: a built-in catalogue name (e.g. '
                       '"chs_en10219"), or a list of {designation, family, dimensions}'})


class SectionRefSchema(ma.Schema):
    family = ma.fields.String(required=True)
    dimensions = ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Float(),
                                required=True, metadata={"description": "metres"})
    designation = ma.fields.String(allow_none=True, metadata={
        "description": "the catalogue member's name, when sized from a catalogue"})


class UtilizationSchema(ma.Schema):
    stiffness = ma.fields.Float(required=True)
    strength = ma.fields.Float(required=True)
    local_buckling = ma.fields.Float(required=True)


class DesignSchema(ma.Schema):
    rank = ma.fields.Integer(required=True)
    material = ma.fields.Nested(MaterialRefSchema, required=True)
    section = ma.fields.Nested(SectionRefSchema, required=True)
    core_material = ma.fields.Nested(MaterialRefSchema, allow_none=True, required=True)
    mass = ma.fields.Float(required=True, metadata={"description": "kg"})
    cost = ma.fields.Float(required=True, metadata={"description": "price x mass"})
    carbon = ma.fields.Float(required=True, metadata={"description": "kg CO2e"})
    deflection = ma.fields.Float(allow_none=True, required=True, metadata={"description": "m"})
    twist = ma.fields.Float(allow_none=True, required=True, metadata={"description": "rad"})
    max_stress = ma.fields.Float(required=True, metadata={"description": "Pa"})
    utilization = ma.fields.Nested(UtilizationSchema, required=True, metadata={
        "description": "each <= 1; 0 for a requirement not asked for"})
    governing = ma.fields.String(required=True, metadata={
        "description": "stiffness, strength, local_buckling, envelope or min_wall"})


class RejectionSchema(ma.Schema):
    material = ma.fields.Nested(MaterialRefSchema, required=True)
    section = ma.fields.String(required=True)
    reason = ma.fields.String(required=True)


class DesignResponseSchema(ma.Schema):
    designs = ma.fields.List(ma.fields.Nested(DesignSchema), required=True)
    rejected = ma.fields.List(ma.fields.Nested(RejectionSchema), required=True)
    pareto = ma.fields.List(ma.fields.Nested(DesignSchema), metadata={
        "description": "with a pareto request: the non-dominated designs, best first in the "
                       "first objective (ranks are positions on the front)"})
    caution = ma.fields.String(required=True)
