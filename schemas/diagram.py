"""Schemas of POST /v1/cycle/diagram: a cycle request plus the chart's own options."""

from __future__ import annotations

from typing import Any

from marshmallow import Schema, fields, post_load, validate

from schemas.cycle import CycleRequestSchema
from schemas.fields import Quantity

FORMATS = ("svg", "png")
MAX_ISOTHERMS = 12
CHART_OPTIONS = ("isotherms", "title", "width", "height")


class DiagramRequestSchema(CycleRequestSchema):
    """A POST /v1/cycle request, plus ``isotherms``, ``title``, ``width`` and ``height``.

    Loads into ``{"spec": CycleSpec, "isotherms": [K] | None, "title": str | None,
    "width": px, "height": px}``.
    """

    isotherms = fields.List(
        Quantity("temperature"), validate=validate.Length(max=MAX_ISOTHERMS),
        metadata={"description": "temperatures of the isotherms to draw (at most "
                                 f"{MAX_ISOTHERMS}; [] for none); default: 4 to 6 round "
                                 "temperatures spanning the cycle"})
    title = fields.String(validate=validate.Length(max=120),
                          metadata={"description": "chart title; default: refrigerant and circuit"})
    width = fields.Integer(load_default=1100, validate=validate.Range(800, 2400), metadata={
        "description": "image width [px] (PNG at 100 px per inch; SVG the same size in pt)"})
    height = fields.Integer(load_default=720, validate=validate.Range(500, 1600), metadata={
        "description": "image height [px]"})

    @post_load
    def _make(self, data: dict, **kwargs: Any) -> dict:  # type: ignore[override]
        options = {k: data.pop(k, None) for k in CHART_OPTIONS}
        options["spec"] = super()._make(data, **kwargs)
        return options


class DiagramQuerySchema(Schema):
    format = fields.String(validate=validate.OneOf(FORMATS), metadata={
        "description": "svg or png; without it the Accept header decides (image/png for PNG), "
                       "SVG by default"})
