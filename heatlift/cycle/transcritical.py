"""Transcritical R744 circuit: a gas cooler above the critical pressure, optional flash tank.

Above the critical point the high-side pressure and the gas-cooler outlet temperature are
independent, and the COP has a maximum over the pressure. Given ``gas_cooler.pressure: None``
the pressure is found by golden-section search for the highest COP between the critical
pressure and 14 MPa; Liao, Zhao and Jakobsen (2000) give a correlation of that optimum
(checked in tests/reference).

With ``flash_tank_pressure`` the gas-cooler outlet is throttled into a flash tank: its liquid
feeds the evaporator's expansion valve, its vapour (quality x of the flow) is bypassed through
a valve to the evaporator outlet pressure and mixes with the evaporator's vapour before the
suction line. Per kg/s of evaporator flow the high side carries 1 / (1 - x).
"""

from __future__ import annotations

import math
from dataclasses import replace

from heatlift.cycle import processes as proc
from heatlift.cycle.assemble import PerKilogram, assemble
from heatlift.cycle.low_side import low_side
from heatlift.cycle.result import CycleResult
from heatlift.cycle.single_stage import liquid_suction_exchange
from heatlift.cycle.spec import CycleSpec, GasCoolerSpec
from heatlift.errors import InvalidInput, NotConverged, SIValue
from heatlift.properties import PropertyModel

HIGHEST_PRESSURE = 14e6  # [Pa] upper end of the search: usual rating of R744 high sides


def solve(m: PropertyModel, spec: CycleSpec) -> PerKilogram:
    """The circuit at the given gas-cooler pressure."""
    gc = spec.gas_cooler
    if gc is None or gc.pressure is None:
        raise InvalidInput("transcritical: give gas_cooler.pressure or 'optimal'",
                           field="gas_cooler")
    low = low_side(m, spec)
    drops = spec.pressure_drops
    p_gc = gc.pressure
    if p_gc <= low.p_evaporator_outlet:
        raise InvalidInput(
            "the gas-cooler pressure {p} is not above the evaporating pressure {pe}",
            {"p": SIValue(p_gc, "pressure"), "pe": SIValue(low.p_evaporator_outlet, "pressure")},
            field="gas_cooler.pressure")
    dp_out = drops.condenser.pressure or 0.0
    dp_dis = drops.discharge_line.pressure or 0.0
    gc_out = m.at_pressure_temperature(p_gc - dp_out, gc.outlet_temperature)

    bypass_share = 0.0
    liquid = gc_out
    tank_vapor = None
    if spec.flash_tank_pressure is not None:
        p_ft = spec.flash_tank_pressure
        if not low.p_evaporator_outlet < p_ft < p_gc:
            raise InvalidInput(
                "the flash-tank pressure {p} must lie between the evaporating pressure and the "
                "gas-cooler pressure", {"p": SIValue(p_ft, "pressure")},
                field="flash_tank_pressure")
        flashed = proc.throttle(m, gc_out, p_ft)
        x = flashed.quality if flashed.quality is not None else (
            1.0 if flashed.phase != "subcooled_liquid" else 0.0)
        if x >= 1.0:
            raise InvalidInput("the flash tank receives no liquid at that pressure",
                               field="flash_tank_pressure")
        bypass_share = x / (1.0 - x)
        liquid = m.saturated_at_pressure(p_ft, 0.0)
        tank_vapor = m.saturated_at_pressure(p_ft, 1.0)

    total = 1.0 + bypass_share
    vapor = low.after_suction_line
    if tank_vapor is not None:
        mixed_h = (vapor.enthalpy + bypass_share * tank_vapor.enthalpy) / total
        vapor = m.at_pressure_enthalpy(vapor.pressure, mixed_h)
    high_liquid, suction, _ = liquid_suction_exchange(
        m, gc_out, vapor, spec.internal_heat_exchanger_effectiveness)
    if tank_vapor is None:
        liquid = high_liquid
    compression = proc.compress(m, suction, p_gc + dp_dis, spec.compressor)
    gc_in = m.at_pressure_enthalpy(p_gc, compression.discharge.enthalpy)
    evap_in = proc.throttle(m, liquid, low.p_evaporator_inlet)

    shell_loss = compression.work - (compression.discharge.enthalpy - suction.enthalpy)
    heating = total * (gc_in.enthalpy - gc_out.enthalpy)
    cooling = low.evaporator_outlet.enthalpy - evap_in.enthalpy
    states: list[tuple[str, object, float]] = [
        ("evaporator_outlet", low.evaporator_outlet, 1.0),
        ("compressor_suction", suction, total),
        ("compressor_discharge", compression.discharge, total),
        ("gas_cooler_inlet", gc_in, total),
        ("gas_cooler_outlet", gc_out, total),
    ]
    if tank_vapor is not None:
        states += [("flash_tank_vapor", tank_vapor, bypass_share),
                   ("flash_tank_liquid", liquid, 1.0)]
    else:
        states += [("expansion_valve_inlet", liquid, 1.0)]
    states.append(("evaporator_inlet", evap_in, 1.0))
    heat_in = cooling + low.suction_line_gain
    if tank_vapor is not None and spec.internal_heat_exchanger_effectiveness > 0.0:
        heat_in += 0.0  # the exchanger moves heat inside the circuit only
    return PerKilogram(
        states=tuple(states),  # type: ignore[arg-type]
        cooling=cooling,
        heating=heating,
        heat_in=heat_in,
        heat_out=heating + shell_loss,
        work=total * compression.work,
        suction=suction,
        discharge=compression.discharge,
        isentropic_efficiency=compression.isentropic_efficiency,
        t_evaporating=proc.mean_saturation_temperature(m, low.p_evaporator_outlet),
        t_condensing=gc.outlet_temperature,
        low_side_pressure=suction.pressure,
        high_side_pressure=compression.discharge.pressure,
        intermediate_pressure=spec.flash_tank_pressure,
    )


def _cop(m: PropertyModel, spec: CycleSpec, pressure: float) -> float:
    gc = spec.gas_cooler
    assert gc is not None
    solved = solve(m, replace(spec, gas_cooler=GasCoolerSpec(gc.outlet_temperature, pressure)))
    return solved.cooling / solved.work


def optimal_pressure(m: PropertyModel, spec: CycleSpec) -> float:
    """Gas-cooler pressure [Pa] of the highest COP, by golden-section search (1 kPa)."""
    low = max(m.critical_pressure * 1.001, (spec.flash_tank_pressure or 0.0) * 1.05)
    high = HIGHEST_PRESSURE
    ratio = (math.sqrt(5.0) - 1.0) / 2.0
    a, b = low, high
    c, d = b - ratio * (b - a), a + ratio * (b - a)
    fc, fd = _cop(m, spec, c), _cop(m, spec, d)
    for _ in range(60):
        if b - a < 1e3:
            return 0.5 * (a + b)
        if fc > fd:
            b, d, fd = d, c, fc
            c = b - ratio * (b - a)
            fc = _cop(m, spec, c)
        else:
            a, c, fc = c, d, fd
            d = a + ratio * (b - a)
            fd = _cop(m, spec, d)
    raise NotConverged("the optimal gas-cooler pressure search did not converge",
                       field="gas_cooler.pressure")


def solve_sized(m: PropertyModel, spec: CycleSpec) -> CycleResult:
    gc = spec.gas_cooler
    if gc is None:
        raise InvalidInput('the transcritical circuit needs gas_cooler: {"outlet_temperature", '
                           '"pressure"}', field="gas_cooler")
    if spec.condensing is not None:
        raise InvalidInput("a transcritical circuit has a gas_cooler instead of condensing",
                           field="condensing")
    if gc.pressure is None:
        spec = replace(spec, gas_cooler=GasCoolerSpec(gc.outlet_temperature,
                                                      optimal_pressure(m, spec)))
    return assemble(m, spec, solve(m, spec))
