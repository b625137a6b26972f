"""Line sizing: every catalogue size judged against the limits, the smallest that meets them all.

Each size is run as the whole line (straight tube, fittings, added equivalent length, rise) and
judged on:

- ``temperature_penalty``: the drop of saturation temperature the pressure drop causes,
  ``T_sat(p_in) - T_sat(p_out)`` [K] (dew point for vapour lines, where the compressor or the
  condenser sees it; bubble point and friction only for the liquid line), against
  ``max_temperature_penalty``;
- velocity [m/s] at the line's mean conditions between ``min_velocity`` (oil carried along
  horizontal runs) and ``max_velocity`` (noise, liquid hammer);
- vapour risers: oil carried up at the minimum load, ``minimum_load_fraction`` of the full-load
  mass flow, by the criterion of Jacobs et al. (1976) (:mod:`heatlift.lines.oil_return`);
- liquid lines: the subcooling left at the outlet after friction and static head,
  ``T_bubble(p_out) - T_in`` [K]; none left means flash gas at the expansion valve;
- the ASME B31.5 allowed working pressure against the design pressure of that side.

A size that fails only limits a larger size would meet is ``undersized``; only limits a smaller
one would meet, ``oversized``; one that fails the pressure rating, or limits both ways,
``unsuitable``. The recommendation is the smallest ``ok`` size. When no single size suits a
vapour riser (the size that keeps the penalty carries no oil at the minimum load), a riser of
its own size is sought under the horizontal run, and failing that a double riser: a small
riser that carries the oil at the minimum load alone and a large one beside it that, with the
small one, carries the full load within the penalty while both still lift oil.
"""

from __future__ import annotations

from dataclasses import dataclass

from heatlift.errors import InvalidInput, Remark, SIValue
from heatlift.lines import oil_return, rating
from heatlift.lines.duty import Duty
from heatlift.lines.hydraulics import (
    FITTING_TYPES,
    Fitting,
    Flow,
    PressureDropParts,
    Section,
    TubeTooSmall,
    flow,
    friction_factor,
)
from heatlift.lines.tubes import Tube, check_material, sizes
from heatlift.properties import PropertyModel, State, model


@dataclass(frozen=True)
class Limits:
    """``max_temperature_penalty`` [K] for the whole line, velocities [m/s],
    ``minimum_load_fraction`` [1] of the full-load mass flow for oil return, and an optional
    ``max_pressure_drop`` [Pa] (lines above the critical pressure have no saturation
    temperature: there it defaults to :data:`SUPERCRITICAL_DROP_SHARE` of the inlet pressure)."""

    max_temperature_penalty: float
    min_velocity: float
    max_velocity: float
    minimum_load_fraction: float
    max_pressure_drop: float | None = None


# common practice, no source: the penalties are the trade's usual budgets (about 1 K of
# saturation temperature on the suction and the discharge line, 0.5 K of friction on the liquid
# line); the velocities keep oil moving along horizontal vapour runs (the hot, dense discharge
# gas needs less), stay below noise on vapour lines and below liquid hammer at a closing
# solenoid valve on the liquid line
DEFAULT_LIMITS = {
    "suction": Limits(1.0, 4.0, 20.0, 0.25),
    "discharge": Limits(1.0, 2.5, 18.0, 0.25),
    "liquid": Limits(0.5, 0.0, 1.5, 0.25),
}


@dataclass(frozen=True)
class Route:
    """The line's straight ``length`` [m] (the riser included), its ``fittings``, an
    ``additional_equivalent_length`` [m] and the ``rise`` [m] from inlet to outlet."""

    length: float
    rise: float = 0.0
    fittings: tuple[Fitting, ...] = ()
    additional_equivalent_length: float = 0.0


@dataclass(frozen=True)
class LineRequest:
    duty: Duty
    route: Route
    standard: str
    schedule: str | None
    limits: Limits
    design_temperature: float | None = None
    design_pressure: float | None = None
    brazed_joints: bool = True
    atmospheric_pressure: float = 101_325.0


@dataclass(frozen=True)
class OilReturn:
    """The riser criterion for this size: ``minimum_velocity`` [m/s], ``minimum_mass_flow``
    [kg/s], ``minimum_capacity`` [W] (None without a cooling capacity), the velocity at the
    minimum load [m/s]; ``ok`` is False only for a riser that will hold oil at minimum load."""

    riser: bool
    applies: bool
    minimum_velocity: float
    minimum_mass_flow: float
    minimum_capacity: float | None
    velocity_at_minimum_load: float
    dimensionless_gas_velocity_at_minimum_load: float
    ok: bool


@dataclass(frozen=True)
class Checks:
    """Each limit: met (True), failed (False), or not applicable (None)."""

    temperature_penalty: bool | None
    pressure_drop: bool | None
    min_velocity: bool | None
    max_velocity: bool
    oil_return: bool | None
    flash_gas: bool | None
    pressure_rating: bool


@dataclass(frozen=True)
class Candidate:
    """One size judged as the whole line [SI]."""

    nominal_size: str
    standard: str
    outside_diameter: float
    inside_diameter: float
    wall_thickness: float
    velocity: float
    reynolds_number: float
    friction_factor: float
    loss_coefficient: float
    pressure_drop: float
    pressure_drop_parts: PressureDropParts
    temperature_penalty: float | None
    outlet_pressure: float
    outlet_temperature: float
    oil_return: OilReturn | None
    subcooling_remaining: float | None
    flash_gas: bool | None
    pressure_rating: rating.PressureRating
    checks: Checks
    verdict: str
    reasons: tuple[Remark, ...]
    segments: int


@dataclass(frozen=True)
class RiserTube:
    """One riser of a riser arrangement at full load: its share of the flow [kg/s], velocity
    and the velocity that carries oil [m/s]; whether it lifts oil at full and at minimum load
    (None where it carries no flow at minimum load: the trap of a double riser's large riser
    fills with oil and closes it)."""

    nominal_size: str
    inside_diameter: float
    mass_flow: float
    velocity: float
    minimum_velocity: float
    carries_oil_at_full_load: bool
    carries_oil_at_minimum_load: bool | None


@dataclass(frozen=True)
class RiserDesign:
    """A vapour riser sized apart from the horizontal run: ``single`` (one smaller riser) or
    ``double`` (a small and a large riser in parallel). Pressure drop [Pa] and penalty [K] of
    the whole line at full load."""

    arrangement: str
    horizontal_size: str
    risers: tuple[RiserTube, ...]
    riser_length: float
    horizontal_length: float
    pressure_drop: float
    temperature_penalty: float | None
    ok: bool
    reasons: tuple[Remark, ...]


@dataclass(frozen=True)
class SizingResult:
    refrigerant: str
    line: str
    standard: str
    schedule: str | None
    duty: Duty
    limits: Limits
    design: rating.DesignBasis
    candidates: tuple[Candidate, ...]
    recommended: Candidate | None
    riser_design: RiserDesign | None
    remarks: tuple[Remark, ...]
    caution: str


@dataclass(frozen=True)
class CheckResult:
    refrigerant: str
    line: str
    standard: str
    schedule: str | None
    duty: Duty
    limits: Limits
    design: rating.DesignBasis
    candidate: Candidate
    remarks: tuple[Remark, ...]
    caution: str


class NoSizeCarries(InvalidInput):
    """Even the largest size of the catalogue fails the limits that a larger tube would meet."""

    title = "No size in the catalogue carries this duty"


SUPERCRITICAL_DROP_SHARE = 0.01  # common practice, no source: 1 % of the inlet pressure

# -- helpers ------------------------------------------------------------------------------------


def _k(value: float) -> SIValue:
    return SIValue(value, "temperature_difference")


def _v(value: float) -> SIValue:
    return SIValue(value, "velocity")


def _p(value: float) -> SIValue:
    return SIValue(value, "pressure")


def _gauge(value: float) -> SIValue:
    """A gauge pressure, written as a pressure difference from the atmosphere."""
    return SIValue(value, "pressure_drop")


def check_route(route: Route) -> None:
    if abs(route.rise) > route.length:
        raise InvalidInput(
            "the rise {rise} is longer than the line itself, {length}: the vertical rise (or "
            "drop) is part of the straight length, so it can be at most {length} either way",
            {"rise": SIValue(route.rise, "length"), "length": SIValue(route.length, "length")},
            field="rise",
        )
    for i, f in enumerate(route.fittings):
        if f.type not in FITTING_TYPES:
            raise InvalidInput(f"fitting type must be one of {', '.join(FITTING_TYPES)}",
                               field=f"fittings.{i}.type")
        if f.type == "bend" and (f.angle_degrees is None or f.radius_ratio is None):
            raise InvalidInput("a fitting of type bend needs angle_degrees and radius_ratio",
                               field=f"fittings.{i}")
        if f.type == "other" and f.loss_coefficient is None:
            raise InvalidInput("a fitting of type other needs its loss_coefficient",
                               field=f"fittings.{i}.loss_coefficient")


def _saturation(m: PropertyModel, pressure: float, quality: float) -> float | None:
    """Saturation temperature [K] at ``pressure`` or None outside the saturation range."""
    if not m.limits.pressure_min <= pressure < m.critical_pressure:
        return None
    return m.saturated_at_pressure(pressure, quality).temperature


def _penalty(m: PropertyModel, line: str, p_in: float, drop: float) -> float | None:
    quality = 0.0 if line == "liquid" else 1.0
    t_in = _saturation(m, p_in, quality)
    t_out = _saturation(m, p_in - drop, quality)
    if t_in is None or t_out is None:
        return None
    return t_in - t_out


def caution(m: PropertyModel) -> str:
    text = ("Pressure ratings are estimates after ASME B31.5 (wall-thickness formula, allowable "
            "stresses from its tables as recalled, design pressure from a design temperature); "
            "local codes (EN 378, ISO 5149, ASME B31.5 as adopted) and a licensed practitioner "
            "decide.")
    ref = m.refrigerant
    if ref.is_flammable:
        text += (f" {m.name} is ASHRAE 34 safety class {ref.safety_class} (flammable): joints, "
                 "charge limits, ventilation and ignition sources fall under EN 378, ISO 5149 "
                 "and IEC 60335-2-40; these figures do not replace that assessment.")
    return text


# -- one size -----------------------------------------------------------------------------------


def _whole_line(route: Route, tube: Tube) -> Section:
    return Section(tube, route.length, route.rise, route.fittings,
                   route.additional_equivalent_length)


def _oil(
    duty: Duty, limits: Limits, tube: Tube, density: float, riser: bool
) -> OilReturn:
    carry = oil_return.evaluate(duty.mass_flow * limits.minimum_load_fraction, density,
                                tube.inside_diameter, tube.flow_area)
    capacity = None if duty.cooling_per_mass_flow is None else \
        carry.minimum_mass_flow * duty.cooling_per_mass_flow
    v_low = duty.mass_flow * limits.minimum_load_fraction / (density * tube.flow_area)
    applies = riser and oil_return.applies_to(duty.refrigerant)
    ok = (not applies) or carry.dimensionless_gas_velocity >= oil_return.CRITERION
    return OilReturn(riser, applies, carry.minimum_velocity, carry.minimum_mass_flow, capacity,
                     v_low, carry.dimensionless_gas_velocity, ok)


def evaluate(request: LineRequest, tube: Tube, design: rating.DesignBasis) -> Candidate:
    """Judge ``tube`` as the whole line (raises :class:`TubeTooSmall` when hopeless)."""
    duty, route, limits = request.duty, request.route, request.limits
    m = model(duty.refrigerant)
    liquid = duty.line == "liquid"
    result = flow(m, duty.inlet, duty.mass_flow, _whole_line(route, tube), liquid)
    parts = result.parts
    penalty = _penalty(m, duty.line, duty.inlet.pressure,
                       parts.friction if liquid else parts.total)
    if penalty is None and duty.inlet.pressure < m.critical_pressure:
        raise TubeTooSmall(f"{tube.nominal_size}: the outlet leaves the saturation range")
    oil = None if liquid else _oil(duty, limits, tube, result.density, route.rise > 0.0)
    subcooling = flash = None
    static_flash = False
    if liquid:
        t_bubble = _saturation(m, result.outlet.pressure, 0.0)
        if t_bubble is not None:
            subcooling = t_bubble - duty.inlet.temperature
            flash = subcooling <= 0.0
            t_static = _saturation(m, duty.inlet.pressure - parts.static_head, 0.0)
            static_flash = t_static is not None and t_static <= duty.inlet.temperature
    max_drop = limits.max_pressure_drop
    if max_drop is None and penalty is None:
        max_drop = SUPERCRITICAL_DROP_SHARE * duty.inlet.pressure
    drop = parts.friction if liquid else parts.total
    metal = max(duty.inlet.temperature, result.outlet.temperature,
                design.design_temperature or 0.0)
    rated, _ = rating.rate(tube, design, metal, request.brazed_joints,
                           request.atmospheric_pressure)
    checks = Checks(
        temperature_penalty=None if penalty is None else
        penalty <= limits.max_temperature_penalty,
        pressure_drop=None if max_drop is None else drop <= max_drop,
        min_velocity=None if limits.min_velocity <= 0.0 else
        result.velocity >= limits.min_velocity,
        max_velocity=result.velocity <= limits.max_velocity,
        oil_return=None if oil is None or not oil.applies else oil.ok,
        flash_gas=None if flash is None else not flash,
        pressure_rating=rated.ok,
    )
    verdict, reasons = _judge(checks, result, penalty, oil, subcooling, rated, limits,
                              (drop, max_drop), static_flash)
    return Candidate(
        nominal_size=tube.nominal_size, standard=tube.standard,
        outside_diameter=tube.outside_diameter, inside_diameter=tube.inside_diameter,
        wall_thickness=tube.wall_thickness, velocity=result.velocity,
        reynolds_number=result.reynolds_number, friction_factor=result.friction_factor,
        loss_coefficient=result.loss_coefficient, pressure_drop=parts.total,
        pressure_drop_parts=parts, temperature_penalty=penalty,
        outlet_pressure=result.outlet.pressure, outlet_temperature=result.outlet.temperature,
        oil_return=oil, subcooling_remaining=subcooling, flash_gas=flash,
        pressure_rating=rated, checks=checks, verdict=verdict, reasons=tuple(reasons),
        segments=result.segments,
    )


def _judge(
    checks: Checks, result: Flow, penalty: float | None, oil: OilReturn | None,
    subcooling: float | None, rated: rating.PressureRating, limits: Limits,
    drop: tuple[float, float | None], static_flash: bool,
) -> tuple[str, list[Remark]]:
    small: list[Remark] = []
    large: list[Remark] = []
    other: list[Remark] = []
    if checks.pressure_drop is False:
        assert drop[1] is not None
        small.append(Remark("pressure_drop_exceeded",
                            "the pressure drop {dp} is above the limit {lim}",
                            {"dp": SIValue(drop[0], "pressure_drop"),
                             "lim": SIValue(drop[1], "pressure_drop")}))
    if checks.temperature_penalty is False:
        assert penalty is not None
        small.append(Remark("temperature_penalty_exceeded",
                            "the pressure drop costs {pen} of saturation temperature, more "
                            "than the limit {lim}",
                            {"pen": _k(penalty), "lim": _k(limits.max_temperature_penalty)}))
    if not checks.max_velocity:
        small.append(Remark("velocity_above_limit",
                            "the velocity {v} is above the limit {lim}",
                            {"v": _v(result.velocity), "lim": _v(limits.max_velocity)}))
    if checks.flash_gas is False:
        assert subcooling is not None
        if static_flash:
            other.append(Remark("flash_gas_static_head",
                                "the static head of the rise alone uses up the subcooling "
                                "({sc} left at the outlet): flash gas forms whatever the size; "
                                "subcool the liquid further or lower the rise",
                                {"sc": _k(subcooling)}))
        else:
            small.append(Remark("flash_gas",
                                "friction and static head use up the subcooling ({sc} left "
                                "at the outlet), so flash gas forms before the expansion "
                                "valve",
                                {"sc": _k(subcooling)}))
    if checks.min_velocity is False:
        large.append(Remark("velocity_below_limit",
                            "the velocity {v} is below the limit {lim}: oil may settle in "
                            "horizontal runs",
                            {"v": _v(result.velocity), "lim": _v(limits.min_velocity)}))
    if checks.oil_return is False:
        assert oil is not None
        large.append(Remark(
            "oil_not_returned",
            "at the minimum load ({share} of full load) the riser velocity {v} is below the "
            "{vmin} that carries oil upward (Jacobs et al. 1976, J* >= 0.85): oil will collect "
            "in the riser",
            {"share": SIValue(limits.minimum_load_fraction, "dimensionless"),
             "v": _v(oil.velocity_at_minimum_load), "vmin": _v(oil.minimum_velocity)}))
    if not checks.pressure_rating:
        other.append(Remark(
            "pressure_rating_too_low",
            f"the allowed working pressure {{awp}} gauge (ASME B31.5, {rated.stress_basis} "
            "allowable stress {s}) is below the design pressure {dp} gauge: a heavier wall is "
            "needed",
            {"awp": _gauge(rated.allowed_gauge_pressure), "dp": _gauge(rated.design_gauge_pressure),
             "s": SIValue(rated.allowable_stress, "pressure_drop")}))
    if other or (small and large):
        verdict = "unsuitable"
    elif small:
        verdict = "undersized"
    elif large:
        verdict = "oversized"
    else:
        verdict = "ok"
    reasons = small + large + other
    if verdict == "ok":
        reasons.append(_all_met(checks, result, penalty, oil, subcooling, rated, limits))
    return verdict, reasons


def _all_met(
    checks: Checks, result: Flow, penalty: float | None, oil: OilReturn | None,
    subcooling: float | None, rated: rating.PressureRating, limits: Limits,
) -> Remark:
    parts = ["meets every limit:"]
    values: dict[str, SIValue] = {"v": _v(result.velocity), "vmax": _v(limits.max_velocity),
                                  "awp": _gauge(rated.allowed_gauge_pressure),
                                  "dp": _gauge(rated.design_gauge_pressure)}
    if penalty is not None:
        parts.append("temperature penalty {pen} within {lim},")
        values.update(pen=_k(penalty), lim=_k(limits.max_temperature_penalty))
    parts.append("velocity {v} below {vmax},")
    if checks.oil_return and oil is not None:
        parts.append("oil carried up the riser down to {vlow} at minimum load (needs {vmin}),")
        values.update(vlow=_v(oil.velocity_at_minimum_load), vmin=_v(oil.minimum_velocity))
    if subcooling is not None:
        parts.append("{sc} of subcooling left at the outlet,")
        values["sc"] = _k(subcooling)
    parts.append("rated for {awp} gauge against a design pressure of {dp} gauge")
    return Remark("meets_all_limits", " ".join(parts), values)


# -- the whole catalogue ------------------------------------------------------------------------


def _prepare(request: LineRequest) -> tuple[PropertyModel, rating.DesignBasis, list[Remark]]:
    check_route(request.route)
    m = model(request.duty.refrigerant)
    remarks: list[Remark] = []
    design = rating.design_basis(m, request.duty.line, request.design_temperature,
                                 request.design_pressure)
    if request.duty.cooling_per_mass_flow is None and request.duty.line != "liquid":
        remarks.append(Remark(
            "minimum_capacity_unknown",
            "the duty was given as a mass flow, so the oil-return limit is given as a minimum "
            "mass flow only (minimum_capacity needs the cooling capacity)"))
    if request.duty.line != "liquid" and request.route.rise > 0.0 and \
            not oil_return.applies_to(m.name):
        remarks.append(Remark(
            "oil_drained_not_lifted",
            f"{m.name} does not dissolve its oil: the oil is drained from the low points (oil "
            "pots, the low-pressure receiver), not carried up risers, so the riser criterion of "
            "Jacobs et al. (1976) is not applied"))
    if request.duty.inlet.pressure >= m.critical_pressure:
        remarks.append(Remark(
            "supercritical_line",
            "the line runs above the critical pressure {pc}: no saturation temperature, so no "
            "temperature penalty; judge its pressure drop directly",
            {"pc": _p(m.critical_pressure)}))
    return m, design, remarks


def _low_temperature_remark(request: LineRequest, tube: Tube, cand: Candidate) -> Remark | None:
    floor = tube.material.minimum_temperature
    lowest = min(request.duty.inlet.temperature, cand.outlet_temperature)
    if floor is None or lowest >= floor:
        return None
    return Remark(
        "steel_below_minimum_temperature",
        f"the line runs at {{t}}, below the {{floor}} down to which {tube.material.name} may "
        "be used without impact testing (ASME B31.5): use an impact-tested low-temperature "
        "pipe such as ASTM A333 grade 6",
        {"t": SIValue(lowest, "temperature"), "floor": SIValue(floor, "temperature")})


def size(request: LineRequest) -> SizingResult:
    """Every size of the catalogue judged; the smallest that meets every limit recommended."""
    m, design, remarks = _prepare(request)
    duty = request.duty
    tubes = sizes(request.standard, request.schedule)
    check_material(m.name, tubes[0].material, request.standard)
    candidates: list[Candidate] = []
    skipped: list[str] = []
    for tube in tubes:
        try:
            candidates.append(evaluate(request, tube, design))
        except TubeTooSmall:
            skipped.append(tube.nominal_size)
    if skipped:
        remarks.append(Remark(
            "sizes_skipped",
            f"sizes {', '.join(skipped)} were left out: each would lose more than half the "
            "inlet pressure"))
    largest = candidates[-1] if candidates else None
    if largest is None or _too_small(largest):
        raise _no_size(request, largest, tubes[-1])
    recommended = next((c for c in candidates if c.verdict == "ok"), None)
    riser_design = None
    if recommended is None:
        riser_design, note = _riser_or_reason(request, tubes, candidates, design)
        remarks.append(note)
    else:
        tube = next(t for t in tubes if t.nominal_size == recommended.nominal_size)
        low = _low_temperature_remark(request, tube, recommended)
        if low is not None:
            remarks.append(low)
        if recommended.flash_gas is False and recommended.subcooling_remaining is not None \
                and recommended.subcooling_remaining < 1.0:
            remarks.append(Remark(
                "little_subcooling_left",
                "only {sc} of subcooling is left at the outlet of the recommended size: a "
                "little more pressure loss (a filter drier, a solenoid valve) would flash gas",
                {"sc": _k(recommended.subcooling_remaining)}))
    return SizingResult(
        refrigerant=m.name, line=duty.line, standard=request.standard,
        schedule=_schedule(request), duty=duty, limits=request.limits, design=design,
        candidates=tuple(candidates), recommended=recommended, riser_design=riser_design,
        remarks=tuple(remarks), caution=caution(m),
    )


def check(request: LineRequest, tube: Tube) -> CheckResult:
    """The figures of one given size."""
    m, design, remarks = _prepare(request)
    check_material(m.name, tube.material, tube.standard)
    try:
        cand = evaluate(request, tube, design)
    except TubeTooSmall as exc:
        raise InvalidInput(
            f"{tube.nominal_size} is far too small for this duty: the line would lose more than "
            "half its inlet pressure {p}; POST /v1/lines/size finds a size that fits",
            {"p": _p(request.duty.inlet.pressure)}, field="size") from exc
    low = _low_temperature_remark(request, tube, cand)
    if low is not None:
        remarks.append(low)
    return CheckResult(m.name, request.duty.line, tube.standard, tube.schedule, request.duty,
                       request.limits, design, cand, tuple(remarks), caution(m))


def _schedule(request: LineRequest) -> str | None:
    return (request.schedule or "40") if request.standard == "ASME B36.10" else None


def _too_small(c: Candidate) -> bool:
    return (c.checks.temperature_penalty is False or c.checks.pressure_drop is False
            or not c.checks.max_velocity)


def _no_size(request: LineRequest, largest: Candidate | None, tube: Tube) -> NoSizeCarries:
    limits = request.limits
    where = f"{request.standard}" + (f" schedule {_schedule(request)}"
                                     if request.standard == "ASME B36.10" else "")
    if largest is None:
        return NoSizeCarries(
            f"no {where} size carries this duty: even the largest, {tube.nominal_size}, loses "
            "more than half the inlet pressure. Split the flow into parallel lines or shorten "
            "the line", field="mass_flow")
    values = {"v": _v(largest.velocity), "vmax": _v(limits.max_velocity),
              "lim": _k(limits.max_temperature_penalty)}
    detail = "a velocity of {v} (limit {vmax})"
    if largest.temperature_penalty is not None:
        values["pen"] = _k(largest.temperature_penalty)
        detail += " and a temperature penalty of {pen} (limit {lim})"
    hint = ("ASME B36.10 steel pipe (up to NPS 12)" if request.standard != "ASME B36.10"
            else "a larger pipe than NPS 12")
    return NoSizeCarries(
        f"no {where} size carries this duty: the largest, {largest.nominal_size}, gives "
        f"{detail}. Use {hint}, split the flow into parallel lines, or allow a larger "
        "max_temperature_penalty / max_velocity",
        values, field="mass_flow")


# -- risers apart from the horizontal run -------------------------------------------------------


def _riser_or_reason(
    request: LineRequest, tubes: tuple[Tube, ...], candidates: list[Candidate],
    design: rating.DesignBasis,
) -> tuple[RiserDesign | None, Remark]:
    duty, route = request.duty, request.route
    oil_conflict = duty.line != "liquid" and route.rise > 0.0 and any(
        c.checks.oil_return is False and c.verdict in ("oversized", "unsuitable")
        and c.checks.pressure_rating for c in candidates)
    if oil_conflict:
        design_found = riser_design(request, tubes, candidates, design)
        if design_found is not None:
            word = "a riser of its own size" if design_found.arrangement == "single" else \
                "a double riser"
            return design_found, Remark(
                "no_single_size",
                f"no single size meets both the pressure-drop and the oil-return limits: the "
                f"sizes that keep the penalty hold oil in the riser at minimum load. "
                f"riser_design gives {word}")
        return None, Remark(
            "no_riser_design",
            f"no single size meets both the pressure-drop and the oil-return limits, and no "
            f"single or double riser in {request.standard} does either: raise "
            "minimum_load_fraction (capacity control with a higher minimum step), allow a "
            "larger max_temperature_penalty, or shorten the riser")
    if duty.line == "liquid" and all(c.checks.flash_gas is False for c in candidates):
        return None, Remark(
            "flash_gas_every_size",
            "flash gas forms at every size: the static head of the {rise} rise (with the "
            "friction) uses up the subcooling of the liquid; subcool it further (a subcooler, "
            "a liquid-suction heat exchanger) or lower the rise",
            {"rise": SIValue(route.rise, "length")})
    if not any(c.checks.pressure_rating for c in candidates):
        return None, Remark(
            "no_rated_size",
            f"no {request.standard} size is rated for the design pressure {{dp}}: use a "
            "heavier wall or steel pipe, or check the design pressure",
            {"dp": _p(design.design_pressure)})
    return None, Remark(
        "no_size_meets_all",
        "no size meets every limit at once (see each candidate's reasons): the velocity window "
        "and the penalty cannot both be met; relax min_velocity or max_temperature_penalty")


def riser_design(
    request: LineRequest, tubes: tuple[Tube, ...], candidates: list[Candidate],
    design: rating.DesignBasis,
) -> RiserDesign | None:
    """A single riser of its own size, or else a double riser, under the smallest horizontal
    size that meets the velocity window and the rating."""
    duty, route, limits = request.duty, request.route, request.limits
    m = model(duty.refrigerant)
    by_label = {t.nominal_size: t for t in tubes}
    ok_horizontal = [by_label[c.nominal_size] for c in candidates
                     if c.checks.pressure_rating and c.checks.max_velocity
                     and c.checks.min_velocity is not False]
    metal = max(duty.inlet.temperature, design.design_temperature or 0.0)
    rated = [t for t in tubes if rating.rate(t, design, metal, request.brazed_joints,
                                             request.atmospheric_pressure)[0].ok]
    low_flow = duty.mass_flow * limits.minimum_load_fraction
    horizontal_length = route.length - route.rise

    def carries(tube: Tube, mass_flow: float, state: State) -> bool:
        carry = oil_return.evaluate(mass_flow, state.density, tube.inside_diameter,
                                    tube.flow_area)
        return carry.dimensionless_gas_velocity >= oil_return.CRITERION

    # the small riser: the largest rated size that lifts oil at the minimum load on its own
    lifting = [t for t in rated if carries(t, low_flow, duty.inlet)]
    if not lifting:
        return None
    small = lifting[-1]
    for horizontal in ok_horizontal[:4]:
        section = Section(horizontal, horizontal_length, 0.0, route.fittings,
                          route.additional_equivalent_length)
        try:
            first = flow(m, duty.inlet, duty.mass_flow, section, False)
        except TubeTooSmall:
            continue
        if small.inside_diameter <= horizontal.inside_diameter:
            single = _single(request, m, horizontal, small, first, low_flow)
            if single is not None and single.ok:
                return single
        for large in [t for t in rated if t.inside_diameter >= small.inside_diameter]:
            double = _double(request, m, horizontal, small, large, first, low_flow)
            if double is not None and double.ok:
                return double
    return None


def _riser_tube(
    tube: Tube, mass_flow: float, state: State, low_flow: float | None
) -> RiserTube:
    carry = oil_return.evaluate(mass_flow, state.density, tube.inside_diameter, tube.flow_area)
    at_low = None
    if low_flow is not None:
        at_low = oil_return.evaluate(low_flow, state.density, tube.inside_diameter,
                                     tube.flow_area).dimensionless_gas_velocity \
            >= oil_return.CRITERION
    return RiserTube(tube.nominal_size, tube.inside_diameter, mass_flow,
                     mass_flow / (state.density * tube.flow_area), carry.minimum_velocity,
                     carry.dimensionless_gas_velocity >= oil_return.CRITERION, at_low)


def _line_penalty(m: PropertyModel, request: LineRequest, drop: float) -> float | None:
    return _penalty(m, request.duty.line, request.duty.inlet.pressure, drop)


def _single(
    request: LineRequest, m: PropertyModel, horizontal: Tube, riser: Tube, first: Flow,
    low_flow: float,
) -> RiserDesign | None:
    limits, route = request.limits, request.route
    try:
        up = flow(m, first.outlet, request.duty.mass_flow,
                  Section(riser, route.rise, route.rise), False)
    except TubeTooSmall:
        return None
    drop = first.parts.total + up.parts.total
    penalty = _line_penalty(m, request, drop)
    tube = _riser_tube(riser, request.duty.mass_flow, up.inlet, low_flow)
    ok = (penalty is not None and penalty <= limits.max_temperature_penalty
          and up.velocity <= limits.max_velocity and bool(tube.carries_oil_at_minimum_load))
    reasons = (Remark(
        "single_riser",
        "riser {riser} under a horizontal run of {horizontal}: the riser lifts oil down to the "
        "minimum load and the whole line costs {pen} (limit {lim})".replace(
            "{riser}", riser.nominal_size).replace("{horizontal}", horizontal.nominal_size),
        {"pen": _k(penalty if penalty is not None else float("nan")),
         "lim": _k(limits.max_temperature_penalty)}),)
    return RiserDesign("single", horizontal.nominal_size, (tube,), route.rise,
                       route.length - route.rise, drop, penalty, ok, reasons)


def _split(
    m: PropertyModel, state: State, mass_flow: float, small: Tube, large: Tube
) -> float:
    """The small riser's share of ``mass_flow`` [kg/s]: equal friction drop in both risers of
    equal length, ``f_a m_a^2 / D_a^5 = f_b m_b^2 / D_b^5`` (same density), by fixed point."""
    mu = m.transport_at(state.pressure, state.temperature, "vapor").viscosity
    share = small.flow_area / (small.flow_area + large.flow_area)
    for _ in range(8):
        m_a, m_b = share * mass_flow, (1.0 - share) * mass_flow
        f_a = friction_factor(4.0 * m_a / (3.141592653589793 * small.inside_diameter * mu),
                              small.roughness / small.inside_diameter)
        f_b = friction_factor(4.0 * m_b / (3.141592653589793 * large.inside_diameter * mu),
                              large.roughness / large.inside_diameter)
        ratio = ((f_b / f_a) * (small.inside_diameter / large.inside_diameter) ** 5) ** 0.5
        share = ratio / (1.0 + ratio)
    return share * mass_flow


def _double(
    request: LineRequest, m: PropertyModel, horizontal: Tube, small: Tube, large: Tube,
    first: Flow, low_flow: float,
) -> RiserDesign | None:
    limits, route = request.limits, request.route
    total = request.duty.mass_flow
    m_small = _split(m, first.outlet, total, small, large)
    try:
        up_a = flow(m, first.outlet, m_small, Section(small, route.rise, route.rise), False)
        up_b = flow(m, first.outlet, total - m_small, Section(large, route.rise, route.rise),
                    False)
    except TubeTooSmall:
        return None
    riser_drop = 0.5 * (up_a.parts.total + up_b.parts.total)
    drop = first.parts.total + riser_drop
    penalty = _line_penalty(m, request, drop)
    tube_a = _riser_tube(small, m_small, up_a.inlet, low_flow)
    tube_b = _riser_tube(large, total - m_small, up_b.inlet, None)
    ok = (penalty is not None and penalty <= limits.max_temperature_penalty
          and max(up_a.velocity, up_b.velocity) <= limits.max_velocity
          and tube_a.carries_oil_at_full_load and tube_b.carries_oil_at_full_load
          and bool(tube_a.carries_oil_at_minimum_load))
    message = (
        "double riser: small riser {small} carries the oil alone down to the minimum load; at "
        "full load it and the large riser {large} share the flow, both lift oil, and the whole "
        "line costs {pen} (limit {lim}). Trap the large riser at its foot (an oil trap, or "
        "two 90 deg elbows) and join both at the top from above, so that oil that settles in "
        "the trap at part load closes the large riser; the trap's fittings are not in these "
        "figures").replace("{small}", small.nominal_size).replace("{large}", large.nominal_size)
    reasons = (Remark("double_riser", message,
                      {"pen": _k(penalty if penalty is not None else float("nan")),
                       "lim": _k(limits.max_temperature_penalty)}),)
    return RiserDesign("double", horizontal.nominal_size, (tube_a, tube_b), route.rise,
                       route.length - route.rise, drop, penalty, ok, reasons)
