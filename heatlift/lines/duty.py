"""What a line carries: the refrigerant's state at the line's inlet and its mass flow.

Three ways to say it: a whole cycle (``heatlift.cycle``), the cycle's operating conditions with
a cooling capacity (a single-stage cycle is solved from them), or a mass flow with the inlet
state. The line's inlet is a place of the cycle, in the words of the trade:

- suction line: evaporator outlet -> compressor suction;
- discharge line: compressor discharge -> condenser (or gas-cooler) inlet;
- liquid line: condenser (or gas-cooler) outlet -> expansion-valve inlet.
"""

from __future__ import annotations

from dataclasses import dataclass

from heatlift.cycle import CompressorSpec, CycleResult, CycleSpec, SaturationSpec, solve
from heatlift.errors import InvalidInput, SIValue
from heatlift.properties import State, model

LINES = ("suction", "discharge", "liquid")
INLET_LABELS = {
    "suction": ("evaporator_outlet",),
    "discharge": ("compressor_discharge", "high_stage_discharge"),
    "liquid": ("condenser_outlet", "gas_cooler_outlet"),
}
OUTLET_WORDS = {"suction": "compressor suction", "discharge": "condenser inlet",
                "liquid": "expansion-valve inlet"}


@dataclass(frozen=True)
class Duty:
    """The line's ``inlet`` state and ``mass_flow`` [kg/s]; ``cooling_per_mass_flow`` [J/kg] is
    the cooling capacity each kg/s through this line stands for (None when only a mass flow was
    given); ``cooling_capacity`` [W] the capacity at this mass flow."""

    refrigerant: str
    line: str
    inlet: State
    mass_flow: float
    cooling_per_mass_flow: float | None
    basis: str
    inlet_label: str | None = None

    @property
    def cooling_capacity(self) -> float | None:
        if self.cooling_per_mass_flow is None:
            return None
        return self.mass_flow * self.cooling_per_mass_flow


@dataclass(frozen=True)
class InletSpec:
    """The inlet state for a mass-flow duty: ``pressure`` [Pa] with ``temperature`` [K], or a
    ``saturation_temperature`` [K] (dew point for vapour lines, bubble point for the liquid
    line) with ``superheat`` or ``subcooling`` [K]."""

    pressure: float | None = None
    temperature: float | None = None
    saturation_temperature: float | None = None
    superheat: float | None = None
    subcooling: float | None = None


def _check_line(line: str) -> None:
    if line not in LINES:
        raise InvalidInput(f"line must be one of {', '.join(LINES)}", field="line")


def from_cycle(spec: CycleSpec, line: str, basis: str = "cycle") -> Duty:
    """Solve the cycle and take the line's inlet state and mass flow from it."""
    _check_line(line)
    result = solve(spec)
    return from_result(result, line, basis)


def from_result(result: CycleResult, line: str, basis: str = "cycle") -> Duty:
    labels = {p.label for p in result.states}
    label = next((name for name in INLET_LABELS[line] if name in labels), None)
    if label is None:
        raise InvalidInput(f"the {result.circuit} circuit has no {line} line inlet "
                           f"({' or '.join(INLET_LABELS[line])})", field="line")
    point = result.point(label)
    cooling = result.performance.cooling_capacity / point.mass_flow
    return Duty(result.refrigerant, line, point.state, point.mass_flow, cooling, basis, label)


def from_conditions(
    refrigerant: str, line: str, cooling_capacity: float, evaporating: SaturationSpec,
    condensing: SaturationSpec, superheat: float, subcooling: float,
    isentropic_efficiency: float,
) -> Duty:
    """A single-stage cycle from its operating conditions [W; saturation specs; K, K, 1]."""
    spec = CycleSpec(
        refrigerant=refrigerant,
        evaporating=evaporating,
        condensing=condensing,
        superheat=superheat,
        subcooling=subcooling,
        compressor=CompressorSpec(isentropic_efficiency=isentropic_efficiency),
        cooling_capacity=cooling_capacity,
    )
    return from_cycle(spec, line, "cooling_capacity")


def from_mass_flow(refrigerant: str, line: str, mass_flow: float, inlet: InletSpec) -> Duty:
    """A mass flow [kg/s] with the line's inlet state."""
    _check_line(line)
    m = model(refrigerant)
    liquid = line == "liquid"
    if inlet.pressure is not None and inlet.temperature is not None:
        state = m.at_pressure_temperature(inlet.pressure, inlet.temperature)
    elif inlet.saturation_temperature is not None:
        t_sat = inlet.saturation_temperature
        m.check_saturation_temperature(t_sat, field="inlet.saturation_temperature")
        if liquid:
            if inlet.subcooling is None:
                raise InvalidInput("a liquid line's inlet by saturation_temperature needs "
                                   "the subcooling", field="inlet.subcooling")
            bubble = m.saturated_at_temperature(t_sat, 0.0)
            state = bubble if inlet.subcooling == 0.0 else m.at_pressure_temperature(
                bubble.pressure, t_sat - inlet.subcooling)
        else:
            if inlet.superheat is None:
                raise InvalidInput(f"a {line} line's inlet by saturation_temperature needs the "
                                   "superheat", field="inlet.superheat")
            dew = m.saturated_at_temperature(t_sat, 1.0)
            state = dew if inlet.superheat == 0.0 else m.at_pressure_temperature(
                dew.pressure, t_sat + inlet.superheat)
    else:
        raise InvalidInput(
            "give the inlet as pressure and temperature, or as saturation_temperature with "
            + ("subcooling" if liquid else "superheat"), field="inlet")
    _check_phase(m.name, line, state)
    return Duty(m.name, line, state, mass_flow, None, "mass_flow")


def _check_phase(name: str, line: str, state: State) -> None:
    liquid = line == "liquid"
    if liquid and state.phase in ("superheated_vapor",):
        raise InvalidInput(
            f"the liquid line's inlet state of {name} at {{p}} and {{t}} is a vapour; a liquid "
            "line starts with subcooled liquid: lower the temperature below the bubble point",
            {"p": SIValue(state.pressure, "pressure"),
             "t": SIValue(state.temperature, "temperature")}, field="inlet")
    if not liquid and state.phase == "subcooled_liquid":
        raise InvalidInput(
            f"the {line} line's inlet state of {name} at {{p}} and {{t}} is a liquid; a {line} "
            "line carries vapour: raise the temperature above the dew point",
            {"p": SIValue(state.pressure, "pressure"),
             "t": SIValue(state.temperature, "temperature")}, field="inlet")
    if state.phase == "two_phase" and state.quality != (0.0 if liquid else 1.0):
        raise InvalidInput(
            f"the {line} line's inlet state of {name} at {{p}} and {{t}} is two-phase; give a "
            + ("subcooled liquid" if liquid else "superheated vapour"),
            {"p": SIValue(state.pressure, "pressure"),
             "t": SIValue(state.temperature, "temperature")}, field="inlet")


@dataclass(frozen=True)
class DutySpec:
    """The duty as asked, in exactly one of three forms: ``cycle`` (a whole cycle);
    ``cooling_capacity`` [W] with ``evaporating``/``condensing`` saturation, ``superheat``,
    ``subcooling`` [K] and ``isentropic_efficiency`` [1]; or ``mass_flow`` [kg/s] with
    ``inlet``."""

    line: str
    refrigerant: str | None = None
    cycle: CycleSpec | None = None
    cooling_capacity: float | None = None
    evaporating: SaturationSpec | None = None
    condensing: SaturationSpec | None = None
    superheat: float = 5.0
    subcooling: float = 2.0
    isentropic_efficiency: float = 0.7
    mass_flow: float | None = None
    inlet: InletSpec | None = None


def resolve(spec: DutySpec) -> Duty:
    """The duty of ``spec``: solves the cycle where one is asked for."""
    _check_line(spec.line)
    forms = [name for name, value in (("cycle", spec.cycle),
                                      ("cooling_capacity", spec.cooling_capacity),
                                      ("mass_flow", spec.mass_flow)) if value is not None]
    if len(forms) != 1:
        raise InvalidInput(
            "give the duty in exactly one form: a cycle, a cooling_capacity with evaporating "
            "and condensing, or a mass_flow with the inlet state"
            + (f" (got {', '.join(forms)})" if forms else ""), field="cooling_capacity")
    if spec.cycle is not None:
        if spec.refrigerant is not None and \
                model(spec.refrigerant).name != model(spec.cycle.refrigerant).name:
            raise InvalidInput(
                f"refrigerant {model(spec.refrigerant).name} differs from the cycle's "
                f"{model(spec.cycle.refrigerant).name}; give it once", field="refrigerant")
        return from_cycle(spec.cycle, spec.line)
    if spec.refrigerant is None:
        raise InvalidInput("give the refrigerant", field="refrigerant")
    if spec.cooling_capacity is not None:
        if spec.evaporating is None or spec.condensing is None:
            raise InvalidInput("a cooling_capacity duty needs evaporating and condensing",
                               field="evaporating" if spec.evaporating is None else
                               "condensing")
        return from_conditions(spec.refrigerant, spec.line, spec.cooling_capacity,
                               spec.evaporating, spec.condensing, spec.superheat,
                               spec.subcooling, spec.isentropic_efficiency)
    assert spec.mass_flow is not None
    if spec.inlet is None:
        raise InvalidInput("a mass_flow duty needs the inlet state", field="inlet")
    return from_mass_flow(spec.refrigerant, spec.line, spec.mass_flow, spec.inlet)
