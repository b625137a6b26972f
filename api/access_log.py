"""Structured logs: one JSON object a line with the request id, never a key or a body.

Every request writes one access line (logger ``heatlift.access``): request id, method, path
(without the query string), status, bytes, elapsed time, the worker's pid and the caller's
address. With HEATLIFT_LOG_FORMAT=json (the default) gunicorn's own lines (start, worker
boot, a worker that died) are JSON objects of the same shape, so that a log shipper reads every
line of the service's output as JSON; with ``text`` the same fields follow the message as
``key=value``. Errors carry their traceback in the line (field ``exception``), never in the
response.
"""

from __future__ import annotations

import json
import logging
import os
import sys
import time
from typing import Any

from flask import Flask, Response, current_app, g, request
from gunicorn import glogging


class JsonFormatter(logging.Formatter):
    def format(self, record: logging.LogRecord) -> str:
        entry: dict[str, Any] = {
            "time": self.formatTime(record, "%Y-%m-%dT%H:%M:%S%z"),
            "level": record.levelname.lower(), "logger": record.name,
            "message": record.getMessage(), "pid": record.process,
        }
        entry.update(getattr(record, "fields", {}))
        if record.exc_info:
            entry["exception"] = self.formatException(record.exc_info)
        return json.dumps(entry, ensure_ascii=True, default=str)


class TextFormatter(logging.Formatter):
    def __init__(self) -> None:
        super().__init__("%(asctime)s [%(process)d] %(levelname)s %(name)s: %(message)s")

    def format(self, record: logging.LogRecord) -> str:
        text = super().format(record)
        fields = getattr(record, "fields", {})
        return text + "".join(f" {key}={value}" for key, value in fields.items())


def formatter(log_format: str) -> logging.Formatter:
    return JsonFormatter() if log_format == "json" else TextFormatter()


log = logging.getLogger("heatlift.access")


def configure(app: Flask) -> None:
    level = app.config.get("HEATLIFT_LOG_LEVEL", "INFO")
    handler = logging.StreamHandler(sys.stderr)
    handler.setFormatter(formatter(app.config.get("HEATLIFT_LOG_FORMAT", "json")))
    root = logging.getLogger("heatlift")
    root.handlers[:] = [handler]
    root.setLevel(level)
    root.propagate = False


def _log(response: Response) -> Response:
    if not current_app.config.get("HEATLIFT_ACCESS_LOG", True):
        return response
    started = g.get("started")
    log.info("request", extra={"fields": {
        "request_id": g.get("request_id", ""),
        "method": request.method,
        "path": request.path[:200],
        "status": response.status_code,
        "bytes": response.calculate_content_length(),
        "elapsed_ms": round((time.perf_counter() - started) * 1e3, 3) if started else None,
        "remote": request.remote_addr,
    }})
    return response


def register(app: Flask) -> None:
    configure(app)
    app.after_request(_log)


class GunicornLogger(glogging.Logger):  # type: ignore[misc]
    """gunicorn's own logger with this module's formatter on its error log; named by
    ``logger_class`` in api/gunicorn_conf.py."""

    def setup(self, cfg: Any) -> None:
        super().setup(cfg)
        chosen = formatter(os.environ.get("HEATLIFT_LOG_FORMAT", "json").lower())
        for handler in self.error_log.handlers:
            handler.setFormatter(chosen)
