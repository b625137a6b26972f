"""Pressure rating of a tube: ASME B31.5 allowed working pressure against the design pressure.

ASME B31.5 (para. 504.1.2, straight pipe under internal pressure) gives the minimum wall
``t_m = P D / (2 S E + 0.8 P)``, that is ``t_m = P D / (2 (S E + P y))`` with ``y = 0.4``;
solved for the pressure a wall of ``t_m`` carries:

    P = 2 S E t_m / (D - 0.8 t_m)                                                     [Pa, gauge]

``D`` outside diameter [m], ``S`` the material's allowable stress at the metal temperature [Pa],
``E`` the joint efficiency [1] (1 for seamless), ``t_m`` the minimum wall [m]: the nominal wall
less the mill tolerance (no corrosion or thread allowance: brazed or welded refrigerant lines
are dry inside). Brazing anneals drawn copper next to each joint, so brazed copper is rated with
the annealed stress (common practice).

The design pressure of each side is, by default, the bubble-point saturation pressure at a
design temperature of that side: 55 degC for the high side and 32 degC for the low side
(common practice, matching the table of EN 378-2 for ambient temperatures up to 32 degC, from
memory). The caller may give either the design temperature or the design pressure.
"""

from __future__ import annotations

from dataclasses import dataclass

from heatlift.errors import InvalidInput, Remark, SIValue
from heatlift.lines.tubes import Tube
from heatlift.properties import PropertyModel

DESIGN_TEMPERATURE = {"high": 55.0 + 273.15, "low": 32.0 + 273.15}  # [K], common practice
SIDE_OF_LINE = {"suction": "low", "discharge": "high", "liquid": "high"}
Y_COEFFICIENT = 0.4  # ASME B31.5 (and B31.1) y for ferritic steel and non-ferrous metals < 900 F


@dataclass(frozen=True)
class DesignBasis:
    """What the tube must hold on this side: ``design_pressure`` [Pa, absolute], from
    ``design_temperature`` [K] (None when the caller gave the pressure)."""

    side: str
    design_pressure: float
    design_temperature: float | None


@dataclass(frozen=True)
class PressureRating:
    """Allowed working and design pressure [Pa, absolute]; the stress [Pa] and minimum wall [m]
    used; ``metal_temperature`` [K] at which the stress was read."""

    allowed_working_pressure: float
    design_pressure: float
    ok: bool
    design_temperature: float | None
    metal_temperature: float
    allowable_stress: float
    minimum_wall: float
    stress_basis: str
    material: str
    atmospheric_pressure: float

    @property
    def allowed_gauge_pressure(self) -> float:
        return self.allowed_working_pressure - self.atmospheric_pressure

    @property
    def design_gauge_pressure(self) -> float:
        return self.design_pressure - self.atmospheric_pressure


def allowed_gauge_pressure(
    outside_diameter: float, minimum_wall: float, allowable_stress: float,
    joint_efficiency: float = 1.0,
) -> float:
    """``P = 2 S E t_m / (D - 2 y t_m)`` [Pa, gauge] with y = 0.4 (ASME B31.5)."""
    return (2.0 * allowable_stress * joint_efficiency * minimum_wall
            / (outside_diameter - 2.0 * Y_COEFFICIENT * minimum_wall))


def design_basis(
    m: PropertyModel, line: str, design_temperature: float | None,
    design_pressure: float | None,
) -> DesignBasis:
    """The design pressure of the side of ``line``: given, or the bubble pressure at the
    design temperature (given or the side's default)."""
    side = SIDE_OF_LINE[line]
    if design_pressure is not None:
        return DesignBasis(side, design_pressure, None)
    temperature = design_temperature if design_temperature is not None else \
        DESIGN_TEMPERATURE[side]
    if temperature >= m.critical_temperature:
        raise InvalidInput(
            f"the {side}-side design temperature {{t}} is at or above the critical temperature "
            f"of {m.name}, {{tc}}, so no saturation pressure defines the design pressure: give "
            "design_pressure (for example the relief-valve setting of that side), or a "
            "design_temperature below {tc}",
            {"t": SIValue(temperature, "temperature"),
             "tc": SIValue(m.critical_temperature, "temperature")},
            field="design_pressure",
        )
    m.check_saturation_temperature(temperature, field="design_temperature")
    return DesignBasis(side, m.saturated_at_temperature(temperature, 0.0).pressure, temperature)


def rate(
    tube: Tube, basis: DesignBasis, metal_temperature: float, brazed: bool,
    atmospheric_pressure: float,
) -> tuple[PressureRating, list[Remark]]:
    """Rate ``tube`` at ``metal_temperature`` [K] against ``basis``."""
    material = tube.material
    remarks: list[Remark] = []
    if material.is_copper:
        stress_basis = "annealed" if brazed or tube.temper == "annealed" else "drawn"
    else:
        stress_basis = next(iter(material.allowable_stress))
    stress = material.stress_at(stress_basis, metal_temperature)
    top = material.highest_tabulated_temperature(stress_basis)
    if metal_temperature > top:
        remarks.append(Remark(
            "metal_temperature_above_table",
            f"the metal temperature {{t}} lies above the highest temperature of the "
            f"allowable-stress table of {material.name}, {{top}}; the stress at {{top}} was used",
            {"t": SIValue(metal_temperature, "temperature"), "top": SIValue(top, "temperature")},
        ))
    t_min = tube.wall_thickness * (1.0 - material.wall_tolerance)
    gauge = allowed_gauge_pressure(tube.outside_diameter, t_min, stress,
                                   material.joint_efficiency)
    allowed = gauge + atmospheric_pressure
    rating = PressureRating(
        allowed_working_pressure=allowed,
        design_pressure=basis.design_pressure,
        ok=allowed >= basis.design_pressure,
        design_temperature=basis.design_temperature,
        metal_temperature=metal_temperature,
        allowable_stress=stress,
        minimum_wall=t_min,
        stress_basis=stress_basis,
        material=material.name,
        atmospheric_pressure=atmospheric_pressure,
    )
    return rating, remarks
