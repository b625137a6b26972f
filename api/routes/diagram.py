"""POST /v1/cycle/diagram: the solved cycle on a pressure-enthalpy chart, SVG or PNG."""

from flask import request
from flask.views import MethodView
from flask_smorest import Blueprint

from api import diagram
from heatlift import cycle
from schemas.diagram import DiagramQuerySchema, DiagramRequestSchema

ORDER = 41
blp = Blueprint("cycle_diagram", __name__, url_prefix="/v1/cycle",
                description="The solved cycle drawn on a pressure-enthalpy chart")

_IMAGE = {"type": "string", "format": "binary"}
_CHART = ("the chart: image/svg+xml by default, image/png when the Accept header prefers it "
          "or with format=png")


@blp.route("/diagram")
class Diagram(MethodView):
    @blp.arguments(DiagramQuerySchema(), location="query")
    @blp.arguments(DiagramRequestSchema())
    @blp.response(200, _IMAGE, content_type="image/svg+xml", description=_CHART)
    @blp.alt_response(200, schema=_IMAGE, content_type="image/png", success=True,
                      description=_CHART)
    def post(self, query, args):
        """Solve a cycle (the body of POST /v1/cycle, plus chart options) and draw it."""
        fmt = diagram.media_type(query.get("format"), request.accept_mimetypes)
        return diagram.respond(cycle.solve(args["spec"]), args, fmt)
