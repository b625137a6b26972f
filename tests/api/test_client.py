"""heatlift.client.Client: every endpoint reachable, problems raised, retries with back-off."""

from __future__ import annotations

import threading
import time
import xml.etree.ElementTree as ET
from collections.abc import Iterator
from http.server import BaseHTTPRequestHandler, ThreadingHTTPServer
from pathlib import Path

import pytest

from heatlift.client import Client, HeatliftClientError
from tests.conftest import free_port

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def hl(server: str) -> Iterator[Client]:
    with Client(server, retries=1, backoff=0.05) as client:
        yield client


def test_service_endpoints(hl):
    assert hl.health()["status"] == "ok"
    assert hl.ready()["status"] == "ready"
    assert hl.version()["engine"].startswith("heatlift")
    assert "/v1/datasheets/validate" in hl.openapi()["paths"]
    assert isinstance(hl.metrics(), str)


def test_properties_endpoints(hl):
    catalogue = hl.refrigerants()
    assert "R134a" in str(catalogue)
    assert hl.refrigerant("r-134a")["designation"] == "R134a"
    sat = hl.saturation("R134a", temperature=0)
    # R134a at 0 degC: 292.8 kPa (NIST reference data, from memory), tolerance 0.5 %
    assert sat["pressure_dew"]["value"] == pytest.approx(292.8, rel=5e-3)
    assert hl.saturation("R134a", pressure="45 psig", units="IP")["temperature_dew"]["unit"] \
        == "degF"
    table = hl.saturation_table("R134a", -10, 10, 10, format="csv")
    assert table.splitlines()[0].startswith("refrigerant") and len(table.splitlines()) == 4
    state = hl.state("R134a", pressure="3 bar", temperature="10 degC")
    assert state["phase"] == "superheated_vapor"


def test_ip_client_default(server):
    with Client(server, units="IP") as ip:
        assert ip.saturation("R134a", temperature=32)["pressure_dew"]["unit"] == "psi"


def test_cycle_and_compressor_endpoints(hl):
    cycle = hl.cycle(refrigerant="R134a", evaporating={"temperature": -10},
                     condensing={"temperature": 45}, superheat=10, subcooling=5,
                     compressor={"isentropic_efficiency": 0.7}, cooling_capacity=10)
    assert 0 < cycle["performance"]["cop"]["value"] < cycle["performance"]["cop_carnot"]["value"]
    cop = hl.cycle_query(refrigerant="R134a", evaporating_temperature=-10,
                         condensing_temperature=45, superheat=10, subcooling=5,
                         isentropic_efficiency=0.7, cooling_capacity=10,
                         select="performance.cop")
    assert float(cop) == pytest.approx(cycle["performance"]["cop"]["value"], rel=1e-9)
    poly = hl.compressor_polynomial(
        refrigerant="R134a", basis="SI", rating={"superheat": 10},
        coefficients={"mass_flow": [0.05, 0, 0, 0, 0, 0, 0, 0, 0, 0]},
        evaporating_temperature=-10, condensing_temperature=45)
    assert poly["mass_flow"]["value"] == pytest.approx(0.05)


def test_lines_endpoints(hl):
    tubes = hl.lines_tubes()
    assert tubes
    assert hl.lines_fittings()


@pytest.mark.parametrize("method", ["cycle_sweep", "lines_size", "lines_check", "charge",
                                    "cycle_diagram"])
def test_every_post_endpoint_answers_a_problem_for_an_empty_body(hl, method):
    with pytest.raises(HeatliftClientError) as exc:
        getattr(hl, method)()
    assert exc.value.status == 422
    assert exc.value.problem["status"] == 422
    assert exc.value.detail and exc.value.errors


def test_problem_details_are_carried(hl):
    with pytest.raises(HeatliftClientError) as exc:
        hl.saturation("R134x", temperature=0)
    error = exc.value
    assert error.status == 404 and error.title == "Unknown refrigerant"
    assert "R134a" in (error.detail or "") and error.request_id
    assert "404" in str(error)
    with pytest.raises(HeatliftClientError) as exc:
        hl.saturation("R744", temperature=40)
    assert exc.value.status == 422 and "30.97" in (exc.value.detail or "")


def test_validate_datasheet_json_csv_junit(hl):
    text = (ROOT / "examples" / "datasheets.csv").read_text("utf-8")
    report = hl.validate_datasheet(csv=text)
    assert report["summary"]["rows"] == 25
    junit = hl.validate_datasheet(csv=text, format="junit")
    assert ET.fromstring(junit).get("tests") == "25"
    as_csv = hl.validate_datasheet(csv=text, format="csv", tolerances={"capacity_fail": 0.5})
    assert as_csv.splitlines()[0].startswith("row,line,model")
    rows = [{"model": "X", "refrigerant": "R134a", "evaporating_temperature": -10,
             "condensing_temperature": 45, "superheat": 10, "subcooling": 0, "cop": 9.0}]
    assert hl.validate_datasheet(rows)["rows"][0]["verdict"] == "fail"  # above Carnot
    with pytest.raises(ValueError):
        hl.validate_datasheet(rows, csv=text)


# -- retries against a fake service -------------------------------------------------------------

class _Flaky(BaseHTTPRequestHandler):
    plan: list[int] = []
    calls: list[float] = []

    def do_GET(self) -> None:  # noqa: N802
        type(self).calls.append(time.monotonic())
        status = type(self).plan.pop(0) if type(self).plan else 200
        body = (b'{"status": "ok"}' if status == 200 else
                b'{"type": "x", "title": "Service Unavailable", "status": %d, "detail": "busy"}'
                % status)
        self.send_response(status)
        self.send_header("Content-Type", "application/json" if status == 200
                         else "application/problem+json")
        self.send_header("Content-Length", str(len(body)))
        self.end_headers()
        self.wfile.write(body)

    def log_message(self, *_: object) -> None:
        """Keep the stub server's request lines out of the test output."""


@pytest.fixture
def flaky() -> Iterator[str]:
    server = ThreadingHTTPServer(("127.0.0.1", 0), _Flaky)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    _Flaky.calls = []
    yield f"http://127.0.0.1:{server.server_address[1]}"
    server.shutdown()
    server.server_close()


def test_retries_502_503_504_with_backoff(flaky):
    _Flaky.plan = [503, 502, 504]
    client = Client(flaky, retries=3, backoff=0.05)
    assert client.health() == {"status": "ok"}
    calls = _Flaky.calls
    assert len(calls) == 4
    pauses = [b - a for a, b in zip(calls, calls[1:], strict=False)]
    assert pauses[0] >= 0.04 and pauses[1] >= 0.09 and pauses[2] >= 0.19  # 0.05, 0.1, 0.2 s


def test_gives_up_after_the_retries(flaky):
    _Flaky.plan = [503] * 5
    client = Client(flaky, retries=2, backoff=0.01)
    with pytest.raises(HeatliftClientError) as exc:
        client.health()
    assert exc.value.status == 503 and exc.value.detail == "busy"
    assert len(_Flaky.calls) == 3


def test_no_retry_on_a_client_error(flaky):
    _Flaky.plan = [422]
    with pytest.raises(HeatliftClientError) as exc:
        Client(flaky, retries=3, backoff=0.01).health()
    assert exc.value.status == 422 and len(_Flaky.calls) == 1


def test_connection_errors_are_retried_then_raised():
    port = free_port()
    started = time.monotonic()
    with pytest.raises(HeatliftClientError) as exc:
        Client(f"http://127.0.0.1:{port}", retries=2, backoff=0.05).health()
    assert exc.value.status is None and "cannot reach" in str(exc.value)
    assert "3 attempt" in str(exc.value)
    assert time.monotonic() - started >= 0.14  # 0.05 + 0.1 s of back-off
