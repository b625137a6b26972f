"""POST /v1/state: a state from two properties, with superheat or subcooling."""

from flask.views import MethodView
from flask_smorest import Blueprint

from api.output import reply
from heatlift import state
from schemas.state import STATE_INPUTS, StateReplySchema, StateReportSchema, StateRequestSchema

ORDER = 30
blp = Blueprint("state", __name__, url_prefix="/v1/state",
                description="A refrigerant state from two properties")


@blp.route("")
class State(MethodView):
    @blp.arguments(StateRequestSchema())
    @blp.response(200, StateReplySchema)
    def post(self, args):
        """State, phase and superheat or subcooling at its pressure."""
        given = {k: args[k] for k in STATE_INPUTS if k in args}
        return reply(StateReportSchema, state.evaluate(args["refrigerant"], **given))
