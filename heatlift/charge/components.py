"""Refrigerant mass held by each part of a circuit at its operating state.

- line: ``m = V rho``, ``V = (pi/4) d^2 L`` the inside volume, ``rho`` the mean of the densities
  at the line's two ends in the solved cycle (suction: evaporator outlet to compressor suction;
  discharge: compressor discharge to condenser or gas-cooler inlet; liquid: condenser or
  gas-cooler outlet to expansion-valve inlet);
- heat exchanger: ``m = V sum_i s_i rho_i`` over its zones (:mod:`heatlift.charge.zones`);
- receiver or accumulator: ``m = V [f rho_l + (1 - f) rho_g]`` with ``f`` the liquid fill
  fraction and the coexisting phases at the vessel's pressure (the condenser-outlet pressure for
  a receiver, the suction pressure for an accumulator, unless given); a receiver holds mostly
  liquid, so its phases are those at the bubble point (quality 0), an accumulator mostly vapour,
  so those at the dew point (quality 1).
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

from heatlift.charge.spec import LINE_KINDS, ROLES, HeatExchangerSpec, LineSpec, VesselSpec
from heatlift.charge.void import MODELS, VoidModel
from heatlift.charge.zones import Zone, exchanger_zones
from heatlift.cycle import CycleResult
from heatlift.errors import InvalidInput, OutOfRange, SIValue
from heatlift.lines import tubes
from heatlift.properties import PropertyModel, State


@dataclass(frozen=True)
class ComponentCharge:
    """The refrigerant in one part [kg, m^3, kg/m^3, 1].

    ``kind`` is line, heat_exchanger, receiver or accumulator; ``role`` the line (suction,
    discharge, liquid), the exchanger's role, or the vessel kind. ``share`` is the part's share
    of the total charge (set by :func:`heatlift.charge.estimate`).
    """

    name: str
    kind: str
    role: str
    internal_volume: float
    mean_density: float
    mass: float
    share: float = 0.0
    length: float | None = None
    inside_diameter: float | None = None
    size: str | None = None
    standard: str | None = None
    pressure: float | None = None
    fill_fraction: float | None = None
    void_model: str | None = None
    mass_flux: float | None = None
    zones: tuple[Zone, ...] = ()


# (first label found for the start, first label found for the end) of each line
_LINE_ENDS: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {
    "suction": (("evaporator_outlet",), ("compressor_suction", "low_stage_suction")),
    "discharge": (("compressor_discharge", "high_stage_discharge"),
                  ("condenser_inlet", "gas_cooler_inlet")),
    "liquid": (("condenser_outlet", "gas_cooler_outlet"), ("expansion_valve_inlet",)),
}
_EXCHANGER_ENDS = {
    "evaporator": ("evaporator_inlet", "evaporator_outlet"),
    "condenser": ("condenser_inlet", "condenser_outlet"),
    "gas_cooler": ("gas_cooler_inlet", "gas_cooler_outlet"),
}


def _first(cycle: CycleResult, labels: tuple[str, ...]) -> State | None:
    for label in labels:
        try:
            return cycle.point(label).state
        except KeyError:
            continue
    return None


def line_diameter(spec: LineSpec, refrigerant: str, index: int) -> tuple[float, str | None]:
    """Inside diameter [m] of a line, and the standard its size came from (None when given)."""
    field = f"lines.{index}"
    if spec.inside_diameter is not None:
        return spec.inside_diameter, None
    if spec.size is None:
        raise InvalidInput("give the line's inside_diameter, or its size with the standard",
                           field=f"{field}.inside_diameter")
    if spec.standard is not None:
        standard = tubes.normalise_standard(spec.standard)
    else:
        standard = tubes.standard_of_label(spec.size) or tubes.default_standard(refrigerant)
    try:
        tube = tubes.find(standard, spec.size, spec.schedule)
    except InvalidInput as exc:
        raise InvalidInput(exc.message, exc.values, field=f"{field}.size") from exc
    return tube.inside_diameter, standard


def line_charge(m: PropertyModel, cycle: CycleResult, spec: LineSpec, index: int
                ) -> ComponentCharge:
    """Refrigerant in a line: inside volume ``(pi/4) d^2 L`` [m^3] times the mean density of the
    line's end states [kg/m^3]."""
    if spec.line not in LINE_KINDS:
        raise InvalidInput(f"line must be one of {', '.join(LINE_KINDS)}",
                           field=f"lines.{index}.line")
    diameter, standard = line_diameter(spec, m.name, index)
    starts, ends = _LINE_ENDS[spec.line]
    start = _first(cycle, starts)
    if start is None:
        raise InvalidInput(f"the {cycle.circuit} circuit has no {spec.line} line",
                           field=f"lines.{index}.line")
    end = _first(cycle, ends) or start
    density = 0.5 * (start.density + end.density)
    volume = math.pi / 4.0 * diameter**2 * spec.length
    return ComponentCharge(
        name=spec.name or f"{spec.line} line", kind="line", role=spec.line,
        internal_volume=volume, mean_density=density, mass=volume * density,
        length=spec.length, inside_diameter=diameter, size=spec.size, standard=standard,
        pressure=0.5 * (start.pressure + end.pressure),
    )


def void_model(name: str, field: str) -> VoidModel:
    try:
        return MODELS[name]
    except KeyError:
        raise InvalidInput(f"model must be one of {', '.join(MODELS)}", field=field) from None


def exchanger_charge(
    m: PropertyModel, cycle: CycleResult, spec: HeatExchangerSpec, index: int,
    mass_flow_known: bool,
) -> ComponentCharge:
    """Refrigerant in a heat exchanger: ``V sum_i s_i rho_i`` over its zones [kg]."""
    field = f"heat_exchangers.{index}"
    if spec.role not in ROLES:
        raise InvalidInput(f"role must be one of {', '.join(ROLES)}", field=f"{field}.role")
    model = void_model(spec.void_model, f"{field}.model")
    start, end = _EXCHANGER_ENDS[spec.role]
    try:
        inlet_point, outlet = cycle.point(start), cycle.point(end).state
    except KeyError:
        other = "gas_cooler" if spec.role == "condenser" else "condenser"
        hint = f"; use the role {other}" if spec.role in ("condenser", "gas_cooler") else ""
        raise InvalidInput(f"the {cycle.circuit} circuit has no {spec.role.replace('_', ' ')}"
                           f"{hint}", field=f"{field}.role") from None
    flux = None
    if model.needs_mass_flux:
        if spec.tube_inside_diameter is None:
            raise InvalidInput(
                f"the {model.source} void fraction depends on the mass flux: give the "
                "exchanger's tube_inside_diameter (and circuits), or use the model zivi or "
                "homogeneous", field=f"{field}.tube_inside_diameter")
        if not mass_flow_known:
            raise InvalidInput(
                f"the {model.source} void fraction depends on the mass flux: give the cycle's "
                "cooling_capacity (or heating_capacity or mass_flow), or use the model zivi or "
                "homogeneous", field="cooling_capacity")
        area = spec.circuits * math.pi / 4.0 * spec.tube_inside_diameter**2
        flux = inlet_point.mass_flow / area
    try:
        zones = exchanger_zones(m, inlet_point.state, outlet, model, flux, spec.zone_shares)
    except InvalidInput as exc:
        if exc.field == "zone_shares":
            raise InvalidInput(exc.message, exc.values, field=f"{field}.zone_shares") from exc
        raise
    volume = spec.internal_volume
    zones = tuple(dataclasses.replace(z, volume=z.volume_share * volume,
                                      mass=z.volume_share * volume * z.mean_density)
                  for z in zones)
    density = sum(z.volume_share * z.mean_density for z in zones)
    return ComponentCharge(
        name=spec.name or spec.role.replace("_", " "), kind="heat_exchanger", role=spec.role,
        internal_volume=spec.internal_volume, mean_density=density,
        mass=spec.internal_volume * density,
        pressure=0.5 * (inlet_point.state.pressure + outlet.pressure),
        void_model=model.name, mass_flux=flux, zones=zones,
    )


def vessel_charge(
    m: PropertyModel, cycle: CycleResult, spec: VesselSpec, kind: str, index: int
) -> ComponentCharge:
    """Refrigerant in a receiver or accumulator: ``V [f rho_l + (1 - f) rho_g]`` [kg]."""
    field = f"{kind}s.{index}"
    pressure = spec.pressure
    if pressure is None:
        labels = ("condenser_outlet",) if kind == "receiver" else ("evaporator_outlet",)
        state = _first(cycle, labels)
        if state is None:
            raise InvalidInput(
                f"the {cycle.circuit} circuit has no condenser: give the receiver's pressure "
                "(below the critical pressure {pc})",
                {"pc": SIValue(m.critical_pressure, "pressure")}, field=f"{field}.pressure")
        pressure = state.pressure
    if not m.limits.pressure_min <= pressure < m.critical_pressure:
        raise OutOfRange(
            f"a {kind} holds liquid and vapour of {m.name} only between {{low}} and {{high}} "
            "(the critical pressure); got {p}",
            {"low": SIValue(m.limits.pressure_min, "pressure"),
             "high": SIValue(m.critical_pressure, "pressure"), "p": SIValue(pressure, "pressure")},
            field=f"{field}.pressure")
    phases = m.coexisting_phases(pressure, 0.0 if kind == "receiver" else 1.0)
    f = spec.fill_fraction
    density = f * phases.liquid_density + (1.0 - f) * phases.vapor_density
    return ComponentCharge(
        name=spec.name or kind, kind=kind, role=kind, internal_volume=spec.volume,
        mean_density=density, mass=spec.volume * density, pressure=pressure, fill_fraction=f,
    )
