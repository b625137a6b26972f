"""What a cycle calculation answers: labelled states in flow order and the performance."""

from __future__ import annotations

from typing import NamedTuple

from heatlift.errors import Remark
from heatlift.properties import State

# labels of the places in a circuit, in the words of the trade
LABELS = (
    "evaporator_outlet",
    "compressor_suction",
    "compressor_discharge",
    "low_stage_suction",
    "low_stage_discharge",
    "high_stage_suction",
    "high_stage_discharge",
    "intermediate_injection",
    "condenser_inlet",
    "condenser_outlet",
    "gas_cooler_inlet",
    "gas_cooler_outlet",
    "economizer_injection_inlet",
    "economizer_liquid_outlet",
    "economizer_vapor_outlet",
    "flash_tank_liquid",
    "flash_tank_vapor",
    "expansion_valve_inlet",
    "evaporator_inlet",
)


class CyclePoint(NamedTuple):
    """A state at a labelled place in the circuit, with the mass flow through it [kg/s].

    (Named tuples, like :class:`~heatlift.properties.State`, for the records a cycle builds
    many of: immutable, and built in a fraction of a frozen dataclass's time.)
    """

    label: str
    state: State
    mass_flow: float


class Performance(NamedTuple):
    """Cycle performance [W, kg/s, m^3/s, J/m^3, K, Pa, 1].

    ``cop = cooling_capacity / compressor_power``; ``cop_heating = heating_capacity /
    compressor_power``; ``cop_carnot = T_e / (T_c - T_e)`` between the mean evaporating and the
    mean condensing saturation temperatures (the gas-cooler outlet temperature when
    transcritical); ``second_law_efficiency = cop / cop_carnot``; ``energy_balance_residual`` is
    (heat in + power - heat out) / heat out over the whole circuit [1].
    """

    cooling_capacity: float
    heating_capacity: float
    heat_rejected: float
    compressor_power: float
    cop: float
    cop_heating: float
    mass_flow: float
    suction_volume_flow: float
    volumetric_capacity: float
    pressure_ratio: float
    discharge_temperature: float
    cop_carnot: float
    second_law_efficiency: float
    isentropic_efficiency: float
    intermediate_pressure: float | None
    high_side_pressure: float
    low_side_pressure: float
    energy_balance_residual: float


class CycleResult(NamedTuple):
    """A solved and sized circuit: its labelled states in flow order, the performance and
    the reviewer's remarks (a named tuple like its parts: immutable, cheap to build)."""

    refrigerant: str
    circuit: str
    states: tuple[CyclePoint, ...]
    performance: Performance
    remarks: tuple[Remark, ...]

    def point(self, label: str) -> CyclePoint:
        """The state at ``label``; raises KeyError when the circuit has no such place."""
        for p in self.states:
            if p.label == label:
                return p
        raise KeyError(label)
