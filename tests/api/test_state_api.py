"""POST /v1/state over real HTTP: the field checks of superheat and subcooling."""

from __future__ import annotations

import pytest

from tests.api.problem import assert_problem


def test_superheat_from_a_gauge_reading_in_ip(http):
    """Suction at 30 psig and a suction-line thermometer at 45 degF (R134a)."""
    r = http.post("/v1/state", {"refrigerant": "R134a", "units": "IP",
                                "pressure": "30 psig", "temperature": "45 degF"})
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["phase"] == "superheated_vapor"
    assert body["subcooling"] is None
    sat = http.get("/v1/saturation", refrigerant="R134a", pressure="30 psig", units="IP").json()
    t_dew = sat["temperature_dew"]["value"]
    # 30 psig on R134a is about 35 degF (pressure-temperature card, common practice, from
    # memory; 1.5 degF)
    assert t_dew == pytest.approx(35.0, abs=1.5)
    assert body["superheat"] == {"value": pytest.approx(45.0 - t_dew, abs=1e-6),
                                 "unit": "delta_degF"}
    assert body["temperature_dew"]["value"] == pytest.approx(t_dew, abs=1e-9)
    assert body["gauge_pressure"] == {"value": pytest.approx(30.0, rel=1e-9), "unit": "psig"}
    assert body["state"]["pressure"]["unit"] == "psi"
    assert body["state"]["enthalpy"]["unit"] == "Btu/lb"


def test_superheat_at_a_high_site(http):
    """The same gauge reading at a lower atmospheric pressure means a lower suction pressure
    and so a larger superheat."""
    sea = http.post("/v1/state", {"refrigerant": "R134a", "units": "IP",
                                  "pressure": "30 psig", "temperature": 45}).json()
    high = http.post("/v1/state", {"refrigerant": "R134a", "units": "IP",
                                   "pressure": "30 psig", "temperature": 45,
                                   "atmospheric_pressure": "12.2 psi"}).json()
    assert high["superheat"]["value"] > sea["superheat"]["value"]
    assert high["gauge_pressure"]["value"] == pytest.approx(30.0, rel=1e-9)


def test_blend_superheat_is_against_the_dew_point(http):
    body = http.post("/v1/state", {"refrigerant": "R454B", "pressure": "800 kPa",
                                   "temperature": 10}).json()
    assert body["phase"] == "superheated_vapor"
    sat = http.get("/v1/saturation", refrigerant="R454B", pressure="800 kPa").json()
    assert body["superheat"]["value"] == pytest.approx(
        10.0 - sat["temperature_dew"]["value"], abs=1e-6)
    assert body["temperature_bubble"]["value"] < body["temperature_dew"]["value"]


def test_blend_two_phase_from_pressure_and_enthalpy(http):
    body = http.post("/v1/state", {"refrigerant": "R454B", "pressure": "800 kPa",
                                   "enthalpy": "300 kJ/kg"}).json()
    assert body["phase"] == "two_phase"
    assert 0.0 < body["state"]["quality"]["value"] < 1.0
    assert body["state"]["quality"]["unit"] == "1"
    assert body["state"]["enthalpy"]["value"] == pytest.approx(300.0, rel=1e-6)
    assert body["superheat"] is None and body["subcooling"] is None


def test_subcooled_liquid(http):
    body = http.post("/v1/state", {"refrigerant": "R134a", "pressure": "1000 kPa",
                                   "temperature": "30 degC"}).json()
    assert body["phase"] == "subcooled_liquid"
    assert body["superheat"] is None
    # R134a bubble point at 1 MPa: 39.4 degC (NIST reference data, from memory; 0.5 K)
    assert body["temperature_bubble"]["value"] == pytest.approx(39.4, abs=0.5)
    assert body["subcooling"]["value"] == pytest.approx(
        body["temperature_bubble"]["value"] - 30.0, abs=1e-6)
    assert body["state"]["density"]["value"] > 1000.0


def test_pure_two_phase_from_temperature_and_quality(http):
    body = http.post("/v1/state", {"refrigerant": "R717", "temperature": -10,
                                   "quality": 0.2}).json()
    assert body["phase"] == "two_phase"
    # R717 at -10 degC: 290.9 kPa (NIST reference data, from memory; 0.5 %)
    assert body["state"]["pressure"]["value"] == pytest.approx(290.9, rel=5e-3)


def test_temperature_and_enthalpy_of_a_pure_fluid(http):
    body = http.post("/v1/state", {"refrigerant": "R134a", "temperature": 5,
                                   "enthalpy": "300 kJ/kg"}).json()
    assert body["phase"] == "two_phase"
    assert body["state"]["temperature"]["value"] == pytest.approx(5.0, abs=1e-9)


def test_supercritical_r744(http):
    body = http.post("/v1/state", {"refrigerant": "R744", "pressure": "9 MPa",
                                   "temperature": 35}).json()
    assert body["phase"] == "supercritical"
    assert body["superheat"] is None and body["temperature_dew"] is None


def test_state_needs_exactly_two(http):
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R134a",
                                                  "pressure": 300}), 422)
    assert "exactly two" in body["detail"]
    assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "pressure": 300,
                                           "temperature": 5, "enthalpy": 400}), 422)


def test_quality_out_of_range(http):
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "pressure": 300,
                                                  "quality": 1.5}), 422)
    assert "quality" in body["errors"]


def test_enthalpy_out_of_the_equation_of_states_range(http):
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "units": "IP",
                                                  "pressure": 50, "enthalpy": -2000}), 422)
    assert "Btu/lb" in body["detail"] and "degF" in body["detail"]


def test_blend_with_temperature_and_enthalpy_is_explained(http):
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R454B", "temperature": 5,
                                                  "enthalpy": 300}), 422)
    assert "pressure" in body["detail"]
