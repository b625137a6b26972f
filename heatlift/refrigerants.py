"""The refrigerant catalogue: designations, composition, safety class, GWP, flammability.

The data live in ``heatlift/data/refrigerants.json``, every value beside its source; this module
loads them once and answers look-ups by ISO 817 / ASHRAE 34 designation (case-insensitive, a few
common spellings tolerated), with close matches on a miss.
"""

from __future__ import annotations

import difflib
import json
import re
from dataclasses import dataclass
from functools import cache
from importlib import resources
from types import MappingProxyType
from typing import Any

from heatlift.errors import UnknownRefrigerant

KINDS = ("pure", "azeotrope", "zeotrope")
SAFETY_CLASSES = ("A1", "A2L", "A2", "A3", "B1", "B2L", "B2", "B3")
GWP_BASES = ("AR4", "AR5", "AR6")


@dataclass(frozen=True)
class Refrigerant:
    """One catalogue entry. Concentrations [kg/m^3]; composition by mass fraction [1]."""

    designation: str
    kind: str
    composition: MappingProxyType[str, float]
    safety_class: str
    gwp100: MappingProxyType[str, float | None]
    lower_flammability_limit: float | None
    practical_limit: float | None
    atel_odl: float | None
    coolprop_fluids: tuple[str, ...]
    sources: MappingProxyType[str, str]

    @property
    def is_blend(self) -> bool:
        return self.kind != "pure"

    @property
    def is_flammable(self) -> bool:
        return self.safety_class[1:] in ("2L", "2", "3")


def _key(designation: str) -> str:
    """Normalised look-up key: case-folded, without blanks, dashes and a leading 'R-'."""
    text = re.sub(r"[\s\-_]", "", designation.strip().lower())
    return text


def _entry(raw: dict[str, Any]) -> Refrigerant:
    sources = {k[: -len("_source")]: v for k, v in raw.items() if k.endswith("_source")}
    gwp = {basis: raw["gwp100"].get(basis) for basis in GWP_BASES}
    return Refrigerant(
        designation=raw["designation"],
        kind=raw["kind"],
        composition=MappingProxyType(dict(raw["composition"])),
        safety_class=raw["safety_class"],
        gwp100=MappingProxyType(gwp),
        lower_flammability_limit=raw.get("lower_flammability_limit"),
        practical_limit=raw.get("practical_limit"),
        atel_odl=raw.get("atel_odl"),
        # CoolProp's pseudo-pure models of the older blends are as accurate at saturation and
        # as fast as a pure fluid; the newer blends are mixtures of their components
        coolprop_fluids=(
            (raw["coolprop"]["pseudo_pure"],)
            if raw["coolprop"].get("pseudo_pure")
            else tuple(raw["coolprop"]["fluids"])
        ),
        sources=MappingProxyType(sources),
    )


@cache
def catalogue() -> dict[str, Refrigerant]:
    """All entries by canonical designation, in catalogue order (loaded once)."""
    text = resources.files("heatlift").joinpath("data/refrigerants.json").read_text("utf-8")
    entries = [_entry(raw) for raw in json.loads(text)["refrigerants"]]
    return {r.designation: r for r in entries}


@cache
def _index() -> dict[str, str]:
    index = {_key(name): name for name in catalogue()}
    # "R-134a" and "r134A" are handled by _key; these are other names engineers type
    aliases = {"co2": "R744", "nh3": "R717", "ammonia": "R717", "water": "R718",
               "propane": "R290", "isobutane": "R600a", "propylene": "R1270",
               "propene": "R1270", "r1234ze": "R1234ze(E)", "r1233zd": "R1233zd(E)"}
    for alias, name in aliases.items():
        if name in catalogue():
            index.setdefault(alias, name)
    return index


def lookup(designation: str) -> Refrigerant:
    """The entry for ``designation``; raises :class:`UnknownRefrigerant` with close matches."""
    key = _key(designation)
    if key.startswith("r-"):
        key = "r" + key[2:]
    name = _index().get(key)
    if name is None:
        keys = difflib.get_close_matches(key, list(_index()), n=4, cutoff=0.6)
        suggestions = list(dict.fromkeys(_index()[k] for k in keys))
        raise UnknownRefrigerant(designation[:60], suggestions)
    return catalogue()[name]
