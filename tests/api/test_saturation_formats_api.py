"""GET|POST /v1/saturation and GET /v1/saturation/table: units, CSV and select= over HTTP."""

from __future__ import annotations

import csv
import io

import pytest

from tests.api.problem import assert_problem


def test_get_and_post_give_the_same_result(http):
    got = http.get("/v1/saturation", refrigerant="R32", temperature=5).json()
    posted = http.post("/v1/saturation", {"refrigerant": "R32", "temperature": 5}).json()
    for body in (got, posted):
        body.pop("meta")
    assert got == posted
    # R32 at 5 degC: about 951 kPa (NIST reference data, from memory; 1 %)
    assert got["pressure_dew"]["value"] == pytest.approx(951.0, rel=1e-2)


def test_response_fields_of_the_contract(http):
    body = http.get("/v1/saturation", refrigerant="R407C", temperature=0).json()
    for key in ("pressure_bubble", "pressure_dew", "temperature_bubble", "temperature_dew",
                "glide", "gauge_pressure", "liquid", "vapor", "latent_heat"):
        assert key in body, key
    for phase in ("liquid", "vapor"):
        assert set(body[phase]) >= {"density", "enthalpy", "entropy"}
    assert body["glide"]["unit"] == "K"
    assert body["pressure_bubble"]["value"] > body["pressure_dew"]["value"]
    assert body["gauge_pressure"]["dew"]["unit"] == "kPag"
    assert body["gauge_pressure"]["dew"]["value"] == pytest.approx(
        body["pressure_dew"]["value"] - 101.325, rel=1e-9)
    assert body["latent_heat"]["value"] == pytest.approx(
        body["vapor"]["enthalpy"]["value"] - body["liquid"]["enthalpy"]["value"], rel=1e-9)


def test_ip_units_and_bare_numbers(http):
    body = http.get("/v1/saturation", refrigerant="R134a", temperature=32, units="IP").json()
    si = http.get("/v1/saturation", refrigerant="R134a", temperature=0).json()
    assert body["pressure_dew"]["unit"] == "psi"
    assert body["pressure_dew"]["value"] == pytest.approx(si["pressure_dew"]["value"]
                                                          / 6.894757293168361, rel=1e-9)
    assert body["liquid"]["enthalpy"]["unit"] == "Btu/lb"
    assert body["liquid"]["enthalpy"]["value"] == pytest.approx(
        si["liquid"]["enthalpy"]["value"] / 2.326, rel=1e-9)
    assert body["liquid"]["density"]["unit"] == "lb/ft^3"
    assert body["glide"]["unit"] == "delta_degF"
    assert body["meta"]["units"] == "IP"


def test_unit_overrides_in_a_post_body(http):
    body = http.post("/v1/saturation", {
        "refrigerant": "R744", "temperature": "-10 degC", "units": "IP",
        "unit_overrides": {"pressure": "bar", "specific_enthalpy": "kJ/kg"},
    }).json()
    assert body["pressure_dew"]["unit"] == "bar"
    # R744 at -10 degC: 26.49 bar (Span and Wagner 1996, NIST reference data, from memory)
    assert body["pressure_dew"]["value"] == pytest.approx(26.49, rel=5e-3)
    assert body["gauge_pressure"]["dew"]["unit"] == "barg"
    assert body["vapor"]["enthalpy"]["unit"] == "kJ/kg"
    assert body["temperature_dew"]["unit"] == "degF"  # the rest stays IP


def test_unit_overrides_in_a_query_string(http):
    body = http.get("/v1/saturation", refrigerant="R744", temperature=-10,
                    unit_overrides="pressure:MPa,density:lb/ft^3").json()
    assert body["pressure_dew"]["unit"] == "MPa"
    assert body["pressure_dew"]["value"] == pytest.approx(2.649, rel=5e-3)
    assert body["liquid"]["density"]["unit"] == "lb/ft^3"
    assert body["temperature_dew"]["unit"] == "degC"


def test_written_units_are_accepted_back(http):
    first = http.get("/v1/saturation", refrigerant="R290", temperature=-10, units="IP").json()
    p = first["pressure_dew"]
    # -10 degF is -23.333 degC: read back in SI, written in SI
    again = http.post("/v1/saturation", {"refrigerant": "R290", "pressure": p}).json()
    assert again["temperature_dew"]["value"] == pytest.approx((-10.0 - 32) / 1.8, abs=1e-6)
    text = f"{first['gauge_pressure']['dew']['value']!r} {first['gauge_pressure']['dew']['unit']}"
    by_gauge = http.get("/v1/saturation", refrigerant="R290", pressure=text, units="IP").json()
    assert by_gauge["temperature_dew"]["value"] == pytest.approx(-10.0, abs=1e-6)


def test_atmospheric_pressure_moves_the_gauge(http):
    body = http.get("/v1/saturation", refrigerant="R134a", pressure="200 kPag",
                    atmospheric_pressure="90 kPa").json()
    assert body["pressure_dew"]["value"] == pytest.approx(290.0, rel=1e-12)
    assert body["gauge_pressure"]["dew"]["value"] == pytest.approx(200.0, rel=1e-12)


def test_csv_has_units_in_the_header(http):
    r = http.get("/v1/saturation", refrigerant="R454B", pressure="8 bar", format="csv")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/csv")
    rows = list(csv.DictReader(io.StringIO(r.text)))
    assert len(rows) == 1
    row = rows[0]
    assert float(row["pressure_dew [kPa]"]) == pytest.approx(800.0, rel=1e-12)
    assert "temperature_dew [degC]" in row and "glide [K]" in row
    assert "liquid.density [kg/m^3]" in row
    assert row["refrigerant"] == "R454B"


def test_csv_in_ip(http):
    r = http.get("/v1/saturation", refrigerant="R454B", temperature=40, format="csv",
                 units="IP")
    header = next(csv.reader(io.StringIO(r.text)))
    assert "pressure_dew [psi]" in header and "glide [delta_degF]" in header


def test_select_gives_a_bare_number(http):
    r = http.get("/v1/saturation", refrigerant="R134a", temperature=0, select="pressure_dew")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/plain")
    assert float(r.text) == pytest.approx(292.8, rel=5e-3)  # NIST, from memory
    nested = http.get("/v1/saturation", refrigerant="R134a", temperature=0,
                      select="vapor.density", units="IP")
    assert float(nested.text) > 0 and "{" not in nested.text


def test_select_of_a_missing_path_names_the_keys(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=0,
                                   select="nope.value"), 422)
    assert "pressure_dew" in body["detail"]


def test_table_rows_and_csv(http):
    r = http.get("/v1/saturation/table", refrigerant="R134a", start=-20, stop=40, step=10)
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["by"] == "temperature"
    assert [row["temperature_dew"]["value"] for row in body["rows"]] == pytest.approx(
        [-20, -10, 0, 10, 20, 30, 40], abs=1e-9)
    # R134a at 0 and 40 degC: 292.8 and 1016.6 kPa (NIST reference data, from memory)
    assert body["rows"][2]["pressure_dew"]["value"] == pytest.approx(292.8, rel=5e-3)
    assert body["rows"][6]["pressure_dew"]["value"] == pytest.approx(1016.6, rel=5e-3)
    csv_text = http.get("/v1/saturation/table", refrigerant="R134a", start=-20, stop=40,
                        step=10, format="csv").text
    rows = list(csv.DictReader(io.StringIO(csv_text)))
    assert len(rows) == 7
    assert float(rows[2]["pressure_dew [kPa]"]) == pytest.approx(292.8, rel=5e-3)


def test_table_by_pressure_in_ip(http):
    body = http.get("/v1/saturation/table", refrigerant="R410A", by="pressure", start="50 psig",
                    stop="150 psig", step=25, units="IP").json()
    assert len(body["rows"]) == 5
    assert body["rows"][0]["gauge_pressure"]["dew"] == {"value": pytest.approx(50.0),
                                                         "unit": "psig"}
    temps = [row["temperature_dew"]["value"] for row in body["rows"]]
    assert temps == sorted(temps)


def test_table_select_one_cell(http):
    r = http.get("/v1/saturation/table", refrigerant="R134a", start=0, stop=40, step=20,
                 select="rows.1.pressure_dew")
    assert r.headers["Content-Type"].startswith("text/plain")
    assert float(r.text) > 292.8


def test_table_over_the_point_limit_names_the_limit(http):
    body = assert_problem(http.get("/v1/saturation/table", refrigerant="R134a", start=-40,
                                   stop=60, step=0.1), 422)
    assert "500" in body["detail"] and "step" in body["errors"]
    # the smallest step that would do, in the caller's units
    assert "0.2004" in body["detail"] and "K" in body["detail"]
    ip = assert_problem(http.get("/v1/saturation/table", refrigerant="R134a", start=-40,
                                 stop=140, step=0.1, units="IP"), 422)
    assert "delta_degF" in ip["detail"]


def test_table_with_a_vanishing_step_is_a_422(http):
    assert_problem(http.get("/v1/saturation/table", refrigerant="R134a", start=-40, stop=60,
                            step="1e-320"), 422)


def test_table_bounds_outside_saturation(http):
    body = assert_problem(http.get("/v1/saturation/table", refrigerant="R134a", start=-40,
                                   stop=120, step=10), 422)
    assert "stop" in body["errors"]
    assert "101.06" in body["detail"]  # the critical temperature in degC


def test_table_stop_below_start(http):
    body = assert_problem(http.get("/v1/saturation/table", refrigerant="R134a", start=40,
                                   stop=0, step=10), 422)
    assert "start" in body["detail"]
