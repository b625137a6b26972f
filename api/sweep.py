"""Running a cycle sweep: each value is put into a copy of the cycle request and solved.

Each row is loaded by the same schema as POST /v1/cycle, so the values are read in the
caller's units; a row that cannot be computed carries its problem instead of a result, and the
other rows still answer.
"""

from __future__ import annotations

import copy
from typing import Any

from marshmallow import ValidationError

from api.output import schema_instance
from api.problems import _flatten
from heatlift import cycle
from heatlift.errors import HeatliftError
from schemas.cycle import CycleRequestSchema, CycleResultSchema
from schemas.dumping import dump
from schemas.fields import current_units


def _set_path(body: dict, path: str, value: Any) -> None:
    node = body
    parts = path.split(".")
    for part in parts[:-1]:
        child = node.get(part)
        if child is None:
            child = node[part] = {}
        if not isinstance(child, dict):
            raise ValidationError({"vary": [f"'{part}' in '{path}' is not an object"]})
        node = child
    node[parts[-1]] = value


def run_sweep(body: dict, vary: str, values: list[Any]) -> dict[str, Any]:
    ctx = current_units()
    rows = []
    schema = schema_instance(CycleRequestSchema)
    for value in values:
        request = copy.deepcopy(body["cycle"])
        _set_path(request, vary, value)
        try:
            spec = schema.load(request)
            result = cycle.solve(spec)
        except ValidationError as exc:
            rows.append({"value": value, "result": None,
                         "error": {"status": 422, "errors": _flatten(exc.messages)}})
            continue
        except HeatliftError as exc:
            rows.append({"value": value, "result": None, "error": {
                "status": exc.status, "title": exc.title,
                "detail": exc.render(lambda v: ctx.text(v.value, v.kind))}})
            continue
        dumped = dump(schema_instance(CycleResultSchema), result)
        dumped["warnings"] = [r.render(lambda v: ctx.text(v.value, v.kind))
                              for r in result.remarks]
        rows.append({"value": value, "result": dumped, "error": None})
    return {"vary": vary, "rows": rows}
