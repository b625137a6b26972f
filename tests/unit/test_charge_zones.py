"""Heat-exchanger zones: enthalpy shares, quadrature, blends, given shares."""

import math

import pytest

from heatlift.charge.void import MODELS
from heatlift.charge.zones import exchanger_zones, mean_single_phase_density, mean_two_phase, split
from heatlift.errors import InvalidInput
from heatlift.properties import model

C = 273.15


def test_homogeneous_mean_density_matches_the_closed_form():
    # pure fluid at one pressure: 1/rho_h = x v_g + (1-x) v_l, so
    # int_0^1 rho_h dx = ln(v_g / v_l) / (v_g - v_l)
    m = model("R134a")
    p = m.saturated_at_temperature(0.0 + C, 1.0).pressure
    c = m.coexisting_phases(p, 0.5)
    vl, vg = 1 / c.liquid_density, 1 / c.vapor_density
    rho, _ = mean_two_phase(m, p, 0.0, 1.0, MODELS["homogeneous"], None)
    assert rho == pytest.approx(math.log(vg / vl) / (vg - vl), rel=1e-6)
    x_a, x_b = 0.2, 0.7
    rho, _ = mean_two_phase(m, p, x_a, x_b, MODELS["homogeneous"], None)
    va, vb = x_a * vg + (1 - x_a) * vl, x_b * vg + (1 - x_b) * vl
    assert rho == pytest.approx(math.log(vb / va) / (vg - vl) / (x_b - x_a), rel=1e-6)


def test_mean_void_fraction_of_zivi_matches_a_fine_sum():
    m = model("R290")
    p = m.saturated_at_temperature(40.0 + C, 1.0).pressure
    c = m.coexisting_phases(p, 0.5)
    n = 200_000
    total = sum(MODELS["zivi"].alpha((i + 0.5) / n, c.liquid_density, c.vapor_density, 0, 0)
                for i in range(n)) / n
    _, alpha = mean_two_phase(m, p, 0.0, 1.0, MODELS["zivi"], None)
    assert alpha == pytest.approx(total, rel=1e-5)


def test_single_phase_mean_of_a_liquid_lies_between_its_ends():
    m = model("R134a")
    p = 1.2e6
    h_bub = m.saturated_at_pressure(p, 0.0).enthalpy
    low = m.at_pressure_enthalpy(p, h_bub - 20e3).density
    high = m.at_pressure_enthalpy(p, h_bub - 1e3).density
    mean = mean_single_phase_density(m, p, h_bub - 20e3, h_bub - 1e3)
    assert high < mean < low


def test_condenser_zones_follow_the_flow_and_add_up():
    m = model("R134a")
    p = m.saturated_at_temperature(40.0 + C, 1.0).pressure
    inlet = m.at_pressure_temperature(p, 70.0 + C)
    outlet = m.at_pressure_temperature(p, 35.0 + C)
    zones = exchanger_zones(m, inlet, outlet, MODELS["zivi"], None)
    assert [z.name for z in zones] == ["desuperheating", "two_phase", "subcooled"]
    assert sum(z.volume_share for z in zones) == pytest.approx(1.0, abs=1e-12)
    h_dew = m.saturated_at_pressure(p, 1.0).enthalpy
    assert zones[0].enthalpy_share == pytest.approx(
        (inlet.enthalpy - h_dew) / (inlet.enthalpy - outlet.enthalpy), rel=1e-9)
    assert zones[1].quality_in == 1.0 and zones[1].quality_out == 0.0
    assert zones[0].mean_density < zones[1].mean_density < zones[2].mean_density


def test_evaporator_of_a_blend_samples_the_glide():
    m = model("R407C")
    p = 4.0e5
    h_in = m.at_pressure_quality(p, 0.25).enthalpy
    outlet = m.at_pressure_temperature(p, m.saturated_at_pressure(p, 1.0).temperature + 5)
    inlet = m.at_pressure_enthalpy(p, h_in)
    zones = exchanger_zones(m, inlet, outlet, MODELS["homogeneous"], None)
    assert [z.name for z in zones] == ["two_phase", "superheating"]
    assert zones[0].quality_in == pytest.approx(0.25, abs=1e-6)
    # the blend's phase densities change along the glide; the mean lies between the
    # homogeneous densities at the zone's ends
    assert outlet.density < zones[0].mean_density < inlet.density


def test_given_zone_shares_replace_the_enthalpy_shares():
    m = model("R134a")
    p = m.saturated_at_temperature(40.0 + C, 1.0).pressure
    inlet = m.at_pressure_temperature(p, 70.0 + C)
    outlet = m.at_pressure_temperature(p, 35.0 + C)
    zones = exchanger_zones(m, inlet, outlet, MODELS["zivi"], None,
                            {"desuperheating": 0.1, "two_phase": 0.7, "subcooled": 0.2})
    assert [z.volume_share for z in zones] == pytest.approx([0.1, 0.7, 0.2])
    with pytest.raises(InvalidInput, match="superheating"):
        exchanger_zones(m, inlet, outlet, MODELS["zivi"], None, {"superheating": 1.0})
    with pytest.raises(InvalidInput, match="add up to 1"):
        exchanger_zones(m, inlet, outlet, MODELS["zivi"], None, {"two_phase": 0.5})


def test_supercritical_gas_cooler_is_one_zone():
    m = model("R744")
    assert split(m, 9e6, 500e3, 300e3) == [("supercritical", 500e3, 300e3)]


def test_drift_flux_model_needs_the_mass_flux():
    m = model("R134a")
    with pytest.raises(InvalidInput, match="mass flux"):
        mean_two_phase(m, 3e5, 0.2, 1.0, MODELS["steiner"], None)
