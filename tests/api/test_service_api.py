"""Health, readiness, version, request ids and the provenance block over real HTTP."""

from __future__ import annotations

import uuid


def test_health_ready_version(http):
    assert http.get("/v1/health").json() == {"status": "ok"}
    assert http.get("/v1/ready").json() == {"status": "ready"}
    version = http.get("/v1/version").json()
    assert version["engine"].startswith("heatlift ")
    assert version["property_library"].startswith("CoolProp ")
    assert version["api"] == "v1"


def test_request_id_is_echoed_when_sent(http):
    rid = f"quote-{uuid.uuid4().hex[:12]}"
    r = http.session.get(http.base + "/v1/saturation",
                         params={"refrigerant": "R134a", "temperature": 0},
                         headers={"X-Request-ID": rid}, timeout=60)
    assert r.headers["X-Request-ID"] == rid
    assert r.json()["meta"]["request_id"] == rid
    # also on an error
    r = http.session.get(http.base + "/v1/nowhere", headers={"X-Request-ID": rid}, timeout=60)
    assert r.headers["X-Request-ID"] == rid


def test_request_id_is_generated_when_absent_or_unusable(http):
    r = http.get("/v1/health")
    assert len(r.headers["X-Request-ID"]) >= 16
    bad = http.session.get(http.base + "/v1/health", headers={"X-Request-ID": "a b\tc"},
                           timeout=60)
    assert bad.headers["X-Request-ID"] != "a b\tc"


def test_meta_on_every_json_result(http):
    body = http.get("/v1/saturation", refrigerant="R290", temperature=0, units="IP").json()
    meta = body["meta"]
    assert set(meta) >= {"engine", "property_library", "units", "request_id", "elapsed_ms",
                         "warnings"}
    assert meta["units"] == "IP" and isinstance(meta["warnings"], list)
    assert meta["elapsed_ms"] >= 0


def test_equal_requests_give_equal_results(http):
    a = http.get("/v1/saturation", refrigerant="R455A", temperature=-20).json()
    b = http.get("/v1/saturation", refrigerant="R455A", temperature=-20).json()
    a.pop("meta"), b.pop("meta")
    assert a == b
