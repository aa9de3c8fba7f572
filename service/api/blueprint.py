"""The blueprint every resource uses: flask-smorest's, with a JSON body parser that answers a
body nested too deeply to parse (recursion) with 400 like any other unreadable JSON."""

from __future__ import annotations

import json

import flask_smorest
from webargs.flaskparser import FlaskParser


class BodyParser(FlaskParser):
    def _raw_load_json(self, req):
        try:
            return super()._raw_load_json(req)
        except RecursionError:
            self._handle_invalid_json_error(
                json.JSONDecodeError("nested too deeply", "", 0), req)


class Blueprint(flask_smorest.Blueprint):
    ARGUMENTS_PARSER = BodyParser()
