"""A catalogue entry together with the points computed from its equation of state."""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache

from heatlift.properties import model
from heatlift.refrigerants import Refrigerant, catalogue

FLAMMABLE_CAUTION = (
    "Flammability and concentration limits are estimates after ISO 817 / ASHRAE 34 and "
    "ISO 5149-1 / EN 378-1 data; local codes, the current regulation and a licensed practitioner "
    "decide. Flammable refrigerants need ventilation, ignition-source and qualification measures "
    "that this service does not check."
)


@dataclass(frozen=True)
class RefrigerantFacts:
    """Catalogue data plus critical point [K, Pa] and normal boiling point [K]."""

    designation: str
    kind: str
    composition: dict[str, float]
    safety_class: str
    gwp100: dict[str, float | None]
    critical_temperature: float
    critical_pressure: float
    normal_boiling_point: float | None  # None: no liquid at 101.325 kPa (R744)
    lower_flammability_limit: float | None
    practical_limit: float | None
    sources: dict[str, str]
    caution: str | None


def _facts(entry: Refrigerant) -> RefrigerantFacts:
    m = model(entry.designation)
    return RefrigerantFacts(
        designation=entry.designation,
        kind=entry.kind,
        composition=dict(entry.composition),
        safety_class=entry.safety_class,
        gwp100=dict(entry.gwp100),
        critical_temperature=m.critical_temperature,
        critical_pressure=m.critical_pressure,
        normal_boiling_point=m.normal_boiling_point(),
        lower_flammability_limit=entry.lower_flammability_limit,
        practical_limit=entry.practical_limit,
        sources=dict(entry.sources),
        caution=FLAMMABLE_CAUTION if entry.is_flammable else None,
    )


@cache
def describe(designation: str) -> RefrigerantFacts:
    """The facts of one catalogue refrigerant (computed once)."""
    from heatlift.refrigerants import lookup

    return _facts(lookup(designation))


def describe_all() -> list[RefrigerantFacts]:
    return [describe(name) for name in catalogue()]
