"""Schemas of the cycle endpoints: the request loads into a :class:`heatlift.cycle.CycleSpec`."""

from __future__ import annotations

from typing import Any

from marshmallow import Schema, ValidationError, fields, post_load, validate, validates_schema

from heatlift.compressor import BASES as POLYNOMIAL_BASES
from heatlift.compressor import POWER_CORRECTIONS, PolynomialSpec
from heatlift.cycle import (
    CIRCUITS,
    CompressorSpec,
    CycleSpec,
    GasCoolerSpec,
    PressureDrop,
    PressureDrops,
    SaturationSpec,
)
from heatlift.cycle.result import CyclePoint, CycleResult
from heatlift.cycle.spec import BASES
from schemas.common import (
    MetaSchema,
    QueryUnitSettingsSchema,
    UnitSettingsSchema,
    refrigerant_field,
)
from schemas.compressors import PolynomialCoefficientsSchema, PolynomialRatingSchema
from schemas.fields import Quantity, current_units
from schemas.units import UnitError, split_quantity_text

CYCLE_CAUTION = (
    "Pressures and discharge temperatures are estimates from the equation of state for the "
    "stated conditions; the compressor maker's envelope, the pressure ratings of the parts, local "
    "codes and a licensed practitioner decide."
)


class SaturationConditionSchema(Schema):
    temperature = Quantity("temperature")
    pressure = Quantity("pressure")
    basis = fields.String(load_default="dew", validate=validate.OneOf(BASES), metadata={
        "description": "for blends: dew (default, as compressor ratings), mean or bubble"})

    @validates_schema
    def _one(self, data: dict, **_: Any) -> None:
        if ("temperature" in data) == ("pressure" in data):
            raise ValidationError("give exactly one of temperature or pressure",
                                  field_name="temperature")

    @post_load
    def _make(self, data: dict, **_: Any) -> SaturationSpec:
        return SaturationSpec(data.get("temperature"), data.get("pressure"), data["basis"])


class GasCoolerField(fields.Field):
    """``"optimal"`` or a pressure quantity."""

    def _deserialize(self, value: Any, attr: Any, data: Any, **kwargs: Any) -> float | None:
        if isinstance(value, str) and value.strip().lower() == "optimal":
            return None
        return Quantity("pressure")._deserialize(value, attr, data)


class GasCoolerSchema(Schema):
    outlet_temperature = Quantity("temperature", required=True)
    pressure = GasCoolerField(load_default=None, metadata={
        "description": 'a pressure, or "optimal" (default) for the highest COP'})

    @post_load
    def _make(self, data: dict, **_: Any) -> GasCoolerSpec:
        return GasCoolerSpec(data["outlet_temperature"], data.get("pressure"))


class CyclePolynomialSchema(Schema):
    """A compressor polynomial inside a cycle request (the refrigerant is the cycle's)."""

    basis = fields.String(required=True, validate=validate.OneOf(POLYNOMIAL_BASES))
    coefficients = fields.Nested(PolynomialCoefficientsSchema, required=True)
    rating = fields.Nested(PolynomialRatingSchema, required=True)
    power_correction = fields.String(load_default="isentropic_efficiency",
                                     validate=validate.OneOf(POWER_CORRECTIONS))

    @post_load
    def _make(self, data: dict, **_: Any) -> PolynomialSpec:
        return PolynomialSpec(
            refrigerant="",  # filled with the cycle's refrigerant by the engine
            rating=data["rating"], basis=data["basis"],
            power_correction=data["power_correction"],
            **{k: tuple(v) for k, v in data["coefficients"].items()},  # type: ignore[arg-type]
        )


class CompressorSchema(Schema):
    isentropic_efficiency = Quantity("dimensionless", minimum=0.0, maximum=1.0, exclusive=False)
    heat_loss_fraction = Quantity("dimensionless", minimum=0.0, maximum=0.5, load_default=0.0)
    displacement = Quantity("volume_flow", minimum=0.0, exclusive=True)
    volumetric_efficiency = Quantity("dimensionless", minimum=0.0, maximum=1.0)
    polynomial = fields.Nested(CyclePolynomialSchema, load_default=None, metadata={
        "description": "the supplier's AHRI 540 / EN 12900 polynomials; they size the cycle"})

    @validates_schema
    def _efficiency(self, data: dict, **_: Any) -> None:
        eta = data.get("isentropic_efficiency")
        if eta is not None and eta <= 0.0:
            raise ValidationError("isentropic_efficiency must be above 0 and at most 1",
                                  field_name="isentropic_efficiency")

    @post_load
    def _make(self, data: dict, **_: Any) -> CompressorSpec:
        return CompressorSpec(
            isentropic_efficiency=data.get("isentropic_efficiency", 0.7),
            heat_loss_fraction=data["heat_loss_fraction"],
            displacement=data.get("displacement"),
            volumetric_efficiency=data.get("volumetric_efficiency"),
            polynomial=data.get("polynomial"),
        )


class DropField(fields.Field):
    """A pressure drop, or the saturation-temperature drop it causes (a unit K or delta_degF).

    A bare number is a pressure drop in the request's unit system; ``"1 K"`` or
    ``{"value": 1, "unit": "K"}`` is a saturation-temperature drop.
    """

    def _deserialize(self, value: Any, attr: Any, data: Any, **kwargs: Any) -> PressureDrop:
        unit = None
        if isinstance(value, dict):
            unit = value.get("unit")
        elif isinstance(value, str):
            try:
                unit = split_quantity_text(value)[1]
            except UnitError as exc:
                raise ValidationError(str(exc)) from exc
        if isinstance(unit, str) and _is_temperature_difference(unit):
            drop = Quantity("temperature_difference", minimum=0.0)._deserialize(value, attr, data)
            return PressureDrop(saturation_temperature=drop)
        try:
            drop = Quantity("pressure_drop", minimum=0.0)._deserialize(value, attr, data)
        except ValidationError as exc:
            raise ValidationError(
                f"{' '.join(str(m) for m in exc.messages)} (or give a saturation-temperature "  # type: ignore[union-attr]
                "drop in K or delta_degF)") from exc
        return PressureDrop(pressure=drop)


def _is_temperature_difference(unit: str) -> bool:
    from schemas.units import affine_map

    try:
        affine_map(unit, "temperature_difference")
        return True
    except UnitError:
        return False


class PressureDropsSchema(Schema):
    suction_line = DropField()
    discharge_line = DropField()
    evaporator = DropField()
    condenser = DropField()

    @post_load
    def _make(self, data: dict, **_: Any) -> PressureDrops:
        return PressureDrops(**data)


class InternalHeatExchangerSchema(Schema):
    effectiveness = Quantity("dimensionless", minimum=0.0, maximum=1.0, required=True)


class EconomizerSchema(Schema):
    type = fields.String(load_default="subcooler", validate=validate.OneOf(["subcooler", "flash"]))
    approach = Quantity("temperature_difference", minimum=0.0, load_default=5.0)
    superheat = Quantity("temperature_difference", minimum=0.0, load_default=5.0)


class FlashTankSchema(Schema):
    pressure = Quantity("pressure", required=True)


_TD = "temperature_difference"


class CycleRequestSchema(UnitSettingsSchema):
    """A cycle to solve; loads into a :class:`heatlift.cycle.CycleSpec`."""

    refrigerant = refrigerant_field()
    circuit = fields.String(load_default="single_stage", validate=validate.OneOf(CIRCUITS))
    evaporating = fields.Nested(SaturationConditionSchema, required=True)
    condensing = fields.Nested(SaturationConditionSchema)
    gas_cooler = fields.Nested(GasCoolerSchema)
    superheat = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=5.0)
    suction_line_superheat = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=0.0)
    subcooling = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=2.0)
    liquid_line_subcooling = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=0.0)
    compressor = fields.Nested(CompressorSchema, load_default=None)
    high_stage_compressor = fields.Nested(CompressorSchema, load_default=None)
    cooling_capacity = Quantity("power", minimum=0.0, exclusive=True)
    heating_capacity = Quantity("power", minimum=0.0, exclusive=True)
    mass_flow = Quantity("mass_flow", minimum=0.0, exclusive=True)
    pressure_drops = fields.Nested(PressureDropsSchema, load_default=None)
    internal_heat_exchanger = fields.Nested(InternalHeatExchangerSchema, load_default=None)
    intermediate_pressure = Quantity("pressure")
    economizer = fields.Nested(EconomizerSchema, load_default=None)
    flash_tank = fields.Nested(FlashTankSchema, load_default=None)
    discharge_temperature_limit = Quantity("temperature", load_default=135.0 + 273.15)

    @validates_schema
    def _circuit_fits(self, data: dict, **_: Any) -> None:
        if data.get("circuit") == "transcritical":
            if "gas_cooler" not in data:
                raise ValidationError('the transcritical circuit needs gas_cooler: '
                                      '{"outlet_temperature": ..., "pressure": "optimal"}',
                                      field_name="gas_cooler")
        elif "condensing" not in data:
            raise ValidationError("give condensing: a temperature or a pressure",
                                  field_name="condensing")

    @post_load
    def _make(self, data: dict, **_: Any) -> CycleSpec:
        economizer = data.get("economizer") or {}
        ihx = data.get("internal_heat_exchanger") or {}
        return CycleSpec(
            refrigerant=data["refrigerant"],
            circuit=data["circuit"],
            evaporating=data["evaporating"],
            condensing=data.get("condensing"),
            gas_cooler=data.get("gas_cooler"),
            superheat=data["superheat"],
            suction_line_superheat=data["suction_line_superheat"],
            subcooling=data["subcooling"],
            liquid_line_subcooling=data["liquid_line_subcooling"],
            compressor=data.get("compressor") or CompressorSpec(isentropic_efficiency=0.7),
            high_stage_compressor=data.get("high_stage_compressor"),
            cooling_capacity=data.get("cooling_capacity"),
            heating_capacity=data.get("heating_capacity"),
            mass_flow=data.get("mass_flow"),
            pressure_drops=data.get("pressure_drops") or PressureDrops(),
            internal_heat_exchanger_effectiveness=ihx.get("effectiveness", 0.0),
            intermediate_pressure=data.get("intermediate_pressure"),
            economizer=economizer.get("type", "subcooler"),
            economizer_approach=economizer.get("approach", 5.0),
            economizer_superheat=economizer.get("superheat", 5.0),
            flash_tank_pressure=(data.get("flash_tank") or {}).get("pressure"),
            discharge_temperature_limit=data["discharge_temperature_limit"],
        )


class CycleQuerySchema(QueryUnitSettingsSchema):
    """The single-stage case as flat query parameters, for spreadsheets."""

    refrigerant = refrigerant_field()
    evaporating_temperature = Quantity("temperature", required=True)
    condensing_temperature = Quantity("temperature", required=True)
    basis = fields.String(load_default="dew", validate=validate.OneOf(BASES))
    superheat = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=5.0)
    subcooling = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=2.0)
    isentropic_efficiency = Quantity("dimensionless", minimum=0.0, maximum=1.0, exclusive=True,
                                     load_default=0.7)
    cooling_capacity = Quantity("power", minimum=0.0, exclusive=True)
    heating_capacity = Quantity("power", minimum=0.0, exclusive=True)
    mass_flow = Quantity("mass_flow", minimum=0.0, exclusive=True)

    @post_load
    def _make(self, data: dict, **_: Any) -> dict:
        data["spec"] = CycleSpec(
            refrigerant=data["refrigerant"],
            evaporating=SaturationSpec(data["evaporating_temperature"], basis=data["basis"]),
            condensing=SaturationSpec(data["condensing_temperature"], basis=data["basis"]),
            superheat=data["superheat"],
            subcooling=data["subcooling"],
            compressor=CompressorSpec(isentropic_efficiency=data["isentropic_efficiency"]),
            cooling_capacity=data.get("cooling_capacity"),
            heating_capacity=data.get("heating_capacity"),
            mass_flow=data.get("mass_flow"),
        )
        return data


# -- responses ----------------------------------------------------------------------------------


class CyclePointSchema(Schema):
    label = fields.String()
    pressure = Quantity("pressure", attribute="state.pressure")
    gauge_pressure = fields.Method("_gauge")
    temperature = Quantity("temperature", attribute="state.temperature")
    enthalpy = Quantity("specific_enthalpy", attribute="state.enthalpy")
    entropy = Quantity("specific_entropy", attribute="state.entropy")
    density = Quantity("density", attribute="state.density")
    quality = Quantity("dimensionless", attribute="state.quality", allow_none=True)
    phase = fields.String(attribute="state.phase")
    mass_flow = Quantity("mass_flow")

    def _gauge(self, point: CyclePoint) -> dict:
        ctx = current_units()
        return ctx.render(point.state.pressure, "pressure", ctx.gauge_unit())


class PerformanceSchema(Schema):
    cooling_capacity = Quantity("power")
    heating_capacity = Quantity("power")
    heat_rejected = Quantity("power")
    compressor_power = Quantity("power")
    cop = Quantity("dimensionless")
    cop_heating = Quantity("dimensionless")
    mass_flow = Quantity("mass_flow")
    suction_volume_flow = Quantity("volume_flow")
    volumetric_capacity = Quantity("volumetric_capacity")
    pressure_ratio = Quantity("dimensionless")
    discharge_temperature = Quantity("temperature")
    cop_carnot = Quantity("dimensionless")
    second_law_efficiency = Quantity("dimensionless")
    isentropic_efficiency = Quantity("dimensionless")
    intermediate_pressure = Quantity("pressure", allow_none=True)
    high_side_pressure = Quantity("pressure")
    low_side_pressure = Quantity("pressure")
    energy_balance_residual = Quantity("dimensionless")


class CycleResultSchema(Schema):
    refrigerant = fields.String()
    circuit = fields.String()
    states = fields.List(fields.Nested(CyclePointSchema))
    performance = fields.Nested(PerformanceSchema)
    caution = fields.Function(lambda _: CYCLE_CAUTION)


class CycleReplySchema(CycleResultSchema):
    meta = fields.Nested(MetaSchema)


def cycle_result_dump(result: CycleResult) -> dict:
    return CycleResultSchema().dump(result)
