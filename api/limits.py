"""Limits that keep one request from holding a worker: body size, JSON depth, a deadline.

- Body size: Flask's ``MAX_CONTENT_LENGTH`` (HEATLIFT_MAX_BODY_BYTES) refuses a larger body with
  413, a chunked one too (which Werkzeug alone would cut at the limit); the problem names the
  limit.
- JSON depth: the brackets of a JSON body are counted before anything parses it (a scan that
  skips over strings, so it needs no recursion whatever the depth), and a body nested deeper
  than HEATLIFT_MAX_JSON_DEPTH is refused with 400 naming the limit; so is a string holding a
  lone UTF-16 surrogate escape, which Python's parser lets through but no reply can write back.
  The scan runs first among the request hooks, but never ahead of the API-key check: a caller
  without a key gets 401.
- Deadline: the interval timer of the worker's main thread (gunicorn's sync workers run each
  request there): when it fires, the calculation in progress stops at its next Python step and
  the caller gets a 422 problem that names the limit. Property-library calls are short (micro-
  to milliseconds), so the deadline is kept to within a few milliseconds.
"""

from __future__ import annotations

import json
import re
import signal
import threading
import time
import uuid
from typing import Any

from flask import Flask, Response, current_app, g, request
from werkzeug.exceptions import BadRequest, HTTPException, RequestEntityTooLarge

from api.auth import check_key
from api.context import _REQUEST_ID
from api.metrics import count_failure
from api.problems import problem

# a JSON string (with its escapes) or one bracket: strings are skipped whole, so that brackets
# inside them do not count
_TOKENS = re.compile(rb'"(?:[^"\\]|\\.)*"|[\[\]{}]', re.DOTALL)
_SURROGATE_ESCAPE = re.compile(rb"\\u[dD][89a-fA-F][0-9a-fA-F]{2}")
_SURROGATE = re.compile("[\ud800-\udfff]")


class DeadlineExceeded(Exception):
    """Not an engine error on purpose: nothing in the engine may catch it and carry on."""


def json_depth(document: Any) -> int:
    """Nesting depth of a parsed JSON document (iterative, so any depth is safe)."""
    deepest = 0
    stack = [(document, 1)]
    while stack:
        node, depth = stack.pop()
        if isinstance(node, dict):
            deepest = max(deepest, depth)
            stack.extend((v, depth + 1) for v in node.values())
        elif isinstance(node, list):
            deepest = max(deepest, depth)
            stack.extend((v, depth + 1) for v in node)
    return deepest


def raw_depth_exceeds(data: bytes, limit: int) -> bool:
    """Whether the JSON text ``data`` opens more than ``limit`` brackets at once.

    Malformed text is left to the JSON parser (which answers 400 for it); this only counts.
    """
    return _scan(data, limit) == "depth"


def _scan(data: bytes, limit: int) -> str | None:
    """"depth" for a body nested deeper than ``limit``, "surrogate" for a string holding a
    lone UTF-16 surrogate escape (``"\\ud800"``: valid JSON text, but no character, so that
    no reply could ever write it back), None for neither.

    Most bodies are settled without the token loop: with no more brackets in the whole text
    (strings included) than the limit, none can be nested deeper, and with no ``\\u`` in it no
    string holds a surrogate escape."""
    if b"\\u" not in data and data.count(b"[") + data.count(b"{") <= limit:
        return None
    depth = 0
    for match in _TOKENS.finditer(data):
        token = match.group()
        if token in (b"[", b"{"):
            depth += 1
            if depth > limit:
                return "depth"
        elif token in (b"]", b"}"):
            depth -= 1
        elif _SURROGATE_ESCAPE.search(token) and _has_surrogate(token):
            return "surrogate"
    return None


def _has_surrogate(token: bytes) -> bool:
    try:
        text = json.loads(token)
    except ValueError:
        return False  # malformed: the JSON parser answers 400 for it
    return isinstance(text, str) and _SURROGATE.search(text) is not None


def _size(count: int) -> str:
    for unit, factor in (("MiB", 1 << 20), ("KiB", 1 << 10)):
        if count >= factor and count % (factor // 4) == 0:
            return f"{count} bytes ({count / factor:g} {unit})"
    return f"{count} bytes"


def _identify() -> None:
    """Request id and start time, set as api/context.py sets them, for a request refused
    before that hook ran (so that the refusal, too, carries its X-Request-ID and is logged)."""
    incoming = request.headers.get("X-Request-ID", "")
    g.request_id = incoming if _REQUEST_ID.match(incoming) else uuid.uuid4().hex
    g.started = time.perf_counter()


def _check_size() -> None:
    """413 for a chunked body (no Content-Length) over the limit.

    Werkzeug refuses a declared length over ``MAX_CONTENT_LENGTH`` itself, but a chunked body
    it reads only up to the limit and cuts it there without a word: a CSV would lose its last
    rows and still be validated. One byte more on the wire than the limit is a body too large.
    """
    limit = current_app.config.get("MAX_CONTENT_LENGTH")
    if not limit or request.content_length is not None:
        return
    if len(request.get_data(cache=True)) >= limit and request.environ["wsgi.input"].read(1):
        raise RequestEntityTooLarge()


def check_body() -> None:
    if check_key() is not None:
        return  # the key check (api/context.py) answers 401 before any body is read
    if request.method not in ("POST", "PUT", "PATCH"):
        return
    try:
        _check_size()
        _check_json()
    except HTTPException:
        _identify()
        raise


def _check_json() -> None:
    if not request.is_json:
        return
    data = request.get_data(cache=True)
    limit = int(current_app.config.get("HEATLIFT_MAX_JSON_DEPTH", 32))
    found = _scan(data, limit) if data else None
    if found == "depth":
        raise BadRequest(
            f"The JSON body is nested deeper than the limit of {limit} levels "
            "(HEATLIFT_MAX_JSON_DEPTH); no request of this service needs that many.")
    if found == "surrogate":
        raise BadRequest(
            "The JSON body holds a lone UTF-16 surrogate escape (\\ud800 to \\udfff without "
            "its pair), which is no character; send the text as UTF-8.")


def _too_large(error: RequestEntityTooLarge) -> Response:
    if error.description != RequestEntityTooLarge.description:
        detail = str(error.description)  # a route's own limit (rows in a batch) with its text
    else:
        limit = current_app.config.get("MAX_CONTENT_LENGTH")
        detail = (f"The request body is larger than this service's limit of "
                  f"{_size(int(limit))}, set by HEATLIFT_MAX_BODY_BYTES; send fewer rows or "
                  "points per request." if limit else "The request body is too large.")
    return problem(413, "Content too large", detail, slug="too-large")


def _on_deadline(_signum: int, _frame: Any) -> None:
    seconds = current_app.config.get("HEATLIFT_SOLVER_DEADLINE", 10.0)
    raise DeadlineExceeded(
        f"the calculation took longer than the limit of {seconds:g} s "
        "(HEATLIFT_SOLVER_DEADLINE); ask for fewer points or rows per request")


def _in_main_thread() -> bool:
    return threading.current_thread() is threading.main_thread()


def start_deadline() -> None:
    seconds = float(current_app.config.get("HEATLIFT_SOLVER_DEADLINE", 10.0))
    if seconds > 0 and _in_main_thread():
        signal.signal(signal.SIGALRM, _on_deadline)
        signal.setitimer(signal.ITIMER_REAL, seconds)


def stop_deadline(_exc: BaseException | None = None) -> None:
    if _in_main_thread():
        signal.setitimer(signal.ITIMER_REAL, 0)


def _deadline_problem(error: DeadlineExceeded) -> Response:
    stop_deadline()
    count_failure("deadline")
    return problem(422, "Calculation deadline exceeded", str(error), slug="deadline")


def register(app: Flask) -> None:
    app.register_error_handler(DeadlineExceeded, _deadline_problem)
    app.register_error_handler(RequestEntityTooLarge, _too_large)
    # first of the request hooks, so that no other hook parses a body nested too deeply
    app.before_request_funcs.setdefault(None, []).insert(0, check_body)
    app.before_request(start_deadline)
    app.teardown_request(stop_deadline)
