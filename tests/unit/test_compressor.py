"""The compressor polynomial engine: evaluation, basis, correction, envelope."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from heatlift.compressor import (
    BTU_IT,
    PolynomialSpec,
    RatingConditions,
    basis_factors,
    evaluate_polynomial,
    inside_polygon,
    operating_point,
    polynomial,
    polynomial_values,
)
from heatlift.errors import InvalidInput, OutOfRange
from heatlift.properties import model

K = 273.15
TE, TC = -10.0 + K, 45.0 + K
# an invented set (SI basis: degC, W, kg/s, A) that gives positive figures around -10/45 degC
CAPACITY = (9000.0, 300.0, -60.0, 4.0, -1.5, 0.1, 0.02, -0.02, 0.005, -0.001)
POWER = (1500.0, -20.0, 40.0, 0.1, 0.2, 0.3, 0.0, 0.0, 0.0, 0.0)
MASS = (0.05, 0.0016, -0.0002, 0.00002, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
CURRENT = (3.0, -0.02, 0.08, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)


def spec(**kwargs: object) -> PolynomialSpec:
    base: dict[str, object] = {
        "refrigerant": "R134a", "rating": RatingConditions(superheat=10.0, subcooling=0.0),
        "power": POWER, "mass_flow": MASS, "current": CURRENT,
    }
    base.update(kwargs)
    return PolynomialSpec(**base)  # type: ignore[arg-type]


def test_term_order_of_the_standards():
    s, d = 3.0, 7.0
    expected = [1, s, d, s * s, s * d, d * d, s ** 3, d * s * s, s * d * d, d ** 3]
    for i, term in enumerate(expected):
        c = [0.0] * 10
        c[i] = 1.0
        assert polynomial(c, s, d) == pytest.approx(term, rel=1e-15)


def test_ip_basis_reads_degf_and_btu_per_hour():
    f = basis_factors("IP")
    # -10 degC is 14 degF; 1 Btu/h = 1055.05585262/3600 W; 1 lb/h = 0.45359237/3600 kg/s
    assert TE * f.temperature_scale + f.temperature_offset == pytest.approx(14.0, abs=1e-9)
    assert f.to_si["capacity"] == pytest.approx(BTU_IT / 3600.0, rel=1e-15)
    assert f.to_si["power"] == 1.0  # I-P sheets give the power input in W
    assert f.to_si["mass_flow"] == pytest.approx(0.45359237 / 3600.0, rel=1e-15)
    flat = PolynomialSpec("R134a", RatingConditions(10.0), basis="IP",
                          capacity=(12000.0, 0, 0, 0, 0, 0, 0, 0, 0, 0),
                          mass_flow=(0.0, 1.0, 0, 0, 0, 0, 0, 0, 0, 0))
    values = polynomial_values(flat, TE, TC)
    assert values["capacity"] == pytest.approx(12000.0 * BTU_IT / 3600.0, rel=1e-12)  # 1 TR
    assert values["mass_flow"] == pytest.approx(14.0 * 0.45359237 / 3600.0, rel=1e-9)
    with pytest.raises(InvalidInput):
        basis_factors("metric")


def test_at_the_rating_conditions_nothing_is_corrected():
    result = evaluate_polynomial(spec(), TE, TC, 10.0, 0.0)
    for name in ("capacity", "power", "mass_flow", "current", "cop", "isentropic_efficiency"):
        assert getattr(result.corrected, name) == pytest.approx(getattr(result.rating, name),
                                                                rel=1e-12)


def test_correction_follows_the_suction_density_and_the_refrigerating_effect():
    result = evaluate_polynomial(spec(), TE, TC, 20.0, 5.0)
    r, a = result.rating, result.corrected
    assert a.mass_flow == pytest.approx(r.mass_flow * a.suction_density / r.suction_density,
                                        rel=1e-12)
    assert a.capacity == pytest.approx(a.mass_flow * a.refrigerating_effect, rel=1e-12)
    assert a.suction_temperature == pytest.approx(TE + 20.0, abs=1e-6)
    # more superheat: thinner gas, less mass flow; subcooling adds refrigerating effect
    assert a.mass_flow < r.mass_flow
    assert a.refrigerating_effect > r.refrigerating_effect
    # the default power correction keeps the isentropic efficiency
    assert a.isentropic_efficiency == pytest.approx(r.isentropic_efficiency, rel=1e-12)
    assert a.current == pytest.approx(r.current * a.power / r.power, rel=1e-12)


def test_power_unchanged_option():
    result = evaluate_polynomial(spec(power_correction="unchanged"), TE, TC, 20.0, 5.0)
    assert result.corrected.power == result.rating.power
    assert result.corrected.current == result.rating.current
    assert result.corrected.isentropic_efficiency != pytest.approx(
        result.rating.isentropic_efficiency, rel=1e-6)
    with pytest.raises(InvalidInput):
        evaluate_polynomial(spec(power_correction="scaled"), TE, TC, 10.0, 0.0)


def test_capacity_only_and_mass_flow_only():
    only_capacity = spec(capacity=CAPACITY, mass_flow=None)
    result = evaluate_polynomial(only_capacity, TE, TC, 10.0, 0.0)
    q = operating_point("R134a", TE, TC, 10.0, 0.0).refrigerating_effect
    assert result.rating.mass_flow == pytest.approx(result.rating.capacity / q, rel=1e-12)
    only_mass = evaluate_polynomial(spec(), TE, TC, 10.0, 0.0)
    assert only_mass.rating.capacity == pytest.approx(only_mass.rating.mass_flow * q, rel=1e-12)
    assert only_mass.rating.cop == pytest.approx(only_mass.rating.capacity
                                                 / only_mass.rating.power, rel=1e-12)


def test_disagreeing_capacity_and_mass_flow_sets_are_remarked():
    result = evaluate_polynomial(spec(capacity=CAPACITY), TE, TC, 10.0, 0.0)
    implied = result.rating.mass_flow * result.rating.refrigerating_effect
    assert result.rating.capacity / implied - 1 > 0.1  # the invented sets differ by 15 %
    assert "polynomials_disagree" in [r.code for r in result.remarks]
    # the corrected capacity follows the mass-flow polynomial
    assert result.corrected.capacity == pytest.approx(implied, rel=1e-12)
    consistent = tuple(c * implied / result.rating.capacity for c in CAPACITY)
    result = evaluate_polynomial(spec(capacity=consistent), TE, TC, 10.0, 0.0)
    assert "polynomials_disagree" not in [r.code for r in result.remarks]


def test_return_gas_rating():
    rating = RatingConditions(return_gas_temperature=20.0 + K, subcooling=0.0)
    result = evaluate_polynomial(spec(rating=rating), TE, TC, 10.0, 0.0)
    assert result.rating.superheat == pytest.approx(30.0, abs=1e-9)
    assert result.corrected.mass_flow > result.rating.mass_flow  # 10 K is denser than 30 K
    with pytest.raises(InvalidInput, match="return-gas"):
        evaluate_polynomial(spec(rating=RatingConditions(return_gas_temperature=TE - 5)),
                            TE, TC, 10.0, 0.0)


def test_volumetric_efficiency_from_displacement():
    displacement = 20.0 / 3600.0
    result = evaluate_polynomial(spec(displacement=displacement), TE, TC, 10.0, 0.0)
    r = result.rating
    assert r.volumetric_efficiency == pytest.approx(
        r.mass_flow / (r.suction_density * displacement), rel=1e-12)
    assert result.corrected.volumetric_efficiency == pytest.approx(r.volumetric_efficiency)


def test_implausible_efficiency_is_remarked_once():
    tiny_power = (50.0, 0, 0, 0, 0, 0, 0, 0, 0, 0)
    result = evaluate_polynomial(spec(power=tiny_power), TE, TC, 10.0, 0.0)
    codes = [r.code for r in result.remarks]
    assert codes.count("implausible_isentropic_efficiency") == 1


def test_bad_points_and_polynomials():
    with pytest.raises(InvalidInput, match="below the condensing"):
        evaluate_polynomial(spec(), TC, TE, 10.0, 0.0)
    with pytest.raises(OutOfRange):
        evaluate_polynomial(spec(), TE, 110.0 + K, 10.0, 0.0)  # R134a critical 101 degC
    with pytest.raises(InvalidInput, match="polynomial gives"):
        evaluate_polynomial(spec(power=(-5.0, 0, 0, 0, 0, 0, 0, 0, 0, 0)), TE, TC, 10.0, 0.0)
    with pytest.raises(InvalidInput, match="10 coefficients"):
        evaluate_polynomial(spec(power=(1.0, 2.0)), TE, TC, 10.0, 0.0)
    with pytest.raises(InvalidInput, match="at least one"):
        evaluate_polynomial(spec(power=None, mass_flow=None, current=None), TE, TC, 10.0, 0.0)
    with pytest.raises(OutOfRange, match="subcooling"):
        evaluate_polynomial(spec(), TE, TC, 10.0, 250.0)


def test_blend_uses_dew_points():
    blend = spec(refrigerant="R454B")
    result = evaluate_polynomial(blend, TE, TC, 10.0, 0.0)
    m = model("R454B")
    assert result.pressure_evaporating == pytest.approx(
        m.saturated_at_temperature(TE, 1.0).pressure, rel=1e-9)
    assert result.pressure_condensing == pytest.approx(
        m.saturated_at_temperature(TC, 1.0).pressure, rel=1e-9)
    assert result.rating.suction_temperature == pytest.approx(TE + 10.0, abs=1e-6)


ENVELOPE = ((-30 + K, 20 + K), (10 + K, 20 + K), (10 + K, 60 + K), (-10 + K, 60 + K),
            (-30 + K, 45 + K))


def test_envelope():
    inside = evaluate_polynomial(spec(envelope=ENVELOPE), TE, TC, 10.0, 0.0)
    assert inside.within_envelope is True and not inside.remarks
    outside = evaluate_polynomial(spec(envelope=ENVELOPE), -28 + K, 58 + K, 10.0, 0.0)
    assert outside.within_envelope is False
    assert [r.code for r in outside.remarks] == ["outside_envelope"]
    # corners and edges are permitted points
    assert inside_polygon(10 + K, 40 + K, ENVELOPE)
    assert inside_polygon(-30 + K, 20 + K, ENVELOPE)
    with pytest.raises(InvalidInput, match="no area"):
        evaluate_polynomial(spec(envelope=((1.0, 1.0), (2.0, 2.0), (3.0, 3.0))), TE, TC,
                            10.0, 0.0)


@settings(max_examples=60, deadline=None)
@given(st.floats(-50, 50), st.floats(-50, 50))
def test_point_in_rectangle_matches_bounds(x, y):
    rectangle = ((-20.0, -10.0), (30.0, -10.0), (30.0, 25.0), (-20.0, 25.0))
    assert inside_polygon(x, y, rectangle) == (-20 <= x <= 30 and -10 <= y <= 25)


def test_concave_envelope():
    # an L shape: the notch at the top right is outside
    shape = ((0.0, 0.0), (10.0, 0.0), (10.0, 5.0), (5.0, 5.0), (5.0, 10.0), (0.0, 10.0))
    assert inside_polygon(2.0, 8.0, shape)
    assert inside_polygon(8.0, 2.0, shape)
    assert not inside_polygon(8.0, 8.0, shape)
