"""Writing results: JSON with ``meta``, CSV with units in the header, or one bare number.

``format=csv`` flattens the result (nested objects become dotted column names; a list of rows
becomes one CSV row each) and puts each quantity's unit in its column header:
``pressure_dew [kPa]``. ``select=performance.cop`` answers ``text/plain`` with the bare number,
so that a spreadsheet's web-query function can drop it in a cell.
"""

from __future__ import annotations

import csv
import functools
import io
import time
from collections.abc import Iterable
from typing import Any

from flask import Response, g, json, request
from marshmallow import Schema
from werkzeug.exceptions import UnprocessableEntity

import heatlift
from api.encoding import to_json
from heatlift.errors import Remark
from heatlift.properties import LIBRARY_VERSION
from schemas.dumping import dump
from schemas.fields import current_units

FORMATS = ("json", "csv")
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


class OutputError(UnprocessableEntity):
    def __init__(self, field: str, message: str) -> None:
        super().__init__(message)
        self.data = {"messages": {field: [message]}}


def meta() -> dict[str, Any]:
    ctx = current_units()
    remarks = [
        {"code": r.code, "message": r.render(lambda v: ctx.text(v.value, v.kind))}
        for r in g.get("remarks", [])
    ]
    return {
        "engine": f"heatlift {heatlift.__version__}",
        "property_library": LIBRARY_VERSION,
        "units": ctx.system,
        "request_id": g.get("request_id", ""),
        "elapsed_ms": round((time.perf_counter() - g.get("started", time.perf_counter())) * 1e3, 3),
        "warnings": remarks,
    }


@functools.cache
def schema_instance(schema_class: type[Schema]) -> Schema:
    """One instance per schema class for the process: building a schema deep-copies every
    declared field and its nested schemas (most of a small request's cost when done per
    request); dumping and loading keep no state on the instance (units come from a context
    variable), so one instance serves every request."""
    return schema_class()


def reply(
    schema: type[Schema] | Schema,
    result: Any,
    rows_key: str | None = None,
    wrap: str | None = None,
    remarks: Iterable[Remark] = (),
) -> Response:
    """Dump ``result`` with ``schema`` (a class: its shared instance) in the caller's units and
    answer in the asked format.

    ``remarks`` (the engine result's reviewer remarks) go to ``meta.warnings``.

    ``wrap`` puts a dumped list under that key (and makes it the CSV rows); ``rows_key`` names
    the list inside the result that becomes the CSV rows.
    """
    g.setdefault("remarks", []).extend(remarks)
    if isinstance(schema, type):
        schema = schema_instance(schema)
    body = dump(schema, result)
    if wrap:
        body, rows_key = {wrap: body}, wrap
    fmt = request.args.get("format", "json").lower()
    selector = request.args.get("select")
    if fmt not in FORMATS:
        raise OutputError("format", f"format must be one of {', '.join(FORMATS)}")
    if selector:
        return _select(body, selector)
    if fmt == "csv":
        return csv_response(body, rows_key)
    body["meta"] = meta()
    return Response(to_json(body), mimetype="application/json")


def _select(body: dict[str, Any], path: str) -> Response:
    node: Any = body
    for part in path.split("."):
        if isinstance(node, dict) and part in node:
            node = node[part]
        elif isinstance(node, list) and part.isdigit() and int(part) < len(node):
            node = node[int(part)]
        else:
            raise OutputError("select", f"'{path}' is not a path in this result; "
                              f"top-level keys are {', '.join(body)}")
    if isinstance(node, dict) and set(node) == {"value", "unit"}:
        node = node["value"]
    if isinstance(node, dict | list):
        raise OutputError("select", f"'{path}' is an object; select a single number or text")
    text = "" if node is None else (json.dumps(node) if isinstance(node, bool) else str(node))
    return Response(text, mimetype="text/plain")


def flatten(node: Any, prefix: str = "") -> dict[str, Any]:
    """Nested result -> {"column [unit]": value}."""
    out: dict[str, Any] = {}
    if isinstance(node, dict) and set(node) == {"value", "unit"}:
        unit = node["unit"]
        out[f"{prefix} [{unit}]"] = node["value"]
    elif isinstance(node, dict):
        for key, value in node.items():
            out.update(flatten(value, f"{prefix}.{key}" if prefix else key))
    elif isinstance(node, list):
        if all(not isinstance(v, dict | list) for v in node):
            out[prefix] = ";".join(str(v) for v in node)
        else:
            for i, value in enumerate(node):
                out.update(flatten(value, f"{prefix}.{i}"))
    else:
        out[prefix] = node
    return out


def neutralise(cell: Any) -> Any:
    """A text cell a spreadsheet would run as a formula gets a leading apostrophe."""
    if isinstance(cell, str) and cell.startswith(_FORMULA_START):
        return "'" + cell
    return cell


def csv_text(records: list[dict[str, Any]]) -> str:
    columns: list[str] = []
    for record in records:
        for key in record:
            if key not in columns:
                columns.append(key)
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\r\n")
    writer.writerow(columns)
    for record in records:
        writer.writerow([neutralise(record.get(c, "")) for c in columns])
    return buffer.getvalue()


def unite_null_quantities(records: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """A quantity that is null in one row (``lower_flammability_limit`` of a non-flammable
    refrigerant) flattens without its unit; put it in the ``name [unit]`` column of the rows
    that have a value, so that each quantity is one column."""
    united: dict[str, str] = {}
    for record in records:
        for key in record:
            if key.endswith("]") and " [" in key:
                united.setdefault(key.rsplit(" [", 1)[0], key)
    return [
        {(united[k] if v is None and k in united else k): v for k, v in record.items()}
        for record in records
    ]


def csv_response(body: dict[str, Any], rows_key: str | None = None) -> Response:
    if rows_key and isinstance(body.get(rows_key), list):
        shared = {k: v for k, v in body.items() if k != rows_key}
        head = flatten(shared)
        records = [{**head, **flatten(row)} for row in body[rows_key]]
    else:
        records = [flatten(body)]
    return Response(csv_text(unite_null_quantities(records)), mimetype="text/csv")
