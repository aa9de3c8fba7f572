"""/v1/jobs: long requests (sweeps) run in the background.

POST answers 202 at once with the job's address; GET gives its status and progress (cases
stored of total); the result is served once it is done, as JSON, CSV, NDJSON or Parquet by
the Accept header, in the same table a synchronous POST /v1/sweeps gives; DELETE cancels.
"""

from __future__ import annotations

import json

from flask import Response, abort, current_app, request, stream_with_context
from flask.views import MethodView

from service.api.blueprint import Blueprint, negotiated, produces
from service.api.errors import problem
from service.api.jobs.schemas import JobListQuerySchema, JobListSchema, JobRequestSchema, JobSchema
from service.api.studies.compute import inputs
from service.api.sweeps.routes import CAUTION_HEADER, CSV, JSON, NDJSON, PARQUET, prepared_sweep
from service.api.sweeps.schemas import SweepTableSchema
from service.api.teamdata import caller, storage, team_object
from service.core import CAUTION
from service.core.errors import InputError
from service.core.sweeps import column_type
from service.formats import csv_chunks, ndjson_chunks, parquet_bytes
from service.storage import jobs as job_store
from service.storage.models import Job

blp = Blueprint("jobs", __name__, url_prefix="/v1/jobs",
                description="Long requests in the background")

RETRY_AFTER_SECONDS = 5
"""What a client over its job limit is told to wait before trying again."""

ROWS_PER_READ = 2000

_TABLE_TEXT = {"schema": {"type": "string"}}
_BINARY = {"schema": {"type": "string", "format": "binary"}}


def _view(job: Job) -> dict:
    return {
        "id": job.id, "kind": job.kind, "status": job.status,
        "progress": {"done": job.done, "total": job.total}, "error": job.error,
        "attempts": job.attempts, "created_at": job.created_at,
        "finished_at": job.finished_at,
        "result": f"/v1/jobs/{job.id}/result" if job.status == job_store.DONE else None,
    }


@blp.route("")
class Jobs(MethodView):
    @blp.arguments(JobListQuerySchema, location="query")
    @blp.response(200, JobListSchema)
    def get(self, query):
        """The team's jobs, newest first (optionally of one status), without their rows."""
        with storage().transaction() as session:
            found = job_store.listing(session, caller().team_id, query.get("status"))
        return {"count": len(found), "jobs": [_view(job) for job in found]}

    @blp.arguments(JobRequestSchema)
    @blp.response(202, JobSchema, headers={
        "Location": {"description": "the job", "schema": {"type": "string"}}})
    @blp.alt_response(429, response="TOO_MANY_REQUESTS")
    def post(self, body):
        """Queue a sweep; answers at once with the job's address (Location).

        The request is checked as POST /v1/sweeps checks it (422 at ``request.<path>``);
        the job computes with the versions of the team's materials and catalogues of now.
        """
        raw = request.get_json()["request"]
        try:
            sweep = prepared_sweep(body["request"]).sweep
        except InputError as error:
            raise error.prefixed("request") from None
        who, used = caller(), inputs()
        limit = int(current_app.config["MAX_ACTIVE_JOBS"])
        with storage().transaction() as session:
            if job_store.active_count(session, who.team_id, who.key_id) >= limit:
                abort(problem(429, f"at most {limit} jobs may be queued or running at once",
                              headers={"Retry-After": str(RETRY_AFTER_SECONDS)}))
            job = job_store.create(session, who.team_id, who.key_id, body["kind"], raw,
                                   used, len(sweep.cases), sweep.columns())
        current_app.extensions["formwise_jobs"].enqueue(job.id)
        return _view(job), 202, {"Location": f"/v1/jobs/{job.id}"}


@blp.route("/<string:job_id>")
class JobById(MethodView):
    @blp.response(200, JobSchema)
    @blp.alt_response(404, response="NOT_FOUND")
    def get(self, job_id):
        """The job's status and progress."""
        return _view(team_object(job_store.get, "job", job_id))

    @blp.response(200, JobSchema)
    @blp.alt_response(404, response="NOT_FOUND")
    def delete(self, job_id):
        """Cancel a queued or running job (a finished one is left as it is)."""
        return _view(team_object(job_store.cancel, "job", job_id))


@blp.route("/<string:job_id>/result")
class JobResult(MethodView):
    @blp.response(200, description="The sweep table; the format follows the Accept header",
                  content_type=JSON)
    @blp.doc(responses={"200": {
        "description": "The sweep table; the format follows the Accept header",
        "content": {JSON: {"schema": SweepTableSchema}, CSV: _TABLE_TEXT, NDJSON: _TABLE_TEXT,
                    PARQUET: _BINARY}}})
    @blp.alt_response(404, response="NOT_FOUND")
    @blp.alt_response(406, response="NOT_ACCEPTABLE")
    @blp.alt_response(409, response="CONFLICT")
    @produces(JSON, CSV, NDJSON, PARQUET)
    def get(self, job_id):
        """A finished job's table: ``Accept`` JSON (default), CSV, NDJSON or Parquet."""
        job = team_object(job_store.get, "job", job_id)
        fmt = negotiated()
        if job.status != job_store.DONE:
            abort(problem(409, f"the job is {job.status}; its result is served once done"))
        if fmt == PARQUET:
            response = Response(_parquet(job), mimetype=PARQUET)
        elif fmt == JSON:
            response = current_app.response_class(
                stream_with_context(_json_chunks(job)), mimetype=JSON)
        else:
            writer = csv_chunks if fmt == CSV else ndjson_chunks
            response = Response(stream_with_context(writer(job.columns, _rows(job))),
                                mimetype=fmt)
        response.headers[CAUTION_HEADER] = CAUTION
        return response


def _rows(job: Job):
    """The job's rows, read in batches of short transactions (a slow download holds no
    transaction open)."""
    start = 0
    while True:
        with storage().transaction() as session:
            batch = job_store.rows(session, job.id, start, ROWS_PER_READ)
        yield from batch
        if len(batch) < ROWS_PER_READ:
            return
        start += ROWS_PER_READ


def _json_chunks(job: Job):
    """``{"cases", "columns", "rows", "caution"}`` as POST /v1/sweeps gives it, streamed."""
    yield f'{{"cases": {job.total}, "columns": {json.dumps(job.columns)}, "rows": ['
    for k, row in enumerate(_rows(job)):
        yield ("," if k else "") + json.dumps(row)
    yield f'], "caution": {json.dumps(CAUTION)}}}'


def _parquet(job: Job) -> bytes:
    return parquet_bytes(job.columns, _rows(job), column_type)
