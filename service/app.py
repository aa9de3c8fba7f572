"""The application factory: configuration, extensions, data, blueprints, error handlers."""

from __future__ import annotations

import logging
import re
import uuid
from collections.abc import Mapping

from flask import Flask, Response, g, request

from service.api.compression import gzip_response
from service.api.context import FormwiseState
from service.api.errors import ProblemApi, register_error_handlers
from service.api.fields import Quantity, quantity2properties
from service.api.teams import init_team_data
from service.config import load_config
from service.explorer import blp as explorer

_REQUEST_ID = re.compile(r"^[A-Za-z0-9._-]{1,64}$")


def create_app(config: Mapping[str, object] | None = None) -> Flask:
    """Build the Formwise Flask application.

    Args:
        config: settings that override the defaults and FORMWISE_* environment variables
            (see :mod:`service.config`).
    """
    app = Flask("service")
    app.config.from_mapping(load_config(config))
    logging.getLogger("service").setLevel(str(app.config["LOG_LEVEL"]).upper())

    app.extensions["formwise"] = FormwiseState.load(app.config)

    api = ProblemApi(app)
    api.register_field(Quantity, None, None)
    api.ma_plugin.converter.add_attribute_function(quantity2properties)
    register_blueprints(api)
    app.register_blueprint(explorer)

    register_error_handlers(app)
    app.before_request(_assign_request_id)
    app.after_request(_echo_request_id)
    app.after_request(gzip_response)
    init_team_data(app)
    return app


def register_blueprints(api: ProblemApi) -> None:
    """One blueprint per resource, in the order the OpenAPI document lists them."""
    from service.api.catalogs.routes import blp as catalogs
    from service.api.charts.routes import blp as charts
    from service.api.designs.routes import blp as designs
    from service.api.health.routes import blp as health
    from service.api.jobs.routes import blp as jobs
    from service.api.materials.routes import blp as materials
    from service.api.materials.team import blp as team_materials
    from service.api.rankings.routes import blp as rankings
    from service.api.sections.routes import blp as sections
    from service.api.studies.routes import blp as studies
    from service.api.sweeps.routes import blp as sweeps

    for blueprint in (health, materials, sections, rankings, designs, sweeps, team_materials,
                      catalogs, studies, jobs, charts):
        api.register_blueprint(blueprint)


def _assign_request_id() -> None:
    incoming = request.headers.get("X-Request-Id", "")
    g.request_id = incoming if _REQUEST_ID.match(incoming) else uuid.uuid4().hex


def _echo_request_id(response: Response) -> Response:
    response.headers["X-Request-Id"] = g.get("request_id", "")
    return response
