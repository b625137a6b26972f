"""Economised single-stage circuit: vapour injected at an intermediate compressor port.

Two economiser types, per kg/s of evaporator flow:

- ``subcooler``: a share r of the condensed liquid is throttled to the intermediate pressure
  p_i and evaporates in a heat exchanger that subcools the main liquid to
  T_bubble(p_i) + approach; the injection vapour leaves at T_dew(p_i) + economizer_superheat.
  Energy balance of the exchanger: r (h_inj,out - h_liq) = h_liq - h_main,out.
- ``flash``: all the liquid is throttled to p_i into a flash tank; its vapour (quality x) goes
  to the port, its saturated liquid to the evaporator: r = x / (1 - x).

The compression is taken in two steps at the same isentropic efficiency: suction -> p_i, then
the mix h_mix = (h_1 + r h_inj) / (1 + r) -> discharge. Blend compositions are taken as fixed in
the flash tank (the vapour of a zeotrope is in truth richer in the volatile component).
"""

from __future__ import annotations

from heatlift.cycle import processes as proc
from heatlift.cycle.assemble import PerKilogram
from heatlift.cycle.low_side import high_side, intermediate_pressure, low_side
from heatlift.cycle.spec import CycleSpec
from heatlift.errors import InvalidInput
from heatlift.properties import PropertyModel


def solve(m: PropertyModel, spec: CycleSpec) -> PerKilogram:
    low = low_side(m, spec)
    high = high_side(m, spec, low.p_evaporator_outlet)
    suction = low.after_suction_line
    p_i = intermediate_pressure(spec, suction.pressure, high.p_discharge)
    cond_out = proc.subcooled(m, high.p_condenser_outlet, spec.subcooling)
    liquid = proc.cooled_liquid(m, cond_out, spec.liquid_line_subcooling)

    injection_in = proc.throttle(m, liquid, p_i)
    if spec.economizer == "subcooler":
        injection_out = proc.superheated(m, p_i, spec.economizer_superheat)
        t_main = m.saturated_at_pressure(p_i, 0.0).temperature + spec.economizer_approach
        if t_main >= liquid.temperature:
            raise InvalidInput(
                "the economiser cannot subcool: the liquid is already colder than the "
                "intermediate saturation temperature plus the approach; lower the "
                "intermediate pressure or the approach", field="economizer_approach")
        main_out = m.at_pressure_temperature(liquid.pressure, t_main)
        share = (liquid.enthalpy - main_out.enthalpy) / (injection_out.enthalpy - liquid.enthalpy)
    elif spec.economizer == "flash":
        quality = injection_in.quality if injection_in.quality is not None else 0.0
        injection_out = m.saturated_at_pressure(p_i, 1.0)
        main_out = m.saturated_at_pressure(p_i, 0.0)
        share = quality / (1.0 - quality)
    else:
        raise InvalidInput('economizer must be "subcooler" or "flash"', field="economizer")

    first = proc.compress(m, suction, p_i, spec.compressor)
    total = 1.0 + share
    mixed = m.at_pressure_enthalpy(
        p_i, (first.discharge.enthalpy + share * injection_out.enthalpy) / total)
    second = proc.compress(m, mixed, high.p_discharge, spec.compressor)
    cond_in = m.at_pressure_enthalpy(high.p_condenser_inlet, second.discharge.enthalpy)
    evap_in = proc.throttle(m, main_out, low.p_evaporator_inlet)

    shell_loss = (first.work - (first.discharge.enthalpy - suction.enthalpy)
                  + total * (second.work - (second.discharge.enthalpy - mixed.enthalpy)))
    cooling = low.evaporator_outlet.enthalpy - evap_in.enthalpy
    heating = total * (cond_in.enthalpy - cond_out.enthalpy)
    states = (
        ("evaporator_outlet", low.evaporator_outlet, 1.0),
        ("compressor_suction", suction, 1.0),
        ("intermediate_injection", mixed, total),
        ("compressor_discharge", second.discharge, total),
        ("condenser_inlet", cond_in, total),
        ("condenser_outlet", cond_out, total),
        ("economizer_injection_inlet", injection_in, share if spec.economizer == "subcooler"
         else total),
        ("economizer_vapor_outlet", injection_out, share),
        ("economizer_liquid_outlet", main_out, 1.0),
        ("evaporator_inlet", evap_in, 1.0),
    )
    return PerKilogram(
        states=states,
        cooling=cooling,
        heating=heating,
        heat_in=cooling + low.suction_line_gain,
        heat_out=heating + total * (cond_out.enthalpy - liquid.enthalpy) + shell_loss,
        work=first.work + total * second.work,
        suction=suction,
        discharge=second.discharge,
        isentropic_efficiency=first.isentropic_efficiency,
        t_evaporating=proc.mean_saturation_temperature(m, low.p_evaporator_outlet),
        t_condensing=proc.mean_saturation_temperature(m, high.p_condenser_inlet),
        low_side_pressure=suction.pressure,
        high_side_pressure=second.discharge.pressure,
        intermediate_pressure=p_i,
    )
