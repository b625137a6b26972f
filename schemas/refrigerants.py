"""Schemas of the refrigerant catalogue."""

from __future__ import annotations

from marshmallow import Schema, fields

from schemas.common import MetaSchema
from schemas.fields import Quantity


class GwpSchema(Schema):
    AR4 = fields.Float(allow_none=True)
    AR5 = fields.Float(allow_none=True)
    AR6 = fields.Float(allow_none=True)


class RefrigerantSchema(Schema):
    designation = fields.String()
    kind = fields.String(metadata={"enum": ["pure", "azeotrope", "zeotrope"]})
    composition = fields.Dict(keys=fields.String(), values=fields.Float(),
                              metadata={"description": "mass fractions"})
    safety_class = fields.String(metadata={"description": "ASHRAE 34 / ISO 817 safety class"})
    gwp100 = fields.Nested(GwpSchema)
    critical_temperature = Quantity("temperature")
    critical_pressure = Quantity("pressure")
    normal_boiling_point = Quantity("temperature", allow_none=True)
    lower_flammability_limit = Quantity("concentration", allow_none=True)
    practical_limit = Quantity("concentration", allow_none=True)
    sources = fields.Dict(keys=fields.String(), values=fields.String())
    caution = fields.String(allow_none=True)


class RefrigerantListSchema(Schema):
    refrigerants = fields.List(fields.Nested(RefrigerantSchema))
    meta = fields.Nested(MetaSchema)


class RefrigerantReplySchema(RefrigerantSchema):
    meta = fields.Nested(MetaSchema)
