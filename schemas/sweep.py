"""Schemas of the cycle sweep: one input of a cycle request varied over a range."""

from __future__ import annotations

from typing import Any

from marshmallow import Schema, ValidationError, fields, validates_schema

from schemas.common import MetaSchema, UnitSettingsSchema
from schemas.units import UnitError, split_quantity_text


class SweepRequestSchema(UnitSettingsSchema):
    cycle = fields.Dict(required=True, metadata={"description": "a POST /v1/cycle request body"})
    vary = fields.String(required=True, metadata={
        "description": "dotted path of the input to vary, e.g. condensing.temperature"})
    start = fields.Raw(metadata={"description": "first value: a number or '30 degC'"})
    stop = fields.Raw(metadata={"description": "last value, in the unit of start"})
    step = fields.Raw(metadata={"description": "step, a number in the unit of start"})
    values = fields.List(fields.Raw(), metadata={"description": "or the values themselves"})

    @validates_schema
    def _range_or_values(self, data: dict, **_: Any) -> None:
        has_range = all(k in data for k in ("start", "stop", "step"))
        if has_range == ("values" in data):
            raise ValidationError("give either start, stop and step, or values",
                                  field_name="values")
        inner = data.get("cycle") or {}
        if any(k in inner for k in ("units", "unit_overrides", "atmospheric_pressure")):
            raise ValidationError("put units, unit_overrides and atmospheric_pressure at the top "
                                  "level of the sweep request; they apply to every row",
                                  field_name="cycle")


def _number_and_unit(raw: Any, name: str) -> tuple[float, str | None]:
    if isinstance(raw, bool):
        raise ValidationError({name: ["must be a number or a number with unit"]})
    if isinstance(raw, int | float):
        return float(raw), None
    if isinstance(raw, dict) and "value" in raw:
        return _number_and_unit(raw["value"], name)[0], raw.get("unit")
    if isinstance(raw, str):
        try:
            return split_quantity_text(raw)
        except UnitError as exc:
            raise ValidationError({name: [str(exc)]}) from exc
    raise ValidationError({name: ["must be a number or a number with unit"]})


def sweep_values(args: dict, max_points: int) -> list[Any]:
    """The values to put at the varied path, in the caller's own notation."""
    if "values" in args:
        values = list(args["values"])
    else:
        start, unit = _number_and_unit(args["start"], "start")
        stop, stop_unit = _number_and_unit(args["stop"], "stop")
        step, _ = _number_and_unit(args["step"], "step")
        if stop_unit not in (None, unit):
            raise ValidationError({"stop": [f"give stop in the unit of start ({unit})"]})
        if step <= 0 or stop < start:
            raise ValidationError({"step": ["step must be positive and stop not below start"]})
        count = int((stop - start) / step + 1e-9) + 1
        if count > max_points:
            raise ValidationError({"step": [
                f"the sweep would have {count} points; the limit is {max_points}"]})
        values = [start + i * step for i in range(count)]
        if unit:
            values = [{"value": v, "unit": unit} for v in values]
    if not values:
        raise ValidationError({"values": ["give at least one value"]})
    if len(values) > max_points:
        raise ValidationError({"values": [
            f"the sweep has {len(values)} points; the limit is {max_points}"]})
    return values


class SweepRowSchema(Schema):
    value = fields.Raw()
    result = fields.Dict(allow_none=True)
    error = fields.Dict(allow_none=True)


class SweepResultSchema(Schema):
    vary = fields.String()
    rows = fields.List(fields.Nested(SweepRowSchema))


class SweepReplySchema(SweepResultSchema):
    meta = fields.Nested(MetaSchema)
