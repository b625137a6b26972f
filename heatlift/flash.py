"""Fast single-phase flashes on the full equation of state: Newton steps in temperature and density.

A Helmholtz-energy equation of state is explicit in temperature T and density rho: one
evaluation at (T, rho) with the phase imposed costs microseconds, while the library's general
flashes from pressure and enthalpy or entropy search the phase first and bracket the answer
(tens to hundreds of microseconds for a pure fluid, hundreds of milliseconds for a mixture).
Given a starting point close to the answer, Newton's method on

    p(T, rho) = p*,    y(T, rho) = y*        (y = h or s)

with the 2x2 Jacobian of the equation of state's own partial derivatives converges
quadratically in two to four evaluations to the state the general flash would find (both solve
the same equations; this one to a tighter tolerance). The pressure-temperature pair needs only
the density: Newton on p(T, rho) = p* at fixed T.

Every function takes a CoolProp ``AbstractState`` (any backend explicit in T and rho: ``HEOS``
for pure fluids and for mixtures of fixed composition), leaves it updated at the solution and
raises :class:`FlashFailure` when it does not converge or leaves the branch it was asked for
(the caller then falls back on the library's own flash). SI units throughout: Pa, K, kg/m^3,
J/kg, J/kg/K.

This module is the numerical kernel of the property layer: only heatlift/properties.py imports
it, and the rest of the engine reaches the property library through properties.py alone.

Source: the method is the standard Newton-Raphson solution in (T, rho) of an explicit
Helmholtz-energy equation of state, as in Lemmon and Span's and the library's own
``HSU_P_flash_singlephase_Newton``; see Bell, Wronski, Quoilin and Lemon, Ind. Eng. Chem. Res.
53 (2014) 2498-2508, for the library.
"""

from __future__ import annotations

from typing import Any

import CoolProp.CoolProp as CP

MAX_STEPS = 30
# converged when |p - p*| <= P_TOL p* and |y - y*| <= Y_TOL (|y*| + Y_FLOOR): a million
# times below the 1e-6 relative agreement the engine promises
P_TOL = 1e-12
Y_TOL = 1e-12
# or when the next Newton step would move T and rho by less than this, relative (with the
# quadratic convergence of Newton's method the state is then that close to the root; a
# liquid's pressure reacts so strongly to its density that the pressure criterion alone
# would ask for a density exact to 1e-14)
STEP_TOL = 1e-11
Y_FLOOR = {"enthalpy": 1e4, "entropy": 10.0}

_DT = CP.DmassT_INPUTS


class FlashFailure(ValueError):
    """The Newton steps did not converge on the requested branch."""


def _evaluate(state: CP.AbstractState, rho: float, temperature: float) -> None:
    try:
        state.update(_DT, rho, temperature)
    except ValueError as exc:
        raise FlashFailure(str(exc)) from exc


def _jacobian(state: CP.AbstractState, rho: float, temperature: float, r_mass: float,
              molar_mass: float) -> tuple[float, float, float]:
    """(dp/drho|T [Pa m^3/kg], dp/dT|rho [Pa/K], cv [J/kg/K]) at the state just evaluated,
    from the reduced residual Helmholtz energy a^r(tau, delta) the evaluation has already
    computed (cheaper than the library's generic partial derivatives):

        dp/drho|T = R T (1 + 2 delta a^r_d + delta^2 a^r_dd),
        dp/dT|rho = rho R (1 + delta a^r_d - delta tau a^r_dt),

    with R the specific gas constant [J/kg/K] (Lemmon, Span and Wagner's tabulated relations;
    Span, Multiparameter Equations of State, 2000, table 3.3).
    """
    delta, tau = state.delta(), state.tau()
    ad = state.dalphar_dDelta()
    dp_drho = r_mass * temperature * (1.0 + delta * (2.0 * ad + delta * state.d2alphar_dDelta2()))
    dp_dt = rho * r_mass * (1.0 + delta * (ad - tau * state.d2alphar_dDelta_dTau()))
    return dp_drho, dp_dt, state.cvmass()


def constants(state: CP.AbstractState) -> tuple[float, float]:
    """(specific gas constant [J/kg/K], molar mass [kg/mol]) of the state's fluid."""
    molar_mass = state.molar_mass()
    return state.gas_constant() / molar_mass, molar_mass


def density_at(
    state: CP.AbstractState, pressure: float, temperature: float, rho: float, phase: Any,
    branch: str, fluid: tuple[float, float],
) -> None:
    """The density at ``pressure`` [Pa] and ``temperature`` [K] from the start ``rho``.

    Newton on p(T, rho) = p*: rho <- rho - (p - p*) / (dp/drho)_T, each step limited to half
    the density. ``phase`` is the library's phase index to impose; ``branch`` is ``"vapor"``
    (a state between the spinodals, where dp/drho <= 0, is left towards lower density),
    ``"liquid"`` or ``"any"``; ``fluid`` is :func:`constants` of the state.
    """
    r_mass, molar_mass = fluid
    state.specify_phase(phase)
    try:
        for _ in range(MAX_STEPS):
            _evaluate(state, rho, temperature)
            error = state.p() - pressure
            delta = state.delta()
            slope = r_mass * temperature * (1.0 + delta * (2.0 * state.dalphar_dDelta()
                                                           + delta * state.d2alphar_dDelta2()))
            if abs(error) <= P_TOL * pressure:
                if slope <= 0.0:
                    raise FlashFailure("converged inside the spinodal")
                return
            if slope <= 0.0:
                rho *= 0.7 if branch == "vapor" else 1.1
                continue
            step = error / slope
            if abs(step) <= STEP_TOL * rho:
                return  # the state evaluated is within STEP_TOL of the root
            rho -= max(-0.5 * rho, min(0.5 * rho, step))
        raise FlashFailure(f"no density found at {pressure} Pa and {temperature} K")
    finally:
        state.unspecify_phase()


def pressure_and(
    state: CP.AbstractState, pressure: float, target: float, which: str, temperature: float,
    rho: float, phase: Any, fluid: tuple[float, float],
) -> None:
    """The state at ``pressure`` [Pa] whose ``which`` (``"enthalpy"`` [J/kg] or ``"entropy"``
    [J/kg/K]) equals ``target``, from the start (``temperature`` [K], ``rho`` [kg/m^3]).

    Newton on F(T, rho) = (p - p*, y - y*) = 0 with the Jacobian of the equation of state,
    J = [[dp/dT, dp/drho], [dy/dT, dy/drho]], where by dh = T ds + dp / rho and the Maxwell
    relation (ds/drho)_T = -(dp/dT)_rho / rho^2:

        dh/dT|rho = cv + (dp/dT) / rho,   dh/drho|T = (dp/drho - T (dp/dT) / rho) / rho,
        ds/dT|rho = cv / T,               ds/drho|T = -(dp/dT) / rho^2.

    A step is shortened so that T moves by at most 30 % and rho by at most 50 %; a
    mechanically unstable state (dp/drho <= 0) ends the attempt.
    """
    enthalpy = which == "enthalpy"
    tolerance = Y_TOL * (abs(target) + Y_FLOOR[which])
    p_tolerance = P_TOL * pressure
    r_mass, molar_mass = fluid
    state.specify_phase(phase)
    try:
        for _ in range(MAX_STEPS):
            _evaluate(state, rho, temperature)
            f1 = state.p() - pressure
            f2 = (state.hmass() if enthalpy else state.smass()) - target
            b, a, cv = _jacobian(state, rho, temperature, r_mass, molar_mass)
            if abs(f1) <= p_tolerance and abs(f2) <= tolerance:
                if b <= 0.0:
                    raise FlashFailure("converged inside the spinodal")
                return
            if b <= 0.0:
                raise FlashFailure("mechanically unstable state")
            if enthalpy:
                c = cv + a / rho
                d = (b - temperature * a / rho) / rho
            else:
                c = cv / temperature
                d = -a / (rho * rho)
            det = a * d - b * c
            if det == 0.0:
                raise FlashFailure("singular Jacobian")
            d_t = (f1 * d - b * f2) / det
            d_rho = (a * f2 - c * f1) / det
            if abs(d_t) <= STEP_TOL * temperature and abs(d_rho) <= STEP_TOL * rho:
                return  # the state evaluated is within STEP_TOL of the root
            scale = 1.0
            if abs(d_t) > 0.3 * temperature:
                scale = 0.3 * temperature / abs(d_t)
            if abs(d_rho) > 0.5 * rho:
                scale = min(scale, 0.5 * rho / abs(d_rho))
            temperature -= scale * d_t
            rho -= scale * d_rho
        raise FlashFailure(f"no state found at {pressure} Pa with that {which}")
    finally:
        state.unspecify_phase()


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
