"""GET /v1/health: liveness and what the service has loaded."""

from flask.views import MethodView

from service import __version__
from service.api.blueprint import Blueprint
from service.api.context import state
from service.api.health.schemas import HealthSchema

blp = Blueprint("health", __name__, url_prefix="/v1/health", description="Service health")


@blp.route("")
class Health(MethodView):
    @blp.response(200, HealthSchema)
    def get(self):
        """Report that the service is up, with its version and data counts."""
        current = state()
        return {
            "status": "ok",
            "version": __version__,
            "materials": len(current.materials),
            "section_families": len(current.families),
        }
