"""Compressor polynomial, superheat conversion and EER factor against sources outside the engine.

Sources, beside each check:
- the 10-coefficient polynomial and its term order: AHRI Standard 540 and EN 12900
  (X = C1 + C2 S + C3 D + C4 S^2 + C5 S D + C6 D^2 + C7 S^3 + C8 D S^2 + C9 S D^2 + C10 D^3),
  from memory; evaluated here by hand, term by term;
- the conversion to another superheat: mass flow in proportion to the suction density (the
  standards' method), capacity = mass flow x (h1 - h4); power in proportion to mass flow and
  isentropic enthalpy rise (Dabiri and Rice (1981), "A compressor simulation model with
  corrections for the level of suction gas superheat", ASHRAE Transactions 87, with their
  factor F = 1), from memory; the formula is written out below with states taken from
  CoolProp's high-level PropsSI interface, outside heatlift's property layer;
- the Btu: the International Table Btu from the IT calorie (4.1868 J), the pound
  (0.45359237 kg, international yard and pound agreement of 1959) and 1 degF = 5/9 K, so
  1 W = 3.412142 Btu/h; from memory, and exact by those definitions.
"""

from __future__ import annotations

import pytest
from CoolProp.CoolProp import PropsSI

from heatlift.compressor import (
    BTU_PER_HOUR_PER_WATT,
    PolynomialSpec,
    RatingConditions,
    evaluate_polynomial,
    polynomial_values,
)
from heatlift.datasheet import DatasheetRow, Tolerances, check_row

K = 273.15
# an invented coefficient set (not a real compressor's), SI basis: degC in, W out
C = (21000.0, 640.0, -140.0, 9.0, -3.0, 0.25, 0.04, -0.05, -0.02, -0.006)


def test_polynomial_by_hand_si():
    s, d = -10.0, 45.0
    terms = [
        21000.0,                    # C1
        640.0 * (-10.0),            # C2 S       = -6400
        -140.0 * 45.0,              # C3 D       = -6300
        9.0 * 100.0,                # C4 S^2     = 900
        -3.0 * (-450.0),            # C5 S D     = 1350
        0.25 * 2025.0,              # C6 D^2     = 506.25
        0.04 * (-1000.0),           # C7 S^3     = -40
        -0.05 * 45.0 * 100.0,       # C8 D S^2   = -225
        -0.02 * (-10.0) * 2025.0,   # C9 S D^2   = 405
        -0.006 * 91125.0,           # C10 D^3    = -546.75
    ]
    assert sum(terms) == pytest.approx(10649.5, abs=1e-9)  # the sum by hand
    spec = PolynomialSpec("R134a", RatingConditions(10.0), "SI", capacity=C)
    value = polynomial_values(spec, s + K, d + K)["capacity"]
    assert value == pytest.approx(10649.5, rel=1e-12)


def test_polynomial_by_hand_ip():
    # the same coefficients read in the IP basis: -10 degC = 14 degF, 45 degC = 113 degF,
    # result in Btu/h, 1 Btu/h = 1055.05585262 / 3600 W = 0.29307107 W
    s, d = 14.0, 113.0
    by_hand = (21000.0 + 640.0 * s - 140.0 * d + 9.0 * s * s - 3.0 * s * d + 0.25 * d * d
               + 0.04 * s ** 3 - 0.05 * d * s * s - 0.02 * s * d * d - 0.006 * d ** 3)
    spec = PolynomialSpec("R134a", RatingConditions(10.0), "IP", capacity=C)
    value = polynomial_values(spec, -10.0 + K, 45.0 + K)["capacity"]
    assert value == pytest.approx(by_hand * 1055.05585262 / 3600.0, rel=1e-9)
    assert 1055.05585262 / 3600.0 == pytest.approx(0.29307107, rel=1e-8)


def _states(te: float, tc: float, superheat: float, subcooling: float) -> dict[str, float]:
    """R134a states by PropsSI (dew pressures, suction at te + superheat, liquid subcooled)."""
    fluid = "R134a"
    p_e = PropsSI("P", "T", te, "Q", 1, fluid)
    p_c = PropsSI("P", "T", tc, "Q", 1, fluid)
    t1 = te + superheat
    h1 = PropsSI("H", "T", t1, "P", p_e, fluid)
    s1 = PropsSI("S", "T", t1, "P", p_e, fluid)
    rho1 = PropsSI("D", "T", t1, "P", p_e, fluid)
    t_bubble = PropsSI("T", "P", p_c, "Q", 0, fluid)
    h4 = (PropsSI("H", "P", p_c, "Q", 0, fluid) if subcooling == 0
          else PropsSI("H", "T", t_bubble - subcooling, "P", p_c, fluid))
    h2s = PropsSI("H", "P", p_c, "S", s1, fluid)
    return {"h1": h1, "rho1": rho1, "h4": h4, "h2s": h2s}


def test_superheat_and_subcooling_conversion_formula():
    mass = (0.06, 0.0019, -0.00025, 0.00002, 0, 0, 0, 0, 0, 0)   # kg/s, invented
    power = (1800.0, -25.0, 50.0, 0.1, 0.2, 0.3, 0, 0, 0, 0)       # W, invented
    current = (3.5, -0.02, 0.09, 0, 0, 0, 0, 0, 0, 0)              # A, invented
    spec = PolynomialSpec("R134a", RatingConditions(superheat=10.0, subcooling=0.0), "SI",
                          power=power, mass_flow=mass, current=current)
    te, tc = -10.0 + K, 45.0 + K
    result = evaluate_polynomial(spec, te, tc, 20.0, 5.0)

    s, d = -10.0, 45.0
    m_r = 0.06 + 0.0019 * s - 0.00025 * d + 0.00002 * s * s
    p_r = 1800.0 - 25.0 * s + 50.0 * d + 0.1 * s * s + 0.2 * s * d + 0.3 * d * d
    i_r = 3.5 - 0.02 * s + 0.09 * d
    rated = _states(te, tc, 10.0, 0.0)
    actual = _states(te, tc, 20.0, 5.0)
    # the conversion, written out
    m_a = m_r * actual["rho1"] / rated["rho1"]
    q_a = m_a * (actual["h1"] - actual["h4"])
    p_a = p_r * (m_a / m_r) * (actual["h2s"] - actual["h1"]) / (rated["h2s"] - rated["h1"])
    i_a = i_r * p_a / p_r
    eta_s = m_r * (rated["h2s"] - rated["h1"]) / p_r

    assert result.rating.mass_flow == pytest.approx(m_r, rel=1e-12)
    assert result.rating.power == pytest.approx(p_r, rel=1e-12)
    assert result.rating.capacity == pytest.approx(m_r * (rated["h1"] - rated["h4"]), rel=1e-7)
    assert result.corrected.mass_flow == pytest.approx(m_a, rel=1e-7)
    assert result.corrected.capacity == pytest.approx(q_a, rel=1e-7)
    assert result.corrected.power == pytest.approx(p_a, rel=1e-7)
    assert result.corrected.current == pytest.approx(i_a, rel=1e-7)
    assert result.corrected.cop == pytest.approx(q_a / p_a, rel=1e-7)
    assert result.rating.isentropic_efficiency == pytest.approx(eta_s, rel=1e-7)
    assert result.corrected.isentropic_efficiency == pytest.approx(eta_s, rel=1e-7)


def test_eer_factor_from_the_unit_definitions():
    btu_it = 4.1868 * 453.59237 * 5.0 / 9.0      # J: IT calorie x pound (in g) x 5/9
    assert btu_it == pytest.approx(1055.05585262, rel=1e-12)
    factor = 3600.0 / btu_it                       # Btu/h in one W
    assert BTU_PER_HOUR_PER_WATT == pytest.approx(factor, rel=1e-12)
    assert factor == pytest.approx(3.412142, abs=5e-7)
    # the datasheet check uses it: EER = 3.412142 x COP passes with no deviation
    row = DatasheetRow("REF", "R134a", -10 + K, 45 + K, 0.0, superheat=10.0, cop=2.5,
                       eer=2.5 * factor)
    eer = next(c for c in check_row(row, 1, Tolerances()).checks if c.name == "eer")
    assert eer.verdict == "pass" and eer.deviation == pytest.approx(0.0, abs=1e-12)
    # an EER formed with 3.6 (kJ per Wh) instead is 5.5 % off and fails
    wrong = DatasheetRow("REF", "R134a", -10 + K, 45 + K, 0.0, superheat=10.0, cop=2.5,
                         eer=2.5 * 3.6)
    eer = next(c for c in check_row(wrong, 1, Tolerances()).checks if c.name == "eer")
    assert eer.verdict == "fail"
    assert eer.deviation == pytest.approx(3.6 / factor - 1.0, rel=1e-12)
