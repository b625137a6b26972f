"""POST /v1/lines/size, POST /v1/lines/check, GET /v1/lines/tubes over real HTTP."""

from __future__ import annotations

import pytest

from tests.api.problem import assert_problem

DUTY = {
    "refrigerant": "R454B",
    "cooling_capacity": "18 kW",
    "evaporating": {"temperature": -6},
    "condensing": {"temperature": 40},
    "superheat": 5, "subcooling": 3, "isentropic_efficiency": 0.65,
}
SUCTION = {**DUTY, "line": "suction", "length": 25, "rise": 6,
           "fittings": [{"type": "elbow_90_long_radius", "count": 8},
                        {"type": "ball_valve", "count": 1}]}
CANDIDATE_FIELDS = {
    "nominal_size", "outside_diameter", "inside_diameter", "wall_thickness", "velocity",
    "reynolds_number", "friction_factor", "pressure_drop", "pressure_drop_parts",
    "temperature_penalty", "oil_return", "subcooling_remaining", "flash_gas",
    "pressure_rating", "verdict", "reasons",
}


def value(node):
    return node["value"]


def test_suction_line_riser_design(http):
    r = http.post("/v1/lines/size", SUCTION)
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["line"] == "suction" and body["standard"] == "ASTM B280"
    for cand in body["candidates"]:
        assert CANDIDATE_FIELDS <= set(cand)
        assert {"minimum_velocity", "minimum_capacity", "ok"} <= set(cand["oil_return"])
        assert {"allowed_working_pressure", "design_pressure", "ok"} <= set(
            cand["pressure_rating"])
        assert {"straight_tube", "fittings", "static_head"} <= set(cand["pressure_drop_parts"])
        parts = cand["pressure_drop_parts"]
        assert value(cand["pressure_drop"]) == pytest.approx(
            sum(value(v) for v in parts.values()), rel=1e-9)
    by = {c["nominal_size"]: c for c in body["candidates"]}
    assert by["1-1/8"]["verdict"] == "oversized"
    assert by["1-1/8"]["oil_return"]["ok"] is False
    assert by["1-1/8"]["oil_return"]["minimum_capacity"]["unit"] == "kW"
    assert body["recommended"] is None
    design = body["riser_design"]
    assert design["arrangement"] == "single" and design["horizontal_size"] == "1-1/8"
    assert design["risers"][0]["nominal_size"] == "7/8"
    codes = [w["code"] for w in body["meta"]["warnings"]]
    assert "no_single_size" in codes
    assert "licensed practitioner" in body["caution"] and "A2L" in body["caution"]


def test_suction_line_at_half_load_recommends_one_size(http):
    r = http.post("/v1/lines/size", {**SUCTION, "minimum_load_fraction": 0.5})
    assert r.status_code == 200, r.text
    rec = r.json()["recommended"]
    assert rec["nominal_size"] == "1-1/8" and rec["verdict"] == "ok"
    assert value(rec["temperature_penalty"]) <= 1.0
    assert rec["reasons"][0]["code"] == "meets_all_limits"


def test_discharge_line_in_ip_units(http):
    body = {**DUTY, "line": "discharge", "units": "IP", "length": "40 ft", "rise": "6 ft",
            "fittings": [{"type": "elbow_90_long_radius", "count": 6}],
            "evaporating": {"temperature": "21.2 degF"}, "condensing": {"temperature": 104}}
    r = http.post("/v1/lines/size", body)
    assert r.status_code == 200, r.text
    rec = r.json()["recommended"]
    assert rec["nominal_size"] == "5/8"
    assert rec["velocity"]["unit"] == "ft/min"
    assert rec["outside_diameter"] == {"value": pytest.approx(0.625), "unit": "in"}
    assert rec["temperature_penalty"]["unit"] == "delta_degF"
    assert rec["pressure_rating"]["gauge_pressure"]["design_pressure"]["unit"] == "psig"
    assert rec["subcooling_remaining"] is None and rec["flash_gas"] is None


def test_liquid_line_from_a_mass_flow(http):
    body = {"refrigerant": "R410A", "line": "liquid", "mass_flow": "0.1 kg/s",
            "inlet": {"saturation_temperature": 40, "subcooling": 5},
            "length": 20, "rise": -4, "fittings": [{"type": "other", "loss_coefficient": 6}]}
    r = http.post("/v1/lines/size", body)
    assert r.status_code == 200, r.text
    rec = r.json()["recommended"]
    assert rec["oil_return"] is None
    assert rec["flash_gas"] is False and value(rec["subcooling_remaining"]) > 5.0
    assert value(rec["pressure_drop_parts"]["static_head"]) < 0


def test_liquid_riser_flash_gas_warned(http):
    body = {**DUTY, "line": "liquid", "subcooling": 1, "length": 25, "rise": 8}
    r = http.post("/v1/lines/size", body)
    assert r.status_code == 200, r.text
    out = r.json()
    assert out["recommended"] is None
    assert all(c["flash_gas"] for c in out["candidates"])
    assert "flash_gas_every_size" in [w["code"] for w in out["meta"]["warnings"]]


def test_duty_from_a_cycle_request(http):
    cycle = {"refrigerant": "R134a", "evaporating": {"temperature": -10},
             "condensing": {"temperature": 40}, "cooling_capacity": 12}
    r = http.post("/v1/lines/size", {"line": "suction", "cycle": cycle, "length": 15})
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["refrigerant"] == "R134a" and body["duty"]["basis"] == "cycle"
    assert body["duty"]["inlet_label"] == "evaporator_outlet"
    assert value(body["duty"]["cooling_capacity"]) == pytest.approx(12.0)


@pytest.mark.parametrize(("size", "standard"), [
    ("1-1/8", "ASTM B280"), ("28 x 1.0", "EN 12735-1"), ("2 sch 40", "ASME B36.10")])
def test_check_a_given_size(http, size, standard):
    r = http.post("/v1/lines/check", {**SUCTION, "size": size})
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["standard"] == standard
    assert body["candidate"]["nominal_size"] == size
    assert CANDIDATE_FIELDS <= set(body["candidate"])


def test_check_ammonia_in_steel(http):
    body = {"refrigerant": "R717", "line": "suction", "cooling_capacity": 300,
            "evaporating": {"temperature": -30}, "condensing": {"temperature": 35},
            "length": 40, "rise": 3, "size": "6", "schedule": 40}
    r = http.post("/v1/lines/check", body)
    assert r.status_code == 200, r.text
    out = r.json()
    assert out["candidate"]["nominal_size"] == "6 sch 40"
    assert out["candidate"]["oil_return"]["applies"] is False
    assert "oil_drained_not_lifted" in [w["code"] for w in out["meta"]["warnings"]]


def test_tubes_catalogue(http):
    r = http.get("/v1/lines/tubes", standard="EN 12735-1")
    assert r.status_code == 200
    rows = r.json()["tubes"]
    assert {row["standard"] for row in rows} == {"EN 12735-1"}
    assert "from memory" in rows[0]["dimensions_source"]
    r = http.get("/v1/lines/tubes", standard="ASME B36.10", schedule="80", format="csv")
    assert r.status_code == 200 and r.headers["Content-Type"].startswith("text/csv")
    assert "2 sch 80" in r.text and "outside_diameter [mm]" in r.text.splitlines()[0]
    r = http.get("/v1/lines/tubes", standard="ASTM B280", select="tubes.6.inside_diameter",
                 units="IP")
    assert float(r.text) == pytest.approx(1.025)  # 1-1/8 x 0.050 in


def test_fittings_list(http):
    r = http.get("/v1/lines/fittings")
    assert r.status_code == 200
    assert "tee_branch" in [f["type"] for f in r.json()["fittings"]]


# -- 422 --------------------------------------------------------------------------------------


def test_ammonia_in_copper_is_422(http):
    body = {**SUCTION, "refrigerant": "R717", "standard": "ASTM B280"}
    problem = assert_problem(http.post("/v1/lines/size", body), 422)
    assert "copper" in problem["detail"] and "ASME B36.10" in problem["detail"]
    assert "standard" in problem["errors"]
    problem = assert_problem(http.post("/v1/lines/check", {**body, "size": "22 x 1.0",
                                                            "standard": "EN 12735-1"}), 422)
    assert "copper" in problem["detail"]


def test_duty_no_size_can_carry_is_422(http):
    problem = assert_problem(http.post("/v1/lines/size", {**SUCTION, "cooling_capacity": 2000}),
                             422)
    assert "4-1/8" in problem["detail"] and "ASME B36.10" in problem["detail"]
    assert "m/s" in problem["detail"]


def test_rise_longer_than_length_is_422_in_callers_units(http):
    problem = assert_problem(http.post("/v1/lines/size", {**SUCTION, "length": 10, "rise": 12}),
                             422)
    assert "rise" in problem["errors"] and "12 m" in problem["detail"]
    ip = {**SUCTION, "units": "IP", "length": "10 m", "rise": "-12 m"}
    problem = assert_problem(http.post("/v1/lines/size", ip), 422)
    assert "ft" in problem["detail"]


@pytest.mark.parametrize("change", [
    {"line": "hot_gas"},
    {"fittings": [{"type": "bend"}]},
    {"fittings": [{"type": "elbow_90_long_radius", "count": 0}]},
    {"schedule": 60},
    {"standard": "DIN 1786"},
    {"mass_flow": 0.1},
    {"cooling_capacity": None},
    {"minimum_load_fraction": 0},
    {"min_velocity": 30},
    {"length": 0},
    {"refrigerant": "R1233zd(E)", "evaporating": {"temperature": 5}},
])
def test_bad_requests_are_problems(http, change):
    body = {**SUCTION, **change}
    if body.get("cooling_capacity") is None:
        body.pop("cooling_capacity")
    assert_problem(http.post("/v1/lines/size", body), 422)


def test_unknown_size_lists_the_catalogue(http):
    problem = assert_problem(http.post("/v1/lines/check", {**SUCTION, "size": "5/16"}), 422)
    assert '"1-1/8"' in problem["detail"]


def test_unknown_refrigerant_is_404(http):
    assert_problem(http.post("/v1/lines/size", {**SUCTION, "refrigerant": "R999"}), 404)
