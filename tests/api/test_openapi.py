"""/openapi.json: OpenAPI 3.1, valid, and equal to the committed snapshot schemas/openapi.json.

When the contract changes on purpose (a new endpoint, a new field), regenerate the snapshot
with ``python -m api.openapi_snapshot`` and commit it with the change.
"""

from __future__ import annotations

import json

import pytest

from api.openapi_snapshot import COMMAND, SNAPSHOT, committed
from schemas.units import KINDS

CONTRACT_OPERATIONS = [
    ("/v1/refrigerants", "get"), ("/v1/refrigerants/{designation}", "get"),
    ("/v1/saturation", "get"), ("/v1/saturation", "post"), ("/v1/saturation/table", "get"),
    ("/v1/state", "post"), ("/v1/health", "get"), ("/v1/ready", "get"), ("/v1/version", "get"),
    ("/docs", "get"),
]
METHODS = ("get", "put", "post", "delete", "patch", "options", "head")


@pytest.fixture(scope="module")
def live(http) -> dict:
    r = http.get("/openapi.json")
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("application/json")
    return r.json()


def walk(node, path=()):
    """Every (path, dict) in a JSON document."""
    if isinstance(node, dict):
        yield path, node
        for key, value in node.items():
            yield from walk(value, (*path, key))
    elif isinstance(node, list):
        for i, value in enumerate(node):
            yield from walk(value, (*path, i))


def test_openapi_version_is_3_1(live):
    assert live["openapi"].startswith("3.1")
    assert live["info"]["title"] == "heatlift"


def test_document_is_valid_openapi_3_1(live):
    """openapi-spec-validator when installed; otherwise the OpenAPI 3.1 meta-schema (the
    OpenAPI Initiative's schema/v3.1 document, as bundled by schemathesis) with jsonschema_rs."""
    try:
        from openapi_spec_validator import OpenAPIV31SpecValidator
    except ImportError:
        import jsonschema_rs
        from schemathesis.specs.openapi.definitions import OPENAPI_31

        errors = [f"{list(e.instance_path)}: {e.message}"
                  for e in jsonschema_rs.validator_for(OPENAPI_31).iter_errors(live)]
    else:
        errors = [f"{list(e.path)}: {e.message}"
                  for e in OpenAPIV31SpecValidator(live).iter_errors()]
    assert not errors, errors[:10]


def test_component_schemas_are_json_schema_2020_12(live):
    import jsonschema_rs

    for name, schema in live["components"]["schemas"].items():
        assert jsonschema_rs.meta.is_valid(schema), name


def test_every_reference_resolves(live):
    for where, node in walk(live):
        ref = node.get("$ref")
        if isinstance(ref, str):
            target = live
            for part in ref.removeprefix("#/").split("/"):
                assert part in target, (where, ref)
                target = target[part]


def test_contract_operations_are_documented(live):
    for path, method in CONTRACT_OPERATIONS:
        assert method in live["paths"].get(path, {}), (path, method)


def test_every_operation_has_a_summary_and_a_success_response(live):
    for path, item in live["paths"].items():
        for method in METHODS:
            if method in item:
                op = item[method]
                assert op.get("summary"), (path, method)
                assert any(code.startswith("2") for code in op.get("responses", {})), (path,
                                                                                      method)


def test_quantities_carry_their_kind(live):
    kinds = [node["x-quantity-kind"] for _, node in walk(live) if "x-quantity-kind" in node]
    assert len(kinds) > 50
    assert set(kinds) <= set(KINDS)
    saturation = live["components"]["schemas"]["Saturation"]["properties"]
    assert saturation["pressure_dew"]["x-quantity-kind"] == "pressure"
    assert saturation["glide"]["x-quantity-kind"] == "temperature_difference"


def test_no_cdn_documentation_routes(live):
    """flask-smorest's Swagger UI, ReDoc and RapiDoc pages load their scripts from a CDN; none
    is registered (the offline /docs replaces them)."""
    for path in live["paths"]:
        assert not any(word in path for word in ("swagger", "redoc", "rapidoc")), path


def test_snapshot_matches_the_live_document(live):
    snapshot = committed()
    assert snapshot is not None, f"{SNAPSHOT} is missing; create it with: {COMMAND}"
    if snapshot != live:
        changed = sorted(
            {f"paths {p}" for p in set(live["paths"]) ^ set(snapshot.get("paths", {}))}
            | {f"path {p}" for p in set(live["paths"]) & set(snapshot.get("paths", {}))
               if live["paths"][p] != snapshot["paths"][p]}
            | {f"schema {s}" for s in set(live["components"]["schemas"])
               | set(snapshot.get("components", {}).get("schemas", {}))
               if live["components"]["schemas"].get(s)
               != snapshot.get("components", {}).get("schemas", {}).get(s)}
        )
        pytest.fail(
            f"{SNAPSHOT.name} differs from /openapi.json ({', '.join(changed[:12]) or 'info'}"
            f"{' ...' if len(changed) > 12 else ''}). If the change of the contract is "
            f"intended, regenerate the snapshot with:\n    {COMMAND}\nand commit it."
        )


def test_snapshot_is_written_as_the_command_writes_it():
    """The committed file is the command's output byte for byte (no hand edits)."""
    from api.openapi_snapshot import render

    text = SNAPSHOT.read_text("utf-8")
    assert text == render(json.loads(text)), f"regenerate with: {COMMAND}"
