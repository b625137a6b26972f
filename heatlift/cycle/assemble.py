"""Turning a circuit solved per kilogram of evaporator flow into a sized result.

Every circuit module solves its states for 1 kg/s through the evaporator and reports, per
kilogram of evaporator flow, the heat taken in the evaporator, the heat rejected, the compressor
work, and each state's share of flow. This module picks the actual evaporator mass flow from the
requested size, scales everything, computes the figures of merit and the reviewer's remarks.
"""

from __future__ import annotations

from typing import NamedTuple

from heatlift.cycle.result import CyclePoint, CycleResult, Performance
from heatlift.cycle.spec import CycleSpec
from heatlift.errors import InvalidInput, Remark, SIValue
from heatlift.properties import PropertyModel, State

_new = tuple.__new__  # a named tuple from the tuple of its fields, without its Python __new__
PRESSURE_RATIO_LIMIT = 8.0  # one reciprocating or scroll stage, common practice


class PerKilogram(NamedTuple):
    """A circuit solved for 1 kg/s of evaporator flow [J/kg of evaporator flow, K, Pa, 1].

    ``heat_in`` includes heat picked up by the suction line (not useful cooling) and
    ``heat_out`` heat lost by the liquid line and the compressor shell besides the condenser, so
    that heat_in + work = heat_out closes the balance. (A named tuple, like the circuit's other
    intermediate records: immutable, and cheap to build once per solve.)
    """

    states: tuple[tuple[str, State, float], ...]  # label, state, flow per kg evaporator flow
    cooling: float
    heating: float
    heat_in: float
    heat_out: float
    work: float
    suction: State
    discharge: State
    isentropic_efficiency: float
    t_evaporating: float
    t_condensing: float
    low_side_pressure: float
    high_side_pressure: float
    intermediate_pressure: float | None = None


def evaporator_mass_flow(spec: CycleSpec, solved: PerKilogram) -> float:
    """The evaporator mass flow [kg/s] from exactly one size of the request."""
    cooling, heating, flow = spec.cooling_capacity, spec.heating_capacity, spec.mass_flow
    displacement = spec.compressor.displacement
    if (cooling is not None) + (heating is not None) + (flow is not None) + \
            (displacement is not None) > 1:
        given = [k for k, v in (("cooling_capacity", cooling), ("heating_capacity", heating),
                                ("mass_flow", flow), ("compressor.displacement", displacement))
                 if v is not None]
        raise InvalidInput(
            "give exactly one size: cooling_capacity, heating_capacity, mass_flow or the "
            f"compressor displacement (got {', '.join(given)})", field="cooling_capacity",
        )
    if flow is not None:
        return flow
    if cooling is not None:
        return cooling / solved.cooling
    if heating is not None:
        return heating / solved.heating
    if displacement is not None:
        eta_v = spec.compressor.volumetric_efficiency
        if eta_v is None:
            raise InvalidInput("with a displacement give the volumetric_efficiency too",
                               field="compressor.volumetric_efficiency")
        # the displacement belongs to the (low-stage) compressor drawing the suction vapour
        return solved.suction.density * displacement * eta_v / suction_share(solved)
    raise InvalidInput(
        "give a size: cooling_capacity, heating_capacity, mass_flow, or compressor.displacement "
        "with compressor.volumetric_efficiency", field="cooling_capacity",
    )


def suction_share(solved: PerKilogram) -> float:
    """Flow through the (low-stage) compressor suction per kg of evaporator flow [1]."""
    suction = solved.suction
    for _, state, share in solved.states:
        if state is suction:
            return share
    raise ValueError("the circuit's suction state is not among its states")


def remarks(m: PropertyModel, spec: CycleSpec, solved: PerKilogram) -> list[Remark]:
    out: list[Remark] = []
    t_dis = solved.discharge.temperature
    if t_dis > spec.discharge_temperature_limit:
        out.append(Remark(
            "discharge_temperature",
            "discharge temperature {t} is above {limit}, a usual limit for compressor oils "
            "(common practice, no source; the compressor maker's envelope decides). Consider "
            "a lower pressure ratio per stage, injection or an economised or two-stage circuit.",
            {"t": SIValue(t_dis, "temperature"),
             "limit": SIValue(spec.discharge_temperature_limit, "temperature")},
        ))
    for label, state, _ in solved.states:
        if state.phase == "two_phase" and label.endswith("suction") and (
                state.quality is None or state.quality < 1.0 - 1e-9):
            out.append(Remark(
                "liquid_at_suction",
                f"the {label.replace('_', ' ')} state is two-phase: liquid reaches the "
                "compressor. Raise the superheat.",
            ))
    ratio = solved.high_side_pressure / solved.low_side_pressure
    if solved.intermediate_pressure is None and ratio > PRESSURE_RATIO_LIMIT:
        out.append(Remark(
            "pressure_ratio",
            f"the pressure ratio {ratio:.3g} is high for one compression stage (above "
            f"{PRESSURE_RATIO_LIMIT:g}, common practice, no source); consider an economised or "
            "two-stage circuit.",
        ))
    if m.refrigerant.kind == "zeotrope" and spec.circuit != "transcritical":
        p_out = next(s.pressure for lb, s, _ in solved.states if lb == "condenser_outlet")
        glide = (m.saturated_at_pressure(p_out, 1.0).temperature
                 - m.saturated_at_pressure(p_out, 0.0).temperature)
        if spec.subcooling < glide:
            out.append(Remark(
                "subcooling_below_glide",
                "the subcooling {sc} is smaller than the condensing glide {glide} of this "
                "blend: a liquid-line sight glass may show bubbles and a charge by sight glass "
                "would overcharge.",
                {"sc": SIValue(spec.subcooling, "temperature_difference"),
                 "glide": SIValue(glide, "temperature_difference")},
            ))
    return out


def assemble(m: PropertyModel, spec: CycleSpec, solved: PerKilogram) -> CycleResult:
    """Size the per-kilogram solution and compute the figures of merit."""
    flow = evaporator_mass_flow(spec, solved)
    if not flow > 0.0:
        raise InvalidInput("the size must be positive", field="cooling_capacity")
    points = tuple([_new(CyclePoint, (label, state, share * flow))
                    for label, state, share in solved.states])
    work = solved.work * flow
    cooling = solved.cooling * flow
    heating = solved.heating * flow
    t_e, t_c = solved.t_evaporating, solved.t_condensing
    cop_carnot = t_e / (t_c - t_e)
    cop = cooling / work
    suction_volume_flow = suction_share(solved) * flow / solved.suction.density
    high, low = solved.high_side_pressure, solved.low_side_pressure
    performance = _new(Performance, (  # in the order of Performance's fields
        cooling,  # cooling_capacity
        heating,  # heating_capacity
        solved.heat_out * flow,  # heat_rejected
        work,  # compressor_power
        cop,  # cop
        heating / work,  # cop_heating
        flow,  # mass_flow
        suction_volume_flow,  # suction_volume_flow
        cooling / suction_volume_flow,  # volumetric_capacity
        high / low,  # pressure_ratio
        solved.discharge.temperature,  # discharge_temperature
        cop_carnot,  # cop_carnot
        cop / cop_carnot,  # second_law_efficiency
        solved.isentropic_efficiency,  # isentropic_efficiency
        solved.intermediate_pressure,  # intermediate_pressure
        high,  # high_side_pressure
        low,  # low_side_pressure
        (solved.heat_in + solved.work - solved.heat_out) / solved.heat_out,  # residual
    ))
    return _new(CycleResult, (m.name, spec.circuit, points, performance,
                              tuple(remarks(m, spec, solved))))
