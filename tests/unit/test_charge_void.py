"""Void-fraction models: limits, ordering, monotonicity (equations: see the reference tests)."""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from heatlift.charge.void import MODELS, homogeneous, rouhani_axelsson, steiner, zivi

qualities = st.floats(min_value=1e-4, max_value=1.0 - 1e-4)
liquid = st.floats(min_value=300.0, max_value=1500.0)
ratio = st.floats(min_value=1e-3, max_value=0.5)  # rho_g / rho_l
flux = st.floats(min_value=20.0, max_value=2000.0)
tension = st.floats(min_value=1e-3, max_value=0.03)


@pytest.mark.parametrize("name", list(MODELS))
def test_ends_of_the_quality_range(name):
    alpha = MODELS[name].alpha
    assert alpha(0.0, 1000.0, 30.0, 0.01, 300.0) == 0.0
    assert alpha(1.0, 1000.0, 30.0, 0.01, 300.0) == 1.0


@settings(max_examples=60, deadline=None)
@given(qualities, liquid, ratio, tension, flux)
def test_homogeneous_is_the_largest_void_fraction(x, rho_l, r, sigma, g):
    rho_g = r * rho_l
    top = homogeneous(x, rho_l, rho_g)
    for other in (zivi(x, rho_l, rho_g), rouhani_axelsson(x, rho_l, rho_g, sigma, g),
                  steiner(x, rho_l, rho_g, sigma, g)):
        assert 0.0 < other <= top * (1 + 1e-12) < 1.0 + 1e-12


@settings(max_examples=40, deadline=None)
@given(st.floats(min_value=0.01, max_value=0.98), liquid, ratio, tension, flux)
def test_void_fraction_rises_with_quality(x, rho_l, r, sigma, g):
    rho_g = r * rho_l
    for name, model in MODELS.items():
        lo = model.alpha(x, rho_l, rho_g, sigma, g)
        hi = model.alpha(x + 0.01, rho_l, rho_g, sigma, g)
        assert hi > lo, name


def test_drift_flux_approaches_its_distribution_parameter_at_high_mass_flux():
    # G -> infinity removes the drift term: alpha = (x/rho_g) / (C0 (x/rho_g + (1-x)/rho_l))
    x, rl, rg = 0.3, 1100.0, 25.0
    c0 = 1.0 + 0.2 * (1.0 - x)
    expected = (x / rg) / (c0 * (x / rg + (1.0 - x) / rl))
    assert rouhani_axelsson(x, rl, rg, 0.01, 1e12) == pytest.approx(expected, rel=1e-9)
    assert rouhani_axelsson(x, rl, rg, 0.01, 100.0) < expected


def test_equal_densities_give_the_quality_for_the_slip_models():
    # with rho_g = rho_l every slip-ratio model reduces to alpha = x
    assert homogeneous(0.37, 500.0, 500.0) == pytest.approx(0.37)
    assert zivi(0.37, 500.0, 500.0) == pytest.approx(0.37)
    assert math.isclose(homogeneous(0.5, 900.0, 9.0), 1 / 1.01)
