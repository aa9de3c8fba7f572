"""/v1/studies: stored requests with their results, the versions of their inputs and the
service version; re-run to see what changed."""

from __future__ import annotations

from flask.views import MethodView

from service.api.blueprint import Blueprint
from service.api.studies.compute import (
    MAX_DIFFERENCES,
    compute,
    differences,
    input_changes,
    inputs,
)
from service.api.studies.schemas import (
    NewStudySchema,
    RerunSchema,
    StudyListQuerySchema,
    StudyListSchema,
    StudySchema,
)
from service.api.teamdata import caller, storage, team_object
from service.storage import studies
from service.storage.models import Study

blp = Blueprint("studies", __name__, url_prefix="/v1/studies",
                description="Stored requests with their results")


def _stored(kind: str, body: dict, rerun_of: str | None = None) -> Study:
    result = compute(kind, body)
    used = inputs()
    with storage().transaction() as session:
        return studies.add(session, caller().team_id, kind, body, result, used, used["service"],
                           rerun_of)


@blp.route("")
class Studies(MethodView):
    @blp.arguments(StudyListQuerySchema, location="query")
    @blp.response(200, StudyListSchema)
    def get(self, query):
        """The team's studies, newest first (without their results)."""
        with storage().transaction() as session:
            found = studies.listing(session, caller().team_id, query.get("kind"))
        return {"count": len(found), "studies": found}

    @blp.arguments(NewStudySchema)
    @blp.response(201, StudySchema, headers={
        "Location": {"description": "the new study", "schema": {"type": "string"}}})
    def post(self, body):
        """Compute a designs, rankings or sweeps request and store it with its result.

        The request is answered exactly as its endpoint answers it (errors at
        ``request.<path>``); the study records the versions of the team's materials and
        catalogues, of the built-in data and of the service.
        """
        study = _stored(body["kind"], body["request"])
        return study, 201, {"Location": f"/v1/studies/{study.id}"}


@blp.route("/<string:study_id>")
class StudyById(MethodView):
    @blp.response(200, StudySchema)
    @blp.alt_response(404, response="NOT_FOUND")
    def get(self, study_id):
        """One study with its request and result."""
        return team_object(studies.get, "study", study_id)

    @blp.response(204)
    @blp.alt_response(404, response="NOT_FOUND")
    def delete(self, study_id):
        """Delete a study."""
        team_object(studies.remove, "study", study_id)


@blp.route("/<string:study_id>/rerun")
class StudyRerun(MethodView):
    @blp.response(201, RerunSchema, headers={
        "Location": {"description": "the new study", "schema": {"type": "string"}}})
    @blp.alt_response(404, response="NOT_FOUND")
    def post(self, study_id):
        """Compute a study's request again with today's data; store it as a new study and
        say which inputs and which parts of the result changed."""
        old = team_object(studies.get, "study", study_id)
        new = _stored(old.kind, old.request, rerun_of=old.id)
        found = list(differences(old.result, new.result))
        return {
            "study": new,
            "changed_inputs": input_changes(old.inputs, new.inputs),
            "result_changed": bool(found),
            "difference_count": len(found),
            "differences": found[:MAX_DIFFERENCES],
        }, {"Location": f"/v1/studies/{new.id}"}
