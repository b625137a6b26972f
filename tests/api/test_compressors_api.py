"""POST /v1/compressors/polynomial over real HTTP."""

from __future__ import annotations

import pytest

from heatlift.compressor import BTU_IT, POUND

# invented coefficients (SI basis) of a small R134a compressor
CAPACITY = [21000.0, 640.0, -140.0, 9.0, -3.0, 0.25, 0.04, -0.05, -0.02, -0.006]
POWER = [1800.0, -25.0, 50.0, 0.1, 0.2, 0.3, 0, 0, 0, 0]
MASS = [0.06, 0.0019, -0.00025, 0.00002, 0, 0, 0, 0, 0, 0]
CURRENT = [3.5, -0.02, 0.09, 0, 0, 0, 0, 0, 0, 0]


def body(**extra: object) -> dict:
    base = {
        "refrigerant": "R134a", "basis": "SI",
        "coefficients": {"power": POWER, "mass_flow": MASS, "current": CURRENT},
        "rating": {"superheat": 10, "subcooling": 0},
        "evaporating_temperature": -10, "condensing_temperature": 45,
        "superheat": 20, "subcooling": 5,
        "displacement": "30 m^3/h",
        "envelope": [[-30, 20], [10, 20], [10, 60], [-30, 50]],
    }
    base.update(extra)
    return base


def test_rated_and_corrected_si(http):
    r = http.post("/v1/compressors/polynomial", body())
    assert r.status_code == 200, r.text
    out = r.json()
    s, d = -10.0, 45.0
    p_r = 1800.0 - 25.0 * s + 50.0 * d + 0.1 * s * s + 0.2 * s * d + 0.3 * d * d
    m_r = 0.06 + 0.0019 * s - 0.00025 * d + 0.00002 * s * s
    assert out["power"] == {"value": pytest.approx(p_r / 1e3, rel=1e-9), "unit": "kW"}
    assert out["mass_flow"]["value"] == pytest.approx(m_r, rel=1e-9)
    assert out["rating"]["superheat"] == {"value": 10.0, "unit": "K"}
    corrected = out["corrected"]
    assert corrected["superheat"]["value"] == 20.0
    assert corrected["mass_flow"]["value"] < m_r  # warmer suction gas is thinner
    assert corrected["cop"]["unit"] == "1"
    assert corrected["cop"]["value"] == pytest.approx(
        corrected["capacity"]["value"] / corrected["power"]["value"], rel=1e-9)
    assert out["isentropic_efficiency"]["value"] == pytest.approx(
        corrected["isentropic_efficiency"]["value"], rel=1e-9)
    assert 0.3 < out["volumetric_efficiency"]["value"] < 1.0
    assert out["within_envelope"] is True
    assert out["meta"]["warnings"] == []
    assert out["pressure_evaporating"]["unit"] == "kPa"


def test_ip_basis_and_ip_units(http):
    # the same compressor written in the IP basis: one constant capacity of 2 TR
    ip = body(basis="IP", units="IP", coefficients={
        "capacity": [24000.0, 0, 0, 0, 0, 0, 0, 0, 0, 0],
        "mass_flow": [400.0, 0, 0, 0, 0, 0, 0, 0, 0, 0]},
        evaporating_temperature=14, condensing_temperature=113, superheat=18, subcooling=9,
        rating={"return_gas_temperature": 65, "subcooling": 15},
        displacement=None, envelope=None)
    ip = {k: v for k, v in ip.items() if v is not None}
    r = http.post("/v1/compressors/polynomial", ip)
    assert r.status_code == 200, r.text
    out = r.json()
    assert out["capacity"] == {"value": pytest.approx(24000.0, rel=1e-9), "unit": "Btu/h"}
    assert out["mass_flow"] == {"value": pytest.approx(400.0, rel=1e-9), "unit": "lb/h"}
    assert out["rating"]["superheat"]["value"] == pytest.approx(65 - 14, abs=1e-6)
    assert out["rating"]["superheat"]["unit"] == "delta_degF"
    assert out["evaporating_temperature"]["value"] == pytest.approx(14.0, abs=1e-9)
    # SI view of the same request: 400 lb/h in kg/s
    r = http.post("/v1/compressors/polynomial", {**ip, "units": "SI",
                                                 "evaporating_temperature": "14 degF",
                                                 "condensing_temperature": "113 degF",
                                                 "superheat": "18 delta_degF",
                                                 "subcooling": "9 delta_degF",
                                                 "rating": {"return_gas_temperature": "65 degF",
                                                            "subcooling": "15 delta_degF"}})
    assert r.status_code == 200, r.text
    assert r.json()["mass_flow"]["value"] == pytest.approx(400 * POUND / 3600, rel=1e-9)
    assert r.json()["capacity"]["value"] == pytest.approx(24000 * BTU_IT / 3600 / 1e3, rel=1e-9)


def test_outside_envelope_is_a_warning(http):
    r = http.post("/v1/compressors/polynomial", body(evaporating_temperature=-28,
                                                     condensing_temperature=58))
    assert r.status_code == 200, r.text
    assert r.json()["within_envelope"] is False
    codes = [w["code"] for w in r.json()["meta"]["warnings"]]
    assert "outside_envelope" in codes
    assert "-28 degC" in r.json()["meta"]["warnings"][codes.index("outside_envelope")]["message"]


def test_defaults_to_the_rating_conditions(http):
    plain = body()
    del plain["superheat"], plain["subcooling"]
    out = http.post("/v1/compressors/polynomial", plain).json()
    assert out["corrected"]["mass_flow"] == out["rating"]["mass_flow"]
    assert out["corrected"]["superheat"]["value"] == 10.0


@pytest.mark.parametrize("change,field,words", [
    ({"basis": None}, "basis", "Missing"),
    ({"coefficients": {"power": [1, 2, 3]}}, "coefficients.power", "10"),
    ({"coefficients": {}}, "coefficients", "at least one"),
    ({"rating": {"superheat": 10, "return_gas_temperature": 20}}, "rating.superheat",
     "exactly one"),
    ({"evaporating_temperature": 50}, "evaporating_temperature", "below the condensing"),
    ({"condensing_temperature": 120}, "condensing_temperature", "critical"),
    ({"superheat": -3}, "superheat", "at least 0 K"),
    ({"displacement": "3 kW"}, "displacement", "volume flow"),
    ({"coefficients": {"power": [-1, 0, 0, 0, 0, 0, 0, 0, 0, 0]}}, "coefficients.power",
     "polynomial gives"),
    ({"envelope": [[0, 1], [1, 2]]}, "envelope", "Length"),
    ({"power_correction": "magic"}, "power_correction", "Must be one of"),
])
def test_bad_requests_are_422_with_a_useful_detail(http, change, field, words):
    request = body()
    for key, value in change.items():
        if value is None:
            request.pop(key)
        else:
            request[key] = value
    r = http.post("/v1/compressors/polynomial", request)
    assert r.status_code == 422, r.text
    assert r.headers["Content-Type"].startswith("application/problem+json")
    problem = r.json()
    assert words in problem["detail"], problem
    assert field in problem.get("errors", {}), problem


def test_unknown_refrigerant_is_404(http):
    r = http.post("/v1/compressors/polynomial", body(refrigerant="R134x"))
    assert r.status_code == 404
    assert "R134a" in r.json()["detail"]
