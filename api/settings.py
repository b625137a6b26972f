"""Configuration from environment variables, all with the prefix ``HEATLIFT_``.

| variable | default | meaning |
|---|---|---|
| HEATLIFT_BIND | 127.0.0.1:8080 | address:port of gunicorn (read by api/gunicorn_conf.py) |
| HEATLIFT_WORKERS | core count | worker processes (gunicorn) |
| HEATLIFT_TIMEOUT | 30 | seconds before the master replaces a stuck worker (gunicorn) |
| HEATLIFT_GRACEFUL_TIMEOUT | 20 | seconds a stopping worker may finish its request (gunicorn) |
| HEATLIFT_MAX_REQUESTS | 20000 | requests after which a worker is replaced (gunicorn) |
| HEATLIFT_MAX_REQUESTS_JITTER | 2000 | random extra, so that workers are not replaced at once |
| HEATLIFT_LOG_LEVEL | info | debug, info, warning, error |
| HEATLIFT_LOG_FORMAT | json | json (one object a line) or text |
| HEATLIFT_CORS_ORIGINS | (none) | comma-separated origins allowed to call from a browser |
| HEATLIFT_API_KEYS | (none) | comma-separated keys; when set, /v1 (not health, ready) needs one |
| HEATLIFT_API_KEYS_FILE | (none) | a file with one key a line (blanks and # comments ignored) |
| HEATLIFT_MAX_BODY_BYTES | 10485760 | largest request body (413 beyond) |
| HEATLIFT_MAX_ROWS | 10000 | rows in one datasheet validation |
| HEATLIFT_MAX_TABLE_POINTS | 500 | rows in one saturation table |
| HEATLIFT_MAX_SWEEP_POINTS | 200 | points in one cycle sweep |
| HEATLIFT_MAX_JSON_DEPTH | 32 | nesting depth of a JSON body |
| HEATLIFT_TABLES_DIR | ~/.cache/heatlift | the blends' saturation tables (`heatlift warm-tables`) |
| HEATLIFT_SOLVER_DEADLINE | 10 | seconds one request may calculate, fractions too (422 beyond) |
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Any

PREFIX = "HEATLIFT_"


class SettingsError(ValueError):
    """A configuration value that cannot be used; the service refuses to start with it."""


def _int(env: dict[str, str], name: str, default: int, minimum: int = 1) -> int:
    raw = env.get(PREFIX + name)
    if raw is None or raw == "":
        return default
    try:
        value = int(raw)
    except ValueError as exc:
        raise SettingsError(f"{PREFIX}{name}={raw!r} is not a whole number") from exc
    if value < minimum:
        raise SettingsError(f"{PREFIX}{name} must be at least {minimum}")
    return value


def _seconds(env: dict[str, str], name: str, default: float) -> float:
    raw = env.get(PREFIX + name)
    if raw is None or raw == "":
        return default
    try:
        value = float(raw)
    except ValueError as exc:
        raise SettingsError(f"{PREFIX}{name}={raw!r} is not a number of seconds") from exc
    if not 0 < value < 1e6:
        raise SettingsError(f"{PREFIX}{name} must be a positive number of seconds")
    return value


def _list(raw: str | None) -> list[str]:
    return [item.strip() for item in (raw or "").split(",") if item.strip()]


def api_keys(env: dict[str, str]) -> frozenset[str]:
    keys = set(_list(env.get(PREFIX + "API_KEYS")))
    path = env.get(PREFIX + "API_KEYS_FILE")
    if path:
        try:
            lines = Path(path).read_text("utf-8").splitlines()
        except OSError as exc:
            raise SettingsError(f"{PREFIX}API_KEYS_FILE cannot be read: {exc.strerror}") from exc
        keys.update(line.strip() for line in lines
                    if line.strip() and not line.lstrip().startswith("#"))
    return frozenset(keys)


def from_environment(env: dict[str, str] | None = None) -> dict[str, Any]:
    """Flask configuration keys from the environment (``os.environ`` by default)."""
    env = dict(os.environ if env is None else env)
    log_format = env.get(PREFIX + "LOG_FORMAT", "json").lower()
    if log_format not in ("json", "text"):
        raise SettingsError(f"{PREFIX}LOG_FORMAT must be json or text")
    return {
        "MAX_CONTENT_LENGTH": _int(env, "MAX_BODY_BYTES", 10 * 1024 * 1024),
        "HEATLIFT_MAX_ROWS": _int(env, "MAX_ROWS", 10_000),
        "HEATLIFT_MAX_TABLE_POINTS": _int(env, "MAX_TABLE_POINTS", 500),
        "HEATLIFT_MAX_SWEEP_POINTS": _int(env, "MAX_SWEEP_POINTS", 200),
        "HEATLIFT_MAX_JSON_DEPTH": _int(env, "MAX_JSON_DEPTH", 32),
        "HEATLIFT_SOLVER_DEADLINE": _seconds(env, "SOLVER_DEADLINE", 10.0),
        "HEATLIFT_API_KEYS": api_keys(env),
        "HEATLIFT_CORS_ORIGINS": _list(env.get(PREFIX + "CORS_ORIGINS")),
        "HEATLIFT_LOG_LEVEL": env.get(PREFIX + "LOG_LEVEL", "info").upper(),
        "HEATLIFT_LOG_FORMAT": log_format,
    }
