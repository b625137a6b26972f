"""POST /v1/datasheets/validate: consistency checks of datasheet rows; JSON, CSV or JUnit out."""

from __future__ import annotations

from typing import Any

from flask import Response, current_app, request
from flask.views import MethodView
from flask_smorest import Blueprint
from marshmallow import Schema, ValidationError
from werkzeug.exceptions import BadRequest, RequestEntityTooLarge, UnprocessableEntity

from api.batch import many_rows
from api.encoding import to_json, to_json_with_items
from api.output import csv_text, flatten, meta, schema_instance
from heatlift import datasheet
from heatlift.csvfile import CsvError, TooManyRows
from heatlift.junit import junit_xml
from schemas.datasheets import (
    DatasheetBodySchema,
    DatasheetQuerySchema,
    DatasheetReplySchema,
    DatasheetRowReportSchema,
    DatasheetRowSchema,
    DatasheetValidationSchema,
    check_json_rows,
    csv_rows,
    load_rows,
    tolerances_from,
)
from schemas.dumping import dump

ORDER = 80
DEFAULT_MAX_ROWS = 10_000
PART_ROWS = 250  # rows checked, written and encoded at a time in a JSON report
blp = Blueprint("datasheets", __name__, url_prefix="/v1/datasheets",
                description="Consistency checks of compressor datasheets, for CI")

_MEDIA = {"application/json": "json", "text/csv": "csv", "application/xml": "junit",
          "text/xml": "junit", "application/junit+xml": "junit"}
_MIMETYPES = {"json": "application/json", "csv": "text/csv", "junit": "application/xml"}


class DatasheetInvalid(UnprocessableEntity):
    def __init__(self, errors: dict[str, Any]) -> None:
        super().__init__("The datasheet could not be read.")
        self.data = {"messages": errors}


def _too_many(limit: int) -> RequestEntityTooLarge:
    return RequestEntityTooLarge(
        f"The datasheet has more than {limit} rows, the limit of this service "
        "(HEATLIFT_MAX_ROWS); split it into parts of at most that many rows.")


def _read(limit: int) -> tuple[list[tuple[int | None, dict[str, Any]]], dict[str, Any] | None]:
    """Raw rows (line, cells) and the body's tolerances, from a JSON or CSV body."""
    if request.mimetype == "text/csv":
        try:
            text = request.get_data(cache=True).decode("utf-8")
        except UnicodeDecodeError as exc:
            raise BadRequest("The CSV is not UTF-8 text; save it as CSV UTF-8.") from exc
        try:
            return csv_rows(text, limit), None
        except CsvError as exc:
            raise BadRequest(f"The body is not valid CSV: {exc}.") from exc
        except TooManyRows as exc:
            raise _too_many(exc.limit) from exc
        except ValidationError as exc:
            raise DatasheetInvalid(exc.messages_dict) from exc
    data = request.get_json(silent=True) if request.get_data(cache=True) else None
    tolerances = None
    if isinstance(data, dict):
        if isinstance(data.get("rows"), list) and len(data["rows"]) > limit:
            raise _too_many(limit)
        try:
            loaded = schema_instance(DatasheetBodySchema).load(data)
        except ValidationError as exc:
            raise DatasheetInvalid(exc.messages_dict) from exc
        data, tolerances = loaded["rows"], loaded.get("tolerances")
    if not isinstance(data, list):
        raise DatasheetInvalid({"_body": [
            "send the rows as a JSON array of objects, a JSON object with 'rows', or a CSV "
            "body with Content-Type text/csv"]})
    if len(data) > limit:
        raise _too_many(limit)
    try:
        return check_json_rows(data), tolerances
    except ValidationError as exc:
        raise DatasheetInvalid(exc.messages_dict) from exc


def _format(asked: str | None) -> str:
    if asked:
        return asked
    best = request.accept_mimetypes.best_match(list(_MEDIA), default="application/json")
    return _MEDIA.get(best or "application/json", "json")


def _csv_records(body: dict[str, Any]) -> list[dict[str, Any]]:
    records = []
    for row in body["rows"]:
        record = {k: row[k] for k in ("row", "line", "model", "refrigerant", "verdict")}
        for check in row["checks"]:
            # the tolerance is the same in every line and the messages state it
            fields = {k: v for k, v in check.items()
                      if k not in ("name", "number", "measure", "tolerance")}
            record.update(flatten(fields, check["name"]))
        records.append(record)
    return records


def _json_report(rows: list[datasheet.DatasheetRow | datasheet.RowReport],
                 tolerances: datasheet.Tolerances) -> bytes:
    """The JSON report, as ``DatasheetReplySchema`` writes it, checked and encoded
    ``PART_ROWS`` rows at a time: the objects of a report (some 4 kB of JSON a row) are freed
    part by part instead of all being alive until the whole answer is encoded (for 10,000 rows
    that was some 400 MB in a worker, and the time per row grew with the rows)."""
    tol = tolerances.checked()
    row_schema = schema_instance(DatasheetRowReportSchema)
    verdicts: list[str] = []
    parts: list[bytes] = []
    part: list[datasheet.RowReport] = []
    for report in datasheet.reports(rows, tol):
        part.append(report)
        if len(part) == PART_ROWS:
            parts.append(_encoded(row_schema, part, verdicts))
            part = []
    parts.append(_encoded(row_schema, part, verdicts))
    head = dump(schema_instance(DatasheetValidationSchema),
                datasheet.Validation((), datasheet.summarise(verdicts), tol))
    head["meta"] = meta()
    return to_json_with_items(head, "rows", parts)


def _encoded(schema: Schema, part: list[datasheet.RowReport],
             verdicts: list[str]) -> bytes:
    """The rows of ``part`` as JSON array items (no brackets); their verdicts added to
    ``verdicts``."""
    verdicts.extend(r.verdict for r in part)
    return to_json([dump(schema, r) for r in part])[1:-1]


_BODY_DOC = {
    "required": True,
    "description": "rows as a JSON array, a JSON object {rows, tolerances, units}, or CSV "
                   "(text/csv) with units in the headers, e.g. 'cooling_capacity [kW]'",
    "content": {
        "application/json": {"schema": {"oneOf": [
            {"type": "array", "items": DatasheetRowSchema},
            DatasheetBodySchema,
        ]}},
        "text/csv": {"schema": {"type": "string"}},
    },
}


_REPLY_DOC = {
    "description": "the report: JSON (default), CSV (one line per row) or JUnit XML (one test "
                   "case per row)",
    "content": {
        "application/json": {"schema": DatasheetReplySchema},
        "text/csv": {"schema": {"type": "string"}},
        "application/xml": {"schema": {"type": "string"}},
    },
}


@blp.route("/validate")
class Validate(MethodView):
    content_types = ("application/json", "text/csv")

    @blp.arguments(DatasheetQuerySchema(), location="query")
    @blp.doc(requestBody=_BODY_DOC, responses={"200": _REPLY_DOC})
    @blp.response(200, DatasheetReplySchema)
    @many_rows
    def post(self, query):
        """Check datasheet rows against the physics and against each other.

        Capacity against mass flow, COP against Carnot, the implied efficiencies, COP and EER,
        the polynomial, the saturation pressures. JSON (default), CSV or JUnit XML by Accept
        or format=.
        """
        limit = int(current_app.config.get("HEATLIFT_MAX_ROWS", DEFAULT_MAX_ROWS))
        raw, body_tolerances = _read(limit)
        if not raw:
            raise DatasheetInvalid({"rows": ["the datasheet has no rows"]})
        tolerances = tolerances_from(query, body_tolerances)
        rows, fmt = load_rows(raw), _format(query.get("format"))
        if fmt == "json":
            return Response(_json_report(rows, tolerances), mimetype=_MIMETYPES["json"])
        body = dump(schema_instance(DatasheetValidationSchema),
                    datasheet.validate(rows, tolerances))
        if fmt == "csv":
            return Response(csv_text(_csv_records(body)), mimetype=_MIMETYPES["csv"])
        return Response(junit_xml(body["rows"]), mimetype=_MIMETYPES["junit"])
