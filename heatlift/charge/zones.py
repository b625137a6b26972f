"""Zones of a heat exchanger and the mean refrigerant density in each.

Between its inlet and outlet states a heat exchanger's refrigerant passes through up to three
zones: vapour (desuperheating in a condenser, superheating in an evaporator), two-phase, and
liquid (subcooled); above the critical pressure one supercritical zone (a gas cooler).

Assumption (stated in every answer that uses it): **each zone's share of the internal volume
equals its share of the enthalpy change** — the heat exchanged per unit of volume is taken as
uniform along the exchanger, and within a zone the volume is spread evenly over enthalpy. It is
the simplest rule that follows from the solved states alone; a real exchanger's subcooled zone,
with its poorer heat transfer, takes a larger share of the volume than its share of the duty, so
shares measured or taken from the maker's rating may be given instead.

The pressure in the exchanger is taken as the mean of the inlet and outlet pressures.

Mean densities [kg/m^3]:

- single-phase zone: the density averaged over enthalpy, ``(1/(h_b - h_a)) int rho(p, h) dh``,
  by composite Gauss-Legendre quadrature (6 panels of 3 nodes);
- two-phase zone: the two-phase density ``rho_tp = alpha rho_g + (1 - alpha) rho_l`` averaged
  over quality, ``(1/(x_b - x_a)) int rho_tp(x) dx`` (quality taken linear along the zone, i.e.
  in enthalpy for a pure fluid), by adaptive Simpson quadrature. The phase densities (and the
  surface tension) are those of the coexisting phases: constant for a pure fluid, sampled at
  nine qualities and interpolated linearly for a blend, whose temperature and phase
  compositions change along the glide.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass

from heatlift.charge.void import VoidModel
from heatlift.errors import InvalidInput, SIValue
from heatlift.properties import Coexistence, PropertyModel, State

_GL3 = ((-math.sqrt(0.6), 5.0 / 9.0), (0.0, 8.0 / 9.0), (math.sqrt(0.6), 5.0 / 9.0))
_PANELS = 6
_BLEND_NODES = 9
_SIMPSON_TOLERANCE = 1e-8  # relative to the integral's scale
_MIN_SHARE = 1e-9


@dataclass(frozen=True)
class Zone:
    """One zone of a heat exchanger: ``name``; ``volume_share`` and ``enthalpy_share`` [1];
    ``mean_density`` [kg/m^3]; for the two-phase zone the qualities at its ends and the
    ``mean_void_fraction`` [1] averaged over quality; ``volume`` [m^3] and ``mass`` [kg] once
    the exchanger's internal volume is known (:mod:`heatlift.charge.components`)."""

    name: str
    volume_share: float
    enthalpy_share: float
    mean_density: float
    quality_in: float | None = None
    quality_out: float | None = None
    mean_void_fraction: float | None = None
    volume: float = 0.0
    mass: float = 0.0


def mean_single_phase_density(m: PropertyModel, pressure: float, h_a: float, h_b: float) -> float:
    """Density averaged over enthalpy between ``h_a`` and ``h_b`` [J/kg] at ``pressure`` [Pa].

    ``(1/(h_b - h_a)) int_{h_a}^{h_b} rho(p, h) dh``, composite 3-node Gauss-Legendre (the nodes
    lie inside the interval, so a zone ending at a saturation point is never evaluated on it).
    """
    if h_a == h_b:
        return m.at_pressure_enthalpy(pressure, h_a).density
    width = (h_b - h_a) / _PANELS
    total = 0.0
    for i in range(_PANELS):
        centre = h_a + (i + 0.5) * width
        for node, weight in _GL3:
            total += weight * m.at_pressure_enthalpy(pressure, centre + 0.5 * width * node).density
    return total / (2.0 * _PANELS)


def _adaptive_simpson(f: Callable[[float], float], a: float, b: float, scale: float) -> float:
    """int_a^b f by adaptive Simpson quadrature to ``_SIMPSON_TOLERANCE * scale * (b - a)``."""
    tolerance = _SIMPSON_TOLERANCE * scale * abs(b - a)

    def simpson(fa: float, fm: float, fb: float, lo: float, hi: float) -> float:
        return (hi - lo) / 6.0 * (fa + 4.0 * fm + fb)

    def refine(lo: float, hi: float, fa: float, fm: float, fb: float, whole: float,
               tol: float, depth: int) -> float:
        mid = 0.5 * (lo + hi)
        lm, rm = 0.5 * (lo + mid), 0.5 * (mid + hi)
        flm, frm = f(lm), f(rm)
        left, right = simpson(fa, flm, fm, lo, mid), simpson(fm, frm, fb, mid, hi)
        if depth <= 0 or abs(left + right - whole) <= 15.0 * tol:
            return left + right + (left + right - whole) / 15.0
        return (refine(lo, mid, fa, flm, fm, left, 0.5 * tol, depth - 1)
                + refine(mid, hi, fm, frm, fb, right, 0.5 * tol, depth - 1))

    fa, fb, fm = f(a), f(b), f(0.5 * (a + b))
    return refine(a, b, fa, fm, fb, simpson(fa, fm, fb, a, b), tolerance, 40)


def _phases(m: PropertyModel, pressure: float, x_a: float, x_b: float, sigma: bool
            ) -> Callable[[float], Coexistence]:
    """Coexisting phases along quality: exact and constant for a pure fluid, linear between
    nine samples for a blend."""
    if not m.is_mixture:
        fixed = m.coexisting_phases(pressure, 0.5, surface_tension=sigma)
        return lambda _x: fixed
    lo, hi = min(x_a, x_b), max(x_a, x_b)
    xs = [lo + (hi - lo) * i / (_BLEND_NODES - 1) for i in range(_BLEND_NODES)]
    samples = [m.coexisting_phases(pressure, x, surface_tension=sigma) for x in xs]

    def at(x: float) -> Coexistence:
        if hi == lo:
            return samples[0]
        pos = min(_BLEND_NODES - 1.0, max(0.0, (x - lo) / (hi - lo) * (_BLEND_NODES - 1)))
        i = min(int(pos), _BLEND_NODES - 2)
        w = pos - i
        a, b = samples[i], samples[i + 1]
        st = None
        if a.surface_tension is not None and b.surface_tension is not None:
            st = a.surface_tension + w * (b.surface_tension - a.surface_tension)
        return Coexistence(
            pressure, a.temperature + w * (b.temperature - a.temperature), x,
            a.liquid_density + w * (b.liquid_density - a.liquid_density),
            a.vapor_density + w * (b.vapor_density - a.vapor_density), st,
        )

    return at


def mean_two_phase(
    m: PropertyModel, pressure: float, x_a: float, x_b: float, model: VoidModel,
    mass_flux: float | None,
) -> tuple[float, float]:
    """(mean two-phase density [kg/m^3], mean void fraction [1]) over quality ``x_a``..``x_b``.

    ``rho_tp(x) = alpha(x) rho_g + (1 - alpha(x)) rho_l``, averaged over quality:
    ``(1/(x_b - x_a)) int rho_tp dx``. ``mass_flux`` [kg/m^2/s] is needed by the drift-flux
    models only.
    """
    if model.needs_mass_flux and mass_flux is None:
        raise InvalidInput(f"the {model.source} void fraction needs the mass flux")
    phases = _phases(m, pressure, x_a, x_b, model.needs_mass_flux)
    flux = mass_flux if mass_flux is not None else 0.0

    def alpha(x: float) -> float:
        c = phases(x)
        return model.alpha(x, c.liquid_density, c.vapor_density, c.surface_tension or 0.0, flux)

    def rho(x: float) -> float:
        c = phases(x)
        a = model.alpha(x, c.liquid_density, c.vapor_density, c.surface_tension or 0.0, flux)
        return a * c.vapor_density + (1.0 - a) * c.liquid_density

    lo, hi = min(x_a, x_b), max(x_a, x_b)
    if hi - lo < 1e-12:
        return rho(lo), alpha(lo)
    scale = phases(lo).liquid_density
    mean_rho = _adaptive_simpson(rho, lo, hi, scale) / (hi - lo)
    mean_alpha = _adaptive_simpson(alpha, lo, hi, 1.0) / (hi - lo)
    return mean_rho, mean_alpha


def split(m: PropertyModel, pressure: float, h_in: float, h_out: float
          ) -> list[tuple[str, float, float]]:
    """The zones between ``h_in`` and ``h_out`` [J/kg] at ``pressure`` [Pa], in flow order:
    ``(name, h_start, h_end)``."""
    if pressure >= m.critical_pressure:
        return [("supercritical", h_in, h_out)]
    h_bubble = m.saturated_at_pressure(pressure, 0.0).enthalpy
    h_dew = m.saturated_at_pressure(pressure, 1.0).enthalpy
    cooling = h_in > h_out
    lo, hi = min(h_in, h_out), max(h_in, h_out)
    pieces = [
        ("subcooled", lo, min(hi, h_bubble)),
        ("two_phase", max(lo, h_bubble), min(hi, h_dew)),
        ("desuperheating" if cooling else "superheating", max(lo, h_dew), hi),
    ]
    kept = [(name, a, b) for name, a, b in pieces if b - a > _MIN_SHARE * (hi - lo)]
    if cooling:
        return [(name, b, a) for name, a, b in reversed(kept)]
    return kept


def _quality(m: PropertyModel, pressure: float, h: float) -> float:
    bubble = m.saturated_at_pressure(pressure, 0.0)
    dew = m.saturated_at_pressure(pressure, 1.0)
    if h <= bubble.enthalpy:
        return 0.0
    if h >= dew.enthalpy:
        return 1.0
    if not m.is_mixture:
        return (h - bubble.enthalpy) / (dew.enthalpy - bubble.enthalpy)
    q = m.at_pressure_enthalpy(pressure, h).quality
    return 0.0 if q is None else q


def exchanger_zones(
    m: PropertyModel,
    inlet: State,
    outlet: State,
    model: VoidModel,
    mass_flux: float | None,
    shares: Mapping[str, float] | None = None,
) -> tuple[Zone, ...]:
    """The zones of a heat exchanger from its inlet and outlet states, each with its volume
    share (enthalpy share unless ``shares`` gives them) and mean density."""
    pressure = 0.5 * (inlet.pressure + outlet.pressure)
    span = abs(inlet.enthalpy - outlet.enthalpy)
    if span <= 0.0:
        raise InvalidInput("the inlet and outlet states of the heat exchanger are equal")
    pieces = split(m, pressure, inlet.enthalpy, outlet.enthalpy)
    names = [name for name, _, _ in pieces]
    if shares is not None:
        unknown = [k for k in shares if k not in names]
        if unknown:
            raise InvalidInput(
                f"zone_shares names {', '.join(unknown)}, but at this operating point the "
                f"exchanger has the zones {', '.join(names)}", field="zone_shares")
        total = sum(shares.values())
        if abs(total - 1.0) > 5e-3:
            raise InvalidInput("zone_shares must add up to 1 (they add up to {total})",
                               {"total": SIValue(total, "dimensionless")}, field="zone_shares")
    zones = []
    for name, h_a, h_b in pieces:
        enthalpy_share = abs(h_b - h_a) / span
        share = enthalpy_share if shares is None else shares.get(name, 0.0) / sum(shares.values())
        if name == "two_phase":
            x_a, x_b = _quality(m, pressure, h_a), _quality(m, pressure, h_b)
            rho, alpha = mean_two_phase(m, pressure, x_a, x_b, model, mass_flux)
            zones.append(Zone(name, share, enthalpy_share, rho, x_a, x_b, alpha))
        else:
            zones.append(Zone(name, share, enthalpy_share,
                              mean_single_phase_density(m, pressure, h_a, h_b)))
    return tuple(zones)
