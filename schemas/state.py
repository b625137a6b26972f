"""Schemas of the state look-up."""

from __future__ import annotations

from marshmallow import Schema, ValidationError, fields, validates_schema

from schemas.common import MetaSchema, StateSchema, UnitSettingsSchema, refrigerant_field
from schemas.fields import Quantity

STATE_INPUTS = ("pressure", "temperature", "enthalpy", "entropy", "quality")


class StateRequestSchema(UnitSettingsSchema):
    refrigerant = refrigerant_field()
    pressure = Quantity("pressure")
    temperature = Quantity("temperature")
    enthalpy = Quantity("specific_enthalpy")
    entropy = Quantity("specific_entropy")
    quality = Quantity("dimensionless", minimum=0.0, maximum=1.0)

    @validates_schema
    def _exactly_two(self, data: dict, **_: object) -> None:
        given = [k for k in STATE_INPUTS if k in data]
        if len(given) != 2:
            raise ValidationError(
                f"give exactly two of {', '.join(STATE_INPUTS)}; "
                f"got {len(given)}{': ' + ', '.join(given) if given else ''}",
                field_name="_schema",
            )


class StateReportSchema(Schema):
    refrigerant = fields.String()
    state = fields.Nested(StateSchema)
    phase = fields.Function(lambda r: r.state.phase, metadata={
        "type": "string", "enum": ["subcooled_liquid", "two_phase", "superheated_vapor",
                                   "supercritical"]})
    superheat = Quantity("temperature_difference", allow_none=True)
    subcooling = Quantity("temperature_difference", allow_none=True)
    temperature_bubble = Quantity("temperature", allow_none=True)
    temperature_dew = Quantity("temperature", allow_none=True)
    gauge_pressure = fields.Method("_gauge", metadata={
        "x-quantity-kind": "pressure",
        "description": "the state's pressure as a gauge reading against atmospheric_pressure"})

    def _gauge(self, report: object) -> dict:
        from schemas.fields import current_units

        ctx = current_units()
        unit = ctx.gauge_unit()
        return ctx.render(report.state.pressure, "pressure", unit)  # type: ignore[attr-defined]


class StateReplySchema(StateReportSchema):
    meta = fields.Nested(MetaSchema)
