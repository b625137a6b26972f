"""POST /v1/cycle/diagram over real HTTP: SVG by default, PNG on request, problems as JSON."""

from __future__ import annotations

import xml.etree.ElementTree as ET

import pytest

from tests.api.problem import assert_problem

SVG_NS = "{http://www.w3.org/2000/svg}"
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"

# the invented demo scenario (examples/): Nordkyl Cold Stores' chilled store
NORDKYL = {
    "refrigerant": "R454B",
    "evaporating": {"temperature": -6},
    "condensing": {"temperature": 40},
    "superheat": 5,
    "subcooling": 3,
    "cooling_capacity": 18,
}
ECONOMISED = {
    "refrigerant": "R404A", "circuit": "economized",
    "evaporating": {"temperature": -35}, "condensing": {"temperature": 40},
    "cooling_capacity": 10,
}
TRANSCRITICAL = {
    "refrigerant": "R744", "circuit": "transcritical",
    "evaporating": {"temperature": -8},
    "gas_cooler": {"outlet_temperature": 35, "pressure": "optimal"},
    "cooling_capacity": 30,
}
TWO_STAGE = {
    "refrigerant": "R717", "circuit": "two_stage",
    "evaporating": {"temperature": -40}, "condensing": {"temperature": 35},
    "cooling_capacity": 100,
}


def _svg(response) -> ET.Element:
    assert response.status_code == 200, response.text[:500]
    assert response.headers["Content-Type"].startswith("image/svg+xml")
    return ET.fromstring(response.content)


def _by_id(root: ET.Element) -> dict[str, ET.Element]:
    return {e.get("id"): e for e in root.iter() if e.get("id")}


def _text(element: ET.Element) -> str:
    return "".join(element.itertext()).strip()


def test_svg_is_valid_and_holds_the_cycle(http):
    root = _svg(http.post("/v1/cycle/diagram", NORDKYL))
    assert root.tag == SVG_NS + "svg"
    ids = _by_id(root)
    for gid in ("cycle-path", "cycle-states", "saturation-bubble", "saturation-dew",
                "isotherms", "state-table", "caution"):
        assert gid in ids, gid
    # the cycle path is drawn: one path element per process, each with points
    paths = list(ids["cycle-path"].iter(SVG_NS + "path"))
    assert len(paths) >= 4 and all(p.get("d") for p in paths)
    # a single-stage circuit with no line losses has four distinct states, numbered 1 to 4
    numbers = {k: _text(v) for k, v in ids.items() if k.startswith("state-") and k[6:].isdigit()}
    assert numbers == {f"state-{n}": str(n) for n in range(1, 5)}
    table = _text(ids["state-table"])
    assert "evaporator outlet" in table and "compressor discharge" in table
    assert "[kPa]" in table and "[kJ/kg]" in table


def test_axes_are_labelled_in_the_callers_units(http):
    root = _svg(http.post("/v1/cycle/diagram", {**NORDKYL, "units": "IP",
                                                "evaporating": {"temperature": "-6 degC"},
                                                "condensing": {"temperature": "40 degC"},
                                                "cooling_capacity": "18 kW"}))
    text = " ".join(_text(e) for e in root.iter(SVG_NS + "text"))
    assert "Specific enthalpy h [Btu/lb]" in text
    assert "Absolute pressure p [psi]" in text
    si = _svg(http.post("/v1/cycle/diagram", {**NORDKYL, "unit_overrides": {"pressure": "barg"}}))
    text = " ".join(_text(e) for e in si.iter(SVG_NS + "text"))
    # a logarithmic axis needs absolute pressure: barg is drawn as bar
    assert "Absolute pressure p [bar]" in text and "[kJ/kg]" in text


def test_png_by_accept_header(http):
    r = http.post("/v1/cycle/diagram", NORDKYL, headers={"Accept": "image/png"})
    assert r.status_code == 200
    assert r.headers["Content-Type"] == "image/png"
    assert r.content.startswith(PNG_SIGNATURE)
    assert len(r.content) > 20_000


def test_format_parameter_beats_accept(http):
    r = http.post("/v1/cycle/diagram?format=png", NORDKYL, headers={"Accept": "image/svg+xml"})
    assert r.headers["Content-Type"] == "image/png" and r.content.startswith(PNG_SIGNATURE)
    r = http.post("/v1/cycle/diagram?format=svg", NORDKYL, headers={"Accept": "image/png"})
    assert r.headers["Content-Type"].startswith("image/svg+xml")


def test_svg_when_accept_is_anything(http):
    r = http.post("/v1/cycle/diagram", NORDKYL, headers={"Accept": "*/*"})
    assert r.headers["Content-Type"].startswith("image/svg+xml")
    r = http.post("/v1/cycle/diagram", NORDKYL,
                  headers={"Accept": "image/svg+xml;q=0.5, image/png;q=0.9"})
    assert r.headers["Content-Type"] == "image/png"


def test_equal_requests_give_equal_bytes(http):
    first = http.post("/v1/cycle/diagram", ECONOMISED)
    second = http.post("/v1/cycle/diagram", ECONOMISED)
    assert first.status_code == second.status_code == 200
    assert first.content == second.content


@pytest.mark.parametrize("body,count", [(ECONOMISED, 8), (TRANSCRITICAL, 4), (TWO_STAGE, 7)])
def test_each_circuit_draws(http, body, count):
    root = _svg(http.post("/v1/cycle/diagram", body))
    ids = _by_id(root)
    assert "cycle-path" in ids
    numbered = sorted(int(k[6:]) for k in ids if k.startswith("state-") and k[6:].isdigit())
    assert numbered == list(range(1, count + 1))


def test_transcritical_marks_the_critical_pressure(http):
    ids = _by_id(_svg(http.post("/v1/cycle/diagram", TRANSCRITICAL)))
    assert "critical-pressure" in ids and "critical-point" in ids


def test_chart_options(http):
    body = {**NORDKYL, "title": "Nordkyl Cold Stores, chilled store", "isotherms": [],
            "width": 900, "height": 600}
    root = _svg(http.post("/v1/cycle/diagram", body))
    ids = _by_id(root)
    assert _text(ids["title"]) == "Nordkyl Cold Stores, chilled store"
    assert root.find(SVG_NS + "title").text == "Nordkyl Cold Stores, chilled store"
    assert "isotherms" not in ids
    assert root.get("width") == "648pt" and root.get("height") == "432pt"  # 9 x 6 in
    labels = _svg(http.post("/v1/cycle/diagram", {**NORDKYL, "isotherms": ["32 degF", 20]}))
    text = {_text(e) for e in labels.iter(SVG_NS + "text")}
    assert "0 °C" in text or "20 °C" in text


def test_bad_request_is_a_problem_not_an_image(http):
    missing = {k: v for k, v in NORDKYL.items() if k != "condensing"}
    body = assert_problem(http.post("/v1/cycle/diagram", missing), 422)
    assert "condensing" in body["errors"]
    body = assert_problem(http.post("/v1/cycle/diagram?format=gif", NORDKYL), 422)
    assert "format" in body["errors"]
    body = assert_problem(http.post("/v1/cycle/diagram", {**NORDKYL, "isotherms": [0] * 13}),
                          422)
    assert "isotherms" in body["errors"]
    body = assert_problem(http.post("/v1/cycle/diagram", {**NORDKYL, "width": 20}), 422)
    assert "width" in body["errors"]
    assert_problem(http.post("/v1/cycle/diagram", {**NORDKYL, "colour": "red"}), 422)
    hot = {**NORDKYL, "evaporating": {"temperature": 50}}
    assert_problem(http.post("/v1/cycle/diagram", hot, headers={"Accept": "image/png"}), 422)


def test_isotherm_outside_the_range_is_reported_in_callers_units(http):
    body = assert_problem(http.post("/v1/cycle/diagram", {**NORDKYL, "units": "IP",
                                                           "evaporating": {"temperature": 21},
                                                           "condensing": {"temperature": 104},
                                                           "isotherms": [-250]}), 422)
    assert "degF" in body["detail"] and "isotherms" in body["errors"]
