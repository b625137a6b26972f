"""flash.refine: the Newton steps from a close start (the library tables') on the full
equation of state, against the library's own general flash of the same state."""

from __future__ import annotations

import CoolProp.CoolProp as CP
import pytest

from heatlift import flash

P, T = 2.5e6, 350.0  # R32 vapour about 36 K above its dew point


def vapour() -> CP.AbstractState:
    """A state of R32 with the vapour phase imposed, as the engine keeps one per phase."""
    state = CP.AbstractState("HEOS", "R32")
    state.specify_phase(CP.iphase_gas)
    return state


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
    point = flash.refine(vapour(), P, target, key, t0, reference.rhomass() * (1 - off))
    assert point is not None
    # within 1e-9 relative, a thousand times inside the engine's promise of 1e-6
    assert point.temperature == pytest.approx(T, rel=1e-9)
    assert point.density == pytest.approx(reference.rhomass(), rel=1e-9)
    assert point.enthalpy == pytest.approx(reference.hmass(), rel=1e-9)
    assert point.entropy == pytest.approx(reference.smass(), rel=1e-9)


def test_a_far_start_is_left_to_the_full_solve(reference: CP.AbstractState) -> None:
    # 5 % off: beyond the reach of the unguarded steps, None rather than a doubtful answer
    found = flash.refine(vapour(), P, reference.smass(), CP.iSmass, T * 1.05,
                         reference.rhomass() * 0.95)
    assert found is None
