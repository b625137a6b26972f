"""GET|POST /v1/saturation and GET /v1/saturation/table."""

from flask import current_app
from flask.views import MethodView
from flask_smorest import Blueprint

from api.batch import many_rows
from api.output import reply
from heatlift import saturation
from schemas.saturation import (
    SaturationBodySchema,
    SaturationQuerySchema,
    SaturationReplySchema,
    SaturationSchema,
    SaturationTableQuerySchema,
    SaturationTableReplySchema,
    SaturationTableSchema,
)

ORDER = 20
blp = Blueprint("saturation", __name__, url_prefix="/v1/saturation",
                description="Bubble and dew points, glide, latent heat")


def _lookup(args: dict):
    if "temperature" in args:
        return saturation.at_temperature(args["refrigerant"], args["temperature"])
    return saturation.at_pressure(args["refrigerant"], args["pressure"])


@blp.route("")
class Saturation(MethodView):
    @blp.arguments(SaturationQuerySchema(), location="query")
    @blp.response(200, SaturationReplySchema)
    def get(self, args):
        """Saturation by temperature or by pressure (query parameters; csv and select too)."""
        return reply(SaturationSchema, _lookup(args))

    @blp.arguments(SaturationBodySchema())
    @blp.response(200, SaturationReplySchema)
    def post(self, args):
        """Saturation by temperature or by pressure (JSON body)."""
        return reply(SaturationSchema, _lookup(args))


@blp.route("/table")
class Table(MethodView):
    @blp.arguments(SaturationTableQuerySchema(), location="query")
    @blp.response(200, SaturationTableReplySchema)
    @many_rows
    def get(self, args):
        """Saturation rows over a range of temperatures (or pressures with by=pressure)."""
        result = saturation.table(args["refrigerant"], args["by"], args["start"], args["stop"],
                                  args["step"], current_app.config["HEATLIFT_MAX_TABLE_POINTS"])
        return reply(SaturationTableSchema, result, rows_key="rows")
