"""Oil return up vapour risers: the dimensionless gas velocity criterion of Jacobs et al. (1976).

Jacobs, Scheideman, Kazem and Macken (1976), "Oil transport by refrigerant vapor", ASHRAE
Transactions 82(2), found that the oil film on the wall of a vertical tube is carried upward
when the dimensionless gas velocity (Wallis's form)

    J* = J_g sqrt(rho_g / (g D (rho_l - rho_g)))                                         [1]

is at least about 0.85, where ``J_g = m / (rho_g A)`` is the superficial gas velocity [m/s],
``rho_g`` the vapour density and ``rho_l`` the density of the liquid film [kg/m^3], ``D`` the
inside diameter [m]. The minimum-capacity tables for suction and discharge risers of the
refrigeration handbooks rest on this criterion with J* = 0.85 (ASHRAE Handbook,
Refrigeration, chapter on halocarbon refrigeration systems; from memory). Hence

    v_min = 0.85 sqrt(g D (rho_l - rho_g) / rho_g),     m_min = rho_g v_min A.

The film is oil rich; its density is taken as :data:`OIL_DENSITY`, a typical density of a
refrigeration lubricant (mineral oils about 860-890, polyol esters about 940-1000 kg/m^3):
an assumption, and v_min moves with sqrt(rho_l), so 10 % on the density is 5 % on v_min.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fluids.constants import g as GRAVITY

# refrigerants whose oil does not dissolve in them: the oil is drained from low points (oil pots,
# the low-pressure receiver) rather than carried up risers (common practice, no source)
IMMISCIBLE = frozenset({"R717"})
CRITERION = 0.85  # minimum J* for upward oil-film flow (Jacobs et al. 1976, from memory)
OIL_DENSITY = 900.0  # [kg/m^3], assumed oil-rich film density


@dataclass(frozen=True)
class OilCarry:
    """The oil-return limit of one riser: ``minimum_velocity`` [m/s], ``minimum_mass_flow``
    [kg/s]; ``dimensionless_gas_velocity`` [1] at the flow it was evaluated for."""

    minimum_velocity: float
    minimum_mass_flow: float
    dimensionless_gas_velocity: float


def dimensionless_gas_velocity(
    velocity: float, vapor_density: float, diameter: float, liquid_density: float = OIL_DENSITY
) -> float:
    """``J* = J_g sqrt(rho_g / (g D (rho_l - rho_g)))`` [1] (Wallis; Jacobs et al. 1976);
    ``velocity`` [m/s], densities [kg/m^3], ``diameter`` [m]."""
    return velocity * math.sqrt(vapor_density / (GRAVITY * diameter
                                                 * (liquid_density - vapor_density)))


def minimum_velocity(
    vapor_density: float, diameter: float, liquid_density: float = OIL_DENSITY,
    criterion: float = CRITERION,
) -> float:
    """``v_min = J*_min sqrt(g D (rho_l - rho_g) / rho_g)`` [m/s]."""
    return criterion * math.sqrt(GRAVITY * diameter * (liquid_density - vapor_density)
                                 / vapor_density)


def evaluate(
    mass_flow: float, vapor_density: float, diameter: float, area: float,
    liquid_density: float = OIL_DENSITY,
) -> OilCarry:
    """The riser limit for a tube of inside ``diameter`` [m] and flow ``area`` [m^2], and J* at
    ``mass_flow`` [kg/s]."""
    if vapor_density >= liquid_density:
        # a fluid as dense as oil (supercritical R744 at high pressure): no film to lift
        return OilCarry(0.0, 0.0, math.inf)
    v_min = minimum_velocity(vapor_density, diameter, liquid_density)
    velocity = mass_flow / (vapor_density * area)
    return OilCarry(v_min, vapor_density * v_min * area,
                    dimensionless_gas_velocity(velocity, vapor_density, diameter, liquid_density))


def applies_to(refrigerant: str) -> bool:
    """False for refrigerants whose oil is not carried up risers (ammonia)."""
    return refrigerant not in IMMISCIBLE
