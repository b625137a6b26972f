"""Datasheet checks: rows computed from the engine pass, each planted error fails its check."""

from __future__ import annotations

import xml.etree.ElementTree as ET
from dataclasses import replace

import pytest

from heatlift.compressor import (
    BTU_PER_HOUR_PER_WATT,
    PolynomialSpec,
    RatingConditions,
    operating_point,
)
from heatlift.csvfile import CsvError, TooManyRows, read_table, write_table
from heatlift.datasheet import DatasheetRow, Tolerances, check_row, validate
from heatlift.errors import InvalidInput
from heatlift.junit import junit_xml
from heatlift.properties import model
from schemas.datasheets import csv_rows, formula_like, load_rows

K = 273.15


def consistent(refrigerant: str = "R134a", te: float = -10.0, tc: float = 45.0,
               superheat: float = 10.0, subcooling: float = 5.0, eta_s: float = 0.65,
               eta_v: float = 0.85, displacement: float = 30.0 / 3600.0) -> DatasheetRow:
    """A row whose claims are computed from the engine's own states at an assumed compressor."""
    op = operating_point(refrigerant, te + K, tc + K, superheat, subcooling)
    mass = eta_v * op.suction.density * displacement
    capacity = mass * op.refrigerating_effect
    power = mass * op.isentropic_work / eta_s
    cop = capacity / power
    return DatasheetRow(
        model="TEST-1", refrigerant=refrigerant, evaporating_temperature=te + K,
        condensing_temperature=tc + K, superheat=superheat, subcooling=subcooling,
        cooling_capacity=capacity, power=power, cop=cop, eer=cop * BTU_PER_HOUR_PER_WATT,
        mass_flow=mass, current=power / 560.0, displacement=displacement,
        pressure_evaporating=op.pressure_evaporating, pressure_condensing=op.pressure_condensing,
    )


def with_polynomial(row: DatasheetRow) -> DatasheetRow:
    """The same row with constant polynomials equal to its claims (SI basis)."""
    def flat(value: float) -> tuple[float, ...]:
        return (value, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)

    assert row.cooling_capacity and row.power and row.mass_flow and row.current
    spec = PolynomialSpec(row.refrigerant, RatingConditions(row.superheat, None, row.subcooling),
                          "SI", capacity=flat(row.cooling_capacity), power=flat(row.power),
                          mass_flow=flat(row.mass_flow), current=flat(row.current))
    return replace(row, polynomial=spec)


def verdicts(report) -> dict[str, str]:  # type: ignore[no-untyped-def]
    return {c.name: c.verdict for c in report.checks}


TOL = Tolerances()


@pytest.mark.parametrize("refrigerant,te,tc", [("R134a", -10, 45), ("R454B", 5, 50),
                                               ("R290", -25, 40), ("R410A", 7.2, 54.4)])
def test_rows_from_the_engine_pass_every_check(refrigerant, te, tc):
    report = check_row(with_polynomial(consistent(refrigerant, te, tc)), 1, TOL)
    assert report.verdict == "pass", [(c.name, c.message) for c in report.checks]
    assert set(verdicts(report)) == {
        "capacity", "carnot", "isentropic_efficiency", "volumetric_efficiency", "cop", "eer",
        "polynomial_capacity", "polynomial_power", "polynomial_mass_flow",
        "polynomial_current", "pressure_evaporating", "pressure_condensing"}
    checks = {c.name: c for c in report.checks}
    assert checks["isentropic_efficiency"].deviation == pytest.approx(0.65, rel=1e-12)
    assert checks["volumetric_efficiency"].deviation == pytest.approx(0.85, rel=1e-12)
    assert checks["capacity"].deviation == pytest.approx(0.0, abs=1e-12)


def only_failing(report) -> set[str]:  # type: ignore[no-untyped-def]
    return {c.name for c in report.checks if c.verdict == "fail"}


def test_planted_capacity_error_fails_check_1_only():
    row = consistent()
    wrong = row.cooling_capacity * 1.10  # type: ignore[operator]
    planted = replace(row, cooling_capacity=wrong, cop=wrong / row.power,  # type: ignore[operator]
                      eer=wrong / row.power * BTU_PER_HOUR_PER_WATT)  # type: ignore[operator]
    report = check_row(planted, 1, TOL)
    assert only_failing(report) == {"capacity"}
    assert report.verdict == "fail"
    check = next(c for c in report.checks if c.name == "capacity")
    assert check.deviation == pytest.approx(0.10, rel=1e-9)
    assert check.number == 1


def test_capacity_tolerances_give_warn_and_can_be_changed():
    row = consistent()
    planted = replace(row, cooling_capacity=row.cooling_capacity * 1.03,  # type: ignore[operator]
                      cop=None, eer=None)
    assert verdicts(check_row(planted, 1, TOL))["capacity"] == "warn"
    loose = Tolerances(capacity_warn=0.04, capacity_fail=0.08)
    assert verdicts(check_row(planted, 1, loose))["capacity"] == "pass"
    tight = Tolerances(capacity_warn=0.01, capacity_fail=0.02)
    assert verdicts(check_row(planted, 1, tight))["capacity"] == "fail"


def test_cop_above_carnot_fails():
    row = replace(consistent(), cooling_capacity=None, power=None, mass_flow=None, eer=None,
                  displacement=None, cop=5.0)  # Carnot of -10/45 degC: 263.15/55 = 4.785
    report = check_row(row, 1, TOL)
    assert only_failing(report) == {"carnot"}
    check = report.checks[0]
    assert check.computed == pytest.approx(263.15 / 55.0, rel=1e-12)
    assert check.deviation == pytest.approx(5.0 / (263.15 / 55.0), rel=1e-12)


def test_power_below_isentropic_power_fails():
    row = consistent()
    low = row.power * 0.65 / 1.0  # type: ignore[operator]  # implied efficiency 1.0
    planted = replace(row, power=low, cop=row.cooling_capacity / low,  # type: ignore[operator]
                      eer=row.cooling_capacity / low * BTU_PER_HOUR_PER_WATT,  # type: ignore[operator]
                      current=None)
    assert only_failing(check_row(planted, 1, TOL)) == {"isentropic_efficiency"}
    # a low efficiency warns, a very low one fails
    assert verdicts(check_row(replace(row, power=row.power * 0.65 / 0.40, cop=None, eer=None),  # type: ignore[operator]
                              1, TOL))["isentropic_efficiency"] == "warn"
    assert verdicts(check_row(replace(row, power=row.power * 0.65 / 0.20, cop=None, eer=None),  # type: ignore[operator]
                              1, TOL))["isentropic_efficiency"] == "fail"


def test_isentropic_efficiency_from_capacity_when_no_mass_flow():
    row = replace(consistent(), mass_flow=None, displacement=None)
    check = next(c for c in check_row(row, 1, TOL).checks if c.name == "isentropic_efficiency")
    assert check.deviation == pytest.approx(0.65, rel=1e-12)
    assert "capacity" in check.message


def test_volumetric_efficiency_above_one_fails():
    row = consistent()
    planted = replace(row, displacement=row.displacement / 1.3)  # type: ignore[operator]
    assert only_failing(check_row(planted, 1, TOL)) == {"volumetric_efficiency"}


def test_eer_and_cop_consistency():
    row = consistent()
    wrong_eer = replace(row, eer=row.cop * 3.6)  # type: ignore[operator]
    assert only_failing(check_row(wrong_eer, 1, TOL)) == {"eer"}
    heating_cop = replace(row, cop=row.cop + 1.0, eer=None)  # type: ignore[operator]
    assert only_failing(check_row(heating_cop, 1, TOL)) == {"cop"}
    # EER without COP is checked against capacity / power
    eer_only = replace(row, cop=None)
    check = next(c for c in check_row(eer_only, 1, TOL).checks if c.name == "eer")
    assert check.computed == pytest.approx(
        BTU_PER_HOUR_PER_WATT * row.cooling_capacity / row.power, rel=1e-12)  # type: ignore[operator]
    assert check.kind == "eer"


def test_polynomial_slip_fails_check_4():
    row = with_polynomial(consistent())
    spec = row.polynomial
    assert spec is not None and spec.power is not None
    slipped = replace(spec, power=(spec.power[0] * 10, *spec.power[1:]))
    report = check_row(replace(row, polynomial=slipped), 1, TOL)
    assert only_failing(report) == {"polynomial_power"}
    check = next(c for c in report.checks if c.name == "polynomial_power")
    assert check.deviation == pytest.approx(0.1 - 1.0, rel=1e-9)
    assert check.number == 4


def test_pressure_checks_and_their_hints():
    row = consistent()
    gauge = replace(row, pressure_condensing=row.pressure_condensing - 101_325.0)  # type: ignore[operator]
    report = check_row(gauge, 1, TOL)
    assert only_failing(report) == {"pressure_condensing"}
    assert "gauge" in next(c for c in report.checks if c.name == "pressure_condensing").message
    blend = consistent("R454B", -10, 45)
    bubble = model("R454B").saturated_at_temperature(-10 + K, 0.0).pressure
    report = check_row(replace(blend, pressure_evaporating=bubble), 1, TOL)
    assert only_failing(report) == {"pressure_evaporating"}
    assert "bubble" in next(c for c in report.checks if c.name == "pressure_evaporating").message


def test_input_errors_fail_the_row_only():
    rows = [consistent(), replace(consistent(), refrigerant="R999"),
            replace(consistent(), evaporating_temperature=60 + K),
            DatasheetRow("EMPTY", "R134a", -10 + K, 45 + K, 0.0, superheat=10.0)]
    result = validate(rows)
    assert [r.verdict for r in result.rows] == ["pass", "fail", "fail", "warn"]
    assert result.rows[1].checks[0].name == "input"
    assert "refrigerant" in result.rows[1].checks[0].message
    assert result.rows[3].checks[0].name == "claims"
    s = result.summary
    assert (s.rows, s.passed, s.warned, s.failed, s.verdict) == (4, 1, 1, 2, "fail")


def test_return_gas_temperature_row():
    row = consistent(superheat=28.3)
    as_return_gas = replace(row, superheat=None, return_gas_temperature=-10 + K + 28.3)
    assert check_row(as_return_gas, 1, TOL).verdict == "pass"
    below = replace(as_return_gas, return_gas_temperature=-20 + K)
    assert check_row(below, 1, TOL).checks[0].name == "input"


def test_tolerance_order_is_checked():
    with pytest.raises(InvalidInput):
        validate([consistent()], Tolerances(capacity_warn=0.1, capacity_fail=0.05))
    with pytest.raises(InvalidInput):
        validate([consistent()], Tolerances(isentropic_low_warn=0.9))
    with pytest.raises(InvalidInput):
        validate([consistent()], Tolerances(cop_fail=0.0))


# -- reading CSV ---------------------------------------------------------------------------------

CSV = "\n".join([
    "# an invented test sheet",
    "model,refrigerant,evaporating_temperature [degC],condensing_temperature [degC],"
    "superheat [K],subcooling,cooling_capacity [kW],mass_flow [kg/h],pressure_condensing [bar],"
    "coefficients.power",
    'A-1,R134a,-10,45,10,5,7.24,180.0,"11.6",1;2;3;4;5;6;7;8;9;10',
    "",
    "# a comment between rows",
    "A-2,R134a,-10,45,10,5 K,abc,180,11.6 bar,",
    "",
])


def test_csv_rows_read_units_from_the_header():
    rows = csv_rows(CSV, 100)
    assert [line for line, _ in rows] == [3, 6]
    first = rows[0][1]
    assert first["cooling_capacity"] == {"value": 7.24, "unit": "kW"}
    assert first["subcooling"] == 5.0  # no unit in the header: the request's units
    assert first["coefficients"] == {"power": [str(i) for i in range(1, 11)]}
    assert rows[1][1]["pressure_condensing"] == "11.6 bar"
    loaded = load_rows(rows)
    assert isinstance(loaded[0], DatasheetRow)
    assert loaded[0].cooling_capacity == pytest.approx(7240.0)
    assert loaded[0].mass_flow == pytest.approx(0.05)
    assert loaded[0].pressure_condensing == pytest.approx(1.16e6)
    assert loaded[0].line == 3
    failed = loaded[1]
    assert not isinstance(failed, DatasheetRow)
    assert failed.verdict == "fail" and "cooling_capacity" in failed.checks[0].message


def test_semicolon_csv_with_decimal_commas():
    text = ("model;refrigerant;evaporating_temperature [degC];condensing_temperature [degC];"
            "superheat [K];subcooling [K];cop\nB-1;R290;-10,5;45;10;0;2,45\n")
    rows = csv_rows(text, 10)
    assert rows[0][1]["evaporating_temperature"] == {"value": -10.5, "unit": "degC"}
    assert rows[0][1]["cop"] == 2.45


@pytest.mark.parametrize("header,error", [
    ("model,refrigerant,cooling capacity [kPa]", "not a unit of power"),
    ("model,refrigerant,capacity", "unknown column"),
    ("model,model", "appears twice"),
    ("model,eer [W/W]", "Btu/Wh"),
    ("model [kW]", "takes no unit"),
    ("=cmd|calc,model", "formula"),
])
def test_csv_header_faults(header, error):
    from marshmallow import ValidationError

    with pytest.raises(ValidationError) as exc:
        csv_rows(header + "\n" + ",".join(["x"] * len(header.split(","))) + "\n", 10)
    assert error in str(exc.value.messages)


def test_formula_like_cells():
    assert all(formula_like(t) for t in ("=1+2", "@SUM(A1)", "+cmd", "-cmd", "\tx", " =x"))
    assert not any(formula_like(t) for t in ("-10", "+5.5", "-.5", "R134a", "KX-2"))


def test_csv_limits_and_faults():
    header = "model,refrigerant\n"
    with pytest.raises(TooManyRows) as exc:
        read_table(header + "a,R134a\n" * 11, max_rows=10)
    assert exc.value.limit == 10
    assert len(read_table(header + "a,R134a\n" * 10, max_rows=10).records) == 10
    with pytest.raises(CsvError):
        read_table(header + "a,R134a,extra\n")
    with pytest.raises(CsvError):
        read_table("# only a comment\n")
    with pytest.raises(CsvError):
        read_table('model\n"unterminated\n', None)


def test_write_table_round_trip():
    table = read_table('model;notes\n"a;b";"x ""y"""\n')
    text = write_table(table.delimiter, table.header, [c for _, c in table.records])
    assert read_table(text).records[0][1] == ["a;b", 'x "y"']


def test_junit_counts_failures_and_cleans_text():
    rows = [
        {"row": 1, "model": "A\x01", "refrigerant": "R134a", "verdict": "pass", "checks": []},
        {"row": 2, "model": "B <&>", "refrigerant": "R134a", "verdict": "fail", "checks": [
            {"name": "capacity", "number": 1, "verdict": "fail", "message": "off by 10 %"}]},
        {"row": 3, "model": "C", "refrigerant": None, "verdict": "warn", "checks": [
            {"name": "claims", "number": 0, "verdict": "warn", "message": "nothing"}]},
    ]
    root = ET.fromstring(junit_xml(rows))
    assert root.get("tests") == "3" and root.get("failures") == "1"
    cases = root.findall("./testsuite/testcase")
    assert [c.get("name") for c in cases] == ["row 1: A\ufffd", "row 2: B <&>", "row 3: C"]
    failure = cases[1].find("failure")
    assert failure is not None and failure.get("type") == "capacity"
    assert "off by 10 %" in (failure.get("message") or "")
    assert cases[2].find("failure") is None and cases[2].find("system-out") is not None


def test_fast_check_rendering_equals_the_schema_dump():
    from schemas.datasheets import DatasheetCheckSchema, render_check
    from schemas.fields import current_units, using_units
    from schemas.units import UnitContext

    row = with_polynomial(consistent("R454B", -10, 45))
    checks = [*check_row(row, 1, TOL).checks,
              *check_row(replace(row, refrigerant="R999"), 2, TOL).checks]
    for ctx in (UnitContext(), UnitContext("IP", {"pressure": "bar"})):
        with using_units(ctx):
            schema = DatasheetCheckSchema()
            for check in checks:
                assert render_check(check, current_units()) == schema.dump(check)
