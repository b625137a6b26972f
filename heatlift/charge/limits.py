"""The refrigerant charge a room allows, after ISO 5149-1 / EN 378-1 and IEC 60335-2-40.

Two rules, the smaller governs:

- **practical limit** (toxicity and, for flammable refrigerants, 20 % of the LFL, whichever
  the standard's table gives): ``m = PL V`` with ``PL`` [kg/m^3] from the catalogue
  (``practical_limit``; where the catalogue holds none, the ATEL/ODL) and ``V`` the room volume
  [m^3] (ISO 5149-1 / EN 378-1, occupancy category a);
- **flammability** (A2L, A2, A3): ``m_max = 2.5 LFL^(5/4) h0 A^(1/2)`` [kg] with the lower
  flammability limit ``LFL`` [kg/m^3], the installation height ``h0`` [m] and the floor area
  ``A`` [m^2] (ISO 5149-1 / IEC 60335-2-40; the factor 2.5 carries the unit
  kg^(-1/4) m^(7/4) that balances the form, which is the standard's as written). A charge at or
  below ``m1 = 4 m^3 x LFL`` is not limited by the room size under this rule, so the rule
  allows ``max(m_max, m1)``.

The reference charges ``m1 = 4 m^3 LFL``, ``m2 = 26 m^3 LFL``, ``m3 = 130 m^3 LFL`` and the
installation heights of :data:`INSTALLATION_HEIGHTS` are recalled from ISO 5149-1 / IEC
60335-2-40 (from memory, not checked against the standards' text).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from heatlift.charge.spec import OCCUPANCIES, SpaceSpec
from heatlift.errors import InvalidInput, Remark, SIValue
from heatlift.refrigerants import Refrigerant

# h0 [m] by the position of the indoor unit: IEC 60335-2-40 Annex GG, from memory
INSTALLATION_HEIGHTS = {"floor": 0.6, "window": 1.0, "wall": 1.8, "ceiling": 2.2}
M1_VOLUME, M2_VOLUME, M3_VOLUME = 4.0, 26.0, 130.0  # [m^3], times LFL: m1, m2, m3, from memory

PRACTICAL_BASIS = "ISO 5149-1 / EN 378-1 practical limit x room volume"
ATEL_BASIS = "ISO 5149-1 / EN 378-1 ATEL/ODL x room volume"
FLAMMABLE_BASIS = "ISO 5149-1 / IEC 60335-2-40 m_max = 2.5 LFL^(5/4) h0 A^(1/2)"
M1_BASIS = "ISO 5149-1 / IEC 60335-2-40 m1 = 4 m^3 x LFL (charge not limited by room size)"


@dataclass(frozen=True)
class LimitRule:
    """One rule's allowed charge [kg] and its basis; ``concentration`` [kg/m^3] is the limit
    it rests on (the practical limit, ATEL/ODL or LFL)."""

    basis: str
    allowed_charge: float
    concentration: float


@dataclass(frozen=True)
class ChargeLimit:
    """The allowed charge for the room [kg] and whether the charge stays within it.

    ``allowed_charge`` is None when the catalogue holds no limit for the refrigerant (then
    ``within_limit`` is None too). ``rules`` lists each rule applied; ``basis`` names the one
    that governs. ``m1``, ``m2``, ``m3`` [kg] are the flammability rule's reference charges.
    """

    allowed_charge: float | None
    basis: str
    within_limit: bool | None
    charge: float
    room_volume: float
    floor_area: float
    installation_height: float | None
    occupancy: str
    rules: tuple[LimitRule, ...]
    m1: float | None = None
    m2: float | None = None
    m3: float | None = None


def flammability_charge(lfl: float, installation_height: float, floor_area: float) -> float:
    """``m_max = 2.5 LFL^(5/4) h0 A^(1/2)`` [kg] (ISO 5149-1 / IEC 60335-2-40).

    :param lfl: lower flammability limit [kg/m^3]
    :param installation_height: h0, height of the refrigerant-containing part [m]
    :param floor_area: A, floor area of the room [m^2]
    """
    return 2.5 * lfl**1.25 * installation_height * math.sqrt(floor_area)


def room_volume(space: SpaceSpec) -> float:
    """The room volume [m^3]: given, or floor area times room height."""
    if space.volume is not None:
        return space.volume
    if space.room_height is not None:
        return space.floor_area * space.room_height
    raise InvalidInput("give the room's volume or its room_height", field="space.room_height")


def charge_limit(refrigerant: Refrigerant, charge: float, space: SpaceSpec
                 ) -> tuple[ChargeLimit, tuple[Remark, ...]]:
    """The allowed charge [kg] for ``space`` and the charge [kg] against it, with remarks."""
    if space.occupancy not in OCCUPANCIES:
        raise InvalidInput("occupancy must be a (general), b (supervised) or c (authorised "
                           "persons only)", field="space.occupancy")
    volume = room_volume(space)
    h0 = space.installation_height
    if space.room_height is not None and h0 is not None and h0 > space.room_height:
        raise InvalidInput("the installation height {h0} is above the room height {h}",
                           {"h0": SIValue(h0, "length"), "h": SIValue(space.room_height, "length")},
                           field="space.installation_height")
    remarks: list[Remark] = []
    rules: list[LimitRule] = []
    name = refrigerant.designation
    if refrigerant.practical_limit is not None:
        pl = refrigerant.practical_limit
        rules.append(LimitRule(PRACTICAL_BASIS, pl * volume, pl))
    elif refrigerant.atel_odl is not None:
        pl = refrigerant.atel_odl
        rules.append(LimitRule(ATEL_BASIS, pl * volume, pl))
    else:
        remarks.append(Remark(
            "no_practical_limit",
            f"the catalogue holds no practical limit and no ATEL/ODL for {name}; "
            + ("only the flammability rule was applied" if refrigerant.is_flammable
               else "no charge limit could be computed"),
        ))
    m1 = m2 = m3 = None
    lfl = refrigerant.lower_flammability_limit
    if refrigerant.is_flammable:
        if lfl is None:
            raise InvalidInput(f"the catalogue holds no lower flammability limit for {name}")
        if h0 is None:
            raise InvalidInput(
                f"{name} is flammable ({refrigerant.safety_class}): give the "
                "installation_height of the indoor part (a height, or floor, window, wall, "
                "ceiling)", field="space.installation_height")
        m1, m2, m3 = M1_VOLUME * lfl, M2_VOLUME * lfl, M3_VOLUME * lfl
        m_max = flammability_charge(lfl, h0, space.floor_area)
        if m_max < m1:
            rules.append(LimitRule(M1_BASIS, m1, lfl))
        else:
            rules.append(LimitRule(FLAMMABLE_BASIS, m_max, lfl))
        if charge > m3:
            remarks.append(Remark(
                "above_m3",
                "the charge {m} is above m3 = 130 m^3 x LFL = {m3}; ISO 5149-1 / EN 378-1 set "
                "other requirements (e.g. a machinery room) above it",
                {"m": SIValue(charge, "mass"), "m3": SIValue(m3, "mass")},
            ))
    if space.occupancy != "a":
        remarks.append(Remark(
            "occupancy_category",
            f"the limits are those of access category a (general occupancy), the strictest; "
            f"category {space.occupancy} may allow more, depending on the location of the "
            "system (ISO 5149-1 / EN 378-1)",
        ))
    if rules:
        governing = min(rules, key=lambda r: r.allowed_charge)
        allowed: float | None = governing.allowed_charge
        basis = governing.basis
        within: bool | None = charge <= governing.allowed_charge
    else:
        allowed, basis, within = None, f"no limit for {name} in the catalogue", None
    limit = ChargeLimit(allowed, basis, within, charge, volume, space.floor_area, h0,
                        space.occupancy, tuple(rules), m1, m2, m3)
    return limit, tuple(remarks)
