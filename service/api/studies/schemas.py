"""Schemas of /v1/studies."""

from __future__ import annotations

import marshmallow as ma

from service.api.studies.compute import KINDS


class NewStudySchema(ma.Schema):
    """The body of POST /v1/studies (component ``NewStudy``: a component named
    ``StudyRequest`` would clash with the model generated clients make for ``Study.request``)."""

    kind = ma.fields.String(required=True, validate=ma.validate.OneOf(list(KINDS)))
    request = ma.fields.Dict(required=True, metadata={
        "description": "the body of a POST /v1/<kind> request"})


class StudyInputsSchema(ma.Schema):
    materials = ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Integer(),
                               required=True, metadata={"description": "team material versions"})
    catalogs = ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Integer(),
                              required=True, metadata={"description": "team catalogue versions"})
    builtin_data = ma.fields.String(required=True, metadata={
        "description": "digest of the built-in material data"})
    service = ma.fields.String(required=True, metadata={"description": "service version"})


class StudySummarySchema(ma.Schema):
    id = ma.fields.String(required=True)
    kind = ma.fields.String(required=True)
    created_at = ma.fields.DateTime(required=True)
    service_version = ma.fields.String(required=True)
    rerun_of = ma.fields.String(required=True, allow_none=True)
    inputs = ma.fields.Nested(StudyInputsSchema, required=True)


class StudySchema(StudySummarySchema):
    request = ma.fields.Dict(required=True)
    result = ma.fields.Dict(required=True, metadata={
        "description": "the JSON answer of POST /v1/<kind> to the request"})


class StudyListSchema(ma.Schema):
    count = ma.fields.Integer(required=True)
    studies = ma.fields.List(ma.fields.Nested(StudySummarySchema), required=True)


class StudyListQuerySchema(ma.Schema):
    kind = ma.fields.String(validate=ma.validate.OneOf(list(KINDS)))


class InputChangeSchema(ma.Schema):
    input = ma.fields.String(required=True, metadata={
        "description": "materials, catalogs, builtin_data or service"})
    id = ma.fields.String(required=True, allow_none=True)
    before = ma.fields.Raw(required=True, allow_none=True)
    after = ma.fields.Raw(required=True, allow_none=True)


class DifferenceSchema(ma.Schema):
    path = ma.fields.String(required=True, metadata={"description": "JSON path in result"})
    before = ma.fields.Raw(required=True, allow_none=True)
    after = ma.fields.Raw(required=True, allow_none=True)


class RerunSchema(ma.Schema):
    study = ma.fields.Nested(StudySchema, required=True, metadata={
        "description": "the new study (rerun_of names the old one)"})
    changed_inputs = ma.fields.List(ma.fields.Nested(InputChangeSchema), required=True)
    result_changed = ma.fields.Boolean(required=True)
    difference_count = ma.fields.Integer(required=True)
    differences = ma.fields.List(ma.fields.Nested(DifferenceSchema), required=True, metadata={
        "description": "the first differences of the result, old to new"})
