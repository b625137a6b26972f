"""API keys: off unless configured; then every /v1 endpoint but health and readiness needs one.

A key is sent as ``Authorization: Bearer <key>`` or ``X-API-Key: <key>``. Keys are compared in
constant time (``hmac.compare_digest`` against every configured key, so that neither the
comparison nor the number of keys tried leaks by timing), and never logged.
"""

from __future__ import annotations

import hmac

from flask import Response, current_app, request

from api.problems import problem

OPEN_PATHS = frozenset({"/v1/health", "/v1/ready"})


def _presented() -> str | None:
    header = request.headers.get("Authorization", "")
    if header[:7].lower() == "bearer ":
        return header[7:].strip()
    return request.headers.get("X-API-Key")


def _matches(candidate: str, keys: frozenset[str]) -> bool:
    given = candidate.encode("utf-8", "surrogateescape")
    found = False
    for key in keys:
        found |= hmac.compare_digest(given, key.encode("utf-8"))
    return found


def check_key() -> Response | None:
    keys: frozenset[str] = current_app.config.get("HEATLIFT_API_KEYS") or frozenset()
    if not keys or not request.path.startswith("/v1/") or request.path in OPEN_PATHS:
        return None
    if request.method == "OPTIONS":
        return None
    candidate = _presented()
    if candidate is None or not _matches(candidate, keys):
        response = problem(
            401, "Unauthorized",
            "This service needs an API key: send 'Authorization: Bearer <key>' or "
            "'X-API-Key: <key>'." if candidate is None else "The API key is not valid.",
            slug="unauthorized",
        )
        response.headers["WWW-Authenticate"] = 'Bearer realm="heatlift"'
        return response
    return None
