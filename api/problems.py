"""RFC 9457 problem details for every error the service returns.

The engine raises :class:`heatlift.errors.HeatliftError` with SI values; here they are written in
the caller's units. Property-library messages and stack traces never reach the caller.
"""

from __future__ import annotations

import logging
from typing import Any

from flask import Flask, Response
from marshmallow import ValidationError
from werkzeug.exceptions import HTTPException

from api.encoding import to_json
from api.metrics import count_failure
from heatlift.errors import HeatliftError, SIValue
from schemas.fields import current_units

log = logging.getLogger("heatlift.api")

PROBLEM_TYPES = "https://heatlift.invalid/problems/"


def problem(
    status: int,
    title: str,
    detail: str,
    errors: dict[str, Any] | None = None,
    slug: str | None = None,
    extra: dict[str, Any] | None = None,
) -> Response:
    body: dict[str, Any] = {
        "type": PROBLEM_TYPES + (slug or title.lower().replace(" ", "-")),
        "title": title,
        "status": status,
        "detail": detail,
    }
    if errors:
        body["errors"] = errors
    if extra:
        body.update(extra)
    response = Response(to_json(body), status=status, mimetype="application/problem+json")
    return response


def _in_caller_units(value: SIValue) -> str:
    return current_units().text(value.value, value.kind)


def from_engine(error: HeatliftError) -> Response:
    detail = error.render(_in_caller_units)
    errors = {error.field: [detail]} if error.field else None
    extra = None
    if hasattr(error, "suggestions"):
        extra = {"suggestions": error.suggestions}
    slug = type(error).__name__.lower()
    if error.status == 422:  # a calculation the engine refused (not an unknown name: 404)
        count_failure(slug)
    return problem(error.status, error.title, detail, errors, slug, extra)


def _flatten(messages: Any, prefix: str = "") -> dict[str, list[str]]:
    """webargs/marshmallow messages -> {"dotted.field.path": [messages]}."""
    out: dict[str, list[str]] = {}
    if isinstance(messages, dict):
        for key, value in messages.items():
            if key in ("json", "query", "form", "files", "headers", "cookies", "view_args"):
                out.update(_flatten(value, prefix))
                continue
            path = f"{prefix}.{key}" if prefix else str(key)
            out.update(_flatten(value, path))
    elif isinstance(messages, list) and all(isinstance(m, str) for m in messages):
        out[prefix or "_body"] = list(messages)
    elif isinstance(messages, list):
        for i, item in enumerate(messages):
            out.update(_flatten(item, f"{prefix}.{i}" if prefix else str(i)))
    else:
        out[prefix or "_body"] = [str(messages)]
    return out


def _validation_detail(errors: dict[str, list[str]]) -> str:
    parts = [f"{path}: {' '.join(msgs)}" for path, msgs in errors.items()]
    return "The request could not be used. " + "; ".join(parts)


def _http(error: HTTPException) -> Response:
    status = error.code or 500
    data = getattr(error, "data", None) or {}
    messages = data.get("messages") or data.get("errors")
    if status == 422 and messages:
        errors = _flatten(messages)
        return problem(422, "Invalid request", _validation_detail(errors), errors, "validation")
    detail = data.get("message") or error.description or error.name
    if status == 404 and not data:
        detail = "No such endpoint. GET /openapi.json lists every path; /docs describes them."
    if status == 405:
        detail = f"{error.description} Allowed: {', '.join(error.valid_methods or [])}." \
            if hasattr(error, "valid_methods") else detail
    return problem(status, error.name, str(detail), slug=error.name.lower().replace(" ", "-"))


def _unexpected(error: Exception) -> Response:
    log.exception("unhandled error")
    return problem(
        500,
        "Internal error",
        "The service failed on this request; this is a defect. Please report the X-Request-ID.",
        slug="internal",
    )


def _validation(error: ValidationError) -> Response:
    errors = _flatten(error.messages)
    return problem(422, "Invalid request", _validation_detail(errors), errors, "validation")


def register(app: Flask) -> None:
    app.register_error_handler(ValidationError, _validation)
    app.register_error_handler(HeatliftError, from_engine)
    app.register_error_handler(HTTPException, _http)
    app.register_error_handler(Exception, _unexpected)
