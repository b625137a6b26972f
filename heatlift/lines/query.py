"""A line-sizing question as the service receives it, and its answer.

:class:`LineQuery` holds what the caller asked (the duty in one of its forms, the route, the
catalogue, any limits and design conditions that differ from the defaults);
:func:`size_query` and :func:`check_query` resolve it into a
:class:`~heatlift.lines.sizing.LineRequest` and answer it.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from heatlift.errors import InvalidInput, SIValue
from heatlift.lines import sizing, tubes
from heatlift.lines.duty import DutySpec, resolve
from heatlift.lines.sizing import DEFAULT_LIMITS, CheckResult, LineRequest, Route, SizingResult


@dataclass(frozen=True)
class LimitOverrides:
    """Limits the caller set [K, m/s, m/s, 1]; None keeps the line type's default."""

    max_temperature_penalty: float | None = None
    min_velocity: float | None = None
    max_velocity: float | None = None
    minimum_load_fraction: float | None = None
    max_pressure_drop: float | None = None


@dataclass(frozen=True)
class LineQuery:
    duty: DutySpec
    route: Route
    standard: str | None = None
    schedule: str | None = None
    limits: LimitOverrides = LimitOverrides()
    design_temperature: float | None = None
    design_pressure: float | None = None
    brazed_joints: bool = True
    atmospheric_pressure: float = 101_325.0
    size: str | None = None


def _request(query: LineQuery, standard: str) -> LineRequest:
    sizing.check_route(query.route)
    duty = resolve(query.duty)
    limits = DEFAULT_LIMITS[duty.line]
    given = {k: v for k, v in vars(query.limits).items() if v is not None}
    limits = replace(limits, **given)
    if limits.min_velocity >= limits.max_velocity:
        raise InvalidInput(
            "min_velocity {low} must lie below max_velocity {high} (the defaults for a "
            f"{duty.line} line are {{dlow}} to {{dhigh}})",
            {"low": SIValue(limits.min_velocity, "velocity"),
             "high": SIValue(limits.max_velocity, "velocity"),
             "dlow": SIValue(DEFAULT_LIMITS[duty.line].min_velocity, "velocity"),
             "dhigh": SIValue(DEFAULT_LIMITS[duty.line].max_velocity, "velocity")},
            field="min_velocity")
    return LineRequest(
        duty=duty, route=query.route, standard=standard, schedule=query.schedule,
        limits=limits, design_temperature=query.design_temperature,
        design_pressure=query.design_pressure, brazed_joints=query.brazed_joints,
        atmospheric_pressure=query.atmospheric_pressure,
    )


def _standard(query: LineQuery, refrigerant: str) -> str:
    if query.standard is not None:
        return tubes.normalise_standard(query.standard)
    if query.size is not None:
        found = tubes.standard_of_label(query.size)
        if found is not None:
            return found
    return tubes.default_standard(refrigerant)


def _refrigerant(query: LineQuery) -> str:
    from heatlift.properties import model

    name = query.duty.refrigerant or (query.duty.cycle.refrigerant if query.duty.cycle else None)
    if name is None:
        raise InvalidInput("give the refrigerant", field="refrigerant")
    return model(name).name


def size_query(query: LineQuery) -> SizingResult:
    """Size the line of ``query`` over its catalogue."""
    refrigerant = _refrigerant(query)
    standard = _standard(query, refrigerant)
    tubes.check_material(refrigerant, tubes.catalogue(standard).material, standard)
    return sizing.size(_request(query, standard))


def check_query(query: LineQuery) -> CheckResult:
    """The figures of ``query.size``."""
    assert query.size is not None
    refrigerant = _refrigerant(query)
    standard = _standard(query, refrigerant)
    tube = tubes.find(standard, query.size, query.schedule)
    tubes.check_material(refrigerant, tube.material, standard)
    return sizing.check(_request(query, standard), tube)
