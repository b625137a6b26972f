"""POST|GET /v1/cycle and POST /v1/cycle/sweep."""

from flask import current_app
from flask.views import MethodView
from flask_smorest import Blueprint

from api.output import reply
from api.sweep import run_sweep
from heatlift import cycle
from schemas.cycle import CycleQuerySchema, CycleReplySchema, CycleRequestSchema, CycleResultSchema
from schemas.sweep import SweepReplySchema, SweepRequestSchema, SweepResultSchema, sweep_values

ORDER = 40
blp = Blueprint("cycle", __name__, url_prefix="/v1/cycle",
                description="Vapour-compression cycles")


def _solved(spec: cycle.CycleSpec):
    result = cycle.solve(spec)
    return reply(CycleResultSchema, result, remarks=result.remarks)


@blp.route("")
class Cycle(MethodView):
    @blp.arguments(CycleRequestSchema())
    @blp.response(200, CycleReplySchema)
    def post(self, spec):
        """Solve a single-stage, economised, two-stage or transcritical circuit."""
        return _solved(spec)

    @blp.arguments(CycleQuerySchema(), location="query")
    @blp.response(200, CycleReplySchema)
    def get(self, args):
        """The single-stage cycle from flat query parameters (csv and select for spreadsheets)."""
        return _solved(args["spec"])


@blp.route("/sweep")
class Sweep(MethodView):
    @blp.arguments(SweepRequestSchema())
    @blp.response(200, SweepReplySchema)
    def post(self, args):
        """One input of a cycle varied over a range: one row of results per value."""
        values = sweep_values(args, current_app.config["HEATLIFT_MAX_SWEEP_POINTS"])
        result = run_sweep(args, args["vary"], values)
        return reply(SweepResultSchema, result, rows_key="rows")
