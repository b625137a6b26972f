"""Thermodynamic states of refrigerants: the only module that calls CoolProp.

Each refrigerant gets one :class:`PropertyModel`, which keeps one CoolProp ``AbstractState``
(Helmholtz-energy equation of state, backend ``HEOS``) per thread, created on first use.

A state from the pressure and one more property is found by locating the phase from the
bubble and dew points at the pressure first, then either solving the single phase by Newton
steps on the equation of state with the phase imposed (:mod:`heatlift.flash`: an evaluation
at temperature and density takes microseconds, where the library's general flashes take tens
of microseconds for a pure fluid and hundreds of milliseconds for a mixture), or the
two-phase state: for a pure fluid and the library's pseudo-pure blends (R404A, R407C, R410A,
R507A) mixed linearly from the bubble and dew points, for a blend built from its components
from its fitted table or by a bounded iteration on the library's saturation flashes.
Saturation comes from the library's superancillary functions for pure fluids and from the
fitted tables (:mod:`heatlift.properties_tables`) for every blend; without tables, from the
library's flashes.

All values are SI base units: K, Pa, J/kg, J/kg/K, kg/m^3.
"""

from __future__ import annotations

import contextlib
import math
import threading
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from functools import cache
from typing import Any, NamedTuple

import CoolProp
import CoolProp.CoolProp as CP

from heatlift import flash, properties_tables, starts
from heatlift.errors import InvalidInput, NotConverged, OutOfRange, PropertyFailure, SIValue
from heatlift.refrigerants import Refrigerant, lookup

LIBRARY_VERSION = f"CoolProp {CoolProp.__version__} ({CoolProp.__gitrevision__[:10]})"

PHASES = ("subcooled_liquid", "two_phase", "superheated_vapor", "supercritical")
_MAX_ITERATIONS = 40
_RELATIVE_TOLERANCE = 1e-10
_new = tuple.__new__  # builds a named tuple from a tuple of its fields (see State)
_REMEMBERED = 512  # saturation answers a thread keeps (by pressure) before it starts afresh
_LIMIT_SLACK = 1e-9  # relative: a limit given in other units may come back rounded in the last bit
# the library's keys and input pairs read on the hot paths (a module attribute each, once)
_IT, _IH, _IS, _ID = CP.iT, CP.iHmass, CP.iSmass, CP.iDmass
_QT, _HP = CP.QT_INPUTS, CP.HmassP_INPUTS
_KINDS = {"temperature": "temperature", "pressure": "pressure", "enthalpy": "specific_enthalpy",
          "entropy": "specific_entropy", "quality": "dimensionless"}


class State(NamedTuple):
    """A thermodynamic state [Pa, K, J/kg, J/kg/K, kg/m^3]; ``quality`` only when two-phase.

    Immutable like the engine's result dataclasses, but a named tuple: a cycle builds a dozen
    of them, and a named tuple is built in a fifth of the time of a frozen dataclass. The
    hot paths build it as ``_new(State, (...))`` (``tuple.__new__``: the same named tuple,
    without the generated class's Python-level ``__new__``, in half the time).
    """

    pressure: float
    temperature: float
    enthalpy: float
    entropy: float
    density: float
    quality: float | None
    phase: str


class _Side(NamedTuple):
    """What tells a single-phase state's side of saturation: a saturated phase's temperature
    [K] and density [kg/m^3] at a pressure (a :class:`State` has both too)."""

    temperature: float
    density: float


class _PerThread(threading.local):
    """A model's per-thread objects: the library state and the remembered saturation answers
    (set up afresh in each thread on its first use)."""

    def __init__(self) -> None:
        self.state: CP.AbstractState | None = None
        # pressure [Pa] -> (bubble, dew), a side None until asked for (blends)
        self.saturation: dict[float, tuple[State | None, State | None]] = {}
        self.enveloped = False  # a blend's phase envelope is traced on the state
        self.second: CP.AbstractState | None = None
        self.components: list[CP.AbstractState] | None = None
        self.phased: dict[Any, CP.AbstractState] = {}  # phase imposed for good, by flag
        # pressure [Pa] -> (bubble, dew) sides of a pure fluid whose h and s were not asked for
        self.light: dict[float, tuple[_Side, _Side]] = {}


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
        self._local = _PerThread()
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
        # read on every evaluation: plain attributes
        self.critical_temperature = self.limits.critical_temperature
        self.critical_pressure = self.limits.critical_pressure
        self._constants = flash.constants(self._state())  # (R, M, rho_r, T_r)
        self._t_max, self._p_max = self._state().Tmax(), self._state().pmax()
        self._t_min = self.limits.temperature_min
        # a pure fluid's bubble and dew coincide; the library's pseudo-pure blends (R404A,
        # R407C, R410A, R507A) keep a glide between separate bubble and dew lines
        self._one_temperature = refrigerant.kind == "pure"
        # Newton starts from the library's tables (pure fluids and pseudo-pure blends)
        self._starts = None if self.is_mixture else starts.Starts(fluids[0])

    # -- the per-thread CoolProp state -------------------------------------------------------

    def _state(self) -> CP.AbstractState:
        state = self._local.state
        if state is None:
            state = CP.AbstractState("HEOS", self._backend_name)
            if self._mole_fractions is not None:
                state.set_mole_fractions(self._mole_fractions)
            self._local.state = state
        return state

    def _update(self, pair: Any, a: float, b: float, phase: Any = None) -> CP.AbstractState:
        """The library's flash of the thread's state (``phase`` imposed if given).

        A blend's state gets its phase envelope traced before its first general flash: the
        library's saturation flashes of a mixture start from the envelope, and without it they
        fail near the critical point (R454B's dew line above about 4.7 MPa). Traced on first
        need, per thread, not at start-up: the tables answer most saturation questions."""
        state = self._state()
        if self.is_mixture and not self._local.enveloped:
            self._trace_envelope(state)
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

    def _trace_envelope(self, state: CP.AbstractState) -> None:
        """Trace the phase envelope on this thread's state (once; where the library cannot
        trace it, the flashes start without it)."""
        self._local.enveloped = True
        with contextlib.suppress(ValueError):
            state.build_phase_envelope("")

    # -- limits ---------------------------------------------------------------------------------

    def _find_limits(self) -> Limits:
        state = self._state()
        table = self._table()
        if table is not None and table.limits is not None:
            # found when the table was built (below), read at start-up instead of tracing the
            # phase envelope in every process
            return Limits(*table.limits)
        if self.is_mixture:
            # the critical point of the fixed composition: on the traced phase envelope, the
            # point where the incipient phase's density meets the bulk phase's (finding it by
            # the library's critical-point search is slower by orders and less robust)
            state.build_phase_envelope("")
            self._local.enveloped = True
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

    def normal_boiling_point(self) -> float | None:
        """Bubble-point temperature at 101.325 kPa [K] (for a blend: the bubble point).

        None where 101.325 kPa lies below the triple-point pressure: R744 has no liquid at
        atmospheric pressure (it sublimes at about -78.5 degC).
        """
        if 101_325.0 < self.limits.pressure_min:
            return None
        return self.saturated_at_pressure(101_325.0, 0.0).temperature

    # -- saturation -----------------------------------------------------------------------------

    def check_saturation_temperature(self, temperature: float, field: str | None = None) -> None:
        lim = self.limits
        # the slack lets the triple point itself in: 0.01 degC + 273.15 is 273.15999999999997 K
        if not lim.temperature_min * (1 - _LIMIT_SLACK) <= temperature < lim.critical_temperature:
            raise OutOfRange(
                f"{{value}} is outside the saturation range of {self.name}: saturation exists "
                "from {low} (triple point) up to below {high} (critical point)",
                {"value": _t(temperature), "low": _t(lim.temperature_min),
                 "high": _t(lim.critical_temperature)},
                field=field,
            )

    def check_saturation_pressure(self, pressure: float, field: str | None = None) -> None:
        lim = self.limits
        if not lim.pressure_min * (1 - _LIMIT_SLACK) <= pressure < lim.critical_pressure:
            raise OutOfRange(
                f"{{value}} is outside the saturation range of {self.name}: saturation exists "
                "from {low} (triple point) up to below {high} (critical point)",
                {"value": _p(pressure), "low": _p(lim.pressure_min),
                 "high": _p(lim.critical_pressure)},
                field=field,
            )

    def saturated_at_temperature(self, temperature: float, quality: float,
                                 field: str | None = None) -> State:
        """Bubble (``quality`` 0) or dew (1) point at ``temperature`` [K] (``field`` names the
        input in the OutOfRange raised outside the saturation range)."""
        self.check_saturation_temperature(temperature, field)
        if self._one_temperature:
            # a pure fluid: both coexisting phases from one flash, remembered by pressure
            return self._coexisting(self._flashed(_QT, quality, temperature))[quality == 1.0]
        table = self._table()
        if table is not None:
            found = table.pressure_at(temperature, quality == 1.0)
            if found is not None:
                # the pressure whose saturation temperature is the one asked (to 1e-13): that
                # state, with the temperature as asked rather than its last-digit echo
                point = self.saturated_at_pressure(found, quality)._replace(
                    temperature=temperature)
                self._remember_side(point)
                return point
        state = self._update(CP.QT_INPUTS, quality, temperature)
        if not self.is_mixture:
            point = self._snapshot(state, quality, "two_phase")
            self._remember_side(point)
            return point
        if state.p() >= self.critical_pressure:
            # with a phase envelope built on the state, the library's flash can land on the
            # envelope's far branch (R454B dew point at 2.3 degC: 14.3 MPa, not 787 kPa):
            # the same flash on a state without an envelope
            plain = CP.AbstractState("HEOS", self._backend_name)
            assert self._mole_fractions is not None
            plain.set_mole_fractions(self._mole_fractions)
            try:
                plain.update(CP.QT_INPUTS, quality, temperature)
            except ValueError as exc:
                raise PropertyFailure(
                    f"the equation of state of {self.name} could not be evaluated here",
                ) from exc
            state = plain
        return self._snapshot(state, quality, "two_phase")

    def pressure_at_saturation(self, temperature: float, quality: float,
                               field: str | None = None) -> float:
        """The bubble (``quality`` 0) or dew (1) pressure [Pa] at ``temperature`` [K], for a
        caller that needs no more of the saturated states than their temperatures and
        densities (:meth:`saturation_sides`).

        A pure fluid: the library's saturation flash (its superancillaries: about half a
        microsecond) without evaluating the coexisting phases' h and s (two evaluations of
        the equation of state), remembered as the pressure's sides; the full states follow
        from :meth:`saturation` when a state asks for them. Other refrigerants: the full
        :meth:`saturated_at_temperature`.
        """
        if not self._one_temperature:
            return self.saturated_at_temperature(temperature, quality, field).pressure
        self.check_saturation_temperature(temperature, field)
        state = self._flashed(_QT, quality, temperature)
        p, t = state.p(), state.T()
        _bounded(self._local.light)[p] = (
            _new(_Side, (t, state.saturated_liquid_keyed_output(_ID))),
            _new(_Side, (t, state.saturated_vapor_keyed_output(_ID))))
        return p

    def saturation_sides(self, pressure: float) -> tuple[State | _Side, State | _Side]:
        """(bubble, dew) temperatures and densities at ``pressure`` [Pa]: the remembered
        states, else the remembered sides of :meth:`pressure_at_saturation`, else the states
        of :meth:`saturation`."""
        sides = self._local.light.get(pressure)
        if sides is not None and pressure not in self._local.saturation:
            return sides
        return self.saturation(pressure)

    def saturation_temperatures(self, pressure: float) -> tuple[float, float]:
        """(T_bubble, T_dew) [K] at ``pressure`` [Pa] (:meth:`saturation_sides`)."""
        bubble, dew = self.saturation_sides(pressure)
        return bubble.temperature, dew.temperature

    def _flashed(self, pair: Any, a: float, b: float) -> CP.AbstractState:
        """The library's flash of a pure fluid's thread state (no phase imposed, no envelope:
        :meth:`_update` without its blend and phase handling)."""
        state = self._state()
        try:
            state.update(pair, a, b)
        except ValueError as exc:
            raise PropertyFailure(
                f"the equation of state of {self.name} could not be evaluated here",
            ) from exc
        return state

    def _saturation_cache(self) -> dict[float, tuple[State | None, State | None]]:
        """The thread's remembered saturation answers, emptied when it holds _REMEMBERED
        pressures."""
        return _bounded(self._local.saturation)

    def _remember_pair(self, bubble: State, dew: State) -> tuple[State, State]:
        """Remember both saturated states at their pressure (the thread's last few hundred
        pressures); returns them."""
        pair = self._saturation_cache()[bubble.pressure] = (bubble, dew)
        return pair

    def _coexisting(self, state: CP.AbstractState) -> tuple[State, State]:
        """(bubble, dew) of a pure fluid from the ``state`` of one saturation flash, remembered
        at their pressure."""
        p, t = state.p(), state.T()
        liq, vap = state.saturated_liquid_keyed_output, state.saturated_vapor_keyed_output
        pair = self._saturation_cache()[p] = (
            _new(State, (p, t, liq(_IH), liq(_IS), liq(_ID), 0.0, "two_phase")),
            _new(State, (p, t, vap(_IH), vap(_IS), vap(_ID), 1.0, "two_phase")))
        return pair

    def _remember_side(self, found: State) -> None:
        """Remember one saturated state (``quality`` 0 or 1) beside its other side, if known."""
        cache = self._saturation_cache()
        bubble, dew = cache.get(found.pressure, (None, None))
        cache[found.pressure] = (found, dew) if found.quality == 0.0 else (bubble, found)

    def saturation(self, pressure: float) -> tuple[State, State]:
        """(bubble, dew) at ``pressure`` [Pa], each as :meth:`saturated_at_pressure` gives it
        (one call for the pair that most states need)."""
        found = self._local.saturation.get(pressure)
        if found is not None and found[0] is not None and found[1] is not None:
            return found  # type: ignore[return-value]
        sides = self._local.light.get(pressure)
        if sides is not None:
            # the flash that gave the sides (pressure_at_saturation), now with h and s: the
            # very states saturated_at_temperature gives, to the last bit
            return self._coexisting(self._flashed(_QT, 1.0, sides[1].temperature))
        return self.saturated_at_pressure(pressure, 0.0), self.saturated_at_pressure(pressure, 1.0)

    def saturated_at_pressure(self, pressure: float, quality: float) -> State:
        """Bubble (``quality`` 0) or dew (1) point at ``pressure`` [Pa] (another quality: the
        two-phase state at the pressure, not remembered).

        A blend's saturation flash costs about a millisecond and a cycle asks for the same
        pressures many times, so each thread remembers its last few hundred answers (the
        answers are exact either way; only time is saved).
        """
        side = quality == 1.0
        if side or quality == 0.0:
            pair = self._local.saturation.get(pressure)
            if pair is not None and pair[side] is not None:
                return pair[side]  # type: ignore[return-value]
            if pressure in self._local.light:
                return self.saturation(pressure)[side]
        self.check_saturation_pressure(pressure)
        table = self._table()
        if table is not None and table.covers(pressure) and quality in (0.0, 1.0):
            bubble, dew = self._remember_pair(*(
                State(pressure, t, h, s, 1.0 / v, q, "two_phase")
                for (t, h, s, v), q in zip(table.lines(pressure), (0.0, 1.0), strict=True)))
            return dew if side else bubble
        try:
            state = self._update(CP.PQ_INPUTS, pressure, quality)
        except PropertyFailure:
            if not self.is_mixture or quality not in (0.0, 1.0):
                raise
            state = self._saturation_by_temperature(pressure, quality)
        if not self.refrigerant.is_blend:
            # one flash of a pure fluid yields both coexisting phases: keep both (not for the
            # pseudo-pure blends R404A, R407C ...: their bubble and dew points differ)
            bubble, dew = self._coexisting(state)
            return dew if side else bubble if quality == 0.0 else \
                self._snapshot(state, quality, "two_phase")
        result = self._snapshot(state, quality, "two_phase")
        if quality in (0.0, 1.0):
            self._remember_side(result)
        return result

    def _saturation_by_temperature(self, pressure: float, quality: float) -> CP.AbstractState:
        """A blend's bubble or dew point at ``pressure`` when the library's pressure-quality
        flash fails (it does near the critical point, e.g. R454B dew at 3.4 MPa): secant steps
        on the temperature-quality flash, p_sat(T) = p, in ln p (at most 30 steps)."""
        lim = self.limits
        t0 = lim.temperature_min + 0.9 * (lim.critical_temperature - lim.temperature_min)
        t1 = t0 + 1.0

        def error(t: float) -> float:
            return math.log(self._update(CP.QT_INPUTS, quality, t).p() / pressure)

        f0, f1 = error(t0), error(t1)
        for _ in range(30):
            if f1 == f0:
                break
            t2 = t1 - f1 * (t1 - t0) / (f1 - f0)
            t2 = min(max(t2, lim.temperature_min), lim.critical_temperature - 1e-6)
            t0, f0, t1, f1 = t1, f1, t2, error(t2)
            if abs(f1) < 1e-13:
                return self._update(CP.QT_INPUTS, quality, t1)
        raise PropertyFailure(
            f"the {'dew' if quality else 'bubble'} point of {self.name} at this pressure could "
            "not be found (too near the critical point)")

    # -- states from a pressure and one more property ------------------------------------------

    def check_equation_range(self, pressure: float, temperature: float) -> None:
        """The equation of state's own range: temperature up to its Tmax, pressure up to its
        pmax (beyond them CoolProp refuses or extrapolates)."""
        t_max, p_max = self._t_max, self._p_max
        if temperature > t_max or pressure > p_max:
            raise OutOfRange(
                f"{{t}} and {{p}} lie outside the equation of state of {self.name}, which "
                "covers temperatures up to {tmax} and pressures up to {pmax}",
                {"t": _t(temperature), "p": _p(pressure), "tmax": _t(t_max),
                 "pmax": _p(p_max)},
            )

    def at_pressure_temperature(self, pressure: float, temperature: float) -> State:
        """State at ``pressure`` [Pa] and ``temperature`` [K]; two-phase only for blends."""
        if temperature > self._t_max or pressure > self._p_max:
            self.check_equation_range(pressure, temperature)
        if pressure >= self.critical_pressure or temperature >= self.critical_temperature:
            return self._single_phase_pt(pressure, temperature, "supercritical")
        # (saturation checks the saturation range of the pressure; the sides need no h or s)
        sides = self.saturation_sides(pressure)
        if temperature > sides[1].temperature:
            return self._tabled(pressure, temperature, _IT, "superheated_vapor", sides[1]) or \
                self._single_phase_pt(pressure, temperature, "superheated_vapor")
        if temperature < sides[0].temperature:
            return self._tabled(pressure, temperature, _IT, "subcooled_liquid", sides[0]) or \
                self._single_phase_pt(pressure, temperature, "subcooled_liquid")
        bubble, dew = self.saturation(pressure)
        if dew.temperature - bubble.temperature < 1e-9:
            raise InvalidInput(
                f"{{t}} is the saturation temperature of {self.name} at {{p}}: temperature and "
                "pressure do not fix a two-phase state; give the quality or the enthalpy",
                {"t": _t(temperature), "p": _p(pressure)},
            )
        return self._two_phase_at(pressure, temperature, lambda s: s.temperature, bubble, dew, 0)

    def at_pressure_enthalpy(self, pressure: float, enthalpy: float,
                             near: State | None = None) -> State:
        """State at ``pressure`` [Pa] and specific ``enthalpy`` [J/kg].

        ``near``: a single-phase state close to the answer (a compression's isentropic end
        for its real one), used as the Newton start: a start only, never an answer, so the
        result is the same with or without it to far below the engine's 1e-6."""
        return self._at_pressure(pressure, enthalpy, "enthalpy", near)

    def at_pressure_entropy(self, pressure: float, entropy: float,
                            near: State | None = None) -> State:
        """State at ``pressure`` [Pa] and specific ``entropy`` [J/kg/K] (``near``: as for
        :meth:`at_pressure_enthalpy`)."""
        return self._at_pressure(pressure, entropy, "entropy", near)

    def at_pressure_quality(self, pressure: float, quality: float) -> State:
        """Two-phase state at ``pressure`` [Pa] and vapour mass fraction ``quality`` [1].

        For a blend the library's quality is the vapour's mole fraction, which differs from
        the mass fraction where the phases' compositions (and so molar masses) differ: from the
        blend's table (:mod:`heatlift.properties_tables`) when it covers the pressure, else by
        secant steps on the library's molar quality until its mass fraction is ``quality``.

        A pure fluid and the library's pseudo-pure blends: T, h, s and the specific volume
        are linear in quality between the bubble and the dew point at the pressure (the
        library's own definition of their two-phase states), so the state is mixed from them.
        """
        if not self.is_mixture:
            return _mixed(*self.saturation(pressure), quality)
        self.check_saturation_pressure(pressure)
        if quality in (0.0, 1.0):
            state = self._update(CP.PQ_INPUTS, pressure, quality)
            return self._snapshot(state, quality, "two_phase")
        found = self._from_table(pressure, 4, quality)
        if found is not None:
            return found
        return self._mixture_two_phase(pressure, quality)

    def _from_table(self, pressure: float, which: int, target: float) -> State | None:
        """Blend's two-phase state at ``pressure`` whose property ``which`` (0 T, 1 h, 2 s,
        4 mass quality) is ``target``, from its table; None where no table covers it."""
        table = self._table()
        if table is None or not table.covers(pressure):
            return None
        found = table.two_phase(pressure, which, target)
        if found is None:
            return None
        t, h, s, v, q = found
        return State(pressure, t, h, s, 1.0 / v, q, "two_phase")

    def _mixture_two_phase(self, pressure: float, quality: float) -> State:
        """Blend, no table: the library's flash at the molar quality whose mass fraction is
        ``quality`` (secant steps from Q = q, at most 20).

        A flash whose temperature falls outside the bubble-to-dew range at the pressure (the
        library's two-phase flash of a mixture with a phase envelope built sometimes lands on
        a spurious root: R454B at 839 kPa, Q = 0.2: 286 K and -17 kJ/kg between 276.0 and
        277.5 K) is repeated on a state without the envelope.
        """
        t_low = self.saturated_at_pressure(pressure, 0.0).temperature
        t_high = self.saturated_at_pressure(pressure, 1.0).temperature
        slack = 1e-6 * t_high
        plain: CP.AbstractState | None = None

        def flashed(q_molar: float) -> CP.AbstractState:
            nonlocal plain
            state = self._update(CP.PQ_INPUTS, pressure, q_molar) if plain is None else plain
            if plain is None and t_low - slack <= state.T() <= t_high + slack:
                return state
            if plain is None:
                plain = CP.AbstractState("HEOS", self._backend_name)
                assert self._mole_fractions is not None
                plain.set_mole_fractions(self._mole_fractions)
            try:
                plain.update(CP.PQ_INPUTS, pressure, q_molar)
            except ValueError as exc:
                raise PropertyFailure(
                    f"the equation of state of {self.name} could not be evaluated here",
                ) from exc
            if not t_low - slack <= plain.T() <= t_high + slack:
                raise NotConverged(
                    f"the two-phase state of {self.name} at {{p}} did not converge",
                    {"p": _p(pressure)})
            return plain

        q0 = quality
        state = flashed(q0)
        f0 = state.Qmass() - quality
        q1 = min(1.0, max(0.0, quality - f0))
        for _ in range(20):
            state = flashed(q1)
            f1 = state.Qmass() - quality
            if abs(f1) <= 1e-12 or f1 == f0:
                break
            q0, q1, f0 = q1, min(1.0, max(0.0, q1 - f1 * (q1 - q0) / (f1 - f0))), f1
        return self._snapshot(state, state.Qmass(), "two_phase")

    def _table(self) -> properties_tables.BlendTable | None:
        """The blend's fitted saturation (built by ``heatlift warm-tables``), if any (blends
        built from components and the pseudo-pure blends; pure fluids have none)."""
        if not self.refrigerant.is_blend:
            return None
        return properties_tables.table_for(self.name)

    def at_temperature_quality(self, temperature: float, quality: float) -> State:
        """Two-phase state at ``temperature`` [K] and vapour mass fraction ``quality`` [1].

        For a blend at 0 < quality < 1 the pressure lies between the dew and the bubble
        pressure at the temperature: secant steps in p (bracket kept, at most 40) until the
        state at (p, quality) has the temperature, so that quality stays a mass fraction.
        """
        self.check_saturation_temperature(temperature)
        if not self.is_mixture or quality in (0.0, 1.0):
            state = self._update(CP.QT_INPUTS, quality, temperature)
            return self._snapshot(state, quality, "two_phase")
        lo = self.saturated_at_temperature(temperature, 1.0).pressure
        hi = self.saturated_at_temperature(temperature, 0.0).pressure
        f_lo = self.at_pressure_quality(lo, quality).temperature - temperature
        f_hi = self.at_pressure_quality(hi, quality).temperature - temperature
        for _ in range(_MAX_ITERATIONS):
            if f_hi == f_lo:
                break
            p = lo - f_lo * (hi - lo) / (f_hi - f_lo)
            if not min(lo, hi) < p < max(lo, hi):
                p = 0.5 * (lo + hi)
            found = self.at_pressure_quality(p, quality)
            f = found.temperature - temperature
            if abs(f) < 1e-9 * temperature:
                return found
            if (f < 0) == (f_lo < 0):
                lo, f_lo = p, f
            else:
                hi, f_hi = p, f
        raise NotConverged(
            f"the two-phase state of {self.name} at {{t}} did not converge", {"t": _t(temperature)})

    def coexisting_phases(self, pressure: float, quality: float,
                          surface_tension: bool = False) -> Coexistence:
        """The liquid and the vapour in equilibrium in the two-phase state at ``pressure`` [Pa]
        and ``quality`` [1] (charge estimation: void fractions need each phase's density).

        For a blend the two phases differ in composition from the blend and from each other
        (the library's coexisting-phase densities). ``surface_tension`` [N/m] on request: the
        library's correlation for a pure fluid; for a blend, which the library does not cover,
        the mole-fraction average of the components' saturated-liquid surface tensions at the
        state's temperature (a component above its critical temperature counts zero), an
        approximation.
        """
        self.check_saturation_pressure(pressure)
        state = self._update(CP.PQ_INPUTS, pressure, quality)
        temperature = state.T()
        liquid = state.saturated_liquid_keyed_output(CP.iDmass)
        vapor = state.saturated_vapor_keyed_output(CP.iDmass)
        sigma: float | None = None
        if surface_tension:
            try:
                if not self.is_mixture:
                    sigma = state.surface_tension()
                else:
                    assert self._mole_fractions is not None
                    sigma = 0.0
                    for x, component in zip(self._mole_fractions, self._components(),
                                            strict=True):
                        if temperature < component.T_critical():
                            component.update(CP.QT_INPUTS, 0.0, temperature)
                            sigma += x * component.surface_tension()
            except ValueError as exc:
                raise PropertyFailure(
                    f"the property library has no surface tension for {self.name}",
                ) from exc
        return Coexistence(pressure, temperature, quality, liquid, vapor, sigma)

    def _at_pressure(self, pressure: float, target: float, which: str,
                     near: State | None = None) -> State:
        """The state at ``pressure`` with enthalpy or entropy ``target``: the phase from the
        bubble and dew points, a single phase from the library tables' start
        (:meth:`_tabled`), else by :meth:`_spanned_solve`."""
        enthalpy = which == "enthalpy"
        key = _IH if enthalpy else _IS
        if near is not None and near.quality is not None:
            near = None  # a two-phase state is no start for a single-phase solve
        if pressure >= self.critical_pressure:
            return self._tabled(pressure, target, key, "supercritical", None) or \
                self._spanned_solve(pressure, target, which, "supercritical", None,
                                    "supercritical", "supercritical", near)
        if pressure not in self._local.saturation:
            sides = self._local.light.get(pressure)
            if sides is not None:
                # only the sides are known (a condensing pressure): the vapour first, which a
                # compression's ends are. A refined point hotter than the dew point at the
                # pressure is superheated vapour (h and s rise with T along an isobar), the
                # same state the full decision below would give; else that decision follows
                found = self._tabled(pressure, target, key, "superheated_vapor", sides[1])
                if found is not None:
                    return found
        # (saturation checks the saturation range of the pressure)
        bubble, dew = self.saturation(pressure)
        if target > (dew.enthalpy if enthalpy else dew.entropy):
            return self._tabled(pressure, target, key, "superheated_vapor", dew) or \
                self._spanned_solve(pressure, target, which, "superheated_vapor", dew,
                                    None, "superheated_vapor", near)
        if target < (bubble.enthalpy if enthalpy else bubble.entropy):
            return self._tabled(pressure, target, key, "subcooled_liquid", bubble) or \
                self._spanned_solve(pressure, target, which, "subcooled_liquid", bubble,
                                    "subcooled_liquid", None, near)
        return self._two_phase_at(pressure, target, _enthalpy_of if enthalpy else _entropy_of,
                                  bubble, dew, 1 if enthalpy else 2)

    def _spanned_solve(self, pressure: float, target: float, which: str, phase: str,
                       start: State | None, low: str | None, high: str | None,
                       near: State | None = None) -> State:
        """:meth:`_single_phase_solve`, with the span of the equation of state checked
        (:meth:`_check_span`, OutOfRange) only when the solve fails or its temperature lies
        outside the equation of state's range: a state inside costs no bound evaluations."""
        try:
            found = self._single_phase_solve(pressure, target, which, phase, start, near)
        except (NotConverged, PropertyFailure):
            self._check_span(pressure, target, which, low, high)
            raise
        if not self._t_min <= found.temperature <= self._t_max:
            self._check_span(pressure, target, which, low, high)
        return found

    def _check_span(
        self, pressure: float, target: float, which: str, low: str | None, high: str | None
    ) -> None:
        """OutOfRange when ``target`` (h or s) lies below its value at the lowest temperature of
        the equation of state (phase ``low``) or above it at the highest (phase ``high``).

        A bound that cannot itself be evaluated is not checked (the solver then decides).
        """
        bounds = []
        if low is not None:
            bounds.append((low, self.limits.temperature_min, "below", "lowest"))
        if high is not None:
            bounds.append((high, self._t_max, "above", "highest"))
        for phase, temperature, word, extreme in bounds:
            try:
                edge = self._single_phase_pt(pressure, temperature, phase)
            except (PropertyFailure, NotConverged):
                continue
            value = edge.enthalpy if which == "enthalpy" else edge.entropy
            if (target < value) if word == "below" else (target > value):
                raise OutOfRange(
                    f"{{value}} is {word} the {which} range of {self.name} at {{p}}: the "
                    f"{extreme} temperature of its equation of state, {{t}}, gives {{edge}}",
                    {"value": SIValue(target, _KINDS[which]), "p": _p(pressure),
                     "t": _t(temperature), "edge": SIValue(value, _KINDS[which])},
                )

    # -- single phase ---------------------------------------------------------------------------

    _BRANCHES = {"superheated_vapor": "vapor", "subcooled_liquid": "liquid",
                 "supercritical": "any"}  # for flash.density_at
    _PHASE_FLAGS = {
        "superheated_vapor": CP.iphase_gas,
        "subcooled_liquid": CP.iphase_liquid,
        # for the equation of state evaluated at (T, rho) the imposed phase only skips the
        # phase search; "supercritical liquid" is accepted on either side of T_c (the
        # library refuses "supercritical" below T_c)
        "supercritical": CP.iphase_supercritical_liquid,
    }

    def _single_phase_pt(self, pressure: float, temperature: float, phase: str) -> State:
        """Single-phase state at ``pressure`` [Pa] and ``temperature`` [K]: Newton in density
        on the equation of state with the phase imposed (:func:`heatlift.flash.density_at`)
        from the saturated phase's density (:meth:`_density_guess`); a pure fluid falls back
        on the library's flash. (Where the library's tables give a close start,
        :meth:`_tabled` answers first.)"""
        flag = self._PHASE_FLAGS[phase]
        rho = self._density_guess(pressure, temperature, phase)
        state = self._state()
        try:
            point = flash.density_at(state, pressure, temperature, rho, flag,
                                     self._BRANCHES[phase], self._constants)
        except flash.FlashFailure as exc:
            if self.is_mixture:
                raise NotConverged(
                    f"no {phase.replace('_', ' ')} state of {self.name} was found at {{p}} and "
                    "{t}", {"p": _p(pressure), "t": _t(temperature)},
                ) from exc
            # the library's flash, finding the phase itself above the critical pressure (an
            # imposed supercritical phase below T_c lands on a metastable root there)
            point = _point(self._update(CP.PT_INPUTS, pressure, temperature,
                                        None if phase == "supercritical" else flag))
        return self._single_phase_state(point, pressure, phase)

    def _single_phase_state(self, point: flash.Point, pressure: float, phase: str) -> State:
        """The solved single-phase ``point`` at the asked ``pressure`` [Pa].

        The pressure written is the one asked for: the solve leaves the density within 1e-9
        of the root, where a liquid's own pressure (its bulk modulus times that) can still be
        off by a part in a million. Above the critical pressure a state is supercritical;
        below it, hotter than the critical temperature, it is a superheated vapour (the
        trade's word for it).
        """
        temperature = point.temperature
        if pressure >= self.critical_pressure:
            phase = "supercritical"
        elif phase == "supercritical":
            phase = "superheated_vapor" if temperature >= self.critical_temperature else \
                "subcooled_liquid"
        return _new(State, (pressure, temperature, point.enthalpy, point.entropy,
                            point.density, None, phase))

    def _density_guess(self, pressure: float, temperature: float, phase: str) -> float:
        """A starting density [kg/m^3] for the phase at ``pressure`` [Pa], ``temperature`` [K].

        Vapour: the dew point's compressibility Z_d = p / (rho_d R T_d), relaxed towards the
        ideal gas as (T_d / T)^2.5 (the second virial term B p / (R T) falls roughly so),
        rho = p / (Z R T). Liquid of a pure fluid: the saturated liquid at the temperature
        (a saturation evaluation costs about a microsecond), compressed to the pressure with its
        isothermal compressibility; of a blend: the bubble point at the pressure, expanded along
        the saturated liquid line of its table when there is one. Supercritical: 1.5 times the
        ideal gas's density.
        """
        r_mass = self._constants[0]
        if phase == "supercritical" or pressure >= self.critical_pressure:
            if not self.is_mixture and temperature < self.critical_temperature:
                # dense, liquid-like: start above the saturated liquid so that Newton cannot
                # reach the metastable vapour-like root of the same isotherm
                return self._update(CP.QT_INPUTS, 0.0, temperature).rhomass() * 1.02
            return pressure / (r_mass * temperature) * 1.5
        if phase == "superheated_vapor":
            sat = self.saturated_at_pressure(pressure, 1.0)
            z_dew = pressure / (sat.density * r_mass * sat.temperature)
            z = 1.0 - (1.0 - z_dew) * (sat.temperature / temperature) ** 2.5
            return pressure / (z * r_mass * temperature)
        table = self._table()
        if table is None and temperature >= self.limits.temperature_min:
            return self._compressed_liquid(temperature, pressure)
        bubble = self.saturated_at_pressure(pressure, 0.0)
        if table is not None and table.covers(pressure):
            # expanded from the bubble point along the saturated liquid line of the table
            beta = table.liquid_expansion(pressure)
            return bubble.density * math.exp(max(-0.5, min(0.5, -beta * (
                temperature - bubble.temperature))))
        return bubble.density

    def _single_phase_solve(
        self, pressure: float, target: float, which: str, phase: str, start: State | None,
        near: State | None = None,
    ) -> State:
        """The single-phase state at ``pressure`` with the given enthalpy or entropy.

        Newton steps in temperature and density on the equation of state with the phase
        imposed (:func:`heatlift.flash.pressure_and`; each evaluation takes microseconds),
        starting from ``near`` when given, else from the saturated state ``start`` (where the
        library's tables give a close start, :meth:`_tabled` answers first). The start
        depends on the inputs alone, never on what the process solved before, so
        that equal requests give equal answers to the last digit. A pure fluid whose steps
        fail falls back on the library's own flash; a blend raises NotConverged. The answer
        must lie on the side of saturation the phase says.
        """
        flag = self._PHASE_FLAGS[phase]
        state = self._state()

        def solve(guess: tuple[float, float], handed_over: bool) -> flash.Point:
            point = flash.pressure_and(state, pressure, target, which, guess[0], guess[1],
                                       flag, self._constants, handed_over)
            if not self._acceptable(point, start, phase):
                raise flash.FlashFailure("converged on the other side of saturation or on a "
                                         "metastable root")
            return point

        def guesses() -> Iterator[tuple[tuple[float, float], bool]]:
            """Starts in the order tried, each with whether it was handed over."""
            if near is not None:
                yield (near.temperature, near.density), True
            elif start is not None:
                yield flash.first_guess_from_saturation(
                    start.temperature, start.density, target, which,
                    phase == "superheated_vapor"), False
            else:
                temperature = self.critical_temperature * 1.2
                yield (temperature, self._density_guess(pressure, temperature, phase)), False
            if not self.is_mixture and phase == "subcooled_liquid" and start is not None:
                # a liquid far colder than its bubble point (near the critical pressure the
                # bubble point's density is far from the cold liquid's): start on the
                # saturated liquid line where the property is the target
                yield self._liquid_line_start(pressure, target, which, start.temperature), False

        failure = flash.FlashFailure("no start given")
        for guess, handed_over in guesses():
            try:
                return self._single_phase_state(solve(guess, handed_over), pressure, phase)
            except flash.FlashFailure as exc:
                failure = exc
        if self.is_mixture:
            raise NotConverged(
                f"no {phase.replace('_', ' ')} state of {self.name} was found at {{p}} with "
                f"that {which}", {"p": _p(pressure)},
            ) from failure
        pair = CP.HmassP_INPUTS if which == "enthalpy" else CP.PSmass_INPUTS
        a, b = (target, pressure) if which == "enthalpy" else (pressure, target)
        return self._single_phase_state(_point(self._update(pair, a, b)), pressure, phase)

    def _tabled(self, pressure: float, target: float, key: Any, phase: str,
                saturated: State | _Side | None) -> State | None:
        """The single-phase state at ``pressure`` [Pa] whose property ``key`` (the library's
        ``iT``, ``iHmass`` or ``iSmass``) is ``target``, from the library tables' start
        (:mod:`heatlift.starts`) and Newton steps on the full equation of state
        (:func:`heatlift.flash.refine`): one evaluation near cycle states, two or three where
        the tables are coarser (some liquids, carbon dioxide near its critical point).

        None where the fluid has no tables, the tables have no answer, the step from their
        start is not short, or the point is not the state asked for: off the phase's side of
        the ``saturated`` state (a vapour colder or denser than its dew point, a liquid hotter
        or lighter than its bubble point: the tables interpolate across saturation in the
        cells it crosses), a metastable root above the critical pressure (``saturated``
        None), or beyond the equation of state's temperatures. The caller then solves from
        its other starts.
        """
        starts = self._starts
        if starts is None:
            return None
        flag = self._PHASE_FLAGS[phase]
        table = starts.phased.get(flag) or starts.state_for(flag)
        if table is None:
            return None
        try:
            if key is _IH:
                table.update(_HP, target, pressure)
            else:
                table.update(_TABLE_PAIRS[key], pressure, target)
        except ValueError:
            return None
        point = flash.refine(self._local.phased.get(flag) or self._phased_state(flag),
                             pressure, target, key, table.T(), table.rhomass())
        if point is None:
            return None
        temperature, rho = point.temperature, point.density
        if not self._t_min <= temperature <= self._t_max:
            return None
        if saturated is None:
            return None if self._metastable(point) else \
                self._single_phase_state(point, pressure, phase)
        if phase == "superheated_vapor":
            if temperature < saturated.temperature or rho > saturated.density:
                return None
        elif temperature > saturated.temperature or rho < saturated.density:
            return None
        return _new(State, (pressure, temperature, point.enthalpy, point.entropy, rho, None,
                            phase))

    def _phased_state(self, flag: Any) -> CP.AbstractState:
        """This thread's state of the fluid with the phase ``flag`` imposed for good (for
        :meth:`_tabled`: imposing and lifting a phase per solve costs more than a look-up)."""
        state = CP.AbstractState("HEOS", self._backend_name)
        state.specify_phase(flag)
        self._local.phased[flag] = state
        return state

    def _acceptable(self, point: flash.Point, saturated: State | None, phase: str) -> bool:
        """Whether a solved ``point`` is the state asked for: on its ``phase``'s side of the
        ``saturated`` state at the same pressure (hotter than the dew point for a vapour,
        colder than the bubble point for a liquid); without one (above the critical
        pressure), not a pure fluid's metastable root (:meth:`_metastable`)."""
        if saturated is None:
            return self.is_mixture or not self._metastable(point)
        if phase == "superheated_vapor":
            return point.temperature >= saturated.temperature
        return point.temperature <= saturated.temperature

    def _liquid_line_start(self, pressure: float, target: float, which: str,
                           t_bubble: float) -> tuple[float, float]:
        """(T [K], rho [kg/m^3]): the saturated liquid whose enthalpy or entropy is ``target``
        (regula falsi on the temperature-quality flash between the lowest temperature and the
        bubble point ``t_bubble``, to 1e-6 K: a start only), compressed to ``pressure`` with
        its isothermal compressibility. Pure fluids and pseudo-pure blends."""
        def value(t: float) -> float:
            st = self._update(CP.QT_INPUTS, 0.0, t)
            return (st.hmass() if which == "enthalpy" else st.smass()) - target

        lo, hi = self.limits.temperature_min, t_bubble
        f_lo, f_hi = value(lo), value(hi)
        t = hi
        if f_lo < 0.0 < f_hi:
            for _ in range(60):
                t = lo - f_lo * (hi - lo) / (f_hi - f_lo)
                f = value(t)
                if abs(f) <= 1e-9 * (abs(target) + 1.0) or hi - lo < 1e-6:
                    break
                if f < 0.0:
                    lo, f_lo = t, f
                    f_hi *= 0.5  # Illinois: the kept end's weight halves
                else:
                    hi, f_hi = t, f
                    f_lo *= 0.5
        return t, self._compressed_liquid(t, pressure)

    def _compressed_liquid(self, temperature: float, pressure: float) -> float:
        """The density [kg/m^3] of the liquid at ``temperature`` [K] and ``pressure`` [Pa],
        estimated from the saturated liquid at the temperature compressed at its isothermal
        compressibility kappa_T: rho = rho_sat exp(kappa_T (p - p_sat)), within about 1e-8
        (a Newton start). Pure fluids and pseudo-pure blends."""
        state = self._update(CP.QT_INPUTS, 0.0, temperature)
        kappa = state.saturated_liquid_keyed_output(CP.iisothermal_compressibility)
        return state.rhomass() * math.exp(min(0.5, kappa * (pressure - state.p())))

    def _metastable(self, point: flash.Point) -> bool:
        """A pure fluid above its critical pressure but below its critical temperature is
        stable only denser than its saturated liquid at that temperature."""
        temperature, rho = point.temperature, point.density
        if temperature >= self.critical_temperature or \
                temperature < self.limits.temperature_min:
            return False
        check = self._components_state()
        check.update(CP.QT_INPUTS, 0.0, temperature)
        return rho < check.rhomass()

    def _components_state(self) -> CP.AbstractState:
        """A second per-thread state of the fluid, for checks that must not disturb the first."""
        found = self._local.second
        if found is None:
            found = self._local.second = CP.AbstractState("HEOS", self._backend_name)
        return found

    # -- two phase ------------------------------------------------------------------------------

    def _two_phase_at(
        self,
        pressure: float,
        target: float,
        prop: Callable[[State], float],
        bubble: State,
        dew: State,
        which: int | None = None,
    ) -> State:
        """The quality at which ``prop`` of the two-phase state at ``pressure`` equals ``target``.

        A blend with a table covering the pressure: the table's two-phase series (``which``
        names the property: 0 temperature, 1 enthalpy, 2 entropy).

        For a pure fluid and the pseudo-pure blends every property is linear in quality, so
        the first guess is exact; for a blend a bounded secant iteration on saturation flashes
        (at most 40 steps, bracket kept) refines it.
        """
        low, high = prop(bubble), prop(dew)
        if not self.is_mixture:
            return _mixed(bubble, dew, min(1.0, max(0.0, (target - low) / (high - low))))
        if which is not None:
            found = self._from_table(pressure, which, target)
            if found is not None:
                return found
        quality = (target - low) / (high - low)
        glide = dew.temperature - bubble.temperature
        if glide < 1e-9 or quality in (0.0, 1.0):
            return self.at_pressure_quality(pressure, min(1.0, max(0.0, quality)))
        q_lo, f_lo = 0.0, low - target
        q_hi, f_hi = 1.0, high - target
        kept = 0  # Illinois variant of regula falsi: halve an end kept twice in a row
        for _ in range(_MAX_ITERATIONS):
            state = self.at_pressure_quality(pressure, quality)
            f = prop(state) - target
            if abs(f) <= _RELATIVE_TOLERANCE * 1e2 * max(abs(target), 1.0):
                return state
            if (f < 0) == (f_lo < 0):
                q_lo, f_lo = quality, f
                kept = kept + 1 if kept > 0 else 1
                if kept > 1:
                    f_hi *= 0.5
            else:
                q_hi, f_hi = quality, f
                kept = kept - 1 if kept < 0 else -1
                if kept < -1:
                    f_lo *= 0.5
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
            solvers: dict[str, Callable[[float, float], State]] = {
                "temperature": self.at_pressure_temperature,
                "enthalpy": self.at_pressure_enthalpy,
                "entropy": self.at_pressure_entropy,
                "quality": self.at_pressure_quality,
            }
            return solvers[other](p, given[other])
        if names == {"temperature", "quality"}:
            return self.at_temperature_quality(given["temperature"], given["quality"])
        if self.is_mixture:
            raise InvalidInput(
                f"for the blend {self.name} give the pressure with one other property, or the "
                "temperature with the quality",
            )
        if quality is not None and 0.0 < quality < 1.0:
            raise InvalidInput(
                f"for {self.name} a quality between 0 and 1 fixes a state together with the "
                "pressure or the temperature; give one of them with the quality",
            )
        if "temperature" in names:
            other = next(iter(names - {"temperature"}))
            found = self._two_phase_at_temperature(given["temperature"], given[other], other)
            if found is not None:
                return found
            if other == "enthalpy":
                return self._vapor_at_temperature_enthalpy(given["temperature"], given[other])
        return self._general_flash(given)

    def _two_phase_at_temperature(self, temperature: float, target: float, which: str
                                  ) -> State | None:
        """Pure fluid: the two-phase state at ``temperature`` [K] whose h or s is ``target``;
        None outside the dome. h and s are linear in quality between bubble and dew."""
        if temperature >= self.critical_temperature:
            return None
        self.check_saturation_temperature(temperature, field="temperature")
        bubble = self.saturated_at_temperature(temperature, 0.0)
        dew = self.saturated_at_temperature(temperature, 1.0)
        low, high = (bubble.enthalpy, dew.enthalpy) if which == "enthalpy" else (
            bubble.entropy, dew.entropy)
        if not low <= target <= high:
            return None
        return self.at_temperature_quality(temperature, (target - low) / (high - low))

    def _vapor_at_temperature_enthalpy(self, temperature: float, enthalpy: float) -> State:
        """Pure fluid, superheated vapour at ``temperature`` [K] with ``enthalpy`` [J/kg].

        At constant temperature a vapour's enthalpy falls as the pressure rises (from the
        ideal-gas value at zero pressure to the dew point), so bisection in ln p between
        1e-6 times the saturation pressure and the saturation pressure brackets the state.
        In the liquid and above the critical temperature the enthalpy barely depends on the
        pressure and the pair does not fix the state.
        """
        def refuse() -> InvalidInput:
            return InvalidInput(
                f"temperature and enthalpy fix a state of {self.name} only in the two-phase "
                "region and in the superheated vapour; give the pressure with the temperature "
                "or the enthalpy",
                field="enthalpy",
            )

        if temperature >= self.critical_temperature:
            raise refuse()
        p_sat = self.saturated_at_temperature(temperature, 1.0).pressure
        lo, hi = math.log(p_sat * 1e-6), math.log(p_sat)

        def vapor(ln_p: float) -> State:
            # the library's own phase-imposed evaluation: valid below the triple-point
            # pressure too, where a vapour at this temperature still exists
            state = self._update(CP.PT_INPUTS, math.exp(ln_p), temperature, CP.iphase_gas)
            return self._snapshot(state, None, "superheated_vapor")

        top = vapor(lo)
        if enthalpy > top.enthalpy:
            raise OutOfRange(
                f"{{h}} is above the enthalpy of {self.name} vapour at {{t}} at any pressure "
                "(at most {top}, the ideal-gas limit)",
                {"h": SIValue(enthalpy, "specific_enthalpy"), "t": _t(temperature),
                 "top": SIValue(top.enthalpy, "specific_enthalpy")},
                field="enthalpy",
            )
        if enthalpy < self.saturated_at_temperature(temperature, 0.0).enthalpy:
            raise refuse()
        for _ in range(80):
            mid = 0.5 * (lo + hi)
            if vapor(mid).enthalpy > enthalpy:
                lo = mid
            else:
                hi = mid
            if hi - lo < 1e-12:
                break
        return vapor(0.5 * (lo + hi))

    def _general_flash(self, given: dict[str, float]) -> State:
        pairs = {
            frozenset({"temperature", "enthalpy"}): (CP.HmassT_INPUTS, "enthalpy", "temperature"),
            frozenset({"temperature", "entropy"}): (CP.SmassT_INPUTS, "entropy", "temperature"),
            frozenset({"enthalpy", "entropy"}): (CP.HmassSmass_INPUTS, "enthalpy", "entropy"),
            frozenset({"enthalpy", "quality"}): (CP.HmassQ_INPUTS, "enthalpy", "quality"),
            frozenset({"entropy", "quality"}): (CP.QSmass_INPUTS, "quality", "entropy"),
        }
        pair, first, second = pairs[frozenset(given)]
        try:
            state = self._update(pair, given[first], given[second])
        except PropertyFailure as exc:
            raise OutOfRange(
                f"no state of {self.name} has {first} {{a}} and {second} {{b}}; give the "
                "pressure with one other property",
                {"a": SIValue(given[first], _KINDS[first]),
                 "b": SIValue(given[second], _KINDS[second])},
            ) from exc
        return self.at_pressure_enthalpy(state.p(), state.hmass())


    # -- transport properties (line sizing) ----------------------------------------------------

    def transport_at(self, pressure: float, temperature: float, phase: str) -> Transport:
        """Dynamic viscosity of the single phase ``phase`` at ``pressure`` [Pa] and
        ``temperature`` [K]; ``phase`` is ``"liquid"`` or ``"vapor"`` (or a :data:`PHASES`
        name: ``subcooled_liquid`` counts as liquid, the others as vapour).

        Pure fluids and the pseudo-pure blends: the library's viscosity correlation of the
        fluid. Blends built from their components: the library's mixture viscosity of these
        blends lies above that of every component (R454B liquid at 37 degC: 0.167 mPa s, with
        0.096 for R32 and 0.125 for R1234yf) and takes tens of milliseconds, so the components'
        viscosities are mixed instead, each component at the blend's temperature:

        - liquid, Grunberg-Nissan without interaction term: ``ln mu = sum x_i ln mu_i``, each
          component as saturated liquid (the pressure effect on a liquid's viscosity is small);
        - vapour, Herning and Zipperer (1936):
          ``mu = sum y_i mu_i sqrt(M_i) / sum y_i sqrt(M_i)``, each component at the pressure,
          or just below its own saturation pressure where it would condense at the pressure;

        with ``x_i = y_i`` the blend's mole fractions. Returns a :class:`Transport` [Pa s].
        """
        liquid = phase in ("liquid", "subcooled_liquid")
        if not self.is_mixture:
            if pressure >= self.critical_pressure or temperature >= self.critical_temperature:
                flag = CP.iphase_supercritical
            else:
                if self.limits.pressure_min <= pressure:
                    # the side of the saturation line decides; the hint only on the line itself
                    t_sat = self.saturated_at_pressure(pressure, 0.0).temperature
                    if abs(temperature - t_sat) > 1e-9 * t_sat:
                        liquid = temperature < t_sat
                flag = CP.iphase_liquid if liquid else CP.iphase_gas
            state = self._update(CP.PT_INPUTS, pressure, temperature, flag)
            try:
                return Transport(viscosity=state.viscosity())
            except ValueError as exc:
                raise _viscosity_failure(self.name, exc) from exc
        assert self._mole_fractions is not None
        values = []
        for component in self._components():
            try:
                values.append(_component_viscosity(component, pressure, temperature, liquid))
            except ValueError as exc:
                raise _viscosity_failure(self.name, exc) from exc
        fractions = self._mole_fractions
        if liquid:
            mu = math.exp(sum(x * math.log(v) for x, (v, _) in zip(fractions, values,
                                                                    strict=True)))
        else:
            weights = [y * math.sqrt(m) for y, (_, m) in zip(fractions, values, strict=True)]
            mu = sum(w * v for w, (v, _) in zip(weights, values, strict=True)) / sum(weights)
        return Transport(viscosity=mu)

    def _components(self) -> list[CP.AbstractState]:
        found = self._local.components
        if found is None:
            found = [CP.AbstractState("HEOS", f) for f in self.refrigerant.coolprop_fluids]
            self._local.components = found
        return found


@dataclass(frozen=True)
class Transport:
    """Transport properties of one phase: dynamic ``viscosity`` [Pa s]."""

    viscosity: float


@dataclass(frozen=True)
class Coexistence:
    """Liquid and vapour in equilibrium [Pa, K, 1, kg/m^3, kg/m^3, N/m or None]."""

    pressure: float
    temperature: float
    quality: float
    liquid_density: float
    vapor_density: float
    surface_tension: float | None


def _viscosity_failure(name: str, exc: ValueError) -> PropertyFailure:
    if "not available" in str(exc):
        return PropertyFailure(
            f"the property library has no viscosity correlation for {name}, so no friction "
            "pressure drop can be computed for it")
    return PropertyFailure(f"the viscosity of {name} could not be evaluated here")


def _component_viscosity(
    state: CP.AbstractState, pressure: float, temperature: float, liquid: bool
) -> tuple[float, float]:
    """(viscosity [Pa s], molar mass [kg/mol]) of one pure component of a blend."""
    molar_mass = state.molar_mass()
    if temperature >= state.T_critical():
        state.update(CP.PT_INPUTS, pressure, temperature)
        return state.viscosity(), molar_mass
    state.update(CP.QT_INPUTS, 0.0 if liquid else 1.0, temperature)
    if liquid or state.p() <= pressure:
        # liquid: the saturated liquid; vapour that would condense at the pressure: the
        # saturated vapour at its own (lower) saturation pressure
        return state.viscosity(), molar_mass
    state.specify_phase(CP.iphase_gas)
    try:
        state.update(CP.PT_INPUTS, pressure, temperature)
        return state.viscosity(), molar_mass
    finally:
        state.unspecify_phase()


# the library's (pressure, value) input pairs, for :meth:`PropertyModel._tabled`
_TABLE_PAIRS: dict[Any, Any] = {CP.iT: CP.PT_INPUTS, CP.iSmass: CP.PSmass_INPUTS}


def _bounded(cache: dict[float, Any]) -> dict[float, Any]:
    """A thread's remembered saturation answers by pressure, emptied when it holds
    _REMEMBERED pressures (a long-lived worker sees ever new pressures)."""
    if len(cache) >= _REMEMBERED:
        cache.clear()
    return cache


def _enthalpy_of(state: State) -> float:
    return state.enthalpy


def _entropy_of(state: State) -> float:
    return state.entropy


def _point(state: CP.AbstractState) -> flash.Point:
    """The single-phase point the library's own flash left ``state`` at."""
    return _new(flash.Point, (state.T(), state.rhomass(), state.hmass(), state.smass()))


def _mixed(bubble: State, dew: State, quality: float) -> State:
    """The two-phase state of vapour mass fraction ``quality`` between ``bubble`` and ``dew``
    at one pressure, each property linear in quality (specific volume for the density): exact
    for a pure fluid and for the library's pseudo-pure blends."""
    if quality == 0.0:
        return bubble
    if quality == 1.0:
        return dew
    liquid = 1.0 - quality
    return _new(State, (
        bubble.pressure,
        liquid * bubble.temperature + quality * dew.temperature,
        liquid * bubble.enthalpy + quality * dew.enthalpy,
        liquid * bubble.entropy + quality * dew.entropy,
        1.0 / (liquid / bubble.density + quality / dew.density),
        quality,
        "two_phase",
    ))


@cache
def model(designation: str) -> PropertyModel:
    """The (cached) property model of a catalogue refrigerant."""
    return PropertyModel(lookup(designation))
