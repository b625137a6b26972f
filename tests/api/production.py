"""Helpers for the production tests (issue 7): a valid request for every operation, the
processes of a running gunicorn, and a bounded concurrent load over plain HTTP/1.1.

The load client is ``http.client`` on fresh connections (the sync workers close every
connection), so that the client spends as little of the machine's CPU as it can: the tests run
client and server on the same two cores.
"""

from __future__ import annotations

import http.client
import json
import os
import threading
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any
from urllib.parse import urlencode, urlsplit

from tests.conftest import start_server, stop_server

# ----------------------------------------------------------------------- valid requests

R454B_CHILLER = {
    "refrigerant": "R454B",
    "evaporating": {"temperature": -6}, "condensing": {"temperature": 40},
    "superheat": 5, "subcooling": 3,
    "compressor": {"isentropic_efficiency": 0.68},
    "cooling_capacity": "18 kW",
}
SUCTION_LINE = {
    "refrigerant": "R454B", "cooling_capacity": "18 kW",
    "evaporating": {"temperature": -6}, "condensing": {"temperature": 40},
    "superheat": 5, "subcooling": 3, "isentropic_efficiency": 0.65,
    "line": "suction", "length": 25, "rise": 6,
    "fittings": [{"type": "elbow_90_long_radius", "count": 8}],
}
POLYNOMIAL = {
    "refrigerant": "R134a", "basis": "SI",
    # invented coefficients of a small compressor (SI basis: W, kg/s, A over degC)
    "coefficients": {"power": [1800.0, -25.0, 50.0, 0.1, 0.2, 0.3, 0, 0, 0, 0],
                     "mass_flow": [0.06, 0.0019, -0.00025, 0.00002, 0, 0, 0, 0, 0, 0]},
    "rating": {"superheat": 10, "subcooling": 0},
    "evaporating_temperature": -10, "condensing_temperature": 45,
    "superheat": 20, "subcooling": 5, "displacement": "30 m^3/h",
}
# an invented datasheet row (the engine checks it; pass or fail does not matter here)
DATASHEET_ROW = {
    "model": "T-1", "refrigerant": "R134a", "evaporating_temperature": -10,
    "condensing_temperature": 45, "superheat": 10, "subcooling": 5,
    "cooling_capacity": 7.5, "power": 2.9, "mass_flow": 0.05,
}
CHARGE = {
    "refrigerant": "R290",
    "evaporating": {"temperature": 0}, "condensing": {"temperature": 45},
    "cooling_capacity": 7,
    "lines": [{"line": "liquid", "length": 8, "inside_diameter": 7.9},
              {"line": "suction", "length": 8, "inside_diameter": 13.8}],
    "heat_exchangers": [{"role": "evaporator", "internal_volume": 2.5},
                        {"role": "condenser", "internal_volume": 2.0}],
    "space": {"floor_area": 12, "room_height": 2.5, "installation_height": "floor"},
}

#: one valid request per operation of the OpenAPI document: (method, path) -> (query, body).
#: A new operation needs an entry here (test_openapi_fuzz_api.py says which is missing).
VALID: dict[tuple[str, str], tuple[dict[str, Any], Any]] = {
    ("GET", "/v1/health"): ({}, None),
    ("GET", "/v1/ready"): ({}, None),
    ("GET", "/v1/version"): ({}, None),
    ("GET", "/v1/refrigerants"): ({}, None),
    ("GET", "/v1/refrigerants/{designation}"): ({"designation": "R454B"}, None),
    ("GET", "/v1/saturation"): ({"refrigerant": "R134a", "temperature": "5"}, None),
    ("POST", "/v1/saturation"): ({}, {"refrigerant": "R454B", "pressure": "8 bar"}),
    ("GET", "/v1/saturation/table"): ({"refrigerant": "R32", "start": "-20", "stop": "20",
                                       "step": "10"}, None),
    # subcooled liquid: superheat is null in the reply (a nullable quantity)
    ("POST", "/v1/state"): ({}, {"refrigerant": "R134a", "pressure": "1000 kPa",
                                 "temperature": "30 degC"}),
    ("GET", "/v1/cycle"): ({"refrigerant": "R134a", "evaporating_temperature": "-10",
                            "condensing_temperature": "40", "cooling_capacity": "10"}, None),
    ("POST", "/v1/cycle"): ({}, R454B_CHILLER),
    ("POST", "/v1/cycle/sweep"): ({}, {"cycle": R454B_CHILLER, "vary": "condensing.temperature",
                                       "start": "30 degC", "stop": "50 degC", "step": 10}),
    ("POST", "/v1/cycle/diagram"): ({}, {k: v for k, v in R454B_CHILLER.items()
                                         if k != "compressor"}),
    ("POST", "/v1/lines/size"): ({}, SUCTION_LINE),
    ("POST", "/v1/lines/check"): ({}, {**SUCTION_LINE, "size": "1-1/8"}),
    ("GET", "/v1/lines/tubes"): ({"standard": "ASTM B280"}, None),
    ("GET", "/v1/lines/fittings"): ({}, None),
    ("POST", "/v1/charge"): ({}, CHARGE),
    ("POST", "/v1/compressors/polynomial"): ({}, POLYNOMIAL),
    ("POST", "/v1/datasheets/validate"): ({}, [DATASHEET_ROW]),
    ("GET", "/docs"): ({}, None),
}


def operations(document: dict[str, Any]) -> list[tuple[str, str]]:
    """(METHOD, path) of every operation in an OpenAPI document."""
    methods = ("get", "put", "post", "delete", "patch")
    return [(m.upper(), path) for path, item in document["paths"].items()
            for m in methods if m in item]


def concrete(path: str, query: dict[str, Any]) -> tuple[str, dict[str, Any]]:
    """The path with its {parameters} filled from ``query``; the rest of the query."""
    rest = dict(query)
    for name in list(rest):
        if "{" + name + "}" in path:
            path = path.replace("{" + name + "}", str(rest.pop(name)))
    return path, rest


# ---------------------------------------------------------------------------- problems


def refused(response, *statuses: int) -> dict:
    """A 4xx problem+json (one of ``statuses`` when given); returns the problem."""
    text = response.text
    assert 400 <= response.status_code < 500, (response.status_code, text[:600])
    if statuses:
        assert response.status_code in statuses, (response.status_code, text[:600])
    assert response.headers["Content-Type"].startswith("application/problem+json"), (
        response.headers["Content-Type"], text[:300])
    body = response.json()
    for key in ("type", "title", "status", "detail"):
        assert key in body, (key, body)
    assert body["status"] == response.status_code
    assert isinstance(body["detail"], str) and body["detail"]
    assert "Traceback" not in text and 'File "' not in text
    return body


# ------------------------------------------------------------------------- processes


def log_file(url: str) -> Path:
    """The log file tests/conftest.py start_server writes for the server at ``url``."""
    return Path(os.environ.get("TMPDIR", "/tmp")) / f"heatlift-test-{urlsplit(url).port}.log"


def log_entries(url: str) -> list[dict[str, Any]]:
    """Every line of the server's log that is a JSON object."""
    found = []
    for line in log_file(url).read_text("utf-8", errors="replace").splitlines():
        if line.startswith("{"):
            try:
                found.append(json.loads(line))
            except ValueError:  # a line that only starts like JSON is not a log record
                continue
    return found


def children(pid: int) -> list[int]:
    """Pids of the live child processes of ``pid`` (gunicorn's workers, for the master),
    from the parent field of /proc/<pid>/stat (no psutil needed)."""
    found = []
    for entry in Path("/proc").iterdir():
        if not entry.name.isdigit():
            continue
        try:
            stat = (entry / "stat").read_text()
        except OSError:
            continue
        # "pid (comm) state ppid ...": comm may hold spaces and parentheses
        fields = stat[stat.rindex(")") + 2:].split()
        if int(fields[1]) == pid and fields[0] not in ("Z", "X"):
            found.append(int(entry.name))
    return sorted(found)


def rss_kib(pid: int) -> int:
    """Resident memory of a process [KiB] (VmRSS of /proc/<pid>/status)."""
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1])
    raise LookupError(f"no VmRSS for {pid}")


@dataclass
class Server:
    proc: Any
    url: str

    @property
    def master(self) -> int:
        return int(self.proc.pid)

    def workers(self) -> list[int]:
        return children(self.master)

    def log_text(self) -> str:
        return log_file(self.url).read_text("utf-8", errors="replace")

    def log_entries(self) -> list[dict[str, Any]]:
        return log_entries(self.url)


@contextmanager
def serving(env: dict[str, str], workers: int = 2) -> Iterator[Server]:
    """A ``heatlift serve`` of its own (tests/conftest.py start_server) for one module."""
    proc, url = start_server(env=env, workers=workers)
    try:
        yield Server(proc, url)
    finally:
        stop_server(proc)


# ------------------------------------------------------------------------------ load


@dataclass(frozen=True)
class Call:
    """One request: ``name`` groups it in the report."""

    name: str
    method: str
    path: str
    query: dict[str, Any] = field(default_factory=dict)
    body: Any = None
    headers: dict[str, str] = field(default_factory=dict)
    expect: int = 200

    def target(self) -> str:
        return self.path + ("?" + urlencode(self.query) if self.query else "")


@dataclass(frozen=True)
class Outcome:
    index: int
    name: str
    status: int | None  # None: the connection failed
    error: str | None
    seconds: float
    started: float  # [s] since the run began
    expected: int = 200

    @property
    def ok(self) -> bool:
        return self.status == self.expected


def send(base: str, call: Call, timeout: float = 60.0) -> tuple[int, dict[str, str], bytes]:
    """One request on a fresh connection: (status, headers, body)."""
    parts = urlsplit(base)
    conn = http.client.HTTPConnection(parts.hostname, parts.port, timeout=timeout)
    try:
        headers = dict(call.headers)
        data = None
        if call.body is not None:
            data = json.dumps(call.body).encode("utf-8")
            headers.setdefault("Content-Type", "application/json")
        conn.request(call.method, call.target(), body=data, headers=headers)
        response = conn.getresponse()
        return response.status, dict(response.getheaders()), response.read()
    finally:
        conn.close()


@dataclass
class LoadResult:
    outcomes: list[Outcome]
    elapsed: float
    began: float  # time.perf_counter() when the run began

    @property
    def failed(self) -> list[Outcome]:
        return [o for o in self.outcomes if not o.ok]

    def latency_ms(self, quantile: float) -> float:
        ordered = sorted(o.seconds for o in self.outcomes if o.status is not None)
        if not ordered:
            return float("nan")
        return ordered[min(len(ordered) - 1, int(quantile * len(ordered)))] * 1e3

    def summary(self, title: str) -> str:
        by_name: dict[str, int] = {}
        for o in self.outcomes:
            by_name[o.name] = by_name.get(o.name, 0) + 1
        return (f"{title}: {len(self.outcomes)} requests in {self.elapsed:.1f} s "
                f"({len(self.outcomes) / max(self.elapsed, 1e-9):.0f}/s), "
                f"{len(self.failed)} failed, p50 {self.latency_ms(0.50):.1f} ms, "
                f"p99 {self.latency_ms(0.99):.1f} ms; {by_name}")


def run_load(base: str, make: Callable[[int], Call], threads: int, max_requests: int,
             max_seconds: float, stop: threading.Event | None = None,
             progress: Callable[[int], None] | None = None) -> LoadResult:
    """``threads`` clients send ``make(i)`` for i = 0, 1, ... until ``max_requests`` were
    sent, ``max_seconds`` passed or ``stop`` is set, whichever comes first."""
    stop = stop or threading.Event()
    lock = threading.Lock()
    counter = iter(range(max_requests))
    outcomes: list[Outcome] = []
    began = time.perf_counter()
    deadline = began + max_seconds

    def client() -> None:
        while not stop.is_set() and time.perf_counter() < deadline:
            with lock:
                index = next(counter, None)
            if index is None:
                return
            call = make(index)
            started = time.perf_counter()
            try:
                status, _, _ = send(base, call)
                error = None
            except (OSError, http.client.HTTPException) as exc:
                status, error = None, f"{type(exc).__name__}: {exc}"
            outcome = Outcome(index, call.name, status, error, time.perf_counter() - started,
                              started - began, call.expect)
            with lock:
                outcomes.append(outcome)
                done = len(outcomes)
            if progress is not None:
                progress(done)

    workers = [threading.Thread(target=client, daemon=True) for _ in range(threads)]
    for worker in workers:
        worker.start()
    for worker in workers:
        worker.join(max_seconds + 120)
    return LoadResult(sorted(outcomes, key=lambda o: o.index), time.perf_counter() - began,
                      began)


REFRIGERANTS = ("R134a", "R32", "R410A", "R454B", "R290", "R744", "R717", "R1234yf")


def mixed(index: int) -> Call:
    """The mixed load: saturation (GET and POST), state, cycle, sweep and the catalogue, each
    with a different temperature or refrigerant from request to request."""
    refrigerant = REFRIGERANTS[index % len(REFRIGERANTS)]
    t = -30 + (index * 7) % 50  # -30 .. 19 degC, inside every catalogue fluid's range
    kind = index % 10
    if kind in (0, 1, 2):
        return Call("saturation", "GET", "/v1/saturation",
                    {"refrigerant": refrigerant, "temperature": f"{t} degC"})
    if kind == 3:
        return Call("saturation-post", "POST", "/v1/saturation",
                    body={"refrigerant": refrigerant, "temperature": t + 0.5})
    if kind in (4, 5):
        return Call("state", "POST", "/v1/state",
                    body={"refrigerant": "R134a", "pressure": "300 kPa",
                          "temperature": f"{t + 10} degC"})
    if kind in (6, 7):
        body = dict(R454B_CHILLER, evaporating={"temperature": -15 + index % 10})
        return Call("cycle", "POST", "/v1/cycle", body=body)
    if kind == 8:
        return Call("sweep", "POST", "/v1/cycle/sweep",
                    body={"cycle": R454B_CHILLER, "vary": "condensing.temperature",
                          "start": 30, "stop": 45, "step": 5})
    return Call("refrigerants", "GET", "/v1/refrigerants/" + refrigerant)
