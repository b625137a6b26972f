"""Cycle results against sources outside the engine.

- The ideal cycle (isentropic compression, saturated vapour at the suction, saturated liquid at
  the condenser outlet) computed here independently: for water (R718) from the iapws package
  (IAPWS-95, an independent implementation), for R134a from CoolProp's high-level PropsSI
  interface (same equation of state, independent code path from the engine's state objects).
- The optimal gas-cooler pressure of a transcritical R744 cycle against the correlation of
  Liao, Zhao and Jakobsen (2000), Applied Thermal Engineering 20, 831-841:
  p_opt [bar] = (2.778 - 0.0157 t_e) t_gc + (0.381 t_e - 9.34), t in degC (formula from
  memory). The authors fitted it to their own cycle model, whose compressor efficiency depends
  on the pressure ratio; with a constant efficiency we expect agreement within 5 %.
- The COP gain of economised and two-stage circuits over single stage at a high pressure ratio:
  common practice, no source: some 10 to 30 % for low-temperature HFC duty, and far less at a
  low pressure ratio.
"""

import CoolProp.CoolProp as CP
import pytest
from iapws import IAPWS95

from heatlift.cycle import CompressorSpec, CycleSpec, GasCoolerSpec, SaturationSpec, solve

C = 273.15


def ideal(refrigerant, te, tc, **kw):
    return solve(CycleSpec(
        refrigerant=refrigerant,
        evaporating=SaturationSpec(temperature=te + C),
        condensing=SaturationSpec(temperature=tc + C),
        superheat=0.0, subcooling=0.0,
        compressor=CompressorSpec(isentropic_efficiency=1.0),
        mass_flow=1.0, **kw,
    ))


@pytest.mark.parametrize("te, tc", [(5.0, 35.0), (10.0, 45.0)])
def test_ideal_water_cycle_against_iapws95(te, tc):
    vapour = IAPWS95(T=te + C, x=1)
    liquid = IAPWS95(T=tc + C, x=0)
    discharge = IAPWS95(P=liquid.P, s=vapour.s)  # MPa, kJ/kg/K
    cop = (vapour.h - liquid.h) / (discharge.h - vapour.h)
    r = ideal("R718", te, tc)
    # iapws and CoolProp both implement IAPWS-95; 1e-4 allows for their solvers' tolerances
    assert r.performance.cop == pytest.approx(cop, rel=1e-4)
    assert r.performance.discharge_temperature == pytest.approx(discharge.T, abs=0.05)


def test_ideal_r134a_cycle_against_propssi():
    te, tc = -10.0 + C, 40.0 + C
    h1 = CP.PropsSI("H", "T", te, "Q", 1, "R134a")
    s1 = CP.PropsSI("S", "T", te, "Q", 1, "R134a")
    pc = CP.PropsSI("P", "T", tc, "Q", 0, "R134a")
    h2 = CP.PropsSI("H", "P", pc, "S", s1, "R134a")
    h3 = CP.PropsSI("H", "T", tc, "Q", 0, "R134a")
    r = ideal("R134a", -10.0, 40.0)
    assert r.performance.cop == pytest.approx((h1 - h3) / (h2 - h1), rel=1e-6)
    assert r.performance.compressor_power == pytest.approx(h2 - h1, rel=1e-6)
    assert r.performance.cop_carnot == pytest.approx(te / (tc - te), rel=1e-9)


def liao_optimal_pressure(te: float, tgc: float) -> float:
    """Liao, Zhao and Jakobsen (2000), [bar] with t in degC (from memory)."""
    return (2.778 - 0.0157 * te) * tgc + (0.381 * te - 9.34)


@pytest.mark.parametrize("te, tgc", [(-10.0, 35.0), (0.0, 40.0), (5.0, 45.0), (-5.0, 32.0)])
def test_r744_optimal_pressure_against_liao(te, tgc):
    r = solve(CycleSpec(
        refrigerant="R744", circuit="transcritical",
        evaporating=SaturationSpec(temperature=te + C),
        gas_cooler=GasCoolerSpec(tgc + C, None),
        superheat=0.0, subcooling=0.0,
        compressor=CompressorSpec(isentropic_efficiency=0.75),
        cooling_capacity=10e3,
    ))
    expected = liao_optimal_pressure(te, tgc) * 1e5
    assert r.performance.high_side_pressure == pytest.approx(expected, rel=0.05)


def _cop(refrigerant, te, tc, circuit):
    return solve(CycleSpec(
        refrigerant=refrigerant, circuit=circuit,
        evaporating=SaturationSpec(temperature=te + C),
        condensing=SaturationSpec(temperature=tc + C),
        superheat=5.0, subcooling=2.0,
        compressor=CompressorSpec(isentropic_efficiency=0.7),
        cooling_capacity=10e3,
    )).performance.cop


@pytest.mark.parametrize("circuit", ["economized", "two_stage"])
def test_staging_gain_at_high_pressure_ratio(circuit):
    single = _cop("R404A", -35.0, 40.0, "single_stage")
    staged = _cop("R404A", -35.0, 40.0, circuit)
    gain = staged / single - 1.0
    # common practice, no source: 10 to 30 % at low-temperature duty
    assert 0.10 < gain < 0.35
    # and far less at a small pressure ratio
    small = _cop("R404A", 0.0, 30.0, circuit) / _cop("R404A", 0.0, 30.0, "single_stage") - 1
    assert small < gain / 2
