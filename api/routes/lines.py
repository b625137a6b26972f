"""POST /v1/lines/size, POST /v1/lines/check, GET /v1/lines/tubes and /v1/lines/fittings."""

from flask.views import MethodView
from flask_smorest import Blueprint

from api.output import reply
from heatlift.lines import query, tubes
from heatlift.lines.hydraulics import FITTING_TYPES
from schemas.common import QueryUnitSettingsSchema
from schemas.lines import (
    CheckReplySchema,
    CheckResultSchema,
    FittingTypesReplySchema,
    FittingTypesSchema,
    LineCheckRequestSchema,
    LineSizeRequestSchema,
    SizingReplySchema,
    SizingResultSchema,
    TubesQuerySchema,
    TubesReplySchema,
    TubesSchema,
)

ORDER = 50
blp = Blueprint("lines", __name__, url_prefix="/v1/lines",
                description="Suction, discharge and liquid line sizing")


@blp.route("/size")
class Size(MethodView):
    @blp.arguments(LineSizeRequestSchema())
    @blp.response(200, SizingReplySchema)
    def post(self, line_query):
        """Every catalogue size judged; the smallest that meets every limit recommended."""
        result = query.size_query(line_query)
        return reply(SizingResultSchema, result, rows_key="candidates", remarks=result.remarks)


@blp.route("/check")
class Check(MethodView):
    @blp.arguments(LineCheckRequestSchema())
    @blp.response(200, CheckReplySchema)
    def post(self, line_query):
        """The same figures for one given size (its catalogue label)."""
        result = query.check_query(line_query)
        return reply(CheckResultSchema, result, remarks=result.remarks)


@blp.route("/tubes")
class Tubes(MethodView):
    @blp.arguments(TubesQuerySchema(), location="query")
    @blp.response(200, TubesReplySchema)
    def get(self, args):
        """The tube catalogues: ASTM B280, EN 12735-1, ASME B36.10 (csv and select too)."""
        listing = tubes.listing(args.get("standard"), args.get("schedule"))
        return reply(TubesSchema, listing, rows_key="tubes")


@blp.route("/fittings")
class Fittings(MethodView):
    @blp.arguments(QueryUnitSettingsSchema(), location="query")
    @blp.response(200, FittingTypesReplySchema)
    def get(self, _args):
        """The fitting types a route may list, with the method behind each loss coefficient."""
        rows = {"fittings": [{"type": k, "description": v} for k, v in FITTING_TYPES.items()]}
        return reply(FittingTypesSchema, rows, rows_key="fittings")
