"""Unit systems and conversion factors: the only place in heatlift where a unit is known.

Every accepted unit string is reduced once (cached) to an affine map onto the SI base unit of
its kind, ``si = value * scale + offset``; parsing and rendering a value is then one multiply
and one add. pint does the parsing of unit expressions; the trade's own conventions are laid
over it:

- ``Btu`` is the International Table Btu (1 Btu/lb = 2.326 kJ/kg exactly), as refrigeration
  tables use it; pint's default ``Btu`` is the ISO one.
- ``TR`` is the ton of refrigeration, 12,000 Btu/h (pint would read ``TR`` as a gas constant).
- ``psig``, ``barg``, ``kPag``, ``MPag`` are gauge pressures: the atmospheric pressure of the
  request is added on the way in (and subtracted for a gauge output unit).
- A temperature *difference* given as ``degC``/``degF`` means ``K``/``delta_degF``: a difference
  is never shifted by an offset.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass, field
from functools import lru_cache

import pint

STANDARD_ATMOSPHERE = 101_325.0  # [Pa]

# kind -> (SI base unit used by the engine, SI output unit, IP output unit, pint dimensionality)
_KINDS: dict[str, tuple[str, str, str]] = {
    "temperature": ("K", "degC", "degF"),
    "temperature_difference": ("K", "K", "delta_degF"),
    "pressure": ("Pa", "kPa", "psi"),
    "pressure_drop": ("Pa", "kPa", "psi"),
    "specific_enthalpy": ("J/kg", "kJ/kg", "Btu/lb"),
    "specific_entropy": ("J/kg/K", "kJ/kg/K", "Btu/lb/degR"),
    "density": ("kg/m^3", "kg/m^3", "lb/ft^3"),
    "concentration": ("kg/m^3", "kg/m^3", "lb/ft^3"),
    "power": ("W", "kW", "Btu/h"),
    "mass_flow": ("kg/s", "kg/s", "lb/h"),
    "volume_flow": ("m^3/s", "m^3/h", "ft^3/min"),
    "velocity": ("m/s", "m/s", "ft/min"),
    "length": ("m", "m", "ft"),
    "diameter": ("m", "mm", "in"),
    "area": ("m^2", "m^2", "ft^2"),
    "volume": ("m^3", "L", "ft^3"),
    "room_volume": ("m^3", "m^3", "ft^3"),  # a room's volume: m^3, not the litres of "volume"
    "mass": ("kg", "kg", "lb"),
    "co2_equivalent": ("kg", "t", "t"),
    "volumetric_capacity": ("J/m^3", "kJ/m^3", "Btu/ft^3"),
    "mass_flux": ("kg/m^2/s", "kg/m^2/s", "lb/ft^2/h"),
    "dynamic_viscosity": ("Pa*s", "Pa*s", "lb/ft/h"),
    "current": ("A", "A", "A"),
    "dimensionless": ("", "1", "1"),
}

KINDS: tuple[str, ...] = tuple(_KINDS)
SYSTEMS = ("SI", "IP")

_GAUGE_UNITS = {"psig": "psi", "barg": "bar", "kpag": "kPa", "mpag": "MPa"}
_DIFFERENCE_ALIASES = {
    "degc": "K",
    "°c": "K",
    "c": "K",
    "delta_degc": "K",
    "degf": "delta_degF",
    "°f": "delta_degF",
    "f": "delta_degF",
    "degr": "delta_degF",
    "r": "delta_degF",
}
# plain spellings the trade writes that pint reads otherwise or not at all
_ALIASES = {
    "cfm": "ft^3/min",
    "°c": "degC",
    "°f": "degF",
    "c": "degC",
    "f": "degF",
    "psia": "psi",
    "bara": "bar",
    "kpaa": "kPa",
    "tr": "TR",
    "ton": "TR",
    "%": "percent",
    "1": "dimensionless",
    "-": "dimensionless",
    "tco2e": "t",
    "t co2e": "t",
    "kgco2e": "kg",
}

_registry: pint.UnitRegistry = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
_registry.define("heatlift_ton_of_refrigeration = 12000 * Btu_it / hour")
_BTU = re.compile(r"\bBtu\b", re.IGNORECASE)
_TR = re.compile(r"\bTR\b")
_POWER_SUFFIX = re.compile(r"(?<=[a-zA-Z])([23])(?![\d.])")


class UnitError(ValueError):
    """A unit string that cannot be read, or one of the wrong kind."""


@dataclass(frozen=True)
class AffineMap:
    """``si = value * scale + offset`` and back; ``gauge`` adds the atmospheric pressure."""

    scale: float
    offset: float = 0.0
    gauge: bool = False


def _pint_expression(unit: str) -> str:
    text = _BTU.sub("Btu_it", unit)
    text = _TR.sub("heatlift_ton_of_refrigeration", text)
    return _POWER_SUFFIX.sub(r"^\1", text)


def _clean(number: float) -> float:
    """Drop the last-bit noise of pint's chained factors (8 bar would come out as
    799.9999999999999 kPa): a factor that rounds to a short decimal (at most 12 significant
    digits) is that decimal; anything else (5/9, the psi) keeps every digit."""
    short = float(f"{number:.12g}")
    return short if abs(short - number) <= 4e-15 * abs(number) else number


# letters, digits and the signs of unit algebra; nothing invisible, no control characters
_UNIT_TEXT = re.compile(r"[A-Za-z0-9 ./*^()_%°µμ²³·-]*")


@lru_cache(maxsize=4096)
def affine_map(unit: str, kind: str) -> AffineMap:
    """The map from ``unit`` to the SI base unit of ``kind``; raises :class:`UnitError`."""
    if kind not in _KINDS:
        raise UnitError(f"unknown quantity kind '{kind}'")
    raw = unit.strip()
    if not _UNIT_TEXT.fullmatch(raw):
        raise UnitError(
            f"{unit!r} holds characters no unit has; for {kind.replace('_', ' ')} use "
            f"{', '.join(units_for(kind))}"
        )
    key = raw.lower()
    gauge = False
    if key in _GAUGE_UNITS:
        if kind not in ("pressure",):
            raise UnitError(
                f"the gauge unit '{raw}' only fits an absolute pressure; use "
                f"{', '.join(units_for(kind))}"
            )
        raw, gauge = _GAUGE_UNITS[key], True
    elif kind == "temperature_difference" and key in _DIFFERENCE_ALIASES:
        raw = _DIFFERENCE_ALIASES[key]
    elif key in _ALIASES:
        raw = _ALIASES[key]
    base = _KINDS[kind][0]
    if kind == "dimensionless":
        if raw in ("dimensionless", ""):
            return AffineMap(1.0)
        if raw == "percent":
            return AffineMap(0.01)
        raise UnitError(f"'{unit}' is not dimensionless; use 1 or %")
    try:
        source = _registry.Unit(_pint_expression(raw))
        target = _registry.Unit(_pint_expression(base))
    except Exception as exc:  # pint raises many types for bad text
        raise UnitError(
            f"'{unit}' is not a unit heatlift can read; for {kind.replace('_', ' ')} use "
            f"{', '.join(units_for(kind))}"
        ) from exc
    if source.dimensionality != target.dimensionality:
        raise UnitError(
            f"'{unit}' is not a unit of {kind.replace('_', ' ')}; use "
            f"{', '.join(units_for(kind))}"
        )
    zero = _registry.Quantity(0.0, source).to(target).magnitude
    span = _registry.Quantity(1000.0, source).to(target).magnitude - zero
    # the scale over a span of 1000 units, not 1: for an offset unit (degF) the difference of
    # two nearby values would cancel most digits
    scale, offset = _clean(span / 1000.0), _clean(zero)
    return AffineMap(scale=scale, offset=offset, gauge=gauge)


def units_for(kind: str) -> tuple[str, ...]:
    """A short list of units that fit ``kind``, for error messages."""
    si, ip = _KINDS[kind][1], _KINDS[kind][2]
    extra = {
        "temperature": ("K", "degR"),
        "temperature_difference": ("delta_degC",),
        "pressure": ("bar", "MPa", "psig", "barg", "kPag"),
        "pressure_drop": ("bar", "Pa"),
        "power": ("W", "TR"),
        "mass_flow": ("kg/h", "lb/min"),
        "volume_flow": ("m^3/s", "L/s"),
        "diameter": ("m",),
        "length": ("mm", "in"),
        "volume": ("m^3", "gal"),
        "mass": ("g", "t"),
    }.get(kind, ())
    seen: list[str] = []
    for u in (si, ip, *extra):
        if u not in seen:
            seen.append(u)
    return tuple(seen)


@dataclass(frozen=True)
class UnitContext:
    """How one request reads bare numbers and writes results.

    ``system`` is ``SI`` or ``IP``; ``overrides`` maps a kind to the unit it is written in;
    ``atmospheric_pressure`` [Pa] converts gauge pressures.
    """

    system: str = "SI"
    overrides: dict[str, str] = field(default_factory=dict)
    atmospheric_pressure: float = STANDARD_ATMOSPHERE
    # kind -> renderer in its output unit, filled as results are rendered (a result renders
    # the same few kinds dozens of times)
    _renderers: dict[str, Callable[[float], dict[str, object]]] = field(
        default_factory=dict, compare=False, repr=False)

    def output_unit(self, kind: str) -> str:
        if kind in self.overrides:
            return self.overrides[kind]
        si, ip = _KINDS[kind][1], _KINDS[kind][2]
        return ip if self.system == "IP" else si

    def input_unit(self, kind: str) -> str:
        """The unit a bare number is read in (overrides change output only)."""
        si, ip = _KINDS[kind][1], _KINDS[kind][2]
        return ip if self.system == "IP" else si

    def gauge_unit(self) -> str:
        """The gauge unit matching the output pressure unit (``psi`` -> ``psig``)."""
        unit = self.output_unit("pressure")
        if unit.lower() in _GAUGE_UNITS:
            return unit
        return {"kPa": "kPag", "psi": "psig", "bar": "barg", "MPa": "MPag"}.get(unit, "kPag")

    def to_si(self, value: float, unit: str | None, kind: str) -> float:
        m = affine_map(unit if unit is not None else self.input_unit(kind), kind)
        si = value * m.scale + m.offset
        if m.gauge:
            si += self.atmospheric_pressure
        return si

    def from_si(self, value: float, kind: str, unit: str | None = None) -> float:
        return _from_si(value, affine_map(unit or self.output_unit(kind), kind),
                        self.atmospheric_pressure)

    def render(self, value: float, kind: str, unit: str | None = None) -> dict[str, object]:
        """``{"value", "unit"}`` for an SI value; non-finite values are written as null."""
        if not unit:
            return self.renderer(kind)(value)
        return _rendered(value, unit, affine_map(unit, kind), self.atmospheric_pressure)

    def renderer(self, kind: str) -> Callable[[float], dict[str, object]]:
        """:meth:`render` for ``kind`` in its output unit, as one function (kept per kind)."""
        found = self._renderers.get(kind)
        if found is None:
            unit = self.output_unit(kind)
            m = affine_map(unit, kind)
            atmosphere = self.atmospheric_pressure

            def found(value: float) -> dict[str, object]:
                return _rendered(value, unit, m, atmosphere)
            self._renderers[kind] = found
        return found

    def text(self, value: float, kind: str) -> str:
        """A value as text in the caller's units, for error details: ``'-40 degF'``."""
        unit = self.output_unit(kind)
        number = self.from_si(value, kind, unit)
        return f"{number:.6g} {unit}" if unit != "1" else f"{number:.6g}"


def _from_si(value: float, m: AffineMap, atmosphere: float) -> float:
    """The SI ``value`` in the unit of map ``m`` (``atmosphere`` [Pa] for a gauge unit)."""
    if m.gauge:
        value -= atmosphere
    return (value - m.offset) / m.scale


def _rendered(value: float, unit: str, m: AffineMap, atmosphere: float) -> dict[str, object]:
    """``{"value", "unit"}`` of the SI ``value`` in ``unit`` (map ``m``; ``atmosphere`` [Pa]
    for a gauge unit)."""
    out = _from_si(value, m, atmosphere)
    if not math.isfinite(out):
        return {"value": None, "unit": unit}
    # 15 significant digits: free of the last-bit noise of a division (3.7299999999999995 mm
    # is written 3.73 mm)
    return {"value": float(f"{out:.15g}"), "unit": unit}


def check_override(kind: str, unit: str) -> None:
    """Raise :class:`UnitError` unless ``unit`` is a unit of ``kind``."""
    if kind not in _KINDS:
        raise UnitError(f"unknown quantity kind '{kind}'; kinds are {', '.join(KINDS)}")
    affine_map(unit, kind)


_NUMBER_AND_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


def split_quantity_text(text: str) -> tuple[float, str | None]:
    """``"45 psig"`` -> ``(45.0, "psig")``; ``"12"`` -> ``(12.0, None)``."""
    match = _NUMBER_AND_UNIT.match(text)
    if not match:
        raise UnitError(f"'{text}' is not a number followed by a unit, like '45 psig' or '7 degC'")
    unit = match.group(2)
    return float(match.group(1)), (unit or None)
