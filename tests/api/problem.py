"""A shared check for API tests: every error is an RFC 9457 problem, never a 500."""

from __future__ import annotations

import requests


def assert_problem(response: requests.Response, status: int) -> dict:
    """The response is ``status`` with a problem+json body; returns the body."""
    assert response.status_code == status, (response.status_code, response.text[:500])
    assert response.headers["Content-Type"].startswith("application/problem+json"), (
        response.headers["Content-Type"])
    body = response.json()
    for key in ("type", "title", "status", "detail"):
        assert key in body, (key, body)
    assert body["status"] == status
    assert isinstance(body["detail"], str) and body["detail"]
    assert "Traceback" not in response.text
    return body
