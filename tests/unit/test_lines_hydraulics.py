"""Pressure drop through one section of tube (heatlift.lines.hydraulics)."""

from __future__ import annotations

import math

import pytest
from fluids.constants import g

from heatlift.lines import hydraulics as hy
from heatlift.lines import oil_return, tubes
from heatlift.properties import model

TUBE = tubes.find("ASTM B280", "1-1/8")


def _liquid_inlet():
    m = model("R134a")
    bubble = m.saturated_at_temperature(313.15, 0.0)
    return m, m.at_pressure_temperature(bubble.pressure, 308.15)


def test_liquid_drop_is_darcy_weisbach_plus_head():
    m, inlet = _liquid_inlet()
    flow_rate = 0.3
    section = hy.Section(TUBE, 20.0, 3.0, (hy.Fitting("elbow_90_long_radius", 4),), 2.0)
    result = hy.liquid_flow(m, inlet, flow_rate, section)
    d = TUBE.inside_diameter
    v = flow_rate / (inlet.density * TUBE.flow_area)
    head = 0.5 * inlet.density * v**2
    f = result.friction_factor
    assert result.velocity == pytest.approx(v)
    assert result.parts.straight_tube == pytest.approx(f * 20.0 / d * head)
    assert result.parts.additional_equivalent_length == pytest.approx(f * 2.0 / d * head)
    assert result.parts.fittings == pytest.approx(result.loss_coefficient * head)
    assert result.parts.static_head == pytest.approx(inlet.density * g * 3.0)
    assert result.outlet.pressure == pytest.approx(inlet.pressure - result.parts.total)
    assert result.segments == 1


def test_drop_sign_of_static_head():
    m, inlet = _liquid_inlet()
    down = hy.liquid_flow(m, inlet, 0.3, hy.Section(TUBE, 10.0, -4.0))
    assert down.parts.static_head < 0
    assert down.outlet.pressure > inlet.pressure - down.parts.friction


def test_vapour_segments_when_the_drop_is_large():
    m = model("R134a")
    inlet = m.at_pressure_temperature(m.saturated_at_temperature(263.15, 1.0).pressure, 268.15)
    small = tubes.find("ASTM B280", "7/8")
    result = hy.vapor_flow(m, inlet, 0.08, hy.Section(small, 30.0))
    assert result.parts.total > hy.SEGMENT_SHARE * inlet.pressure
    assert result.segments > 1
    # constant enthalpy along the adiabatic line
    assert result.outlet.enthalpy == pytest.approx(inlet.enthalpy, rel=1e-6)
    # a one-piece estimate at inlet density underestimates the drop: the gas expands
    mu = m.transport_at(inlet.pressure, inlet.temperature, "vapor").viscosity
    v = 0.08 / (inlet.density * small.flow_area)
    re = inlet.density * v * small.inside_diameter / mu
    f = hy.friction_factor(re, small.roughness / small.inside_diameter)
    naive = f * 30.0 / small.inside_diameter * 0.5 * inlet.density * v**2
    assert result.parts.total > naive


def test_segmented_agrees_with_fine_integration():
    # the same line integrated in 200 equal pieces by hand must agree within 0.5 %
    m = model("R134a")
    inlet = m.at_pressure_temperature(m.saturated_at_temperature(263.15, 1.0).pressure, 268.15)
    small = tubes.find("ASTM B280", "7/8")
    result = hy.vapor_flow(m, inlet, 0.08, hy.Section(small, 30.0))
    p = inlet.pressure
    pieces = 200
    for _ in range(pieces):
        state = m.at_pressure_enthalpy(p, inlet.enthalpy)
        mu = m.transport_at(state.pressure, state.temperature, "vapor").viscosity
        v = 0.08 / (state.density * small.flow_area)
        re = state.density * v * small.inside_diameter / mu
        f = hy.friction_factor(re, small.roughness / small.inside_diameter)
        p -= f * (30.0 / pieces) / small.inside_diameter * 0.5 * state.density * v**2
    assert result.parts.total == pytest.approx(inlet.pressure - p, rel=5e-3)


def test_hopeless_tube_is_signalled():
    m = model("R134a")
    inlet = m.saturated_at_temperature(263.15, 1.0)
    with pytest.raises(hy.TubeTooSmall):
        hy.vapor_flow(m, inlet, 0.5, hy.Section(tubes.find("ASTM B280", "1/4"), 30.0))


@pytest.mark.parametrize("kind", sorted(set(hy.FITTING_TYPES) - {"bend", "other"}))
def test_every_fitting_has_a_positive_coefficient(kind):
    k = hy.loss_coefficient(hy.Fitting(kind), TUBE.inside_diameter, 2e5, 0.016)
    assert 0.0 < k < 20.0


def test_fitting_order_makes_sense():
    d, re, fd = TUBE.inside_diameter, 2e5, 0.016

    def k(kind: str) -> float:
        return hy.loss_coefficient(hy.Fitting(kind), d, re, fd)

    assert k("elbow_90_long_radius") < k("elbow_90_short_radius")
    assert k("elbow_45") < k("elbow_90_short_radius")
    assert k("tee_run") < k("tee_branch")
    assert k("ball_valve") < k("gate_valve") < k("angle_valve") < k("globe_valve")
    custom = hy.Fitting("bend", angle_degrees=90.0, radius_ratio=1.5)
    assert hy.loss_coefficient(custom, d, re, fd) == pytest.approx(k("elbow_90_long_radius"))
    assert hy.loss_coefficient(hy.Fitting("other", loss_coefficient=2.5), d, re, fd) == 2.5
    total = hy.total_loss_coefficient((hy.Fitting("ball_valve", 3),), d, re, fd)
    assert total == pytest.approx(3 * k("ball_valve"))


def test_friction_factor_laminar():
    assert hy.friction_factor(1000.0, 1e-4) == pytest.approx(64 / 1000.0)


def test_oil_return_criterion_roundtrip():
    d, rho = 0.026, 20.0
    v_min = oil_return.minimum_velocity(rho, d)
    assert oil_return.dimensionless_gas_velocity(v_min, rho, d) == pytest.approx(0.85)
    assert v_min == pytest.approx(0.85 * math.sqrt(g * d * (900.0 - rho) / rho))
    carry = oil_return.evaluate(0.02, rho, d, math.pi / 4 * d**2)
    assert carry.minimum_mass_flow == pytest.approx(rho * v_min * math.pi / 4 * d**2)
    assert oil_return.evaluate(1.0, 950.0, d, 1e-3).minimum_velocity == 0.0
    assert not oil_return.applies_to("R717") and oil_return.applies_to("R404A")


@pytest.mark.parametrize("designation", ["R134a", "R454B", "R448A", "R744"])
def test_viscosity_is_plausible(designation):
    m = model(designation)
    t = 263.15
    p = m.saturated_at_temperature(t, 1.0).pressure
    vapour = m.transport_at(0.95 * p, t + 5.0, "vapor").viscosity
    liquid = m.transport_at(1.05 * p, t - 5.0, "liquid").viscosity
    # refrigerant vapours 8-16 uPa s, liquids 70-400 uPa s near these temperatures
    # (common practice, no source)
    assert 8e-6 < vapour < 16e-6
    assert 7e-5 < liquid < 4e-4
