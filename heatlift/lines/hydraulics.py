"""Pressure drop of refrigerant flowing through a tube: Darcy-Weisbach, fittings, static head.

For one section of tube of inside diameter ``D`` [m], straight length ``L`` [m], fittings of
total loss coefficient ``K`` [1], an added equivalent length ``L_e`` [m] and a vertical rise
``z`` [m] (negative for a drop), with density ``rho`` [kg/m^3] and velocity
``v = m / (rho A)`` [m/s]:

    dp = (f (L + L_e) / D + K) rho v^2 / 2 + rho g z                                   [Pa]

``f`` is the Darcy friction factor of the Colebrook (1939) equation, solved to machine
precision by Clamond's (2009) algorithm, ``fluids.friction.friction_factor`` (64/Re in laminar
flow below Re = 2040), with the tube's roughness. Loss coefficients of fittings come from the
fluids library: rounded bends and elbows by Rennels and Hudson (2012), tees by the 3-K method of
Darby (Silverberg and Darby 1999, 2001), valves by Crane TP-410 (2009).

Properties are taken at the section's mean conditions. A vapour changes density as its
pressure falls, so where the drop exceeds :data:`SEGMENT_SHARE` of the inlet pressure the
section is integrated in segments, each at its own mean conditions; the flow is adiabatic and
the change of kinetic and potential energy is neglected, so every segment has the enthalpy of
the inlet. A liquid is taken as incompressible at its inlet properties.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fluids import fittings as ff
from fluids.constants import g as GRAVITY
from fluids.friction import friction_factor as colebrook_friction_factor

from heatlift.errors import HeatliftError, InvalidInput
from heatlift.lines.tubes import Tube
from heatlift.properties import PropertyModel, State

SEGMENT_SHARE = 0.03  # integrate in segments when the drop exceeds 3 % of the inlet pressure
SEGMENT_TARGET = 0.01  # each segment then takes about 1 % of the inlet pressure
MAX_SEGMENTS = 60
GIVE_UP_SHARE = 0.5  # a tube that loses half the inlet pressure is far too small

# fitting type -> (angle [deg], bend radius / inside diameter) for the Rennels bend formula
BENDS: dict[str, tuple[float, float]] = {
    "elbow_90_short_radius": (90.0, 1.0),
    "elbow_90_long_radius": (90.0, 1.5),
    "bend_90": (90.0, 3.0),
    "elbow_45": (45.0, 1.0),
    "elbow_45_long_radius": (45.0, 1.5),
    "return_bend_180": (180.0, 1.5),
}
_DARBY_TEES = {
    "tee_run": "Tee, Run-through, flanged, (r/D = 1)",
    "tee_branch": "Tee, Through-branch, (as elbow), flanged, (r/D = 1)",
}
VALVES = ("ball_valve", "gate_valve", "globe_valve", "angle_valve", "check_valve_swing",
          "check_valve_lift")
FITTING_TYPES: dict[str, str] = {
    "elbow_90_short_radius": "90 deg elbow, r/D = 1 (Rennels)",
    "elbow_90_long_radius": "90 deg elbow, r/D = 1.5 (Rennels)",
    "bend_90": "90 deg tube bend, r/D = 3 (Rennels)",
    "elbow_45": "45 deg elbow, r/D = 1 (Rennels)",
    "elbow_45_long_radius": "45 deg elbow, r/D = 1.5 (Rennels)",
    "return_bend_180": "180 deg return bend, r/D = 1.5 (Rennels)",
    "bend": "a bend of given angle_degrees and radius_ratio r/D (Rennels)",
    "tee_run": "tee, flow straight through the run (Darby 3-K, brazed/welded)",
    "tee_branch": "tee, flow turning through the branch (Darby 3-K, brazed/welded)",
    "ball_valve": "ball valve, full bore (Crane K = 3 fT)",
    "gate_valve": "gate valve, full bore (Crane K = 8 fT)",
    "globe_valve": "globe valve, full seat (Crane K = 340 fT)",
    "angle_valve": "angle valve, full seat (Crane K = 55 fT)",
    "check_valve_swing": "swing check valve, straight (Crane K = 50 fT)",
    "check_valve_lift": "lift check valve, straight (Crane K = 600 fT)",
    "other": "a component of given loss_coefficient K (solenoid valve, sight glass, drier...)",
}
_INCH = 0.0254


class TubeTooSmall(HeatliftError):
    """The tube loses more than half the inlet pressure: not a candidate (internal signal)."""


@dataclass(frozen=True)
class Fitting:
    """``count`` fittings of one ``type`` (a key of :data:`FITTING_TYPES`); ``angle_degrees`` and
    ``radius_ratio`` [1] for ``bend``, ``loss_coefficient`` [1] for ``other``."""

    type: str
    count: int = 1
    angle_degrees: float | None = None
    radius_ratio: float | None = None
    loss_coefficient: float | None = None


@dataclass(frozen=True)
class Section:
    """A length of one tube: straight ``length`` [m], vertical ``rise`` [m], its fittings, and
    an ``additional_equivalent_length`` [m] of straight tube for components."""

    tube: Tube
    length: float
    rise: float = 0.0
    fittings: tuple[Fitting, ...] = ()
    additional_equivalent_length: float = 0.0


@dataclass(frozen=True)
class PressureDropParts:
    """The parts of a pressure drop [Pa]; ``static_head`` is negative for a downward flow."""

    straight_tube: float
    fittings: float
    additional_equivalent_length: float
    static_head: float

    @property
    def friction(self) -> float:
        return self.straight_tube + self.fittings + self.additional_equivalent_length

    @property
    def total(self) -> float:
        return self.friction + self.static_head

    def __add__(self, other: PressureDropParts) -> PressureDropParts:
        return PressureDropParts(
            self.straight_tube + other.straight_tube, self.fittings + other.fittings,
            self.additional_equivalent_length + other.additional_equivalent_length,
            self.static_head + other.static_head,
        )


NO_DROP = PressureDropParts(0.0, 0.0, 0.0, 0.0)


@dataclass(frozen=True)
class Flow:
    """Flow through a section: the outlet state, the drop's parts [Pa], and at the section's
    mean conditions the density [kg/m^3], viscosity [Pa s], velocity [m/s], Reynolds number,
    Darcy friction factor and the fittings' total loss coefficient [1]; ``segments`` is how
    many pieces the section was integrated in."""

    inlet: State
    outlet: State
    parts: PressureDropParts
    density: float
    viscosity: float
    velocity: float
    reynolds_number: float
    friction_factor: float
    loss_coefficient: float
    segments: int


def friction_factor(reynolds: float, relative_roughness: float) -> float:
    """Darcy friction factor [1]: Colebrook's equation
    ``1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51/(Re sqrt(f)))`` solved exactly (Clamond 2009),
    ``64/Re`` below Re = 2040 (fluids.friction.friction_factor)."""
    return float(colebrook_friction_factor(Re=reynolds, eD=relative_roughness))


def loss_coefficient(fitting: Fitting, diameter: float, reynolds: float, fd: float) -> float:
    """Loss coefficient [1] of ONE fitting of ``fitting.type`` on a tube of inside
    ``diameter`` [m], at Reynolds number ``reynolds`` and Darcy friction factor ``fd``, on the
    velocity head of the tube.

    Bends and elbows: Rennels and Hudson (2012), ``K = f a r/D + (0.10 + 2.4 f) sin(a/2)
    + 6.6 f (sqrt(sin(a/2)) + sin(a/2)) / (r/D)^(4 a / pi)`` (fluids.fittings.bend_rounded);
    tees: Darby 3-K ``K = K1/Re + Ki (1 + Kd / NPS^0.3)`` with NPS the inside diameter in
    inches (fluids.fittings.Darby3K); valves: Crane TP-410 (2009), multiples of the Crane
    fully turbulent friction factor fT (fluids.fittings.K_*_Crane).
    """
    kind = fitting.type
    if kind in BENDS:
        angle, ratio = BENDS[kind]
        return float(ff.bend_rounded(Di=diameter, angle=angle, fd=fd, bend_diameters=ratio))
    if kind == "bend":
        assert fitting.angle_degrees is not None and fitting.radius_ratio is not None
        return float(ff.bend_rounded(Di=diameter, angle=fitting.angle_degrees, fd=fd,
                                     bend_diameters=fitting.radius_ratio))
    if kind in _DARBY_TEES:
        nps = max(diameter / _INCH, 0.125)
        return float(ff.Darby3K(NPS=nps, Re=reynolds, name=_DARBY_TEES[kind]))
    valves = {
        "ball_valve": lambda d: ff.K_ball_valve_Crane(d, d, 0.0),
        "gate_valve": lambda d: ff.K_gate_valve_Crane(d, d, 0.0),
        "globe_valve": lambda d: ff.K_globe_valve_Crane(d, d),
        "angle_valve": lambda d: ff.K_angle_valve_Crane(d, d, style=0),
        "check_valve_swing": lambda d: ff.K_swing_check_valve_Crane(D=d, angled=False),
        "check_valve_lift": lambda d: ff.K_lift_check_valve_Crane(d, d, angled=False),
    }
    if kind in valves:
        return float(valves[kind](diameter))
    if kind == "other":
        assert fitting.loss_coefficient is not None
        return fitting.loss_coefficient
    raise InvalidInput(f"fitting type must be one of {', '.join(FITTING_TYPES)}",
                       field="fittings")


def total_loss_coefficient(
    fittings: tuple[Fitting, ...], diameter: float, reynolds: float, fd: float
) -> float:
    """Sum of ``count * K`` over the fittings [1]."""
    return sum(f.count * loss_coefficient(f, diameter, reynolds, fd) for f in fittings)


@dataclass(frozen=True)
class _Local:
    density: float
    viscosity: float
    velocity: float
    reynolds: float
    fd: float
    k: float


def _local(
    m: PropertyModel, state: State, mass_flow: float, section: Section, phase: str
) -> _Local:
    tube = section.tube
    d = tube.inside_diameter
    mu = m.transport_at(state.pressure, state.temperature, phase).viscosity
    velocity = mass_flow / (state.density * tube.flow_area)
    reynolds = state.density * velocity * d / mu
    fd = friction_factor(reynolds, tube.roughness / d)
    k = total_loss_coefficient(section.fittings, d, reynolds, fd)
    return _Local(state.density, mu, velocity, reynolds, fd, k)


def _parts(loc: _Local, section: Section, share: float) -> PressureDropParts:
    d = section.tube.inside_diameter
    head = 0.5 * loc.density * loc.velocity**2
    return PressureDropParts(
        straight_tube=loc.fd * section.length * share / d * head,
        fittings=loc.k * share * head,
        additional_equivalent_length=loc.fd * section.additional_equivalent_length * share / d
        * head,
        static_head=loc.density * GRAVITY * section.rise * share,
    )


def _guard(p_in: float, p_out: float, tube: Tube) -> None:
    if p_out < (1.0 - GIVE_UP_SHARE) * p_in:
        raise TubeTooSmall(f"{tube.nominal_size} loses more than half the inlet pressure")


def liquid_flow(m: PropertyModel, inlet: State, mass_flow: float, section: Section) -> Flow:
    """Flow of a liquid, incompressible at its inlet properties."""
    loc = _local(m, inlet, mass_flow, section, "liquid")
    parts = _parts(loc, section, 1.0)
    p_out = inlet.pressure - parts.total
    _guard(inlet.pressure, p_out, section.tube)
    outlet = _liquid_outlet(m, inlet, p_out)
    return Flow(inlet, outlet, parts, loc.density, loc.viscosity, loc.velocity, loc.reynolds,
                loc.fd, loc.k, 1)


def _liquid_outlet(m: PropertyModel, inlet: State, p_out: float) -> State:
    """The outlet: the same enthalpy at the outlet pressure (two-phase if it flashed)."""
    if p_out >= m.critical_pressure:
        return m.at_pressure_enthalpy(p_out, inlet.enthalpy)
    bubble = m.saturated_at_pressure(p_out, 0.0)
    if inlet.enthalpy < bubble.enthalpy:
        return m.at_pressure_temperature(p_out, min(inlet.temperature,
                                                    bubble.temperature - 1e-6))
    return m.at_pressure_enthalpy(p_out, inlet.enthalpy)


def vapor_flow(m: PropertyModel, inlet: State, mass_flow: float, section: Section) -> Flow:
    """Flow of a vapour (or supercritical fluid) at constant enthalpy, in segments where the
    drop exceeds :data:`SEGMENT_SHARE` of the inlet pressure."""
    first = _local(m, inlet, mass_flow, section, "vapor")
    estimate = _parts(first, section, 1.0).total
    count = 1
    if abs(estimate) > SEGMENT_SHARE * inlet.pressure:
        count = min(MAX_SEGMENTS, math.ceil(abs(estimate) / (SEGMENT_TARGET * inlet.pressure)))
    share = 1.0 / count
    parts = NO_DROP
    p = inlet.pressure
    guess = estimate * share
    for _ in range(count):
        # properties at the segment's mean pressure, from the previous segment's drop (each
        # segment loses about 1 % of the pressure, so the guess moves the mean by a fraction of
        # a per cent and one pass is exact to far below the method's own accuracy)
        _guard(inlet.pressure, p - guess, section.tube)
        mid = m.at_pressure_enthalpy(p - 0.5 * guess, inlet.enthalpy)
        piece = _parts(_local(m, mid, mass_flow, section, "vapor"), section, share)
        parts = parts + piece
        p -= piece.total
        guess = piece.total
        _guard(inlet.pressure, p, section.tube)
    outlet = m.at_pressure_enthalpy(p, inlet.enthalpy)
    mean_state = m.at_pressure_enthalpy(0.5 * (inlet.pressure + p), inlet.enthalpy)
    mean = _local(m, mean_state, mass_flow, section, "vapor")
    return Flow(inlet, outlet, parts, mean.density, mean.viscosity, mean.velocity,
                mean.reynolds, mean.fd, mean.k, count)


def flow(
    m: PropertyModel, inlet: State, mass_flow: float, section: Section, liquid: bool
) -> Flow:
    """Flow through ``section`` from ``inlet`` at ``mass_flow`` [kg/s]; ``liquid`` selects the
    incompressible treatment (a supercritical inlet is always treated as compressible)."""
    if liquid and inlet.pressure < m.critical_pressure and inlet.phase != "supercritical":
        return liquid_flow(m, inlet, mass_flow, section)
    return vapor_flow(m, inlet, mass_flow, section)
