"""Cross-origin requests from browser tools, for the origins listed in HEATLIFT_CORS_ORIGINS."""

from __future__ import annotations

from flask import Flask, Response, current_app, request

ALLOWED_HEADERS = "Authorization, Content-Type, X-API-Key, X-Request-ID"


def _allowed(origin: str | None) -> bool:
    origins = current_app.config.get("HEATLIFT_CORS_ORIGINS") or []
    return origin is not None and (origin in origins or "*" in origins)


def preflight() -> Response | None:
    if request.method == "OPTIONS" and request.headers.get("Access-Control-Request-Method"):
        response = Response(status=204)
        if _allowed(request.headers.get("Origin")):
            response.headers["Access-Control-Allow-Methods"] = "GET, POST, OPTIONS"
            response.headers["Access-Control-Allow-Headers"] = ALLOWED_HEADERS
            response.headers["Access-Control-Max-Age"] = "600"
        return add_headers(response)
    return None


def add_headers(response: Response) -> Response:
    origin = request.headers.get("Origin")
    if _allowed(origin):
        response.headers["Access-Control-Allow-Origin"] = origin or ""
        response.headers["Access-Control-Expose-Headers"] = "X-Request-ID"
        response.headers["Vary"] = "Origin"
    return response


def register(app: Flask) -> None:
    app.before_request(preflight)
    app.after_request(add_headers)
