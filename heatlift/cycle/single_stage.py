"""The single-stage vapour-compression circuit with real losses.

Flow order and places (per kg/s of evaporator flow):

evaporator_outlet (p_e, T_dew + superheat)
  -> suction line: pressure drop, ``suction_line_superheat`` picked up outside the cold space
  -> internal heat exchanger, vapour side (when its effectiveness is above 0)
  -> compressor_suction -> compressor_discharge (isentropic efficiency, shell heat loss)
  -> discharge line drop -> condenser_inlet (p_c) -> condenser drop
  -> condenser_outlet (T_bubble - subcooling) -> ``liquid_line_subcooling``
  -> internal heat exchanger, liquid side -> expansion_valve_inlet
  -> throttling (h constant) -> evaporator_inlet (p_e + evaporator drop).

The internal (liquid-to-suction) heat exchanger with effectiveness eps transfers
Q = eps * (h_v(p_v, T_liquid_in) - h_v_in) per kg: the vapour, with the smaller heat capacity
rate, could at most be heated to the liquid inlet temperature.
"""

from __future__ import annotations

from heatlift.cycle import processes as proc
from heatlift.cycle.assemble import PerKilogram
from heatlift.cycle.low_side import high_side, low_side
from heatlift.cycle.spec import CycleSpec
from heatlift.properties import PropertyModel, State

_new = tuple.__new__  # a named tuple from the tuple of its fields, without its Python __new__


def liquid_suction_exchange(
    m: PropertyModel, liquid: State, vapor: State, effectiveness: float
) -> tuple[State, State, float]:
    """Cooled liquid, heated vapour and the heat moved [J/kg] in the internal heat exchanger."""
    if effectiveness <= 0.0:
        return liquid, vapor, 0.0
    if liquid.temperature <= vapor.temperature:
        return liquid, vapor, 0.0
    hot_limit = m.at_pressure_temperature(vapor.pressure, liquid.temperature)
    heat = effectiveness * (hot_limit.enthalpy - vapor.enthalpy)
    vapor_out = m.at_pressure_enthalpy(vapor.pressure, vapor.enthalpy + heat)
    liquid_out = m.at_pressure_enthalpy(liquid.pressure, liquid.enthalpy - heat)
    return liquid_out, vapor_out, heat


def solve(m: PropertyModel, spec: CycleSpec) -> PerKilogram:
    low = low_side(m, spec)
    high = high_side(m, spec, low.p_evaporator_outlet)
    cond_out = proc.subcooled(m, high.p_condenser_outlet, spec.subcooling)
    liquid = proc.cooled_liquid(m, cond_out, spec.liquid_line_subcooling)
    valve_in, suction, _ = liquid_suction_exchange(
        m, liquid, low.after_suction_line, spec.internal_heat_exchanger_effectiveness)
    compression = proc.compress(m, suction, high.p_discharge, spec.compressor)
    cond_in = compression.discharge if high.p_condenser_inlet == high.p_discharge else \
        m.at_pressure_enthalpy(high.p_condenser_inlet, compression.discharge.enthalpy)
    evap_in = proc.throttle(m, valve_in, low.p_evaporator_inlet)

    shell_loss = compression.work - (compression.discharge.enthalpy - suction.enthalpy)
    heating = cond_in.enthalpy - cond_out.enthalpy
    cooling = low.evaporator_outlet.enthalpy - evap_in.enthalpy
    states = (
        ("evaporator_outlet", low.evaporator_outlet, 1.0),
        ("compressor_suction", suction, 1.0),
        ("compressor_discharge", compression.discharge, 1.0),
        ("condenser_inlet", cond_in, 1.0),
        ("condenser_outlet", cond_out, 1.0),
        ("expansion_valve_inlet", valve_in, 1.0),
        ("evaporator_inlet", evap_in, 1.0),
    )
    return _new(PerKilogram, (  # in the order of PerKilogram's fields
        states,
        cooling,  # cooling
        heating,  # heating
        cooling + low.suction_line_gain,  # heat_in
        heating + (cond_out.enthalpy - liquid.enthalpy) + shell_loss,  # heat_out
        compression.work,  # work
        suction,  # suction
        compression.discharge,  # discharge
        compression.isentropic_efficiency,  # isentropic_efficiency
        proc.mean_saturation_temperature(m, low.p_evaporator_outlet),  # t_evaporating
        proc.mean_saturation_temperature(m, high.p_condenser_inlet),  # t_condensing
        suction.pressure,  # low_side_pressure
        compression.discharge.pressure,  # high_side_pressure
        None,  # intermediate_pressure
    ))
