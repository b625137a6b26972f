"""Tube catalogues, labels, materials and the B31.5 rating (heatlift.lines.tubes, .rating)."""

from __future__ import annotations

import pytest

from heatlift.errors import InvalidInput
from heatlift.lines import rating, tubes
from heatlift.properties import model

PSI = 6894.757293168  # [Pa], definition


@pytest.mark.parametrize("standard", tubes.STANDARDS)
def test_catalogue_ascending_and_positive(standard):
    cat = tubes.catalogue(standard)
    assert cat.tubes
    for schedule in ((None,) if standard != "ASME B36.10" else tubes.SCHEDULES):
        pool = tubes.sizes(standard, schedule)
        ods = [t.outside_diameter for t in pool]
        assert ods == sorted(ods)
        for t in pool:
            assert 0 < t.wall_thickness < 0.2 * t.outside_diameter
            assert t.inside_diameter == pytest.approx(t.outside_diameter - 2 * t.wall_thickness)


@pytest.mark.parametrize(("standard", "label", "found"), [
    ("ASTM B280", "3/4", "3/4"),
    ("ASTM B280", " 1-1/8 in", "1-1/8"),
    ("EN 12735-1", "22 x 1.0", "22 x 1.0"),
    ("EN 12735-1", "22x1", "22 x 1.0"),
    ("EN 12735-1", "76.1 x 2", "76.1 x 2.0"),
    ("ASME B36.10", "2 sch 40", "2 sch 40"),
    ("ASME B36.10", "2", "2 sch 40"),
    ("ASME B36.10", "1-1/2 SCH 80", "1-1/2 sch 80"),
])
def test_find_labels(standard, label, found):
    assert tubes.find(standard, label).nominal_size == found


def test_find_bare_nps_takes_schedule():
    assert tubes.find("ASME B36.10", "2", "80").nominal_size == "2 sch 80"


def test_unknown_label_lists_sizes():
    with pytest.raises(InvalidInput) as err:
        tubes.find("ASTM B280", "5/16")
    assert err.value.field == "size" and '"1-1/8"' in err.value.render_si()


@pytest.mark.parametrize(("label", "standard"), [
    ("22 x 1.0", "EN 12735-1"), ("2 sch 40", "ASME B36.10"), ("1-1/8", None)])
def test_standard_of_label(label, standard):
    assert tubes.standard_of_label(label) == standard


@pytest.mark.parametrize("text", ["astm-b280", "ASTM B280", "en12735-1", "asme b36.10"])
def test_normalise_standard(text):
    assert tubes.normalise_standard(text) in tubes.STANDARDS


def test_unknown_standard():
    with pytest.raises(InvalidInput):
        tubes.normalise_standard("DIN 1786")


def test_no_copper_for_ammonia():
    copper = tubes.catalogue("ASTM B280").material
    with pytest.raises(InvalidInput) as err:
        tubes.check_material("R717", copper, "ASTM B280")
    assert "copper" in err.value.render_si() and err.value.field == "standard"
    tubes.check_material("R717", tubes.catalogue("ASME B36.10").material, "ASME B36.10")
    tubes.check_material("R454B", copper, "ASTM B280")
    assert tubes.default_standard("R717") == "ASME B36.10"
    assert tubes.default_standard("R134a") == "ASTM B280"


def test_stress_interpolation():
    copper = tubes.materials()["copper_c12200"]
    s100 = copper.stress_at("annealed", (100 - 32) / 1.8 + 273.15)
    s150 = copper.stress_at("annealed", (150 - 32) / 1.8 + 273.15)
    s125 = copper.stress_at("annealed", (125 - 32) / 1.8 + 273.15)
    assert s100 == pytest.approx(6000 * PSI, rel=1e-6)
    assert s125 == pytest.approx(0.5 * (s100 + s150), rel=1e-6)  # table kept to 0.1 mK
    assert copper.stress_at("annealed", 200.0) == pytest.approx(s100)  # below the table
    assert copper.stress_at("drawn", 300.0) > s100


def test_b31_5_formula_by_hand():
    # P = 2 S E t / (D - 0.8 t): 7/8 x 0.045 in, minimum wall 90 %, S = 6000 psi
    t = 0.045 * 0.9 * 0.0254
    d = 0.875 * 0.0254
    expected = 2 * 6000 * PSI * t / (d - 0.8 * t)
    assert rating.allowed_gauge_pressure(d, t, 6000 * PSI) == pytest.approx(expected, rel=1e-12)
    # the wall formula solved back: t = P D / (2 S E + 0.8 P)
    p = expected
    assert p * d / (2 * 6000 * PSI + 0.8 * p) == pytest.approx(t, rel=1e-12)


def test_rating_brazed_uses_annealed_stress():
    tube = tubes.find("ASTM B280", "1-1/8")
    basis = rating.DesignBasis("high", 3.0e6, 328.15)
    brazed, _ = rating.rate(tube, basis, 328.15, True, 101_325.0)
    mechanical, _ = rating.rate(tube, basis, 328.15, False, 101_325.0)
    assert brazed.stress_basis == "annealed" and mechanical.stress_basis == "drawn"
    assert mechanical.allowed_working_pressure > 1.5 * brazed.allowed_working_pressure - 1e5


def test_rating_above_table_warns():
    tube = tubes.find("ASTM B280", "1/2")
    basis = rating.DesignBasis("high", 3.0e6, 328.15)
    _, remarks = rating.rate(tube, basis, 500.0, True, 101_325.0)
    assert [r.code for r in remarks] == ["metal_temperature_above_table"]


def test_design_basis_defaults_and_overrides():
    m = model("R410A")
    high = rating.design_basis(m, "discharge", None, None)
    low = rating.design_basis(m, "suction", None, None)
    assert high.design_temperature == pytest.approx(328.15)
    assert low.design_temperature == pytest.approx(305.15)
    assert high.design_pressure == pytest.approx(
        m.saturated_at_temperature(328.15, 0.0).pressure)
    given = rating.design_basis(m, "liquid", None, 4.2e6)
    assert given.design_pressure == 4.2e6 and given.design_temperature is None


def test_design_basis_above_critical_asks_for_pressure():
    with pytest.raises(InvalidInput) as err:
        rating.design_basis(model("R744"), "suction", None, None)
    assert err.value.field == "design_pressure"


def test_listing():
    rows = tubes.listing().tubes
    assert {r.standard for r in rows} == set(tubes.STANDARDS)
    steel80 = tubes.listing("ASME B36.10", "80").tubes
    assert steel80 and all(r.schedule == "80" for r in steel80)
    with pytest.raises(InvalidInput):
        tubes.listing("ASTM B280", "80")
