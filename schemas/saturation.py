"""Schemas of the saturation look-ups."""

from __future__ import annotations

from marshmallow import Schema, ValidationError, fields, post_load, validate, validates_schema

from schemas.common import (
    MetaSchema,
    QueryUnitSettingsSchema,
    SaturatedPhaseSchema,
    refrigerant_field,
)
from schemas.fields import Quantity


class _OneOfTemperaturePressure:
    @validates_schema
    def _exactly_one(self, data: dict, **_: object) -> None:
        given = [k for k in ("temperature", "pressure") if k in data]
        if len(given) != 1:
            raise ValidationError(
                "give exactly one of temperature or pressure"
                + (" (both were given)" if len(given) == 2 else ""),
                field_name="temperature",
            )


class SaturationQuerySchema(_OneOfTemperaturePressure, QueryUnitSettingsSchema):
    refrigerant = refrigerant_field()
    temperature = Quantity("temperature", metadata={"description": "saturation temperature"})
    pressure = Quantity("pressure", metadata={"description": "saturation pressure"})


class SaturationBodySchema(_OneOfTemperaturePressure, Schema):
    units = fields.String(validate=validate.OneOf(["SI", "IP", "si", "ip"]))
    unit_overrides = fields.Dict(keys=fields.String(), values=fields.String())
    atmospheric_pressure = Quantity("pressure")
    refrigerant = refrigerant_field()
    temperature = Quantity("temperature")
    pressure = Quantity("pressure")


class SaturationSchema(Schema):
    """Bubble and dew points of one saturation look-up."""

    refrigerant = fields.String()
    temperature_bubble = Quantity("temperature")
    temperature_dew = Quantity("temperature")
    pressure_bubble = Quantity("pressure")
    pressure_dew = Quantity("pressure")
    gauge_pressure = fields.Method("_gauge", metadata={
        "type": "object",
        "description": "bubble and dew: the pressures as gauge readings (kPag, psig, barg) "
                       "against atmospheric_pressure"})
    glide = Quantity("temperature_difference")
    latent_heat = Quantity("specific_enthalpy")
    liquid = fields.Nested(SaturatedPhaseSchema)
    vapor = fields.Nested(SaturatedPhaseSchema)

    def _gauge(self, obj: object) -> dict:
        from schemas.fields import current_units

        ctx = current_units()
        gauge_unit = ctx.gauge_unit()
        return {
            "bubble": ctx.render(obj.pressure_bubble, "pressure", gauge_unit),  # type: ignore[attr-defined]
            "dew": ctx.render(obj.pressure_dew, "pressure", gauge_unit),  # type: ignore[attr-defined]
        }


class SaturationReplySchema(SaturationSchema):
    meta = fields.Nested(MetaSchema)


class SaturationTableQuerySchema(QueryUnitSettingsSchema):
    refrigerant = refrigerant_field()
    by = fields.String(load_default="temperature",
                       validate=validate.OneOf(["temperature", "pressure"]))
    start = fields.String(required=True, metadata={"description": "first temperature or pressure"})
    stop = fields.String(required=True, metadata={"description": "last temperature or pressure"})
    step = fields.String(required=True, metadata={
        "description": "step: a temperature difference (K) or a pressure difference"})

    @post_load
    def _quantities(self, data: dict, **_: object) -> dict:
        """Read start/stop/step as temperatures or pressures, by ``by``."""
        kinds = {"temperature": ("temperature", "temperature_difference"),
                 "pressure": ("pressure", "pressure_drop")}[data["by"]]
        errors: dict[str, list[str]] = {}
        for name, kind in (("start", kinds[0]), ("stop", kinds[0]), ("step", kinds[1])):
            try:
                bound = {"step": 0.0}.get(name)
                field = Quantity(kind, minimum=bound, exclusive=True)
                data[name] = field.deserialize(data[name])
            except ValidationError as exc:
                errors[name] = list(exc.messages)  # type: ignore[arg-type]
        if errors:
            raise ValidationError(errors)
        return data


class SaturationTableSchema(Schema):
    refrigerant = fields.String()
    by = fields.String()
    rows = fields.List(fields.Nested(SaturationSchema))


class SaturationTableReplySchema(SaturationTableSchema):
    meta = fields.Nested(MetaSchema)
