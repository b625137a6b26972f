"""Health, readiness and version."""

from flask import Response, json
from flask.views import MethodView
from flask_smorest import Blueprint

import heatlift
from heatlift.properties import LIBRARY_VERSION
from heatlift.warmup import is_warm

ORDER = 0
blp = Blueprint("service", __name__, url_prefix="/v1", description="Service status")


def _plain(body: dict, status: int = 200) -> Response:
    return Response(json.dumps(body), status=status, mimetype="application/json")


@blp.route("/health")
class Health(MethodView):
    def get(self):
        """Liveness: the process answers."""
        return _plain({"status": "ok"})


@blp.route("/ready")
class Ready(MethodView):
    def get(self):
        """Readiness: the property library is loaded and every catalogue fluid is warm."""
        if not is_warm():
            return _plain({"status": "warming up"}, 503)
        return _plain({"status": "ready"})


@blp.route("/version")
class Version(MethodView):
    def get(self):
        """Engine and property-library versions."""
        return _plain({"engine": f"heatlift {heatlift.__version__}",
                       "property_library": LIBRARY_VERSION, "api": "v1"})
