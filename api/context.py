"""Per-request context: request id, timing, the caller's unit system, and warnings.

The unit system (``units``, ``unit_overrides``, ``atmospheric_pressure``) is read from the query
string and the JSON body before the request schema is loaded, so that every Quantity field of
the request is read, and every field of the response written, in the caller's units.
"""

from __future__ import annotations

import re
import time
import uuid
from typing import Any

from flask import Flask, Response, current_app, g, request
from flask.json.provider import DefaultJSONProvider
from marshmallow import ValidationError
from werkzeug.exceptions import BadRequest, UnprocessableEntity, UnsupportedMediaType

from api.auth import check_key
from heatlift.errors import Remark
from schemas.fields import Quantity, _current
from schemas.units import STANDARD_ATMOSPHERE, SYSTEMS, UnitContext, UnitError, check_override

_REQUEST_ID = re.compile(r"^[A-Za-z0-9._:\-]{1,128}$")


def _reject_constant(name: str) -> float:
    raise ValueError(f"{name} is not valid JSON; send finite numbers only")


class StrictJSONProvider(DefaultJSONProvider):
    """JSON without the NaN/Infinity extensions; keys kept in the order the code wrote them."""

    sort_keys = False
    ensure_ascii = False

    def loads(self, s: str | bytes, **kwargs: Any) -> Any:
        import json

        try:
            return json.loads(s, parse_constant=_reject_constant, **kwargs)
        except RecursionError as exc:
            raise ValueError("the JSON is nested too deeply") from exc


def _body() -> dict[str, Any]:
    if not request.content_length and not request.data:
        return {}
    if not request.is_json:
        return {}
    try:
        data = request.get_json(force=False, silent=False, cache=True)
    except BadRequest as exc:
        raise BadRequest(
            "The body is not valid JSON (NaN and Infinity are not JSON; check quotes and commas)."
        ) from exc
    return data if isinstance(data, dict) else {}


def query_overrides(text: str) -> dict[str, str] | None:
    """``unit_overrides`` in a query string: ``pressure:bar,power:TR`` (or a JSON object).

    None when the text is neither, so that the caller reports it.
    """
    import json

    text = text.strip()
    if text.startswith("{"):
        try:
            parsed = json.loads(text, parse_constant=_reject_constant)
        except ValueError:
            return None
        return parsed if isinstance(parsed, dict) else None
    pairs: dict[str, str] = {}
    for item in filter(None, (part.strip() for part in text.split(","))):
        kind, sep, unit = item.partition(":")
        if not sep or not kind.strip() or not unit.strip():
            return None
        pairs[kind.strip()] = unit.strip()
    return pairs


def unit_context_from_request() -> UnitContext:
    """Read ``units``, ``unit_overrides`` and ``atmospheric_pressure`` from query and body."""
    body = _body() if request.method in ("POST", "PUT", "PATCH") else {}
    errors: dict[str, list[str]] = {}
    system = body.get("units", request.args.get("units", "SI"))
    if not isinstance(system, str) or system.upper() not in SYSTEMS:
        errors["units"] = ['units must be "SI" or "IP"']
        system = "SI"
    system = system.upper()
    overrides_raw: Any = body.get("unit_overrides", {})
    if "unit_overrides" not in body and "unit_overrides" in request.args:
        overrides_raw = query_overrides(request.args["unit_overrides"])
    overrides: dict[str, str] = {}
    if not isinstance(overrides_raw, dict):
        errors["unit_overrides"] = [
            'an object of kind -> unit, e.g. {"pressure": "bar"} (in a query string: '
            "unit_overrides=pressure:bar,power:TR)"
        ]
    else:
        for kind, unit in overrides_raw.items():
            try:
                if not isinstance(unit, str):
                    raise UnitError("the unit must be a string")
                check_override(str(kind), unit)
                overrides[str(kind)] = unit
            except UnitError as exc:
                errors[f"unit_overrides.{kind}"] = [str(exc)]
    ctx = UnitContext(system, overrides, STANDARD_ATMOSPHERE)
    atm_raw = body.get("atmospheric_pressure", request.args.get("atmospheric_pressure"))
    if atm_raw is not None:
        token = _current.set(ctx)
        try:
            atm = Quantity("pressure", minimum=10e3, maximum=200e3)._deserialize(
                atm_raw, "atmospheric_pressure", body
            )
            ctx = UnitContext(system, overrides, atm)
        except ValidationError as exc:
            errors["atmospheric_pressure"] = [str(m) for m in exc.messages]  # type: ignore[union-attr]
        finally:
            _current.reset(token)
    if errors:
        raise UnitsInvalid(errors)
    return ctx


class UnitsInvalid(UnprocessableEntity):
    def __init__(self, errors: dict[str, list[str]]) -> None:
        super().__init__("The unit settings of the request are not usable.")
        self.data = {"messages": errors}


def warn(remark: Remark) -> None:
    """Add a reviewer's remark to ``meta.warnings`` of the current response."""
    g.setdefault("remarks", []).append(remark)


JSON_ONLY = ("application/json",)


def _check_content_type() -> None:
    """415 for a request body in a media type the endpoint does not read.

    An endpoint reads JSON unless its MethodView lists more in ``content_types`` (e.g.
    ``("application/json", "text/csv")``); ``application/<x>+json`` counts as JSON.
    """
    if request.method not in ("POST", "PUT", "PATCH") or request.endpoint is None:
        return
    if not request.content_length and not request.get_data(cache=True):
        return
    view = current_app.view_functions.get(request.endpoint)
    accepted = tuple(getattr(getattr(view, "view_class", None), "content_types", JSON_ONLY))
    mimetype = request.mimetype
    if mimetype in accepted or ("application/json" in accepted and request.is_json):
        return
    sent = f"'{mimetype}'" if mimetype else "no Content-Type"
    raise UnsupportedMediaType(
        f"The body was sent with {sent}; this endpoint reads {' or '.join(accepted)}: send "
        "the body in that format with a matching Content-Type header."
    )


def _before() -> Response | None:
    g.started = time.perf_counter()
    incoming = request.headers.get("X-Request-ID", "")
    g.request_id = incoming if _REQUEST_ID.match(incoming) else uuid.uuid4().hex
    g.remarks = []
    refused = check_key()  # before anything of the body is read
    if refused is not None:
        return refused
    _check_content_type()
    g.unit_token = _current.set(unit_context_from_request())
    return None


def _after(response: Response) -> Response:
    response.headers["X-Request-ID"] = g.get("request_id", "")
    return response


def _teardown(_exc: BaseException | None) -> None:
    token = g.pop("unit_token", None)
    if token is not None:
        _current.reset(token)


def register(app: Flask) -> None:
    app.json_provider_class = StrictJSONProvider
    app.json = StrictJSONProvider(app)
    app.before_request(_before)
    app.after_request(_after)
    app.teardown_request(_teardown)
