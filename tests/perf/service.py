"""Targets 3, 4 and 5: HTTP throughput, start-up, and growth with rows.

A real gunicorn is started the way the tests start it (``heatlift serve``, two workers, on a
free loopback port). Load comes from a small pool of client threads on ``requests`` sessions,
more threads than workers, bounded in count and in time, loopback only.

- Target 3: requests per second of ``POST /v1/cycle`` (every body different) against
  ``GET /v1/health`` on the same server in the same run; p50 and p99 latencies; and one
  request's time split into schema loading, physics, schema dumping (units rendering) and JSON
  encoding, measured in-process with the app's own schemas.
- Target 4: the time from starting the server to ``/v1/ready`` answering 200 (all workers
  warm); in a fresh process, the property library's import, the warm-up the master does once
  before it forks, and the time a forked worker takes to answer its first cycle.
- Target 5: ``GET /v1/saturation/table`` and ``POST /v1/datasheets/validate`` with 1k and
  10k rows; time per row at both sizes.
"""

from __future__ import annotations

import math
import os
import random
import statistics
import subprocess
import sys
import threading
import time
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import requests

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from tests.conftest import start_server, stop_server  # noqa: E402


@dataclass(frozen=True)
class Load:
    requests_per_second: float
    p50: float
    p99: float
    count: int
    errors: int


def load(url: str, make: Callable[[random.Random, requests.Session], requests.Response],
         threads: int, seconds: float, max_requests: int) -> Load:
    """``threads`` clients send requests back to back for ``seconds`` (at most
    ``max_requests`` in all); wall-clock latency per request."""
    latencies: list[float] = []
    errors = [0]
    lock = threading.Lock()
    deadline = time.perf_counter() + seconds
    sent = [0]

    def client(seed: int) -> None:
        rng = random.Random(seed)
        with requests.Session() as session:
            while time.perf_counter() < deadline:
                with lock:
                    if sent[0] >= max_requests:
                        return
                    sent[0] += 1
                t0 = time.perf_counter()
                response = make(rng, session)
                dt = time.perf_counter() - t0
                with lock:
                    latencies.append(dt)
                    if response.status_code != 200:
                        errors[0] += 1

    started = time.perf_counter()
    pool = [threading.Thread(target=client, args=(k,)) for k in range(threads)]
    for t in pool:
        t.start()
    for t in pool:
        t.join()
    elapsed = time.perf_counter() - started
    ordered = sorted(latencies)
    return Load(len(ordered) / elapsed, statistics.median(ordered),
                ordered[min(len(ordered) - 1, int(0.99 * len(ordered)))], len(ordered), errors[0])


def cycle_body(rng: random.Random) -> dict:
    refrigerant = rng.choice(["R134a", "R32", "R290", "R717", "R1234yf", "R404A", "R410A",
                              "R454B", "R513A", "R448A", "R449A", "R452A"])
    return {
        "refrigerant": refrigerant,
        "evaporating": {"temperature": f"{rng.uniform(-20.0, 5.0):.4f} degC"},
        "condensing": {"temperature": f"{rng.uniform(30.0, 45.0):.4f} degC"},
        "superheat": f"{rng.uniform(3.0, 10.0):.4f} K",
        "subcooling": f"{rng.uniform(1.0, 5.0):.4f} K",
        "compressor": {"isentropic_efficiency": round(rng.uniform(0.6, 0.8), 5)},
        "cooling_capacity": f"{rng.uniform(5.0, 50.0):.3f} kW",
    }


def throughput(url: str, threads: int = 6, seconds: float = 8.0, rounds: int = 4
               ) -> tuple[Load, Load]:
    """(cycle, health), each for ``seconds`` in all, taking turns ``rounds`` times."""
    def post_cycle(rng: random.Random, s: requests.Session) -> requests.Response:
        return s.post(url + "/v1/cycle", json=cycle_body(rng), timeout=30)

    def get_health(rng: random.Random, s: requests.Session) -> requests.Response:
        return s.get(url + "/v1/health", timeout=30)

    runs = {"cycle": [], "health": []}
    for _ in range(rounds):  # alternate so that drift of the machine's load hits both
        runs["cycle"].append(load(url, post_cycle, threads, seconds / rounds, 20_000))
        runs["health"].append(load(url, get_health, threads, seconds / rounds, 20_000))
    return merge(runs["cycle"]), merge(runs["health"])


def merge(loads: list[Load]) -> Load:
    count = sum(x.count for x in loads)
    return Load(sum(x.requests_per_second * x.count for x in loads) / count,
                statistics.median(x.p50 for x in loads), max(x.p99 for x in loads), count,
                sum(x.errors for x in loads))


@dataclass(frozen=True)
class Split:
    schema_load: float
    physics: float
    schema_dump: float
    json_encode: float


def request_split(samples: int = 200) -> Split:
    """Median per-request CPU time [s] of each stage of POST /v1/cycle, in-process: the
    request schema's load (unit parsing, validation), the engine's solve, the reply schema's
    dump (unit rendering) and the JSON encoding, each as the service does it (shared schema
    instances, the compiled dump, orjson). The meta block needs an app context."""
    from api import create_app
    from api.encoding import to_json
    from api.output import reply, schema_instance
    from heatlift import cycle
    from schemas.cycle import CycleRequestSchema, CycleResultSchema
    from schemas.dumping import dump

    app = create_app()
    rng = random.Random(5)
    bodies = [cycle_body(rng) for _ in range(samples)]
    stages: dict[str, list[float]] = {k: [] for k in Split.__dataclass_fields__}
    clock = time.thread_time
    loader, result_schema = schema_instance(CycleRequestSchema), schema_instance(CycleResultSchema)
    with app.test_request_context("/v1/cycle", method="POST"):
        for body in bodies:
            t0 = clock()
            spec = loader.load(body)
            t1 = clock()
            result = cycle.solve(spec)
            t2 = clock()
            dumped = dump(result_schema, result)
            t3 = clock()
            to_json(dumped)
            t4 = clock()
            stages["schema_load"].append(t1 - t0)
            stages["physics"].append(t2 - t1)
            stages["schema_dump"].append(t3 - t2)
            stages["json_encode"].append(t4 - t3)
        reply(CycleResultSchema, result)  # the real reply path works on this result too
    return Split(**{k: statistics.median(v) for k, v in stages.items()})


@dataclass(frozen=True)
class Startup:
    ready: float  # launch of `heatlift serve` (2 workers) to /v1/ready answering 200 [s]
    library_import: float  # importing the property library (it loads every fluid) [s]
    warm_up: float  # importing heatlift and building every property model (tables read) [s]
    worker: float  # a worker forked from the warm master to its first cycle answered [s]


_WORKER_START = """
import os, sys, time
sys.path.insert(0, {root!r})
t0 = time.perf_counter()
import CoolProp.CoolProp
t1 = time.perf_counter()
from api import create_app
from heatlift.warmup import warm_up
app = create_app()
warm_up()
t2 = time.perf_counter()
body = {body!r}
read, write = os.pipe()
forked = time.perf_counter()
pid = os.fork()
if pid == 0:  # as a gunicorn worker: the preloaded app, first request
    client = app.test_client()
    ok = client.post("/v1/cycle", json=body).status_code == 200
    ok = ok and client.get("/v1/ready").status_code == 200
    os.write(write, f"{{time.perf_counter() - forked if ok else -1.0}}".encode())
    os._exit(0)
os.waitpid(pid, 0)
print(t1 - t0, t2 - t1, float(os.read(read, 64).decode()))
"""


def startup() -> Startup:
    """Launch to ready with 2 workers, then in a fresh process: the library's import, the
    warm-up (what the gunicorn master does once, before it forks), and one forked worker's
    time to its first cycle answer (what each worker adds)."""
    t0 = time.perf_counter()
    proc, url = start_server(workers=2)
    ready = time.perf_counter() - t0
    stop_server(proc)
    code = _WORKER_START.format(root=str(ROOT), body=cycle_body(random.Random(3)))
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         cwd=ROOT, check=True, env={**os.environ, "HEATLIFT_ACCESS_LOG":
                                                    "/dev/null"})
    library, warm, worker = (float(v) for v in out.stdout.strip().splitlines()[-1].split())
    return Startup(ready, library, warm, worker)


def growth(url: str, rounds: int = 3) -> dict[str, list[tuple[int, float]]]:
    """Seconds per request of a saturation table and of a datasheet validation at 1k and 10k
    rows: wall time of one request, the best of ``rounds`` rounds for 10k rows and of twice
    as many for 1k, the sizes taking turns. This machine's speed changes by up to 1.5x for
    seconds at a time; one slow second in the few that a 1k request takes moved the ratio of
    the two sizes by 0.3 with the best of two, taken one size after the other."""
    with requests.Session() as s:
        def table(rows: int) -> Callable[[], requests.Response]:
            step = 80.0 / rows
            params = {"refrigerant": "R134a", "by": "temperature", "start": "-40 degC",
                      "stop": f"{-40.0 + step * (rows - 1) + step / 2:.6f} degC",
                      "step": f"{step:.8f} K"}
            return lambda: s.get(url + "/v1/saturation/table", params=params, timeout=600)

        template = (ROOT / "examples" / "datasheets.csv").read_text("utf-8").splitlines()
        header = [line for line in template if not line.startswith("#")][0]
        data = [line for line in template if not line.startswith("#")][1:]

        def datasheet(rows: int) -> Callable[[], requests.Response]:
            body = "\n".join([header] + [data[k % len(data)] for k in range(rows)]) + "\n"
            return lambda: s.post(url + "/v1/datasheets/validate", data=body,
                                  headers={"Content-Type": "text/csv"}, timeout=600)

        out: dict[str, list[tuple[int, float]]] = {}
        for what, make in (("saturation_table", table), ("datasheet", datasheet)):
            small, large = make(1000), make(10000)
            best = {1000: math.inf, 10000: math.inf}
            for _ in range(rounds):
                best[1000] = min(best[1000], _timed(small), _timed(small))
                best[10000] = min(best[10000], _timed(large))
            out[what] = [(1000, best[1000]), (10000, best[10000])]
    return out


def _timed(send: Callable[[], requests.Response]) -> float:
    t0 = time.perf_counter()
    response = send()
    elapsed = time.perf_counter() - t0
    if response.status_code != 200:
        raise RuntimeError(f"{response.status_code}: {response.text[:300]}")
    return elapsed


def serve_for_benchmarks() -> tuple[subprocess.Popen, str]:
    os.environ.setdefault("HEATLIFT_MAX_TABLE_POINTS", "20000")
    os.environ.setdefault("HEATLIFT_ACCESS_LOG", "/dev/null")
    os.environ.setdefault("HEATLIFT_SOLVER_DEADLINE", "600")
    os.environ.setdefault("HEATLIFT_TIMEOUT", "600")
    return start_server(workers=2)


if __name__ == "__main__":
    proc, url = serve_for_benchmarks()
    try:
        c, h = throughput(url)
        print(f"cycle {c.requests_per_second:.0f}/s p50 {c.p50 * 1e3:.1f} ms p99 "
              f"{c.p99 * 1e3:.1f} ms ({c.count}, {c.errors} errors); health "
              f"{h.requests_per_second:.0f}/s p50 {h.p50 * 1e3:.1f} ms p99 {h.p99 * 1e3:.1f} ms;"
              f" ratio {c.requests_per_second / h.requests_per_second:.2f}")
        print(growth(url))
    finally:
        stop_server(proc)
    print(request_split())
    print(startup())
