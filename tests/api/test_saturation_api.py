"""Saturation over real HTTP."""

import pytest


def test_saturation_by_temperature_si(http):
    r = http.get("/v1/saturation", refrigerant="R134a", temperature=0)
    assert r.status_code == 200
    body = r.json()
    # R134a at 0 degC: 292.8 kPa (NIST reference data, from memory), tolerance 0.5 %
    assert body["pressure_dew"]["unit"] == "kPa"
    assert body["pressure_dew"]["value"] == pytest.approx(292.8, rel=5e-3)
    assert body["glide"]["value"] == pytest.approx(0.0, abs=1e-9)
    assert body["meta"]["engine"].startswith("heatlift ")
    assert r.headers["X-Request-ID"] == body["meta"]["request_id"]


def test_saturation_by_gauge_pressure_in_ip(http):
    r = http.post("/v1/saturation", {"refrigerant": "r-134A", "pressure": "45 psig", "units": "IP"})
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["refrigerant"] == "R134a"
    assert body["temperature_dew"]["unit"] == "degF"
    # 45 psig R134a is about 50 degF (common practice, pressure-temperature card, from memory)
    assert body["temperature_dew"]["value"] == pytest.approx(50.0, abs=1.0)
    assert body["gauge_pressure"]["dew"] == {"value": pytest.approx(45.0), "unit": "psig"}


def test_blend_glide(http):
    r = http.get("/v1/saturation", refrigerant="R407C", pressure="500 kPa")
    body = r.json()
    # R407C glide is about 6 to 7 K at evaporating pressures (common practice, from memory)
    assert 5.0 < body["glide"]["value"] < 7.5


def test_out_of_range_is_422_in_callers_units(http):
    r = http.get("/v1/saturation", refrigerant="R744", temperature=40, units="IP")
    assert r.status_code == 200  # 40 degF is below R744's critical point of 87.8 degF
    r = http.get("/v1/saturation", refrigerant="R744", temperature=40)
    assert r.status_code == 422
    assert r.headers["Content-Type"].startswith("application/problem+json")
    assert "degC" in r.json()["detail"] and "30.97" in r.json()["detail"]
