"""A hostile-input corpus against the real gunicorn of the session: every request is refused
with a 4xx problem+json (never a 5xx, never a traceback), and nothing the caller sent comes
back unescaped where a browser or a spreadsheet would run it.

The body-size, batch-size and deadline limits need a server with small limits; they are in
test_keys_and_limits_api.py.
"""

from __future__ import annotations

import csv
import io
import json
import socket
import xml.etree.ElementTree as ET
from urllib.parse import quote, urlsplit

import pytest

from tests.api.production import (
    CHARGE,
    DATASHEET_ROW,
    POLYNOMIAL,
    R454B_CHILLER,
    SUCTION_LINE,
    VALID,
    refused,
)

PAYLOAD = "<script>alert(1)</script>"
FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def not_echoed_raw(response, payload: str = PAYLOAD) -> None:
    """``payload`` does not come back where markup would run: no HTML page carries it, an XML
    or SVG reply is well-formed and has no script element, the request id is not it."""
    kind = response.headers.get("Content-Type", "")
    assert response.headers.get("X-Request-ID") != payload
    if kind.startswith("text/html"):
        assert payload not in response.text, response.text[:300]
    if "xml" in kind:
        root = ET.fromstring(response.content)
        assert not [e for e in root.iter() if e.tag.rsplit("}", 1)[-1].lower() == "script"]
        assert payload not in response.text


def short(response) -> str:
    return f"HTTP {response.status_code} {response.text[:160]!r}"


def check_all(cases) -> None:
    """Run every (label, response, check) and report all that fail, one line each."""
    failures = []
    for label, response, check in cases:
        try:
            check(response)
        except AssertionError:
            failures.append(f"{label}: {short(response)}")
    assert not failures, f"{len(failures)} refused wrongly:\n" + "\n".join(failures)


def refused_naming(name: str, *statuses: int):
    def check(response) -> None:
        problem = refused(response, *statuses)
        assert name in json.dumps(problem.get("errors", {}))
        not_echoed_raw(response)
    return check


def post_raw(http, path: str, data: bytes | str, content_type: str | None, **kwargs):
    headers = {"Content-Type": content_type} if content_type else {}
    headers.update(kwargs.pop("headers", {}))
    return http.session.post(http.base + path, data=data, headers=headers, timeout=60, **kwargs)


# ------------------------------------------------------------------------- quantities

# (endpoint, the rest of a valid body, the field, the unit a reply in SI would use for it)
TARGETS = [
    ("/v1/saturation", {"refrigerant": "R134a"}, "temperature", "degC"),
    ("/v1/state", {"refrigerant": "R134a", "pressure": 300}, "temperature", "degC"),
    ("/v1/state", {"refrigerant": "R134a", "temperature": 5}, "pressure", "kPa"),
    ("/v1/state", {"refrigerant": "R134a", "pressure": 300}, "enthalpy", "kJ/kg"),
    ("/v1/cycle", R454B_CHILLER, "cooling_capacity", "kW"),
    ("/v1/cycle", R454B_CHILLER, "superheat", "K"),
    ("/v1/lines/size", SUCTION_LINE, "length", "m"),
    ("/v1/charge", CHARGE, "cooling_capacity", "kW"),
    ("/v1/compressors/polynomial", POLYNOMIAL, "evaporating_temperature", "degC"),
]
TARGET_IDS = [f"{path}:{name}" for path, _, name, _ in TARGETS]
# a number that works for the field with its unit (so that junk after the unit is what fails)
GOOD = {"temperature": 5, "pressure": 300, "enthalpy": 400, "cooling_capacity": 5,
        "superheat": 5, "length": 20, "evaporating_temperature": -10}


def huge(unit: str) -> list[object]:
    """Finite numbers far outside any physics, in each form a quantity may take."""
    return [1e308, -1e308, f"1e308 {unit}", f"-1e308 {unit}", {"value": 1e308, "unit": unit},
            {"value": -1e308, "unit": unit}]


NOT_FINITE = ["NaN", "nan", "Infinity", "-Infinity", "inf", "1e999", "-1e999"]
WRONG_TYPES = [[5], [], {"a": 1}, {"value": [1], "unit": "K"}, {"value": 5, "unit": 7}, True,
               False, "", "   ", "five"]
# a unit must be a unit: no control or format characters, no pictographs, no look-alikes
JUNK_UNITS = ["\u202e{n}", "{n}\u200f", "{n}\u200b", "{n}😀", "{n}\u0000", "{n}\u0007",
              "{n}\ufeff", "{n}; DROP TABLE x", "{n} " + PAYLOAD]


def _post(http, path: str, body: dict, name: str, value: object):
    return http.post(path, {**body, name: value})


@pytest.mark.parametrize("path,body,name,unit", TARGETS, ids=TARGET_IDS)
def test_numbers_far_outside_the_physics(http, path, body, name, unit):
    """1e308 and -1e308, bare and with units: 422, and the detail names a range in the
    caller's units (the unit of that field in SI)."""
    def check(response) -> None:
        assert unit in refused(response, 422)["detail"]  # a range, in the caller's units

    check_all((f"{name}={value!r}", _post(http, path, body, name, value), check)
              for value in huge(unit))


@pytest.mark.parametrize("path,body,name,unit", TARGETS, ids=TARGET_IDS)
def test_not_finite_numbers_as_text(http, path, body, name, unit):
    values = [form for text in NOT_FINITE
              for form in (text, f"{text} {unit}", {"value": text, "unit": unit})]
    check_all((f"{name}={value!r}", _post(http, path, body, name, value),
               refused_naming(name, 422)) for value in values)


@pytest.mark.parametrize("literal", ["NaN", "Infinity", "-Infinity", "nan", "1e999999"])
@pytest.mark.parametrize("path,body,name,unit", TARGETS[:5], ids=TARGET_IDS[:5])
def test_not_finite_json_literals(http, path, body, name, unit, literal):
    """NaN and Infinity are not JSON (400); a literal too large for a double is not finite
    (400 or 422)."""
    text = json.dumps(body)[:-1] + f', "{name}": {literal}' + "}"
    r = post_raw(http, path, text, "application/json")
    refused(r, 400) if literal != "1e999999" else refused(r, 400, 422)


@pytest.mark.parametrize("path,body,name,unit", TARGETS, ids=TARGET_IDS)
def test_wrong_types_where_a_quantity_goes(http, path, body, name, unit):
    check_all((f"{name}={value!r}", _post(http, path, body, name, value),
               refused_naming(name, 422)) for value in WRONG_TYPES)


@pytest.mark.parametrize("path,body,name,unit", TARGETS, ids=TARGET_IDS)
def test_junk_in_the_unit(http, path, body, name, unit):
    """Control, format and bidirectional characters, pictographs or markup around a valid unit
    are not silently dropped: the value is refused (422) with the field named."""
    values = [template.format(n=f"{GOOD[name]} {unit}") for template in JUNK_UNITS]
    check_all((f"{name}={value!r}", _post(http, path, body, name, value),
               refused_naming(name, 422)) for value in values)


@pytest.mark.parametrize("value", ["-300 degC", "-10 K", "-500 degF", "-1 degR",
                                   {"value": -274, "unit": "degC"}, "-273.16 degC"])
def test_negative_absolute_temperatures(http, value):
    for path, body in (("/v1/saturation", {"refrigerant": "R134a"}),
                       ("/v1/state", {"refrigerant": "R134a", "pressure": 300})):
        problem = refused(http.post(path, {**body, "temperature": value}), 422)
        assert "absolute zero" in problem["detail"] and "-273.15 degC" in problem["detail"]
    problem = refused(http.get("/v1/saturation", refrigerant="R134a", temperature=value
                               if isinstance(value, str) else "-274 degC"), 422)
    assert "-273.15 degC" in problem["detail"]
    cycle = {**R454B_CHILLER, "evaporating": {"temperature": value}}
    refused(http.post("/v1/cycle", cycle), 422)


def test_query_strings_are_refused_the_same_way(http):
    cases = []
    for value in ("NaN", "inf", "1e308", "-1e308 degC", "1e999", "5 K😀", "5 degC\u202e", "",
                  PAYLOAD, "5 \x00K"):
        r = http.get("/v1/saturation", refrigerant="R134a", temperature=value)
        cases.append((f"temperature={value!r}", r, refused_naming("temperature", 422)))
    for params in ({"units": PAYLOAD}, {"format": PAYLOAD}, {"select": PAYLOAD},
                   {"unit_overrides": f"pressure:{PAYLOAD}"}, {"unit_overrides": "{" * 50},
                   {"atmospheric_pressure": PAYLOAD}):
        r = http.get("/v1/saturation", refrigerant="R134a", temperature=5, **params)
        name = next(iter(params))
        cases.append((f"{params!r}", r, refused_naming(name, 422)))
    check_all(cases)


def test_table_and_sweep_point_limits(http):
    problem = refused(http.get("/v1/saturation/table", refrigerant="R134a", start=-50,
                               stop=50, step=0.001), 413, 422)
    assert "500" in problem["detail"]
    problem = refused(http.post("/v1/cycle/sweep", {
        "cycle": R454B_CHILLER, "vary": "condensing.temperature",
        "start": 20, "stop": 60, "step": 1e-6}), 413, 422)
    assert "200" in problem["detail"]


# ------------------------------------------------------------------------ designations

DESIGNATIONS = [
    PAYLOAD, "R134a\u200f", "\u202eR134a", "R134a😀", "R\u0000134a", "R１３４a", "ℝ134a",
    "R134a'; DROP TABLE refrigerants;--", "../../etc/passwd", "%00", "R" * 5000, "",
    "R134a\r\nX-Injected: 1", "\u0130", "\ufeffR134a",
]


@pytest.mark.parametrize("designation", DESIGNATIONS,
                         ids=[repr(d)[:24] for d in DESIGNATIONS])
def test_hostile_designations(http, designation):
    calls = [
        lambda: http.post("/v1/saturation", {"refrigerant": designation, "temperature": 5}),
        lambda: http.post("/v1/state", {"refrigerant": designation, "pressure": 300,
                                        "temperature": 5}),
        lambda: http.post("/v1/cycle", {**R454B_CHILLER, "refrigerant": designation}),
        lambda: http.post("/v1/cycle/diagram", {**R454B_CHILLER, "refrigerant": designation}),
        lambda: http.post("/v1/datasheets/validate", [{**DATASHEET_ROW,
                                                       "refrigerant": designation}]),
    ]
    if len(designation) < 1000:  # gunicorn refuses a request line over 4094 bytes itself
        calls += [
            lambda: http.get("/v1/saturation", refrigerant=designation, temperature=5),
            lambda: http.session.get(
                http.base + "/v1/refrigerants/" + quote(designation, safe=""), timeout=60),
        ]
    for call in calls:
        r = call()
        if r.status_code == 200 and "datasheets" in r.url:
            # a datasheet row with an unknown refrigerant is a failed row, not a failed request
            assert r.json()["rows"][0]["verdict"] in ("fail", "error")
            continue
        refused(r, 400, 404, 422)
        not_echoed_raw(r)
        if designation and "\r" not in designation and len(designation) < 100:
            # the problem may quote the designation: JSON-escaped, that is fine
            assert r.json()["detail"]
    # header injection through a designation never reaches a header
    assert "X-Injected" not in r.headers


def test_lone_surrogate_escape_is_400_not_500(http):
    for raw in ('{"refrigerant": "\\ud800", "temperature": 5}',
                '{"refrigerant": "R134a", "temperature": "5 \\udfff"}',
                '{"refrigerant": "R134a", "temperature": 5, "\\ud83d": 1}'):
        refused(post_raw(http, "/v1/saturation", raw, "application/json"), 400)
    # a pair is one character (an emoji): an unknown refrigerant, not a bad body
    refused(post_raw(http, "/v1/saturation", '{"refrigerant": "\\ud83d\\ude00", '
                     '"temperature": 5}', "application/json"), 404)
    # an escaped backslash before "ud800" is plain text
    refused(post_raw(http, "/v1/saturation", '{"refrigerant": "\\\\ud800", "temperature": 5}',
                     "application/json"), 404)


def test_bytes_that_are_not_utf8(http):
    refused(post_raw(http, "/v1/saturation", b'{"refrigerant": "\xff\xfe", "temperature": 5}',
                     "application/json"), 400)
    refused(post_raw(http, "/v1/datasheets/validate", b"model,refrigerant\n\xff,R134a\n",
                     "text/csv"), 400)


# ----------------------------------------------------------------------- nested JSON


def nested(levels: int) -> str:
    return "[" * levels + "]" * levels


@pytest.mark.parametrize("text", [
    nested(100_000),
    '{"refrigerant": "R134a", "temperature": 5, "x": ' + nested(100_000) + "}",
    '{"a": ' * 100_000 + "1" + "}" * 100_000,
    '{"refrigerant": "R134a", "temperature": 5, "x": ' + nested(72) + "}",
    "[" * 100_000,  # never closed: too deep before it is even malformed
], ids=["array-1e5", "field-1e5", "objects-1e5", "72-levels", "unclosed-1e5"])
def test_deeply_nested_json_is_400_naming_the_limit(http, text):
    for path in ("/v1/saturation", "/v1/cycle", "/v1/datasheets/validate"):
        problem = refused(post_raw(http, path, text, "application/json"), 400)
        assert "32" in problem["detail"] and "nested" in problem["detail"], problem["detail"]


def test_depth_limit_boundary(http):
    """32 levels in all pass the depth check (and fail on the unknown field); 33 do not."""
    at_limit = '{"refrigerant": "R134a", "temperature": 5, "x": ' + nested(31) + "}"
    problem = refused(post_raw(http, "/v1/saturation", at_limit, "application/json"), 422)
    assert "x" in problem["errors"]
    over = '{"refrigerant": "R134a", "temperature": 5, "x": ' + nested(32) + "}"
    refused(post_raw(http, "/v1/saturation", over, "application/json"), 400)
    # brackets inside strings are text, not nesting
    text = '{"refrigerant": "' + "[" * 200 + '", "temperature": 5}'
    refused(post_raw(http, "/v1/saturation", text, "application/json"), 404, 422)


# --------------------------------------------------------------------- content types

POST_OPERATIONS = [path for (method, path) in VALID if method == "POST"]
WRONG_TYPES_OF_BODY = ["text/plain", "application/xml", "multipart/form-data; boundary=x",
                       "application/x-www-form-urlencoded", "application/octet-stream",
                       "image/png", "application/vnd.ms-excel"]


@pytest.mark.parametrize("path", POST_OPERATIONS)
def test_unknown_content_type_is_415(http, path):
    data = json.dumps(VALID[("POST", path)][1])
    for content_type in WRONG_TYPES_OF_BODY + ([] if "datasheets" in path else ["text/csv"]):
        problem = refused(post_raw(http, path, data, content_type), 415)
        assert "application/json" in problem["detail"]
        assert content_type.split(";")[0] in problem["detail"]


def test_content_type_header_is_not_echoed_raw(http):
    sent = "text/x-" + PAYLOAD.replace("/", "")  # a media type has one slash
    r = post_raw(http, "/v1/state", "{}", sent)
    refused(r, 415)
    not_echoed_raw(r, sent[5:])


# ------------------------------------------------------------------- CSV formula cells

CSV_HEADER = ("model,refrigerant,evaporating_temperature [degC],condensing_temperature [degC],"
              "superheat [K],subcooling [K],cooling_capacity [kW],power [kW],mass_flow [kg/s]")
CSV_ROW = "{model},R134a,-10,45,10,5,7.5,2.9,0.05"
FORMULAS = ['=HYPERLINK("http://example.invalid","x")', "+SUM(1;2)", "-2+3", "@SUM(A1)",
            "=1+1", "-SUM(A1)", "+cmd|' /C calc'!A0", "\t=1", " =1", "=" + PAYLOAD]


def dangerous_cells(text: str) -> list[str]:
    """CSV cells a spreadsheet would run as a formula (a plain signed number is data)."""
    found = []
    for row in csv.reader(io.StringIO(text)):
        for cell in row:
            if cell.lstrip(" ").startswith(FORMULA_START):
                try:
                    float(cell)
                except ValueError:
                    found.append(cell)
    return found


def quoted(cell: str) -> str:
    return '"' + cell.replace('"', '""') + '"'


@pytest.mark.parametrize("cell", FORMULAS, ids=[repr(c)[:16] for c in FORMULAS])
def test_csv_cells_that_start_a_formula(http, cell):
    """A datasheet cell that a spreadsheet would run is either refused (422 naming the line
    and column) or neutralised in the CSV the service writes; the JUnit XML is well-formed."""
    text = CSV_HEADER + "\n" + CSV_ROW.format(model=quoted(cell)) + "\n"
    for accept in ("text/csv", "application/xml", "application/json"):
        r = post_raw(http, "/v1/datasheets/validate", text, "text/csv",
                     headers={"Accept": accept})
        if r.status_code == 200:
            if accept == "text/csv":
                assert not dangerous_cells(r.text), dangerous_cells(r.text)
            not_echoed_raw(r, PAYLOAD)
        else:
            problem = refused(r, 422)
            assert "model" in json.dumps(problem["errors"]), problem
            assert "line 2" in problem["detail"], problem["detail"]


@pytest.mark.parametrize("cell", FORMULAS, ids=[repr(c)[:16] for c in FORMULAS])
def test_json_rows_with_formulas_never_reach_csv_output(http, cell):
    row = {**DATASHEET_ROW, "model": cell}
    r = http.session.post(http.base + "/v1/datasheets/validate", json=[row],
                          params={"format": "csv"}, timeout=60)
    if r.status_code == 200:
        assert not dangerous_cells(r.text), dangerous_cells(r.text)
    else:
        refused(r, 422)


def test_markup_in_a_model_name_is_escaped_in_junit_xml(http):
    row = {**DATASHEET_ROW, "model": PAYLOAD + ']]><x a="&"/>'}
    r = http.session.post(http.base + "/v1/datasheets/validate", json=[row],
                          headers={"Accept": "application/xml"}, timeout=60)
    assert r.status_code == 200, r.text[:400]
    root = ET.fromstring(r.content)
    names = [case.get("name") for case in root.iter("testcase")]
    assert any(PAYLOAD in (name or "") for name in names), names  # the text, as text
    not_echoed_raw(r)


# ------------------------------------------------------------------------ transport


def test_markup_in_path_and_request_id(http):
    r = http.session.get(http.base + "/v1/" + quote(PAYLOAD, safe=""), timeout=60,
                         headers={"X-Request-ID": PAYLOAD})
    refused(r, 404)
    not_echoed_raw(r)
    r = http.session.get(http.base + "/v1/health", headers={"X-Request-ID": "a\tb"},
                         timeout=60)
    assert r.headers["X-Request-ID"] != "a\tb"


def raw_exchange(base: str, request: bytes) -> bytes:
    parts = urlsplit(base)
    with socket.create_connection((parts.hostname, parts.port), timeout=30) as sock:
        sock.sendall(request)
        chunks = []
        while True:
            chunk = sock.recv(65536)
            if not chunk:
                break
            chunks.append(chunk)
    return b"".join(chunks)


@pytest.mark.parametrize("request_bytes", [
    b"GET /v1/health HTTP/1.1 " + PAYLOAD.encode() + b"\r\nHost: x\r\n\r\n",
    b"GET /" + PAYLOAD.encode() + b" \x01 HTTP/1.1\r\nHost: x\r\n\r\n",
    b"GET /v1/health HTTP/1.1\r\nHost: x\r\nX-Bad" + PAYLOAD.encode() + b": 1\r\n\r\n",
    b"POST /v1/state HTTP/1.1\r\nHost: x\r\nContent-Length: -5\r\n\r\n",
    b"GET /v1/health?" + b"a" * 9000 + b" HTTP/1.1\r\nHost: x\r\n\r\n",
], ids=["request-line", "control-char", "header-name", "negative-length", "long-line"])
def test_malformed_http_answered_without_markup(server, request_bytes):
    """Requests too malformed to reach the application are answered by gunicorn itself (an
    HTML page): a 4xx, with what the caller sent escaped."""
    reply = raw_exchange(server, request_bytes)
    head, _, body = reply.partition(b"\r\n\r\n")
    status = int(head.split()[1])
    assert 400 <= status < 500, head
    assert PAYLOAD.encode() not in body
