"""The cycle engine: energy balances, circuits, sizing, remarks and errors."""

from dataclasses import replace

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from heatlift.cycle import (
    CompressorSpec,
    CycleSpec,
    GasCoolerSpec,
    PressureDrop,
    PressureDrops,
    SaturationSpec,
    solve,
)
from heatlift.errors import InvalidInput, OutOfRange

C = 273.15


def spec(refrigerant="R134a", te=-10.0, tc=40.0, **kw):
    base = dict(
        refrigerant=refrigerant,
        evaporating=SaturationSpec(temperature=te + C),
        condensing=SaturationSpec(temperature=tc + C),
        superheat=5.0,
        subcooling=3.0,
        compressor=CompressorSpec(isentropic_efficiency=0.7),
        cooling_capacity=10e3,
    )
    base.update(kw)
    return CycleSpec(**base)


CIRCUIT_CASES = {
    "single_stage": spec(),
    "single_stage_blend": spec("R454B"),
    "single_stage_ihx": spec(internal_heat_exchanger_effectiveness=0.6),
    "economized_subcooler": spec("R404A", te=-35, circuit="economized"),
    "economized_flash": spec("R404A", te=-35, circuit="economized", economizer="flash"),
    "two_stage": spec("R717", te=-35, circuit="two_stage"),
    "transcritical": spec("R744", te=-5, condensing=None, circuit="transcritical",
                          gas_cooler=GasCoolerSpec(35 + C, 9e6), subcooling=0.0),
    "transcritical_flash_tank": spec("R744", te=-5, condensing=None, circuit="transcritical",
                                     gas_cooler=GasCoolerSpec(35 + C, 9e6),
                                     flash_tank_pressure=4.0e6),
}


def test_every_figure_of_merit_is_what_its_name_says():
    # the sized result is built positionally on the hot path: each figure against its
    # definition from the states, so that no two can trade places unnoticed
    r = solve(spec())
    p = r.performance
    h = {pt.label: pt.state.enthalpy for pt in r.states}
    suction = r.point("compressor_suction").state
    discharge = r.point("compressor_discharge").state
    flow = p.mass_flow
    assert flow == pytest.approx(10e3 / (h["evaporator_outlet"] - h["evaporator_inlet"]))
    assert p.cooling_capacity == pytest.approx(10e3)
    assert p.compressor_power == pytest.approx(flow * (h["compressor_discharge"]
                                                        - h["compressor_suction"]))
    assert p.heating_capacity == pytest.approx(flow * (h["condenser_inlet"]
                                                        - h["condenser_outlet"]))
    assert p.heat_rejected == pytest.approx(p.heating_capacity)  # no line or shell losses
    assert p.cop == pytest.approx(p.cooling_capacity / p.compressor_power)
    assert p.cop_heating == pytest.approx(p.heating_capacity / p.compressor_power)
    assert p.suction_volume_flow == pytest.approx(flow / suction.density)
    assert p.volumetric_capacity == pytest.approx(p.cooling_capacity / p.suction_volume_flow)
    assert p.pressure_ratio == pytest.approx(discharge.pressure / suction.pressure)
    assert p.discharge_temperature == discharge.temperature
    t_e = r.point("evaporator_outlet").state.temperature - 5.0  # superheat 5 K
    t_c = r.point("condenser_outlet").state.temperature + 3.0  # subcooling 3 K
    assert p.cop_carnot == pytest.approx(t_e / (t_c - t_e), rel=1e-6)
    assert p.second_law_efficiency == pytest.approx(p.cop / p.cop_carnot)
    assert p.isentropic_efficiency == 0.7
    assert p.intermediate_pressure is None
    assert (p.high_side_pressure, p.low_side_pressure) == (discharge.pressure, suction.pressure)
    assert abs(p.energy_balance_residual) < 1e-9


@pytest.mark.parametrize("name", list(CIRCUIT_CASES))
def test_energy_balance_closes_for_every_circuit(name):
    # adiabatic compressor, no line heat exchange: heat rejected = cooling + power
    r = solve(CIRCUIT_CASES[name])
    p = r.performance
    assert p.heat_rejected == pytest.approx(p.cooling_capacity + p.compressor_power, rel=1e-6)
    assert abs(p.energy_balance_residual) < 1e-6
    assert p.cooling_capacity == pytest.approx(10e3, rel=1e-9)
    assert 0.0 < p.second_law_efficiency < 1.0


def test_states_in_flow_order_single_stage():
    labels = [pt.label for pt in solve(spec()).states]
    assert labels == ["evaporator_outlet", "compressor_suction", "compressor_discharge",
                      "condenser_inlet", "condenser_outlet", "expansion_valve_inlet",
                      "evaporator_inlet"]


def test_superheat_and_subcooling_are_where_asked():
    r = solve(spec("R454B"))
    out = r.point("evaporator_outlet").state
    from heatlift.properties import model

    m = model("R454B")
    assert out.temperature - m.saturated_at_pressure(out.pressure, 1.0).temperature == \
        pytest.approx(5.0, abs=1e-6)
    liq = r.point("condenser_outlet").state
    assert m.saturated_at_pressure(liq.pressure, 0.0).temperature - liq.temperature == \
        pytest.approx(3.0, abs=1e-6)
    # throttling keeps the enthalpy (to the blend flashes' accuracy target of 1e-6)
    assert r.point("evaporator_inlet").state.enthalpy == pytest.approx(liq.enthalpy, rel=1e-6)


def test_sizing_by_heating_capacity_and_mass_flow_agree():
    r = solve(spec())
    by_heat = solve(replace(spec(), cooling_capacity=None,
                            heating_capacity=r.performance.heating_capacity))
    by_flow = solve(replace(spec(), cooling_capacity=None, mass_flow=r.performance.mass_flow))
    assert by_heat.performance.cooling_capacity == pytest.approx(10e3, rel=1e-9)
    assert by_flow.performance.cooling_capacity == pytest.approx(10e3, rel=1e-9)


def test_displacement_sizing():
    s = replace(spec(), cooling_capacity=None,
                compressor=CompressorSpec(0.7, displacement=20 / 3600, volumetric_efficiency=0.9))
    r = solve(s)
    suction = r.point("compressor_suction").state
    assert r.performance.mass_flow == pytest.approx(suction.density * 20 / 3600 * 0.9, rel=1e-12)


def test_suction_line_superheat_is_not_useful_cooling():
    plain = solve(spec())
    heated = solve(spec(suction_line_superheat=10.0))
    assert heated.performance.mass_flow == pytest.approx(plain.performance.mass_flow, rel=1e-9)
    assert heated.performance.compressor_power > plain.performance.compressor_power
    assert abs(heated.performance.energy_balance_residual) < 1e-6


def test_pressure_drop_as_saturation_temperature():
    from heatlift.properties import model

    r = solve(spec(pressure_drops=PressureDrops(suction_line=PressureDrop(
        saturation_temperature=1.0))))
    m = model("R134a")
    suction = r.point("compressor_suction").state
    t_dew = m.saturated_at_pressure(suction.pressure, 1.0).temperature
    assert t_dew == pytest.approx(-11.0 + C, abs=1e-6)


def test_heat_loss_from_shell_lowers_discharge_enthalpy():
    lossy = solve(spec(compressor=CompressorSpec(0.7, heat_loss_fraction=0.1)))
    plain = solve(spec())
    assert lossy.performance.discharge_temperature < plain.performance.discharge_temperature
    assert lossy.performance.compressor_power == pytest.approx(
        plain.performance.compressor_power, rel=1e-9)
    assert abs(lossy.performance.energy_balance_residual) < 1e-6


def test_remarks():
    high = solve(spec("R404A", te=-40, tc=45))
    codes = {r.code for r in high.remarks}
    assert "pressure_ratio" in codes
    hot = solve(spec("R717", te=-30, tc=40))
    assert "discharge_temperature" in {r.code for r in hot.remarks}
    glide = solve(spec("R407C", subcooling=1.0))
    assert "subcooling_below_glide" in {r.code for r in glide.remarks}


def test_condensing_above_critical_suggests_transcritical():
    with pytest.raises(OutOfRange) as err:
        solve(spec("R744", te=-5, tc=35))
    assert "transcritical" in err.value.message


def test_evaporating_above_condensing_is_refused():
    with pytest.raises(InvalidInput):
        solve(spec(te=45, tc=40))


def test_two_sizes_are_refused():
    with pytest.raises(InvalidInput):
        solve(spec(mass_flow=0.1))


def test_mean_basis_lies_between_dew_and_bubble():
    pressures = {}
    for basis in ("dew", "mean", "bubble"):
        s = spec("R407C", evaporating=SaturationSpec(temperature=-10 + C, basis=basis))
        pressures[basis] = solve(s).point("evaporator_outlet").state.pressure
    assert pressures["dew"] < pressures["mean"] < pressures["bubble"]


def test_optimal_gas_cooler_pressure_is_a_maximum():
    base = CIRCUIT_CASES["transcritical"]
    best = solve(replace(base, gas_cooler=GasCoolerSpec(35 + C, None)))
    p_opt = best.performance.high_side_pressure
    for factor in (0.95, 1.05):
        other = solve(replace(base, gas_cooler=GasCoolerSpec(35 + C, p_opt * factor)))
        assert other.performance.cop < best.performance.cop


REFRIGERANTS = ["R134a", "R32", "R290", "R717", "R410A", "R454B", "R1234yf", "R513A"]


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    refrigerant=st.sampled_from(REFRIGERANTS),
    te=st.floats(-30.0, 10.0),
    lift=st.floats(15.0, 45.0),
    superheat=st.floats(0.0, 15.0),
    subcooling=st.floats(0.0, 10.0),
    eta=st.floats(0.4, 1.0),
)
def test_cop_below_carnot(refrigerant, te, lift, superheat, subcooling, eta):
    s = spec(refrigerant, te=te, tc=te + lift, superheat=superheat, subcooling=subcooling,
             compressor=CompressorSpec(isentropic_efficiency=eta))
    p = solve(s).performance
    assert p.cop < p.cop_carnot
    assert 0.0 < p.second_law_efficiency < 1.0
    assert abs(p.energy_balance_residual) < 1e-6
