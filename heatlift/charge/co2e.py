"""CO2-equivalent of a charge and the EU F-gas leak-check thresholds, as information.

``CO2e [t] = m [kg] x GWP100 / 1000``; the engine keeps SI base units, so it returns kg of
CO2-equivalent (``m x GWP``) and the unit layer writes tonnes.

Leak-check thresholds, from memory: Regulation (EU) No 517/2014, Article 4: equipment holding
fluorinated greenhouse gases of 5 t CO2e or more is checked for leaks at least every 12 months
(24 with a leakage detection system), 50 t or more every 6 months (12), 500 t or more every 3
months (6), and at 500 t or more a leakage detection system is required (Article 5).
Regulation (EU) 2024/573, which replaced it, keeps these thresholds (from memory). Refrigerants
that are not fluorinated gases (hydrocarbons, R744, R717, R718) fall outside these duties.
"""

from __future__ import annotations

from dataclasses import dataclass

from heatlift.errors import InvalidInput
from heatlift.refrigerants import GWP_BASES, Refrigerant

REGULATION = ("Regulation (EU) No 517/2014, Art. 4 and 5; thresholds kept by Regulation (EU) "
              "2024/573 (from memory)")
# components that carry no fluorine: a refrigerant made only of these is no F-gas
_NOT_FLUORINATED = frozenset({"R290", "R600a", "R600", "R1270", "R170", "R744", "R717", "R718"})


@dataclass(frozen=True)
class LeakCheckThreshold:
    """A leak-check threshold [kg CO2e] with its interval in months, without and with a
    leakage detection system, and whether such a system is required."""

    co2_equivalent: float
    interval_months: int
    interval_with_detection_months: int
    leak_detection_required: bool


THRESHOLDS = (
    LeakCheckThreshold(5_000.0, 12, 24, False),
    LeakCheckThreshold(50_000.0, 6, 12, False),
    LeakCheckThreshold(500_000.0, 3, 6, True),
)


@dataclass(frozen=True)
class LeakChecks:
    """The thresholds, whether the refrigerant is a fluorinated gas, and the highest
    threshold the charge reaches (None below 5 t CO2e or for a refrigerant that is no F-gas)."""

    regulation: str
    fluorinated: bool
    thresholds: tuple[LeakCheckThreshold, ...]
    reached: LeakCheckThreshold | None


def gwp(refrigerant: Refrigerant, basis: str) -> float | None:
    """GWP100 [1] of ``refrigerant`` on ``basis`` (AR4, AR5, AR6); None when not recorded."""
    if basis not in GWP_BASES:
        raise InvalidInput(f"gwp_basis must be one of {', '.join(GWP_BASES)}",
                           field="gwp_basis")
    return refrigerant.gwp100.get(basis)


def co2_equivalent(charge: float, refrigerant: Refrigerant, basis: str) -> float | None:
    """CO2-equivalent [kg CO2e] of ``charge`` [kg]: ``charge x GWP100``; None without a GWP."""
    value = gwp(refrigerant, basis)
    return None if value is None else charge * value


def is_fluorinated(refrigerant: Refrigerant) -> bool:
    """True when any component of the refrigerant is a fluorinated gas."""
    return any(c not in _NOT_FLUORINATED for c in refrigerant.composition)


def leak_checks(co2e: float | None, refrigerant: Refrigerant) -> LeakChecks:
    """The leak-check information for a charge of ``co2e`` [kg CO2e]."""
    fluorinated = is_fluorinated(refrigerant)
    reached = None
    if fluorinated and co2e is not None:
        for threshold in THRESHOLDS:
            if co2e >= threshold.co2_equivalent:
                reached = threshold
    return LeakChecks(REGULATION, fluorinated, THRESHOLDS, reached)
