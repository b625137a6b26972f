"""POST /v1/charge: refrigerant charge, CO2-equivalent and the room's charge limit."""

from flask.views import MethodView
from flask_smorest import Blueprint

from api.output import reply
from heatlift import charge
from schemas.charge import ChargeReplySchema, ChargeRequestSchema, ChargeResultSchema

ORDER = 60
blp = Blueprint("charge", __name__, url_prefix="/v1/charge",
                description="Refrigerant charge, CO2-equivalent, charge limit of the room")


@blp.route("")
class Charge(MethodView):
    @blp.arguments(ChargeRequestSchema())
    @blp.response(200, ChargeReplySchema)
    def post(self, spec: charge.ChargeSpec):
        """Charge of lines, heat exchangers and vessels; CO2-equivalent; allowed charge."""
        result = charge.estimate(spec)
        return reply(ChargeResultSchema, result, remarks=result.remarks)
