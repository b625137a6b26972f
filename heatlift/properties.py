"""Thermodynamic states of refrigerants: the only module that calls CoolProp.

Each refrigerant gets one :class:`PropertyModel`, which keeps one CoolProp ``AbstractState``
(Helmholtz-energy equation of state, backend ``HEOS``) per thread, created on first use.

Pure fluids and the pseudo-pure blends that CoolProp ships (R404A, R407C, R410A, R507A) are
flashed directly. Blends built from their components are mixtures of fixed composition; their
general flashes from pressure and enthalpy or entropy cost hundreds of milliseconds, so this
module finds the phase from the bubble and dew points at the pressure first and then either
imposes the single phase (an evaluation in temperature and pressure takes microseconds) and
solves for temperature by Newton steps, or solves the two-phase state for the quality with a
bounded secant iteration on saturation flashes.

All values are SI base units: K, Pa, J/kg, J/kg/K, kg/m^3.
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from dataclasses import dataclass
from functools import cache
from typing import Any

import CoolProp
import CoolProp.CoolProp as CP

from heatlift.errors import InvalidInput, NotConverged, OutOfRange, PropertyFailure, SIValue
from heatlift.refrigerants import Refrigerant, lookup

LIBRARY_VERSION = f"CoolProp {CoolProp.__version__} ({CoolProp.__gitrevision__[:10]})"

PHASES = ("subcooled_liquid", "two_phase", "superheated_vapor", "supercritical")
_MAX_ITERATIONS = 40
_RELATIVE_TOLERANCE = 1e-10


@dataclass(frozen=True)
class State:
    """A thermodynamic state [Pa, K, J/kg, J/kg/K, kg/m^3]; ``quality`` only when two-phase."""

    pressure: float
    temperature: float
    enthalpy: float
    entropy: float
    density: float
    quality: float | None
    phase: str


@dataclass(frozen=True)
class Limits:
    """Where saturation exists for a refrigerant: lower end [K, Pa], critical point [K, Pa]."""

    temperature_min: float
    pressure_min: float
    critical_temperature: float
    critical_pressure: float


def _t(value: float) -> SIValue:
    return SIValue(value, "temperature")


def _p(value: float) -> SIValue:
    return SIValue(value, "pressure")


class PropertyModel:
    """Equation-of-state evaluations for one refrigerant (thread-safe through per-thread states)."""

    def __init__(self, refrigerant: Refrigerant) -> None:
        self.refrigerant = refrigerant
        self.name = refrigerant.designation
        self._local = threading.local()
        fluids = refrigerant.coolprop_fluids
        self.is_mixture = len(fluids) > 1
        self._backend_name = "&".join(fluids)
        self._mole_fractions: list[float] | None = None
        if self.is_mixture:
            masses = [refrigerant.composition[c] for c in refrigerant.composition]
            molar = [CP.AbstractState("HEOS", f).molar_mass() for f in fluids]
            moles = [w / m for w, m in zip(masses, molar, strict=True)]
            self._mole_fractions = [n / sum(moles) for n in moles]
        self.limits = self._find_limits()

    # -- the per-thread CoolProp state -------------------------------------------------------

    def _state(self) -> CP.AbstractState:
        state = getattr(self._local, "state", None)
        if state is None:
            state = CP.AbstractState("HEOS", self._backend_name)
            if self._mole_fractions is not None:
                state.set_mole_fractions(self._mole_fractions)
            self._local.state = state
        return state

    def _update(self, pair: Any, a: float, b: float, phase: Any = None) -> CP.AbstractState:
        state = self._state()
        try:
            if phase is not None:
                state.specify_phase(phase)
            state.update(pair, a, b)
        except ValueError as exc:
            raise PropertyFailure(
                f"the equation of state of {self.name} could not be evaluated here",
            ) from exc
        finally:
            if phase is not None:
                state.unspecify_phase()
        return state

    def _snapshot(self, state: CP.AbstractState, quality: float | None, phase: str) -> State:
        return State(
            pressure=state.p(),
            temperature=state.T(),
            enthalpy=state.hmass(),
            entropy=state.smass(),
            density=state.rhomass(),
            quality=quality,
            phase=phase,
        )

    # -- limits ---------------------------------------------------------------------------------

    def _find_limits(self) -> Limits:
        state = self._state()
        if self.is_mixture:
            # the critical point of the fixed composition: on the traced phase envelope, the
            # point where the incipient phase's density meets the bulk phase's (finding it by
            # the library's critical-point search is slower by orders and less robust)
            state.build_phase_envelope("")
            env = state.get_phase_envelope_data()
            i = min(range(len(env.T)), key=lambda k: abs(env.rhomolar_vap[k] - env.rhomolar_liq[k]))
            t_crit, p_crit = env.T[i], env.p[i]
            t_min = max(CP.AbstractState("HEOS", f).Ttriple()
                        for f in self.refrigerant.coolprop_fluids)
            t_min = max(t_min, state.Tmin())
        else:
            t_crit, p_crit = state.T_critical(), state.p_critical()
            t_min = max(state.Ttriple(), state.Tmin())
        state.update(CP.QT_INPUTS, 0.0, t_min)
        return Limits(t_min, state.p(), t_crit, p_crit)

    @property
    def critical_temperature(self) -> float:
        return self.limits.critical_temperature

    @property
    def critical_pressure(self) -> float:
        return self.limits.critical_pressure

    def normal_boiling_point(self) -> float:
        """Bubble-point temperature at 101.325 kPa [K] (for a blend: the bubble point)."""
        return self.saturated_at_pressure(101_325.0, 0.0).temperature

    # -- saturation -----------------------------------------------------------------------------

    def check_saturation_temperature(self, temperature: float, field: str | None = None) -> None:
        lim = self.limits
        if not lim.temperature_min <= temperature < lim.critical_temperature:
            raise OutOfRange(
                f"{{value}} is outside the saturation range of {self.name}: saturation exists "
                "from {low} (triple point) up to below {high} (critical point)",
                {"value": _t(temperature), "low": _t(lim.temperature_min),
                 "high": _t(lim.critical_temperature)},
                field=field,
            )

    def check_saturation_pressure(self, pressure: float, field: str | None = None) -> None:
        lim = self.limits
        if not lim.pressure_min <= pressure < lim.critical_pressure:
            raise OutOfRange(
                f"{{value}} is outside the saturation range of {self.name}: saturation exists "
                "from {low} (triple point) up to below {high} (critical point)",
                {"value": _p(pressure), "low": _p(lim.pressure_min),
                 "high": _p(lim.critical_pressure)},
                field=field,
            )

    def saturated_at_temperature(self, temperature: float, quality: float) -> State:
        """Bubble (``quality`` 0) or dew (1) point at ``temperature`` [K]."""
        self.check_saturation_temperature(temperature)
        state = self._update(CP.QT_INPUTS, quality, temperature)
        return self._snapshot(state, quality, "two_phase")

    def saturated_at_pressure(self, pressure: float, quality: float) -> State:
        """Bubble (``quality`` 0) or dew (1) point at ``pressure`` [Pa]."""
        self.check_saturation_pressure(pressure)
        state = self._update(CP.PQ_INPUTS, pressure, quality)
        return self._snapshot(state, quality, "two_phase")

    # -- states from a pressure and one more property ------------------------------------------

    def at_pressure_temperature(self, pressure: float, temperature: float) -> State:
        """State at ``pressure`` [Pa] and ``temperature`` [K]; two-phase only for blends."""
        if pressure >= self.critical_pressure or temperature >= self.critical_temperature:
            return self._single_phase_pt(pressure, temperature, "supercritical")
        self.check_saturation_pressure(pressure)
        bubble = self.saturated_at_pressure(pressure, 0.0)
        dew = self.saturated_at_pressure(pressure, 1.0)
        if temperature > dew.temperature:
            return self._single_phase_pt(pressure, temperature, "superheated_vapor")
        if temperature < bubble.temperature:
            return self._single_phase_pt(pressure, temperature, "subcooled_liquid")
        if dew.temperature - bubble.temperature < 1e-9:
            raise InvalidInput(
                f"{{t}} is the saturation temperature of {self.name} at {{p}}: temperature and "
                "pressure do not fix a two-phase state; give the quality or the enthalpy",
                {"t": _t(temperature), "p": _p(pressure)},
            )
        return self._two_phase_at(pressure, temperature, lambda s: s.temperature, bubble, dew)

    def at_pressure_enthalpy(self, pressure: float, enthalpy: float) -> State:
        """State at ``pressure`` [Pa] and specific ``enthalpy`` [J/kg]."""
        return self._at_pressure(pressure, enthalpy, "enthalpy")

    def at_pressure_entropy(self, pressure: float, entropy: float) -> State:
        """State at ``pressure`` [Pa] and specific ``entropy`` [J/kg/K]."""
        return self._at_pressure(pressure, entropy, "entropy")

    def at_pressure_quality(self, pressure: float, quality: float) -> State:
        """Two-phase state at ``pressure`` [Pa] and vapour mass fraction ``quality`` [1]."""
        self.check_saturation_pressure(pressure)
        state = self._update(CP.PQ_INPUTS, pressure, quality)
        return self._snapshot(state, quality, "two_phase")

    def at_temperature_quality(self, temperature: float, quality: float) -> State:
        """Two-phase state at ``temperature`` [K] and quality [1]."""
        self.check_saturation_temperature(temperature)
        state = self._update(CP.QT_INPUTS, quality, temperature)
        return self._snapshot(state, quality, "two_phase")

    def _at_pressure(self, pressure: float, target: float, which: str) -> State:
        def prop(state: State) -> float:
            return state.enthalpy if which == "enthalpy" else state.entropy

        if pressure >= self.critical_pressure:
            return self._single_phase_solve(pressure, target, which, "supercritical", None)
        self.check_saturation_pressure(pressure)
        bubble = self.saturated_at_pressure(pressure, 0.0)
        dew = self.saturated_at_pressure(pressure, 1.0)
        if target > prop(dew):
            return self._single_phase_solve(pressure, target, which, "superheated_vapor", dew)
        if target < prop(bubble):
            return self._single_phase_solve(pressure, target, which, "subcooled_liquid", bubble)
        return self._two_phase_at(pressure, target, prop, bubble, dew)

    # -- single phase ---------------------------------------------------------------------------

    _PHASE_FLAGS = {
        "superheated_vapor": CP.iphase_gas,
        "subcooled_liquid": CP.iphase_liquid,
        "supercritical": CP.iphase_supercritical,
    }

    def _single_phase_pt(self, pressure: float, temperature: float, phase: str) -> State:
        state = self._update(CP.PT_INPUTS, pressure, temperature, self._PHASE_FLAGS[phase])
        return self._snapshot(state, None, self._phase_name(state, phase))

    def _phase_name(self, state: CP.AbstractState, phase: str) -> str:
        if phase == "supercritical":
            return "supercritical"
        if state.p() >= self.critical_pressure or state.T() >= self.critical_temperature:
            return "supercritical"
        return phase

    def _single_phase_solve(
        self, pressure: float, target: float, which: str, phase: str, start: State | None
    ) -> State:
        """Newton steps in temperature at fixed pressure with the phase imposed.

        dh/dT = cp and ds/dT = cp/T at constant pressure, so each step is
        ``T -= (h(T) - h*) / cp`` (or ``(s(T) - s*) * T / cp``).
        """
        if not self.is_mixture:
            pair = CP.HmassP_INPUTS if which == "enthalpy" else CP.PSmass_INPUTS
            a, b = (target, pressure) if which == "enthalpy" else (pressure, target)
            state = self._update(pair, a, b)
            return self._snapshot(state, None, self._phase_name(state, phase))
        flag = self._PHASE_FLAGS[phase]
        temperature = start.temperature if start is not None else self.critical_temperature
        step_limit = 0.5 * temperature
        state = self._state()
        for _ in range(_MAX_ITERATIONS):
            state = self._update(CP.PT_INPUTS, pressure, temperature, flag)
            value = state.hmass() if which == "enthalpy" else state.smass()
            slope = state.cpmass() if which == "enthalpy" else state.cpmass() / temperature
            step = (value - target) / slope
            step = max(-step_limit, min(step_limit, step))
            temperature -= step
            if temperature < self.limits.temperature_min * 0.5:
                break
            if abs(step) < _RELATIVE_TOLERANCE * temperature:
                state = self._update(CP.PT_INPUTS, pressure, temperature, flag)
                return self._snapshot(state, None, self._phase_name(state, phase))
        raise NotConverged(
            f"no {phase.replace('_', ' ')} state of {self.name} was found at {{p}} with that "
            f"{which}",
            {"p": _p(pressure)},
        )

    # -- two phase ------------------------------------------------------------------------------

    def _two_phase_at(
        self,
        pressure: float,
        target: float,
        prop: Callable[[State], float],
        bubble: State,
        dew: State,
    ) -> State:
        """The quality at which ``prop`` of the two-phase state at ``pressure`` equals ``target``.

        For a pure fluid enthalpy and entropy are linear in quality, so the first guess is exact;
        for a blend a bounded secant iteration on saturation flashes (at most 40 steps, bracket
        kept) refines it.
        """
        low, high = prop(bubble), prop(dew)
        quality = (target - low) / (high - low)
        glide = dew.temperature - bubble.temperature
        if glide < 1e-9 or quality in (0.0, 1.0):
            return self.at_pressure_quality(pressure, min(1.0, max(0.0, quality)))
        q_lo, f_lo = 0.0, low - target
        q_hi, f_hi = 1.0, high - target
        for _ in range(_MAX_ITERATIONS):
            state = self.at_pressure_quality(pressure, quality)
            f = prop(state) - target
            if abs(f) <= _RELATIVE_TOLERANCE * 1e2 * max(abs(target), 1.0):
                return state
            if (f < 0) == (f_lo < 0):
                q_lo, f_lo = quality, f
            else:
                q_hi, f_hi = quality, f
            quality = q_lo - f_lo * (q_hi - q_lo) / (f_hi - f_lo)
            if not q_lo < quality < q_hi:
                quality = 0.5 * (q_lo + q_hi)
        raise NotConverged(
            f"the two-phase state of {self.name} at {{p}} did not converge",
            {"p": _p(pressure)},
        )

    # -- generic entry --------------------------------------------------------------------------

    def state(self, **given: float) -> State:
        """State from exactly two of pressure, temperature, enthalpy, entropy, quality [SI]."""
        names = frozenset(given)
        if len(names) != 2:
            raise InvalidInput("give exactly two of pressure, temperature, enthalpy, entropy, "
                               "quality")
        quality = given.get("quality")
        if quality is not None and not 0.0 <= quality <= 1.0:
            raise OutOfRange("quality must lie between 0 and 1", field="quality")
        if "pressure" in names:
            p = given["pressure"]
            other = next(iter(names - {"pressure"}))
            return {
                "temperature": self.at_pressure_temperature,
                "enthalpy": self.at_pressure_enthalpy,
                "entropy": self.at_pressure_entropy,
                "quality": self.at_pressure_quality,
            }[other](p, given[other])
        if names == {"temperature", "quality"}:
            return self.at_temperature_quality(given["temperature"], given["quality"])
        if self.is_mixture:
            raise InvalidInput(
                f"for the blend {self.name} give the pressure with one other property, or the "
                "temperature with the quality",
            )
        return self._general_flash(given)

    def _general_flash(self, given: dict[str, float]) -> State:
        pairs = {
            frozenset({"temperature", "enthalpy"}): (CP.HmassT_INPUTS, "enthalpy", "temperature"),
            frozenset({"temperature", "entropy"}): (CP.SmassT_INPUTS, "entropy", "temperature"),
            frozenset({"enthalpy", "entropy"}): (CP.HmassSmass_INPUTS, "enthalpy", "entropy"),
            frozenset({"enthalpy", "quality"}): (CP.HmassQ_INPUTS, "enthalpy", "quality"),
            frozenset({"entropy", "quality"}): (CP.QSmass_INPUTS, "quality", "entropy"),
        }
        pair, first, second = pairs[frozenset(given)]
        state = self._update(pair, given[first], given[second])
        return self.at_pressure_enthalpy(state.p(), state.hmass())


@cache
def model(designation: str) -> PropertyModel:
    """The (cached) property model of a catalogue refrigerant."""
    return PropertyModel(lookup(designation))
