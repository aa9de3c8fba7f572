"""GET /v1/health as in the contract."""

from service import __version__
from service.core.sections import FAMILIES


def test_health_reports_counts(client, app):
    response = client.get("/v1/health")
    assert response.status_code == 200
    body = response.get_json()
    assert body == {
        "status": "ok",
        "version": __version__,
        "materials": len(app.extensions["formwise"].materials),
        "section_families": len(FAMILIES),
    }
    assert body["materials"] >= 60
    assert body["section_families"] == 6
