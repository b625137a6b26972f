"""A small Python client for the heatlift service, on requests.

    >>> from heatlift.client import Client
    >>> hl = Client("http://127.0.0.1:8080")                         # doctest: +SKIP
    >>> hl.saturation("R134a", temperature=0)["pressure_dew"]        # doctest: +SKIP
    {'value': 292.8..., 'unit': 'kPa'}

One method per endpoint of the HTTP contract; bodies and parameters are passed through as the
contract names them (``client.cycle(refrigerant="R454B", evaporating={...}, ...)``), so a
new field of the service needs no new client. Every error, whether the service answered with a
problem or could not be reached, is raised as :class:`HeatliftClientError`.

Retries: a connection that fails (refused, reset, connect timeout) and a 502, 503 or 504 answer
are tried again, ``retries`` times, after ``backoff * 2**attempt`` seconds (or the service's
``Retry-After``). Every endpoint is a calculation without side effects, so a retry is safe. A
read timeout is not retried: the request reached the service and was too slow; a retry would
only be as slow again.
"""

from __future__ import annotations

import time
from collections.abc import Mapping
from typing import Any
from urllib.parse import quote

import requests

DEFAULT_URL = "http://127.0.0.1:8080"
RETRY_STATUSES = (502, 503, 504)
_MAX_SLEEP = 30.0


class HeatliftClientError(Exception):
    """A request that did not succeed.

    ``status`` is the HTTP status (None when the service could not be reached), ``problem``
    the RFC 9457 problem details the service sent (``type``, ``title``, ``status``, ``detail``,
    ``errors``), or an empty dict.
    """

    def __init__(self, message: str, *, status: int | None = None,
                 problem: Mapping[str, Any] | None = None, url: str | None = None,
                 request_id: str | None = None) -> None:
        super().__init__(message)
        self.status = status
        self.problem: dict[str, Any] = dict(problem or {})
        self.url = url
        self.request_id = request_id

    @property
    def title(self) -> str | None:
        return self.problem.get("title")

    @property
    def detail(self) -> str | None:
        return self.problem.get("detail")

    @property
    def errors(self) -> dict[str, list[str]]:
        return dict(self.problem.get("errors") or {})


class Client:
    """heatlift over HTTP.

    ``timeout`` [s]: (connect, read) or one number for both; ``retries``: extra attempts on
    connection errors and 502/503/504; ``backoff`` [s]: the first pause, doubled each time;
    ``api_key``: sent as ``Authorization: Bearer <key>``; ``units``: ``"SI"`` or ``"IP"`` for
    every request that does not name its own.
    """

    def __init__(
        self,
        base_url: str = DEFAULT_URL,
        *,
        timeout: float | tuple[float, float] = (5.0, 60.0),
        retries: int = 3,
        backoff: float = 0.5,
        api_key: str | None = None,
        units: str | None = None,
        session: requests.Session | None = None,
    ) -> None:
        self.base_url = base_url.rstrip("/")
        self.timeout = timeout
        self.retries = max(0, int(retries))
        self.backoff = max(0.0, float(backoff))
        self.units = units
        self.session = session or requests.Session()
        self.session.headers.setdefault("User-Agent", "heatlift-client")
        if api_key:
            self.session.headers["Authorization"] = f"Bearer {api_key}"

    def close(self) -> None:
        self.session.close()

    def __enter__(self) -> Client:
        return self

    def __exit__(self, *_: object) -> None:
        self.close()

    # -- the one place that talks HTTP ----------------------------------------------------------

    def request(
        self,
        method: str,
        path: str,
        *,
        json: Any = None,
        params: Mapping[str, Any] | None = None,
        data: str | bytes | None = None,
        headers: Mapping[str, str] | None = None,
    ) -> Any:
        """Send one request (with retries); the parsed JSON, text, or bytes of an image."""
        url = self.base_url + path
        last: Exception | None = None
        for attempt in range(self.retries + 1):
            try:
                response = self.session.request(
                    method, url, json=json, params=_params(params), data=data,
                    headers=dict(headers or {}), timeout=self.timeout)
            except requests.ConnectionError as exc:  # includes a connect timeout
                last = exc
                if attempt < self.retries:
                    time.sleep(self._pause(attempt, None))
                    continue
                raise HeatliftClientError(
                    f"cannot reach heatlift at {self.base_url} after {attempt + 1} attempt(s): "
                    f"{exc.__class__.__name__}", url=url) from exc
            except requests.Timeout as exc:
                raise HeatliftClientError(
                    f"heatlift at {self.base_url} did not answer {method} {path} in time "
                    f"(timeout {self.timeout} s)", url=url) from exc
            except requests.RequestException as exc:
                raise HeatliftClientError(f"{method} {path} could not be sent: {exc}",
                                          url=url) from exc
            if response.status_code in RETRY_STATUSES and attempt < self.retries:
                time.sleep(self._pause(attempt, response.headers.get("Retry-After")))
                continue
            return _result(response, method, path)
        raise HeatliftClientError(f"{method} {path} failed: {last}", url=url)  # not reached

    def _pause(self, attempt: int, retry_after: str | None) -> float:
        if retry_after is not None:
            try:
                return min(_MAX_SLEEP, max(0.0, float(retry_after)))
            except ValueError:  # an HTTP date rather than seconds: back off as usual
                retry_after = None
        return min(_MAX_SLEEP, self.backoff * 2 ** attempt)

    def get(self, path: str, **params: Any) -> Any:
        return self.request("GET", path, params=self._with_units(params))

    def post(self, path: str, body: Any = None, **params: Any) -> Any:
        if isinstance(body, dict):
            body = self._with_units(body)
        return self.request("POST", path, json=body, params=params or None)

    def _with_units(self, mapping: Mapping[str, Any]) -> dict[str, Any]:
        out = dict(mapping)
        if self.units and "units" not in out:
            out["units"] = self.units
        return out

    # -- service --------------------------------------------------------------------------------

    def health(self) -> dict[str, Any]:
        """GET /v1/health."""
        return self.get("/v1/health")

    def ready(self) -> dict[str, Any]:
        """GET /v1/ready (a 503 while warming up is retried, then raised)."""
        return self.get("/v1/ready")

    def version(self) -> dict[str, Any]:
        """GET /v1/version."""
        return self.get("/v1/version")

    def metrics(self) -> str:
        """GET /metrics (Prometheus text)."""
        return self.request("GET", "/metrics")

    def openapi(self) -> dict[str, Any]:
        """GET /openapi.json."""
        return self.request("GET", "/openapi.json")

    # -- refrigerants and properties ------------------------------------------------------------

    def refrigerants(self, **params: Any) -> dict[str, Any]:
        """GET /v1/refrigerants: the catalogue."""
        return self.get("/v1/refrigerants", **params)

    def refrigerant(self, designation: str, **params: Any) -> dict[str, Any]:
        """GET /v1/refrigerants/{designation}."""
        return self.get(f"/v1/refrigerants/{quote(designation, safe='')}", **params)

    def saturation(self, refrigerant: str, *, temperature: Any = None, pressure: Any = None,
                   **options: Any) -> dict[str, Any]:
        """POST /v1/saturation by ``temperature`` or ``pressure`` (a number or "45 psig")."""
        body = {"refrigerant": refrigerant, **options}
        if temperature is not None:
            body["temperature"] = temperature
        if pressure is not None:
            body["pressure"] = pressure
        return self.post("/v1/saturation", body)

    def saturation_table(self, refrigerant: str, start: Any, stop: Any, step: Any, *,
                         by: str = "temperature", **params: Any) -> Any:
        """GET /v1/saturation/table (``format="csv"`` gives the CSV text)."""
        return self.get("/v1/saturation/table", refrigerant=refrigerant, start=start, stop=stop,
                        step=step, by=by, **params)

    def state(self, refrigerant: str, **properties: Any) -> dict[str, Any]:
        """POST /v1/state from two of pressure, temperature, enthalpy, entropy, quality."""
        return self.post("/v1/state", {"refrigerant": refrigerant, **properties})

    # -- cycle ----------------------------------------------------------------------------------

    def cycle(self, **body: Any) -> dict[str, Any]:
        """POST /v1/cycle: the body as the contract names it (refrigerant, evaporating, ...)."""
        return self.post("/v1/cycle", body)

    def cycle_query(self, **params: Any) -> Any:
        """GET /v1/cycle: the flat single-stage form (``select="performance.cop"`` -> text)."""
        return self.get("/v1/cycle", **params)

    def cycle_sweep(self, **body: Any) -> dict[str, Any]:
        """POST /v1/cycle/sweep: {cycle, vary, start, stop, step} or {cycle, vary, values}."""
        return self.post("/v1/cycle/sweep", body)

    def cycle_diagram(self, image: str = "svg", **body: Any) -> bytes:
        """POST /v1/cycle/diagram: the pressure-enthalpy chart as SVG (or ``image="png"``)."""
        accept = {"svg": "image/svg+xml", "png": "image/png"}[image]
        result = self.request("POST", "/v1/cycle/diagram", json=self._with_units(body),
                              headers={"Accept": accept})
        return result.encode("utf-8") if isinstance(result, str) else result

    # -- lines and charge -----------------------------------------------------------------------

    def lines_size(self, **body: Any) -> dict[str, Any]:
        """POST /v1/lines/size: candidates and the recommended tube."""
        return self.post("/v1/lines/size", body)

    def lines_check(self, **body: Any) -> dict[str, Any]:
        """POST /v1/lines/check: the same figures for a given tube."""
        return self.post("/v1/lines/check", body)

    def lines_tubes(self, standard: str | None = None, **params: Any) -> dict[str, Any]:
        """GET /v1/lines/tubes: the tube catalogues (one ``standard``, or all)."""
        if standard is not None:
            params["standard"] = standard
        return self.get("/v1/lines/tubes", **params)

    def lines_fittings(self, **params: Any) -> dict[str, Any]:
        """GET /v1/lines/fittings: the fitting types the line endpoints accept."""
        return self.get("/v1/lines/fittings", **params)

    def charge(self, **body: Any) -> dict[str, Any]:
        """POST /v1/charge: refrigerant charge, CO2-equivalent, charge limit."""
        return self.post("/v1/charge", body)

    # -- compressors and datasheets -------------------------------------------------------------

    def compressor_polynomial(self, **body: Any) -> dict[str, Any]:
        """POST /v1/compressors/polynomial."""
        return self.post("/v1/compressors/polynomial", body)

    def validate_datasheet(
        self,
        rows: list[dict[str, Any]] | None = None,
        *,
        csv: str | bytes | None = None,
        format: str = "json",
        tolerances: Mapping[str, Any] | None = None,
        **params: Any,
    ) -> Any:
        """POST /v1/datasheets/validate: ``rows`` (dicts) or ``csv`` text.

        ``format``: ``"json"`` (a dict), ``"csv"`` or ``"junit"`` (text). ``tolerances``
        (e.g. ``{"capacity_fail": 0.08}``) go in the query string.
        """
        if (rows is None) == (csv is None):
            raise ValueError("give rows or csv, not both and not neither")
        query = self._with_units({**params, **dict(tolerances or {})})
        query["format"] = format
        if csv is not None:
            return self.request("POST", "/v1/datasheets/validate", params=query,
                                data=csv if isinstance(csv, bytes) else csv.encode("utf-8"),
                                headers={"Content-Type": "text/csv; charset=utf-8"})
        return self.request("POST", "/v1/datasheets/validate", params=query, json=rows)


def _params(params: Mapping[str, Any] | None) -> dict[str, Any] | None:
    if not params:
        return None
    out: dict[str, Any] = {}
    for key, value in params.items():
        if value is None:
            continue
        if isinstance(value, dict):  # e.g. unit_overrides in a query: kind:unit pairs
            value = ",".join(f"{k}:{v}" for k, v in value.items())
        out[key] = value
    return out


def _result(response: requests.Response, method: str, path: str) -> Any:
    content_type = response.headers.get("Content-Type", "")
    if response.status_code >= 400:
        problem: dict[str, Any] = {}
        if "json" in content_type:
            try:
                parsed = response.json()
                problem = parsed if isinstance(parsed, dict) else {}
            except ValueError:
                problem = {}
        detail = problem.get("detail") or response.reason or "no detail"
        raise HeatliftClientError(
            f"{method} {path}: {response.status_code} {problem.get('title', '')}: {detail}",
            status=response.status_code, problem=problem, url=response.url,
            request_id=response.headers.get("X-Request-ID"))
    if "json" in content_type:
        return response.json()
    if content_type.startswith("image/png"):
        return response.content
    return response.text
