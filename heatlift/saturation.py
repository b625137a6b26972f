"""Saturation look-ups: bubble and dew points, glide and latent heat, pure fluids and blends.

For a pure fluid (or an azeotrope) bubble and dew coincide. For a zeotropic blend at one
pressure the dew temperature lies above the bubble temperature by the temperature glide,
``glide = T_dew(p) - T_bubble(p)`` [K].
"""

from __future__ import annotations

from dataclasses import dataclass

from heatlift.properties import State, model


@dataclass(frozen=True)
class Saturation:
    """Saturation at one temperature or one pressure [SI].

    ``liquid`` is the bubble point, ``vapor`` the dew point. By temperature both are at the
    given temperature (so their pressures differ for a blend) and ``glide`` is taken at the dew
    pressure; by pressure both are at the given pressure. ``latent_heat`` is
    ``h_vapor - h_liquid`` of those two points [J/kg].
    """

    refrigerant: str
    temperature_bubble: float
    temperature_dew: float
    pressure_bubble: float
    pressure_dew: float
    glide: float
    latent_heat: float
    liquid: State
    vapor: State


def _result(designation: str, liquid: State, vapor: State, glide: float) -> Saturation:
    return Saturation(
        refrigerant=designation,
        temperature_bubble=liquid.temperature,
        temperature_dew=vapor.temperature,
        pressure_bubble=liquid.pressure,
        pressure_dew=vapor.pressure,
        glide=glide,
        latent_heat=vapor.enthalpy - liquid.enthalpy,
        liquid=liquid,
        vapor=vapor,
    )


def at_temperature(designation: str, temperature: float) -> Saturation:
    """Bubble and dew points at ``temperature`` [K]."""
    m = model(designation)
    m.check_saturation_temperature(temperature, field="temperature")
    liquid = m.saturated_at_temperature(temperature, 0.0)
    vapor = m.saturated_at_temperature(temperature, 1.0)
    glide = 0.0
    if vapor.pressure != liquid.pressure:
        glide = temperature - m.saturated_at_pressure(vapor.pressure, 0.0).temperature
    return _result(m.name, liquid, vapor, glide)


def at_pressure(designation: str, pressure: float) -> Saturation:
    """Bubble and dew points at absolute ``pressure`` [Pa]."""
    m = model(designation)
    m.check_saturation_pressure(pressure, field="pressure")
    liquid = m.saturated_at_pressure(pressure, 0.0)
    vapor = m.saturated_at_pressure(pressure, 1.0)
    return _result(m.name, liquid, vapor, vapor.temperature - liquid.temperature)


@dataclass(frozen=True)
class SaturationTable:
    refrigerant: str
    by: str
    rows: list[Saturation]


def table(
    designation: str, by: str, start: float, stop: float, step: float, max_points: int
) -> SaturationTable:
    """Saturation rows from ``start`` to ``stop`` (inclusive) in steps of ``step`` [K or Pa]."""
    from heatlift.errors import InvalidInput, SIValue

    kind, step_kind = ("temperature", "temperature_difference") if by == "temperature" else (
        "pressure", "pressure_drop")
    if stop < start:
        raise InvalidInput(
            "stop ({stop}) lies below start ({start}); give start <= stop",
            {"stop": SIValue(stop, kind), "start": SIValue(start, kind)}, field="stop",
        )
    m = model(designation)
    check = m.check_saturation_temperature if by == "temperature" else m.check_saturation_pressure
    check(start, field="start")
    check(stop, field="stop")
    rows_wanted = (stop - start) / step + 1e-9  # inf for a vanishing step
    if rows_wanted >= max_points:
        wanted = f"{int(rows_wanted) + 1}" if rows_wanted < 1e9 else "more than a billion"
        raise InvalidInput(
            f"the table would have {wanted} rows; the limit is {max_points} rows: use a larger "
            "step (at least {step_min}) or a narrower range",
            {"step_min": SIValue((stop - start) / max(max_points - 1, 1), step_kind)},
            field="step",
        )
    count = int(rows_wanted) + 1
    lookup = at_temperature if by == "temperature" else at_pressure
    # min(): the last row may overshoot stop by rounding (and stop may be just below critical)
    rows = [lookup(designation, min(start + i * step, stop)) for i in range(count)]
    return SaturationTable(m.name, by, rows)
