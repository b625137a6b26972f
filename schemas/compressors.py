"""Schemas of the compressor polynomial evaluation (AHRI 540 / EN 12900)."""

from __future__ import annotations

from typing import Any

from marshmallow import (
    Schema,
    ValidationError,
    fields,
    post_dump,
    post_load,
    validate,
    validates_schema,
)

from heatlift.compressor import BASES, FIGURES, POWER_CORRECTIONS, PolynomialSpec, RatingConditions
from schemas.common import MetaSchema, UnitSettingsSchema, refrigerant_field
from schemas.fields import Quantity


def coefficient_list() -> fields.List:
    return fields.List(
        fields.Float(allow_nan=False), validate=validate.Length(equal=10),
        metadata={"description": "C1..C10 in the term order of AHRI 540 / EN 12900, in the "
                                 "units of basis"},
    )


class PolynomialCoefficientsSchema(Schema):
    """Coefficients C1..C10 of each polynomial given (at least one)."""

    capacity = coefficient_list()
    power = coefficient_list()
    mass_flow = coefficient_list()
    current = coefficient_list()


class PolynomialRatingSchema(Schema):
    """The conditions the coefficients were fitted at."""

    superheat = Quantity("temperature_difference", minimum=0.0,
                         metadata={"description": "rating superheat (EN 12900 often 10 K)"})
    return_gas_temperature = Quantity(
        "temperature", metadata={"description": "rating suction gas temperature, instead of a "
                                                "superheat (e.g. 20 degC or 65 degF)"})
    subcooling = Quantity("temperature_difference", minimum=0.0, load_default=0.0,
                          metadata={"description": "rating liquid subcooling, default 0 K"})

    @validates_schema
    def _one_suction_condition(self, data: dict, **_: object) -> None:
        given = [k for k in ("superheat", "return_gas_temperature") if k in data]
        if len(given) != 1:
            raise ValidationError("give exactly one of superheat or return_gas_temperature",
                                  field_name="superheat")

    @post_load
    def _conditions(self, data: dict, **_: object) -> RatingConditions:
        return RatingConditions(data.get("superheat"), data.get("return_gas_temperature"),
                                data["subcooling"])


class PolynomialRequestSchema(UnitSettingsSchema):
    refrigerant = refrigerant_field()
    basis = fields.String(
        required=True, validate=validate.OneOf(BASES),
        metadata={"description": "SI: degC with W (capacity, power), kg/s, A; IP: degF with "
                                 "Btu/h (capacity), W (power), lb/h, A"})
    coefficients = fields.Nested(PolynomialCoefficientsSchema, required=True)
    rating = fields.Nested(PolynomialRatingSchema, required=True)
    evaporating_temperature = Quantity("temperature", required=True,
                                       metadata={"description": "suction dew point"})
    condensing_temperature = Quantity("temperature", required=True,
                                      metadata={"description": "discharge dew point"})
    superheat = Quantity("temperature_difference", minimum=0.0,
                         metadata={"description": "actual superheat; default the rating's"})
    subcooling = Quantity("temperature_difference", minimum=0.0,
                          metadata={"description": "actual subcooling; default the rating's"})
    displacement = Quantity("volume_flow", minimum=0.0, exclusive=True,
                            metadata={"description": "swept volume flow at the rated speed"})
    envelope = fields.List(
        fields.Tuple((Quantity("temperature"), Quantity("temperature"))),
        validate=validate.Length(min=3, max=500),
        metadata={"description": "operating envelope: [[evaporating, condensing], ...] dew "
                                 "points, the polygon's corners in order"},
    )
    power_correction = fields.String(
        load_default="isentropic_efficiency", validate=validate.OneOf(POWER_CORRECTIONS),
        metadata={"description": "isentropic_efficiency (default): power scales with mass flow "
                                 "and isentropic enthalpy rise; unchanged: power as rated"})

    @validates_schema
    def _at_least_one(self, data: dict, **_: object) -> None:
        if "coefficients" in data and not any(n in data["coefficients"] for n in FIGURES):
            raise ValidationError("give at least one of capacity, power, mass_flow, current",
                                  field_name="coefficients")

    @post_load
    def _spec(self, data: dict[str, Any], **_: object) -> dict[str, Any]:
        coefficients = {k: tuple(v) for k, v in data["coefficients"].items()}
        envelope = data.get("envelope")
        data["spec"] = PolynomialSpec(
            refrigerant=data["refrigerant"],
            rating=data["rating"],
            basis=data["basis"],
            displacement=data.get("displacement"),
            envelope=tuple((float(a), float(b)) for a, b in envelope) if envelope else None,
            power_correction=data["power_correction"],
            **coefficients,
        )
        return data


class _OmitAbsent:
    """A figure the polynomials given do not determine is left out (a quantity is always a
    {value, unit} object, never null)."""

    @post_dump
    def _omit_absent(self, data: dict[str, Any], **_: object) -> dict[str, Any]:
        return {k: v for k, v in data.items() if v is not None or k == "within_envelope"}


class CompressorPerformanceSchema(_OmitAbsent, Schema):
    """Compressor figures at one superheat and subcooling (absent where not determined)."""

    superheat = Quantity("temperature_difference")
    subcooling = Quantity("temperature_difference")
    suction_temperature = Quantity("temperature")
    suction_density = Quantity("density")
    refrigerating_effect = Quantity("specific_enthalpy",
                                    metadata={"description": "h1 - h4"})
    isentropic_enthalpy_rise = Quantity("specific_enthalpy", attribute="isentropic_work",
                                        metadata={"description": "h2s - h1"})
    capacity = Quantity("power", allow_none=True)
    power = Quantity("power", allow_none=True)
    mass_flow = Quantity("mass_flow", allow_none=True)
    current = Quantity("current", allow_none=True)
    cop = Quantity("dimensionless", allow_none=True)
    isentropic_efficiency = Quantity("dimensionless", allow_none=True)
    volumetric_efficiency = Quantity("dimensionless", allow_none=True)


class PolynomialResultSchema(_OmitAbsent, Schema):
    """The polynomial as rated (top level and ``rating``) and ``corrected`` to the actual
    superheat and subcooling."""

    refrigerant = fields.String()
    basis = fields.String()
    power_correction = fields.String()
    evaporating_temperature = Quantity("temperature")
    condensing_temperature = Quantity("temperature")
    pressure_evaporating = Quantity("pressure")
    pressure_condensing = Quantity("pressure")
    capacity = Quantity("power", attribute="rating.capacity", allow_none=True)
    power = Quantity("power", attribute="rating.power", allow_none=True)
    mass_flow = Quantity("mass_flow", attribute="rating.mass_flow", allow_none=True)
    current = Quantity("current", attribute="rating.current", allow_none=True)
    cop = Quantity("dimensionless", attribute="rating.cop", allow_none=True)
    isentropic_efficiency = Quantity("dimensionless", attribute="rating.isentropic_efficiency",
                                     allow_none=True)
    volumetric_efficiency = Quantity("dimensionless", attribute="rating.volumetric_efficiency",
                                     allow_none=True)
    rating = fields.Nested(CompressorPerformanceSchema)
    corrected = fields.Nested(CompressorPerformanceSchema)
    within_envelope = fields.Boolean(allow_none=True)


class PolynomialReplySchema(PolynomialResultSchema):
    meta = fields.Nested(MetaSchema)
