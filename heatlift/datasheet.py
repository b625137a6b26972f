"""Consistency checks of compressor datasheet rows, for catalogue CI.

A row names a model, a refrigerant, a rating point (evaporating and condensing dew points,
superheat or return-gas temperature, subcooling) and the figures the supplier claims. Each check
compares a claim with what the claims around it and the refrigerant's equation of state imply:

1. ``capacity``: claimed capacity against ``m * (h_1 - h_4)``, the claimed mass flow times the
   refrigerating effect at the rating point.
2. ``carnot``: the COP (claimed, else EER / 3.412, else capacity / power) against the Carnot COP
   of the dew points, ``T_e / (T_c - T_e)``; ``isentropic_efficiency``: the implied
   ``eta_s = m * (h_2s - h_1) / P`` inside a plausible band (``m`` claimed, else
   ``Q / (h_1 - h_4)``); ``volumetric_efficiency``: ``eta_v = m / (rho_1 * V_disp)`` inside a
   plausible band, when a displacement is claimed.
3. ``cop``: claimed COP against capacity / power; ``eer``: claimed EER [Btu/Wh] against
   ``3.412142 * COP`` (1 W = 3.412142 Btu/h).
4. ``polynomial_<figure>``: the row's polynomial (assumed fitted at the row's own superheat and
   subcooling) at the rating point against the claimed capacity, power, mass flow, current.
5. ``pressure_evaporating``, ``pressure_condensing``: claimed saturation pressures against the
   dew pressures at the claimed dew points (with a hint when a claim matches the gauge pressure
   or, for a blend, the bubble pressure instead).

Relative checks pass within ``<name>_warn``, warn within ``<name>_fail`` and fail beyond it; the
default tolerances and their reasons are in :class:`Tolerances`. A row's verdict is its worst
check's; a row whose inputs cannot be computed fails with an ``input`` check.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable, Iterator, Sequence
from dataclasses import dataclass, field

from heatlift.compressor import (
    BTU_PER_HOUR_PER_WATT,
    PolynomialSpec,
    operating_point,
    polynomial_values,
)
from heatlift.errors import HeatliftError, InvalidInput, SIValue
from heatlift.properties import model
from heatlift.tolerances import Tolerances

VERDICTS = ("pass", "warn", "fail")
_HUGE = 1e300  # stands in for a ratio that overflows, so that every number stays finite
STANDARD_ATMOSPHERE = 101_325.0  # [Pa], for the gauge-pressure hint only

_FIGURE_CLAIM = {"capacity": "cooling_capacity", "power": "power", "mass_flow": "mass_flow",
                 "current": "current"}
_KIND = {"capacity": "power", "power": "power", "mass_flow": "mass_flow", "current": "current"}


@dataclass(frozen=True)
class DatasheetRow:
    """One datasheet row [SI]: conditions, and claims (None = not claimed)."""

    model: str
    refrigerant: str
    evaporating_temperature: float
    condensing_temperature: float
    subcooling: float
    superheat: float | None = None
    return_gas_temperature: float | None = None
    cooling_capacity: float | None = None
    power: float | None = None
    cop: float | None = None
    eer: float | None = None
    mass_flow: float | None = None
    current: float | None = None
    displacement: float | None = None
    pressure_evaporating: float | None = None
    pressure_condensing: float | None = None
    polynomial: PolynomialSpec | None = None
    line: int | None = None


@dataclass(frozen=True)
class Check:
    """The outcome of one check of one row.

    ``claimed`` and ``computed`` are of quantity ``kind`` (SI; ``eer`` in Btu/Wh);
    ``deviation`` is dimensionless, formed as ``measure`` says; ``warn`` and ``fail`` are the
    limits applied (a pair ``(low, high)`` for a band). ``message`` is a template filled from
    ``values`` in the caller's units.
    """

    name: str
    number: int
    verdict: str
    kind: str
    claimed: float | None
    computed: float | None
    deviation: float | None
    measure: str
    warn: float | tuple[float, float] | None
    fail: float | tuple[float, float] | None
    message: str
    values: dict[str, SIValue] = field(default_factory=dict)

    def render(self, fmt) -> str:  # type: ignore[no-untyped-def]
        return self.message.format(**{k: fmt(v) for k, v in self.values.items()})


@dataclass(frozen=True)
class RowReport:
    """The checks of one row and its verdict, the worst of them."""

    row: int
    line: int | None
    model: str | None
    refrigerant: str | None
    verdict: str
    checks: tuple[Check, ...]


@dataclass(frozen=True)
class Summary:
    rows: int
    passed: int
    warned: int
    failed: int
    verdict: str


@dataclass(frozen=True)
class Validation:
    rows: tuple[RowReport, ...]
    summary: Summary
    tolerances: Tolerances


def _worst(verdicts: Iterable[str]) -> str:
    return max(verdicts, key=VERDICTS.index, default="pass")


def _escape(text: str) -> str:
    return text.replace("{", "{{").replace("}", "}}")


def _relative(name: str, number: int, kind: str, claimed: float, computed: float,
              warn: float, fail: float, what: str, *, label: str = "",
              extra: dict[str, SIValue] | None = None,
              hint: Callable[[], str] | None = None) -> Check:
    """A claim against a computed value: ``deviation = claimed / computed - 1``.

    ``what`` (a trusted template part, may name ``extra`` values) says where the computed
    value comes from; ``label`` follows both numbers (``" Btu/Wh"`` for an EER, which has no
    kind of its own); ``hint`` adds a reason when the check does not pass.
    """
    dev = claimed / computed - 1.0
    # a deviation too large for a float (a claim of 1e300 W) fails like any large one
    verdict = "pass" if abs(dev) <= warn else "warn" if abs(dev) <= fail else "fail"
    dev = dev if math.isfinite(dev) else math.copysign(_HUGE, dev)
    message = (f"claimed {{claimed}}{label}, computed {{computed}}{label} ({what}): {dev:+.2%} "
               f"(warn beyond {warn:.1%}, fail beyond {fail:.1%})")
    if hint is not None and verdict != "pass":
        message += hint()
    shown = "dimensionless" if kind == "eer" else kind
    values = {"claimed": SIValue(claimed, shown), "computed": SIValue(computed, shown),
              **(extra or {})}
    return Check(name, number, verdict, kind, claimed, computed, dev,
                 "claimed / computed - 1", warn, fail, message, values)


def _band(name: str, number: int, kind: str, value: float, claimed: float, computed: float,
          measure: str, warn: tuple[float, float], fail: tuple[float, float],
          what: str, how: str) -> Check:
    """An implied efficiency ``value`` (the deviation, formed as ``measure``) inside a band."""
    value = value if math.isfinite(value) else _HUGE
    if warn[0] <= value <= warn[1]:
        verdict = "pass"
    elif fail[0] <= value <= fail[1]:
        verdict = "warn"
    else:
        verdict = "fail"
    message = (f"implied {what} {value:.3f} = {_escape(how)} (plausible {warn[0]:.2f} to "
               f"{warn[1]:.2f}; fail below {fail[0]:.2f} or above {fail[1]:.2f})")
    return Check(name, number, verdict, kind, claimed, computed, value, measure, warn, fail,
                 message, {})


def _checks(row: DatasheetRow, tol: Tolerances) -> list[Check]:
    m = model(row.refrigerant)
    te, tc = row.evaporating_temperature, row.condensing_temperature
    if row.superheat is not None:
        superheat = row.superheat
    elif row.return_gas_temperature is not None:
        superheat = row.return_gas_temperature - te
        if superheat < 0.0:
            raise InvalidInput(
                "the return-gas temperature {rg} lies below the evaporating dew point {te}",
                {"rg": SIValue(row.return_gas_temperature, "temperature"),
                 "te": SIValue(te, "temperature")}, field="return_gas_temperature")
    else:
        raise InvalidInput("give the superheat or the return-gas temperature of the rating point",
                           field="superheat")
    op = operating_point(m.name, te, tc, superheat, row.subcooling)
    q = op.refrigerating_effect
    checks: list[Check] = []

    # 1. capacity against mass flow times refrigerating effect
    if row.cooling_capacity is not None and row.mass_flow is not None:
        checks.append(_relative("capacity", 1, "power", row.cooling_capacity, row.mass_flow * q,
                                tol.capacity_warn, tol.capacity_fail,
                                "mass flow x refrigerating effect h1 - h4"))

    # 2. Carnot and the implied efficiencies
    cop, cop_from = row.cop, "claimed COP"
    if cop is None and row.eer is not None:
        cop, cop_from = row.eer / BTU_PER_HOUR_PER_WATT, "COP from the claimed EER"
    if cop is None and row.cooling_capacity is not None and row.power is not None:
        cop, cop_from = row.cooling_capacity / row.power, "COP from capacity / power"
    if cop is not None:
        carnot = te / (tc - te)
        ratio = min(cop / carnot, _HUGE)
        verdict = ("pass" if ratio < tol.carnot_warn else
                   "warn" if ratio < tol.carnot_fail else "fail")
        checks.append(Check(
            "carnot", 2, verdict, "dimensionless", cop, carnot, ratio, "claimed / computed",
            tol.carnot_warn, tol.carnot_fail,
            f"{cop_from} {cop:.3f} is {ratio:.1%} of the Carnot COP {carnot:.3f} of the dew "
            f"points {{te}} / {{tc}} (warn from {tol.carnot_warn:.0%}, fail from "
            f"{tol.carnot_fail:.0%})",
            {"te": SIValue(te, "temperature"), "tc": SIValue(tc, "temperature")}))
    mass, mass_from = row.mass_flow, "claimed mass flow"
    if mass is None and row.cooling_capacity is not None:
        mass, mass_from = row.cooling_capacity / q, "mass flow from capacity / (h1 - h4)"
    if mass is not None and row.power is not None:
        isentropic_power = mass * op.isentropic_work
        checks.append(_band(
            "isentropic_efficiency", 2, "power", isentropic_power / row.power, row.power,
            isentropic_power, "computed / claimed",
            (tol.isentropic_low_warn, tol.isentropic_high_warn),
            (tol.isentropic_low_fail, tol.isentropic_high_fail),
            "isentropic efficiency", f"m (h2s - h1) / P, with the {mass_from}"))
    if mass is not None and row.displacement is not None:
        swept = op.suction.density * row.displacement
        checks.append(_band(
            "volumetric_efficiency", 2, "mass_flow", mass / swept, mass, swept,
            "claimed / computed", (tol.volumetric_low_warn, tol.volumetric_high_warn),
            (tol.volumetric_low_fail, tol.volumetric_high_fail),
            "volumetric efficiency", f"m / (rho1 V), with the {mass_from}"))

    # 3. COP and EER consistent with each other and with capacity / power
    if row.cop is not None and row.cooling_capacity is not None and row.power is not None:
        checks.append(_relative("cop", 3, "dimensionless", row.cop,
                                row.cooling_capacity / row.power, tol.cop_warn, tol.cop_fail,
                                "capacity / power"))
    if row.eer is not None:
        if row.cop is not None:
            base, what = row.cop, "3.412142 x the claimed COP"
        elif row.cooling_capacity is not None and row.power is not None:
            base, what = row.cooling_capacity / row.power, "3.412142 x capacity / power"
        else:
            base, what = None, ""
        if base is not None:
            checks.append(_relative("eer", 3, "eer", row.eer, BTU_PER_HOUR_PER_WATT * base,
                                    tol.eer_warn, tol.eer_fail, what, label=" Btu/Wh"))

    # 4. the polynomial at the rating point
    if row.polynomial is not None:
        evaluated = polynomial_values(row.polynomial, te, tc)
        for figure, value in evaluated.items():
            claim = getattr(row, _FIGURE_CLAIM[figure])
            if claim is not None:
                checks.append(_relative(
                    f"polynomial_{figure}", 4, _KIND[figure], claim, value,
                    tol.polynomial_warn, tol.polynomial_fail,
                    f"the {figure.replace('_', ' ')} polynomial, {row.polynomial.basis} basis, "
                    "at the rating point"))

    # 5. saturation pressures at the dew points
    for name, claim, t, p_dew in (
        ("pressure_evaporating", row.pressure_evaporating, te, op.pressure_evaporating),
        ("pressure_condensing", row.pressure_condensing, tc, op.pressure_condensing),
    ):
        if claim is None:
            continue
        def hint(claim: float = claim, t: float = t, p_dew: float = p_dew) -> str:
            bubble = m.saturated_at_temperature(t, 0.0).pressure
            return _pressure_hint(claim, p_dew, bubble, tol.pressure_warn)

        checks.append(_relative(name, 5, "pressure", claim, p_dew, tol.pressure_warn,
                                tol.pressure_fail, "the dew pressure at {t}",
                                extra={"t": SIValue(t, "temperature")}, hint=hint))
    return checks


def _pressure_hint(claim: float, dew: float, bubble: float, warn: float) -> str:
    if abs((claim + STANDARD_ATMOSPHERE) / dew - 1.0) <= warn:
        return ("; the claim matches the gauge pressure (absolute minus 101.325 kPa): "
                "the datasheet may give gauge pressures in a column read as absolute")
    if abs(bubble / dew - 1.0) > warn and abs(claim / bubble - 1.0) <= warn:
        return ("; the claim matches the bubble pressure at that temperature: the datasheet may "
                "give bubble points where the rating uses dew points")
    return ""


def check_row(row: DatasheetRow, number: int, tolerances: Tolerances) -> RowReport:
    """All checks that the claims of ``row`` allow; ``number`` is its 1-based place."""
    try:
        checks = _checks(row, tolerances)
    except HeatliftError as exc:
        prefix = f"{exc.field}: " if exc.field else ""
        checks = [Check("input", 0, "fail", "dimensionless", None, None, None, "", None, None,
                        _escape(prefix) + exc.message, dict(exc.values))]
    if not checks:
        checks = [Check("claims", 0, "warn", "dimensionless", None, None, None, "", None, None,
                        "no claims that can be checked: give at least two of capacity, power, "
                        "COP, EER, mass flow, or a saturation pressure, or a polynomial", {})]
    return RowReport(number, row.line, row.model, row.refrigerant,
                     _worst(c.verdict for c in checks), tuple(checks))


def input_failure(number: int, line: int | None, model_name: str | None,
                  refrigerant: str | None, messages: dict[str, list[str]]) -> RowReport:
    """A row whose cells could not be read (messages already in the caller's units)."""
    text = "; ".join(f"{name}: {' '.join(msgs)}" for name, msgs in messages.items())
    check = Check("input", 0, "fail", "dimensionless", None, None, None, "", None, None,
                  _escape(text), {})
    return RowReport(number, line, model_name, refrigerant, "fail", (check,))


def reports(rows: Iterable[DatasheetRow | RowReport], tolerances: Tolerances
            ) -> Iterator[RowReport]:
    """Each row's report, in order, as it is checked (rows already reported, e.g. unreadable
    ones, pass through); ``tolerances`` already checked (:meth:`Tolerances.checked`)."""
    for i, row in enumerate(rows, start=1):
        yield row if isinstance(row, RowReport) else check_row(row, i, tolerances)


def summarise(verdicts: Sequence[str]) -> Summary:
    """The counts of each verdict and the worst of them."""
    counts = {v: verdicts.count(v) for v in VERDICTS}
    return Summary(len(verdicts), counts["pass"], counts["warn"], counts["fail"],
                   _worst(verdicts))


def validate(rows: Sequence[DatasheetRow | RowReport],
             tolerances: Tolerances | None = None) -> Validation:
    """Check every row (rows already reported, e.g. unreadable ones, pass through)."""
    tol = (tolerances or Tolerances()).checked()
    checked = tuple(reports(rows, tol))
    return Validation(checked, summarise([r.verdict for r in checked]), tol)
