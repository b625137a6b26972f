"""What a pressure-enthalpy chart of a solved cycle shows, as numbers (no drawing here).

All values SI: specific enthalpy h [J/kg], absolute pressure p [Pa], temperature [K]. A point is
an ``(h, p)`` pair. :func:`chart_data` gathers, for one :class:`~heatlift.cycle.CycleResult`:

- the saturation dome: the bubble curve (q = 0) and the dew curve (q = 1), from a lower
  pressure bound below the cycle's lowest pressure (never below the triple point) up to just
  below the critical pressure;
- isotherms at the given temperatures through the liquid, two-phase and vapour regions (above
  the critical pressure as well, for a transcritical cycle);
- the cycle path, one :class:`Segment` per process, and the states numbered in flow order
  (states at the same point of the chart share a number).

How each process is drawn:

- compression: the polytropic path through suction (1) and discharge (2). For an ideal gas on
  a path ``p v^n = const``, ``T ~ p^((n-1)/n)`` and ``ds = cp dT/T - R dp/p`` is a constant
  times ``d ln p``, so the entropy is linear in ``ln p``:
  ``s(p) = s1 + (s2 - s1) ln(p/p1) / ln(p2/p1)``, and each point is the state ``h(p, s(p))``
  of the refrigerant's own equation of state. Where one of these states cannot be evaluated,
  the whole compression falls back to a straight line in ``ln p``-``h`` (``Segment.method``
  says which was used);
- throttling: constant enthalpy, a vertical line;
- evaporation, condensation, gas cooling, desuperheating, subcooling, mixing: straight lines
  between the states (horizontal where the pressure is constant; a pressure drop tilts them).

Only :mod:`heatlift.properties` methods are used for the thermodynamics.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from functools import cache

from heatlift.cycle.result import CyclePoint, CycleResult
from heatlift.errors import NotConverged, OutOfRange, PropertyFailure, SIValue
from heatlift.properties import PropertyModel, State, model

Point = tuple[float, float]  # (specific enthalpy [J/kg], absolute pressure [Pa])

# how far the chart reaches beyond the cycle's pressures, as factors [1]
BELOW_LOWEST = 2.0
ABOVE_HIGHEST = 1.6
ABOVE_CRITICAL = 1.25
DOME_TOP_WITHIN = 4.0
# fractions of the critical pressure where the dome is traced densely toward its top [1]
_DOME_TOP = (0.9, 0.94, 0.97, 0.985, 0.993, 0.997, 0.999)
_DOME_POINTS = 28
_DOME_GRID_POINTS = 64  # from the triple point: a denser grid, traced once
_COMPRESSION_POINTS = 12
_VAPOR_POINTS = 9
_SUPERCRITICAL_POINTS = 28
_LIQUID_TOP = 0.999  # liquid branches of isotherms end at this fraction of p_c [1]
_SAME_PRESSURE = 1e-7  # relative [1]
_SAME_ENTHALPY = 1e-3  # [J/kg]
_FAILURES = (PropertyFailure, NotConverged, OutOfRange)


@dataclass(frozen=True)
class Isotherm:
    """The line of constant ``temperature`` [K] as ``points`` (h [J/kg], p [Pa]), ordered from
    the lowest pressure (vapour) to the highest (liquid or dense fluid). ``two_phase`` holds
    the indices in ``points`` of its dew point and its bubble point when the chart's pressure
    range holds both (None otherwise)."""

    temperature: float
    points: tuple[Point, ...]
    two_phase: tuple[int, int] | None = None


@dataclass(frozen=True)
class Segment:
    """One process of the cycle from the place ``start`` to the place ``end`` (state labels).

    ``kind``: compression, throttling, evaporation, condensation, gas_cooling, line (suction,
    discharge or liquid line, desuperheating, subcooling, separation), mixing or bypass.
    ``method`` says how the points were made: ``polytropic`` (compression, see the module),
    ``straight`` (a straight line in ln p - h) or ``isenthalpic`` (throttling).
    """

    kind: str
    start: str
    end: str
    points: tuple[Point, ...]
    method: str


@dataclass(frozen=True)
class NumberedState:
    """A numbered point of the chart: the labels of the cycle states that lie on it (in flow
    order) and the state itself [SI]."""

    number: int
    labels: tuple[str, ...]
    state: State

    @property
    def point(self) -> Point:
        return (self.state.enthalpy, self.state.pressure)


@dataclass(frozen=True)
class ChartData:
    """Everything a pressure-enthalpy chart of one cycle shows [J/kg, Pa, K].

    ``bubble`` and ``dew`` run from ``pressure_range[0]`` up to just below the critical
    pressure (or to just beyond the top of the chart); ``critical_point`` is ``(h, p)`` where
    the two meet (the midpoint of their highest points; None when the chart does not reach
    the top of the dome or the dome could not be traced there). ``pressure_range`` is the span
    of pressures the chart should show.
    """

    refrigerant: str
    circuit: str
    bubble: tuple[Point, ...]
    dew: tuple[Point, ...]
    critical_point: Point | None
    critical_pressure: float
    isotherms: tuple[Isotherm, ...]
    segments: tuple[Segment, ...]
    states: tuple[NumberedState, ...]
    pressure_range: tuple[float, float]


# -- the saturation dome ------------------------------------------------------------------------


def dome_pressures(m: PropertyModel, p_low: float, p_high: float = math.inf,
                   count: int = _DOME_POINTS) -> list[float]:
    """Pressures [Pa] at which the dome is traced: ``count`` geometric from ``p_low`` to
    0.9 p_c, then denser toward the critical pressure p_c (where the curves bend most); none
    above the first pressure beyond ``p_high`` (the top of the chart)."""
    p_c = m.critical_pressure
    top = _DOME_TOP[0] * p_c
    if p_low >= top:
        grid = [p for p in (f * p_c for f in _DOME_TOP) if p > p_low]
    else:
        ratio = top / p_low
        grid = [p_low * ratio ** (i / count) for i in range(count)]
        grid += [f * p_c for f in _DOME_TOP]
    beyond = [p for p in grid if p > p_high]
    return [p for p in grid if p <= p_high] + beyond[:1]


def _trace(m: PropertyModel, pressures: Sequence[float]) -> tuple[tuple[Point, ...], ...]:
    """Bubble and dew points (h, p) at ``pressures``; a point whose flash fails is left out."""
    curves: list[tuple[Point, ...]] = []
    for quality in (0.0, 1.0):
        points: list[Point] = []
        for p in pressures:
            try:
                points.append((m.saturated_at_pressure(p, quality).enthalpy, p))
            except _FAILURES:
                continue
        curves.append(tuple(points))
    return tuple(curves)


@cache
def _dome_grid(refrigerant: str) -> tuple[tuple[Point, ...], ...]:
    """The whole dome of ``refrigerant`` on a fixed pressure grid from its triple point: a
    pure function of the refrigerant, kept once per process (a blend's saturation flash
    costs about a millisecond)."""
    m = model(refrigerant)
    return _trace(m, dome_pressures(m, m.limits.pressure_min * (1.0 + 1e-6), math.inf,
                                    _DOME_GRID_POINTS))


def saturation_dome(m: PropertyModel, p_low: float, p_high: float = math.inf
                    ) -> tuple[tuple[Point, ...], tuple[Point, ...]]:
    """Bubble (q = 0) and dew (q = 1) curves as (h, p) points from ``p_low`` [Pa] up to just
    below the critical pressure (or to just beyond ``p_high``): the points at ``p_low``, then
    those of the refrigerant's fixed grid (:func:`dome_pressures` from the triple point)
    above it.

    Near the critical point a blend's saturation flash may fail now and then; such a point is
    left out (the curve passes straight between its neighbours).
    """
    grid = _dome_grid(m.name)
    start = _trace(m, [p_low])
    out: list[tuple[Point, ...]] = []
    for first, curve in zip(start, grid, strict=True):
        inside = [pt for pt in curve if p_low * (1.0 + _SAME_PRESSURE) < pt[1] <= p_high]
        beyond = [pt for pt in curve if pt[1] > p_high][:1]
        out.append((*first, *inside, *beyond))
    return out[0], out[1]


# -- isotherms ------------------------------------------------------------------------------------


def _geometric(low: float, high: float, count: int) -> list[float]:
    if count < 2 or high <= low:
        return [low]
    return [low * (high / low) ** (i / (count - 1)) for i in range(count)]


def _try(states: list[State], evaluate: Callable[[float, float], State], a: float, b: float
         ) -> None:
    try:
        states.append(evaluate(a, b))
    except _FAILURES:
        return


def _stable(states: Sequence[State]) -> list[State]:
    """The states of an isotherm (ordered by rising pressure) whose density rises with the
    pressure. Mechanical stability demands (d rho / d p)_T > 0 everywhere (and the density
    jumps up from dew to bubble point), so a state lighter than the one before it is a wrong
    density root of the equation of state (which imposing a phase close to the critical
    pressure can find); such a state is left out."""
    kept: list[State] = []
    for state in states:
        if not kept or state.density >= kept[-1].density * (1.0 - 1e-9):
            kept.append(state)
    return kept


def check_isotherm_temperature(m: PropertyModel, temperature: float) -> None:
    """OutOfRange unless ``temperature`` [K] lies above the lowest temperature of the
    refrigerant's saturation range (an isotherm colder than that has no liquid line)."""
    if temperature < m.limits.temperature_min:
        raise OutOfRange(
            f"the isotherm {{t}} is below the lower end of the saturation range of {m.name} "
            "({low}, its triple point or the lowest temperature of its equation of state); "
            "give isotherms above it",
            {"t": SIValue(temperature, "temperature"),
             "low": SIValue(m.limits.temperature_min, "temperature")},
            field="isotherms",
        )


def isotherm(m: PropertyModel, temperature: float, p_low: float, p_high: float) -> Isotherm:
    """The isotherm at ``temperature`` [K] between ``p_low`` and ``p_high`` [Pa].

    Below the critical temperature: vapour from ``p_low`` up to the dew point, through the
    two-phase region (horizontal for a pure fluid; a blend's isotherm rises from the dew
    pressure to the bubble pressure, traced at qualities 0.75, 0.5, 0.25), then liquid from
    the bubble point to ``p_high`` or to just below the critical pressure, whichever is lower.
    At or above the critical temperature (or where a blend's saturation at the temperature
    cannot be evaluated, close below it): points at pressures spaced evenly in ln p. Points
    that cannot be evaluated, or whose density falls as the pressure rises (see
    :func:`_stable`), are left out.
    """
    check_isotherm_temperature(m, temperature)
    states: list[State] = []
    try:
        if temperature >= m.critical_temperature:
            raise OutOfRange("no saturation above the critical temperature")
        dew = m.saturated_at_temperature(temperature, 1.0)
        bubble = m.saturated_at_temperature(temperature, 0.0)
    except _FAILURES:
        # above the critical temperature, or a blend's saturation flash close below it that
        # fails: trace the line point by point in pressure
        for p in _geometric(p_low, p_high, _SUPERCRITICAL_POINTS):
            _try(states, m.at_pressure_temperature, p, temperature)
        return Isotherm(temperature, tuple((s.enthalpy, s.pressure) for s in _stable(states)))
    if dew.pressure > p_low:
        for p in _geometric(p_low, dew.pressure, _VAPOR_POINTS)[:-1]:
            _try(states, m.at_pressure_temperature, p, temperature)
    inside = p_low <= dew.pressure and bubble.pressure <= p_high
    if p_low <= dew.pressure <= p_high:
        states.append(dew)
    if inside and bubble.pressure - dew.pressure > _SAME_PRESSURE * dew.pressure:
        for q in (0.75, 0.5, 0.25):
            _try(states, m.at_temperature_quality, temperature, q)
    if p_low <= bubble.pressure <= p_high:
        states.append(bubble)
    # the liquid up to the top of the chart, but not beyond the critical pressure: there the
    # property layer evaluates a liquid colder than the critical temperature with the
    # supercritical phase imposed, which can find the wrong density root
    top = min(p_high, _LIQUID_TOP * m.critical_pressure)
    if bubble.pressure < top:
        start = max(bubble.pressure, p_low) * (1.0 + 1e-6)
        for p in _geometric(start, top, 4)[1:]:
            _try(states, m.at_pressure_temperature, p, temperature)
    kept = _stable(states)
    two_phase = None
    if inside and dew in kept and bubble in kept:
        two_phase = (kept.index(dew), kept.index(bubble))
    return Isotherm(temperature, tuple((s.enthalpy, s.pressure) for s in kept), two_phase)


# -- the cycle path -------------------------------------------------------------------------------


def compression_path(m: PropertyModel, suction: State, discharge: State,
                     count: int = _COMPRESSION_POINTS) -> tuple[tuple[Point, ...], str]:
    """Points (h, p) from ``suction`` to ``discharge`` on the polytropic path (entropy linear in
    ln p, see the module) and the method used (``polytropic`` or ``straight``)."""
    p1, p2 = suction.pressure, discharge.pressure
    s1, s2 = suction.entropy, discharge.entropy
    h1, h2 = suction.enthalpy, discharge.enthalpy
    if p2 <= p1 * (1.0 + _SAME_PRESSURE):
        return ((h1, p1), (h2, p2)), "straight"
    span = math.log(p2 / p1)
    inner: list[Point] = []
    try:
        for i in range(1, count - 1):
            p = p1 * math.exp(span * i / (count - 1))
            s = s1 + (s2 - s1) * math.log(p / p1) / span
            inner.append((m.at_pressure_entropy(p, s).enthalpy, p))
    except _FAILURES:
        inner = []
    if inner:
        return ((h1, p1), *inner, (h2, p2)), "polytropic"
    straight = [(h1 + (h2 - h1) * i / (count - 1), p1 * math.exp(span * i / (count - 1)))
                for i in range(count)]
    return tuple(straight), "straight"


# the processes between labelled places, wherever a circuit has both places:
# (start, end, kind). Order follows the flow.
_PROCESSES: tuple[tuple[str, str, str], ...] = (
    ("evaporator_outlet", "compressor_suction", "line"),
    ("evaporator_outlet", "low_stage_suction", "line"),
    ("compressor_suction", "intermediate_injection", "compression"),
    ("intermediate_injection", "compressor_discharge", "compression"),
    ("compressor_suction", "compressor_discharge", "compression"),
    ("low_stage_suction", "low_stage_discharge", "compression"),
    ("low_stage_discharge", "high_stage_suction", "line"),
    ("high_stage_suction", "high_stage_discharge", "compression"),
    ("compressor_discharge", "condenser_inlet", "line"),
    ("high_stage_discharge", "condenser_inlet", "line"),
    ("compressor_discharge", "gas_cooler_inlet", "line"),
    ("condenser_inlet", "condenser_outlet", "condensation"),
    ("gas_cooler_inlet", "gas_cooler_outlet", "gas_cooling"),
    ("condenser_outlet", "expansion_valve_inlet", "line"),
    ("gas_cooler_outlet", "expansion_valve_inlet", "line"),
    ("condenser_outlet", "economizer_injection_inlet", "throttling"),
    ("economizer_injection_inlet", "economizer_vapor_outlet", "evaporation"),
    ("economizer_vapor_outlet", "intermediate_injection", "mixing"),
    ("condenser_outlet", "flash_tank_liquid", "throttling_into_vessel"),
    ("gas_cooler_outlet", "flash_tank_liquid", "throttling_into_vessel"),
    ("flash_tank_vapor", "compressor_suction", "bypass"),
    ("expansion_valve_inlet", "evaporator_inlet", "throttling"),
    ("economizer_liquid_outlet", "evaporator_inlet", "throttling"),
    ("flash_tank_liquid", "evaporator_inlet", "throttling"),
    ("evaporator_inlet", "evaporator_outlet", "evaporation"),
)


def _same_pressure(a: float, b: float) -> bool:
    return abs(a - b) <= _SAME_PRESSURE * max(a, b)


def _straight(kind: str, a: CyclePoint, b: CyclePoint, points: Sequence[Point] | None = None
              ) -> Segment:
    pts = tuple(points) if points is not None else (
        (a.state.enthalpy, a.state.pressure), (b.state.enthalpy, b.state.pressure))
    return Segment(kind, a.label, b.label, pts, "straight")


def _throttling(a: CyclePoint, b: CyclePoint, into_vessel: bool) -> Segment:
    """Constant h. Into a vessel (flash tank) the expansion ends at the vessel pressure and the
    two-phase mix separates there: a -> (h_a, p_b) -> b. Otherwise the liquid that reaches the
    valve may first have been cooled at its pressure (liquid-line subcooling, an exchanger not
    listed as a place): a -> (h_b, p_a) -> b."""
    ha, pa, hb, pb = a.state.enthalpy, a.state.pressure, b.state.enthalpy, b.state.pressure
    if abs(ha - hb) <= _SAME_ENTHALPY:
        pts: tuple[Point, ...] = ((ha, pa), (ha, pb))
    elif into_vessel:
        pts = ((ha, pa), (ha, pb), (hb, pb))
    else:
        pts = ((ha, pa), (hb, pa), (hb, pb))
    return Segment("throttling", a.label, b.label, pts, "isenthalpic")


def _compression_via_port(m: PropertyModel, result: CycleResult, suction: CyclePoint,
                          mixed: CyclePoint) -> list[Segment]:
    """Economised compression: suction -> the port pressure, where the compressed vapour mixes
    with the injected vapour into ``mixed``. The compressed vapour's enthalpy follows from the
    energy balance of the mixing, m_mix h_mix = m_s h_c + m_inj h_inj, when the injected
    vapour is a listed place; otherwise the compression is drawn straight to the mix."""
    try:
        injected = result.point("economizer_vapor_outlet")
    except KeyError:
        injected = None
    p_i = mixed.state.pressure
    if injected is not None and suction.mass_flow > 0.0:
        h_c = (mixed.mass_flow * mixed.state.enthalpy
               - injected.mass_flow * injected.state.enthalpy) / suction.mass_flow
        try:
            compressed = m.at_pressure_enthalpy(p_i, h_c)
        except _FAILURES:
            compressed = None
        if compressed is not None:
            pts, method = compression_path(m, suction.state, compressed)
            return [
                Segment("compression", suction.label, mixed.label, pts, method),
                Segment("mixing", suction.label, mixed.label,
                        ((compressed.enthalpy, p_i), (mixed.state.enthalpy, p_i)), "straight"),
            ]
    pts, method = compression_path(m, suction.state, mixed.state)
    return [Segment("compression", suction.label, mixed.label, pts, method)]


def cycle_path(m: PropertyModel, result: CycleResult) -> tuple[Segment, ...]:
    """The processes of the circuit as :class:`Segment` s (see the module for how each is
    drawn). Every state of ``result`` lies on at least one segment: a state that no known
    process reaches is joined to the state before it in flow order by a straight line."""
    places = {p.label: p for p in result.states}
    segments: list[Segment] = []
    for start, end, kind in _PROCESSES:
        a, b = places.get(start), places.get(end)
        if a is None or b is None:
            continue
        if kind == "compression" and start == "compressor_suction" and (
                "intermediate_injection" in places):
            if end == "intermediate_injection":
                segments.extend(_compression_via_port(m, result, a, b))
            continue
        if kind == "compression":
            pts, method = compression_path(m, a.state, b.state)
            segments.append(Segment(kind, start, end, pts, method))
        elif kind in ("throttling", "throttling_into_vessel"):
            segments.append(_throttling(a, b, kind == "throttling_into_vessel"))
        elif kind == "bypass":
            # the tank's vapour through the bypass valve (constant h) to the suction pressure,
            # where it mixes with the evaporator's vapour
            h = a.state.enthalpy
            segments.append(Segment("bypass", start, end, (
                (h, a.state.pressure), (h, b.state.pressure),
                (b.state.enthalpy, b.state.pressure)), "isenthalpic"))
        else:
            segments.append(_straight(kind, a, b))
    segments.extend(_economizer_liquid(places))
    segments.extend(_flash_tank_vapor(places))
    reached = {s.start for s in segments} | {s.end for s in segments}
    for before, point in zip(result.states, result.states[1:], strict=False):
        if point.label not in reached:
            segments.append(_straight("line", before, point))
            reached.add(point.label)
    return tuple(segments)


def _economizer_liquid(places: dict[str, CyclePoint]) -> list[Segment]:
    """The economiser's main liquid: subcooled at the high pressure (subcooler type), or the
    saturated liquid separated at the intermediate pressure (flash type)."""
    out = places.get("economizer_liquid_outlet")
    if out is None:
        return []
    for source, kind in (("condenser_outlet", "line"), ("economizer_injection_inlet", "line")):
        a = places.get(source)
        if a is not None and _same_pressure(a.state.pressure, out.state.pressure):
            return [_straight(kind, a, out)]
    return []


def _flash_tank_vapor(places: dict[str, CyclePoint]) -> list[Segment]:
    """A flash tank's vapour separated from the throttled mix at the tank pressure."""
    vapor = places.get("flash_tank_vapor")
    feed = places.get("gas_cooler_outlet") or places.get("condenser_outlet")
    if vapor is None or feed is None:
        return []
    p = vapor.state.pressure
    return [_straight("line", feed, vapor, ((feed.state.enthalpy, p), (vapor.state.enthalpy, p)))]


def number_states(states: Sequence[CyclePoint]) -> tuple[NumberedState, ...]:
    """Numbers 1, 2, ... in flow order; states at the same (h, p) share one number."""
    numbered: list[NumberedState] = []
    for point in states:
        s = point.state
        for i, known in enumerate(numbered):
            k = known.state
            if abs(k.enthalpy - s.enthalpy) <= _SAME_ENTHALPY and _same_pressure(
                    k.pressure, s.pressure):
                numbered[i] = NumberedState(known.number, (*known.labels, point.label), k)
                break
        else:
            numbered.append(NumberedState(len(numbered) + 1, (point.label,), s))
    return tuple(numbered)


# -- all together ---------------------------------------------------------------------------------


def pressure_range(m: PropertyModel, result: CycleResult) -> tuple[float, float]:
    """The pressures [Pa] the chart spans: from the cycle's lowest pressure / 2 (not below
    the triple point) up to 1.6 times its highest pressure, or up to 1.25 times the critical
    pressure when that lies within 4 times the highest pressure (then the top of the dome
    shows without squeezing the cycle into the bottom of the chart)."""
    pressures = [p.state.pressure for p in result.states]
    low = max(min(pressures) / BELOW_LOWEST, m.limits.pressure_min * (1.0 + 1e-6))
    highest = max(pressures)
    high = highest * ABOVE_HIGHEST
    if m.critical_pressure <= DOME_TOP_WITHIN * highest:
        high = max(high, m.critical_pressure * ABOVE_CRITICAL)
    return low, high


def temperature_floor(refrigerant: str) -> float:
    """The lowest temperature [K] an isotherm of ``refrigerant`` may have (the lower end of
    its saturation range)."""
    return model(refrigerant).limits.temperature_min


def chart_data(result: CycleResult, isotherm_temperatures: Sequence[float]) -> ChartData:
    """Dome, isotherms at ``isotherm_temperatures`` [K], cycle path and numbered states."""
    m = model(result.refrigerant)
    for t in isotherm_temperatures:
        check_isotherm_temperature(m, t)
    p_low, p_high = pressure_range(m, result)
    bubble, dew = saturation_dome(m, p_low, p_high)
    critical = None
    if bubble and dew and min(bubble[-1][1], dew[-1][1]) > _DOME_TOP[0] * m.critical_pressure:
        (hb, pb), (hd, pd) = bubble[-1], dew[-1]
        critical = (0.5 * (hb + hd), 0.5 * (pb + pd))
    lines = tuple(iso for iso in (isotherm(m, t, p_low, p_high) for t in isotherm_temperatures)
                  if len(iso.points) >= 2)
    return ChartData(
        refrigerant=result.refrigerant,
        circuit=result.circuit,
        bubble=bubble,
        dew=dew,
        critical_point=critical,
        critical_pressure=m.critical_pressure,
        isotherms=lines,
        segments=cycle_path(m, result),
        states=number_states(result.states),
        pressure_range=(p_low, p_high),
    )
