"""A refrigerant state from two properties, with superheat or subcooling at its pressure.

The field check of the trade: a gauge reading of the suction pressure and a clamp thermometer on
the suction line give the superheat, ``superheat = T - T_dew(p)`` [K]; on the liquid line,
``subcooling = T_bubble(p) - T`` [K]. For a blend the dew and bubble points differ by the glide,
which is why the dew point is used for superheat and the bubble point for subcooling.
"""

from __future__ import annotations

from dataclasses import dataclass

from heatlift.properties import State, model


@dataclass(frozen=True)
class StateReport:
    """A state and how far it lies from saturation at its own pressure [K]."""

    refrigerant: str
    state: State
    superheat: float | None
    subcooling: float | None
    temperature_bubble: float | None
    temperature_dew: float | None


def evaluate(designation: str, **given: float) -> StateReport:
    """State from two of pressure, temperature, enthalpy, entropy, quality [SI]."""
    m = model(designation)
    state = m.state(**given)
    superheat = subcooling = t_bubble = t_dew = None
    # the pressure as given, when given: the flashed state's pressure can differ from it in
    # the tenth digit, and the superheat must match a saturation look-up at the gauge reading
    pressure = given.get("pressure", state.pressure)
    if pressure < m.critical_pressure and pressure >= m.limits.pressure_min:
        t_bubble = m.saturated_at_pressure(pressure, 0.0).temperature
        t_dew = m.saturated_at_pressure(pressure, 1.0).temperature
        if state.phase == "superheated_vapor":
            superheat = state.temperature - t_dew
        elif state.phase == "subcooled_liquid":
            subcooling = t_bubble - state.temperature
    return StateReport(m.name, state, superheat, subcooling, t_bubble, t_dew)
