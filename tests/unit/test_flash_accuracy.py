"""The engine's fast states against the full equation of state's own flashes, every refrigerant.

The engine reaches its states by Newton steps in temperature and density with the phase imposed
(:mod:`heatlift.flash`) and, for the blends built from components, by fitted saturation tables
(:mod:`heatlift.properties_tables`). The reference here is the property library's general flash
on a state of its own, without an imposed phase (pressure-temperature, pressure-enthalpy,
pressure-entropy, pressure-quality, temperature-quality): the same equation of state, solved
the slow, general way (a blend's two-phase state against its pressure-quality flash). Every
property of every state must agree to 1e-6 relative (enthalpy and entropy relative to their size
plus 10 kJ/kg and 10 J/kg/K, because their zero is a convention; the quality absolutely).

Pure fluids (and the library's pseudo-pure blends) get a grid of pressures and states each,
twice: with the Newton steps started from the library's tables (:mod:`heatlift.starts`) and
from the saturated states alone; the blends built from components get a coarse grid, since
each of their reference flashes costs hundreds of milliseconds. Where the tables were not built
(``heatlift warm-tables``), tables for two blends and the library's tables of two pure fluids
are built for this test in a temporary folder so that every path is tested whatever the
machine, and the other fluids are checked on the path the engine takes there.
"""

from __future__ import annotations

from collections.abc import Iterator

import CoolProp.CoolProp as CP
import pytest

from heatlift import properties_tables, starts
from heatlift.properties import PropertyModel, State, model
from heatlift.refrigerants import catalogue, lookup

REL = 1e-6
FLOORS = {"pressure": 0.0, "temperature": 0.0, "density": 0.0, "enthalpy": 1e4,
          "entropy": 10.0}

PURE = [n for n in catalogue() if len(catalogue()[n].coolprop_fluids) == 1]
BLENDS = [n for n in catalogue() if len(catalogue()[n].coolprop_fluids) > 1]
BUILT_FOR_TEST = ("R454B", "R513A")


LIBRARY_BUILT_FOR_TEST = ("R32", "R717")


@pytest.fixture(scope="module", autouse=True)
def tables(tmp_path_factory: pytest.TempPathFactory) -> Iterator[None]:
    """The installed tables if they are all there; else the tables of two blends and the
    library's tables of two pure fluids, built for the test in a temporary folder."""
    wanted = set(starts.catalogue_fluids())
    if all(properties_tables.table_for(n) is not None for n in BLENDS) and \
            wanted <= starts.built():
        yield
        return
    mp = pytest.MonkeyPatch()
    mp.setenv("HEATLIFT_TABLES_DIR", str(tmp_path_factory.mktemp("tables")))
    starts.build(LIBRARY_BUILT_FOR_TEST, log=lambda _: None)
    properties_tables.build(BUILT_FOR_TEST, log=lambda _: None)
    yield
    mp.undo()
    properties_tables.reset()
    starts.reset()


def reference_state(m: PropertyModel) -> CP.AbstractState:
    state = CP.AbstractState("HEOS", "&".join(m.refrigerant.coolprop_fluids))
    if m._mole_fractions is not None:
        state.set_mole_fractions(m._mole_fractions)
    return state


def agree(found: State, ref: CP.AbstractState, where: str, quality: float | None = None
          ) -> None:
    expected = {"pressure": ref.p(), "temperature": ref.T(), "density": ref.rhomass(),
                "enthalpy": ref.hmass(), "entropy": ref.smass()}
    for name, value in expected.items():
        got = getattr(found, name)
        assert abs(got - value) <= REL * (abs(value) + FLOORS[name]), (
            f"{where}: {name} {got!r} vs the full flash's {value!r}")
    if quality is not None:
        assert found.quality is not None and abs(found.quality - quality) <= REL, (
            f"{where}: quality {found.quality!r} vs {quality!r}")


def saturation_temperatures(m: PropertyModel, count: int) -> list[float]:
    """Dew-point temperatures spread from just above the lower limit (or -40 degC) to 0.95
    of the critical temperature [K]."""
    low = max(m.limits.temperature_min + 5.0, 233.15)
    if m.name == "R718":
        low = 278.15
    high = low + 0.95 * (m.critical_temperature - low)
    return [low + (high - low) * k / (count - 1) for k in range(count)]


def check_pressure(m: PropertyModel, ref: CP.AbstractState, p: float, deltas: list[float],
                   liquid_deltas: list[float], two_phase: list[float]) -> int:
    """Every kind of state at pressure ``p``; returns how many states were compared."""
    checked = 0
    ref.update(CP.PQ_INPUTS, p, 1.0)
    agree(m.saturated_at_pressure(p, 1.0), ref, f"{m.name} dew at {p:.0f} Pa", 1.0)
    t_dew = ref.T()
    ref.update(CP.PQ_INPUTS, p, 0.0)
    agree(m.saturated_at_pressure(p, 0.0), ref, f"{m.name} bubble at {p:.0f} Pa", 0.0)
    t_bubble = ref.T()
    checked += 2
    states = [(t_dew + d, "vapour") for d in deltas] + \
        [(t_bubble - d, "liquid") for d in liquid_deltas
         if t_bubble - d > m.limits.temperature_min + 0.5]  # no liquid below the triple point
    for t, label in states:
        where = f"{m.name} {label} at {p:.0f} Pa, {t:.2f} K"
        ref.update(CP.PT_INPUTS, p, t)
        agree(m.at_pressure_temperature(p, t), ref, where)
        h, s = ref.hmass(), ref.smass()
        ref.update(CP.HmassP_INPUTS, h, p)
        agree(m.at_pressure_enthalpy(p, h), ref, where + " from h")
        ref.update(CP.PSmass_INPUTS, p, s)
        agree(m.at_pressure_entropy(p, s), ref, where + " from s")
        checked += 3
    for q in two_phase:
        ref.update(CP.PQ_INPUTS, p, q)
        h, q_mass = ref.hmass(), (ref.Qmass() if m.is_mixture else q)
        if not m.is_mixture:
            # a blend's reference stays the pressure-quality flash: its pressure-enthalpy
            # flash solves the same equilibrium less tightly (near-azeotropic R513A: densities
            # apart by 2e-6, phases swapped), and takes seconds
            ref.update(CP.HmassP_INPUTS, h, p)
        agree(m.at_pressure_enthalpy(p, h), ref, f"{m.name} two-phase at {p:.0f} Pa", q_mass)
        checked += 1
    return checked


@pytest.mark.parametrize("starting", ["from the library tables", "from saturation"])
@pytest.mark.parametrize("name", PURE)
def test_pure_fluid_states_equal_the_full_flash(name: str, starting: str) -> None:
    """Both ways of starting the Newton steps: from the library's tables (where they were
    built) and from the saturated states alone (a machine without the tables)."""
    m = PropertyModel(lookup(name))  # a model of its own: it reads the tables as they are now
    fluid = m.refrigerant.coolprop_fluids[0]
    if starting == "from saturation":
        m._starts = None
    else:
        assert m._starts is not None
        assert (m._starts.state is not None) == (fluid in starts.built())
    tabled = [0, 0]  # single-phase states asked of the tables' path, and answered there
    ask_tables = m._tabled

    def counted(*args: object) -> State | None:
        found = ask_tables(*args)  # type: ignore[arg-type]
        tabled[0] += 1
        tabled[1] += found is not None
        return found
    m._tabled = counted  # type: ignore[method-assign]
    ref = reference_state(m)
    checked = 0
    for t_sat in saturation_temperatures(m, 4):
        ref.update(CP.QT_INPUTS, 1.0, t_sat)
        p = ref.p()
        agree(m.saturated_at_temperature(t_sat, 1.0), ref, f"{name} dew at {t_sat:.2f} K", 1.0)
        deltas = [0.5, 10.0, 40.0, 100.0]
        deltas = [d for d in deltas if t_sat + d < m._t_max - 1.0]
        checked += 1 + check_pressure(m, ref, p, deltas, [0.5, 5.0, 30.0], [0.05, 0.5, 0.95])
    assert checked > 40
    if m._starts is not None and m._starts.state is not None:
        # the fast path is the one taken: most states from the tables' start and one or two
        # Newton steps (the rest, near saturation or far from the tables' best cells, solve
        # from their other starts)
        assert tabled[1] >= 0.8 * tabled[0] > 0, f"{tabled[1]} of {tabled[0]} from the tables"


def test_supercritical_states_equal_the_full_flash() -> None:
    m = model("R744")
    ref = reference_state(m)
    for p in (8e6, 1.0e7, 1.2e7):
        for t in (290.0, 305.0, 310.0, 320.0, 360.0, 400.0):
            ref.update(CP.PT_INPUTS, p, t)
            where = f"R744 at {p:.0f} Pa, {t} K"
            agree(m.at_pressure_temperature(p, t), ref, where)
            h, s = ref.hmass(), ref.smass()
            ref.update(CP.HmassP_INPUTS, h, p)
            agree(m.at_pressure_enthalpy(p, h), ref, where + " from h")
            ref.update(CP.PSmass_INPUTS, p, s)
            agree(m.at_pressure_entropy(p, s), ref, where + " from s")


@pytest.mark.parametrize("name", BLENDS)
def test_blend_states_equal_the_full_mixture_flash(name: str) -> None:
    """Coarse: an evaporating pressure (vapour, two-phase) and a condensing one (liquid,
    vapour, two-phase); each reference mixture flash takes up to seconds."""
    m = model(name)
    ref = reference_state(m)
    ref.update(CP.QT_INPUTS, 1.0, 263.15)
    p_low = ref.p()
    agree(m.saturated_at_temperature(263.15, 1.0), ref, f"{name} dew at -10 degC", 1.0)
    ref.update(CP.QT_INPUTS, 0.0, 308.15)
    p_high = ref.p()
    agree(m.saturated_at_temperature(308.15, 0.0), ref, f"{name} bubble at 35 degC", 0.0)
    checked = check_pressure(m, ref, p_low, [8.0], [], [0.3])
    checked += check_pressure(m, ref, p_high, [30.0], [4.0], [0.6])
    assert checked == 15
    if name in BUILT_FOR_TEST or all(properties_tables.table_for(n) for n in BLENDS):
        assert m._table() is not None and m._table().covers(p_high)  # the fitted path ran
