"""The low side shared by the circuits: evaporator outlet, suction line, high-side pressures."""

from __future__ import annotations

from typing import NamedTuple

from heatlift.cycle import processes as proc
from heatlift.cycle.spec import CycleSpec
from heatlift.errors import InvalidInput, SIValue
from heatlift.properties import PropertyModel, State

_new = tuple.__new__  # a named tuple from the tuple of its fields, without its Python __new__


class LowSide(NamedTuple):
    """Evaporator outlet, the vapour after the suction line [SI], and the heat it picked up."""

    p_evaporator_outlet: float
    p_evaporator_inlet: float
    evaporator_outlet: State
    after_suction_line: State
    suction_line_gain: float


def low_side(m: PropertyModel, spec: CycleSpec) -> LowSide:
    drops = spec.pressure_drops
    p_out = proc.saturation_pressure(m, spec.evaporating, "evaporating")
    evap_out = proc.superheated(m, p_out, spec.superheat)
    p_suction = p_out - proc.drop_in_pressure(
        m, drops.suction_line, p_out, False, "pressure_drops.suction_line")
    if spec.suction_line_superheat > 0.0:
        after = m.at_pressure_temperature(p_suction, evap_out.temperature
                                          + spec.suction_line_superheat)
    elif p_suction == p_out:
        after = evap_out  # no drop and no gain: the same state
    else:
        after = m.at_pressure_enthalpy(p_suction, evap_out.enthalpy)
    p_in = p_out + proc.drop_in_pressure(m, drops.evaporator, p_out, True,
                                         "pressure_drops.evaporator")
    return _new(LowSide, (p_out, p_in, evap_out, after, after.enthalpy - evap_out.enthalpy))


class HighSide(NamedTuple):
    """Condenser inlet and outlet pressures, compressor discharge pressure [Pa]."""

    p_condenser_inlet: float
    p_condenser_outlet: float
    p_discharge: float


def high_side(m: PropertyModel, spec: CycleSpec, p_low: float) -> HighSide:
    if spec.condensing is None:
        raise InvalidInput("give condensing (a temperature or a pressure)", field="condensing")
    drops = spec.pressure_drops
    p_in = proc.saturation_pressure(m, spec.condensing, "condensing", pressure_only=True)
    if p_low >= p_in:
        raise InvalidInput(
            "the evaporating pressure {low} is not below the condensing pressure {high}: "
            "evaporating must be colder than condensing",
            {"low": SIValue(p_low, "pressure"), "high": SIValue(p_in, "pressure")},
            field="evaporating",
        )
    p_dis = p_in + proc.drop_in_pressure(m, drops.discharge_line, p_in, True,
                                         "pressure_drops.discharge_line")
    p_out = p_in - proc.drop_in_pressure(m, drops.condenser, p_in, False,
                                         "pressure_drops.condenser")
    return _new(HighSide, (p_in, p_out, p_dis))


def intermediate_pressure(spec: CycleSpec, p_low: float, p_high: float) -> float:
    """The given intermediate pressure, or the geometric mean sqrt(p_low p_high) [Pa]."""
    p = spec.intermediate_pressure
    if p is None:
        return (p_low * p_high) ** 0.5
    if not p_low < p < p_high:
        raise InvalidInput(
            "the intermediate pressure {p} must lie between the suction pressure {low} and the "
            "discharge pressure {high}",
            {"p": SIValue(p, "pressure"), "low": SIValue(p_low, "pressure"),
             "high": SIValue(p_high, "pressure")},
            field="intermediate_pressure",
        )
    return p
