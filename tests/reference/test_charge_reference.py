"""Reference checks of the charge estimate (POST /v1/charge engine).

Sources beside each expected value:

* internal consistency (no source needed): the mass in a liquid line is its inside volume times
  the liquid density of the line's state;
* NIST reference data for R134a, from memory;
* the published void-fraction equations, written out here independently of the engine, and
  the fluids library (``fluids.two_phase_voidage``) as an independent oracle (the engine
  implements the equations itself and never calls fluids);
* blend GWPs as published by the blend makers and in trade tables (AR4 = IPCC 2007, AR5 = IPCC
  2013), from memory, tolerance 1 % (recall of four-digit figures, and rounding of the
  component sums);
* the ISO 5149-1 / EN 378-1 refrigerant table (practical limit, ATEL/ODL, LFL), from memory,
  tolerance 1 % (the table's figures are two or three significant digits);
* IEC 60335-2-40 / ISO 5149-1 for the form m_max = 2.5 LFL^(5/4) h0 A^(1/2), the installation
  heights h0 and the reference charges m1, m2, m3, from memory; the worked case is computed by
  hand below;
* Regulation (EU) No 517/2014, Art. 4, for the leak-check thresholds and intervals, from memory.
"""

from __future__ import annotations

import math

import fluids.two_phase_voidage as fv
import pytest

from heatlift.charge import ChargeSpec, LineSpec, SpaceSpec, estimate
from heatlift.charge.co2e import THRESHOLDS
from heatlift.charge.limits import INSTALLATION_HEIGHTS, charge_limit, flammability_charge
from heatlift.charge.void import homogeneous, rouhani_axelsson, steiner, zivi
from heatlift.cycle import CycleSpec, SaturationSpec
from heatlift.lines import tubes
from heatlift.properties import model
from heatlift.refrigerants import lookup

C = 273.15
G = 9.80665  # standard gravity [m/s^2]


# -- liquid line: inside volume x liquid density ----------------------------------------------


def _liquid_line(refrigerant: str, subcooling: float, length: float, size: str):
    cycle = CycleSpec(refrigerant=refrigerant, evaporating=SaturationSpec(-6.0 + C),
                      condensing=SaturationSpec(40.0 + C), superheat=5.0, subcooling=subcooling,
                      cooling_capacity=10e3)
    result = estimate(ChargeSpec(cycle=cycle, lines=(
        LineSpec("liquid", length, size=size, standard="ASTM B280"),)))
    return result.components[0], result


@pytest.mark.parametrize("refrigerant", ["R134a", "R290", "R454B", "R410A"])
def test_liquid_line_mass_is_inside_volume_times_liquid_density(refrigerant):
    # internal consistency, no source needed
    part, result = _liquid_line(refrigerant, 3.0, 20.0, "5/8")
    d = tubes.find("ASTM B280", "5/8").inside_diameter
    rho = result.operating_point.cycle.point("condenser_outlet").state.density
    assert part.mass == pytest.approx(math.pi / 4.0 * d**2 * 20.0 * rho, rel=1e-12)


def test_r134a_liquid_line_per_metre():
    # saturated liquid R134a at 40 degC: 1146.7 kg/m^3 (NIST reference data, from memory),
    # tolerance 0.5 %; 5/8 ACR tube: 0.625 in outside, 0.040 in wall, so 0.545 in = 13.843 mm
    # inside (ASTM B280 table, from memory)
    part, _ = _liquid_line("R134a", 0.0, 1.0, "5/8")
    inside = 0.545 * 0.0254
    assert part.inside_diameter == pytest.approx(inside, rel=1e-6)
    assert part.mass == pytest.approx(math.pi / 4.0 * inside**2 * 1146.7, rel=5e-3)


# -- void fractions against the published equations --------------------------------------------

CASES = [  # x, rho_l, rho_g, sigma, G
    (0.05, 1206.0, 32.4, 0.0113, 150.0),
    (0.3, 1110.0, 18.8, 0.0120, 350.0),
    (0.7, 517.7, 13.0, 0.0091, 80.0),
    (0.95, 959.0, 81.9, 0.0055, 600.0),
]


@pytest.mark.parametrize("x, rl, rg, sigma, g", CASES)
def test_homogeneous_and_zivi_equations(x, rl, rg, sigma, g):
    # homogeneous: alpha = 1 / (1 + (1-x)/x rho_g/rho_l) (no slip)
    assert homogeneous(x, rl, rg) == pytest.approx(1 / (1 + (1 - x) / x * rg / rl), rel=1e-12)
    # Zivi (1964): alpha = 1 / (1 + (1-x)/x (rho_g/rho_l)^(2/3))
    assert zivi(x, rl, rg) == pytest.approx(1 / (1 + (1 - x) / x * (rg / rl) ** (2 / 3)),
                                            rel=1e-12)
    # the fluids library as an independent oracle
    assert homogeneous(x, rl, rg) == pytest.approx(fv.homogeneous(x, rl, rg), rel=1e-12)
    assert zivi(x, rl, rg) == pytest.approx(fv.Zivi(x, rl, rg), rel=1e-12)


@pytest.mark.parametrize("x, rl, rg, sigma, g", CASES)
def test_drift_flux_equations(x, rl, rg, sigma, g):
    # Rouhani and Axelsson (1970), as quoted by Xu and Fang (2014); Steiner (1993):
    # alpha = (x/rho_g) [C0 (x/rho_g + (1-x)/rho_l) + 1.18 (1-x) (g sigma (rho_l-rho_g))^0.25
    #          / (G rho_l^0.5)]^-1, with C0 = 1 + 0.2 (1-x) and 1 + 0.12 (1-x)
    drift = 1.18 * (1 - x) * (G * sigma * (rl - rg)) ** 0.25 / (g * rl**0.5)
    for c0, engine in ((1 + 0.2 * (1 - x), rouhani_axelsson), (1 + 0.12 * (1 - x), steiner)):
        expected = (x / rg) / (c0 * (x / rg + (1 - x) / rl) + drift)
        assert engine(x, rl, rg, sigma, g) == pytest.approx(expected, rel=1e-12)
    # fluids takes the mass flow and the diameter: G = m / (pi D^2 / 4)
    d = 0.01
    m = g * math.pi / 4 * d**2
    assert rouhani_axelsson(x, rl, rg, sigma, g) == pytest.approx(
        fv.Rouhani_1(x, rl, rg, sigma, m, d), rel=1e-10)
    assert steiner(x, rl, rg, sigma, g) == pytest.approx(fv.Steiner(x, rl, rg, sigma, m, d),
                                                         rel=1e-10)


def test_void_fraction_examples_of_the_fluids_documentation():
    # fluids documentation examples: Zivi(.4, 800, 2.5) = 0.9689339909056356,
    # Rouhani_1(0.4, 800., 2.5, sigma=0.02, m=1, D=0.3) = 0.8588420244136714,
    # Steiner(0.4, 800., 2.5, sigma=0.02, m=1, D=0.3) = 0.895950181381335
    g = 1.0 / (math.pi / 4 * 0.3**2)
    assert zivi(0.4, 800.0, 2.5) == pytest.approx(0.9689339909056356, rel=1e-12)
    assert rouhani_axelsson(0.4, 800.0, 2.5, 0.02, g) == pytest.approx(0.8588420244136714,
                                                                       rel=1e-10)
    assert steiner(0.4, 800.0, 2.5, 0.02, g) == pytest.approx(0.895950181381335, rel=1e-10)


def test_surface_tension_of_a_pure_fluid():
    # R134a at 0 degC: 11.6 mN/m (NIST reference data, from memory), tolerance 5 %
    m = model("R134a")
    p = m.saturated_at_temperature(C, 0.0).pressure
    assert m.coexisting_phases(p, 0.5, surface_tension=True).surface_tension == pytest.approx(
        0.0116, rel=0.05)


# -- GWP of blends ------------------------------------------------------------------------------

BLEND_GWP = {  # designation: (AR4, AR5), published values, from memory
    "R404A": (3922, 3943),
    "R407C": (1774, 1624),
    "R410A": (2088, 1924),
    "R507A": (3985, 3985),
    "R407A": (2107, 1923),
    "R407F": (1825, 1674),
    "R448A": (1387, 1273),
    "R449A": (1397, 1282),
    "R450A": (605, 547),
    "R452A": (2140, 1945),
    "R454B": (466, 467),
    "R454C": (148, 146),
    "R455A": (148, 146),
    "R513A": (631, 573),
}


@pytest.mark.parametrize("designation", list(BLEND_GWP))
def test_blend_gwp_against_published_values(designation):
    ar4, ar5 = BLEND_GWP[designation]
    entry = lookup(designation)
    assert entry.gwp100["AR4"] == pytest.approx(ar4, rel=0.01)
    assert entry.gwp100["AR5"] == pytest.approx(ar5, rel=0.01)


# -- practical limits, ATEL/ODL, LFL ------------------------------------------------------------

TABLE = {  # ISO 5149-1 / EN 378-1 refrigerant table, from memory [kg/m^3]:
    # designation: (practical limit, ATEL/ODL, LFL or None)
    "R744": (0.1, 0.072, None),
    "R134a": (0.25, 0.21, None),
    "R410A": (0.44, 0.42, None),
    "R32": (0.061, 0.30, 0.307),
    "R290": (0.008, 0.09, 0.038),
}


@pytest.mark.parametrize("designation", list(TABLE))
def test_practical_limits_against_the_standards_table(designation):
    pl, atel, lfl = TABLE[designation]
    entry = lookup(designation)
    assert entry.practical_limit == pytest.approx(pl, rel=0.01)
    assert entry.atel_odl == pytest.approx(atel, rel=0.01)
    if lfl is None:
        assert entry.lower_flammability_limit is None
    else:
        assert entry.lower_flammability_limit == pytest.approx(lfl, rel=0.01)


def test_practical_limit_rule_for_a_room():
    # R410A, 0.44 kg/m^3 (table above, from memory) x 5 m x 4 m x 2.5 m = 22 kg
    limit, _ = charge_limit(lookup("R410A"), 10.0, SpaceSpec(20.0, room_height=2.5))
    assert limit.allowed_charge == pytest.approx(22.0, rel=0.01)


# -- the LFL-based limit, a case worked by hand ----------------------------------------------


def test_flammability_limit_worked_by_hand():
    # R290, LFL 0.038 kg/m^3, unit at the ceiling (h0 = 2.2 m), floor 20 m^2:
    # ln 0.038 = -3.27017; x 1.25 = -4.08771; exp -> 0.038^(5/4) = 0.016778
    # 2.5 x 0.016778 = 0.041944; x 2.2 = 0.092277; x sqrt(20) = 4.47214 -> m_max = 0.41267 kg
    assert flammability_charge(0.038, 2.2, 20.0) == pytest.approx(0.41267, rel=1e-4)
    # through the rule: the practical limit gives 0.008 x 20 x 2.5 = 0.4 kg, which governs
    limit, _ = charge_limit(lookup("R290"), 0.3, SpaceSpec(20.0, room_height=2.5,
                                                           installation_height=2.2))
    assert limit.allowed_charge == pytest.approx(0.40, rel=1e-9)
    assert limit.within_limit is True
    # m1 = 4 m^3 x 0.038 = 0.152 kg, m2 = 26 x 0.038 = 0.988 kg, m3 = 130 x 0.038 = 4.94 kg
    assert (limit.m1, limit.m2, limit.m3) == pytest.approx((0.152, 0.988, 4.94), rel=1e-9)


def test_installation_heights():
    # IEC 60335-2-40 Annex GG h0, from memory: floor 0.6 m, window 1.0 m, wall 1.8 m,
    # ceiling 2.2 m
    assert INSTALLATION_HEIGHTS == {"floor": 0.6, "window": 1.0, "wall": 1.8, "ceiling": 2.2}


def test_leak_check_thresholds():
    # Regulation (EU) No 517/2014 Art. 4(3), from memory: 5 t CO2e every 12 months (24 with a
    # leakage detection system), 50 t every 6 (12), 500 t every 3 (6); Art. 5: detection
    # system required from 500 t
    got = [(t.co2_equivalent / 1000, t.interval_months, t.interval_with_detection_months,
            t.leak_detection_required) for t in THRESHOLDS]
    assert got == [(5, 12, 24, False), (50, 6, 12, False), (500, 3, 6, True)]
