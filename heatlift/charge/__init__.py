"""Refrigerant charge: mass in lines, heat exchangers and vessels, CO2-equivalent, room limit.

``estimate(spec)`` takes a :class:`~heatlift.charge.spec.ChargeSpec` and returns a
:class:`~heatlift.charge.estimate.ChargeEstimate`, all in SI units (kg, m^3, kg CO2e).
"""

from __future__ import annotations

from heatlift.charge.co2e import LeakChecks, LeakCheckThreshold
from heatlift.charge.components import ComponentCharge
from heatlift.charge.estimate import CAUTION, ChargeEstimate, OperatingPoint, estimate
from heatlift.charge.limits import INSTALLATION_HEIGHTS, ChargeLimit, LimitRule
from heatlift.charge.spec import (
    LINE_KINDS,
    OCCUPANCIES,
    ROLES,
    ChargeSpec,
    HeatExchangerSpec,
    LineSpec,
    SpaceSpec,
    VesselSpec,
)
from heatlift.charge.void import DEFAULT_MODEL, MODELS
from heatlift.charge.zones import Zone

__all__ = [
    "CAUTION", "DEFAULT_MODEL", "INSTALLATION_HEIGHTS", "LINE_KINDS", "MODELS", "OCCUPANCIES",
    "ROLES", "ChargeEstimate", "ChargeLimit", "ChargeSpec", "ComponentCharge",
    "HeatExchangerSpec", "LeakCheckThreshold", "LeakChecks", "LimitRule", "LineSpec",
    "OperatingPoint",
    "SpaceSpec", "VesselSpec", "Zone", "estimate",
]
