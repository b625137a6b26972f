"""Saturation tables of the blends: built once, loaded by every worker.

A blend of fixed composition (R454B, R448A, ...) is a mixture to the property library, and its
saturation flashes solve the equality of every component's fugacity in both phases: 0.2 to
15 ms each, several per cycle. The library's pseudo-pure blends (R404A, R407C, R410A, R507A)
have no superancillary functions either (10 to 20 us a flash, against half a microsecond for a
pure fluid) and get tables the same way (their two-phase states are linear in quality).

The bubble line, the dew line and the two-phase states between them are smooth functions of
the pressure and the vapour fraction, so this module fits them once with Chebyshev series, in
the manner of the superancillary functions the library itself uses for pure fluids (Bell and
Deiters, AIChE J. 67 (2021) e17192), from the library's own flashes at the Chebyshev-Lobatto
nodes:

- bubble and dew lines: T, h, s, ln v as series in x = ln p, interval by interval;
- two-phase states: for each pressure interval, the normalised departures
  g_y(x, Q) = (y(p, Q) - y_bubble(p)) / (y_dew(p) - y_bubble(p)) for y = T, h, s, v, and the
  vapour mass fraction q(x, Q), as tensor-product series in x and the molar vapour fraction Q.

Each interval is checked at points between the nodes against fresh flashes and halved until
every property agrees to ``TOLERANCE`` (relative; the engine promises 1e-6); where the library's
flashes fail (close to the critical point) the table ends and the engine falls back on the
flashes themselves. The tables are built by :func:`build` (the command ``heatlift warm-tables``,
run at install or image build) and written to a JSON file whose name carries the library's
version and the catalogue's compositions, so a stale table is never used. When no table exists
the engine works without it: correct, slower.

SI units: Pa, K, J/kg, J/kg/K, m^3/kg.
"""

from __future__ import annotations

import bisect
import functools
import hashlib
import json
import math
import os
import tempfile
import threading
import time
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import CoolProp
import CoolProp.CoolProp as CP
import numpy as np

FORMAT = 2  # 2: each blend carries its limits (triple-point end, critical point)
TOLERANCE = 2e-8  # relative agreement required at the check points (50 times below 1e-6)
NX, NQ = 16, 16  # series degrees in x = ln p and in Q
WIDTH = 0.7  # initial interval width in ln p
MAX_HALVINGS = 3
LOW_TEMPERATURE = 200.0  # [K] the tables start at this dew point (or just above the triple point)
HIGH_FRACTION = 0.9  # and end at most at this fraction of the critical pressure

_lock = threading.Lock()
_loaded: dict[str, BlendTable] | None = None


# -- Chebyshev helpers --------------------------------------------------------------------------

def _lobatto(n: int) -> np.ndarray:
    """Chebyshev-Lobatto nodes cos(pi k / n) on [-1, 1] (from +1 down to -1)."""
    return np.cos(np.pi * np.arange(n + 1) / n)


def _coefficients(values: np.ndarray) -> np.ndarray:
    """Chebyshev coefficients (axis 0) of the values at the Lobatto nodes (axis 0), by the
    discrete cosine transform c_k = (2 / n) sum_j'' f_j cos(pi j k / n) (halved at k = 0, n)."""
    n = values.shape[0] - 1
    k = np.arange(n + 1)
    transform = np.cos(np.pi * np.outer(k, k) / n)
    weights = np.ones(n + 1)
    weights[0] = weights[-1] = 0.5
    a = (2.0 / n) * transform * weights[None, :]
    a[0] *= 0.5
    a[-1] *= 0.5
    return np.tensordot(a, values, axes=(1, 0))


def _basis(t: float, n: int) -> np.ndarray:
    """(T_0(t) ... T_n(t)) for t in [-1, 1]."""
    return np.cos(np.arange(n + 1) * math.acos(max(-1.0, min(1.0, t))))


_SAMPLES = 65  # samples of each saturation line per interval, for pressure_at's start


def _series_and_slope(t: float, coefficients: list[float]) -> tuple[float, float]:
    """sum c_k T_k(t) and its derivative sum c_k k U_(k-1)(t), by the three-term recurrences
    T_(k+1) = 2 t T_k - T_(k-1) and U_(k+1) = 2 t U_k - U_(k-1) (U the Chebyshev polynomials of
    the second kind; exact at the ends too)."""
    two_t = 2.0 * t
    t_prev, t_k = 1.0, t  # T_0, T_1
    u_prev, u_k = 0.0, 1.0  # U_-1, U_0
    value = coefficients[0] + coefficients[1] * t
    slope = coefficients[1]
    for k in range(2, len(coefficients)):
        t_prev, t_k = t_k, two_t * t_k - t_prev
        u_prev, u_k = u_k, two_t * u_k - u_prev
        c = coefficients[k]
        value += c * t_k
        slope += c * k * u_k
    return value, slope


# -- the table of one blend ---------------------------------------------------------------------

@dataclass(frozen=True)
class Interval:
    """One pressure interval [a, b] in x = ln p [ln Pa] and its series.

    ``line``: (NX + 1, 8) coefficients of T, h, s, ln v at the bubble line, then at the dew line;
    ``dome``: (NX + 1, NQ + 1, 5) coefficients of g_T, g_h, g_s, g_v and the mass fraction q.
    """

    a: float
    b: float
    line: np.ndarray
    dome: np.ndarray


class BlendTable:
    """Fitted saturation of one blend between ``pressure_min`` and ``pressure_max`` [Pa]."""

    def __init__(self, name: str, intervals: list[Interval],
                 limits: tuple[float, float, float, float] | None = None) -> None:
        self.name = name
        self.intervals = intervals
        # (lowest temperature [K], its bubble pressure [Pa], critical temperature [K],
        # critical pressure [Pa]) as the property model found them when the table was built
        self.limits = limits
        self.x_min, self.x_max = intervals[0].a, intervals[-1].b
        self.pressure_min, self.pressure_max = math.exp(self.x_min), math.exp(self.x_max)
        self._edges = [iv.a for iv in intervals]
        # the bubble (column 0) and dew (column 4) lines sampled densely, (T, x) in rising
        # order, for pressure_at's start: linear interpolation in them is within about 1e-6
        # in ln p of the series' own inverse
        t = np.linspace(-1.0, 1.0, _SAMPLES)
        basis = np.cos(np.outer(np.arccos(t), np.arange(NX + 1)))
        self._samples: dict[int, tuple[list[float], list[float]]] = {}
        for column in (0, 4):
            ts: list[float] = []
            xs: list[float] = []
            for iv in intervals:
                start = 1 if xs else 0  # an interval's first sample is the last one's end
                ts += (basis @ iv.line[:, column])[start:].tolist()
                xs += (iv.a + (t[start:] + 1.0) * 0.5 * (iv.b - iv.a)).tolist()
            self._samples[column] = (ts, xs)
        # the two lines' temperature series (and the bubble line's ln v) as plain lists, for
        # the Newton steps of pressure_at and the slopes of liquid_expansion
        self._columns = {column: [iv.line[:, column].tolist() for iv in intervals]
                         for column in (0, 3, 4)}

    def covers(self, pressure: float) -> bool:
        return self.pressure_min <= pressure <= self.pressure_max

    def _interval_index(self, x: float) -> int:
        """The last interval whose start is <= x (the first for x below them all)."""
        return max(0, bisect.bisect_right(self._edges, x) - 1)

    def _interval(self, x: float) -> Interval:
        return self.intervals[self._interval_index(x)]

    def lines(self, pressure: float) -> tuple[tuple[float, float, float, float],
                                              tuple[float, float, float, float]]:
        """((T, h, s, v) at the bubble line, (T, h, s, v) at the dew line) at ``pressure``."""
        x = math.log(pressure)
        iv = self._interval(x)
        values = _basis((2.0 * x - iv.a - iv.b) / (iv.b - iv.a), NX) @ iv.line
        t_b, h_b, s_b, lv_b, t_d, h_d, s_d, lv_d = values.tolist()
        return (t_b, h_b, s_b, math.exp(lv_b)), (t_d, h_d, s_d, math.exp(lv_d))

    def liquid_expansion(self, pressure: float) -> float:
        """d ln v / dT along the bubble line at ``pressure`` [1/K]: the saturated liquid's
        thermal expansion, from the slopes of the ln v and T series in x = ln p (a start for
        the subcooled liquid's density)."""
        x = math.log(pressure)
        k = self._interval_index(x)
        iv = self.intervals[k]
        t = (2.0 * x - iv.a - iv.b) / (iv.b - iv.a)
        _, d_t = _series_and_slope(t, self._columns[0][k])
        _, d_lv = _series_and_slope(t, self._columns[3][k])
        return d_lv / d_t if d_t > 0.0 else 0.0

    def two_phase(self, pressure: float, which: int, target: float
                  ) -> tuple[float, float, float, float, float] | None:
        """The two-phase state at ``pressure`` whose property number ``which`` (0 T [K], 1 h
        [J/kg], 2 s [J/kg/K], 4 mass fraction q [1]) equals ``target``: (T, h, s, v, q), found
        by Newton steps in Q on the series; None if no Q in [0, 1] gives it."""
        x = math.log(pressure)
        iv = self._interval(x)
        xh = (2.0 * x - iv.a - iv.b) / (iv.b - iv.a)
        bx = _basis(xh, NX)
        line = bx @ iv.line
        rows = np.tensordot(bx, iv.dome, axes=(0, 0))  # (NQ + 1, 5)
        bub, dew = line[:4], line[4:]
        bub_v, dew_v = math.exp(bub[3]), math.exp(dew[3])
        if which == 4:
            goal = target
        else:
            goal = (target - bub[which]) / (dew[which] - bub[which])
        if not -1e-12 <= goal <= 1.0 + 1e-12:
            return None
        row = rows[:, which].tolist()
        q_molar = goal
        for _ in range(30):
            value, slope = _series_and_slope(2.0 * q_molar - 1.0, row)
            error = value - goal
            derivative = 2.0 * slope
            if derivative <= 0.0:
                return None
            step = error / derivative
            q_molar = min(1.0, max(0.0, q_molar - step))
            if abs(step) <= 1e-6:  # after a step this short, within about its square (1e-12)
                break
        else:
            return None
        g = _basis(2.0 * q_molar - 1.0, NQ) @ rows
        temperature = bub[0] + (dew[0] - bub[0]) * g[0]
        enthalpy = bub[1] + (dew[1] - bub[1]) * g[1]
        entropy = bub[2] + (dew[2] - bub[2]) * g[2]
        volume = bub_v + (dew_v - bub_v) * g[3]
        return float(temperature), float(enthalpy), float(entropy), float(volume), float(g[4])

    def pressure_at(self, temperature: float, dew: bool) -> float | None:
        """The pressure [Pa] whose bubble (``dew`` False) or dew temperature is
        ``temperature`` [K]: Newton steps in x = ln p on the line's series; None outside."""
        column = 4 if dew else 0

        def line_t(x: float) -> tuple[float, float]:
            k = self._interval_index(x)
            iv = self.intervals[k]
            scale = 2.0 / (iv.b - iv.a)
            value, slope = _series_and_slope((2.0 * x - iv.a - iv.b) * scale / 2.0,
                                             self._columns[column][k])
            return value, slope * scale

        ts, xs = self._samples[column]
        if not ts[0] <= temperature <= ts[-1]:
            return None
        # T rises with ln p along a saturation line: linear interpolation between the samples
        # that bracket it, then Newton steps on the series
        k = min(bisect.bisect_right(ts, temperature), len(ts) - 1)
        t_a, t_b = ts[k - 1], ts[k]
        x = xs[k - 1] + (temperature - t_a) / (t_b - t_a) * (xs[k] - xs[k - 1]) \
            if t_b > t_a else xs[k]
        for _ in range(40):
            value, slope = line_t(x)
            if slope <= 0.0:
                return None
            step = (value - temperature) / slope
            x = min(self.x_max, max(self.x_min, x - step))
            if abs(step) <= 1e-5:  # ln p: after a step this short the pressure is within
                return math.exp(x)  # about its square (1e-10) of the series' root
        return None

    # -- storage -----------------------------------------------------------------------------

    def to_json(self) -> dict[str, Any]:
        return {"limits": list(self.limits) if self.limits else None,
                "intervals": [{"a": iv.a, "b": iv.b, "line": iv.line.tolist(),
                               "dome": iv.dome.tolist()} for iv in self.intervals]}

    @classmethod
    def from_json(cls, name: str, raw: dict[str, Any]) -> BlendTable:
        limits = raw.get("limits")
        return cls(name, [Interval(float(iv["a"]), float(iv["b"]), np.array(iv["line"]),
                                   np.array(iv["dome"])) for iv in raw["intervals"]],
                   tuple(float(v) for v in limits) if limits else None)  # type: ignore[arg-type]


# -- building -----------------------------------------------------------------------------------

def _blends() -> dict[str, tuple[tuple[str, ...], list[float]]]:
    """Catalogue blends: name -> (library fluids, mole fractions). The blends built from
    components, and the library's pseudo-pure blends (R404A, R407C, R410A, R507A: one fluid,
    fraction 1), whose saturation flashes have no fast path in the library (10 to 20 us each,
    against about half a microsecond for a pure fluid)."""
    from heatlift.refrigerants import catalogue

    out: dict[str, tuple[tuple[str, ...], list[float]]] = {}
    for name, entry in catalogue().items():
        fluids = entry.coolprop_fluids
        if not entry.is_blend:
            continue
        if len(fluids) < 2:
            out[name] = (fluids, [1.0])
            continue
        masses = [entry.composition[c] for c in entry.composition]
        molar = [CP.AbstractState("HEOS", f).molar_mass() for f in fluids]
        moles = [w / m for w, m in zip(masses, molar, strict=True)]
        out[name] = (fluids, [n / sum(moles) for n in moles])
    return out


@functools.cache
def fingerprint() -> str:
    """What a table depends on: format, fit settings, library version, compositions."""
    text = json.dumps([FORMAT, TOLERANCE, NX, NQ, WIDTH, LOW_TEMPERATURE, HIGH_FRACTION,
                       CoolProp.__version__, CoolProp.__gitrevision__,
                       sorted((k, v[0], v[1]) for k, v in _blends().items())])
    return hashlib.sha256(text.encode()).hexdigest()[:16]


def directory() -> Path:
    """Where tables live: ``$HEATLIFT_TABLES_DIR``, else ``$XDG_CACHE_HOME/heatlift``, else
    ``~/.cache/heatlift``."""
    given = os.environ.get("HEATLIFT_TABLES_DIR")
    if given:
        return Path(given)
    cache = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(cache) / "heatlift"


def table_path() -> Path:
    return directory() / f"blend-saturation-{fingerprint()}.json"


class _Flasher:
    """The library's saturation flashes of one blend: (T, h, s, v, q_mass) at (p, Q molar)."""

    def __init__(self, fluids: tuple[str, ...], fractions: list[float]) -> None:
        self.state = CP.AbstractState("HEOS", "&".join(fluids))
        self.state.set_mole_fractions(fractions)
        self.count = 0

    def __call__(self, pressure: float, q_molar: float) -> list[float]:
        self.count += 1
        s = self.state
        s.update(CP.PQ_INPUTS, pressure, q_molar)
        mass = q_molar if q_molar in (0.0, 1.0) else s.Qmass()
        return [s.T(), s.hmass(), s.smass(), 1.0 / s.rhomass(), mass]


def _fit_interval(flash: _Flasher, a: float, b: float) -> tuple[Interval, float]:
    """Series on [a, b] and the worst relative disagreement at the check points."""
    xs = 0.5 * (a + b) + 0.5 * (b - a) * _lobatto(NX)
    qs = 0.5 + 0.5 * _lobatto(NQ)
    line = np.empty((NX + 1, 8))
    dome = np.empty((NX + 1, NQ + 1, 5))
    for i, x in enumerate(xs):
        p = math.exp(x)
        bub, dew = flash(p, 0.0), flash(p, 1.0)
        line[i] = [bub[0], bub[1], bub[2], math.log(bub[3]), dew[0], dew[1], dew[2],
                   math.log(dew[3])]
        for j, q in enumerate(qs):
            if q >= 1.0:
                dome[i, j] = 1.0
            elif q <= 0.0:
                dome[i, j] = 0.0
            else:
                v = flash(p, float(q))
                dome[i, j, :4] = [(v[k] - bub[k]) / (dew[k] - bub[k]) for k in range(4)]
                dome[i, j, 4] = v[4]
    iv = Interval(a, b, _coefficients(line),
                  np.moveaxis(_coefficients(np.moveaxis(_coefficients(dome), 1, 0)), 0, 1))
    table = BlendTable("check", [iv])
    worst = 0.0
    for frac in (0.11, 0.37, 0.63, 0.89):
        x = a + frac * (b - a)
        p = math.exp(x)
        ref_b, ref_d = flash(p, 0.0), flash(p, 1.0)
        fit_b, fit_d = table.lines(p)
        for ref, fit in ((ref_b, fit_b), (ref_d, fit_d)):
            worst = max(worst, _disagreement(ref[:4], list(fit)))
        for q in (0.013, 0.29, 0.61, 0.97):
            ref = flash(p, q)
            found = table.two_phase(p, 1, ref[1])
            if found is None:
                return iv, math.inf
            worst = max(worst, _disagreement(ref, list(found)))
    return iv, worst


def _disagreement(ref: list[float], fit: list[float]) -> float:
    """Largest relative difference over T, h, s, v (and q): h and s relative to their size
    plus 10 kJ/kg and 10 J/kg/K (their zero is a convention), q absolute."""
    floors = (0.0, 1e4, 10.0, 0.0, 1.0)
    worst = 0.0
    for k, (r, f) in enumerate(zip(ref, fit, strict=False)):
        worst = max(worst, abs(f - r) / (abs(r) + floors[k]) if k != 4 else abs(f - r))
    return worst


def build_one(name: str, fluids: tuple[str, ...], fractions: list[float],
              critical_pressure: float, temperature_min: float,
              log: Callable[[str], None] = lambda _: None) -> BlendTable | None:
    """Fit the saturation of one blend (see the module's docstring); None if nothing fits."""
    flash = _Flasher(fluids, fractions)
    flash.state.update(CP.QT_INPUTS, 1.0, max(LOW_TEMPERATURE, temperature_min + 2.0))
    x_lo = math.log(flash.state.p())
    x_hi = math.log(HIGH_FRACTION * critical_pressure)
    count = max(1, math.ceil((x_hi - x_lo) / WIDTH))
    pending = [(x_lo + (x_hi - x_lo) * k / count, x_lo + (x_hi - x_lo) * (k + 1) / count, 0)
               for k in range(count)]
    intervals: list[Interval] = []
    while pending:
        a, b, depth = pending.pop(0)
        try:
            iv, worst = _fit_interval(flash, a, b)
        except ValueError:
            worst, iv = math.inf, None  # a flash failed: near the critical point
        if iv is not None and worst <= TOLERANCE:
            intervals.append(iv)
            continue
        if depth < MAX_HALVINGS:
            mid = 0.5 * (a + b)
            pending[:0] = [(a, mid, depth + 1), (mid, b, depth + 1)]
            continue
        if not intervals:  # nothing fits yet at the low end: start the table higher
            log(f"  {name}: no table below {math.exp(b) / 1e3:.1f} kPa "
                f"(disagreement {worst:.1e})")
            continue
        log(f"  {name}: the table ends at {math.exp(a) / 1e3:.0f} kPa "
            f"(disagreement {worst:.1e} above it)")
        break
    if not intervals:
        return None
    return BlendTable(name, intervals)


def build(names: Iterable[str] | None = None, path: Path | None = None,
          log: Callable[[str], None] = print) -> Path:
    """Build the tables of the catalogue's blends (or of ``names``) and write them to
    ``path`` (default :func:`table_path`); returns the path. Takes seconds to a minute."""
    from heatlift.properties import model

    blends = _blends()
    wanted = list(names) if names is not None else list(blends)
    out: dict[str, Any] = {"format": FORMAT, "fingerprint": fingerprint(),
                           "library": f"CoolProp {CoolProp.__version__}", "blends": {}}
    for name in wanted:
        fluids, fractions = blends[name]
        m = model(name)
        started = time.perf_counter()
        table = build_one(name, fluids, fractions, m.critical_pressure,
                          m.limits.temperature_min, log)
        if table is None:
            log(f"{name}: no table")
            continue
        lim = m.limits
        table.limits = (lim.temperature_min, lim.pressure_min, lim.critical_temperature,
                        lim.critical_pressure)
        out["blends"][name] = table.to_json()
        log(f"{name}: {len(table.intervals)} intervals, {table.pressure_min / 1e3:.1f} to "
            f"{table.pressure_max / 1e3:.0f} kPa, {time.perf_counter() - started:.1f} s")
    target = path or table_path()
    target.parent.mkdir(parents=True, exist_ok=True)
    with tempfile.NamedTemporaryFile("w", dir=target.parent, delete=False,
                                     suffix=".tmp") as handle:
        json.dump(out, handle)
    os.chmod(handle.name, 0o644)  # workers may run as another user than the build
    os.replace(handle.name, target)
    reset()
    return target


# -- loading ------------------------------------------------------------------------------------

def _load() -> dict[str, BlendTable]:
    path = table_path()
    try:
        raw = json.loads(path.read_text("utf-8"))
    except (OSError, ValueError):
        return {}
    if raw.get("format") != FORMAT or raw.get("fingerprint") != fingerprint():
        return {}
    try:
        return {name: BlendTable.from_json(name, t) for name, t in raw["blends"].items()}
    except (KeyError, TypeError, ValueError, IndexError):
        return {}


def table_for(name: str) -> BlendTable | None:
    """The loaded table of blend ``name``, or None (no table file, stale, or not covered)."""
    global _loaded
    if _loaded is None:
        with _lock:
            if _loaded is None:
                _loaded = _load()
    return _loaded.get(name)


def preload() -> int:
    """Read the table file now (a worker's warm-up); returns how many blends it covers."""
    table_for("")
    return len(_loaded or {})


def reset() -> None:
    """Forget the loaded tables (the next :func:`table_for` reads the file again)."""
    global _loaded
    with _lock:
        _loaded = None
