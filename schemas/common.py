"""Fields and schemas shared by every domain: unit settings, refrigerant, meta, state."""

from __future__ import annotations

from marshmallow import INCLUDE, Schema, fields, validate

from schemas.fields import Quantity

PHASES = ("subcooled_liquid", "two_phase", "superheated_vapor", "supercritical")


class UnitSettingsSchema(Schema):
    """Fields every request may carry; they are read before the rest of the request."""

    units = fields.String(
        load_default="SI",
        validate=validate.OneOf(["SI", "IP", "si", "ip"]),
        metadata={"description": "SI (default) or IP: how bare numbers are read, results written"},
    )
    unit_overrides = fields.Dict(
        keys=fields.String(), values=fields.String(),
        metadata={"description": 'kind -> output unit, e.g. {"pressure": "bar", "power": "TR"}'},
    )
    atmospheric_pressure = Quantity(
        "pressure", metadata={"description": "for gauge units; default 101.325 kPa"}
    )


class QueryUnitSettingsSchema(UnitSettingsSchema):
    """Unit settings and output format for GET endpoints."""

    # a query string has no objects: kind:unit pairs, comma-separated (read by api.context)
    unit_overrides = fields.String(  # type: ignore[assignment]
        metadata={"description": "kind:unit pairs that change single kinds on output, e.g. "
                                 "pressure:bar,power:TR"},
    )

    format = fields.String(validate=validate.OneOf(["json", "csv"]),
                           metadata={"description": "json (default) or csv"})
    select = fields.String(metadata={"description": "dotted path of one value, answered as text"})


def refrigerant_field(**kwargs: object) -> fields.String:
    return fields.String(
        required=True,
        validate=validate.Length(min=1, max=64),
        metadata={"description": "ISO 817 / ASHRAE 34 designation, e.g. R134a, R454B, R744"},
        **kwargs,  # type: ignore[arg-type]
    )


class WarningSchema(Schema):
    code = fields.String()
    message = fields.String()


class MetaSchema(Schema):
    engine = fields.String()
    property_library = fields.String()
    units = fields.String()
    request_id = fields.String()
    elapsed_ms = fields.Float()
    warnings = fields.List(fields.Nested(WarningSchema))


class StateSchema(Schema):
    """A thermodynamic state (dumped from :class:`heatlift.properties.State`)."""

    pressure = Quantity("pressure")
    temperature = Quantity("temperature")
    enthalpy = Quantity("specific_enthalpy")
    entropy = Quantity("specific_entropy")
    density = Quantity("density")
    quality = Quantity("dimensionless", allow_none=True)
    phase = fields.String(metadata={"enum": list(PHASES)})


class SaturatedPhaseSchema(Schema):
    """One saturated phase: the bubble-point liquid or the dew-point vapour."""

    temperature = Quantity("temperature")
    pressure = Quantity("pressure")
    density = Quantity("density")
    enthalpy = Quantity("specific_enthalpy")
    entropy = Quantity("specific_entropy")


class ProblemSchema(Schema):
    """RFC 9457 problem details (extension members such as ``suggestions`` may follow)."""

    class Meta:
        unknown = INCLUDE

    type = fields.String()
    title = fields.String()
    status = fields.Integer()
    detail = fields.String()
    errors = fields.Dict(keys=fields.String(), values=fields.List(fields.String()))
    suggestions = fields.List(fields.String(), metadata={
        "description": "close matches of an unknown refrigerant"})
