"""The unit layer: schemas/units.py (conversion factors) and schemas/fields.py (Quantity).

Exact factors checked here are definitions, not measurements:
the International Table Btu (1 Btu/lb = 2.326 kJ/kg exactly, 1 Btu = 1055.05585262 J), the
avoirdupois pound (0.45359237 kg), the foot (0.3048 m), the standard atmosphere (101.325 kPa),
the ton of refrigeration (12,000 Btu/h) and the kelvin-rankine ratio (1.8).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from marshmallow import ValidationError

from schemas.fields import Quantity, using_units
from schemas.units import (
    _KINDS,
    KINDS,
    UnitContext,
    UnitError,
    affine_map,
    check_override,
    split_quantity_text,
    units_for,
)

SI = UnitContext("SI")
IP = UnitContext("IP")
BTU = 1055.05585262  # [J], International Table Btu (definition)
PSI = 0.45359237 * 9.80665 / 0.0254**2  # [Pa], pound-force per square inch (definition)


def every_written_unit() -> list[tuple[str, str]]:
    """(kind, unit) for every unit the service writes: SI and IP output units of every kind,
    the gauge units it writes for gauge_pressure, and the units the error messages suggest."""
    pairs = []
    for kind, (_base, si, ip) in _KINDS.items():
        for unit in dict.fromkeys((si, ip, *units_for(kind))):
            pairs.append((kind, unit))
    for gauge in (SI.gauge_unit(), IP.gauge_unit(), "barg", "MPag"):
        pairs.append(("pressure", gauge))
    return pairs


WRITTEN = every_written_unit()


def load(kind: str, raw: object, ctx: UnitContext = SI, **bounds: float) -> float:
    with using_units(ctx):
        return Quantity(kind, **bounds).deserialize(raw)


# -------------------------------------------------------------------- written units come back


@pytest.mark.parametrize("kind,unit", WRITTEN, ids=[f"{k}-{u}" for k, u in WRITTEN])
def test_every_written_unit_is_read_back(kind, unit):
    """Render an SI value in the unit, read the rendered object and its text form back."""
    si_value = {"temperature": 280.0, "dimensionless": 0.37}.get(kind, 3.7e5 if "pressure" in
                                                                 kind else 12.5)
    for ctx in (SI, IP):
        rendered = ctx.render(si_value, kind, unit)
        assert rendered["unit"] == unit
        as_object = load(kind, rendered, ctx)
        as_text = load(kind, f"{rendered['value']!r} {unit}", ctx)
        assert as_object == pytest.approx(si_value, rel=1e-12)
        assert as_text == pytest.approx(si_value, rel=1e-12)


@pytest.mark.parametrize("kind", KINDS)
def test_bare_numbers_use_the_systems_output_unit(kind):
    """A bare number is read in the unit the same system writes (table of CONTRACT.md)."""
    _base, si_unit, ip_unit = _KINDS[kind]
    for ctx, unit in ((SI, si_unit), (IP, ip_unit)):
        assert ctx.output_unit(kind) == unit
        value = 0.5 if kind == "dimensionless" else 2.5
        expected = ctx.to_si(value, unit, kind)
        assert load(kind, value, ctx) == pytest.approx(expected, rel=1e-15)


def test_contract_output_units():
    """The SI/IP output unit table of CONTRACT.md."""
    table = {
        "temperature": ("degC", "degF"),
        "temperature_difference": ("K", "delta_degF"),
        "pressure": ("kPa", "psi"),
        "pressure_drop": ("kPa", "psi"),
        "specific_enthalpy": ("kJ/kg", "Btu/lb"),
        "specific_entropy": ("kJ/kg/K", "Btu/lb/degR"),
        "density": ("kg/m^3", "lb/ft^3"),
        "power": ("kW", "Btu/h"),
        "mass_flow": ("kg/s", "lb/h"),
        "volume_flow": ("m^3/h", "ft^3/min"),
        "velocity": ("m/s", "ft/min"),
        "length": ("m", "ft"),
        "diameter": ("mm", "in"),
        "volume": ("L", "ft^3"),
        "mass": ("kg", "lb"),
        "volumetric_capacity": ("kJ/m^3", "Btu/ft^3"),
        "dimensionless": ("1", "1"),
    }
    for kind, (si, ip) in table.items():
        assert (SI.output_unit(kind), IP.output_unit(kind)) == (si, ip), kind


# ------------------------------------------------------------------------- exact factors


def test_ton_of_refrigeration_is_12000_btu_per_hour():
    """TR = 12,000 Btu_IT/h = 3516.8528 W (definition); pint alone would read TR otherwise."""
    assert load("power", "1 TR") == pytest.approx(12000 * BTU / 3600, rel=1e-14)
    assert load("power", "1 TR") == pytest.approx(3516.85, abs=0.01)
    assert load("power", "1 ton") == load("power", "1 TR")
    assert load("power", "12000 Btu/h") == pytest.approx(load("power", "1 TR"), rel=1e-14)
    assert SI.from_si(3516.8528420667, "power", "TR") == pytest.approx(1.0, rel=1e-12)


def test_btu_per_lb_is_exactly_2326_j_per_kg():
    """1 Btu_IT/lb = 2.326 kJ/kg exactly (definition of the IT Btu)."""
    assert affine_map("Btu/lb", "specific_enthalpy").scale == 2326.0
    assert load("specific_enthalpy", "100 Btu/lb") == 232_600.0
    assert load("specific_enthalpy", 100, IP) == 232_600.0
    # entropy: 1 Btu/(lb degR) = 4.1868 kJ/(kg K) exactly
    assert load("specific_entropy", "1 Btu/lb/degR") == pytest.approx(4186.8, rel=1e-15)


def test_other_definitions():
    assert load("pressure", "1 psi") == pytest.approx(PSI, rel=1e-14)  # 6894.757 Pa
    assert load("pressure", "8 bar") == 800_000.0  # no last-bit noise
    assert load("length", "1 ft") == pytest.approx(0.3048, rel=1e-15)
    assert load("diameter", "1 in") == pytest.approx(0.0254, rel=1e-15)
    assert load("mass", "1 lb") == pytest.approx(0.45359237, rel=1e-15)
    assert load("density", "1 lb/ft^3") == pytest.approx(0.45359237 / 0.3048**3, rel=1e-14)
    assert load("volume_flow", "1 cfm") == pytest.approx(0.3048**3 / 60, rel=1e-14)
    assert load("volume", "1 L") == pytest.approx(1e-3, rel=1e-15)
    assert load("co2_equivalent", "2.5 t") == pytest.approx(2500.0, rel=1e-15)
    assert load("dimensionless", "45 %") == pytest.approx(0.45, rel=1e-15)


def test_temperatures_and_their_spellings():
    assert load("temperature", 0) == pytest.approx(273.15, abs=1e-12)
    assert load("temperature", 32, IP) == pytest.approx(273.15, abs=1e-12)
    assert load("temperature", "77 degF") == pytest.approx(298.15, abs=1e-12)
    assert load("temperature", "-40 F") == pytest.approx(load("temperature", "-40 degC"),
                                                         abs=1e-12)
    assert load("temperature", "7 °C") == pytest.approx(280.15, abs=1e-12)
    assert load("temperature", "491.67 degR") == pytest.approx(273.15, abs=1e-12)
    assert load("temperature", {"value": 300, "unit": "K"}) == 300.0


# ------------------------------------------------------------------ temperature differences


def test_temperature_differences_are_never_offset():
    """A difference in degF is a difference in rankine: 5 degF = 5/1.8 K = 2.7778 K."""
    assert load("temperature_difference", "5 degF") == pytest.approx(5 / 1.8, rel=1e-14)
    assert load("temperature_difference", "5 degF") == pytest.approx(2.7778, abs=1e-4)
    assert load("temperature_difference", "5 delta_degF") == pytest.approx(5 / 1.8, rel=1e-14)
    assert load("temperature_difference", 5, IP) == pytest.approx(5 / 1.8, rel=1e-14)
    for text in ("5 degC", "5 K", "5 delta_degC", "5 °C", "5 C"):
        assert load("temperature_difference", text) == pytest.approx(5.0, rel=1e-15), text
    assert load("temperature_difference", 5) == 5.0
    # and on output: 10 K of superheat is 18 delta_degF, never 50 degF
    assert IP.render(10.0, "temperature_difference") == {"value": pytest.approx(18.0),
                                                         "unit": "delta_degF"}


def test_a_temperature_is_not_a_difference():
    """The same text as an absolute temperature does carry the offset."""
    assert load("temperature", "5 degF") == pytest.approx((5 + 459.67) / 1.8, rel=1e-14)


# ------------------------------------------------------------------------------ gauge


def test_gauge_pressure_adds_the_atmosphere():
    assert load("pressure", "45 psig") == pytest.approx(45 * PSI + 101_325.0, rel=1e-14)
    assert load("pressure", "0 kPag") == pytest.approx(101_325.0, rel=1e-15)
    assert load("pressure", "2 barg") == pytest.approx(301_325.0, rel=1e-15)
    assert load("pressure", "0.5 MPag") == pytest.approx(601_325.0, rel=1e-15)
    high_site = UnitContext("SI", {}, 90_000.0)  # a site at altitude
    assert load("pressure", "45 psig", high_site) == pytest.approx(45 * PSI + 90_000.0,
                                                                   rel=1e-14)
    # absolute units ignore the atmospheric pressure
    assert load("pressure", "45 psia", high_site) == pytest.approx(45 * PSI, rel=1e-14)


def test_gauge_output_subtracts_the_atmosphere():
    site = UnitContext("IP", {}, 95_000.0)
    assert site.gauge_unit() == "psig"
    assert SI.gauge_unit() == "kPag"
    assert UnitContext("SI", {"pressure": "bar"}).gauge_unit() == "barg"
    assert site.render(95_000.0 + 10 * PSI, "pressure", "psig")["value"] == pytest.approx(10.0)
    assert SI.render(101_325.0, "pressure", "kPag")["value"] == pytest.approx(0.0, abs=1e-12)


def test_gauge_units_only_fit_a_pressure():
    with pytest.raises(ValidationError, match="gauge"):
        load("pressure_drop", "5 psig")


def test_a_vacuum_below_absolute_zero_pressure_is_refused():
    with pytest.raises(ValidationError, match="absolute pressure"):
        load("pressure", "-20 psig")  # -20 psig is below a perfect vacuum
    assert load("pressure", "-10 psig") == pytest.approx(101_325 - 10 * PSI, rel=1e-14)
    with pytest.raises(ValidationError, match="above 0 kPa"):
        load("pressure", -5)


# ------------------------------------------------------------------------------ overrides


def test_overrides_change_output_only():
    ctx = UnitContext("SI", {"pressure": "bar", "power": "TR"})
    assert ctx.output_unit("pressure") == "bar"
    assert ctx.input_unit("pressure") == "kPa"
    assert load("pressure", 300, ctx) == 300_000.0  # the bare number is still kPa
    assert ctx.render(300_000.0, "pressure") == {"value": 3.0, "unit": "bar"}
    assert ctx.render(3516.8528420667, "power")["value"] == pytest.approx(1.0, rel=1e-12)
    check_override("pressure", "bar")
    with pytest.raises(UnitError):
        check_override("pressure", "degC")
    with pytest.raises(UnitError, match="kinds are"):
        check_override("pressure_of_something", "bar")


def test_render_writes_non_finite_as_null():
    assert SI.render(math.nan, "pressure") == {"value": None, "unit": "kPa"}


def test_error_text_in_callers_units():
    assert IP.text(233.15, "temperature") == "-40 degF"
    assert SI.text(0.5, "dimensionless") == "0.5"


# --------------------------------------------------------------------------- bad input


@pytest.mark.parametrize(
    "kind,text,fits",
    [
        ("temperature", "5 kPa", ["degC", "degF", "K"]),
        ("pressure", "20 degC", ["kPa", "psi", "bar", "psig"]),
        ("specific_enthalpy", "3 kW", ["kJ/kg", "Btu/lb"]),
        ("power", "3 kJ/kg", ["kW", "Btu/h", "TR"]),
        ("temperature_difference", "5 psi", ["K", "delta_degF"]),
        ("dimensionless", "5 kg", ["1", "%"]),
    ],
)
def test_wrong_kind_names_the_kinds_that_fit(kind, text, fits):
    with pytest.raises(ValidationError) as caught:
        load(kind, text)
    message = " ".join(caught.value.messages)  # type: ignore[arg-type]
    for unit in fits:
        assert unit in message, (unit, message)


def test_unreadable_unit_names_the_units_that_fit():
    with pytest.raises(ValidationError, match="degC"):
        load("temperature", "5 furlongs per fortnight zz")


@pytest.mark.parametrize(
    "raw",
    [math.nan, math.inf, -math.inf, "nan", "inf", "NaN degC", "1e999 degC", 10**400,
     {"value": math.nan, "unit": "K"}, {"value": "5", "unit": "K"}],
    ids=["nan", "inf", "-inf", "nan-text", "inf-text", "nan-unit", "overflow-text",
         "huge-int", "nan-object", "string-in-object"],
)
def test_non_finite_numbers_are_refused(raw):
    with pytest.raises(ValidationError):
        load("temperature", raw)


@pytest.mark.parametrize(
    "raw",
    [True, False, None, [1.0], "abc", "", "5 5 K", {"unit": "K"},
     {"value": 5, "unit": "K", "extra": 1}, {"value": 5, "unit": 7}],
    ids=["true", "false", "null", "list", "word", "empty", "two-numbers", "no-value",
         "extra-key", "unit-not-text"],
)
def test_non_numbers_are_refused(raw):
    with pytest.raises(ValidationError):
        load("temperature", raw)


def test_too_large_after_conversion():
    with pytest.raises(ValidationError, match="too large"):
        load("pressure", "1e305 MPa")


def test_below_absolute_zero():
    with pytest.raises(ValidationError, match="absolute zero"):
        load("temperature", "-300 degC")
    with pytest.raises(ValidationError, match="-459.67 degF"):
        load("temperature", -500, IP)


def test_bounds_are_reported_in_callers_units():
    with pytest.raises(ValidationError, match=r"at least 0 delta_degF"):
        load("temperature_difference", -1, IP, minimum=0.0)
    with pytest.raises(ValidationError, match=r"above 0 K"):
        load("temperature_difference", 0, SI, minimum=0.0, exclusive=True)
    assert load("temperature_difference", 0, SI, minimum=0.0) == 0.0


def test_split_quantity_text():
    assert split_quantity_text(" 45 psig ") == (45.0, "psig")
    assert split_quantity_text("-1.5e3") == (-1500.0, None)
    assert split_quantity_text(".5 K") == (0.5, "K")
    with pytest.raises(UnitError):
        split_quantity_text("psig 45")


def test_unknown_kind():
    with pytest.raises(UnitError):
        affine_map("K", "no_such_kind")


# ---------------------------------------------------------------------------- property

@settings(max_examples=60, deadline=None)
@given(
    pair=st.sampled_from(WRITTEN),
    value=st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False),
    system=st.sampled_from(["SI", "IP"]),
    atmosphere=st.floats(min_value=50e3, max_value=110e3),
)
def test_round_trip_property(pair, value, system, atmosphere):
    """unit -> SI -> unit gives the number back, for every written unit and any value."""
    kind, unit = pair
    ctx = UnitContext(system, {}, atmosphere)
    si = ctx.to_si(value, unit, kind)
    back = ctx.from_si(si, kind, unit)
    scale = abs(si) / affine_map(unit, kind).scale + atmosphere  # size of the terms involved
    assert back == pytest.approx(value, rel=1e-12, abs=1e-13 * scale)


@settings(max_examples=40, deadline=None)
@given(
    pair=st.sampled_from(WRITTEN),
    value=st.floats(min_value=1e-3, max_value=1e5, allow_nan=False, allow_infinity=False),
)
def test_rendered_text_round_trip_property(pair, value):
    """What the service writes ({value, unit}, or "value unit") reads back to the same SI."""
    kind, unit = pair
    si = SI.to_si(value, unit, kind)
    if (kind == "temperature" and si <= 0) or (kind == "pressure" and si <= 0):
        return  # not a physical input; refused elsewhere
    rendered = IP.render(si, kind, unit)
    assert load(kind, rendered, IP) == pytest.approx(si, rel=1e-12)
    assert load(kind, f"{rendered['value']!r} {rendered['unit']}") == pytest.approx(si,
                                                                                    rel=1e-12)
