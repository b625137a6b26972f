"""GET /v1/refrigerants and /v1/refrigerants/{designation}: the catalogue."""

from flask.views import MethodView
from flask_smorest import Blueprint

from api.output import reply
from heatlift.describe import describe, describe_all
from schemas.common import QueryUnitSettingsSchema
from schemas.refrigerants import RefrigerantListSchema, RefrigerantReplySchema, RefrigerantSchema

ORDER = 10
blp = Blueprint("refrigerants", __name__, url_prefix="/v1/refrigerants",
                description="The refrigerant catalogue")
_EVERY = RefrigerantSchema(many=True)  # shared, as reply() shares the instances of classes


@blp.route("")
class Catalogue(MethodView):
    @blp.arguments(QueryUnitSettingsSchema(), location="query")
    @blp.response(200, RefrigerantListSchema)
    def get(self, _args):
        """Every refrigerant: kind, composition, safety class, GWP100, critical point."""
        return reply(_EVERY, describe_all(), wrap="refrigerants")


@blp.route("/<designation>")
class Entry(MethodView):
    @blp.arguments(QueryUnitSettingsSchema(), location="query")
    @blp.response(200, RefrigerantReplySchema)
    def get(self, _args, designation: str):
        """One refrigerant by its ISO 817 / ASHRAE 34 designation."""
        return reply(RefrigerantSchema, describe(designation))
