"""Bad input over real HTTP: each a problem+json 4xx with a useful detail, never a 500."""

from __future__ import annotations

import pytest

from tests.api.problem import assert_problem


def post_raw(http, path: str, data: bytes | str, content_type: str | None):
    headers = {"Content-Type": content_type} if content_type else {}
    return http.session.post(http.base + path, data=data, headers=headers, timeout=60)


# ----------------------------------------------------------------------------- refrigerant


def test_unknown_refrigerant(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R999", temperature=0), 404)
    assert "/v1/refrigerants" in body["detail"]
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R45B", "pressure": 800,
                                                  "temperature": 10}), 404)
    assert "R454B" in body["suggestions"]


def test_empty_and_overlong_refrigerant(http):
    assert_problem(http.get("/v1/saturation", refrigerant="", temperature=0), 422)
    assert_problem(http.get("/v1/saturation", refrigerant="R" * 500, temperature=0), 422)


# ----------------------------------------------------------------- temperature / pressure


def test_both_temperature_and_pressure(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=0,
                                   pressure=300), 422)
    assert "exactly one" in body["detail"] and "both" in body["detail"]


def test_neither_temperature_nor_pressure(http):
    body = assert_problem(http.post("/v1/saturation", {"refrigerant": "R134a"}), 422)
    assert "exactly one of temperature or pressure" in body["detail"]


def test_missing_refrigerant(http):
    body = assert_problem(http.post("/v1/saturation", {"temperature": 0}), 422)
    assert "refrigerant" in body["errors"]


# ---------------------------------------------------------------------------------- units


def test_wrong_kind_unit_names_the_field_and_the_units_that_fit(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a",
                                   temperature="5 kPa"), 422)
    assert "temperature" in body["errors"]
    for unit in ("degC", "degF", "K"):
        assert unit in body["detail"]
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "temperature": 5,
                                                  "pressure": {"value": 3, "unit": "kJ/kg"}}),
                          422)
    assert "pressure" in body["errors"] and "psig" in body["detail"]


def test_unreadable_unit(http):
    assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature="5 parsecs"),
                   422)


def test_bad_unit_settings(http):
    assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=0,
                            units="metric"), 422)
    body = assert_problem(http.post("/v1/saturation", {
        "refrigerant": "R134a", "temperature": 0, "unit_overrides": {"pressure": "degC"}}), 422)
    assert "unit_overrides.pressure" in body["errors"]
    body = assert_problem(http.post("/v1/saturation", {
        "refrigerant": "R134a", "temperature": 0, "unit_overrides": {"presure": "bar"}}), 422)
    assert "pressure" in body["detail"]  # the kinds that exist are listed
    assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=0,
                            unit_overrides="pressure"), 422)
    assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "pressure": "10 psig",
                                           "temperature": 5, "atmospheric_pressure": "5 kPa"}),
                   422)


# ------------------------------------------------------------------------ numbers in JSON


@pytest.mark.parametrize("literal", ["NaN", "Infinity", "-Infinity"])
def test_nan_and_infinity_in_the_body_are_400(http, literal):
    raw = '{"refrigerant": "R134a", "temperature": ' + literal + "}"
    body = assert_problem(post_raw(http, "/v1/saturation", raw, "application/json"), 400)
    assert "NaN" in body["detail"]


@pytest.mark.parametrize("value", ["nan", "inf", "Infinity degC", "1e999 degC"])
def test_nan_and_infinity_as_text_are_422(http, value):
    assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=value), 422)


def test_huge_integer_is_refused_not_crashed(http):
    raw = '{"refrigerant": "R134a", "temperature": 1' + "0" * 400 + "}"
    assert_problem(post_raw(http, "/v1/saturation", raw, "application/json"), 422)


@pytest.mark.parametrize("value", ["warm", True, [5], {"value": "5"}, {"unit": "K"}, None])
def test_not_a_number_where_a_number_goes(http, value):
    body = assert_problem(http.post("/v1/saturation", {"refrigerant": "R134a",
                                                       "temperature": value}), 422)
    assert "temperature" in body["errors"]


def test_refrigerant_not_a_string(http):
    assert_problem(http.post("/v1/saturation", {"refrigerant": 134, "temperature": 0}), 422)


# ------------------------------------------------------------------------------- physics


def test_negative_absolute_pressure(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a", pressure=-5), 422)
    assert "absolute pressure" in body["detail"] and "kPa" in body["detail"]
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a", pressure="-20 psig",
                                   units="IP"), 422)
    assert "psi" in body["detail"]


def test_below_absolute_zero(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=-300),
                          422)
    assert "absolute zero" in body["detail"] and "-273.15 degC" in body["detail"]
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "pressure": 300,
                                                  "temperature": -500, "units": "IP"}), 422)
    assert "-459.67 degF" in body["detail"]


def test_above_critical_in_ip_gives_the_range_in_degf(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R134a", temperature=250,
                                   units="IP"), 422)
    assert "degF" in body["detail"] and "degC" not in body["detail"]
    assert "213.9" in body["detail"]  # R134a's critical temperature in degF
    assert "-153.9" in body["detail"]  # and its triple point
    assert "temperature" in body["errors"]


def test_below_triple_point(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R744", temperature=-60), 422)
    assert "-56.5" in body["detail"] and "triple point" in body["detail"]
    body = assert_problem(http.get("/v1/saturation", refrigerant="R744", pressure="1 atm"), 422)
    assert "kPa" in body["detail"]


def test_above_critical_pressure_in_psi(http):
    body = assert_problem(http.get("/v1/saturation", refrigerant="R744", pressure="1100 psi",
                                   units="IP"), 422)
    assert "psi" in body["detail"] and "critical point" in body["detail"]


def test_water_at_its_triple_point_is_inside(http):
    r = http.get("/v1/saturation", refrigerant="R718", temperature=0.01)
    assert r.status_code == 200, r.text
    assert_problem(http.get("/v1/saturation", refrigerant="R718", temperature=0), 422)


# ----------------------------------------------------------------------- body and transport


def test_body_not_json_is_400(http):
    body = assert_problem(post_raw(http, "/v1/state", "{refrigerant: R134a", "application/json"),
                          400)
    assert "JSON" in body["detail"]


@pytest.mark.parametrize("content_type,data", [
    ("text/plain", "refrigerant=R134a"),
    ("application/x-www-form-urlencoded", "refrigerant=R134a&temperature=0"),
    ("application/xml", "<state/>"),
    (None, '{"refrigerant": "R134a", "temperature": 0}'),
])
def test_unsupported_content_type_is_415(http, content_type, data):
    body = assert_problem(post_raw(http, "/v1/saturation", data, content_type), 415)
    assert "application/json" in body["detail"]


def test_json_with_a_charset_is_fine(http):
    r = post_raw(http, "/v1/saturation", '{"refrigerant": "R134a", "temperature": 0}',
                 "application/json; charset=utf-8")
    assert r.status_code == 200, r.text


def test_body_that_is_not_an_object(http):
    assert_problem(post_raw(http, "/v1/state", "[1, 2]", "application/json"), 422)
    assert_problem(post_raw(http, "/v1/state", '"R134a"', "application/json"), 422)


def test_unknown_field_in_the_body(http):
    body = assert_problem(http.post("/v1/state", {"refrigerant": "R134a", "pressure": 300,
                                                  "temperature": 5, "temprature": 9}), 422)
    assert "temprature" in body["errors"]


def test_unknown_path(http):
    body = assert_problem(http.get("/v1/nowhere"), 404)
    assert "/openapi.json" in body["detail"]


def test_wrong_method(http):
    assert_problem(http.get("/v1/state"), 405)
