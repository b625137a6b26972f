"""Two-stage circuit with an open flash intercooler.

Per kg/s of evaporator (low-stage) flow: the low-stage compressor takes the suction vapour to
the intermediate pressure p_i and discharges into the flash tank; the condensed liquid (flow
m_H) is throttled into the same tank. The tank gives saturated vapour to the high-stage
compressor and saturated liquid to the evaporator's expansion valve. Its energy balance,
m_H h_liquid + h_low,discharge = m_H h_dew(p_i) + h_bubble(p_i), gives
m_H = (h_low,discharge - h_bubble) / (h_dew - h_liquid).
"""

from __future__ import annotations

from heatlift.cycle import processes as proc
from heatlift.cycle.assemble import PerKilogram
from heatlift.cycle.low_side import high_side, intermediate_pressure, low_side
from heatlift.cycle.spec import CycleSpec
from heatlift.properties import PropertyModel


def solve(m: PropertyModel, spec: CycleSpec) -> PerKilogram:
    low = low_side(m, spec)
    high = high_side(m, spec, low.p_evaporator_outlet)
    suction = low.after_suction_line
    p_i = intermediate_pressure(spec, suction.pressure, high.p_discharge)
    cond_out = proc.subcooled(m, high.p_condenser_outlet, spec.subcooling)
    liquid = proc.cooled_liquid(m, cond_out, spec.liquid_line_subcooling)

    first = proc.compress(m, suction, p_i, spec.compressor)
    tank_vapor = m.saturated_at_pressure(p_i, 1.0)
    tank_liquid = m.saturated_at_pressure(p_i, 0.0)
    high_flow = (first.discharge.enthalpy - tank_liquid.enthalpy) / (
        tank_vapor.enthalpy - liquid.enthalpy)
    second = proc.compress(m, tank_vapor, high.p_discharge,
                           spec.high_stage_compressor or spec.compressor)
    cond_in = m.at_pressure_enthalpy(high.p_condenser_inlet, second.discharge.enthalpy)
    evap_in = proc.throttle(m, tank_liquid, low.p_evaporator_inlet)

    shell_loss = (first.work - (first.discharge.enthalpy - suction.enthalpy)
                  + high_flow * (second.work - (second.discharge.enthalpy - tank_vapor.enthalpy)))
    cooling = low.evaporator_outlet.enthalpy - evap_in.enthalpy
    heating = high_flow * (cond_in.enthalpy - cond_out.enthalpy)
    states = (
        ("evaporator_outlet", low.evaporator_outlet, 1.0),
        ("low_stage_suction", suction, 1.0),
        ("low_stage_discharge", first.discharge, 1.0),
        ("high_stage_suction", tank_vapor, high_flow),
        ("high_stage_discharge", second.discharge, high_flow),
        ("condenser_inlet", cond_in, high_flow),
        ("condenser_outlet", cond_out, high_flow),
        ("flash_tank_liquid", tank_liquid, 1.0),
        ("evaporator_inlet", evap_in, 1.0),
    )
    return PerKilogram(
        states=states,
        cooling=cooling,
        heating=heating,
        heat_in=cooling + low.suction_line_gain,
        heat_out=heating + high_flow * (cond_out.enthalpy - liquid.enthalpy) + shell_loss,
        work=first.work + high_flow * second.work,
        suction=suction,
        discharge=second.discharge,
        isentropic_efficiency=first.isentropic_efficiency,
        t_evaporating=proc.mean_saturation_temperature(m, low.p_evaporator_outlet),
        t_condensing=proc.mean_saturation_temperature(m, high.p_condenser_inlet),
        low_side_pressure=suction.pressure,
        high_side_pressure=second.discharge.pressure,
        intermediate_pressure=p_i,
    )
