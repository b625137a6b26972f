"""What a charge estimate is asked: the operating point, the parts that hold refrigerant, the room.

All values SI: lengths and diameters [m], volumes [m^3], areas [m^2], pressures [Pa], fractions
[1]. ``None`` means "not given".
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from heatlift.cycle import CycleSpec

LINE_KINDS = ("suction", "discharge", "liquid")
ROLES = ("evaporator", "condenser", "gas_cooler")
VESSEL_KINDS = ("receiver", "accumulator")
OCCUPANCIES = ("a", "b", "c")


@dataclass(frozen=True)
class LineSpec:
    """A refrigerant line: ``line`` (suction, discharge or liquid), ``length`` [m], and either
    ``inside_diameter`` [m] or a catalogue ``size`` label of ``standard`` (ASTM B280,
    EN 12735-1, ASME B36.10 with ``schedule``; see :mod:`heatlift.lines.tubes`)."""

    line: str
    length: float
    inside_diameter: float | None = None
    size: str | None = None
    standard: str | None = None
    schedule: str | None = None
    name: str | None = None


@dataclass(frozen=True)
class HeatExchangerSpec:
    """A heat exchanger: ``role`` (evaporator, condenser, gas_cooler), refrigerant-side
    ``internal_volume`` [m^3], the void-fraction ``void_model`` of
    :data:`heatlift.charge.void.MODELS`, the refrigerant-side ``tube_inside_diameter`` [m] and
    the number of parallel ``circuits`` (for the mass flux of the drift-flux models), and
    optionally ``zone_shares``: the share [1] of the volume in each zone, instead of the shares
    that follow from the enthalpy changes."""

    role: str
    internal_volume: float
    void_model: str = "zivi"
    tube_inside_diameter: float | None = None
    circuits: int = 1
    zone_shares: Mapping[str, float] | None = None
    name: str | None = None


@dataclass(frozen=True)
class VesselSpec:
    """A receiver or a suction accumulator: ``volume`` [m^3] and the share of it filled with
    liquid at the operating point, ``fill_fraction`` [1]; ``pressure`` [Pa] when it does not sit
    at the high-side liquid (receiver) or the suction (accumulator) pressure of the cycle."""

    volume: float
    fill_fraction: float
    pressure: float | None = None
    name: str | None = None


@dataclass(frozen=True)
class SpaceSpec:
    """The occupied room the system serves.

    ``floor_area`` [m^2]; ``volume`` [m^3] (or ``room_height`` [m], then volume = area x
    height); ``installation_height`` [m] of the refrigerant-containing indoor part (the h0 of
    the flammability rule); ``occupancy``: the access category a (general), b (supervised) or
    c (authorised persons only) of ISO 5149-1 / EN 378-1.
    """

    floor_area: float
    volume: float | None = None
    room_height: float | None = None
    installation_height: float | None = None
    occupancy: str = "a"


@dataclass(frozen=True)
class ChargeSpec:
    """A charge estimate: the ``cycle`` that fixes the states, the parts, the GWP basis, the
    room. A cycle without a size is solved per kilogram per second (the states do not depend on
    the size); the drift-flux void models then cannot be used."""

    cycle: CycleSpec
    lines: tuple[LineSpec, ...] = ()
    heat_exchangers: tuple[HeatExchangerSpec, ...] = ()
    receivers: tuple[VesselSpec, ...] = ()
    accumulators: tuple[VesselSpec, ...] = ()
    gwp_basis: str = "AR6"
    space: SpaceSpec | None = None
