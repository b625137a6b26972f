"""Compressor polynomials of AHRI 540 and EN 12900, corrected to actual superheat and subcooling.

A supplier rates a positive-displacement compressor with one 10-coefficient polynomial per
figure (refrigerating capacity, power input, mass flow, current) in the suction dew-point
temperature ``S`` and the discharge dew-point temperature ``D``, term order as in both standards:

    X = C1 + C2*S + C3*D + C4*S^2 + C5*S*D + C6*D^2 + C7*S^3 + C8*D*S^2 + C9*S*D^2 + C10*D^3

The coefficients hold only at the rating conditions they were fitted at: a suction superheat
(or a return-gas temperature) and a liquid subcooling. The conversion to the actual superheat
and subcooling follows the standards' method:

- mass flow scales with the suction density, ``m_a = m_r * rho_1a / rho_1r`` (the compressor
  moves the same volume per stroke; its volumetric efficiency is taken unchanged);
- capacity is that mass flow times the actual refrigerating effect,
  ``Q_a = m_a * (h_1a - h_4a)``, with ``h_4a`` the liquid at the actual subcooling (throttled at
  constant enthalpy) and ``h_1a`` the evaporator outlet at the actual superheat;
- power, by assumption ``power_correction``:
  ``"isentropic_efficiency"`` (default): the isentropic efficiency is unchanged, so power scales
  with mass flow and isentropic enthalpy rise, ``P_a = P_r * (m_a * dh_s,a) / (m_r * dh_s,r)``
  (the power correction of Dabiri and Rice (1981), with their mass-flow factor F = 1);
  ``"unchanged"``: ``P_a = P_r``, the simpler convention that superheat changes only the gas
  density, not the work per stroke.
- current scales with power (same supply voltage and power factor): ``I_a = I_r * P_a / P_r``.

Implied figures: isentropic efficiency ``eta_s = m * (h_2s - h_1) / P``; volumetric efficiency
``eta_v = m / (rho_1 * V_disp)``; ``COP = Q / P``. Temperatures are dew points throughout (the
rating standards use dew points, which matters for blends with glide): the suction pressure is
the dew pressure at ``S``, the discharge pressure the dew pressure at ``D``; subcooling counts
from the bubble point at the discharge pressure.

SI base units: K, Pa, J/kg, kg/m^3, W, kg/s, A, m^3/s.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from functools import cache, lru_cache

from heatlift.errors import InvalidInput, OutOfRange, Remark, SIValue
from heatlift.properties import State, model

FIGURES = ("capacity", "power", "mass_flow", "current")
POWER_CORRECTIONS = ("isentropic_efficiency", "unchanged")
BASES = ("SI", "IP")

# The International Table Btu, from its definition: 1 cal_IT = 4.1868 J, 1 lb = 0.45359237 kg,
# 1 degF = 5/9 K, so 1 Btu_IT = 4.1868 * 453.59237 * 5/9 J = 1055.05585262 J.
BTU_IT = 1055.05585262  # [J]
POUND = 0.45359237  # [kg]
# 1 W = 3600 / 1055.05585262 Btu/h = 3.412141633 Btu/h: also the factor EER = 3.412 * COP
BTU_PER_HOUR_PER_WATT = 3600.0 / BTU_IT

_KIND = {"capacity": "power", "power": "power", "mass_flow": "mass_flow", "current": "current"}


@dataclass(frozen=True)
class BasisFactors:
    """How to evaluate a supplier's polynomial of one basis with SI inputs and outputs.

    The polynomial's temperatures are ``t = T * temperature_scale + temperature_offset``
    (T [K]); its results times ``to_si[figure]`` are SI (W, kg/s, A).
    """

    temperature_scale: float
    temperature_offset: float
    to_si: dict[str, float]


@cache
def basis_factors(basis: str) -> BasisFactors:
    """Conversion factors of a polynomial basis: part of evaluating the polynomial itself.

    - ``SI``: S, D in degC (t = T - 273.15); capacity and power in W, mass flow in kg/s,
      current in A (all factors 1).
    - ``IP``: S, D in degF (t = 1.8 T - 459.67); capacity in Btu/h
      (1 Btu/h = 1055.05585262 / 3600 W = 0.29307107 W), power in W (I-P coefficient sheets
      after AHRI 540 give the power input in watts), mass flow in lb/h
      (1 lb/h = 0.45359237 / 3600 kg/s), current in A.
    """
    if basis == "SI":
        return BasisFactors(1.0, -273.15, dict.fromkeys(FIGURES, 1.0))
    if basis == "IP":
        return BasisFactors(1.8, -459.67, {
            "capacity": BTU_IT / 3600.0,
            "power": 1.0,
            "mass_flow": POUND / 3600.0,
            "current": 1.0,
        })
    raise InvalidInput(f"the polynomial basis must be SI or IP, not '{_literal(basis)}'",
                       field="basis")


def polynomial(c: Sequence[float], s: float, d: float) -> float:
    """The 10-coefficient polynomial of AHRI 540 / EN 12900 at suction ``s``, discharge ``d``.

    ``X = C1 + C2 S + C3 D + C4 S^2 + C5 S D + C6 D^2 + C7 S^3 + C8 D S^2 + C9 S D^2 + C10 D^3``
    in the basis' own units (``s``, ``d`` in degC or degF).
    """
    return (c[0] + c[1] * s + c[2] * d + c[3] * s * s + c[4] * s * d + c[5] * d * d
            + c[6] * s ** 3 + c[7] * d * s * s + c[8] * s * d * d + c[9] * d ** 3)


@dataclass(frozen=True)
class RatingConditions:
    """What the coefficients were fitted at: ``superheat`` [K] or ``return_gas_temperature``
    [K] (exactly one), and ``subcooling`` [K]."""

    superheat: float | None = None
    return_gas_temperature: float | None = None
    subcooling: float = 0.0

    def superheat_at(self, evaporating_dew: float) -> float:
        """The rating superheat at this evaporating dew point [K]."""
        if self.superheat is not None:
            return self.superheat
        if self.return_gas_temperature is None:
            raise InvalidInput("the rating conditions need a superheat or a return-gas "
                               "temperature", field="rating.superheat")
        superheat = self.return_gas_temperature - evaporating_dew
        if superheat < 0.0:
            raise InvalidInput(
                "the rating return-gas temperature {rg} lies below the evaporating dew point "
                "{te}: the rating would need a negative superheat",
                {"rg": SIValue(self.return_gas_temperature, "temperature"),
                 "te": SIValue(evaporating_dew, "temperature")},
                field="rating.return_gas_temperature",
            )
        return superheat


@dataclass(frozen=True)
class PolynomialSpec:
    """A supplier's compressor polynomial set and what it was fitted at.

    Coefficient tuples (10 each, C1..C10) in the units of ``basis``; ``displacement`` [m^3/s]
    (optional, for the volumetric efficiency); ``envelope`` (optional): the operating envelope
    as a polygon of (evaporating dew, condensing dew) points [K, K].
    """

    refrigerant: str
    rating: RatingConditions
    basis: str = "SI"
    capacity: tuple[float, ...] | None = None
    power: tuple[float, ...] | None = None
    mass_flow: tuple[float, ...] | None = None
    current: tuple[float, ...] | None = None
    displacement: float | None = None
    envelope: tuple[tuple[float, float], ...] | None = None
    power_correction: str = "isentropic_efficiency"

    def coefficients(self) -> dict[str, tuple[float, ...]]:
        return {name: c for name in FIGURES if (c := getattr(self, name)) is not None}


@dataclass(frozen=True)
class OperatingPoint:
    """Refrigerant states at one compressor operating point [SI].

    ``suction`` is the evaporator outlet (= compressor suction), ``liquid`` the condenser
    outlet (its enthalpy is the evaporator inlet's after throttling), ``discharge_isentropic``
    the state at the discharge pressure with the suction entropy.
    """

    refrigerant: str
    evaporating_temperature: float
    condensing_temperature: float
    pressure_evaporating: float
    pressure_condensing: float
    superheat: float
    subcooling: float
    suction: State
    liquid: State
    discharge_isentropic: State

    @property
    def refrigerating_effect(self) -> float:
        """``h_1 - h_4`` [J/kg]."""
        return self.suction.enthalpy - self.liquid.enthalpy

    @property
    def isentropic_work(self) -> float:
        """``h_2s - h_1`` [J/kg]."""
        return self.discharge_isentropic.enthalpy - self.suction.enthalpy


def _t(value: float) -> SIValue:
    return SIValue(value, "temperature")


def _dt(value: float) -> SIValue:
    return SIValue(value, "temperature_difference")


def _literal(text: str) -> str:
    """Caller text made safe for a message template."""
    return text[:40].replace("{", "{{").replace("}", "}}")


@lru_cache(maxsize=4096)
def operating_point(
    designation: str,
    evaporating_dew: float,
    condensing_dew: float,
    superheat: float,
    subcooling: float,
) -> OperatingPoint:
    """States at evaporating and condensing dew points [K], superheat and subcooling [K].

    Cached: a datasheet repeats its rating points for every model.
    """
    m = model(designation)
    m.check_saturation_temperature(evaporating_dew, field="evaporating_temperature")
    m.check_saturation_temperature(condensing_dew, field="condensing_temperature")
    if evaporating_dew >= condensing_dew:
        raise InvalidInput(
            "the evaporating dew point {te} must lie below the condensing dew point {tc}",
            {"te": _t(evaporating_dew), "tc": _t(condensing_dew)},
            field="evaporating_temperature",
        )
    if superheat < 0.0 or subcooling < 0.0:
        raise InvalidInput("superheat and subcooling cannot be negative", field="superheat")
    dew_evaporating = m.saturated_at_temperature(evaporating_dew, 1.0)
    dew_condensing = m.saturated_at_temperature(condensing_dew, 1.0)
    p_evap, p_cond = dew_evaporating.pressure, dew_condensing.pressure
    suction = (dew_evaporating if superheat == 0.0
               else m.at_pressure_temperature(p_evap, evaporating_dew + superheat))
    bubble = m.saturated_at_pressure(p_cond, 0.0)
    t_liquid = bubble.temperature - subcooling
    if subcooling == 0.0:
        liquid = bubble
    elif t_liquid <= m.limits.temperature_min:
        raise OutOfRange(
            "a subcooling of {sc} takes the liquid below {low}, where the equation of state of "
            f"{m.name} ends; at this condensing pressure the subcooling must stay below {{max}}",
            {"sc": _dt(subcooling), "low": _t(m.limits.temperature_min),
             "max": _dt(bubble.temperature - m.limits.temperature_min)},
            field="subcooling",
        )
    else:
        liquid = m.at_pressure_temperature(p_cond, t_liquid)
    discharge = m.at_pressure_entropy(p_cond, suction.entropy)
    return OperatingPoint(m.name, evaporating_dew, condensing_dew, p_evap, p_cond, superheat,
                          subcooling, suction, liquid, discharge)


def polynomial_values(spec: PolynomialSpec, evaporating_dew: float,
                      condensing_dew: float) -> dict[str, float]:
    """Each polynomial of ``spec`` at the dew points [K], in SI (W, kg/s, A), uncorrected.

    A value at or below zero means the polynomial is used far outside its fitted range: an
    :class:`InvalidInput` error.
    """
    f = basis_factors(spec.basis)
    s = evaporating_dew * f.temperature_scale + f.temperature_offset
    d = condensing_dew * f.temperature_scale + f.temperature_offset
    out: dict[str, float] = {}
    for name, c in spec.coefficients().items():
        if len(c) != 10:
            raise InvalidInput(f"the {name} polynomial needs 10 coefficients C1..C10, "
                               f"not {len(c)}", field=f"coefficients.{name}")
        value = polynomial(c, s, d) * f.to_si[name]
        if not math.isfinite(value) or value <= 0.0:
            shown = value if math.isfinite(value) else 0.0
            raise InvalidInput(
                f"the {name.replace('_', ' ')} polynomial gives {{value}} at {{te}} / {{tc}}: "
                "not a usable figure; the point lies far outside the range the coefficients "
                "were fitted for, or the coefficients or their basis are wrong",
                {"value": SIValue(shown, _KIND[name]), "te": _t(evaporating_dew),
                 "tc": _t(condensing_dew)},
                field=f"coefficients.{name}",
            )
        out[name] = value
    return out


def inside_polygon(x: float, y: float, polygon: Sequence[tuple[float, float]]) -> bool:
    """Whether (x, y) lies inside or on the edge of ``polygon`` (even-odd ray casting).

    A point on an edge counts as inside: an envelope's edge is a permitted operating point.
    """
    n = len(polygon)
    inside = False
    for i in range(n):
        x1, y1 = polygon[i]
        x2, y2 = polygon[(i + 1) % n]
        cross = (x2 - x1) * (y - y1) - (y2 - y1) * (x - x1)
        length = math.hypot(x2 - x1, y2 - y1)
        if (abs(cross) <= 1e-9 * max(length, 1.0)
                and min(x1, x2) - 1e-9 <= x <= max(x1, x2) + 1e-9
                and min(y1, y2) - 1e-9 <= y <= max(y1, y2) + 1e-9):
            return True
        if (y1 > y) != (y2 > y):
            x_cross = x1 + (y - y1) * (x2 - x1) / (y2 - y1)
            if x < x_cross:
                inside = not inside
    return inside


def _check_envelope(polygon: Sequence[tuple[float, float]]) -> None:
    if len(polygon) < 3:
        raise InvalidInput("an envelope needs at least 3 points (evaporating, condensing)",
                           field="envelope")
    area = 0.5 * sum(polygon[i][0] * polygon[(i + 1) % len(polygon)][1]
                     - polygon[(i + 1) % len(polygon)][0] * polygon[i][1]
                     for i in range(len(polygon)))
    if abs(area) < 1e-9:
        raise InvalidInput("the envelope polygon encloses no area: its points lie on one line",
                           field="envelope")


@dataclass(frozen=True)
class Performance:
    """Compressor figures at one set of superheat and subcooling [SI]; None where the
    polynomials given do not determine a figure."""

    superheat: float
    subcooling: float
    suction_temperature: float
    suction_density: float
    refrigerating_effect: float
    isentropic_work: float
    capacity: float | None
    power: float | None
    mass_flow: float | None
    current: float | None
    cop: float | None
    isentropic_efficiency: float | None
    volumetric_efficiency: float | None


@dataclass(frozen=True)
class PolynomialResult:
    """A polynomial set evaluated at one operating point: as rated and corrected [SI]."""

    refrigerant: str
    basis: str
    power_correction: str
    evaporating_temperature: float
    condensing_temperature: float
    pressure_evaporating: float
    pressure_condensing: float
    rating: Performance
    corrected: Performance
    within_envelope: bool | None
    remarks: tuple[Remark, ...] = field(default_factory=tuple)


def _performance(point: OperatingPoint, capacity: float | None, power: float | None,
                 mass_flow: float | None, current: float | None,
                 displacement: float | None) -> Performance:
    cop = capacity / power if capacity is not None and power is not None else None
    eta_s = (mass_flow * point.isentropic_work / power
             if mass_flow is not None and power is not None else None)
    eta_v = (mass_flow / (point.suction.density * displacement)
             if mass_flow is not None and displacement is not None else None)
    return Performance(point.superheat, point.subcooling, point.suction.temperature,
                       point.suction.density, point.refrigerating_effect, point.isentropic_work,
                       capacity, power, mass_flow, current, cop, eta_s, eta_v)


def _efficiency_remarks(rating: Performance, corrected: Performance) -> list[Remark]:
    """A remark for each implied efficiency above 1 (once when rated and corrected agree)."""
    out: list[Remark] = []
    for name, hint in (
        ("isentropic_efficiency", "the power polynomial is too low for the mass flow, or the "
                                  "basis is wrong"),
        ("volumetric_efficiency", "check the displacement (at the rated speed)"),
    ):
        seen: list[float] = []
        for perf, label in ((rating, "as rated"), (corrected, "corrected")):
            value = getattr(perf, name)
            if value is None or value <= 1.0 or any(abs(value - v) < 1e-9 for v in seen):
                continue
            seen.append(value)
            out.append(Remark(
                f"implausible_{name}",
                f"the implied {name.replace('_', ' ')} ({label}) is {value:.3f}, above 1: {hint}",
            ))
    return out


def evaluate_polynomial(
    spec: PolynomialSpec,
    evaporating_dew: float,
    condensing_dew: float,
    superheat: float | None = None,
    subcooling: float | None = None,
) -> PolynomialResult:
    """Evaluate ``spec`` at the dew points [K] and correct it to ``superheat``, ``subcooling`` [K].

    ``None`` for ``superheat`` or ``subcooling`` means the rating's own. Returns the figures
    at the rating conditions (``rating``) and at the actual ones (``corrected``), all SI
    (W, kg/s, A). See the module docstring for the conversion.
    """
    if spec.power_correction not in POWER_CORRECTIONS:
        raise InvalidInput(f"power_correction must be one of {', '.join(POWER_CORRECTIONS)}",
                           field="power_correction")
    if not spec.coefficients():
        raise InvalidInput("give the coefficients of at least one of capacity, power, mass_flow "
                           "or current", field="coefficients")
    remarks: list[Remark] = []
    te, tc = evaporating_dew, condensing_dew
    rated = operating_point(spec.refrigerant, te, tc, spec.rating.superheat_at(te),
                            spec.rating.subcooling)
    if superheat is None:
        superheat = spec.rating.superheat_at(te)
    if subcooling is None:
        subcooling = spec.rating.subcooling
    actual = operating_point(spec.refrigerant, te, tc, superheat, subcooling)
    raw = polynomial_values(spec, te, tc)

    mass_r = raw.get("mass_flow")
    capacity_r = raw.get("capacity")
    if mass_r is None and capacity_r is not None:
        mass_r = capacity_r / rated.refrigerating_effect
    elif mass_r is not None and capacity_r is None:
        capacity_r = mass_r * rated.refrigerating_effect
    elif mass_r is not None and capacity_r is not None:
        implied = mass_r * rated.refrigerating_effect
        if abs(capacity_r / implied - 1.0) > 0.02:
            remarks.append(Remark(
                "polynomials_disagree",
                f"the capacity polynomial gives {{capacity}}, the mass-flow polynomial times "
                f"the refrigerating effect at the rating conditions gives {{implied}} "
                f"({capacity_r / implied - 1.0:+.1%}): the two sets do not describe the same "
                "compressor at the same rating conditions; the corrected capacity follows the "
                "mass-flow polynomial",
                {"capacity": SIValue(capacity_r, "power"), "implied": SIValue(implied, "power")},
            ))
    power_r, current_r = raw.get("power"), raw.get("current")

    density_ratio = actual.suction.density / rated.suction.density
    if spec.power_correction == "isentropic_efficiency":
        power_ratio = density_ratio * actual.isentropic_work / rated.isentropic_work
    else:
        power_ratio = 1.0
    mass_a = mass_r * density_ratio if mass_r is not None else None
    capacity_a = mass_a * actual.refrigerating_effect if mass_a is not None else None
    power_a = power_r * power_ratio if power_r is not None else None
    current_a = current_r * power_ratio if current_r is not None else None

    rating = _performance(rated, capacity_r, power_r, mass_r, current_r, spec.displacement)
    corrected = _performance(actual, capacity_a, power_a, mass_a, current_a, spec.displacement)
    remarks += _efficiency_remarks(rating, corrected)

    within = None
    if spec.envelope is not None:
        _check_envelope(spec.envelope)
        within = inside_polygon(te, tc, spec.envelope)
        if not within:
            remarks.append(Remark(
                "outside_envelope",
                "the point {te} / {tc} lies outside the operating envelope given: the "
                "polynomial extrapolates and the compressor may not run there",
                {"te": _t(te), "tc": _t(tc)},
            ))
    return PolynomialResult(
        refrigerant=rated.refrigerant,
        basis=spec.basis,
        power_correction=spec.power_correction,
        evaporating_temperature=te,
        condensing_temperature=tc,
        pressure_evaporating=rated.pressure_evaporating,
        pressure_condensing=rated.pressure_condensing,
        rating=rating,
        corrected=corrected,
        within_envelope=within,
        remarks=tuple(remarks),
    )
