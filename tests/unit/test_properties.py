"""The property layer, heatlift/properties.py.

Blends built from their components (R454B, R448A) take a fast path: the phase is found from the
bubble and dew points first, then the single-phase state is solved with the phase imposed, or
the two-phase state by a secant iteration on the quality. The oracle here is CoolProp's own
general mixture flash (``AbstractState.update`` with ``HmassP_INPUTS`` / ``PSmass_INPUTS`` and
no imposed phase): the same equation of state solved by a different, slow, algorithm
(0.2 to 3 s per point), so only a handful of points are checked. The mole fractions of the
oracle are computed here from the catalogue's mass fractions, independently of the engine.
"""

from __future__ import annotations

import threading

import CoolProp.CoolProp as CP
import pytest

from heatlift.errors import InvalidInput, OutOfRange
from heatlift.properties import PHASES, State, model
from heatlift.refrigerants import lookup


def general_flash(designation: str) -> CP.AbstractState:
    """A CoolProp mixture state built from the catalogue's composition by mass."""
    entry = lookup(designation)
    fluids = entry.coolprop_fluids
    masses = list(entry.composition.values())
    molar = [CP.AbstractState("HEOS", f).molar_mass() for f in fluids]
    moles = [w / m for w, m in zip(masses, molar, strict=True)]
    state = CP.AbstractState("HEOS", "&".join(fluids))
    state.set_mole_fractions([n / sum(moles) for n in moles])
    return state


def target_value(designation: str, pressure: float, region: str, which: str) -> float:
    """An enthalpy [J/kg] or entropy [J/kg/K] inside ``region`` at ``pressure``, placed from
    the engine's own bubble and dew points (40 kJ/kg or 0.1 kJ/kg/K outside the dome)."""
    m = model(designation)
    bubble, dew = m.saturated_at_pressure(pressure, 0.0), m.saturated_at_pressure(pressure, 1.0)
    low, high = (bubble.enthalpy, dew.enthalpy) if which == "h" else (bubble.entropy,
                                                                      dew.entropy)
    margin = 40e3 if which == "h" else 100.0
    return {"liquid": low - margin, "two_phase": 0.5 * (low + high), "vapor": high + margin}[
        region]


# (designation, pressure [Pa], region, h or s): each row costs one slow general flash
FLASH_POINTS = [
    ("R454B", 1.0e6, "liquid", "h"),
    ("R454B", 1.0e6, "two_phase", "h"),
    ("R454B", 1.0e6, "vapor", "h"),
    ("R454B", 1.0e6, "liquid", "s"),
    ("R454B", 1.0e6, "two_phase", "s"),
    ("R454B", 1.0e6, "vapor", "s"),
    ("R448A", 1.6e6, "liquid", "h"),
    ("R448A", 1.6e6, "two_phase", "h"),
    ("R448A", 0.4e6, "vapor", "h"),
    ("R448A", 0.4e6, "vapor", "s"),
]
EXPECTED_PHASE = {"liquid": "subcooled_liquid", "two_phase": "two_phase",
                  "vapor": "superheated_vapor"}


@pytest.mark.parametrize("designation,pressure,region,which", FLASH_POINTS,
                         ids=[f"{d}-{p / 1e6:g}MPa-{r}-{w}" for d, p, r, w in FLASH_POINTS])
def test_blend_fast_path_matches_the_general_flash(designation, pressure, region, which):
    target = target_value(designation, pressure, region, which)
    oracle = general_flash(designation)
    if which == "h":
        oracle.update(CP.HmassP_INPUTS, target, pressure)
        engine = model(designation).at_pressure_enthalpy(pressure, target)
    else:
        oracle.update(CP.PSmass_INPUTS, pressure, target)
        engine = model(designation).at_pressure_entropy(pressure, target)
    assert engine.phase == EXPECTED_PHASE[region]
    assert engine.temperature == pytest.approx(oracle.T(), rel=1e-6)
    assert engine.density == pytest.approx(oracle.rhomass(), rel=1e-5)
    assert engine.pressure == pytest.approx(pressure, rel=1e-8)
    achieved = engine.enthalpy if which == "h" else engine.entropy
    assert achieved == pytest.approx(target, rel=1e-7)
    if region == "two_phase":
        assert engine.quality == pytest.approx(oracle.Qmass(), abs=1e-6)  # vapour mass fraction
    else:
        assert engine.quality is None


def test_blend_state_at_pressure_and_temperature_matches_the_general_flash():
    """R454B vapour at 1 MPa, 40 degC: the phase-imposed evaluation against an unimposed one."""
    oracle = general_flash("R454B")
    oracle.update(CP.PT_INPUTS, 1.0e6, 313.15)
    engine = model("R454B").at_pressure_temperature(1.0e6, 313.15)
    assert engine.phase == "superheated_vapor"
    assert engine.enthalpy == pytest.approx(oracle.hmass(), rel=1e-6)
    assert engine.density == pytest.approx(oracle.rhomass(), rel=1e-6)


def test_blend_two_phase_at_pressure_and_temperature():
    """Inside the glide, pressure and temperature do fix a blend's two-phase state."""
    m = model("R454B")
    bubble, dew = m.saturated_at_pressure(1.0e6, 0.0), m.saturated_at_pressure(1.0e6, 1.0)
    middle = 0.5 * (bubble.temperature + dew.temperature)
    s = m.at_pressure_temperature(1.0e6, middle)
    assert s.phase == "two_phase"
    assert 0.0 < s.quality < 1.0  # type: ignore[operator]
    assert s.temperature == pytest.approx(middle, abs=1e-6)


def test_blend_glide_and_temperature_quality():
    m = model("R448A")
    bubble = m.at_temperature_quality(263.15, 0.0)
    dew = m.at_temperature_quality(263.15, 1.0)
    assert bubble.pressure > dew.pressure  # the bubble pressure of a zeotrope lies above


# ----------------------------------------------------------------------------- pure fluids


def test_pure_fluid_state_pairs_agree():
    """Every pair the engine accepts gives back the same R134a state (superheated vapour
    at 300 kPa, 20 degC; two-phase at 0 degC, quality 0.3)."""
    m = model("R134a")
    ref = m.at_pressure_temperature(300e3, 293.15)
    assert ref.phase == "superheated_vapor" and ref.quality is None
    pairs = [
        {"pressure": ref.pressure, "enthalpy": ref.enthalpy},
        {"pressure": ref.pressure, "entropy": ref.entropy},
        {"temperature": ref.temperature, "entropy": ref.entropy},
        {"temperature": ref.temperature, "enthalpy": ref.enthalpy},
        {"enthalpy": ref.enthalpy, "entropy": ref.entropy},
    ]
    for given in pairs:
        s = m.state(**given)
        assert s.phase == "superheated_vapor", given
        assert s.temperature == pytest.approx(ref.temperature, rel=1e-7), given
        assert s.pressure == pytest.approx(ref.pressure, rel=1e-6), given
    wet = m.at_temperature_quality(273.15, 0.3)
    for given in (
        {"pressure": wet.pressure, "quality": 0.3},
        {"temperature": 273.15, "quality": 0.3},
        {"temperature": 273.15, "enthalpy": wet.enthalpy},
        {"temperature": 273.15, "entropy": wet.entropy},
        {"pressure": wet.pressure, "enthalpy": wet.enthalpy},
        {"pressure": wet.pressure, "entropy": wet.entropy},
    ):
        s = m.state(**given)
        assert s.phase == "two_phase", given
        assert s.quality == pytest.approx(0.3, abs=1e-7), given
        assert s.pressure == pytest.approx(wet.pressure, rel=1e-7), given


def test_pure_fluid_two_phase_is_linear_in_quality():
    m = model("R717")
    liquid, vapor = m.saturated_at_pressure(500e3, 0.0), m.saturated_at_pressure(500e3, 1.0)
    mix = m.at_pressure_quality(500e3, 0.25)
    assert mix.enthalpy == pytest.approx(0.75 * liquid.enthalpy + 0.25 * vapor.enthalpy,
                                         rel=1e-9)
    assert mix.temperature == pytest.approx(liquid.temperature, abs=1e-9)


def test_phases_and_state_fields():
    m = model("R744")
    liquid = m.at_pressure_temperature(5e6, 273.15)  # 5 MPa is above R744's 3.49 MPa at 0 degC
    vapor = m.at_pressure_temperature(2e6, 273.15)
    dense = m.at_pressure_temperature(10e6, 313.15)  # transcritical gas cooler outlet
    assert (liquid.phase, vapor.phase, dense.phase) == ("subcooled_liquid",
                                                        "superheated_vapor", "supercritical")
    for s in (liquid, vapor, dense):
        assert isinstance(s, State) and s.phase in PHASES
        assert s.density > 0 and s.pressure > 0 and s.temperature > 0
    assert liquid.density > 800 > vapor.density


def test_model_is_cached_and_named_canonically():
    assert model("R134a") is model("R134a")
    assert model("R454B").name == "R454B"
    assert model("R454B").is_mixture and not model("R134a").is_mixture
    assert model("R410A").refrigerant.kind == "zeotrope"


def test_per_thread_states_give_equal_results():
    m = model("R454B")
    results: list[float] = []

    def work() -> None:
        results.append(m.at_pressure_enthalpy(1.0e6, 300e3).temperature)

    threads = [threading.Thread(target=work) for _ in range(4)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert len(results) == 4 and len(set(results)) == 1


# ------------------------------------------------------------------------------- errors


def test_saturation_outside_triple_to_critical_is_out_of_range():
    m = model("R134a")
    with pytest.raises(OutOfRange) as caught:
        m.saturated_at_temperature(400.0, 0.0)  # above 374.21 K
    assert caught.value.values["high"].value == pytest.approx(m.critical_temperature)
    assert caught.value.values["high"].kind == "temperature"
    with pytest.raises(OutOfRange):
        m.saturated_at_temperature(150.0, 1.0)  # below the triple point, 169.85 K
    with pytest.raises(OutOfRange):
        m.saturated_at_pressure(5e6, 1.0)
    with pytest.raises(OutOfRange):
        m.saturated_at_pressure(100.0, 1.0)


def test_the_triple_point_itself_is_inside():
    """0.01 degC typed by a caller reaches the engine as 273.15999999999997 K."""
    water = model("R718")
    assert water.saturated_at_temperature(0.01 + 273.15, 0.0).pressure == pytest.approx(
        611.655, rel=1e-4)  # IAPWS-95 triple-point pressure 611.655 Pa, from memory


def test_enthalpy_below_the_liquid_range_is_out_of_range():
    for designation in ("R134a", "R454B"):
        with pytest.raises(OutOfRange) as caught:
            model(designation).at_pressure_enthalpy(300e3, -5e6)
        assert caught.value.values["edge"].kind == "specific_enthalpy"
        assert caught.value.values["t"].value == pytest.approx(
            model(designation).limits.temperature_min)


def test_exactly_two_properties():
    m = model("R134a")
    with pytest.raises(InvalidInput):
        m.state(pressure=300e3)
    with pytest.raises(InvalidInput):
        m.state(pressure=300e3, temperature=280.0, enthalpy=4e5)
    with pytest.raises(OutOfRange):
        m.state(pressure=300e3, quality=1.5)


def test_saturation_temperature_and_pressure_do_not_fix_a_pure_two_phase_state():
    m = model("R134a")
    t_sat = m.saturated_at_pressure(300e3, 0.0).temperature
    with pytest.raises(InvalidInput, match="quality or the enthalpy"):
        m.at_pressure_temperature(300e3, t_sat)


def test_blend_needs_the_pressure_or_temperature_with_quality():
    with pytest.raises(InvalidInput, match="blend"):
        model("R454B").state(temperature=280.0, enthalpy=3e5)


def test_temperature_and_enthalpy_in_the_liquid_is_refused_with_advice():
    m = model("R134a")
    with pytest.raises(InvalidInput, match="give the pressure"):
        m.state(temperature=278.15, enthalpy=150e3)  # below the bubble enthalpy at 5 degC
    with pytest.raises(OutOfRange, match="ideal-gas"):
        m.state(temperature=278.15, enthalpy=900e3)  # no vapour at 5 degC holds that much


def test_middle_quality_with_enthalpy_needs_pressure_or_temperature():
    with pytest.raises(InvalidInput, match="pressure or the temperature"):
        model("R134a").state(enthalpy=3e5, quality=0.5)


def test_blend_temperature_and_quality_keep_quality_a_mass_fraction():
    # internal consistency: the state at (T, x) and the state at its own (p, x) coincide
    m = model("R454B")
    at_t = m.at_temperature_quality(270.0, 0.3)
    assert at_t.quality == pytest.approx(0.3, abs=1e-12)
    at_p = m.at_pressure_quality(at_t.pressure, 0.3)
    assert at_p.temperature == pytest.approx(270.0, abs=1e-6)
    assert at_p.enthalpy == pytest.approx(at_t.enthalpy, rel=1e-9)


@pytest.mark.parametrize("name", ["R134a", "R744"])
def test_a_pressure_known_only_by_its_sides_gives_the_states_of_the_full_saturation(name):
    # pressure_at_saturation leaves the saturated h and s out (a condensing pressure): every
    # kind of state there must be the one the model gives once the full saturation is known,
    # to the last bit, including those that are not vapour (the vapour is tried first)
    from heatlift.properties import PropertyModel

    light, full = PropertyModel(lookup(name)), PropertyModel(lookup(name))
    t_sat = 288.15 if name == "R744" else 313.15
    p = light.pressure_at_saturation(t_sat, 1.0)
    assert p in light._local.light and p not in light._local.saturation
    bubble, dew = full.saturation(full.saturated_at_temperature(t_sat, 1.0).pressure)
    assert bubble.pressure == p
    assert light.saturation_temperatures(p) == (bubble.temperature, dew.temperature)
    vapour = full.at_pressure_temperature(p, t_sat + 25.0)
    assert light.at_pressure_temperature(p, t_sat + 25.0) == vapour
    assert light.at_pressure_temperature(p, t_sat - 4.0) == full.at_pressure_temperature(
        p, t_sat - 4.0)
    cases = [("entropy", vapour.entropy), ("enthalpy", vapour.enthalpy),
             ("enthalpy", 0.5 * (bubble.enthalpy + dew.enthalpy)),  # two-phase
             ("entropy", bubble.entropy - 20.0), ("enthalpy", bubble.enthalpy - 5e3)]  # liquid
    saturated = PropertyModel(lookup(name))
    saturated.pressure_at_saturation(t_sat, 1.0)
    assert saturated.saturated_at_pressure(p, 0.0) == bubble  # (a subcooling of 0)
    for which, value in cases:
        fresh = PropertyModel(lookup(name))
        fresh.pressure_at_saturation(t_sat, 1.0)
        method = "at_pressure_entropy" if which == "entropy" else "at_pressure_enthalpy"
        assert getattr(fresh, method)(p, value) == getattr(full, method)(p, value), (which, value)
