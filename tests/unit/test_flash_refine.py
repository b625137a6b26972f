"""flash.refine: the Newton steps from a close start (the library tables') on the full
equation of state, against the library's own general flash of the same state."""

from __future__ import annotations

import CoolProp.CoolProp as CP
import pytest

from heatlift import flash

P, T = 2.5e6, 350.0  # R32 vapour about 36 K above its dew point


@pytest.fixture()
def reference() -> CP.AbstractState:
    ref = CP.AbstractState("HEOS", "R32")
    ref.update(CP.PT_INPUTS, P, T)
    return ref


@pytest.mark.parametrize("key", [CP.iT, CP.iHmass, CP.iSmass])
@pytest.mark.parametrize("off", [1e-7, 1e-4, 3e-3])
def test_a_close_start_ends_on_the_full_flash(reference: CP.AbstractState, key: object,
                                              off: float) -> None:
    target = {CP.iT: T, CP.iHmass: reference.hmass(), CP.iSmass: reference.smass()}[key]
    # a start off in both variables (for the temperature pair only the density is free)
    t0 = T if key == CP.iT else T * (1 + off)
    point = flash.refine(CP.AbstractState("HEOS", "R32"), P, target, key, t0,
                         reference.rhomass() * (1 - off), CP.iphase_gas)
    assert point is not None
    # within 1e-9 relative, a thousand times inside the engine's promise of 1e-6
    assert point.temperature == pytest.approx(T, rel=1e-9)
    assert point.density == pytest.approx(reference.rhomass(), rel=1e-9)
    assert point.enthalpy == pytest.approx(reference.hmass(), rel=1e-9)
    assert point.entropy == pytest.approx(reference.smass(), rel=1e-9)


def test_a_far_start_is_left_to_the_full_solve(reference: CP.AbstractState) -> None:
    # 5 % off: beyond the reach of the unguarded steps, None rather than a doubtful answer
    found = flash.refine(CP.AbstractState("HEOS", "R32"), P, reference.smass(), CP.iSmass,
                         T * 1.05, reference.rhomass() * 0.95, CP.iphase_gas)
    assert found is None


def test_the_phase_is_left_unimposed(reference: CP.AbstractState) -> None:
    state = CP.AbstractState("HEOS", "R32")
    flash.refine(state, P, T, CP.iT, T, reference.rhomass() * 1.001, CP.iphase_gas)
    # a cold liquid at the same pressure: with the vapour still imposed, the library fails
    state.update(CP.PT_INPUTS, P, 250.0)
    assert state.phase() == CP.iphase_liquid
