"""Targets 1 and 2: a single-stage cycle by the engine against the same cycle written plainly.

Pure fluids (and the library's pseudo-pure blends R404A, R407C, R410A, R507A, timed the same
way for target 2): the plain way is
a sequence of the library's high-level ``PropsSI`` calls, one call per output, computing the
same states the engine reports (temperature, enthalpy, entropy and density at the evaporator
outlet, the discharge, the condenser outlet and the evaporator inlet, the quality there, and the
two saturation pressures). A second, minimal sequence (only what the COP needs) is timed too.

Blends built from their components: the plain way is the straightforward mixture flashes on one
reused low-level state (temperature-quality, pressure-temperature, pressure-entropy and
pressure-enthalpy flashes without an imposed phase), which take hundreds of milliseconds each.

The engine's per-thread saturation cache is cleared before every engine solve and every
operating point is different, so nothing is reused between calls.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import CoolProp.CoolProp as CP

from heatlift import cycle
from heatlift.properties import model
from heatlift.refrigerants import catalogue
from tests.perf.timing import Conditions, interleaved, median, varied_conditions


def conditions_for(name: str, count: int, seed: int) -> list[Conditions]:
    """Operating points that exist for ``name``: R744 condenses below its critical point
    (31 degC), water evaporates above its triple point."""
    if name == "R744":
        return varied_conditions(count, seed, transcritical_safe=True)
    points = varied_conditions(count, seed)
    if name == "R718":
        return [Conditions(c.evaporating + 40.0, c.condensing + 20.0, c.superheat, c.subcooling,
                           c.isentropic_efficiency) for c in points]
    return points


def engine_spec(name: str, c: Conditions) -> cycle.CycleSpec:
    return cycle.CycleSpec(
        refrigerant=name,
        evaporating=cycle.SaturationSpec(temperature=c.evaporating),
        condensing=cycle.SaturationSpec(temperature=c.condensing),
        superheat=c.superheat,
        subcooling=c.subcooling,
        compressor=cycle.CompressorSpec(isentropic_efficiency=c.isentropic_efficiency),
        mass_flow=1.0,
    )


def engine_cycle(name: str, inputs: list[Conditions]) -> Callable[[Conditions], object]:
    """``cycle.solve`` on the spec of each of ``inputs`` (built before the clock starts, as the
    plain sequences get their inputs ready-made), with the thread's remembered saturation
    answers forgotten before each solve (Newton starts depend on the inputs alone)."""
    specs = {id(c): engine_spec(name, c) for c in inputs}  # (by identity: a cheap look-up)
    local = model(name)._local  # this thread's remembered saturation: emptied, never replaced
    forget, forget_sides = local.saturation.clear, local.light.clear

    def run(c: Conditions) -> object:
        forget()
        forget_sides()
        return cycle.solve(specs[id(c)])
    return run


def propssi_cycle(fluid: str) -> Callable[[Conditions], dict[str, float]]:
    """The cycle as a plain sequence of PropsSI calls, one per output (21 calls)."""
    P = CP.PropsSI

    def run(c: Conditions) -> dict[str, float]:
        pe = P("P", "T", c.evaporating, "Q", 1, fluid)
        pc = P("P", "T", c.condensing, "Q", 1, fluid)
        t1 = P("T", "P", pe, "Q", 1, fluid) + c.superheat
        h1 = P("H", "P", pe, "T", t1, fluid)
        s1 = P("S", "P", pe, "T", t1, fluid)
        d1 = P("D", "P", pe, "T", t1, fluid)
        h2s = P("H", "P", pc, "S", s1, fluid)
        h2 = h1 + (h2s - h1) / c.isentropic_efficiency
        t2 = P("T", "P", pc, "H", h2, fluid)
        s2 = P("S", "P", pc, "H", h2, fluid)
        d2 = P("D", "P", pc, "H", h2, fluid)
        t3 = P("T", "P", pc, "Q", 0, fluid) - c.subcooling
        h3 = P("H", "P", pc, "T", t3, fluid)
        s3 = P("S", "P", pc, "T", t3, fluid)
        d3 = P("D", "P", pc, "T", t3, fluid)
        t4 = P("T", "P", pe, "H", h3, fluid)
        s4 = P("S", "P", pe, "H", h3, fluid)
        d4 = P("D", "P", pe, "H", h3, fluid)
        q4 = P("Q", "P", pe, "H", h3, fluid)
        return {"pe": pe, "pc": pc, "t1": t1, "h1": h1, "s1": s1, "d1": d1, "h2": h2, "t2": t2,
                "s2": s2, "d2": d2, "t3": t3, "h3": h3, "s3": s3, "d3": d3, "t4": t4, "s4": s4,
                "d4": d4, "q4": q4, "cop": (h1 - h3) / (h2 - h1)}
    return run


def propssi_cycle_minimal(fluid: str) -> Callable[[Conditions], float]:
    """Only what the COP and discharge temperature need (8 PropsSI calls)."""
    P = CP.PropsSI

    def run(c: Conditions) -> float:
        pe = P("P", "T", c.evaporating, "Q", 1, fluid)
        pc = P("P", "T", c.condensing, "Q", 1, fluid)
        t1 = c.evaporating + c.superheat
        h1 = P("H", "P", pe, "T", t1, fluid)
        s1 = P("S", "P", pe, "T", t1, fluid)
        h2 = h1 + (P("H", "P", pc, "S", s1, fluid) - h1) / c.isentropic_efficiency
        P("T", "P", pc, "H", h2, fluid)
        h3 = P("H", "P", pc, "T", P("T", "P", pc, "Q", 0, fluid) - c.subcooling, fluid)
        return (h1 - h3) / (h2 - h1)
    return run


def mixture_flash_cycle(name: str) -> Callable[[Conditions], dict[str, float]]:
    """The cycle of a blend by the straightforward mixture flashes (no imposed phase)."""
    m = model(name)
    state = CP.AbstractState("HEOS", "&".join(m.refrigerant.coolprop_fluids))
    assert m._mole_fractions is not None
    state.set_mole_fractions(m._mole_fractions)

    def run(c: Conditions) -> dict[str, float]:
        state.update(CP.QT_INPUTS, 1.0, c.evaporating)
        pe = state.p()
        state.update(CP.QT_INPUTS, 1.0, c.condensing)
        pc = state.p()
        state.update(CP.PT_INPUTS, pe, c.evaporating + c.superheat)
        h1, s1, d1 = state.hmass(), state.smass(), state.rhomass()
        state.update(CP.PSmass_INPUTS, pc, s1)
        h2 = h1 + (state.hmass() - h1) / c.isentropic_efficiency
        state.update(CP.HmassP_INPUTS, h2, pc)
        t2, s2, d2 = state.T(), state.smass(), state.rhomass()
        state.update(CP.PQ_INPUTS, pc, 0.0)
        state.update(CP.PT_INPUTS, pc, state.T() - c.subcooling)
        h3, s3, d3 = state.hmass(), state.smass(), state.rhomass()
        state.update(CP.HmassP_INPUTS, h3, pe)
        return {"pe": pe, "pc": pc, "h1": h1, "s1": s1, "d1": d1, "h2": h2, "t2": t2, "s2": s2,
                "d2": d2, "h3": h3, "s3": s3, "d3": d3, "t4": state.T(), "s4": state.smass(),
                "d4": state.rhomass(), "q4": state.Q()}
    return run


@dataclass(frozen=True)
class CycleTiming:
    name: str
    baseline: float  # median seconds per cycle, the plain way
    engine: float  # median seconds per cycle, heatlift.cycle.solve
    minimal: float | None = None  # median, minimal PropsSI sequence (pure only)
    failures: tuple[str, ...] = ()  # engine solves that raised (blends)
    round_ratios: tuple[float, ...] = ()  # engine / baseline medians, round by round (pure)

    @property
    def ratio(self) -> float:
        """The median of the round-by-round ratios where there are rounds, else the ratio of
        the two medians. (This machine's speed changes by up to 1.5x for seconds at a time;
        within a round both contenders run within about 50 ms of each other, at one speed.)"""
        if self.round_ratios:
            return median(self.round_ratios)
        return self.engine / self.baseline


def pure_names() -> list[str]:
    """The catalogue's pure refrigerants (target 1)."""
    return [n for n, r in catalogue().items() if r.kind == "pure"]


def pseudo_pure_names() -> list[str]:
    """The blends that the property library models as single pseudo-pure fluids (R404A,
    R407C, R410A, R507A): blends, so target 2's, timed like the pure fluids against PropsSI
    on the same pseudo-pure model."""
    return [n for n, r in catalogue().items() if r.kind != "pure" and not model(n).is_mixture]


def blend_names() -> list[str]:
    return [n for n in catalogue() if model(n).is_mixture]


def time_pure(name: str, points: int = 32, rounds: int = 8) -> CycleTiming:
    """Both ways, round by round on fresh operating points (``points`` each, the same points
    for both contenders, none repeated across rounds), the engine's saturation answers
    forgotten before each solve: nothing is reused between calls.

    A round's block of engine solves must be long: after a block of the plain calls the
    engine's first few solves run up to 3x slower (the processor's caches and branch
    history hold the other contender's code), and only by about the tenth does it run as
    it does in a sweep; with 32 points the median is that of a sweep."""
    fluid = model(name).refrigerant.coolprop_fluids[0]
    seed = sum(map(ord, name))
    warm = conditions_for(name, 1, seed=seed - 1)
    engine_cycle(name, warm)(warm[0])  # the property model exists before timing
    times: dict[str, list[float]] = {"propssi": [], "minimal": [], "engine": []}
    ratios = []
    for r in range(rounds):
        inputs = conditions_for(name, points, seed=seed + r)
        found = interleaved({"propssi": propssi_cycle(fluid),
                             "minimal": propssi_cycle_minimal(fluid),
                             "engine": engine_cycle(name, inputs)}, inputs, 1)
        for k, v in found.items():
            times[k] += v
        ratios.append(median(found["engine"]) / median(found["propssi"]))
    return CycleTiming(name, median(times["propssi"]), median(times["engine"]),
                       median(times["minimal"]), round_ratios=tuple(ratios))


def time_blend(name: str, baseline_points: int = 2, engine_points: int = 40) -> CycleTiming:
    warm = conditions_for(name, 1, seed=7)
    engine_cycle(name, warm)(warm[0])
    base_inputs = conditions_for(name, baseline_points, seed=11)
    base = interleaved({"flashes": mixture_flash_cycle(name)}, base_inputs, 1)["flashes"]
    engine_inputs = conditions_for(name, engine_points, seed=13)
    solve = engine_cycle(name, engine_inputs)
    failures: list[str] = []

    def guarded(c: Conditions) -> None:
        try:
            solve(c)
        except Exception as exc:  # noqa: BLE001 - a benchmark counts failures, it does not stop
            failures.append(f"{c}: {exc}")

    eng = interleaved({"engine": guarded}, engine_inputs, 1)["engine"]
    return CycleTiming(name, median(base), median(eng), failures=tuple(failures))


if __name__ == "__main__":
    import sys

    from tests.perf.timing import fmt_time

    which = sys.argv[1:] or pure_names() + pseudo_pure_names() + blend_names()
    for n in which:
        t = time_pure(n) if not model(n).is_mixture else time_blend(n)
        extra = f" minimal {fmt_time(t.minimal)}" if t.minimal else ""
        print(f"{n:12s} baseline {fmt_time(t.baseline):>10s}{extra}  engine "
              f"{fmt_time(t.engine):>10s}  ratio {t.ratio:.4f}", flush=True)
        for f in t.failures:
            print("    engine failed:", f)
