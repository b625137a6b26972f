"""Prometheus metrics with the official client, in its multi-process mode under gunicorn.

gunicorn's configuration (api/gunicorn_conf.py) points ``PROMETHEUS_MULTIPROC_DIR`` at a fresh
directory before the workers fork; every worker then writes its samples there and ``/metrics``
sums them over all workers. Without that variable (the Flask test client, a single process) the
process's own registry is served.
"""

from __future__ import annotations

import os
import time

from flask import Blueprint, Flask, Response, g, request
from prometheus_client import REGISTRY, CollectorRegistry, Counter, Histogram, multiprocess
from prometheus_client.exposition import choose_encoder

REQUESTS = Counter("heatlift_requests_total", "HTTP requests answered",
                   ["endpoint", "method", "status"])
LATENCY = Histogram("heatlift_request_duration_seconds", "Time to answer a request",
                    ["endpoint"],
                    buckets=(0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10))
SOLVER_FAILURES = Counter("heatlift_solver_failures_total",
                          "Calculations refused by the engine", ["kind"])

blp = Blueprint("metrics", __name__)


@blp.route("/metrics")
def metrics() -> Response:
    """The text format a scraper asks for by Accept (OpenMetrics or Prometheus text, 0.0.4 by
    default), with exactly the content type that format names."""
    encode, content_type = choose_encoder(request.headers.get("Accept", ""))
    if os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
        registry = CollectorRegistry()
        multiprocess.MultiProcessCollector(registry)  # type: ignore[no-untyped-call]
        body = encode(registry)
    else:
        body = encode(REGISTRY)
    response = Response(body, content_type=content_type)  # not mimetype=: no second charset
    response.vary.add("Accept")
    return response


def _endpoint() -> str:
    # the route's rule, not the raw path: bounded label values whatever callers send
    return request.url_rule.rule if request.url_rule is not None else "unmatched"


def observe(response: Response) -> Response:
    started = g.get("started")
    endpoint = _endpoint()
    REQUESTS.labels(endpoint, request.method, str(response.status_code)).inc()
    if started is not None:
        LATENCY.labels(endpoint).observe(time.perf_counter() - started)
    return response


def count_failure(kind: str) -> None:
    SOLVER_FAILURES.labels(kind).inc()


def register(app: Flask) -> None:
    app.register_blueprint(blp)
    app.after_request(observe)
