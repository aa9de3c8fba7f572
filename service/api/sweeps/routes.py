"""POST /v1/sweeps: many design cases in one call, as a table in JSON, CSV, NDJSON or
Parquet."""

from __future__ import annotations

from flask import Response, current_app, stream_with_context
from flask.views import MethodView

from service.api.blueprint import Blueprint, negotiated, produces
from service.api.context import state
from service.api.sweeps.schemas import SweepRequestSchema, SweepTableSchema
from service.core import CAUTION
from service.core.sweeps import Sweep, column_type
from service.formats import csv_chunks, json_table, ndjson_chunks, parquet_bytes
from service.usecases import SweepInputs, sweep_inputs

blp = Blueprint("sweeps", __name__, url_prefix="/v1/sweeps",
                description="Many design cases in one call")

JSON, CSV, NDJSON = "application/json", "text/csv", "application/x-ndjson"
PARQUET = "application/vnd.apache.parquet"
CAUTION_HEADER = "Formwise-Caution"

_TABLE_TEXT = {"schema": {"type": "string"}}
_BINARY = {"schema": {"type": "string", "format": "binary"}}


@blp.route("")
class Sweeps(MethodView):
    @produces(JSON, CSV, NDJSON, PARQUET)
    @blp.arguments(SweepRequestSchema)
    @blp.response(200, SweepTableSchema)
    @blp.doc(responses={"200": {
        "description": "The sweep table; the format follows the Accept header",
        "content": {JSON: {"schema": SweepTableSchema}, CSV: _TABLE_TEXT, NDJSON: _TABLE_TEXT,
                    PARQUET: _BINARY},
    }})
    def post(self, body):
        """Size a base design request for every case of a grid or list.

        One row per case and rank (``top`` designs per case). ``Accept: text/csv`` gives CSV
        with a header line, ``application/x-ndjson`` one JSON object per row, streamed as the
        cases are computed, ``application/vnd.apache.parquet`` an Apache Parquet file with
        typed columns; ``application/json`` (the default) gives ``{cases, columns, rows}``;
        an Accept that allows none of these is a 406.
        """
        inputs = prepared_sweep(body)
        sweep, rows = inputs.sweep, inputs.rows(int(current_app.config["SWEEP_WORKERS"]))
        fmt = negotiated()
        if fmt == JSON:
            return {**json_table(sweep.columns(), rows, len(sweep.cases)), "caution": CAUTION}
        if fmt == PARQUET:
            response = Response(parquet_bytes(sweep.columns(), rows, column_type),
                                mimetype=PARQUET)
            response.headers[CAUTION_HEADER] = CAUTION
            return response
        return _stream(sweep, rows, fmt)


def prepared_sweep(body) -> SweepInputs:
    """A loaded sweeps body as core inputs and cases, with the caller's materials and this
    app's case limit (shared with background jobs)."""
    return sweep_inputs(body, state().materials, int(current_app.config["SWEEP_MAX_CASES"]))


def _stream(sweep: Sweep, rows, fmt: str) -> Response:
    chunks = (
        csv_chunks(sweep.columns(), rows) if fmt == CSV else ndjson_chunks(sweep.columns(), rows)
    )
    response = Response(stream_with_context(chunks), mimetype=fmt)
    response.headers[CAUTION_HEADER] = CAUTION
    return response
