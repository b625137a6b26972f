"""Line sizing against sources outside the engine.

Sources, each named again beside its values below:

- The Colebrook (1939) equation solved here by plain fixed-point iteration (independent of the
  fluids library's Clamond solution the engine calls), and friction factors read off the Moody
  (1944) chart, from memory.
- Tube dimensions: ASTM B280, EN 12735-1 and ASME B36.10M tables, from memory; the steel
  schedules also against the fluids library's own ASME B36.10M tables (fluids.piping).
- Roughness: Idelchik's Handbook of Hydraulic Resistance as tabulated in fluids.friction.
- A suction line's pressure drop worked by hand in this file: properties from CoolProp's
  high-level PropsSI (not the engine's state objects), Darcy-Weisbach written out, Colebrook
  by the fixed-point iteration below.
- Line capacities and the pressure drop per 2 degF of the ASHRAE Handbook, Refrigeration,
  R-22 line-sizing table (IP), from memory, loose tolerance (see the note there).
- Oil return: the dimensionless gas velocity criterion J* >= 0.85 of Jacobs et al. (1976) as
  the refrigeration handbooks use it, from memory; v_min worked out here from its definition.
"""

from __future__ import annotations

import math

import CoolProp.CoolProp as CP
import pytest
from fluids.friction import HHR_roughness
from fluids.piping import nearest_pipe

from heatlift.lines import DEFAULT_LIMITS, LineRequest, Route, check, from_mass_flow, tubes
from heatlift.lines.duty import InletSpec
from heatlift.lines.hydraulics import Section, flow, friction_factor
from heatlift.properties import model

C = 273.15
INCH = 0.0254
G = 9.80665  # [m/s^2], standard gravity (definition)


def colebrook_fixed_point(reynolds: float, relative_roughness: float) -> float:
    """Darcy f from 1/sqrt(f) = -2 log10(e/(3.7 D) + 2.51 / (Re sqrt(f))), iterated on
    x = 1/sqrt(f) from x = 8 until it stops moving."""
    x = 8.0
    for _ in range(200):
        new = -2.0 * math.log10(relative_roughness / 3.7 + 2.51 * x / reynolds)
        if abs(new - x) < 1e-14:
            break
        x = new
    return 1.0 / x**2


# -- friction factor -----------------------------------------------------------------------------


@pytest.mark.parametrize("reynolds", [4e3, 1e4, 5e4, 1e5, 5e5, 1e6, 1e7])
@pytest.mark.parametrize("relative_roughness", [0.0, 1e-5, 1e-4, 1e-3, 1e-2])
def test_friction_factor_solves_colebrook(reynolds, relative_roughness):
    # source: the Colebrook equation itself, solved independently above
    expected = colebrook_fixed_point(reynolds, relative_roughness)
    assert friction_factor(reynolds, relative_roughness) == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize(("reynolds", "relative_roughness", "f_chart"), [
    (1e5, 0.0, 0.0180),     # Moody (1944) chart, smooth pipe, from memory
    (1e6, 0.0, 0.0116),     # Moody (1944) chart, smooth pipe, from memory
    (1e5, 1e-3, 0.0222),    # Moody (1944) chart, from memory
    (1e6, 1e-4, 0.0134),    # Moody (1944) chart, from memory
    (1e8, 1e-2, 0.0379),    # Moody (1944) chart, fully rough (von Karman), from memory
])
def test_friction_factor_against_moody_chart(reynolds, relative_roughness, f_chart):
    # a chart is read to about 1-2 % at best
    assert friction_factor(reynolds, relative_roughness) == pytest.approx(f_chart, rel=0.02)


# -- tube dimensions -----------------------------------------------------------------------------


@pytest.mark.parametrize(("label", "od_in", "wall_in"), [
    # ASTM B280, drawn straight lengths, from memory (equal to ASTM B88 type L walls)
    ("3/8", 0.375, 0.030), ("1/2", 0.500, 0.035), ("5/8", 0.625, 0.040),
    ("3/4", 0.750, 0.042), ("7/8", 0.875, 0.045), ("1-1/8", 1.125, 0.050),
    ("1-3/8", 1.375, 0.055), ("1-5/8", 1.625, 0.060), ("2-1/8", 2.125, 0.070),
    ("2-5/8", 2.625, 0.080), ("3-1/8", 3.125, 0.090), ("4-1/8", 4.125, 0.110),
])
def test_astm_b280_dimensions(label, od_in, wall_in):
    tube = tubes.find("ASTM B280", label)
    assert tube.outside_diameter == pytest.approx(od_in * INCH, abs=1e-7)
    assert tube.wall_thickness == pytest.approx(wall_in * INCH, abs=1e-7)


@pytest.mark.parametrize(("label", "od_mm", "wall_mm"), [
    # EN 12735-1, from memory: the metric outside diameters and commonly stocked walls
    ("6 x 1.0", 6.0, 1.0), ("12 x 1.0", 12.0, 1.0), ("22 x 1.0", 22.0, 1.0),
    ("28 x 1.0", 28.0, 1.0), ("35 x 1.5", 35.0, 1.5), ("42 x 1.5", 42.0, 1.5),
    ("54 x 2.0", 54.0, 2.0), ("76.1 x 2.0", 76.1, 2.0), ("108 x 2.5", 108.0, 2.5),
])
def test_en_12735_1_dimensions(label, od_mm, wall_mm):
    tube = tubes.find("EN 12735-1", label)
    assert tube.outside_diameter == pytest.approx(od_mm / 1000, abs=1e-7)
    assert tube.wall_thickness == pytest.approx(wall_mm / 1000, abs=1e-7)


@pytest.mark.parametrize(("label", "od_mm", "wall_mm"), [
    # ASME B36.10M, from memory
    ("1/2 sch 40", 21.3, 2.77), ("1 sch 40", 33.4, 3.38), ("2 sch 40", 60.3, 3.91),
    ("4 sch 40", 114.3, 6.02), ("6 sch 40", 168.3, 7.11), ("12 sch 40", 323.8, 10.31),
    ("2 sch 80", 60.3, 5.54), ("4 sch 80", 114.3, 8.56),
])
def test_asme_b36_10_dimensions_from_memory(label, od_mm, wall_mm):
    tube = tubes.find("ASME B36.10", label)
    assert tube.outside_diameter == pytest.approx(od_mm / 1000, abs=1e-6)
    assert tube.wall_thickness == pytest.approx(wall_mm / 1000, abs=1e-6)


@pytest.mark.parametrize("schedule", ["40", "80"])
def test_asme_b36_10_against_fluids_tables(schedule):
    # source: the fluids library's ASME B36.10M schedule tables (fluids.piping.nearest_pipe)
    nps_of = {"1/2": 0.5, "3/4": 0.75, "1": 1, "1-1/4": 1.25, "1-1/2": 1.5, "2": 2,
              "2-1/2": 2.5, "3": 3, "3-1/2": 3.5, "4": 4, "5": 5, "6": 6, "8": 8, "10": 10,
              "12": 12}
    for tube in tubes.sizes("ASME B36.10", schedule):
        nps = nps_of[tube.nominal_size.split(" ")[0]]
        _, di, do, t = nearest_pipe(NPS=nps, schedule=schedule)
        assert tube.outside_diameter == pytest.approx(do, abs=1e-5), tube.nominal_size
        assert tube.wall_thickness == pytest.approx(t, abs=1e-5), tube.nominal_size
        assert tube.inside_diameter == pytest.approx(di, abs=2e-5), tube.nominal_size


def test_roughness_against_idelchik():
    # source: Idelchik, Handbook of Hydraulic Resistance, via fluids.friction.HHR_roughness
    smooth = HHR_roughness["Seamless tubes made from brass, copper, lead, aluminum, "
                           "Commercially smooth"]
    assert tubes.catalogue("ASTM B280").material.roughness == pytest.approx(smooth[0])
    new_steel = HHR_roughness["Seamless steel tubes, New and unused"]
    steel = tubes.catalogue("ASME B36.10").material.roughness
    assert new_steel[0] <= steel <= new_steel[1]


# -- a suction line worked by hand -----------------------------------------------------------------


def test_suction_line_drop_by_hand():
    """R134a, 0.05 kg/s at 250 kPa and 0 degC (superheated) through 20 m of 1-1/8 ASTM B280
    tube rising 3 m, no fittings. Hand calculation, properties from PropsSI at the mean
    pressure (the drop is small, so one correction of the mean pressure is enough):

        D = (1.125 - 2 x 0.050) in = 26.035 mm,     A = pi D^2 / 4
        rho, mu at (p_mean, h_in);  v = m / (rho A);  Re = rho v D / mu
        f from Colebrook (e/D = 1.5 um / D) by fixed-point iteration
        dp = f (L / D) rho v^2 / 2 + rho g z
    """
    fluid, m_dot, length, rise = "R134a", 0.05, 20.0, 3.0
    p_in, t_in = 250e3, C + 0.0
    h_in = CP.PropsSI("H", "P", p_in, "T", t_in, fluid)
    d = (1.125 - 2 * 0.050) * INCH
    area = math.pi * d**2 / 4
    dp = 0.0
    for _ in range(3):
        p_mean = p_in - dp / 2
        rho = CP.PropsSI("D", "P", p_mean, "H", h_in, fluid)
        mu = CP.PropsSI("V", "P", p_mean, "H", h_in, fluid)
        v = m_dot / (rho * area)
        re = rho * v * d / mu
        f = colebrook_fixed_point(re, 1.5e-6 / d)
        dp = f * length / d * rho * v**2 / 2 + rho * G * rise
    # the engine
    duty = from_mass_flow(fluid, "suction", m_dot, InletSpec(pressure=p_in, temperature=t_in))
    req = LineRequest(duty, Route(length, rise), "ASTM B280", None, DEFAULT_LIMITS["suction"])
    result = check(req, tubes.find("ASTM B280", "1-1/8")).candidate
    assert result.pressure_drop == pytest.approx(dp, rel=2e-3)
    assert result.pressure_drop_parts.static_head == pytest.approx(rho * G * rise, rel=2e-3)
    assert result.velocity == pytest.approx(v, rel=2e-3)
    assert result.reynolds_number == pytest.approx(re, rel=5e-3)
    # the penalty is the drop of dew temperature between the two pressures
    t_dew_in = CP.PropsSI("T", "P", p_in, "Q", 1, fluid)
    t_dew_out = CP.PropsSI("T", "P", p_in - dp, "Q", 1, fluid)
    assert result.temperature_penalty == pytest.approx(t_dew_in - t_dew_out, rel=5e-3)


# -- the handbook's line-sizing table ------------------------------------------------------------


def _f(deg_f: float) -> float:
    return (deg_f - 32) / 1.8 + C


TON = 3516.8528  # [W], 12,000 Btu/h (definition)
FT100 = 30.48  # [m], 100 ft


def _capacity(refrigerant: str, line: str, t_suction: float, label: str, dt: float) -> float:
    """Cooling capacity [W] a 100 ft run of ``label`` carries at a friction penalty ``dt`` [K]
    (the handbook table's basis: 105 degF condensing, saturated liquid, saturated suction
    vapour, equivalent length 100 ft)."""
    m = model(refrigerant)
    liquid = m.saturated_at_temperature(_f(105), 0.0)
    vapour = m.saturated_at_temperature(t_suction, 1.0)
    effect = vapour.enthalpy - liquid.enthalpy
    inlet, quality = (vapour, 1.0) if line == "suction" else (liquid, 0.0)
    tube = tubes.find("ASTM B280", label)
    lo, hi = 1e-4, 10.0
    for _ in range(60):
        mass_flow = math.sqrt(lo * hi)
        try:
            drop = flow(m, inlet, mass_flow, Section(tube, FT100), line == "liquid").parts.friction
            t_out = m.saturated_at_pressure(inlet.pressure - drop, quality).temperature
            t_in = m.saturated_at_pressure(inlet.pressure, quality).temperature
            too_much = t_in - t_out > dt
        except Exception:
            too_much = True
        lo, hi = (lo, mass_flow) if too_much else (mass_flow, hi)
    return lo * effect


@pytest.mark.parametrize(("t_f", "psi_per_2f"), [
    # ASHRAE Handbook, Refrigeration, R-22 suction-line table: "corresponding dp, psi/100 ft"
    # for dt = 2 degF, from memory
    (-40, 0.79), (-20, 1.15), (0, 1.6), (20, 2.22), (40, 2.91),
])
def test_penalty_to_pressure_drop_conversion(t_f, psi_per_2f):
    m = model("R22")
    p1 = m.saturated_at_temperature(_f(t_f), 1.0).pressure
    p2 = m.saturated_at_temperature(_f(t_f - 2), 1.0).pressure
    assert (p1 - p2) / 6894.757 == pytest.approx(psi_per_2f, rel=0.04)


@pytest.mark.parametrize(("line", "label", "tons"), [
    # ASHRAE Handbook, Refrigeration, R-22 line capacities in tons, type L copper, 105 degF
    # condensing, 100 ft equivalent length; FROM MEMORY and uncertain. Suction lines at 40 degF
    # saturated suction, dt = 2 degF:
    ("suction", "7/8", 3.7), ("suction", "1-1/8", 7.5), ("suction", "2-1/8", 42.8),
    # liquid lines, dt = 1 degF:
    ("liquid", "7/8", 18.2), ("liquid", "1-1/8", 37.0),
])
def test_capacities_against_handbook_table(line, label, tons):
    """Loose tolerance (35 %): the entries are recalled, not looked up. The engine's suction
    figures come out about 25 % below the recalled ones while its liquid figures come out some
    8 % above them; the same pressure drops worked with fluids.friction.one_phase_dP agree
    with the engine, and the recalled table's own dp-per-2-degF column (checked above) agrees
    with the saturation curve, so the recall of these capacity entries is the weak link. The
    check still catches a wrong unit, a wrong basis or a factor of two."""
    dt = (2.0 if line == "suction" else 1.0) / 1.8
    capacity = _capacity("R22", line, _f(40), label, dt)
    assert capacity / TON == pytest.approx(tons, rel=0.35)


def test_capacities_grow_about_with_d_to_the_2_6():
    # Darcy-Weisbach at fixed dp/L with f ~ Re^-0.2 gives m ~ D^2.6..2.7 (common practice,
    # no source): a check on the shape of the table, not on any one entry
    small = _capacity("R22", "suction", _f(40), "1-1/8", 2 / 1.8)
    large = _capacity("R22", "suction", _f(40), "2-1/8", 2 / 1.8)
    ratio = math.log(large / small) / math.log((2.125 - 0.14) / (1.125 - 0.10))
    assert 2.5 < ratio < 2.8


# -- oil return -------------------------------------------------------------------------------


@pytest.mark.parametrize(("refrigerant", "t_sat", "label"), [
    ("R22", _f(40), "1-1/8"), ("R134a", C - 10, "7/8"), ("R410A", C + 5, "2-1/8"),
    ("R404A", C - 30, "1-5/8"),
])
def test_oil_return_minimum_velocity_against_criterion(refrigerant, t_sat, label):
    """Jacobs et al. (1976), as the handbooks' riser tables use it (from memory):
    J* = v sqrt(rho_g / (g D (rho_l - rho_g))) >= 0.85, rho_l the oil-rich film, taken as
    900 kg/m^3. Worked here from the saturated vapour at t_sat + 10 K superheat."""
    duty = from_mass_flow(refrigerant, "suction", 0.05,
                          InletSpec(saturation_temperature=t_sat, superheat=10.0))
    req = LineRequest(duty, Route(10.0, 5.0), "ASTM B280", None, DEFAULT_LIMITS["suction"])
    cand = check(req, tubes.find("ASTM B280", label)).candidate
    tube = tubes.find("ASTM B280", label)
    # the engine evaluates the criterion at the line's mean density; recover it from the
    # reported velocity (v = m / (rho A))
    rho = 0.05 / (cand.velocity * tube.flow_area)
    d = tube.inside_diameter
    v_min = 0.85 * math.sqrt(G * d * (900.0 - rho) / rho)
    assert cand.oil_return is not None
    assert cand.oil_return.minimum_velocity == pytest.approx(v_min, rel=1e-3)
    assert cand.oil_return.minimum_mass_flow == pytest.approx(rho * v_min * tube.flow_area,
                                                              rel=1e-3)


def test_riser_velocity_order_of_magnitude():
    # common practice, no source: halocarbon suction risers of 1 to 2 inch need some 2.5 to
    # 5 m/s (500 to 1000 ft/min) to lift oil; the 1000 ft/min rule of thumb carries a margin
    duty = from_mass_flow("R22", "suction", 0.05,
                          InletSpec(saturation_temperature=_f(40), superheat=10.0))
    req = LineRequest(duty, Route(10.0, 5.0), "ASTM B280", None, DEFAULT_LIMITS["suction"])
    for label in ("1-1/8", "1-5/8", "2-1/8"):
        cand = check(req, tubes.find("ASTM B280", label)).candidate
        assert cand.oil_return is not None
        assert 2.0 < cand.oil_return.minimum_velocity < 5.0
