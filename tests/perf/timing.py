"""Timing helpers shared by the benchmarks: varied inputs, interleaved rounds, medians.

The machines are small (2 cores) and shared, so every comparison runs its contenders
interleaved, round after round, on the same inputs, and reports medians of per-call times; a
ratio is the ratio of the two medians. Calls are timed by the calling thread's CPU time
(``time.thread_time``): on a machine where other processes compete for the two cores, wall
time would add the time spent waiting for a core to whichever contender happened to wait. The
HTTP benchmark, where waiting is part of the service, uses wall time.
"""

from __future__ import annotations

import random
import statistics
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

C = 273.15


@dataclass(frozen=True)
class Conditions:
    """One operating point of a single-stage cycle [K, K, K, K, 1]."""

    evaporating: float
    condensing: float
    superheat: float
    subcooling: float
    isentropic_efficiency: float


def varied_conditions(count: int, seed: int, transcritical_safe: bool = False) -> list[Conditions]:
    """``count`` different operating points: evaporating -20..+5 degC, condensing 30..45 degC
    (R744: -30..-5 and 5..25 degC), superheat 3..12 K, subcooling 1..6 K, efficiency 0.6..0.8
    (R32's discharge then stays below the top of its equation of state, 435 K). Every value
    is drawn afresh, so no two calls share a saturation pressure (the engine's per-thread
    saturation cache, keyed by exact pressure, cannot help across calls)."""
    rng = random.Random(seed)
    out = []
    for _ in range(count):
        te = rng.uniform(-20.0, 5.0) if not transcritical_safe else rng.uniform(-30.0, -5.0)
        tc = rng.uniform(30.0, 45.0) if not transcritical_safe else rng.uniform(5.0, 25.0)
        out.append(Conditions(te + C, tc + C, rng.uniform(3.0, 12.0), rng.uniform(1.0, 6.0),
                              rng.uniform(0.6, 0.8)))
    return out


def per_call(fn: Callable[[Any], Any], inputs: Sequence[Any]) -> list[float]:
    """Seconds per call of ``fn`` over ``inputs``, one timing per input."""
    times = []
    clock = time.thread_time
    for x in inputs:
        t0 = clock()
        fn(x)
        times.append(clock() - t0)
    return times


def interleaved(contenders: dict[str, Callable[[Any], Any]], inputs: Sequence[Any],
                rounds: int) -> dict[str, list[float]]:
    """Per-call times of each contender over ``inputs``, contenders taking turns block by
    block: contender A runs all inputs, then B, ..., ``rounds`` times over. Blocks (rather than
    alternating call by call) let each contender run as it would in a service doing many
    calls, with its own code and data in the processor's caches; taking turns spreads any
    drift of the machine's load over all contenders alike."""
    times: dict[str, list[float]] = {k: [] for k in contenders}
    clock = time.thread_time
    for _ in range(rounds):
        for name, fn in contenders.items():
            bucket = times[name]
            for x in inputs:
                t0 = clock()
                fn(x)
                bucket.append(clock() - t0)
    return times


def median(values: Sequence[float]) -> float:
    return statistics.median(values)


def percentile(values: Sequence[float], q: float) -> float:
    ordered = sorted(values)
    k = min(len(ordered) - 1, max(0, round(q / 100.0 * (len(ordered) - 1))))
    return ordered[k]


def fmt_time(seconds: float) -> str:
    if seconds < 1e-3:
        return f"{seconds * 1e6:.1f} us"
    if seconds < 1.0:
        return f"{seconds * 1e3:.2f} ms"
    return f"{seconds:.2f} s"
