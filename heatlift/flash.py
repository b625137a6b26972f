"""Fast single-phase flashes on the full equation of state: Newton steps in temperature and density.

A Helmholtz-energy equation of state is explicit in temperature T and density rho: one
evaluation at (T, rho) with the phase imposed costs microseconds, while the library's general
flashes from pressure and enthalpy or entropy search the phase first and bracket the answer
(tens to hundreds of microseconds for a pure fluid, hundreds of milliseconds for a mixture).
Given a starting point close to the answer, Newton's method on

    p(T, rho) = p*,    y(T, rho) = y*        (y = h or s)

with the 2x2 Jacobian of the equation of state's own partial derivatives (in ln T and ln rho
on ln p for a vapour, nearly linear there; in T and rho for a liquid) converges quadratically
in one to four evaluations to the state the general flash would find (both solve the same
equations; this one to a tighter tolerance). The last step, once shorter than LAST_STEP_TOL,
is taken without evaluating its end: h and s there follow from the derivatives. The
pressure-temperature pair needs only the density: Newton on p(T, rho) = p* at fixed T.

Every solver takes a CoolProp ``AbstractState`` (any backend explicit in T and rho: ``HEOS``
for pure fluids and for mixtures of fixed composition), returns the solved :class:`Point`
(the state is left at its last evaluation, at most one short step from it) and raises
:class:`FlashFailure` when it does not converge or leaves the branch it was asked for (the
caller then falls back on the library's own flash). SI units throughout: Pa, K, kg/m^3, J/kg,
J/kg/K.

This module is the numerical kernel of the property layer: only heatlift/properties.py imports
it, and the rest of the engine reaches the property library through properties.py alone.

Source: the method is the standard Newton-Raphson solution in (T, rho) of an explicit
Helmholtz-energy equation of state, as in Lemmon and Span's and the library's own
``HSU_P_flash_singlephase_Newton``; see Bell, Wronski, Quoilin and Lemon, Ind. Eng. Chem. Res.
53 (2014) 2498-2508, for the library.
"""

from __future__ import annotations

import math
from typing import Any, NamedTuple

import CoolProp.CoolProp as CP

MAX_STEPS = 30
# converged when |p - p*| <= P_TOL p* and |y - y*| <= Y_TOL (|y*| + Y_FLOOR): a million
# times below the 1e-6 relative agreement the engine promises
P_TOL = 1e-12
Y_TOL = 1e-12
# or when the next Newton step would move T and rho by less than this, relative: with the
# quadratic convergence of Newton's method the state evaluated is then that close to the root
# (a thousand times below the promised 1e-6; a liquid's pressure reacts so strongly to its
# density that the pressure criterion alone would ask for a density exact to 1e-14)
STEP_TOL = 1e-9
# a Newton step shorter than this (relative) is the last one: its end is not evaluated, h and s
# there follow from the derivatives at its start, and T, rho, h and s are then within the
# step's square (1e-10) of the root
LAST_STEP_TOL = 1e-5
Y_FLOOR = {"enthalpy": 1e4, "entropy": 10.0}
# refine(): at most this many evaluations from a close start, the first step shorter than
# REFINE_REACH (relative) and each one shorter than the last (Newton's quadratic convergence
# from a start 1e-3 away reaches LAST_STEP_TOL in two steps)
REFINE_STEPS = 4
REFINE_REACH = 0.02

_DT = CP.DmassT_INPUTS
_IP, _IT, _ID, _IH = CP.iP, CP.iT, CP.iDmass, CP.iHmass

Fluid = tuple[float, float, float, float]
_new = tuple.__new__


class FlashFailure(ValueError):
    """The Newton steps did not converge on the requested branch."""


def constants(state: CP.AbstractState) -> Fluid:
    """(specific gas constant R [J/kg/K], molar mass M [kg/mol], reducing density
    rho_r [kg/m^3], reducing temperature T_r [K]) of the state's fluid (for a mixture: of its
    fixed composition), so that delta = rho / rho_r and tau = T_r / T."""
    molar_mass = state.molar_mass()
    return (state.gas_constant() / molar_mass, molar_mass,
            state.rhomolar_reducing() * molar_mass, state.T_reducing())


class Point(NamedTuple):
    """A solved single-phase point [K, kg/m^3, J/kg, J/kg/K].

    (Built as ``_new(Point, (T, rho, h, s))``: ``tuple.__new__`` makes the same named tuple
    without the Python-level ``__new__`` of the generated class, in half the time.)
    """

    temperature: float
    density: float
    enthalpy: float
    entropy: float


def _current(state: CP.AbstractState, temperature: float, rho: float, phase: Any
             ) -> tuple[float, float] | None:
    """The state's last evaluated (T, rho) if it lies within LAST_STEP_TOL of (``temperature``,
    ``rho``) in ``phase``, else None: a start handed over from the solve just before
    (compression: the isentropic end, then the real one at the same pressure), whose last
    evaluation is that close to it, then needs no evaluation of its own."""
    try:
        t, d = state.T(), state.rhomass()
        if state.phase() != phase:
            return None
    except ValueError:
        return None
    if abs(t - temperature) <= LAST_STEP_TOL * temperature and \
            abs(d - rho) <= LAST_STEP_TOL * rho:
        return t, d
    return None


def density_at(
    state: CP.AbstractState, pressure: float, temperature: float, rho: float, phase: Any,
    branch: str, fluid: Fluid,
) -> Point:
    """The point at ``pressure`` [Pa] and ``temperature`` [K], from the start density ``rho``.

    Newton on ln p(T, rho) = ln p* in ln rho (exact in one step for an ideal gas, and so close
    to linear for a vapour; plain Newton in rho on the liquid branch, where ln p is far from
    linear), each step limited to half the density or a factor of 1.65, with p and its slope
    from the reduced residual Helmholtz energy a^r(tau, delta) (Span, Multiparameter Equations
    of State, 2000, table 3.3):

        p = rho R T (1 + delta a^r_d),   dp/drho|T = R T (1 + 2 delta a^r_d + delta^2 a^r_dd),
        d ln rho = -(ln p - ln p*) p / (rho dp/drho).

    A last step shorter than LAST_STEP_TOL is taken without evaluating its end: h and s there
    follow from their derivatives (:func:`_last_step`), exact to the square of the step.
    ``phase`` is the library's phase index to impose; ``branch`` is ``"vapor"`` (a state
    between the spinodals, where dp/drho <= 0, is left towards lower density), ``"liquid"``
    or ``"any"``; ``fluid`` is :func:`constants` of the state.
    """
    r_mass, _, rho_r, _ = fluid
    rt = r_mass * temperature
    tolerance = P_TOL * pressure
    log_target = math.log(pressure)
    liquid = branch == "liquid"
    update, ad_of, add_of = state.update, state.dalphar_dDelta, state.d2alphar_dDelta2
    state.specify_phase(phase)
    try:
        for _ in range(MAX_STEPS):
            update(_DT, rho, temperature)
            delta = rho / rho_r
            ad = ad_of()
            p = rho * rt * (1.0 + delta * ad)
            slope = rt * (1.0 + delta * (2.0 * ad + delta * add_of()))
            if slope <= 0.0 or p <= 0.0:
                if abs(p - pressure) <= tolerance:
                    raise FlashFailure("converged inside the spinodal")
                rho *= 0.7 if branch == "vapor" else 1.1
                continue
            if liquid:  # p is far from linear in ln rho for a liquid: plain Newton
                step = (p - pressure) / (rho * slope)
            else:
                step = (math.log(p) - log_target) * p / (rho * slope)
            if abs(p - pressure) <= tolerance or abs(step) <= STEP_TOL:
                return _new(Point, (temperature, rho, state.hmass(), state.smass()))
            if abs(step) <= LAST_STEP_TOL:
                a = _dp_dt(state, rho, temperature, delta, ad, fluid)
                return _last_step(state, temperature, rho, temperature,
                                  _moved(rho, step, liquid), a, slope)
            rho = _moved(rho, max(-0.5, min(0.5, step)), liquid)
        raise FlashFailure(f"no density found at {pressure} Pa and {temperature} K")
    except FlashFailure:
        raise
    except ValueError as exc:  # the library refused the evaluation
        raise FlashFailure(str(exc)) from exc
    finally:
        state.unspecify_phase()


def _moved(value: float, step: float, linear: bool) -> float:
    """``value`` moved by the relative Newton ``step``: value (1 - step) in the linear
    variable, value exp(-step) in its logarithm."""
    return value * (1.0 - step) if linear else value * math.exp(-step)


def _dp_dt(state: CP.AbstractState, rho: float, temperature: float, delta: float, ad: float,
           fluid: Fluid) -> float:
    """dp/dT|rho [Pa/K] = rho R (1 + delta a^r_d - delta tau a^r_dt) at the state just
    evaluated (``ad`` = a^r_d there, ``fluid`` :func:`constants`)."""
    r_mass, _, _, t_r = fluid
    return rho * r_mass * (1.0 + delta * (ad - t_r / temperature * state.d2alphar_dDelta_dTau()))


def _last_step(state: CP.AbstractState, temperature: float, rho: float, new_t: float,
               new_rho: float, a: float, b: float, cv: float | None = None) -> Point:
    """The point at (``new_t``, ``new_rho``), one short Newton step from the state evaluated at
    (``temperature``, ``rho``), with h and s carried along the step by their derivatives
    (``a`` = dp/dT|rho, ``b`` = dp/drho|T; ``cv`` [J/kg/K] is read when not given):

        dh = (cv + a / rho) dT + (b - T a / rho) / rho drho,   ds = cv / T dT - a / rho^2 drho.

    The error is of the order of the step squared (below 1e-10 for a step below 1e-5)."""
    if cv is None:
        cv = state.cvmass()
    d_t, d_rho = new_t - temperature, new_rho - rho
    h = state.hmass() + (cv + a / rho) * d_t + (b - temperature * a / rho) / rho * d_rho
    s = state.smass() + cv / temperature * d_t - a / (rho * rho) * d_rho
    return _new(Point, (new_t, new_rho, h, s))


def pressure_and(
    state: CP.AbstractState, pressure: float, target: float, which: str, temperature: float,
    rho: float, phase: Any, fluid: Fluid, handed_over: bool = False,
) -> Point:
    """The point at ``pressure`` [Pa] whose ``which`` (``"enthalpy"`` [J/kg] or ``"entropy"``
    [J/kg/K]) equals ``target``, from the start (``temperature`` [K], ``rho`` [kg/m^3]).

    Newton on F = (ln p - ln p*, y - y*) = 0 in (ln T, ln rho): for an ideal gas ln p and s
    are linear in these, so the steps along an isobar from the saturated vapour are nearly
    exact. For a liquid (``phase`` the library's liquid index) ln p is far from linear in
    ln rho, and F = (p / p* - 1, y - y*) in (T, rho) is used instead. The Jacobian comes from
    the equation of state's derivatives,

        dp/drho|T = R T (1 + 2 delta a^r_d + delta^2 a^r_dd),
        dp/dT|rho = rho R (1 + delta a^r_d - delta tau a^r_dt),

    and by dh = T ds + dp / rho and the Maxwell relation (ds/drho)_T = -(dp/dT)_rho / rho^2:

        dh/dT|rho = cv + (dp/dT) / rho,   dh/drho|T = (dp/drho - T (dp/dT) / rho) / rho,
        ds/dT|rho = cv / T,               ds/drho|T = -(dp/dT) / rho^2,

    each times T or rho for relative steps. A step is shortened so that T moves by at most
    30 % and rho by at most 50 % (in the logarithms: 0.3 and 0.5); a mechanically unstable
    state (dp/drho <= 0) ends the attempt. A last step shorter than LAST_STEP_TOL is taken
    without evaluating its end (:func:`_last_step`). ``handed_over``: the start comes from
    the solve just before, whose last evaluation may serve as the first one (:func:`_current`).
    """
    enthalpy = which == "enthalpy"
    tolerance = Y_TOL * (abs(target) + Y_FLOOR[which])
    p_tolerance = P_TOL * pressure
    log_target = math.log(pressure)
    liquid = phase == CP.iphase_liquid
    r_mass, _, rho_r, _ = fluid
    update, y_of = state.update, (state.hmass if enthalpy else state.smass)
    ad_of, add_of = state.dalphar_dDelta, state.d2alphar_dDelta2
    cv_of = state.cvmass
    current = _current(state, temperature, rho, phase) if handed_over else None
    if current is not None:
        temperature, rho = current
    state.specify_phase(phase)
    try:
        for _ in range(MAX_STEPS):
            if current is not None:
                current = None  # the state is already evaluated there
            else:
                update(_DT, rho, temperature)
            delta = rho / rho_r
            ad = ad_of()
            rt = r_mass * temperature
            p = rho * rt * (1.0 + delta * ad)
            f2 = y_of() - target
            b = rt * (1.0 + delta * (2.0 * ad + delta * add_of()))  # dp/drho
            if b <= 0.0 or p <= 0.0:
                raise FlashFailure("mechanically unstable state")
            if abs(p - pressure) <= p_tolerance and abs(f2) <= tolerance:
                return _new(Point, (temperature, rho, state.hmass(), state.smass()))
            a = _dp_dt(state, rho, temperature, delta, ad, fluid)
            cv = cv_of()
            if enthalpy:
                c = cv + a / rho
                d = (b - temperature * a / rho) / rho
            else:
                c = cv / temperature
                d = -a / (rho * rho)
            # relative steps (dT / T, drho / rho): for a vapour the Jacobian in (ln T, ln rho)
            # of (ln p, y); for a liquid, whose ln p is far from linear, of (p / p* - 1, y)
            if liquid:
                f1, row = p / pressure - 1.0, 1.0 / pressure
            else:
                f1, row = math.log(p) - log_target, 1.0 / p
            j11, j12 = temperature * a * row, rho * b * row
            j21, j22 = temperature * c, rho * d
            det = j11 * j22 - j12 * j21
            if det == 0.0:
                raise FlashFailure("singular Jacobian")
            d_t = (f1 * j22 - j12 * f2) / det
            d_rho = (j11 * f2 - j21 * f1) / det
            if abs(d_t) <= STEP_TOL and abs(d_rho) <= STEP_TOL:
                return _new(Point, (temperature, rho, state.hmass(), state.smass()))
            if abs(d_t) <= LAST_STEP_TOL and abs(d_rho) <= LAST_STEP_TOL:
                return _last_step(state, temperature, rho, _moved(temperature, d_t, liquid),
                                  _moved(rho, d_rho, liquid), a, b, cv)
            scale = 1.0
            if abs(d_t) > 0.3:
                scale = 0.3 / abs(d_t)
            if abs(d_rho) > 0.5:
                scale = min(scale, 0.5 / abs(d_rho))
            temperature = _moved(temperature, scale * d_t, liquid)
            rho = _moved(rho, scale * d_rho, liquid)
        raise FlashFailure(f"no state found at {pressure} Pa with that {which}")
    except FlashFailure:
        raise
    except ValueError as exc:  # the library refused the evaluation
        raise FlashFailure(str(exc)) from exc
    finally:
        state.unspecify_phase()


def refine(
    state: CP.AbstractState, pressure: float, target: float, key: Any, temperature: float,
    rho: float,
) -> Point | None:
    """The point at ``pressure`` [Pa] whose property ``key`` (the library's ``iT``, ``iHmass``
    or ``iSmass``) is ``target`` [K, J/kg, J/kg/K], on a ``state`` whose phase the caller has
    imposed (for good: a state per phase saves imposing it per solve), by Newton steps from a
    close start (``temperature`` [K], ``rho`` [kg/m^3]; the library's tables): at most REFINE_STEPS
    evaluations, each step shorter than REFINE_REACH and than the one before; None when
    they do not reach a step shorter than LAST_STEP_TOL (or the library refuses an
    evaluation), and the caller then runs the full solve.

    An evaluation gives p, h, s, the library's dp/drho|T = b and dp/dT|rho = a (and cv when
    the temperature is unknown); by dh = T ds + dp / rho and the Maxwell relation
    (ds/drho)_T = -(dp/dT)_rho / rho^2,

        dh/dT|rho = cv + a / rho,   dh/drho|T = (b - T a / rho) / rho,
        ds/dT|rho = cv / T,         ds/drho|T = -a / rho^2,

    and the step solves a dT + b drho = p* - p, dy/dT dT + dy/drho drho = y* - y (y = h or
    s; for the temperature itself dT = 0 and drho = (p* - p) / b). The last step's end is
    not evaluated: there y is y* (the step solves its linear equation exactly) and the other
    of h and s follows from its derivatives, exact to the square of the step (below 1e-10).
    """
    update, partial = state.update, state.first_partial_deriv
    reach = REFINE_REACH
    try:
        for _ in range(REFINE_STEPS):
            update(_DT, rho, temperature)
            dp = pressure - state.p()
            b, a = partial(_IP, _ID, _IT), partial(_IP, _IT, _ID)
            h, s = state.hmass(), state.smass()
            dh_drho = (b - temperature * a / rho) / rho
            ds_drho = -a / (rho * rho)
            if key is _IT:
                d_rho = dp / b
                if abs(d_rho) <= LAST_STEP_TOL * rho:
                    return _new(Point, (temperature, rho + d_rho, h + dh_drho * d_rho,
                                        s + ds_drho * d_rho))
                d_t, step = 0.0, abs(d_rho / rho)
            else:
                cv = state.cvmass()
                dh_dt, ds_dt = cv + a / rho, cv / temperature
                if key is _IH:
                    dy_dt, dy_drho, dy = dh_dt, dh_drho, target - h
                else:
                    dy_dt, dy_drho, dy = ds_dt, ds_drho, target - s
                det = a * dy_drho - b * dy_dt
                d_t = (dp * dy_drho - b * dy) / det
                d_rho = (a * dy - dy_dt * dp) / det
                step = abs(d_t / temperature)
                if abs(d_rho) > step * rho:
                    step = abs(d_rho / rho)
                if step <= LAST_STEP_TOL:
                    if key is _IH:
                        return _new(Point, (temperature + d_t, rho + d_rho, target,
                                            s + ds_dt * d_t + ds_drho * d_rho))
                    return _new(Point, (temperature + d_t, rho + d_rho,
                                        h + dh_dt * d_t + dh_drho * d_rho, target))
            if not step < reach:
                return None
            reach = step
            temperature += d_t
            rho += d_rho
        return None
    except (ValueError, ZeroDivisionError):
        return None


def first_guess_from_saturation(
    saturated_t: float, saturated_rho: float, target: float, which: str, vapor: bool,
) -> tuple[float, float]:
    """A start (T [K], rho [kg/m^3]) for :func:`pressure_and` from the saturated state of the
    same phase at the pressure: the saturated state itself, nudged 0.01 % into the phase
    (the first Newton step from there is the step along the isobar that the saturated state's
    own derivatives give)."""
    if vapor:
        return saturated_t * 1.0001, saturated_rho * 0.9999
    return saturated_t * 0.9999, saturated_rho
