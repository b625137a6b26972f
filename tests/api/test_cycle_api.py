"""POST|GET /v1/cycle and POST /v1/cycle/sweep over real HTTP."""

import pytest

R454B_CHILLER = {
    "refrigerant": "R454B",
    "evaporating": {"temperature": -6},
    "condensing": {"temperature": 40},
    "superheat": 5, "subcooling": 3,
    "compressor": {"isentropic_efficiency": 0.68},
    "cooling_capacity": "18 kW",
}


def perf(body, name):
    return body["performance"][name]["value"]


def test_single_stage_blend(http):
    r = http.post("/v1/cycle", R454B_CHILLER)
    assert r.status_code == 200, r.text
    body = r.json()
    assert [s["label"] for s in body["states"]][0] == "evaporator_outlet"
    assert perf(body, "cooling_capacity") == pytest.approx(18.0, rel=1e-9)
    assert perf(body, "heat_rejected") == pytest.approx(
        perf(body, "cooling_capacity") + perf(body, "compressor_power"), rel=1e-6)
    assert 2.0 < perf(body, "cop") < perf(body, "cop_carnot")
    assert body["performance"]["discharge_temperature"]["unit"] == "degC"
    assert "licensed practitioner" in body["caution"]


def test_results_do_not_depend_on_the_unit_system(http):
    si = http.post("/v1/cycle", R454B_CHILLER).json()
    ip_request = dict(R454B_CHILLER, units="IP", evaporating={"temperature": "21.2 degF"},
                      condensing={"temperature": 104}, superheat=9, subcooling="5.4 delta_degF",
                      cooling_capacity={"value": 18, "unit": "kW"},
                      unit_overrides={"power": "kW"})
    ip = http.post("/v1/cycle", ip_request).json()
    assert perf(ip, "cop") == pytest.approx(perf(si, "cop"), rel=1e-6)
    assert perf(ip, "compressor_power") == pytest.approx(perf(si, "compressor_power"), rel=1e-6)
    assert ip["performance"]["mass_flow"]["unit"] == "lb/h"
    assert perf(ip, "mass_flow") == pytest.approx(perf(si, "mass_flow") * 3600 / 0.45359237,
                                                  rel=1e-6)


def test_economized_low_temperature_unit(http):
    r = http.post("/v1/cycle", {
        "refrigerant": "R404A", "circuit": "economized",
        "evaporating": {"temperature": -35}, "condensing": {"temperature": 40},
        "superheat": 5, "subcooling": 2, "economizer": {"type": "subcooler", "approach": 5},
        "compressor": {"isentropic_efficiency": 0.65}, "cooling_capacity": 25,
    })
    assert r.status_code == 200, r.text
    body = r.json()
    labels = [s["label"] for s in body["states"]]
    assert "economizer_vapor_outlet" in labels and "intermediate_injection" in labels
    assert body["performance"]["intermediate_pressure"]["unit"] == "kPa"
    assert abs(perf(body, "energy_balance_residual")) < 1e-6


def test_two_stage_ammonia(http):
    r = http.post("/v1/cycle", {
        "refrigerant": "R717", "circuit": "two_stage",
        "evaporating": {"temperature": -40}, "condensing": {"temperature": 35},
        "cooling_capacity": "100 kW",
    })
    assert r.status_code == 200, r.text
    labels = [s["label"] for s in r.json()["states"]]
    assert labels[1:5] == ["low_stage_suction", "low_stage_discharge", "high_stage_suction",
                           "high_stage_discharge"]


def test_transcritical_pack_with_optimal_pressure(http):
    r = http.post("/v1/cycle", {
        "refrigerant": "R744", "circuit": "transcritical",
        "evaporating": {"temperature": -8}, "superheat": 5,
        "gas_cooler": {"outlet_temperature": 35, "pressure": "optimal"},
        "flash_tank": {"pressure": "40 bar"},
        "compressor": {"isentropic_efficiency": 0.7}, "cooling_capacity": 60,
    })
    assert r.status_code == 200, r.text
    body = r.json()
    # Liao, Zhao and Jakobsen (2000) put the optimum near 89 bar here (from memory): 10 %
    assert body["performance"]["high_side_pressure"]["value"] == pytest.approx(8900, rel=0.10)
    assert "flash_tank_vapor" in [s["label"] for s in body["states"]]


def test_flat_get_for_spreadsheets(http):
    r = http.get("/v1/cycle", refrigerant="R134a", evaporating_temperature=-10,
                 condensing_temperature=40, superheat=5, subcooling=3, isentropic_efficiency=0.7,
                 cooling_capacity=10, select="performance.cop")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/plain")
    assert 2.0 < float(r.text) < 4.0
    csv = http.get("/v1/cycle", refrigerant="R134a", evaporating_temperature=-10,
                   condensing_temperature=40, cooling_capacity=10, format="csv")
    header = csv.text.splitlines()[0]
    assert "performance.cop [1]" in header and "performance.compressor_power [kW]" in header


def test_sweep_over_condensing_temperature(http):
    r = http.post("/v1/cycle/sweep", {
        "cycle": R454B_CHILLER, "vary": "condensing.temperature",
        "start": "30 degC", "stop": "50 degC", "step": 5,
    })
    assert r.status_code == 200, r.text
    rows = r.json()["rows"]
    assert len(rows) == 5
    cops = [row["result"]["performance"]["cop"]["value"] for row in rows]
    assert cops == sorted(cops, reverse=True)


def test_sweep_row_errors_do_not_sink_the_sweep(http):
    r = http.post("/v1/cycle/sweep", {
        "cycle": {"refrigerant": "R744", "evaporating": {"temperature": -5},
                  "condensing": {"temperature": 20}, "cooling_capacity": 10},
        "vary": "condensing.temperature", "values": [20, 25, 35],
    })
    rows = r.json()["rows"]
    assert rows[0]["error"] is None and rows[2]["result"] is None
    assert "transcritical" in rows[2]["error"]["detail"]


def test_sweep_point_limit(http):
    r = http.post("/v1/cycle/sweep", {"cycle": R454B_CHILLER, "vary": "superheat",
                                      "start": 0, "stop": 1000, "step": 0.1})
    assert r.status_code == 422
    assert "limit" in r.json()["detail"]


@pytest.mark.parametrize("change, needle", [
    ({"refrigerant": "R744", "condensing": {"temperature": 35}}, "transcritical"),
    ({"evaporating": {"temperature": 45}}, "colder than condensing"),
    ({"compressor": {"isentropic_efficiency": 1.5}}, "at most 1"),
    ({"superheat": "-3 K"}, "at least 0 K"),
    ({"cooling_capacity": "18 kPa"}, "power"),
    ({"mass_flow": 1}, "exactly one size"),
    ({"circuit": "transcritical"}, "gas_cooler"),
])
def test_cycle_problems(http, change, needle):
    r = http.post("/v1/cycle", {**R454B_CHILLER, **change})
    assert r.status_code == 422, r.text
    assert r.headers["Content-Type"].startswith("application/problem+json")
    assert needle in r.json()["detail"]


def test_warnings_in_meta(http):
    r = http.post("/v1/cycle", {"refrigerant": "R717", "evaporating": {"temperature": -35},
                                "condensing": {"temperature": 40}, "cooling_capacity": 50})
    codes = {w["code"] for w in r.json()["meta"]["warnings"]}
    assert {"discharge_temperature", "pressure_ratio"} <= codes
    message = next(w["message"] for w in r.json()["meta"]["warnings"]
                   if w["code"] == "discharge_temperature")
    assert "degC" in message and "common practice" in message


def test_cycle_with_a_supplier_polynomial_matches_the_compressor_endpoint(http):
    import json
    from pathlib import Path

    example = json.loads((Path(__file__).parents[2] / "examples" /
                          "compressor-polynomial.json").read_text())
    direct = http.post("/v1/compressors/polynomial", example).json()["corrected"]
    r = http.post("/v1/cycle", {
        "refrigerant": example["refrigerant"],
        "evaporating": {"temperature": example["evaporating_temperature"]},
        "condensing": {"temperature": example["condensing_temperature"]},
        "superheat": example["superheat"], "subcooling": example["subcooling"],
        "compressor": {"polynomial": {"basis": example["basis"],
                                      "coefficients": example["coefficients"],
                                      "rating": example["rating"]}},
    })
    assert r.status_code == 200, r.text
    body = r.json()
    assert perf(body, "mass_flow") == pytest.approx(direct["mass_flow"]["value"], rel=1e-6)
    assert perf(body, "compressor_power") == pytest.approx(direct["power"]["value"], rel=1e-6)
    assert perf(body, "cooling_capacity") == pytest.approx(direct["capacity"]["value"], rel=1e-6)
    sized = http.post("/v1/cycle", {**{
        "refrigerant": "R454B", "evaporating": {"temperature": -10},
        "condensing": {"temperature": 45}, "cooling_capacity": 5,
        "compressor": {"polynomial": {"basis": "SI", "coefficients": example["coefficients"],
                                      "rating": example["rating"]}}}})
    assert sized.status_code == 422 and "sets the size" in sized.json()["detail"]
