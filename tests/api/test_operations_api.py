"""The service under load, with a worker killed, over a soak, and what it reports meanwhile
(Prometheus metrics summed over the workers, JSON access logs with the request id).

One gunicorn of its own with two sync workers and worker recycling pushed out of reach
(HEATLIFT_MAX_REQUESTS), so that a recycled worker neither hides memory growth nor looks like
the replacement of a killed one. The tests run in the order of this file: metrics and logs on
a quiet server, then load, soak, the kill, and last the check that every line the service
wrote, the kill included, is one JSON object.

Every run is bounded by a count and a time, whichever ends first; the numbers are sized for
two shared cores (client and server on the same machine) and each test prints what it did.
"""

from __future__ import annotations

import json
import logging
import os
import signal
import threading
import time
import uuid
from dataclasses import replace

import pytest
import requests
from prometheus_client.parser import text_string_to_metric_families

from tests.api.production import (
    REFRIGERANTS,
    Call,
    LoadResult,
    mixed,
    refused,
    rss_kib,
    run_load,
    send,
    serving,
)

log = logging.getLogger("heatlift.tests.operations")
WORKERS = 2
CLIENTS = 6  # above the worker count: requests queue at the socket, none may be lost
LOAD_REQUESTS, LOAD_SECONDS = 600, 30.0
SOAK_REQUESTS = int(os.environ.get("HEATLIFT_SOAK_REQUESTS", "20000"))
SOAK_SECONDS = float(os.environ.get("HEATLIFT_SOAK_SECONDS", "75"))
SOAK_WARM_UP = 2000
SOAK_GROWTH_LIMIT_KIB = 30 * 1024
SOAK_MINIMUM = 4000  # requests after the warm-up without which the soak proves nothing
KILLED: dict[str, int] = {}


@pytest.fixture(scope="module")
def busy():
    env = {"HEATLIFT_MAX_REQUESTS": "100000000", "HEATLIFT_MAX_REQUESTS_JITTER": "0"}
    with serving(env, workers=WORKERS) as server:
        yield server


def report(record_property, name: str, result: LoadResult) -> str:
    text = result.summary(name)
    print("\n" + text)
    log.warning(text)
    record_property(f"{name}_p50_ms", round(result.latency_ms(0.50), 1))
    record_property(f"{name}_p99_ms", round(result.latency_ms(0.99), 1))
    record_property(f"{name}_requests", len(result.outcomes))
    return text


def tagged(make, prefix: str):
    """Calls that carry their own X-Request-ID, to find them in the access log."""
    def call(index: int) -> Call:
        base = make(index)
        return replace(base, headers={**base.headers, "X-Request-ID": f"{prefix}-{index}"})
    return call


# ---------------------------------------------------------------------------- metrics


def scrape(base: str) -> dict[tuple[str, tuple[tuple[str, str], ...]], float]:
    r = requests.get(base + "/metrics", timeout=60)
    assert r.status_code == 200
    samples = {}
    for family in text_string_to_metric_families(r.text):
        for sample in family.samples:
            samples[(sample.name, tuple(sorted(sample.labels.items())))] = sample.value
    return samples


def value(samples, name: str, **labels: str) -> float:
    return samples.get((name, tuple(sorted(labels.items()))), 0.0)


ENDPOINTS = {  # the name of a mixed() call -> (route rule, method): the endpoint label
    "saturation": ("/v1/saturation", "GET"),
    "saturation-post": ("/v1/saturation", "POST"),
    "state": ("/v1/state", "POST"),
    "cycle": ("/v1/cycle", "POST"),
    "sweep": ("/v1/cycle/sweep", "POST"),
    "refrigerants": ("/v1/refrigerants/<designation>", "GET"),
}


def test_metrics_add_up_over_both_workers(busy):
    """Requests spread over both workers (concurrently) are all counted, by endpoint and
    status, in the counter and in the latency histogram; solver refusals are counted."""
    before = scrape(busy.url)
    prefix = "metrics-" + uuid.uuid4().hex[:8]
    result = run_load(busy.url, tagged(mixed, prefix), threads=CLIENTS, max_requests=240,
                      max_seconds=60)
    assert not result.failed, result.failed[:3]
    refusals = [Call("above-critical", "GET", "/v1/saturation",
                     {"refrigerant": "R134a", "temperature": "150 degC"}, expect=422)] * 7
    unknown = [Call("unknown", "GET", "/v1/saturation",
                    {"refrigerant": "R999", "temperature": 5}, expect=404)] * 3
    for call in refusals + unknown:
        assert send(busy.url, call)[0] == call.expect
    after = scrape(busy.url)

    sent: dict[tuple[str, str], int] = {}
    for outcome in result.outcomes:
        key = ENDPOINTS[outcome.name]
        sent[key] = sent.get(key, 0) + 1
    for (rule, method), count in sent.items():
        got = (value(after, "heatlift_requests_total", endpoint=rule, method=method,
                     status="200")
               - value(before, "heatlift_requests_total", endpoint=rule, method=method,
                       status="200"))
        assert got == count, (rule, method, got, count)
    for rule in {rule for rule, _ in sent}:
        # the histogram is by endpoint alone: every method and status
        n = sum(c for (r, _), c in sent.items() if r == rule)
        n += len(refusals + unknown) if rule == "/v1/saturation" else 0
        name = "heatlift_request_duration_seconds_count"
        assert value(after, name, endpoint=rule) - value(before, name, endpoint=rule) == n
        buckets = sorted(
            (float(dict(labels)["le"]), v) for (name, labels), v in after.items()
            if name == "heatlift_request_duration_seconds_bucket"
            and dict(labels)["endpoint"] == rule)
        counts = [v for _, v in buckets]
        assert counts == sorted(counts) and buckets[-1][0] == float("inf")
        assert buckets[-1][1] == value(after, "heatlift_request_duration_seconds_count",
                                       endpoint=rule)
    assert value(after, "heatlift_requests_total", endpoint="/v1/saturation", method="GET",
                 status="422") - value(before, "heatlift_requests_total",
                                       endpoint="/v1/saturation", method="GET",
                                       status="422") == 7
    assert value(after, "heatlift_solver_failures_total", kind="outofrange") - value(
        before, "heatlift_solver_failures_total", kind="outofrange") == 7
    # an unknown refrigerant is the caller's mistake, not a failed calculation
    assert sum(v for (name, _), v in after.items()
               if name == "heatlift_solver_failures_total") - sum(
        v for (name, _), v in before.items() if name == "heatlift_solver_failures_total") == 7

    # and the requests really were spread over the two processes
    pids = {entry["pid"] for entry in busy.log_entries()
            if str(entry.get("request_id", "")).startswith(prefix)}
    assert pids <= set(busy.workers()) and len(pids) == WORKERS, pids


def test_metrics_in_the_prometheus_text_format(busy):
    """Run after the test above, which makes a solver failure (a labelled counter shows only
    once it has a sample)."""
    r = requests.get(busy.url + "/metrics", timeout=60)
    assert r.headers["Content-Type"] == "text/plain; version=0.0.4; charset=utf-8"
    families = {f.name: f for f in text_string_to_metric_families(r.text)}
    assert families["heatlift_requests"].type == "counter"
    assert families["heatlift_request_duration_seconds"].type == "histogram"
    assert families["heatlift_solver_failures"].type == "counter"
    om = requests.get(busy.url + "/metrics", timeout=60,
                      headers={"Accept": "application/openmetrics-text; version=1.0.0"})
    assert om.headers["Content-Type"].startswith("application/openmetrics-text")
    assert om.text.rstrip().endswith("# EOF")


def test_unmatched_paths_share_one_label(busy):
    for _ in range(3):
        requests.get(busy.url + f"/nothing/{uuid.uuid4().hex}", timeout=60)
    labels = {dict(labels).get("endpoint") for (name, labels) in scrape(busy.url)
              if name == "heatlift_requests_total"}
    assert "unmatched" in labels
    assert not any(label and label.startswith("/nothing") for label in labels)


# ------------------------------------------------------------------------ access logs


def test_one_json_access_line_per_request_with_its_request_id(busy):
    sent = {}
    for i, (method, path, body) in enumerate([
        ("GET", "/v1/saturation?refrigerant=R32&temperature=0", None),
        ("POST", "/v1/state", {"refrigerant": "R134a", "pressure": 300, "temperature": 5}),
        ("GET", "/v1/refrigerants/R9999", None),
        ("POST", "/v1/state", {"refrigerant": "R134a"}),
        ("GET", "/v1/health", None),
    ]):
        own = f"access-{uuid.uuid4().hex}" if i % 2 == 0 else None
        headers = {"X-Request-ID": own} if own else {}
        r = requests.request(method, busy.url + path, json=body, headers=headers, timeout=60)
        if own:
            assert r.headers["X-Request-ID"] == own  # echoed
        else:
            assert len(r.headers["X-Request-ID"]) == 32  # generated
        sent[r.headers["X-Request-ID"]] = (method, path.split("?")[0], r.status_code)
    time.sleep(0.5)  # the workers' stderr is unbuffered; leave the pipe a moment
    entries = [e for e in busy.log_entries() if e.get("logger") == "heatlift.access"]
    for request_id, (method, path, status) in sent.items():
        mine = [e for e in entries if e.get("request_id") == request_id]
        assert len(mine) == 1, (request_id, mine)
        entry = mine[0]
        assert (entry["method"], entry["path"], entry["status"]) == (method, path, status)
        assert entry["pid"] in busy.workers()
        assert isinstance(entry["elapsed_ms"], float) and entry["elapsed_ms"] >= 0
        assert entry["level"] == "info" and entry["message"] == "request"
        assert "?" not in entry["path"]  # the query string is never logged


def test_a_refusal_before_the_request_hooks_is_logged_with_its_id(busy):
    own = "deep-" + uuid.uuid4().hex
    r = requests.post(busy.url + "/v1/state", data="[" * 100 + "]" * 100, timeout=60,
                      headers={"Content-Type": "application/json", "X-Request-ID": own})
    refused(r, 400)
    assert r.headers["X-Request-ID"] == own
    time.sleep(0.5)
    assert [e["status"] for e in busy.log_entries() if e.get("request_id") == own] == [400]


# ------------------------------------------------------------------------------- load


def test_mixed_load_above_the_worker_count_has_no_errors(busy, record_property):
    result = run_load(busy.url, mixed, threads=CLIENTS, max_requests=LOAD_REQUESTS,
                      max_seconds=LOAD_SECONDS)
    report(record_property, "load", result)
    assert not result.failed, [(o.name, o.status, o.error) for o in result.failed[:5]]
    assert len(result.outcomes) >= 100, "too few requests for a load test"
    assert {o.name for o in result.outcomes} == set(ENDPOINTS)
    assert busy.workers() and len(busy.workers()) == WORKERS


# ------------------------------------------------------------------------------- soak


def cheap(index: int) -> Call:
    """Real but cheap: saturation of pure fluids and blends at ever different temperatures;
    one request in 20 is refused (the error path must not leak either)."""
    refrigerant = REFRIGERANTS[index % len(REFRIGERANTS)]
    if index % 20 == 19:
        return Call("refused", "GET", "/v1/saturation",
                    {"refrigerant": refrigerant, "temperature": "400 degC"}, expect=422)
    t = -40.0 + (index * 0.731) % 58.0
    return Call("saturation", "GET", "/v1/saturation",
                {"refrigerant": refrigerant, "temperature": f"{t:.4f}"})


def test_worker_memory_stays_bounded_over_a_soak(busy, record_property):
    pids = busy.workers()
    assert len(pids) == WORKERS
    warm = run_load(busy.url, cheap, threads=4, max_requests=SOAK_WARM_UP, max_seconds=45)
    assert not warm.failed, warm.failed[:3]
    start = {pid: rss_kib(pid) for pid in pids}
    samples: list[dict[int, int]] = []

    def sample(done: int) -> None:
        if done % 2000 == 0:
            samples.append({pid: rss_kib(pid) for pid in pids})

    soak = run_load(busy.url, lambda i: cheap(i + SOAK_WARM_UP), threads=4,
                    max_requests=SOAK_REQUESTS - SOAK_WARM_UP, max_seconds=SOAK_SECONDS,
                    progress=sample)
    end = {pid: rss_kib(pid) for pid in pids}
    growth = {pid: end[pid] - start[pid] for pid in pids}
    text = report(record_property, "soak", soak)
    detail = (f"RSS after {SOAK_WARM_UP} warm-up requests {start} KiB, after "
              f"{len(soak.outcomes)} more {end} KiB, growth {growth} KiB; samples {samples}")
    print(detail)
    log.warning(detail)
    record_property("soak_rss_growth_kib", growth)
    assert busy.workers() == pids, "a worker was replaced during the soak"
    assert not soak.failed, soak.failed[:3]
    assert len(soak.outcomes) >= SOAK_MINIMUM, f"the soak ran too few requests: {text}"
    for pid, grown in growth.items():
        assert grown < SOAK_GROWTH_LIMIT_KIB, f"worker {pid} grew {grown} KiB: {detail}"


# ------------------------------------------------------------------------------ fault


def test_a_worker_killed_under_load_is_replaced(busy, record_property):
    before = busy.workers()
    assert len(before) == WORKERS
    stop = threading.Event()
    done = threading.Event()
    box: dict[str, LoadResult] = {}
    progress_count = [0]

    def progress(count: int) -> None:
        progress_count[0] = count

    def load() -> None:
        box["result"] = run_load(busy.url, mixed, threads=CLIENTS, max_requests=100_000,
                                 max_seconds=60, stop=stop, progress=progress)
        done.set()

    thread = threading.Thread(target=load, daemon=True)
    thread.start()
    deadline = time.monotonic() + 20
    while progress_count[0] < 60 and time.monotonic() < deadline:
        time.sleep(0.05)
    victim = before[0]
    os.kill(victim, signal.SIGKILL)
    killed_at = time.perf_counter()
    KILLED["pid"] = victim

    replaced_after = None
    while time.perf_counter() - killed_at < 15:
        now = busy.workers()
        if victim not in now and len(now) == WORKERS:
            replaced_after = time.perf_counter() - killed_at
            break
        time.sleep(0.05)
    assert replaced_after is not None, f"no new worker 15 s after the kill: {busy.workers()}"
    at_replacement = progress_count[0]
    # the load goes on against the new worker for a while
    deadline = time.monotonic() + 20
    while progress_count[0] < at_replacement + 120 and time.monotonic() < deadline:
        time.sleep(0.05)
    stop.set()
    assert done.wait(90)
    result = box["result"]
    report(record_property, "fault", result)
    print(f"worker {victim} killed; replaced after {replaced_after:.2f} s by "
          f"{set(busy.workers()) - set(before)}")

    failed = result.failed
    assert len(failed) <= CLIENTS, [(o.name, o.status, o.error) for o in failed]
    kill_time = killed_at - result.began
    for o in failed:
        assert o.status is None, (o.name, o.status)  # a broken connection, never a 5xx
        assert o.started <= kill_time + 0.05 <= o.started + o.seconds + 0.1, (
            "a request failed that was not in flight at the kill", o)
    after_kill = [o for o in result.outcomes if o.started > kill_time + replaced_after]
    assert len(after_kill) >= 50 and all(o.ok for o in after_kill)
    # the service answers afterwards, on both workers
    statuses = [send(busy.url, mixed(i))[0] for i in range(20)]
    assert statuses == [200] * 20
    assert len(busy.workers()) == WORKERS


def test_every_line_of_the_service_log_is_json(busy):
    """gunicorn's lines too (HEATLIFT_LOG_FORMAT=json), the kill above included."""
    lines = [line for line in busy.log_text().splitlines() if line.strip()]
    bad = []
    entries = []
    for line in lines:
        try:
            entry = json.loads(line)
            assert isinstance(entry, dict)
            entries.append(entry)
        except (ValueError, AssertionError):
            bad.append(line[:200])
    assert not bad, bad[:10]
    assert {"time", "level", "logger", "message", "pid"} <= set(entries[0])
    if "pid" in KILLED:
        assert any(e["logger"] == "gunicorn.error" and str(KILLED["pid"]) in e["message"]
                   and e["level"] == "error" for e in entries), "the kill is not in the log"
