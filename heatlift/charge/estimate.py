"""The charge estimate: every part's refrigerant, the total, its CO2-equivalent, the room's limit.

``estimate(spec)`` solves the cycle of the :class:`~heatlift.charge.spec.ChargeSpec` for its
states, adds up the refrigerant held by each line, heat exchanger, receiver and accumulator at
those states (:mod:`heatlift.charge.components`), and reports the CO2-equivalent
(:mod:`heatlift.charge.co2e`) and the charge the room allows (:mod:`heatlift.charge.limits`).
"""

from __future__ import annotations

import dataclasses
from collections import Counter
from dataclasses import dataclass

from heatlift.charge.co2e import LeakChecks, co2_equivalent, gwp, leak_checks
from heatlift.charge.components import (
    ComponentCharge,
    exchanger_charge,
    line_charge,
    vessel_charge,
)
from heatlift.charge.limits import ChargeLimit, charge_limit
from heatlift.charge.spec import ChargeSpec
from heatlift.cycle import CycleResult, CycleSpec, solve
from heatlift.errors import InvalidInput, Remark, SIValue
from heatlift.properties import model

CAUTION = (
    "Charge, CO2-equivalent and charge limit are estimates after ISO 5149-1, EN 378-1 and "
    "IEC 60335-2-40 (charge limit) and Regulation (EU) No 517/2014 (leak-check thresholds); "
    "local codes, the current regulation and a licensed practitioner decide. Flammable "
    "refrigerants (A2L, A2, A3) need "
    "ventilation, ignition-source and qualification measures that this service does not check."
)
ASSUMPTIONS = (
    "each heat-exchanger zone's share of the internal volume equals its share of the enthalpy "
    "change (uniform heat exchanged per unit volume), unless zone_shares are given",
    "two-phase density averaged over quality, quality taken linear along the zone",
    "heat-exchanger pressure: the mean of its inlet and outlet pressures",
    "line density: the mean of the densities at the line's two ends",
    "receiver: liquid and vapour at the bubble point of its pressure; accumulator: at the dew "
    "point",
)
NOMINAL_MASS_FLOW = 1.0  # [kg/s]: for a cycle without a size; the states do not depend on it


@dataclass(frozen=True)
class OperatingPoint:
    """The solved cycle whose states fix the densities; ``mass_flow_known`` is False when the
    request gave no size and the cycle was solved for 1 kg/s."""

    cycle: CycleResult
    mass_flow_known: bool

    @property
    def mass_flow(self) -> float | None:
        """Evaporator mass flow [kg/s], None when not known."""
        return self.cycle.performance.mass_flow if self.mass_flow_known else None


@dataclass(frozen=True)
class ChargeEstimate:
    """A charge estimate [kg, kg CO2e, 1].

    ``components`` each with its ``mass`` and ``share`` of ``total_charge``; ``co2_equivalent``
    [kg CO2e] on ``gwp_basis`` (None where the catalogue has no GWP on it); ``charge_limit``
    for the room when one was given; ``operating_point`` the solved cycle.
    """

    refrigerant: str
    safety_class: str
    components: tuple[ComponentCharge, ...]
    total_charge: float
    gwp_basis: str
    gwp: float | None
    co2_equivalent: float | None
    leak_checks: LeakChecks
    charge_limit: ChargeLimit | None
    operating_point: OperatingPoint
    assumptions: tuple[str, ...]
    caution: str
    remarks: tuple[Remark, ...]


def has_size(spec: CycleSpec) -> bool:
    """True when the cycle request fixes the mass flow (a capacity, a mass flow or a compressor)."""
    return any(v is not None for v in (
        spec.cooling_capacity, spec.heating_capacity, spec.mass_flow,
        spec.compressor.displacement, spec.compressor.polynomial))


def operating_point(spec: CycleSpec) -> tuple[CycleResult, bool]:
    """The solved cycle and whether its mass flow is the system's (else 1 kg/s per kg)."""
    if has_size(spec):
        return solve(spec), True
    return solve(dataclasses.replace(spec, mass_flow=NOMINAL_MASS_FLOW)), False


def _unique_names(parts: list[ComponentCharge]) -> list[ComponentCharge]:
    counts = Counter(p.name for p in parts)
    seen: Counter[str] = Counter()
    out = []
    for p in parts:
        if counts[p.name] > 1:
            seen[p.name] += 1
            p = dataclasses.replace(p, name=f"{p.name} {seen[p.name]}")
        out.append(p)
    return out


def estimate(spec: ChargeSpec) -> ChargeEstimate:
    """Estimate the refrigerant charge of the system described by ``spec``."""
    if not (spec.lines or spec.heat_exchangers or spec.receivers or spec.accumulators):
        raise InvalidInput("give at least one part that holds refrigerant: lines, "
                           "heat_exchangers, receivers or accumulators", field="lines")
    m = model(spec.cycle.refrigerant)
    refrigerant = m.refrigerant
    basis_gwp = gwp(refrigerant, spec.gwp_basis)
    cycle, flow_known = operating_point(spec.cycle)
    parts: list[ComponentCharge] = []
    parts += [line_charge(m, cycle, line, i) for i, line in enumerate(spec.lines)]
    parts += [exchanger_charge(m, cycle, hx, i, flow_known)
              for i, hx in enumerate(spec.heat_exchangers)]
    parts += [vessel_charge(m, cycle, v, "receiver", i) for i, v in enumerate(spec.receivers)]
    parts += [vessel_charge(m, cycle, v, "accumulator", i)
              for i, v in enumerate(spec.accumulators)]
    total = sum(p.mass for p in parts)
    if not total > 0.0:
        raise InvalidInput("the parts given hold no refrigerant: give lengths and volumes "
                           "above zero", field="lines")
    parts = [dataclasses.replace(p, share=p.mass / total) for p in _unique_names(parts)]
    remarks = list(cycle.remarks)
    co2e = co2_equivalent(total, refrigerant, spec.gwp_basis)
    if basis_gwp is None:
        remarks.append(Remark(
            "no_gwp",
            f"the catalogue holds no {spec.gwp_basis} GWP for {refrigerant.designation}; "
            "choose another gwp_basis for the CO2-equivalent"))
    limit = None
    if spec.space is not None:
        limit, limit_remarks = charge_limit(refrigerant, total, spec.space)
        remarks += limit_remarks
        if limit.within_limit is False and limit.allowed_charge is not None:
            remarks.append(Remark(
                "above_charge_limit",
                "the estimated charge {m} is above the {allowed} the room allows "
                f"({limit.basis})",
                {"m": SIValue(total, "mass"), "allowed": SIValue(limit.allowed_charge, "mass")}))
    return ChargeEstimate(
        refrigerant=refrigerant.designation, safety_class=refrigerant.safety_class,
        components=tuple(parts), total_charge=total, gwp_basis=spec.gwp_basis, gwp=basis_gwp,
        co2_equivalent=co2e, leak_checks=leak_checks(co2e, refrigerant), charge_limit=limit,
        operating_point=OperatingPoint(cycle, flow_known), assumptions=ASSUMPTIONS,
        caution=CAUTION,
        remarks=tuple(remarks),
    )
