"""A single-stage cycle whose compressor is given by its supplier polynomial (AHRI 540 / EN 12900).

The polynomial is evaluated at the compressor's own suction and discharge dew points and
corrected to the cycle's actual suction superheat and subcooling (``heatlift.compressor``). Its
corrected mass flow sizes the cycle, and its implied isentropic efficiency,
eta_is = m (h2s - h1) / P, sets the compression, so that the cycle's power equals the
polynomial's corrected power.
"""

from __future__ import annotations

from dataclasses import replace

from heatlift.compressor import PolynomialSpec, evaluate_polynomial
from heatlift.cycle import single_stage
from heatlift.cycle.assemble import assemble
from heatlift.cycle.result import CycleResult
from heatlift.cycle.spec import CompressorSpec, CycleSpec
from heatlift.errors import InvalidInput
from heatlift.properties import PropertyModel


def solve_rated(m: PropertyModel, spec: CycleSpec) -> CycleResult:
    poly: PolynomialSpec = spec.compressor.polynomial
    if spec.circuit != "single_stage":
        raise InvalidInput("a compressor polynomial is supported for the single_stage circuit",
                           field="compressor.polynomial")
    if any(v is not None for v in (spec.cooling_capacity, spec.heating_capacity, spec.mass_flow,
                                   spec.compressor.displacement)):
        raise InvalidInput("with a compressor polynomial the polynomial sets the size: leave out "
                           "cooling_capacity, heating_capacity, mass_flow and displacement",
                           field="compressor.polynomial")
    if poly.power is None or (poly.mass_flow is None and poly.capacity is None):
        raise InvalidInput("the cycle needs the power polynomial and the mass_flow (or "
                           "capacity) polynomial", field="compressor.polynomial.coefficients")
    first = single_stage.solve(m, spec)
    suction, discharge = first.suction, first.discharge
    te = m.saturated_at_pressure(suction.pressure, 1.0).temperature
    tc = m.saturated_at_pressure(discharge.pressure, 1.0).temperature
    result = evaluate_polynomial(replace(poly, refrigerant=m.name), te, tc,
                                 suction.temperature - te, spec.subcooling)
    corrected = result.corrected
    if corrected.mass_flow is None or corrected.isentropic_efficiency is None:
        raise InvalidInput("the polynomials do not give a mass flow and an isentropic "
                           "efficiency at this point", field="compressor.polynomial")
    compressor = CompressorSpec(isentropic_efficiency=corrected.isentropic_efficiency,
                                heat_loss_fraction=spec.compressor.heat_loss_fraction)
    sized = replace(spec, compressor=compressor, mass_flow=corrected.mass_flow)
    solved = assemble(m, sized, single_stage.solve(m, sized))
    return solved._replace(remarks=solved.remarks + tuple(result.remarks))
