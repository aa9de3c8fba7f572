"""POST /v1/charts/{properties,designs,sweeps,section}: pictures as SVG (default) or PNG.

The format is the request's ``format`` field, else the best of SVG and PNG the Accept header
allows (SVG when it allows both or is absent); an Accept header that allows neither is
answered 406 before the body is read. Every chart carries the caution in its footnote, and
the full caution travels in the ``Formwise-Caution`` header.
"""

from __future__ import annotations

import dataclasses

from flask import Response, current_app, request
from flask.views import MethodView
from werkzeug.exceptions import NotAcceptable

from service.api.blueprint import Blueprint, negotiated, produces
from service.api.charts.schemas import (
    DesignChartSchema,
    PropertyChartSchema,
    SectionChartSchema,
    SweepChartSchema,
)
from service.api.context import state
from service.api.materials.schemas import select_materials, with_custom_materials
from service.charts import designs as design_chart
from service.charts import properties as property_chart
from service.charts import section as section_chart
from service.charts import sweeps as sweep_chart
from service.charts.quantities import product_text, symbol
from service.charts.render import FORMATS, PNG, SVG, draw
from service.core import CAUTION
from service.core.errors import InputError
from service.core.indices import material_index
from service.core.sizing.engine import closest_first
from service.usecases import answer, design_inputs

blp = Blueprint("charts", __name__, url_prefix="/v1/charts",
                description="Charts and drawings as SVG or PNG")

CAUTION_HEADER = "Formwise-Caution"
_IMAGE_RESPONSES = {
    "200": {
        "description": "The chart: SVG unless the format field or the Accept header asks "
                       "for PNG",
        "content": {SVG: {"schema": {"type": "string"}},
                    PNG: {"schema": {"type": "string", "format": "binary"}}},
    },
}


def _image(body: dict, build, *args) -> Response:
    """Draw the chart in the format the body names, else the best the Accept header allows.

    The blueprint has already answered 406 to an Accept that takes neither image type; here a
    ``format`` the Accept header refuses is one too.
    """
    if "format" not in body:
        media_type = negotiated()
    elif request.headers.get("Accept") and not request.accept_mimetypes.best_match(
            [FORMATS[body["format"]]]):
        raise NotAcceptable(f"format {body['format']} is not allowed by the Accept header")
    else:
        media_type = FORMATS[body["format"]]
    response = Response(draw(build, media_type, *args), mimetype=media_type)
    response.headers[CAUTION_HEADER] = CAUTION
    return response


def _doc(view):
    view = blp.alt_response(406, description="Accept takes neither image/svg+xml nor "
                                             "image/png")(view)
    return blp.doc(responses=_IMAGE_RESPONSES)(blp.response(200)(view))


@blp.route("/properties")
class PropertyChart(MethodView):
    @produces(SVG, PNG)
    @blp.arguments(PropertyChartSchema)
    @_doc
    def post(self, body):
        """Material property chart: two property quantities on log-log axes.

        Every material is a point at its value with a cross spanning its low-high range in
        both directions; the highlighted ones in colour (a colour and marker per material
        class), the rest faded. With a ``guide``, the line of equal index through one
        material, its slope in the legend.
        """
        table = with_custom_materials(state().materials, body.get("custom_materials"))
        chosen = None
        if "highlight" in body:
            chosen = select_materials(table, body["highlight"], field="highlight").ids
        guide = _guide(body.get("guide"))
        x, y = body.get("x"), body.get("y")
        if x is None:
            x, y = (property_chart.natural_axes(guide.exponents) if guide is not None
                    else ({"density": 1.0}, {"youngs_modulus": 1.0}))
        chart = property_chart.PropertyChart(
            x=x, y=y, chosen=chosen, guide=guide, top=body.get("top"), labels=body["labels"],
            series=body["series"], basis=body["property_basis"],
            x_limits=body.get("x_limits"), y_limits=body.get("y_limits"),
            width=body["width"], height=body["height"], title=body.get("title"),
        )
        return _image(body, property_chart.build, table, chart)


def _guide(guide: dict | None) -> property_chart.Guide | None:
    if guide is None:
        return None
    if "exponents" in guide:
        exponents = guide["exponents"]
    else:
        exponents = dict(material_index(guide["loading"], guide["limit"],
                                        guide["objective"]).exponents)
    description = product_text(exponents, {name: symbol(name) for name in exponents})
    return property_chart.Guide(exponents, description, guide.get("through"))


@blp.route("/designs")
class DesignChart(MethodView):
    @produces(SVG, PNG)
    @blp.arguments(DesignChartSchema)
    @_doc
    def post(self, body):
        """Design trade-off: the designs of a /v1/designs request, mass against cost or
        carbon, with the Pareto front over every feasible design, each point labelled by
        rank, material and section."""
        versus = body["versus"]
        try:
            inputs = design_inputs(body["request"], state().materials)
            found = answer(dataclasses.replace(inputs, pareto=("mass", versus)),
                           int(current_app.config["DESIGN_WORKERS"]))
        except InputError as error:
            raise error.prefixed("request") from None
        names = inputs.materials.names
        ranks = {id(d): rank for rank, d in enumerate(found.result.designs, start=1)}

        def point(design, rank: int) -> design_chart.TradeOffPoint:
            return design_chart.TradeOffPoint(rank, names[design.material_index],
                                              design.family, design.mass,
                                              design.objective_value(versus))

        points = [point(d, ranks[id(d)]) for d in found.result.designs]
        front = [point(d, ranks.get(id(d), 0)) for d in found.pareto or ()]
        reasons = closest_first(found.result.rejected, 1)
        chart = design_chart.TradeOffChart(
            points=points, front=front, versus=versus,
            basis=inputs.request.property_basis,
            empty_reason=f"{reasons[0].material_id} {reasons[0].family}: {reasons[0].reason}"
            if reasons and not points else "",
            width=body["width"], height=body["height"], title=body.get("title"),
        )
        return _image(body, design_chart.build, chart)


@blp.route("/sweeps")
class SweepChart(MethodView):
    @produces(SVG, PNG)
    @blp.arguments(SweepChartSchema)
    @_doc
    def post(self, body):
        """Sweep chart: the best design's mass (or cost, carbon, a dimension) against one
        varied input of a /v1/sweeps request, a line per section family or material."""
        sweep = body["request"]
        try:
            inputs = design_inputs(sweep["base"], state().materials)
        except InputError as error:
            raise error.prefixed("request.base") from None
        chart = sweep_chart.SweepChart(
            base=inputs.request, materials=inputs.materials, cores=inputs.cores,
            grid=sweep.get("grid"), cases=sweep.get("cases"), x=body.get("x"), y=body["y"],
            series=body["series"], x_scale=body["x_scale"], y_scale=body["y_scale"],
            max_cases=int(current_app.config["SWEEP_MAX_CASES"]),
            width=body["width"], height=body["height"], title=body.get("title"),
        )
        return _image(body, sweep_chart.build, chart)


@blp.route("/section")
class SectionDrawing(MethodView):
    @produces(SVG, PNG)
    @blp.arguments(SectionChartSchema)
    @_doc
    def post(self, body):
        """Section drawing: one cross-section to scale, dimensioned in millimetres, with the
        plane of bending marked; sized for a side panel (420 x 420 px by default)."""
        family = state().families[body["family"]]
        drawing = section_chart.SectionDrawing(
            family=family.id,
            dimensions={name: body["dimensions"][name] for name in family.dimension_names},
            caption=body["caption"],
            basis=body.get("property_basis", ""),
            width=body["width"], height=body["height"], title=body.get("title"),
        )
        return _image(body, section_chart.build, drawing)
