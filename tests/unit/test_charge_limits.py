"""Charge limit of the room, CO2-equivalent and leak-check information."""

import math

import pytest

from heatlift.charge.co2e import THRESHOLDS, co2_equivalent, is_fluorinated, leak_checks
from heatlift.charge.limits import (
    ATEL_BASIS,
    FLAMMABLE_BASIS,
    M1_BASIS,
    PRACTICAL_BASIS,
    charge_limit,
    flammability_charge,
    room_volume,
)
from heatlift.charge.spec import SpaceSpec
from heatlift.errors import InvalidInput
from heatlift.refrigerants import lookup


def test_non_flammable_takes_the_practical_limit_times_the_volume():
    r134a = lookup("R134a")
    limit, remarks = charge_limit(r134a, 10.0, SpaceSpec(50.0, room_height=3.0))
    assert limit.allowed_charge == pytest.approx(r134a.practical_limit * 150.0)
    assert limit.basis == PRACTICAL_BASIS and limit.within_limit is True
    assert remarks == ()


def test_atel_stands_in_where_no_practical_limit_is_held():
    from dataclasses import replace

    entry = replace(lookup("R134a"), practical_limit=None)
    limit, _ = charge_limit(entry, 10.0, SpaceSpec(50.0, volume=100.0))
    assert limit.basis == ATEL_BASIS
    assert limit.allowed_charge == pytest.approx(entry.atel_odl * 100.0)


def test_flammable_takes_the_smaller_of_both_rules():
    r32 = lookup("R32")
    space = SpaceSpec(30.0, room_height=2.5, installation_height=1.8)
    limit, _ = charge_limit(r32, 2.0, space)
    formula = 2.5 * 0.307**1.25 * 1.8 * math.sqrt(30.0)
    volume_rule = r32.practical_limit * 75.0
    assert limit.allowed_charge == pytest.approx(min(formula, volume_rule))
    assert {r.basis for r in limit.rules} == {PRACTICAL_BASIS, FLAMMABLE_BASIS}
    assert limit.m1 == pytest.approx(4 * 0.307) and limit.m3 == pytest.approx(130 * 0.307)


def test_below_m1_the_room_size_does_not_limit_the_flammability_rule():
    r290 = lookup("R290")
    limit, _ = charge_limit(r290, 0.1, SpaceSpec(4.0, room_height=2.5, installation_height=0.6))
    rule = next(r for r in limit.rules if r.concentration == r290.lower_flammability_limit)
    assert rule.basis == M1_BASIS
    assert rule.allowed_charge == pytest.approx(4.0 * 0.038)
    assert flammability_charge(0.038, 0.6, 4.0) < rule.allowed_charge


def test_flammable_needs_the_installation_height():
    with pytest.raises(InvalidInput, match="installation_height") as err:
        charge_limit(lookup("R454B"), 5.0, SpaceSpec(30.0, room_height=3.0))
    assert err.value.field == "space.installation_height"


def test_installation_height_above_the_room_is_refused():
    with pytest.raises(InvalidInput, match="above the room height"):
        charge_limit(lookup("R32"), 1.0, SpaceSpec(30.0, room_height=2.0, installation_height=2.2))


def test_no_limit_in_the_catalogue():
    limit, remarks = charge_limit(lookup("R407A"), 5.0, SpaceSpec(30.0, room_height=3.0))
    assert limit.allowed_charge is None and limit.within_limit is None
    assert remarks[0].code == "no_practical_limit"


def test_other_occupancy_categories_are_remarked():
    _, remarks = charge_limit(lookup("R134a"), 5.0, SpaceSpec(30.0, room_height=3.0,
                                                              occupancy="c"))
    assert [r.code for r in remarks] == ["occupancy_category"]


def test_room_volume_needs_a_height_or_volume():
    assert room_volume(SpaceSpec(10.0, room_height=3.0)) == 30.0
    with pytest.raises(InvalidInput):
        room_volume(SpaceSpec(10.0))


def test_co2_equivalent_and_thresholds():
    r410a = lookup("R410A")
    assert co2_equivalent(3.0, r410a, "AR4") == pytest.approx(3.0 * 2088)
    assert leak_checks(co2_equivalent(2.0, r410a, "AR4"), r410a).reached is None
    assert leak_checks(co2_equivalent(3.0, r410a, "AR4"), r410a).reached == THRESHOLDS[0]
    assert leak_checks(60_000.0, r410a).reached == THRESHOLDS[1]
    assert leak_checks(600_000.0, r410a).reached.leak_detection_required


def test_natural_refrigerants_are_not_f_gases():
    for name in ("R290", "R744", "R717", "R600a"):
        assert not is_fluorinated(lookup(name))
        assert leak_checks(1e9, lookup(name)).reached is None
    for name in ("R454B", "R32", "R1234yf", "R407C"):
        assert is_fluorinated(lookup(name))
