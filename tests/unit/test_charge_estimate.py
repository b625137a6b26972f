"""The charge estimate: parts, shares, errors, and the monotonic properties."""

import math
from dataclasses import replace

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from heatlift.charge import (
    ChargeSpec,
    HeatExchangerSpec,
    LineSpec,
    SpaceSpec,
    VesselSpec,
    estimate,
)
from heatlift.cycle import CycleSpec, GasCoolerSpec, SaturationSpec
from heatlift.errors import InvalidInput, OutOfRange
from heatlift.lines import tubes

C = 273.15


def cycle(refrigerant="R134a", subcooling=3.0, **kw):
    return CycleSpec(refrigerant=refrigerant, evaporating=SaturationSpec(-6.0 + C),
                     condensing=SaturationSpec(40.0 + C), superheat=5.0,
                     subcooling=subcooling, **kw)


def system(refrigerant="R134a", subcooling=3.0, liquid_length=20.0, model="zivi", **kw):
    return ChargeSpec(
        cycle=cycle(refrigerant, subcooling, cooling_capacity=18e3),
        lines=(LineSpec("suction", 25.0, inside_diameter=0.032),
               LineSpec("discharge", 12.0, inside_diameter=0.020),
               LineSpec("liquid", liquid_length, inside_diameter=0.0138)),
        heat_exchangers=(
            HeatExchangerSpec("evaporator", 9e-3, model, tube_inside_diameter=0.0092, circuits=8),
            HeatExchangerSpec("condenser", 6e-3, model, tube_inside_diameter=0.0072, circuits=6)),
        receivers=(VesselSpec(10e-3, 0.2),),
        **kw,
    )


def test_parts_add_up_to_the_total():
    result = estimate(system())
    assert result.total_charge == pytest.approx(sum(c.mass for c in result.components))
    assert sum(c.share for c in result.components) == pytest.approx(1.0)
    assert [c.name for c in result.components] == [
        "suction line", "discharge line", "liquid line", "evaporator", "condenser", "receiver"]
    for part in result.components:
        if part.zones:
            assert sum(z.mass for z in part.zones) == pytest.approx(part.mass, rel=1e-12)
            assert sum(z.volume for z in part.zones) == pytest.approx(part.internal_volume)


def test_line_density_is_that_of_the_line_state():
    result = estimate(system())
    liquid = next(c for c in result.components if c.role == "liquid")
    state = result.operating_point.cycle.point("condenser_outlet").state
    assert liquid.mean_density == pytest.approx(state.density, rel=1e-12)
    assert liquid.mass == pytest.approx(math.pi / 4 * 0.0138**2 * 20.0 * state.density)
    suction = next(c for c in result.components if c.role == "suction")
    assert suction.mean_density < 30.0 < 900.0 < liquid.mean_density


def test_receiver_is_liquid_plus_vapour_at_the_high_side():
    result = estimate(system())
    receiver = next(c for c in result.components if c.kind == "receiver")
    from heatlift.properties import model

    m = model("R134a")
    p = result.operating_point.cycle.point("condenser_outlet").state.pressure
    rho_l = m.saturated_at_pressure(p, 0.0).density
    rho_g = m.saturated_at_pressure(p, 1.0).density
    assert receiver.mass == pytest.approx(10e-3 * (0.2 * rho_l + 0.8 * rho_g), rel=1e-9)


def test_accumulator_sits_at_the_suction_pressure():
    spec = replace(system(), accumulators=(VesselSpec(5e-3, 0.1, name="suction accumulator"),))
    part = estimate(spec).components[-1]
    assert part.name == "suction accumulator"
    assert part.pressure == pytest.approx(
        estimate(spec).operating_point.cycle.point("evaporator_outlet").state.pressure)


def test_sized_lines_take_the_catalogue_inside_diameter():
    spec = replace(system(), lines=(LineSpec("liquid", 20.0, size="5/8", standard="ASTM B280"),
                                    LineSpec("liquid", 5.0, size="16 x 1.0")))
    parts = estimate(spec).components
    assert parts[0].inside_diameter == pytest.approx(
        tubes.find("ASTM B280", "5/8").inside_diameter)
    assert parts[1].standard == "EN 12735-1" and parts[1].inside_diameter == pytest.approx(0.014)
    assert [parts[0].name, parts[1].name] == ["liquid line 1", "liquid line 2"]
    with pytest.raises(InvalidInput) as err:
        estimate(replace(spec, lines=(LineSpec("liquid", 1.0, size="9/7"),)))
    assert err.value.field == "lines.0.size"


def test_a_cycle_without_size_serves_the_models_that_need_no_mass_flux():
    spec = replace(system(), cycle=cycle())
    result = estimate(spec)
    assert not result.operating_point.mass_flow_known
    assert result.operating_point.mass_flow is None
    sized = estimate(system())
    assert result.total_charge == pytest.approx(sized.total_charge, rel=1e-9)
    with pytest.raises(InvalidInput, match="mass flux") as err:
        estimate(replace(system(model="rouhani_axelsson"), cycle=cycle()))
    assert err.value.field == "cooling_capacity"


def test_drift_flux_models_need_the_tube_diameter():
    spec = replace(system(), heat_exchangers=(HeatExchangerSpec("evaporator", 9e-3, "steiner"),))
    with pytest.raises(InvalidInput, match="tube_inside_diameter") as err:
        estimate(spec)
    assert err.value.field == "heat_exchangers.0.tube_inside_diameter"


def test_mass_flux_counts_the_circuits():
    result = estimate(system(model="steiner"))
    evaporator = next(c for c in result.components if c.role == "evaporator")
    flow = result.operating_point.cycle.performance.mass_flow
    assert evaporator.mass_flux == pytest.approx(flow / (8 * math.pi / 4 * 0.0092**2))


def test_transcritical_gas_cooler_and_receiver_pressure():
    co2 = CycleSpec(refrigerant="R744", circuit="transcritical",
                    evaporating=SaturationSpec(-8.0 + C), gas_cooler=GasCoolerSpec(35.0 + C),
                    cooling_capacity=10e3)
    spec = ChargeSpec(cycle=co2, heat_exchangers=(HeatExchangerSpec("gas_cooler", 3e-3),
                                                  HeatExchangerSpec("evaporator", 4e-3)),
                      lines=(LineSpec("liquid", 10.0, inside_diameter=0.008),))
    result = estimate(spec)
    cooler = result.components[1]
    assert [z.name for z in cooler.zones] == ["supercritical"]
    with pytest.raises(InvalidInput, match="gas_cooler"):
        estimate(replace(spec, heat_exchangers=(HeatExchangerSpec("condenser", 3e-3),)))
    with pytest.raises(InvalidInput, match="pressure") as err:
        estimate(replace(spec, receivers=(VesselSpec(20e-3, 0.3),)))
    assert err.value.field == "receivers.0.pressure"
    flash = estimate(replace(spec, receivers=(VesselSpec(20e-3, 0.3, pressure=3.5e6),)))
    assert flash.components[-1].mass > 0
    with pytest.raises(OutOfRange):
        estimate(replace(spec, receivers=(VesselSpec(20e-3, 0.3, pressure=8e6),)))


def test_nothing_to_estimate_is_refused():
    with pytest.raises(InvalidInput, match="at least one part"):
        estimate(ChargeSpec(cycle=cycle(cooling_capacity=1e3)))


def test_unknown_gwp_gives_a_remark_not_an_error():
    result = estimate(system("R290", gwp_basis="AR5"))
    assert result.co2_equivalent is None
    assert [r.code for r in result.remarks if r.code == "no_gwp"] == ["no_gwp"]


def test_co2_equivalent_is_charge_times_gwp():
    result = estimate(system("R410A", gwp_basis="AR4"))
    assert result.gwp == 2088
    assert result.co2_equivalent == pytest.approx(result.total_charge * 2088)


@pytest.mark.parametrize("name", ["homogeneous", "zivi", "rouhani_axelsson", "steiner"])
def test_every_model_runs_on_a_blend(name):
    result = estimate(system("R454B", model=name))
    assert 3.0 < result.total_charge < 20.0


def test_homogeneous_gives_the_smallest_two_phase_charge():
    by_model = {}
    for name in ("homogeneous", "zivi", "rouhani_axelsson", "steiner"):
        parts = estimate(system(model=name)).components
        by_model[name] = [c.mass for c in parts if c.kind == "heat_exchanger"]
    for name, masses in by_model.items():
        for mass, least in zip(masses, by_model["homogeneous"], strict=True):
            assert least <= mass * (1 + 1e-12), name


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.floats(min_value=0.0, max_value=12.0), st.floats(min_value=0.2, max_value=8.0))
def test_more_subcooling_never_lowers_the_charge(subcooling, more):
    low = estimate(system(subcooling=subcooling)).total_charge
    high = estimate(system(subcooling=subcooling + more)).total_charge
    assert high >= low


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.floats(min_value=0.5, max_value=60.0), st.floats(min_value=0.1, max_value=30.0))
def test_a_longer_liquid_line_never_lowers_the_charge(length, more):
    low = estimate(system(liquid_length=length)).total_charge
    high = estimate(system(liquid_length=length + more)).total_charge
    assert high > low


def test_space_gives_the_charge_limit():
    result = estimate(system("R290", space=SpaceSpec(15.0, room_height=2.5,
                                                     installation_height=0.6)))
    limit = result.charge_limit
    assert limit is not None and limit.within_limit is False
    assert "above_charge_limit" in [r.code for r in result.remarks]
    assert "licensed practitioner" in result.caution and "ignition" in result.caution
