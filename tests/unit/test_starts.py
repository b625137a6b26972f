"""The Newton starts from the property library's tables (heatlift.starts): built once, only
read afterwards, and close to the equation of state's answer."""

from __future__ import annotations

import shutil
from collections.abc import Iterator
from pathlib import Path

import CoolProp.CoolProp as CP
import pytest

from heatlift import starts


@pytest.fixture()
def folder(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Iterator[Path]:
    monkeypatch.setenv("HEATLIFT_TABLES_DIR", str(tmp_path))
    starts.reset()
    yield tmp_path
    starts.reset()


def test_nothing_is_read_where_nothing_was_built(folder: Path) -> None:
    assert starts.built() == frozenset()
    assert starts.Starts("R32").state_for(CP.iphase_gas) is None


def test_built_tables_give_starts_close_to_the_equation_of_state(folder: Path) -> None:
    starts.build(["R32"], log=lambda _: None)
    assert starts.built() == {"R32"}
    ref = CP.AbstractState("HEOS", "R32")
    ref.update(CP.PT_INPUTS, 2.5e6, 350.0)  # vapour 36 K above its dew point
    table = starts.Starts("R32").state_for(CP.iphase_gas)
    assert table is not None
    table.update(CP.PSmass_INPUTS, 2.5e6, ref.smass())
    found = table.T(), table.rhomass()
    # a start, not an answer: within 1e-4 here (the Newton steps on the equation of state
    # then finish the solve; tests/unit/test_flash_accuracy.py checks their answers)
    assert found[0] == pytest.approx(ref.T(), rel=1e-4)
    assert found[1] == pytest.approx(ref.rhomass(), rel=1e-4)


def test_a_folder_gone_since_the_build_is_not_listed(folder: Path) -> None:
    """The library would build missing tables on the spot (seconds per fluid): a fluid whose
    folder is gone is left out instead."""
    built = starts.build(["R32"], log=lambda _: None)
    for sub in built.iterdir():
        if sub.is_dir():
            shutil.rmtree(sub)
    starts.reset()
    assert starts.built() == frozenset()
    assert starts.Starts("R32").state is None


def test_the_tables_can_be_turned_off(folder: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    starts.build(["R32"], log=lambda _: None)
    monkeypatch.setenv("HEATLIFT_LIBRARY_TABLES", "0")
    starts.reset()
    assert starts.Starts("R32").state is None
