"""The heatlift web application: Flask app factory, one blueprint per domain.

No physics lives here: routes load a request schema, call the engine and write the result.
"""

from __future__ import annotations

import http
from typing import Any

from flask import Flask
from flask_smorest import Api
from flask_smorest.utils import prepare_response

import heatlift
from api import access_log, context, cors, limits, metrics, problems, settings
from heatlift.warmup import warm_up, warm_up_in_background
from schemas.common import ProblemSchema
from schemas.fields import Quantity

DEFAULTS: dict[str, Any] = {
    "API_TITLE": "heatlift",
    "API_VERSION": "v1",
    "OPENAPI_VERSION": "3.1.0",
    "OPENAPI_URL_PREFIX": "/",
    "OPENAPI_JSON_PATH": "openapi.json",
    "MAX_CONTENT_LENGTH": 10 * 1024 * 1024,
    "HEATLIFT_MAX_TABLE_POINTS": 500,
    "HEATLIFT_MAX_SWEEP_POINTS": 200,
    "API_SPEC_OPTIONS": {
        "info": {
            "description": "Refrigeration and heat-pump calculations, each quantity with its unit.",
            "version": heatlift.__version__,
        },
    },
}


class HeatliftApi(Api):
    ERROR_SCHEMA = ProblemSchema
    DEFAULT_ERROR_RESPONSE_NAME = "DEFAULT_ERROR"

    def _register_responses(self) -> None:  # type: ignore[override]
        """Error responses are documented as application/problem+json, as they are sent."""
        for status in http.HTTPStatus:
            response: dict[str, Any] = {"description": status.phrase}
            if not (100 <= status < 200) and status not in (204, 304):
                response["schema"] = self.ERROR_SCHEMA
            prepare_response(response, self.spec, "application/problem+json")
            self.spec.components.response(status.name, response, lazy=True)
        default = {"description": "Default error response", "schema": self.ERROR_SCHEMA}
        prepare_response(default, self.spec, "application/problem+json")
        self.spec.components.response("DEFAULT_ERROR", default, lazy=True)


def _quantity_property(self: Any, field: Any, **_: Any) -> dict[str, Any]:
    if not isinstance(field, Quantity):
        return {}
    nullable = [{"type": "null"}] if field.allow_none else []
    return {
        "oneOf": [
            *nullable,
            {"type": "number"},
            {"type": "string", "examples": ["45 psig", "7 degC"]},
            {
                "type": "object",
                "properties": {"value": {"type": ["number", "null"]}, "unit": {"type": "string"}},
                "required": ["value"],
            },
        ],
        "x-quantity-kind": field.kind,
    }


def create_app(config: dict[str, Any] | None = None) -> Flask:
    """Build the application; ``config`` overrides :data:`DEFAULTS`."""
    from api.routes import ROUTES

    app = Flask("heatlift", static_folder=None)
    app.config.update(DEFAULTS)
    app.config.update(settings.from_environment())
    app.config.update(config or {})
    access_log.register(app)
    cors.register(app)
    context.register(app)
    limits.register(app)
    metrics.register(app)
    api = HeatliftApi(app)
    api.ma_plugin.converter.add_attribute_function(_quantity_property)  # type: ignore[union-attr]
    for blueprint in ROUTES:
        api.register_blueprint(blueprint)
    problems.register(app)
    warm = app.config.get("HEATLIFT_WARM_UP", True)
    if warm == "now":
        warm_up()
    elif warm:
        warm_up_in_background()
    return app
