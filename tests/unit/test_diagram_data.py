"""The numbers behind the pressure-enthalpy chart: dome, isotherms, cycle path, numbering."""

from __future__ import annotations

import math

import pytest

from heatlift.cycle import CompressorSpec, CycleSpec, GasCoolerSpec, SaturationSpec, solve
from heatlift.diagram_data import (
    Segment,
    _stable,
    chart_data,
    compression_path,
    isotherm,
    number_states,
    saturation_dome,
)
from heatlift.errors import OutOfRange
from heatlift.properties import State, model

C = 273.15


def _spec(refrigerant: str, te: float, tc: float, **kw: object) -> CycleSpec:
    base: dict = dict(
        refrigerant=refrigerant,
        evaporating=SaturationSpec(temperature=te + C),
        condensing=SaturationSpec(temperature=tc + C),
        superheat=5.0,
        subcooling=3.0,
        compressor=CompressorSpec(isentropic_efficiency=0.7),
        cooling_capacity=10e3,
    )
    base.update(kw)
    return CycleSpec(**base)  # type: ignore[arg-type]


CASES = {
    "R454B single stage": _spec("R454B", -6.0, 40.0),
    "R134a single stage, IHX and line losses": _spec(
        "R134a", -10.0, 45.0, internal_heat_exchanger_effectiveness=0.5,
        suction_line_superheat=4.0, liquid_line_subcooling=2.0),
    "R404A economised (subcooler)": _spec("R404A", -35.0, 40.0, circuit="economized"),
    "R404A economised (flash)": _spec("R404A", -35.0, 40.0, circuit="economized",
                                      economizer="flash"),
    "R717 two-stage": _spec("R717", -40.0, 35.0, circuit="two_stage"),
    "R744 transcritical": CycleSpec(
        refrigerant="R744", circuit="transcritical",
        evaporating=SaturationSpec(temperature=-8.0 + C),
        gas_cooler=GasCoolerSpec(outlet_temperature=35.0 + C, pressure=9.0e6),
        cooling_capacity=30e3),
    "R744 transcritical with flash tank": CycleSpec(
        refrigerant="R744", circuit="transcritical",
        evaporating=SaturationSpec(temperature=-8.0 + C),
        gas_cooler=GasCoolerSpec(outlet_temperature=35.0 + C, pressure=9.0e6),
        flash_tank_pressure=4.0e6, cooling_capacity=30e3),
}
ISOTHERMS = (-20.0 + C, 0.0 + C, 20.0 + C, 40.0 + C, 60.0 + C)


@pytest.fixture(scope="module", params=list(CASES))
def solved(request):
    result = solve(CASES[request.param])
    return result, chart_data(result, ISOTHERMS)


# -- the saturation dome -----------------------------------------------------------------------


@pytest.mark.parametrize("refrigerant", ["R134a", "R454B", "R744", "R717"])
def test_dome_points_lie_on_saturation(refrigerant):
    """Each (h, p) of the bubble curve re-evaluated is saturated liquid (q = 0), with subcooled
    liquid just below it in h and two-phase fluid just above; the dew curve likewise (q = 1)."""
    m = model(refrigerant)
    p_low = max(m.limits.pressure_min * 1.01, 1e5)
    bubble, dew = saturation_dome(m, p_low)
    assert len(bubble) > 20 and len(dew) > 20
    assert bubble[-1][1] > 0.98 * m.critical_pressure  # up to just below the critical point
    assert all(p < m.critical_pressure for _, p in (*bubble, *dew))
    step = 50.0  # [J/kg] well inside either side of the boundary
    # close to the critical point a blend's saturation flash fails now and then, and the
    # re-evaluation needs both saturation points at the pressure: check below 0.85 p_c
    near = 0.85 * m.critical_pressure
    bubble = tuple(pt for pt in bubble if pt[1] < near)
    dew = tuple(pt for pt in dew if pt[1] < near)
    assert len(bubble) > 15 and len(dew) > 15
    for (h, p) in bubble:
        assert m.at_pressure_enthalpy(p, h).quality == pytest.approx(0.0, abs=1e-6)
        assert m.at_pressure_enthalpy(p, h - step).phase == "subcooled_liquid"
        assert m.at_pressure_enthalpy(p, h + step).phase == "two_phase"
    for (h, p) in dew:
        assert m.at_pressure_enthalpy(p, h).quality == pytest.approx(1.0, abs=1e-6)
        assert m.at_pressure_enthalpy(p, h + step).phase == "superheated_vapor"
        assert m.at_pressure_enthalpy(p, h - step).phase == "two_phase"


def test_dome_rises_in_pressure_and_bubble_enthalpy():
    m = model("R134a")
    bubble, dew = saturation_dome(m, 50e3)
    assert all(b[1] > a[1] for a, b in zip(bubble, bubble[1:], strict=False))
    # the saturated liquid's enthalpy rises with its pressure up to the critical point
    assert all(b[0] > a[0] for a, b in zip(bubble, bubble[1:], strict=False))


def test_dome_stops_just_beyond_the_top_of_the_chart():
    m = model("R717")
    bubble, _ = saturation_dome(m, 50e3, 2.0e6)
    assert bubble[-2][1] <= 2.0e6 < bubble[-1][1] < m.critical_pressure


# -- isotherms -----------------------------------------------------------------------------------


@pytest.mark.parametrize("refrigerant,temperature", [
    ("R134a", 0.0), ("R134a", 60.0), ("R454B", 20.0), ("R744", 0.0), ("R744", 35.0),
    ("R404A", -20.0), ("R717", 0.0),
])
def test_isotherm_points_have_the_isotherms_temperature(refrigerant, temperature):
    """Every (h, p) of an isotherm, re-evaluated from p and h (another solver path than the
    one that made it), has the isotherm's temperature: within 0.02 K."""
    m = model(refrigerant)
    t = temperature + C
    iso = isotherm(m, t, 1.5e5 if refrigerant != "R744" else 1.0e6, 1.25 * m.critical_pressure)
    assert len(iso.points) >= 6
    for h, p in iso.points:
        assert m.at_pressure_enthalpy(p, h).temperature == pytest.approx(t, abs=0.02), (h, p)


def test_isotherm_crosses_the_dome_below_the_critical_temperature():
    m = model("R134a")
    iso = isotherm(m, 10.0 + C, 1e5, 3e6)
    assert iso.two_phase is not None
    first, last = iso.two_phase
    p_sat = m.saturated_at_temperature(10.0 + C, 0.0).pressure
    # R134a: pure fluid, so the two-phase stretch is level at the saturation pressure
    assert iso.points[first][1] == pytest.approx(p_sat, rel=1e-9)
    assert iso.points[last][1] == pytest.approx(p_sat, rel=1e-9)
    assert iso.points[first][0] > iso.points[last][0]  # from dew (vapour) to bubble (liquid)
    pressures = [p for _, p in iso.points]
    assert pressures == sorted(pressures)


def test_supercritical_isotherm_spans_the_chart():
    m = model("R744")
    iso = isotherm(m, 40.0 + C, 2e6, 12e6)
    assert iso.two_phase is None
    assert iso.points[0][1] == pytest.approx(2e6) and iso.points[-1][1] == pytest.approx(12e6)


def test_isotherm_below_the_saturation_range_is_refused():
    m = model("R134a")
    with pytest.raises(OutOfRange):
        isotherm(m, m.limits.temperature_min - 5.0, 1e5, 3e6)


def test_unstable_density_roots_are_dropped():
    """(d rho / d p)_T > 0: a state lighter than the one before it along an isotherm goes."""
    def s(p: float, rho: float) -> State:
        return State(p, 300.0, 1e5, 1e3, rho, None, "subcooled_liquid")

    states = [s(1e6, 1000.0), s(2e6, 1001.0), s(3e6, 480.0), s(4e6, 1002.0)]
    assert [x.density for x in _stable(states)] == [1000.0, 1001.0, 1002.0]


# -- the cycle path --------------------------------------------------------------------------------


def _on_path(point: tuple[float, float], segments: tuple[Segment, ...]) -> bool:
    return any(math.isclose(point[0], h, rel_tol=1e-12, abs_tol=1e-9)
               and math.isclose(point[1], p, rel_tol=1e-12)
               for seg in segments for h, p in seg.points)


def test_cycle_path_passes_through_every_state(solved):
    result, data = solved
    for point in result.states:
        assert _on_path((point.state.enthalpy, point.state.pressure), data.segments), point.label
    reached = {s.start for s in data.segments} | {s.end for s in data.segments}
    assert {p.label for p in result.states} <= reached


def test_throttling_is_at_constant_enthalpy(solved):
    """Every step of a throttling segment either keeps the pressure (cooling of the liquid
    before the valve, separation in a vessel) or keeps the enthalpy exactly; the pressure
    falls only at constant h."""
    _, data = solved
    throttles = [s for s in data.segments if s.kind == "throttling"]
    assert throttles
    for seg in throttles:
        assert seg.method == "isenthalpic"
        assert seg.points[-1][1] < seg.points[0][1]
        for (ha, pa), (hb, pb) in zip(seg.points, seg.points[1:], strict=False):
            assert pa == pb or ha == hb, seg


def test_compression_follows_the_polytropic_path(solved):
    """From suction to discharge, entropy linear in ln p: s(p) = s1 + (s2 - s1) ln(p/p1) /
    ln(p2/p1), each point's (p, h) re-evaluated."""
    result, data = solved
    m = model(result.refrigerant)
    compressions = [s for s in data.segments if s.kind == "compression"]
    assert compressions
    for seg in compressions:
        assert seg.method == "polytropic"
        (h1, p1), (h2, p2) = seg.points[0], seg.points[-1]
        s1 = m.at_pressure_enthalpy(p1, h1).entropy
        s2 = m.at_pressure_enthalpy(p2, h2).entropy
        pressures = [p for _, p in seg.points]
        assert pressures == sorted(pressures) and p2 > p1
        for h, p in seg.points[1:-1]:
            expected = s1 + (s2 - s1) * math.log(p / p1) / math.log(p2 / p1)
            assert m.at_pressure_enthalpy(p, h).entropy == pytest.approx(expected, abs=0.05)


def test_compression_path_falls_back_to_a_straight_line():
    m = model("R134a")
    suction = m.at_pressure_temperature(2e5, 0.0 + C)
    flat, method = compression_path(m, suction, suction)
    assert method == "straight" and len(flat) == 2


def test_economised_compression_mixes_at_the_port():
    """The vapour compressed to the port pressure is hotter than the mix with the injected
    vapour, and the mix lies between the two (energy balance of the mixing)."""
    result = solve(CASES["R404A economised (subcooler)"])
    data = chart_data(result, ())
    mixing = [s for s in data.segments if s.kind == "mixing"]
    mixed = result.point("intermediate_injection").state.enthalpy
    injected = result.point("economizer_vapor_outlet").state.enthalpy
    compressed = next(s for s in mixing if s.start == "compressor_suction").points[0][0]
    assert injected < mixed < compressed


def test_states_at_the_same_point_share_a_number():
    result = solve(CASES["R454B single stage"])
    numbered = number_states(result.states)
    assert [n.number for n in numbered] == [1, 2, 3, 4]
    assert numbered[0].labels == ("evaporator_outlet", "compressor_suction")
    assert numbered[1].labels == ("compressor_discharge", "condenser_inlet")
    assert numbered[3].labels == ("evaporator_inlet",)


def test_chart_range_covers_the_cycle_and_the_dome_top_when_near(solved):
    result, data = solved
    low, high = data.pressure_range
    pressures = [p.state.pressure for p in result.states]
    assert low < min(pressures) and high > max(pressures)
    m = model(result.refrigerant)
    if m.critical_pressure <= 4 * max(pressures):
        assert high > m.critical_pressure and data.critical_point is not None
    else:
        assert data.critical_point is None
