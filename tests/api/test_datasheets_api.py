"""POST /v1/datasheets/validate over real HTTP: JSON and CSV in; JSON, CSV and JUnit out."""

from __future__ import annotations

import csv
import io
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from heatlift.compressor import BTU_PER_HOUR_PER_WATT, operating_point

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "datasheets.csv"
EXPECTED = ROOT / "examples" / "datasheets-expected.csv"
PATH = "/v1/datasheets/validate"
K = 273.15


def expected() -> list[dict[str, str]]:
    lines = [line for line in EXPECTED.read_text("utf-8").splitlines()
             if not line.startswith("#")]
    return list(csv.DictReader(lines))


def engine_row(model: str = "T-1", te: float = -10.0, tc: float = 45.0, eta_s: float = 0.65,
               mass: float = 0.05) -> dict:
    """A JSON row (SI request units) computed from the engine's own states."""
    op = operating_point("R134a", te + K, tc + K, 10.0, 5.0)
    capacity = mass * op.refrigerating_effect
    power = mass * op.isentropic_work / eta_s
    return {"model": model, "refrigerant": "R134a", "evaporating_temperature": te,
            "condensing_temperature": tc, "superheat": 10, "subcooling": 5,
            "cooling_capacity": capacity / 1e3, "power": power / 1e3, "cop": capacity / power,
            "eer": capacity / power * BTU_PER_HOUR_PER_WATT, "mass_flow": mass,
            "pressure_evaporating": op.pressure_evaporating / 1e3}


def post_csv(http, text: str, **params):  # type: ignore[no-untyped-def]
    return http.session.post(http.base + PATH, data=text.encode("utf-8"), params=params,
                             headers={"Content-Type": "text/csv"}, timeout=60)


def test_json_rows_in_json_out(http):
    wrong = {**engine_row("T-2"), "cooling_capacity": engine_row()["cooling_capacity"] * 1.1}
    wrong.pop("cop"), wrong.pop("eer")
    r = http.post(PATH, [engine_row(), wrong])
    assert r.status_code == 200, r.text
    out = r.json()
    assert out["summary"] == {"rows": 2, "pass": 1, "warn": 0, "fail": 1, "verdict": "fail"}
    assert [row["verdict"] for row in out["rows"]] == ["pass", "fail"]
    failing = [c for c in out["rows"][1]["checks"] if c["verdict"] == "fail"]
    assert [c["name"] for c in failing] == ["capacity"]
    assert failing[0]["claimed"]["unit"] == "kW"
    assert failing[0]["deviation"] == {"value": pytest.approx(0.1, rel=1e-9), "unit": "1"}
    assert failing[0]["tolerance"] == {"warn": 0.02, "fail": 0.05}
    assert out["meta"]["engine"].startswith("heatlift")


def test_object_body_with_tolerances_and_units(http):
    wrong = {**engine_row("T-2"), "cooling_capacity": engine_row()["cooling_capacity"] * 1.06}
    wrong.pop("cop"), wrong.pop("eer")
    r = http.post(PATH, {"rows": [wrong], "tolerances": {"capacity_fail": "8 %"}})
    assert r.status_code == 200, r.text
    assert r.json()["rows"][0]["verdict"] == "warn"
    assert r.json()["tolerances"]["capacity_fail"] == pytest.approx(0.08)
    # the same tolerance in the query string
    r = http.post(PATH + "?capacity_fail=0.08", [wrong])
    assert r.json()["rows"][0]["verdict"] == "warn"
    # the same row with its units written out, answered in IP
    r = http.post(PATH, {"rows": [{**wrong, "evaporating_temperature": "-10 degC",
                                   "condensing_temperature": "45 degC",
                                   "superheat": "10 K", "subcooling": "5 K",
                                   "cooling_capacity": f"{wrong['cooling_capacity']} kW",
                                   "power": f"{wrong['power']} kW",
                                   "mass_flow": "0.05 kg/s",
                                   "pressure_evaporating": f"{wrong['pressure_evaporating']} kPa"
                                   }], "units": "IP"})
    assert r.status_code == 200, r.text
    row = r.json()["rows"][0]
    assert row["verdict"] == "fail"  # default tolerances again: 6 % is beyond 5 %
    check = row["checks"][0]
    assert check["name"] == "capacity"
    assert check["claimed"]["unit"] == "Btu/h"
    assert check["deviation"]["value"] == pytest.approx(0.06, rel=1e-9)
    assert "Btu/h" in check["message"]


def test_bad_tolerances_are_422(http):
    r = http.post(PATH + "?capacity_warn=0.2&capacity_fail=0.1", [engine_row()])
    assert r.status_code == 422
    assert "capacity_warn" in r.json()["detail"]
    r = http.post(PATH + "?capacity_fail=-1", [engine_row()])
    assert r.status_code == 422


def test_example_csv_gives_the_expected_verdicts(http):
    r = post_csv(http, EXAMPLE.read_text("utf-8"))
    assert r.status_code == 200, r.text
    rows = r.json()["rows"]
    wanted = expected()
    assert len(rows) == len(wanted) == 25
    for got, want in zip(rows, wanted, strict=True):
        assert got["model"] == want["model"]
        assert got["verdict"] == want["verdict"], (got["row"], got["checks"])
        bad = {c["name"] for c in got["checks"] if c["verdict"] != "pass"}
        assert bad == set(filter(None, want["checks"].split(";"))), (got["row"], bad)
    assert rows[0]["line"] == 4  # two comment lines, then the header


def test_a_report_of_several_parts_is_the_rows_reports_in_order(http):
    """JSON reports are written PART_ROWS rows at a time: 25 example rows repeated past three
    parts give each row the report of its original, numbered in order, and the summary
    counts every part's rows."""
    from api.routes.datasheets import PART_ROWS

    lines = [line for line in EXAMPLE.read_text("utf-8").splitlines()
             if not line.startswith("#")]
    header, data = lines[0], lines[1:]
    count = 2 * PART_ROWS + 37
    r = post_csv(http, "\n".join([header] + [data[k % len(data)] for k in range(count)]))
    assert r.status_code == 200, r.text
    out = r.json()
    alone = post_csv(http, EXAMPLE.read_text("utf-8")).json()["rows"]
    assert [row["row"] for row in out["rows"]] == list(range(1, count + 1))
    for k, row in enumerate(out["rows"]):
        original = alone[k % len(data)]
        assert {**row, "row": 0, "line": 0} == {**original, "row": 0, "line": 0}, k
    verdicts = [row["verdict"] for row in out["rows"]]
    assert out["summary"] == {"rows": count, "pass": verdicts.count("pass"),
                              "warn": verdicts.count("warn"), "fail": verdicts.count("fail"),
                              "verdict": "fail" if "fail" in verdicts else "warn"}
    assert list(out) == ["summary", "tolerances", "rows", "meta"]
    assert out["tolerances"]["capacity_warn"] == 0.02


def test_csv_out_has_units_in_the_header(http):
    r = post_csv(http, EXAMPLE.read_text("utf-8"), format="csv")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/csv")
    table = list(csv.DictReader(io.StringIO(r.text)))
    assert len(table) == 25
    assert "capacity.claimed [kW]" in table[0]
    assert table[14]["capacity.verdict"] == "fail"
    assert [t["verdict"] for t in table] == [w["verdict"] for w in expected()]
    # the Accept header asks for the same
    r2 = post_csv(http, EXAMPLE.read_text("utf-8"))
    r3 = http.session.post(http.base + PATH, data=EXAMPLE.read_bytes(), timeout=60,
                           headers={"Content-Type": "text/csv", "Accept": "text/csv"})
    assert r2.headers["Content-Type"].startswith("application/json")
    assert r3.headers["Content-Type"].startswith("text/csv")


def test_csv_out_neutralises_formula_like_text(http):
    # a model name that begins like a signed number passes the input check, but a spreadsheet
    # would still run "+44 KX" as a formula: the CSV writes it with a leading apostrophe
    r = http.post(PATH + "?format=csv", [engine_row("+44 KX"), engine_row("-5 LT")])
    assert r.status_code == 200
    models = [record["model"] for record in csv.DictReader(io.StringIO(r.text))]
    assert models == ["'+44 KX", "'-5 LT"]
    # formula text proper is refused at the door
    r = http.post(PATH + "?format=csv", [engine_row("=1+2")])
    assert r.status_code == 422 and "formula" in r.json()["detail"]


def test_junit_out_parses_and_counts_failures(http):
    r = post_csv(http, EXAMPLE.read_text("utf-8"), format="junit")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("application/xml")
    root = ET.fromstring(r.content)
    wanted = expected()
    failures = sum(1 for w in wanted if w["verdict"] == "fail")
    assert root.get("tests") == "25" and root.get("failures") == str(failures)
    cases = root.findall("./testsuite/testcase")
    assert len(cases) == 25
    failed = [c for c in cases if c.find("failure") is not None]
    assert len(failed) == failures
    assert {c.get("name") for c in failed} == {
        f"row {w['row']}: {w['model']}" for w in wanted if w["verdict"] == "fail"}
    capacity = next(c for c in failed if c.get("name") == "row 15: KSC-045")
    assert capacity.find("failure").get("type") == "capacity"  # type: ignore[union-attr]
    r = http.session.post(http.base + PATH, data=EXAMPLE.read_bytes(), timeout=60,
                          headers={"Content-Type": "text/csv", "Accept": "application/xml"})
    assert ET.fromstring(r.content).get("failures") == str(failures)


def test_row_limit_is_413_naming_it(http):
    header = "model,refrigerant,evaporating_temperature,condensing_temperature,superheat," \
             "subcooling\n"
    text = header + "A,R134a,-10,45,10,5\n" * 10_001
    r = post_csv(http, text)
    assert r.status_code == 413
    assert r.headers["Content-Type"].startswith("application/problem+json")
    assert "10000" in r.json()["detail"]
    r = http.post(PATH, [engine_row()] * 10_001)
    assert r.status_code == 413


@pytest.mark.parametrize("text,status,words", [
    ("model,refrigerant,capacity [kW]\nA,R134a,1\n", 422, "unknown column"),
    ("model,cooling_capacity [psi]\nA,1\n", 422, "not a unit of power"),
    ("model,refrigerant\n=HYPERLINK(\"x\"),R134a\n", 422, "formula"),
    ("model,refrigerant\n@SUM(A1),R134a\n", 422, "formula"),
    ("model,refrigerant\n", 422, "no rows"),
    ('model,refrigerant\n"A,R134a\n', 400, "CSV"),
    ("model,refrigerant\nA,R134a,x,y\n", 400, "cells"),
])
def test_csv_faults(http, text, status, words):
    r = post_csv(http, text)
    assert r.status_code == status, r.text
    assert r.headers["Content-Type"].startswith("application/problem+json")
    assert words in r.text


def test_body_faults(http):
    r = http.session.post(http.base + PATH, data=b"\xff\xfe\x00", timeout=60,
                          headers={"Content-Type": "text/csv"})
    assert r.status_code == 400 and "UTF-8" in r.json()["detail"]
    r = http.session.post(http.base + PATH, data="a,b", timeout=60,
                          headers={"Content-Type": "text/plain"})
    assert r.status_code == 415
    r = http.post(PATH, {"nothing": 1})
    assert r.status_code == 422
    r = http.post(PATH, [1, 2])
    assert r.status_code == 422 and "rows.0" in r.json()["errors"]
    r = http.post(PATH, [{**engine_row(), "colour": "red"}])
    assert r.status_code == 422 and "colour" in r.json()["detail"]
    r = http.post(PATH, [])
    assert r.status_code == 422
    r = http.post(PATH + "?format=pdf", [engine_row()])
    assert r.status_code == 422


def test_unreadable_values_fail_their_row_only(http):
    rows = [engine_row(), {**engine_row("T-2"), "cooling_capacity": "lots"},
            {**engine_row("T-3"), "refrigerant": "R134z"}, {"model": "T-4"}]
    r = http.post(PATH, rows)
    assert r.status_code == 200, r.text
    out = r.json()["rows"]
    assert [row["verdict"] for row in out] == ["pass", "fail", "fail", "fail"]
    assert all(row["checks"][0]["name"] == "input" for row in out[1:])
    assert "cooling_capacity" in out[1]["checks"][0]["message"]
    assert "R134a" in out[2]["checks"][0]["message"]  # close match offered
    assert "refrigerant" in out[3]["checks"][0]["message"]
