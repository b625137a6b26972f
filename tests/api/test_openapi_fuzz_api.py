"""schemathesis over the whole OpenAPI document, against the real gunicorn of the session.

The document is built by the same application factory the server runs (collection needs it
before any server is up) and checked to be the one the server serves. Every operation is then
fuzzed with generated requests, valid and invalid ones: no answer may be a 5xx, and every
answer must match the schema the document gives for its status code. Generated requests are
mostly refused (random refrigerant names, values outside the physics), so a second test sends
one hand-written valid request per operation and checks its 200 against the document too.

Bounded: at most ``FUZZ_EXAMPLES`` generated requests per operation (about 20 operations), the
explicit-examples and fuzzing phases only (schemathesis' "coverage" phase sends hundreds of
boundary cases per operation; the hostile-input corpus covers the boundaries that matter).
"""

from __future__ import annotations

import pytest
import requests
import schemathesis
from hypothesis import HealthCheck, settings
from schemathesis.checks import not_a_server_error
from schemathesis.config import SchemathesisConfig
from schemathesis.specs.openapi.checks import response_schema_conformance

from api import create_app
from tests.api.production import VALID, concrete, operations

FUZZ_EXAMPLES = 15


def _document() -> dict:
    app = create_app({"HEATLIFT_WARM_UP": False, "HEATLIFT_ACCESS_LOG": False})
    with app.test_client() as client:
        return client.get("/openapi.json").get_json()


DOCUMENT = _document()
CONFIG = SchemathesisConfig.from_dict({"phases": {"coverage": {"enabled": False}}})
schema = schemathesis.openapi.from_dict(DOCUMENT, config=CONFIG)
CHECKS = [not_a_server_error, response_schema_conformance]


@pytest.fixture(scope="module")
def session():
    with requests.Session() as s:
        yield s


def test_the_server_serves_the_document_that_is_fuzzed(http):
    assert http.get("/openapi.json").json() == DOCUMENT


@schema.parametrize()
@settings(max_examples=FUZZ_EXAMPLES, deadline=None, derandomize=True, database=None,
          suppress_health_check=list(HealthCheck))
def test_no_5xx_and_every_response_matches_its_schema(case, server, session):
    case.call_and_validate(base_url=server, session=session, checks=CHECKS, timeout=60)


def test_every_operation_has_a_valid_request_here():
    missing = [op for op in operations(DOCUMENT) if op not in VALID]
    assert not missing, (
        f"add a valid request for {missing} to VALID in tests/api/production.py")


@pytest.mark.parametrize("method,path", [op for op in VALID])
def test_a_valid_request_gets_a_200_that_matches_its_schema(server, session, method, path):
    if path not in DOCUMENT["paths"]:
        pytest.fail(f"{method} {path} is listed in VALID but not in the OpenAPI document")
    query, body = VALID[(method, path)]
    _, rest = concrete(path, query)
    parameters = {k: v for k, v in query.items() if k not in rest}
    operation = schema[path][method]
    kwargs = {"body": body, "media_type": "application/json"} if body is not None else {}
    case = operation.Case(path_parameters=parameters or None, query=rest or None, **kwargs)
    response = case.call(base_url=server, session=session, timeout=60)
    assert response.status_code == 200, response.text[:800]
    case.validate_response(response, checks=CHECKS)


def test_error_responses_are_documented_as_problem_json():
    """Every error the service sends is application/problem+json (RFC 9457); the document
    must say so, or a generated client looks for application/json and finds nothing."""
    wrong = []
    for name, response in DOCUMENT["components"].get("responses", {}).items():
        for media in response.get("content", {}):
            if media != "application/problem+json":
                wrong.append(f"components/responses/{name}: {media}")
    assert not wrong, wrong[:5]
