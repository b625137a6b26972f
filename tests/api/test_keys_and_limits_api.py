"""API keys and the request limits, against a gunicorn of its own with keys and small limits.

One server for both (each server start builds every property model): keys from
HEATLIFT_API_KEYS and from HEATLIFT_API_KEYS_FILE, a 4 KiB body limit, three datasheet rows,
a one-second calculation deadline, and debug logging, so that the check that no key is ever
logged reads the most talkative log the service writes.

Decision on /metrics: it stays open, like /openapi.json and /docs. The issue asks for a key on
every /v1 endpoint but health and readiness; the metrics path is not under /v1, Prometheus
scrapes it from inside the cluster, and it shows counts only (endpoint, status), never a
request's content. Keep it off the public load balancer (README "Running in production").
"""

from __future__ import annotations

import json
import time

import pytest
import requests

from tests.api.production import (
    DATASHEET_ROW,
    VALID,
    concrete,
    log_file,
    operations,
    refused,
    serving,
)

KEYS = ("k-one-3f9a61c2", "k-two-77b0e4d5")
FILE_KEY = "k-file-c81d2e09"
WRONG = "k-wrong-5e2b9a17"
OPEN = ("/v1/health", "/v1/ready")
DEADLINE = 1.0


@pytest.fixture(scope="module")
def guarded(tmp_path_factory):
    keys_file = tmp_path_factory.mktemp("keys") / "heatlift-keys"
    keys_file.write_text(f"# one key a line\n\n{FILE_KEY}\n   \n", "utf-8")
    env = {
        "HEATLIFT_API_KEYS": ",".join(KEYS) + ", ",
        "HEATLIFT_API_KEYS_FILE": str(keys_file),
        "HEATLIFT_MAX_BODY_BYTES": "4096",
        "HEATLIFT_MAX_ROWS": "3",
        "HEATLIFT_MAX_SWEEP_POINTS": "5000",
        "HEATLIFT_SOLVER_DEADLINE": str(DEADLINE),
        "HEATLIFT_LOG_LEVEL": "debug",
    }
    with serving(env) as server:
        yield server


@pytest.fixture(scope="module")
def document(guarded) -> dict:
    r = requests.get(guarded.url + "/openapi.json", timeout=60)
    assert r.status_code == 200  # the document is open, like /docs
    return r.json()


def call(base: str, method: str, path: str, headers: dict[str, str] | None = None,
         **kwargs) -> requests.Response:
    query, body = VALID.get((method, path), ({}, None))
    target, rest = concrete(path, query)
    if body is not None:
        kwargs.setdefault("json", body)
    return requests.request(method, base + target, params=rest, headers=headers or {},
                            timeout=60, **kwargs)


def guarded_operations(document: dict) -> list[tuple[str, str]]:
    found = [(m, p) for m, p in operations(document)
             if p.startswith("/v1/") and p not in OPEN]
    assert len(found) >= 15, found  # the whole API, not a part of it
    return found


# ------------------------------------------------------------------------------- keys

REFUSED_HEADERS = [
    {},
    {"Authorization": f"Bearer {WRONG}"},
    {"X-API-Key": WRONG},
    {"Authorization": f"Bearer {KEYS[0][:-1]}"},  # a prefix of a key
    {"Authorization": f"Bearer {KEYS[0]}x"},  # a key with more after it
    {"Authorization": "Bearer "},
    {"X-API-Key": ""},
    {"Authorization": f"Basic {KEYS[0]}"},  # not the Bearer scheme
    {"Authorization": KEYS[0]},
    {"Authorization": f"Bearer {KEYS[0]},{KEYS[1]}"},
    {"Authorization": f"Bearer {FILE_KEY[:-2]}"},
    {"X-API-Key": "# one key a line"},  # the file's comment is no key
]
ACCEPTED_HEADERS = [
    {"Authorization": f"Bearer {KEYS[0]}"},
    {"Authorization": f"bearer {KEYS[1]}"},  # the scheme is case-insensitive (RFC 9110)
    {"X-API-Key": KEYS[1]},
    {"X-API-Key": FILE_KEY},  # from HEATLIFT_API_KEYS_FILE
    {"Authorization": f"Bearer {FILE_KEY}"},
]


def test_every_v1_operation_refuses_a_missing_or_wrong_key(guarded, document):
    failures = []
    for method, path in guarded_operations(document):
        for headers in REFUSED_HEADERS:
            r = call(guarded.url, method, path, headers)
            try:
                problem = refused(r, 401)
                assert "key" in problem["detail"].lower()
                assert r.headers.get("WWW-Authenticate", "").startswith("Bearer")
            except AssertionError:
                failures.append(f"{method} {path} {headers}: HTTP {r.status_code}")
    assert not failures, "\n".join(failures)


def test_every_v1_operation_accepts_a_right_key(guarded, document):
    failures = []
    for method, path in guarded_operations(document):
        for headers in ACCEPTED_HEADERS:
            r = call(guarded.url, method, path, headers)
            # not 401 is the point; the valid request of each operation also computes, but
            # a slow one may meet this server's one-second deadline (422)
            if r.status_code == 401 or r.status_code >= 500 or (
                    r.status_code != 200 and "deadline" not in r.text):
                failures.append(f"{method} {path} {headers}: HTTP {r.status_code} "
                                f"{r.text[:120]}")
    assert not failures, "\n".join(failures)


def test_a_right_key_gets_the_same_answer_as_no_keys_at_all(guarded, http):
    """The key check changes nothing else: the same request, the same result."""
    path, method = "/v1/saturation", "POST"
    with_key = call(guarded.url, method, path, {"X-API-Key": KEYS[0]}).json()
    without_keys = http.post(path, VALID[(method, path)][1]).json()
    with_key.pop("meta"), without_keys.pop("meta")
    assert with_key == without_keys


def test_health_and_ready_stay_open(guarded):
    for path in OPEN:
        for headers in ({}, {"Authorization": f"Bearer {WRONG}"}, {"X-API-Key": KEYS[0]}):
            r = requests.get(guarded.url + path, headers=headers, timeout=60)
            assert r.status_code == 200, (path, headers, r.text)


def test_documentation_and_metrics_stay_open(guarded):
    for path in ("/openapi.json", "/docs", "/metrics"):
        r = requests.get(guarded.url + path, timeout=60)
        assert r.status_code == 200, (path, r.status_code)


def test_an_unknown_v1_path_needs_a_key_too(guarded):
    """Without a key the caller learns nothing about which paths exist."""
    refused(requests.get(guarded.url + "/v1/nothing-here", timeout=60), 401)
    refused(requests.get(guarded.url + "/v1/health/../state", timeout=60), 401, 404)
    r = requests.get(guarded.url + "/v1/nothing-here", headers={"X-API-Key": KEYS[0]},
                     timeout=60)
    refused(r, 404)


def test_a_cors_preflight_needs_no_key(guarded):
    r = requests.options(guarded.url + "/v1/state", timeout=60, headers={
        "Origin": "https://tool.example.invalid", "Access-Control-Request-Method": "POST"})
    assert r.status_code == 204


def test_the_key_is_checked_before_the_body_is_read(guarded):
    """A caller without a key gets 401, whatever the body: too large, not JSON, too deep."""
    refused(requests.post(guarded.url + "/v1/state", data="x" * 10_000, timeout=60,
                          headers={"Content-Type": "application/json"}), 401)
    refused(requests.post(guarded.url + "/v1/state", data="[" * 3000, timeout=60,
                          headers={"Content-Type": "application/json"}), 401)
    refused(requests.post(guarded.url + "/v1/state", data="a=b", timeout=60,
                          headers={"Content-Type": "text/plain"}), 401)


# ----------------------------------------------------------------------------- limits

AUTH = {"X-API-Key": KEYS[0]}


def test_a_body_over_the_limit_is_413_naming_the_limit(guarded):
    body = {"refrigerant": "R134a", "pressure": 300, "temperature": 5, "x": "y" * 10_000}
    problem = refused(requests.post(guarded.url + "/v1/state", json=body, headers=AUTH,
                                    timeout=60), 413)
    assert "4096 bytes" in problem["detail"] and "HEATLIFT_MAX_BODY_BYTES" in problem["detail"]
    # the same without a Content-Length (chunked): counted as it arrives
    chunks = (json.dumps(body)[i:i + 1000].encode() for i in range(0, 10_100, 1000))
    problem = refused(requests.post(guarded.url + "/v1/state", data=chunks, timeout=60,
                                    headers={**AUTH, "Content-Type": "application/json"}), 413)
    assert "4096" in problem["detail"]
    csv_text = "model,refrigerant\n" + "x,R134a\n" * 2000
    refused(requests.post(guarded.url + "/v1/datasheets/validate", data=csv_text, timeout=60,
                          headers={**AUTH, "Content-Type": "text/csv"}), 413)
    # just under the limit is read
    small = {"refrigerant": "R134a", "pressure": 300, "temperature": 5}
    assert requests.post(guarded.url + "/v1/state", json=small, headers=AUTH,
                         timeout=60).status_code == 200


def test_rows_over_the_limit_are_413_naming_the_limit(guarded):
    rows = [dict(DATASHEET_ROW, model=f"T-{i}") for i in range(4)]
    problem = refused(requests.post(guarded.url + "/v1/datasheets/validate", json=rows,
                                    headers=AUTH, timeout=60), 413)
    assert "3 rows" in problem["detail"] and "HEATLIFT_MAX_ROWS" in problem["detail"]
    r = requests.post(guarded.url + "/v1/datasheets/validate", json=rows[:3], headers=AUTH,
                      timeout=60)
    assert r.status_code == 200, r.text[:300]


TRANSCRITICAL = {
    "refrigerant": "R744", "circuit": "transcritical",
    "evaporating": {"temperature": -8},
    "gas_cooler": {"outlet_temperature": 35, "pressure": "optimal"},
    "cooling_capacity": 30,
}


def metric(base: str, name: str, **labels: str) -> float:
    text = requests.get(base + "/metrics", timeout=60).text
    from prometheus_client.parser import text_string_to_metric_families

    total = 0.0
    for family in text_string_to_metric_families(text):
        for sample in family.samples:
            if sample.name == name and all(sample.labels.get(k) == v for k, v in labels.items()):
                total += sample.value
    return total


def test_a_calculation_over_the_deadline_is_422_and_frees_the_worker(guarded):
    """4000 transcritical cycles, each optimising its gas-cooler pressure, take far longer
    than the one-second deadline of this server: the worker stops at the deadline."""
    before = metric(guarded.url, "heatlift_solver_failures_total", kind="deadline")
    sweep = {"cycle": TRANSCRITICAL, "vary": "gas_cooler.outlet_temperature",
             "start": 30, "stop": 40, "step": 0.0025}
    started = time.perf_counter()
    r = requests.post(guarded.url + "/v1/cycle/sweep", json=sweep, headers=AUTH, timeout=60)
    elapsed = time.perf_counter() - started
    problem = refused(r, 422)
    assert "1 s" in problem["detail"] and "HEATLIFT_SOLVER_DEADLINE" in problem["detail"]
    assert elapsed < DEADLINE + 4.0, f"the worker was held {elapsed:.1f} s"
    # the worker serves on; the refusal is counted
    for _ in range(4):
        assert requests.get(guarded.url + "/v1/saturation", headers=AUTH, timeout=60, params={
            "refrigerant": "R744", "temperature": 0}).status_code == 200
    after = metric(guarded.url, "heatlift_solver_failures_total", kind="deadline")
    assert after == before + 1


# ------------------------------------------------------------------------------- logs


def test_no_key_is_ever_logged(guarded):
    """Run last in this module: every key above, right and wrong, was sent many times."""
    text = log_file(guarded.url).read_text("utf-8", errors="replace")
    assert "request" in text and "401" in text  # the log is the one of these requests
    for secret in (*KEYS, FILE_KEY, WRONG, KEYS[0][:-1]):
        assert secret not in text, f"{secret} appears in {log_file(guarded.url)}"
