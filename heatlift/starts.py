"""Newton starts for pure fluids from the property library's bicubic tables.

The engine's single-phase states are Newton solutions on the full equation of state
(:mod:`heatlift.flash`); how many evaluations a solve takes depends on its start. The
property library can interpolate bicubically in tables of the equation of state over
(ln p, h) and (ln p, T) (its ``BICUBIC&HEOS`` backend; Bell, Wronski, Quoilin and Lemort,
Ind. Eng. Chem. Res. 53 (2014) 2498-2508, for the library): a pressure-temperature,
pressure-enthalpy or pressure-entropy lookup there costs about a microsecond and lands, near
the states of a refrigeration cycle, within about 1e-6 of the equation of state's answer
(1e-5 to 1e-3 next to the critical point). From there one evaluation and one step without
evaluation (:func:`heatlift.flash._last_step`) usually finish the solve, where a start from
the saturated state needs two to four. The tables give starts only, never answers: the
Newton steps on the equation of state decide every figure, and the engine's states are the
same with or without them to far below its 1e-6 promise.

The library builds such tables in seconds per fluid and writes them to a folder; building is
done once, by ``heatlift warm-tables`` (at install or image build), into
``$HEATLIFT_TABLES_DIR/library-<fingerprint>/``. A process only reads tables that were built
there (a fluid without them simply starts its solves from saturation): it never builds them.
Each fluid's tables are read when its property model is made; the service's master process
makes them all before it forks its workers, which share them. They take about 25 MB per fluid
on the 100 x 100 grid, 115 MB on the finer grid of :data:`FINER`, about 0.7 GB for the whole
catalogue, and 2.5 s to read; ``HEATLIFT_LIBRARY_TABLES=0`` turns them off.

Pure fluids and the library's pseudo-pure blends only: a blend built from components has no
such tables in the library.
"""

from __future__ import annotations

import functools
import hashlib
import json
import os
import shutil
import threading
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import Any

import CoolProp
import CoolProp.CoolProp as CP

from heatlift import properties_tables

GRID = 100  # nodes along each axis of the library's tables
# fluids whose tables span so wide a range that 100 nodes leave Newton starts near the cycle
# states about 3e-5 (propane, propene: triple points near 86 K and 1e-4 Pa) to 1e-3 (carbon
# dioxide, up to 2000 K and 800 MPa, next to its critical point) away from the answer, a
# second evaluation per solve (measured with tests/perf; the others land within 1e-5)
FINER = {"n-Propane": 200, "Propylene": 200, "CarbonDioxide": 200}
BACKEND = "BICUBIC&HEOS"
_MARKER = "built.json"
# what the library writes per fluid (and reads back)
_FILES = ("single_phase_logph.bin.z", "single_phase_logpT.bin.z", "pure_saturation.bin.z")

_lock = threading.Lock()


@functools.cache
def fingerprint() -> str:
    """What the tables depend on: the grid and the library's version."""
    text = json.dumps([GRID, sorted(FINER.items()), CoolProp.__version__,
                       CoolProp.__gitrevision__])
    return hashlib.sha256(text.encode()).hexdigest()[:16]


def directory() -> Path:
    """The folder of the library's tables (beside the blends' tables)."""
    return properties_tables.directory() / f"library-{fingerprint()}"


def enabled() -> bool:
    return os.environ.get("HEATLIFT_LIBRARY_TABLES", "1") not in ("0", "false", "no", "off")


def grid(fluid: str) -> int:
    """Nodes along each axis of ``fluid``'s tables."""
    return FINER.get(fluid, GRID)


def _configure(folder: Path, fluid: str) -> None:
    """Point the library at ``folder`` with ``fluid``'s grid (its settings are global to the
    process and read when a table state is made: a grid other than the one a table was built
    with makes the library build it again; nothing else in heatlift uses tabular backends)."""
    CP.set_config_string(CoolProp.ALTERNATIVE_TABLES_DIRECTORY, str(folder) + os.sep)
    CP.set_config_int(CoolProp.TABULAR_NX, grid(fluid))
    CP.set_config_int(CoolProp.TABULAR_NY, grid(fluid))


def built() -> frozenset[str]:
    """The library fluids whose tables ``heatlift warm-tables`` built and that are still on
    disk (empty when none): a fluid whose folder is gone is left out, since the library would
    otherwise build its tables on the spot."""
    folder = directory()
    try:
        raw = json.loads((folder / _MARKER).read_text("utf-8"))
    except (OSError, ValueError):
        return frozenset()
    if raw.get("fingerprint") != fingerprint() or not isinstance(raw.get("fluids"), dict):
        return frozenset()
    return frozenset(fluid for fluid, sub in raw["fluids"].items()
                     if all((folder / str(sub) / f).is_file() for f in _FILES))


def build(fluids: Iterable[str], log: Callable[[str], None] = print) -> Path:
    """Build the library's tables of ``fluids`` (library names) afresh; returns the folder."""
    import time

    folder = directory()
    shutil.rmtree(folder, ignore_errors=True)
    folder.mkdir(parents=True, exist_ok=True)
    done: dict[str, str] = {}
    with _lock:
        for fluid in fluids:
            _configure(folder, fluid)
            started = time.perf_counter()
            before = {p.name for p in folder.iterdir()}
            try:
                CP.AbstractState(BACKEND, fluid)
            except ValueError as exc:
                log(f"{fluid}: no library tables ({exc})")
                continue
            made = sorted({p.name for p in folder.iterdir()} - before)
            if len(made) != 1:
                log(f"{fluid}: the library wrote no table folder")
                continue
            done[fluid] = made[0]
            log(f"{fluid}: library tables, {time.perf_counter() - started:.1f} s")
    for path in folder.rglob("*"):
        os.chmod(path, 0o755 if path.is_dir() else 0o644)  # workers may run as another user
    (folder / _MARKER).write_text(json.dumps({"fingerprint": fingerprint(), "fluids": done}),
                                  "utf-8")
    reset()
    return folder


def catalogue_fluids() -> list[str]:
    """The library fluids of the catalogue's pure refrigerants and pseudo-pure blends."""
    from heatlift.refrigerants import catalogue

    return [r.coolprop_fluids[0] for r in catalogue().values() if len(r.coolprop_fluids) == 1]


@functools.cache
def _available() -> frozenset[str]:
    return built() if enabled() else frozenset()


def reset() -> None:
    """Forget what was read about the tables (after a build, or in tests)."""
    _available.cache_clear()


class Starts(threading.local):
    """The tables of one fluid, as table states per thread, giving (T [K], rho [kg/m^3])
    starts. (A thread-local object: each thread opens its own states on first use; the tables
    themselves are read once per process and shared by every state of the fluid.) One state
    per imposed phase, the phase imposed once for good: a look-up is then one update."""

    def __init__(self, fluid: str) -> None:
        self.fluid = fluid
        self.state: CP.AbstractState | None = None
        self.phased: dict[Any, CP.AbstractState] = {}  # by imposed phase, this thread's
        if fluid in _available():
            self.state = self._open()

    def _open(self) -> CP.AbstractState | None:
        with _lock:
            _configure(directory(), self.fluid)
            try:
                return CP.AbstractState(BACKEND, self.fluid)
            except ValueError:
                return None

    def state_for(self, phase: Any) -> CP.AbstractState | None:
        """This thread's table state with ``phase`` imposed (opened on first use; the hot
        path, PropertyModel._tabled, reads :attr:`phased` first); None where there are no
        tables. Its ``update`` with a library input pair gives the start (T, rho)."""
        state = self.phased.get(phase)
        if state is None and self.state is not None:
            state = self._open()
            if state is not None:
                state.specify_phase(phase)
                self.phased[phase] = state
        return state
