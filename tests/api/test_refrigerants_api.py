"""GET /v1/refrigerants and /v1/refrigerants/{designation} over real HTTP."""

from __future__ import annotations

import csv
import io

import pytest

from tests.api.problem import assert_problem

CONTRACT_FIELDS = {"designation", "kind", "composition", "safety_class", "gwp100",
                   "critical_temperature", "critical_pressure", "normal_boiling_point",
                   "lower_flammability_limit"}


def test_catalogue_lists_every_entry_with_the_contract_fields(http):
    r = http.get("/v1/refrigerants")
    assert r.status_code == 200, r.text
    body = r.json()
    entries = {e["designation"]: e for e in body["refrigerants"]}
    for name in ("R32", "R134a", "R290", "R717", "R744", "R718", "R22", "R404A", "R410A",
                 "R448A", "R454B", "R455A", "R513A", "R1234ze(E)"):
        assert name in entries, name
    for entry in entries.values():
        assert CONTRACT_FIELDS <= set(entry), entry["designation"]
        assert set(entry["gwp100"]) == {"AR4", "AR5", "AR6"}
        assert entry["kind"] in ("pure", "azeotrope", "zeotrope")
        assert sum(entry["composition"].values()) == pytest.approx(1.0, abs=1e-9)
        assert entry["critical_temperature"]["unit"] == "degC"
        assert entry["critical_pressure"]["unit"] == "kPa"
    assert body["meta"]["engine"].startswith("heatlift ")
    assert body["meta"]["property_library"].startswith("CoolProp ")


def test_one_entry_canonical_and_case_insensitive(http):
    r = http.get("/v1/refrigerants/r-454b")
    assert r.status_code == 200, r.text
    body = r.json()
    assert body["designation"] == "R454B"
    assert body["kind"] == "zeotrope"
    assert body["composition"] == {"R32": pytest.approx(0.689), "R1234yf": pytest.approx(0.311)}
    assert body["safety_class"] == "A2L"
    assert body["lower_flammability_limit"]["unit"] == "kg/m^3"
    # a flammable refrigerant carries the caution of the safety rules
    assert "licensed practitioner" in body["caution"]


def test_entry_in_ip_units(http):
    body = http.get("/v1/refrigerants/R134a", units="IP").json()
    # R134a critical point 374.21 K = 213.9 degF (NIST reference data, from memory)
    assert body["critical_temperature"] == {"value": pytest.approx(213.9, abs=0.5),
                                            "unit": "degF"}
    assert body["critical_pressure"]["unit"] == "psi"
    # normal boiling point -26.07 degC = -14.9 degF (NIST reference data, from memory)
    assert body["normal_boiling_point"]["value"] == pytest.approx(-14.9, abs=0.5)


def test_r744_has_no_normal_boiling_point(http):
    body = http.get("/v1/refrigerants/R744").json()
    assert body["normal_boiling_point"] is None  # CO2 sublimes at 1 atm
    assert body["lower_flammability_limit"] is None
    assert body["caution"] is None


def test_unknown_designation_suggests_close_matches(http):
    body = assert_problem(http.get("/v1/refrigerants/R134"), 404)
    assert "R134a" in body["suggestions"]
    assert "R134a" in body["detail"]


def test_unknown_designation_with_braces_is_still_a_404(http):
    assert_problem(http.get("/v1/refrigerants/R{0}x}"), 404)


def test_catalogue_as_csv_has_one_column_per_quantity(http):
    r = http.get("/v1/refrigerants", format="csv")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/csv")
    rows = list(csv.DictReader(io.StringIO(r.text)))
    header = list(rows[0])
    assert "lower_flammability_limit [kg/m^3]" in header
    assert "lower_flammability_limit" not in header  # nulls share the column of the values
    by_name = {row["designation"]: row for row in rows}
    assert by_name["R744"]["normal_boiling_point [degC]"] == ""
    assert float(by_name["R290"]["lower_flammability_limit [kg/m^3]"]) > 0


def test_select_one_value(http):
    r = http.get("/v1/refrigerants/R744", select="critical_pressure", units="IP")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/plain")
    # 7.3773 MPa = 1070.0 psi (Span and Wagner 1996, from memory; 0.5 %)
    assert float(r.text) == pytest.approx(1070.0, rel=5e-3)
