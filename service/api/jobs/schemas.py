"""Schemas of /v1/jobs."""

from __future__ import annotations

import marshmallow as ma

from service.api.sweeps.schemas import SweepRequestSchema

JOB_KINDS = ("sweeps",)
STATUSES = ("queued", "running", "done", "failed", "cancelled")


class JobRequestSchema(ma.Schema):
    kind = ma.fields.String(required=True, validate=ma.validate.OneOf(JOB_KINDS))
    request = ma.fields.Nested(SweepRequestSchema, required=True, metadata={
        "description": "the body of a POST /v1/sweeps request"})


class ProgressSchema(ma.Schema):
    done = ma.fields.Integer(required=True, metadata={"description": "cases stored"})
    total = ma.fields.Integer(required=True, metadata={"description": "cases in the job"})


class JobSchema(ma.Schema):
    id = ma.fields.String(required=True)
    kind = ma.fields.String(required=True)
    status = ma.fields.String(required=True, validate=ma.validate.OneOf(STATUSES))
    progress = ma.fields.Nested(ProgressSchema, required=True)
    error = ma.fields.String(required=True, allow_none=True)
    attempts = ma.fields.Integer(required=True, metadata={
        "description": "times a worker started it (more than 1 after a lost worker)"})
    created_at = ma.fields.DateTime(required=True)
    finished_at = ma.fields.DateTime(required=True, allow_none=True)
    result = ma.fields.String(required=True, allow_none=True, metadata={
        "description": "address of the result once done"})


class JobListQuerySchema(ma.Schema):
    status = ma.fields.String(validate=ma.validate.OneOf(STATUSES))


class JobListSchema(ma.Schema):
    count = ma.fields.Integer(required=True)
    jobs = ma.fields.List(ma.fields.Nested(JobSchema), required=True, metadata={
        "description": "newest first"})
