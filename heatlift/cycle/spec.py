"""What a cycle calculation is asked: the circuit, its conditions, its compressor, its size.

All values SI: temperatures [K], pressures [Pa] (absolute), temperature differences [K],
capacities [W], mass flow [kg/s], displacement [m^3/s]. ``None`` means "not given".
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

CIRCUITS = ("single_stage", "economized", "two_stage", "transcritical")
BASES = ("dew", "mean", "bubble")
ECONOMIZERS = ("subcooler", "flash")


@dataclass(frozen=True)
class SaturationSpec:
    """A saturation condition by ``temperature`` [K] or ``pressure`` [Pa].

    ``basis`` says which saturation temperature of a blend is meant: the dew point (the
    compressor rating standards' convention), the bubble point, or the mean of the two at the
    same pressure. For a pure fluid all three coincide.
    """

    temperature: float | None = None
    pressure: float | None = None
    basis: str = "dew"


@dataclass(frozen=True)
class GasCoolerSpec:
    """Transcritical high side: gas-cooler ``outlet_temperature`` [K], ``pressure`` [Pa] or
    ``None`` for the pressure that maximises the COP."""

    outlet_temperature: float
    pressure: float | None = None


@dataclass(frozen=True)
class CompressorSpec:
    """The compressor: by isentropic efficiency [1] (with a share ``heat_loss_fraction`` [1] of
    the input power lost from the shell), by ``displacement`` [m^3/s] with
    ``volumetric_efficiency`` [1], or by a supplier polynomial (``heatlift.compressor``)."""

    isentropic_efficiency: float | None = None
    heat_loss_fraction: float = 0.0
    displacement: float | None = None
    volumetric_efficiency: float | None = None
    polynomial: Any = None


@dataclass(frozen=True)
class PressureDrop:
    """A pressure drop [Pa], or the drop of saturation temperature it causes [K]."""

    pressure: float | None = None
    saturation_temperature: float | None = None


@dataclass(frozen=True)
class PressureDrops:
    """Pressure drops of the suction and discharge lines, evaporator and condenser."""

    suction_line: PressureDrop = field(default_factory=PressureDrop)
    discharge_line: PressureDrop = field(default_factory=PressureDrop)
    evaporator: PressureDrop = field(default_factory=PressureDrop)
    condenser: PressureDrop = field(default_factory=PressureDrop)


@dataclass(frozen=True)
class CycleSpec:
    """One vapour-compression cycle to solve.

    ``evaporating`` is the saturation at the evaporator outlet; ``condensing`` the saturation
    at the condenser inlet (for ``transcritical`` give ``gas_cooler`` instead). ``superheat`` is
    at the evaporator outlet, ``suction_line_superheat`` is picked up outside the refrigerated
    space (no useful cooling), ``subcooling`` at the condenser outlet, ``liquid_line_subcooling``
    after it. Exactly one size: ``cooling_capacity``, ``heating_capacity``, ``mass_flow`` or the
    compressor's displacement (or polynomial).
    """

    refrigerant: str
    evaporating: SaturationSpec
    condensing: SaturationSpec | None = None
    gas_cooler: GasCoolerSpec | None = None
    superheat: float = 5.0
    suction_line_superheat: float = 0.0
    subcooling: float = 2.0
    liquid_line_subcooling: float = 0.0
    compressor: CompressorSpec = field(
        default_factory=lambda: CompressorSpec(isentropic_efficiency=0.7)
    )
    cooling_capacity: float | None = None
    heating_capacity: float | None = None
    mass_flow: float | None = None
    pressure_drops: PressureDrops = field(default_factory=PressureDrops)
    internal_heat_exchanger_effectiveness: float = 0.0
    circuit: str = "single_stage"
    intermediate_pressure: float | None = None
    economizer: str = "subcooler"
    economizer_approach: float = 5.0
    economizer_superheat: float = 5.0
    high_stage_compressor: CompressorSpec | None = None
    flash_tank_pressure: float | None = None
    discharge_temperature_limit: float = 135.0 + 273.15
