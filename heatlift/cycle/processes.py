"""The processes a cycle is built from: saturation conditions, compression, throttling, drops.

Each function is one step of a circuit in SI units; the circuit modules chain them.
"""

from __future__ import annotations

from typing import NamedTuple

from heatlift.cycle.spec import CompressorSpec, PressureDrop, SaturationSpec
from heatlift.errors import InvalidInput, NotConverged, OutOfRange, SIValue
from heatlift.properties import PropertyModel, State

_new = tuple.__new__  # a named tuple from the tuple of its fields, without its Python __new__
# a superheat or subcooling below this [K] is saturation: the state is taken on the curve
SATURATED = 1e-6


def saturation_pressure(m: PropertyModel, spec: SaturationSpec, field: str,
                        pressure_only: bool = False) -> float:
    """Absolute pressure [Pa] of a saturation condition on its ``basis``.

    ``pressure_only``: the circuit needs no more of the saturated states there than their
    temperatures and densities (a condensing pressure: its states are single-phase), so a
    pure fluid's saturated h and s are left for a state that asks
    (:meth:`~heatlift.properties.PropertyModel.pressure_at_saturation`).

    ``dew``: p = p_dew(T); ``bubble``: p = p_bubble(T); ``mean``: the p at which
    (T_bubble(p) + T_dew(p)) / 2 = T, found by secant steps between the bubble and dew pressures.
    """
    if spec.pressure is not None:
        m.check_saturation_pressure(spec.pressure, field=f"{field}.pressure")
        return spec.pressure
    if spec.temperature is None:
        raise InvalidInput(f"{field}: give a temperature or a pressure", field=field)
    t = spec.temperature
    if t >= m.critical_temperature:
        raise OutOfRange(
            f"{field} temperature {{t}} is at or above the critical temperature of {m.name} "
            "({tc}): there is no condensation there. For R744 above its critical point use "
            'circuit "transcritical" with a gas_cooler.',
            {"t": SIValue(t, "temperature"), "tc": SIValue(m.critical_temperature, "temperature")},
            field=f"{field}.temperature",
        )
    if spec.basis in ("dew", "bubble"):
        quality = 1.0 if spec.basis == "dew" else 0.0
        if pressure_only:
            return m.pressure_at_saturation(t, quality, f"{field}.temperature")
        return m.saturated_at_temperature(t, quality, f"{field}.temperature").pressure
    p_dew = m.saturated_at_temperature(t, 1.0, f"{field}.temperature").pressure
    p_bubble = m.saturated_at_temperature(t, 0.0).pressure
    if abs(p_bubble - p_dew) < 1e-9 * p_dew:
        return p_dew

    def mean_error(p: float) -> float:
        t_b = m.saturated_at_pressure(p, 0.0).temperature
        t_d = m.saturated_at_pressure(p, 1.0).temperature
        return 0.5 * (t_b + t_d) - t

    p0, p1 = p_dew, p_bubble
    f0, f1 = mean_error(p0), mean_error(p1)
    for _ in range(30):
        p2 = p1 - f1 * (p1 - p0) / (f1 - f0)
        f2 = mean_error(p2)
        if abs(f2) < 1e-7:
            return p2
        p0, f0, p1, f1 = p1, f1, p2, f2
    raise NotConverged(f"{field}: the mean saturation pressure did not converge", field=field)


def mean_saturation_temperature(m: PropertyModel, pressure: float) -> float:
    """(T_bubble + T_dew) / 2 at ``pressure`` [K]."""
    t_bubble, t_dew = m.saturation_temperatures(pressure)
    return 0.5 * (t_bubble + t_dew)


def drop_in_pressure(
    m: PropertyModel, drop: PressureDrop, pressure: float, downstream: bool, field: str
) -> float:
    """A pressure drop [Pa], from a pressure or a saturation-temperature drop [K].

    A temperature drop dT at a place of pressure p (dew point T_d(p)) is the pressure change
    that moves the dew point by dT: p - p_dew(T_d - dT) when p is the upstream pressure
    (``downstream`` False) or p_dew(T_d + dT) - p when p is the downstream one.
    """
    if drop.pressure is not None:
        if drop.pressure >= pressure:
            raise InvalidInput(
                f"{field}: the pressure drop {{dp}} is not less than the pressure {{p}}",
                {"dp": SIValue(drop.pressure, "pressure_drop"), "p": SIValue(pressure, "pressure")},
                field=field,
            )
        return drop.pressure
    if not drop.saturation_temperature:
        return 0.0
    t_dew = m.saturated_at_pressure(pressure, 1.0).temperature
    if downstream:
        return m.saturated_at_temperature(t_dew + drop.saturation_temperature, 1.0).pressure \
            - pressure
    return pressure - m.saturated_at_temperature(t_dew - drop.saturation_temperature, 1.0).pressure


class Compression(NamedTuple):
    """A compression from ``suction`` to ``discharge`` with the specific work input [J/kg]."""

    suction: State
    discharge: State
    work: float
    isentropic_efficiency: float


def compress(
    m: PropertyModel, suction: State, pressure: float, compressor: CompressorSpec
) -> Compression:
    """Compression to ``pressure`` [Pa] by isentropic efficiency.

    w = (h2s - h1) / eta_is, with h2s = h(p2, s1); the shell loses ``heat_loss_fraction`` f of
    the input, so h2 = h1 + w (1 - f).
    """
    eta = compressor.isentropic_efficiency
    if eta is None:
        raise InvalidInput("compressor: give isentropic_efficiency", field="compressor")
    isentropic = m.at_pressure_entropy(pressure, suction.entropy)
    work = (isentropic.enthalpy - suction.enthalpy) / eta
    discharge = m.at_pressure_enthalpy(
        pressure, suction.enthalpy + work * (1.0 - compressor.heat_loss_fraction),
        near=isentropic,
    )
    return _new(Compression, (suction, discharge, work, eta))


def superheated(m: PropertyModel, pressure: float, superheat: float) -> State:
    """Vapour at ``pressure`` [Pa], ``superheat`` [K] above its dew point (0: saturated)."""
    if superheat < SATURATED:
        return m.saturated_at_pressure(pressure, 1.0)
    return m.at_pressure_temperature(pressure, m.saturation_temperatures(pressure)[1] + superheat)


def subcooled(m: PropertyModel, pressure: float, subcooling: float) -> State:
    """Liquid at ``pressure`` [Pa], ``subcooling`` [K] below its bubble point (0: saturated)."""
    if subcooling < SATURATED:
        return m.saturated_at_pressure(pressure, 0.0)
    return m.at_pressure_temperature(pressure, m.saturation_temperatures(pressure)[0] - subcooling)


def cooled_liquid(m: PropertyModel, liquid: State, cooling: float) -> State:
    """The liquid ``cooling`` [K] colder at the same pressure."""
    if cooling <= 0.0:
        return liquid
    return m.at_pressure_temperature(liquid.pressure, liquid.temperature - cooling)


def throttle(m: PropertyModel, inlet: State, pressure: float) -> State:
    """Isenthalpic expansion to ``pressure`` [Pa]: h2 = h1."""
    return m.at_pressure_enthalpy(pressure, inlet.enthalpy)
