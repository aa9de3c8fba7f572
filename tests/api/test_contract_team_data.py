"""Schemathesis over the team-data operations with an API key (the service closed): the same
checks as tests/api/test_contract.py, on an app whose database has a key."""

import tempfile

import schemathesis
from hypothesis import HealthCheck, settings
from schemathesis.checks import not_a_server_error
from schemathesis.specs.openapi.checks import (
    content_type_conformance,
    response_schema_conformance,
    status_code_conformance,
)

from service import create_app
from service.storage import keys

CHECKS = [not_a_server_error, status_code_conformance, content_type_conformance,
          response_schema_conformance]

_app = create_app({"TESTING": True, "JOBS_WORKER": False,
                   "DATABASE_URL": f"sqlite:///{tempfile.mkdtemp(prefix='formwise-contract-')}"
                                   "/team.db"})
with _app.extensions["formwise_storage"].transaction() as _session:
    KEY = keys.create_key(_session, "contract")[1]

# The team-data operations; the material reads are covered by tests/api/test_contract.py.
schema = schemathesis.openapi.from_wsgi("/v1/openapi.json", _app).include(
    path_regex=r"^/v1/(materials|catalogs|studies|jobs)").exclude(
    path_regex=r"^/v1/materials", method="GET")

TEAM_EXAMPLES = 10
"""Fewer than MAX_EXAMPLES: each study or job request computes or expands a sweep."""


@schema.parametrize()
@settings(
    max_examples=TEAM_EXAMPLES,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much],
)
def test_team_data_operations_conform_with_a_key(case):
    # bodies as they are: the test client does not unzip (see test_contract.IDENTITY)
    case.call_and_validate(headers={"Authorization": f"Bearer {KEY}",
                                    "Accept-Encoding": "identity"}, checks=CHECKS)
