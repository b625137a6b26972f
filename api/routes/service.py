"""Health, readiness and version."""

from flask import Response
from flask.views import MethodView
from flask_smorest import Blueprint

import heatlift
from api.encoding import to_json
from heatlift.properties import LIBRARY_VERSION
from heatlift.warmup import is_warm

ORDER = 0
blp = Blueprint("service", __name__, url_prefix="/v1", description="Service status")


def _plain(body: dict, status: int = 200) -> Response:
    return Response(to_json(body), status=status, mimetype="application/json")


def _documented(description: str, **properties: str) -> dict:
    """OpenAPI responses of a small JSON answer whose fields are all strings."""
    schema = {"type": "object", "properties": {k: {"type": "string", "description": v}
                                               for k, v in properties.items()}}
    return {"200": {"description": description,
                    "content": {"application/json": {"schema": schema}}}}


@blp.route("/health")
class Health(MethodView):
    @blp.doc(responses=_documented("the process answers", status="ok"))
    def get(self):
        """Liveness: the process answers."""
        return _plain({"status": "ok"})


@blp.route("/ready")
class Ready(MethodView):
    @blp.doc(responses={**_documented("ready to serve", status="ready"),
                        "503": {"description": "still loading the property library"}})
    def get(self):
        """Readiness: the property library is loaded and every catalogue fluid is warm."""
        if not is_warm():
            return _plain({"status": "warming up"}, 503)
        return _plain({"status": "ready"})


@blp.route("/version")
class Version(MethodView):
    @blp.doc(responses=_documented("versions", engine="heatlift <version>",
                                   property_library="CoolProp <version> (<git revision>)",
                                   api="v1"))
    def get(self):
        """Engine and property-library versions."""
        return _plain({"engine": f"heatlift {heatlift.__version__}",
                       "property_library": LIBRARY_VERSION, "api": "v1"})
