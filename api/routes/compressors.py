"""POST /v1/compressors/polynomial: a 10-coefficient polynomial, rated and corrected."""

from flask.views import MethodView
from flask_smorest import Blueprint

from api.output import reply
from heatlift.compressor import evaluate_polynomial
from schemas.compressors import (
    PolynomialReplySchema,
    PolynomialRequestSchema,
    PolynomialResultSchema,
)

ORDER = 70
blp = Blueprint("compressors", __name__, url_prefix="/v1/compressors",
                description="Compressor polynomials of AHRI 540 / EN 12900")


@blp.route("/polynomial")
class Polynomial(MethodView):
    @blp.arguments(PolynomialRequestSchema())
    @blp.response(200, PolynomialReplySchema)
    def post(self, args):
        """Evaluate a compressor polynomial set; correct it to the actual superheat, subcooling."""
        result = evaluate_polynomial(args["spec"], args["evaporating_temperature"],
                                     args["condensing_temperature"], args.get("superheat"),
                                     args.get("subcooling"))
        return reply(PolynomialResultSchema, result, remarks=result.remarks)
