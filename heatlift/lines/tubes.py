"""Tube and pipe catalogues: ASTM B280 and EN 12735-1 copper tube, ASME B36.10 steel pipe.

The dimensions live in ``heatlift/data/tubes_*.json`` and the materials (roughness, allowable
stress, which refrigerants may use them) in ``heatlift/data/tubes_materials.json``, every value
beside its source. All lengths in metres, stresses in Pa, temperatures in K.

``inside_diameter = outside_diameter - 2 * wall_thickness`` [m].
"""

from __future__ import annotations

import json
import re
from dataclasses import dataclass
from functools import cache
from importlib import resources

from heatlift.errors import InvalidInput

STANDARDS = ("ASTM B280", "EN 12735-1", "ASME B36.10")
SCHEDULES = ("40", "80")
_FILES = {
    "ASTM B280": "tubes_astm_b280.json",
    "EN 12735-1": "tubes_en_12735_1.json",
    "ASME B36.10": "tubes_asme_b36_10.json",
}


@dataclass(frozen=True)
class StressPoint:
    """Allowable stress [Pa] at a metal temperature [K]."""

    temperature: float
    allowable_stress: float


@dataclass(frozen=True)
class Material:
    """A tube material: wall roughness [m], allowable stress by temper, the refrigerants it
    must not carry (designation -> why)."""

    key: str
    name: str
    roughness: float
    roughness_source: str
    wall_tolerance: float
    joint_efficiency: float
    allowable_stress: dict[str, tuple[StressPoint, ...]]
    allowable_stress_source: str
    minimum_temperature: float | None
    excluded_refrigerants: dict[str, str]

    @property
    def is_copper(self) -> bool:
        return self.key.startswith("copper")

    def stress_at(self, temper: str, temperature: float) -> float:
        """Allowable stress [Pa] at metal ``temperature`` [K], linear between table points; the
        first value holds below the table, the last above it (the caller is warned)."""
        points = self.allowable_stress.get(temper) or next(iter(self.allowable_stress.values()))
        if temperature <= points[0].temperature:
            return points[0].allowable_stress
        for low, high in zip(points, points[1:], strict=False):
            if temperature <= high.temperature:
                share = (temperature - low.temperature) / (high.temperature - low.temperature)
                return low.allowable_stress + share * (high.allowable_stress - low.allowable_stress)
        return points[-1].allowable_stress

    def highest_tabulated_temperature(self, temper: str) -> float:
        points = self.allowable_stress.get(temper) or next(iter(self.allowable_stress.values()))
        return points[-1].temperature


@dataclass(frozen=True)
class Tube:
    """One catalogue size [m]. ``nominal_size`` is the label the standard's table uses."""

    standard: str
    nominal_size: str
    outside_diameter: float
    wall_thickness: float
    temper: str | None
    schedule: str | None
    material: Material

    @property
    def inside_diameter(self) -> float:
        return self.outside_diameter - 2.0 * self.wall_thickness

    @property
    def flow_area(self) -> float:
        """Inside cross-section [m^2]: pi D^2 / 4."""
        return 0.785398163397448 * self.inside_diameter**2

    @property
    def roughness(self) -> float:
        return self.material.roughness


@dataclass(frozen=True)
class Catalogue:
    standard: str
    title: str
    dimensions_source: str
    material: Material
    tubes: tuple[Tube, ...]


def _read(name: str) -> dict:
    return json.loads(resources.files("heatlift").joinpath(f"data/{name}").read_text("utf-8"))


@cache
def materials() -> dict[str, Material]:
    out = {}
    for key, raw in _read("tubes_materials.json")["materials"].items():
        stresses = {
            temper: tuple(StressPoint(p["temperature"], p["allowable_stress"]) for p in pts)
            for temper, pts in raw["allowable_stress"].items()
        }
        out[key] = Material(
            key=key, name=raw["name"], roughness=raw["roughness"],
            roughness_source=raw["roughness_source"], wall_tolerance=raw["wall_tolerance"],
            joint_efficiency=raw["joint_efficiency"], allowable_stress=stresses,
            allowable_stress_source=raw["allowable_stress_source"],
            minimum_temperature=raw.get("minimum_temperature"),
            excluded_refrigerants=dict(raw["excluded_refrigerants"]),
        )
    return out


@cache
def catalogue(standard: str) -> Catalogue:
    """The catalogue of ``standard`` (one of :data:`STANDARDS`), sizes in ascending order."""
    raw = _read(_FILES[standard])
    material = materials()[raw["material"]]
    tubes = tuple(
        Tube(standard, t["nominal_size"], t["outside_diameter"], t["wall_thickness"],
             t.get("temper"), t.get("schedule"), material)
        for t in raw["tubes"]
    )
    tubes = tuple(sorted(tubes, key=lambda t: (t.schedule or "", t.outside_diameter,
                                                t.wall_thickness)))
    return Catalogue(standard, raw["title"], raw["dimensions_source"], material, tubes)


def normalise_standard(text: str) -> str:
    """``"astm-b280"`` -> ``"ASTM B280"``; raises :class:`InvalidInput` for an unknown one."""
    key = re.sub(r"[\s\-_.]", "", text).upper()
    for standard in STANDARDS:
        if re.sub(r"[\s\-_.]", "", standard).upper() == key:
            return standard
    raise InvalidInput(f"standard must be one of {', '.join(STANDARDS)}", field="standard")


def sizes(standard: str, schedule: str | None = None) -> tuple[Tube, ...]:
    """The tubes of ``standard``; for ASME B36.10 those of ``schedule`` (default 40)."""
    tubes = catalogue(standard).tubes
    if standard == "ASME B36.10":
        schedule = schedule or "40"
        if schedule not in SCHEDULES:
            raise InvalidInput(
                f"schedule must be one of {', '.join(SCHEDULES)} for ASME B36.10",
                field="schedule",
            )
        tubes = tuple(t for t in tubes if t.schedule == schedule)
    return tubes


def _label_key(text: str) -> str:
    text = text.strip().lower().replace('"', "").replace("in", "").replace("mm", "")
    text = re.sub(r"\s*x\s*", "x", text)
    text = re.sub(r"\s*(sch|schedule)\s*", "sch", text)
    text = re.sub(r"\s+", "-", text.strip())
    # "22x1" means "22 x 1.0"
    return re.sub(r"(\d+(?:\.\d+)?)x(\d+(?:\.\d+)?)",
                  lambda m: f"{float(m.group(1)):g}x{float(m.group(2)):.1f}", text)


def find(standard: str, label: str, schedule: str | None = None) -> Tube:
    """The tube labelled ``label`` ("3/4", "1-1/8", "22 x 1.0", "2 sch 40") in ``standard``.

    For ASME B36.10 a bare NPS ("2") takes ``schedule`` (default 40).
    """
    key = _label_key(label)
    pool = catalogue(standard).tubes
    if standard == "ASME B36.10" and "sch" not in key:
        key = f"{key}sch{schedule or '40'}"
    for tube in pool:
        if _label_key(tube.nominal_size) == key:
            return tube
    listed = ", ".join(f'"{t.nominal_size}"' for t in pool)
    raise InvalidInput(
        f"'{label[:40]}' is not a size of {standard}; its sizes are {listed}".replace(
            "{", "{{").replace("}", "}}"),
        field="size",
    )


def standard_of_label(label: str) -> str | None:
    """The standard a label's form points to: "22 x 1.0" is metric, "2 sch 40" steel."""
    key = _label_key(label)
    if "sch" in key:
        return "ASME B36.10"
    if "x" in key:
        return "EN 12735-1"
    return None


def check_material(refrigerant: str, material: Material, standard: str) -> None:
    """InvalidInput (422) when ``refrigerant`` must not run in ``material``, saying why."""
    reason = material.excluded_refrigerants.get(refrigerant)
    if reason:
        raise InvalidInput(
            f"{refrigerant} must not run in {standard} tube ({material.name}): {reason}",
            field="standard",
        )


def default_standard(refrigerant: str) -> str:
    """Copper inch tube, or steel pipe where copper is excluded (ammonia)."""
    copper = catalogue("ASTM B280").material
    return "ASME B36.10" if refrigerant in copper.excluded_refrigerants else "ASTM B280"


@dataclass(frozen=True)
class TubeRow:
    """One catalogue row as listed by GET /v1/lines/tubes [m]."""

    standard: str
    nominal_size: str
    schedule: str | None
    outside_diameter: float
    wall_thickness: float
    inside_diameter: float
    temper: str | None
    material: Material
    roughness: float
    dimensions_source: str


@dataclass(frozen=True)
class TubeListing:
    tubes: tuple[TubeRow, ...]


def listing(standard: str | None = None, schedule: str | None = None) -> TubeListing:
    """The rows of one catalogue (``standard``) or of all; ``schedule`` narrows ASME B36.10."""
    chosen = (normalise_standard(standard),) if standard else STANDARDS
    if schedule is not None and chosen != ("ASME B36.10",):
        if standard:
            raise InvalidInput("schedule applies to ASME B36.10 only", field="schedule")
        chosen = ("ASME B36.10",)
    rows: list[TubeRow] = []
    for name in chosen:
        cat = catalogue(name)
        pool = sizes(name, schedule) if schedule else cat.tubes
        rows.extend(TubeRow(t.standard, t.nominal_size, t.schedule, t.outside_diameter,
                            t.wall_thickness, t.inside_diameter, t.temper, t.material,
                            t.roughness, cat.dimensions_source) for t in pool)
    return TubeListing(tuple(rows))
