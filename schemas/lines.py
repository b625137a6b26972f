"""Schemas of the line-sizing endpoints: POST /v1/lines/size, /v1/lines/check, GET tubes."""

from __future__ import annotations

from typing import Any

from marshmallow import Schema, ValidationError, fields, post_load, validate, validates_schema

from heatlift.errors import Remark
from heatlift.lines.duty import LINES, DutySpec, InletSpec
from heatlift.lines.hydraulics import FITTING_TYPES, Fitting
from heatlift.lines.query import LimitOverrides, LineQuery
from heatlift.lines.sizing import Route
from heatlift.lines.tubes import SCHEDULES, STANDARDS
from schemas.common import MetaSchema, QueryUnitSettingsSchema, StateSchema, UnitSettingsSchema
from schemas.cycle import CycleRequestSchema, SaturationConditionSchema
from schemas.fields import Quantity, current_units

_TD = "temperature_difference"
MAX_FITTING_ROWS = 50


class ScheduleField(fields.Field):
    """A pipe schedule: ``40``, ``"40"`` or ``"sch 40"``."""

    def _deserialize(self, value: Any, attr: Any, data: Any, **kwargs: Any) -> str:
        text = str(value).strip().lower().replace("schedule", "").replace("sch", "").strip()
        if isinstance(value, bool) or text not in SCHEDULES:
            raise ValidationError(f"schedule must be one of {', '.join(SCHEDULES)}")
        return text


class FittingSchema(Schema):
    type = fields.String(required=True, validate=validate.OneOf(list(FITTING_TYPES)),
                         metadata={"description": "; ".join(f"{k}: {v}" for k, v in
                                                            FITTING_TYPES.items())})
    count = fields.Integer(load_default=1, validate=validate.Range(min=1, max=1000))
    angle_degrees = fields.Float(validate=validate.Range(min=1.0, max=180.0),
                                 metadata={"description": "bend angle, for type bend [deg]"})
    radius_ratio = fields.Float(validate=validate.Range(min=0.5, max=50.0),
                                metadata={"description": "bend radius / inside diameter, "
                                          "for type bend"})
    loss_coefficient = fields.Float(validate=validate.Range(min=0.0, max=1000.0),
                                    metadata={"description": "K, for type other"})

    @validates_schema
    def _needs(self, data: dict, **_: Any) -> None:
        if data.get("type") == "bend":
            for name in ("angle_degrees", "radius_ratio"):
                if name not in data:
                    raise ValidationError(f"a bend needs {name}", field_name=name)
        if data.get("type") == "other" and "loss_coefficient" not in data:
            raise ValidationError("type other needs its loss_coefficient",
                                  field_name="loss_coefficient")

    @post_load
    def _make(self, data: dict, **_: Any) -> Fitting:
        return Fitting(**data)


class InletSchema(Schema):
    pressure = Quantity("pressure")
    temperature = Quantity("temperature")
    saturation_temperature = Quantity("temperature", metadata={
        "description": "dew point for suction and discharge lines, bubble point for the "
        "liquid line"})
    superheat = Quantity(_TD, minimum=0.0, maximum=200.0)
    subcooling = Quantity(_TD, minimum=0.0, maximum=100.0)

    @validates_schema
    def _one_form(self, data: dict, **_: Any) -> None:
        pt = "pressure" in data or "temperature" in data
        sat = "saturation_temperature" in data
        if pt == sat:
            raise ValidationError(
                "give pressure and temperature, or saturation_temperature with superheat "
                "(vapour lines) or subcooling (liquid line)", field_name="_schema")
        if pt and not ("pressure" in data and "temperature" in data):
            raise ValidationError("give both pressure and temperature",
                                  field_name="temperature" if "pressure" in data else
                                  "pressure")

    @post_load
    def _make(self, data: dict, **_: Any) -> InletSpec:
        return InletSpec(**data)


class _LineBodySchema(UnitSettingsSchema):
    refrigerant = fields.String(validate=validate.Length(min=1, max=64), metadata={
        "description": "ISO 817 / ASHRAE 34 designation; may be left out when a cycle is given"})
    line = fields.String(required=True, validate=validate.OneOf(LINES))
    # duty, form 1: a whole cycle request
    cycle = fields.Nested(CycleRequestSchema, metadata={
        "description": "a POST /v1/cycle body; the line's inlet state and mass flow come from "
        "its solution"})
    # duty, form 2: the operating conditions of a single-stage cycle
    cooling_capacity = Quantity("power", minimum=0.0, exclusive=True)
    evaporating = fields.Nested(SaturationConditionSchema)
    condensing = fields.Nested(SaturationConditionSchema)
    superheat = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=5.0)
    subcooling = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=2.0)
    isentropic_efficiency = Quantity("dimensionless", minimum=0.0, maximum=1.0, exclusive=True,
                                     load_default=0.7)
    # duty, form 3: a mass flow with the inlet state
    mass_flow = Quantity("mass_flow", minimum=0.0, exclusive=True)
    inlet = fields.Nested(InletSchema)
    # route
    length = Quantity("length", required=True, minimum=0.0, maximum=5000.0, exclusive=True,
                      metadata={"description": "straight length, the riser included"})
    rise = Quantity("length", load_default=0.0, metadata={
        "description": "vertical rise from inlet to outlet; negative for a drop"})
    fittings = fields.List(fields.Nested(FittingSchema), load_default=list,
                           validate=validate.Length(max=MAX_FITTING_ROWS))
    additional_equivalent_length = Quantity("length", minimum=0.0, maximum=5000.0,
                                            load_default=0.0)
    # catalogue
    standard = fields.String(validate=validate.Length(min=1, max=40), metadata={
        "description": f"one of {', '.join(STANDARDS)}; default ASTM B280 (ASME B36.10 for "
        "ammonia)"})
    schedule = ScheduleField(metadata={"description": "ASME B36.10 schedule, 40 (default) or "
                                       "80"})
    # limits
    max_temperature_penalty = Quantity(_TD, minimum=0.0, maximum=20.0, exclusive=True)
    min_velocity = Quantity("velocity", minimum=0.0, maximum=100.0)
    max_velocity = Quantity("velocity", minimum=0.0, maximum=200.0, exclusive=True)
    minimum_load_fraction = Quantity("dimensionless", minimum=0.0, maximum=1.0, exclusive=False)
    max_pressure_drop = Quantity("pressure_drop", minimum=0.0, exclusive=True, metadata={
        "description": "optional; for lines above the critical pressure it defaults to 1 % of "
        "the inlet pressure"})
    # pressure rating
    design_temperature = Quantity("temperature")
    design_pressure = Quantity("pressure")
    brazed_joints = fields.Boolean(load_default=True, metadata={
        "description": "brazed copper is rated with the annealed stress (default true)"})

    @validates_schema
    def _duty(self, data: dict, **_: Any) -> None:
        forms = [k for k in ("cycle", "cooling_capacity", "mass_flow") if k in data]
        if len(forms) != 1:
            raise ValidationError(
                "give the duty in exactly one form: cycle (a cycle request), cooling_capacity "
                "with evaporating and condensing, or mass_flow with inlet"
                + (f"; got {', '.join(forms)}" if forms else ""), field_name="_schema")
        if "cooling_capacity" in data:
            for name in ("evaporating", "condensing"):
                if name not in data:
                    raise ValidationError(
                        f'a cooling_capacity duty needs {name}, e.g. {{"temperature": -6}}',
                        field_name=name)
        if "mass_flow" in data and "inlet" not in data:
            raise ValidationError("a mass_flow duty needs the inlet state", field_name="inlet")
        if "cycle" not in data and "refrigerant" not in data:
            raise ValidationError("Missing data for required field.", field_name="refrigerant")
        if data.get("minimum_load_fraction") == 0.0:
            raise ValidationError("minimum_load_fraction must be above 0 (a share of full "
                                  "load, at most 1)", field_name="minimum_load_fraction")
        low, high = data.get("min_velocity"), data.get("max_velocity")
        if low is not None and high is not None and low >= high:
            raise ValidationError("min_velocity must lie below max_velocity",
                                  field_name="min_velocity")

    def _query(self, data: dict, size: str | None) -> LineQuery:
        duty = DutySpec(
            line=data["line"], refrigerant=data.get("refrigerant"), cycle=data.get("cycle"),
            cooling_capacity=data.get("cooling_capacity"), evaporating=data.get("evaporating"),
            condensing=data.get("condensing"), superheat=data["superheat"],
            subcooling=data["subcooling"], isentropic_efficiency=data["isentropic_efficiency"],
            mass_flow=data.get("mass_flow"), inlet=data.get("inlet"),
        )
        route = Route(length=data["length"], rise=data["rise"],
                      fittings=tuple(data["fittings"]),
                      additional_equivalent_length=data["additional_equivalent_length"])
        limits = LimitOverrides(
            max_temperature_penalty=data.get("max_temperature_penalty"),
            min_velocity=data.get("min_velocity"), max_velocity=data.get("max_velocity"),
            minimum_load_fraction=data.get("minimum_load_fraction"),
            max_pressure_drop=data.get("max_pressure_drop"),
        )
        return LineQuery(
            duty=duty, route=route, standard=data.get("standard"),
            schedule=data.get("schedule"), limits=limits,
            design_temperature=data.get("design_temperature"),
            design_pressure=data.get("design_pressure"), brazed_joints=data["brazed_joints"],
            atmospheric_pressure=current_units().atmospheric_pressure, size=size,
        )


class LineSizeRequestSchema(_LineBodySchema):
    """POST /v1/lines/size: the duty, the route, the catalogue, optional limits."""

    @post_load
    def _make(self, data: dict, **_: Any) -> LineQuery:
        return self._query(data, None)


class LineCheckRequestSchema(_LineBodySchema):
    """POST /v1/lines/check: as /size, with the tube's catalogue label as ``size``."""

    size = fields.String(required=True, validate=validate.Length(min=1, max=40), metadata={
        "description": 'the catalogue label: "3/4", "1-1/8", "22 x 1.0", "2 sch 40"'})

    @post_load
    def _make(self, data: dict, **_: Any) -> LineQuery:
        return self._query(data, data["size"])


# -- responses ----------------------------------------------------------------------------------


def render_remarks(remarks: tuple[Remark, ...]) -> list[dict[str, str]]:
    ctx = current_units()
    return [{"code": r.code, "message": r.render(lambda v: ctx.text(v.value, v.kind))}
            for r in remarks]


class ReasonSchema(Schema):
    code = fields.String()
    message = fields.String()


class PressureDropPartsSchema(Schema):
    straight_tube = Quantity("pressure_drop")
    fittings = Quantity("pressure_drop")
    additional_equivalent_length = Quantity("pressure_drop")
    static_head = Quantity("pressure_drop")


class OilReturnSchema(Schema):
    riser = fields.Boolean(metadata={"description": "the line rises"})
    applies = fields.Boolean(metadata={
        "description": "the criterion is applied (a riser, and an oil that dissolves in the "
        "refrigerant: not for ammonia)"})
    minimum_velocity = Quantity("velocity")
    minimum_mass_flow = Quantity("mass_flow")
    minimum_capacity = Quantity("power", allow_none=True)
    velocity_at_minimum_load = Quantity("velocity")
    dimensionless_gas_velocity_at_minimum_load = Quantity("dimensionless")
    ok = fields.Boolean()


class PressureRatingSchema(Schema):
    allowed_working_pressure = Quantity("pressure")
    design_pressure = Quantity("pressure")
    gauge_pressure = fields.Method("_gauge")
    ok = fields.Boolean()
    design_temperature = Quantity("temperature", allow_none=True)
    metal_temperature = Quantity("temperature")
    allowable_stress = Quantity("pressure_drop")
    minimum_wall = Quantity("diameter")
    stress_basis = fields.String()
    material = fields.String()

    def _gauge(self, rating: Any) -> dict:
        ctx = current_units()
        unit = ctx.gauge_unit()
        return {"allowed_working_pressure": ctx.render(rating.allowed_working_pressure,
                                                       "pressure", unit),
                "design_pressure": ctx.render(rating.design_pressure, "pressure", unit)}


class ChecksSchema(Schema):
    temperature_penalty = fields.Boolean(allow_none=True)
    pressure_drop = fields.Boolean(allow_none=True)
    min_velocity = fields.Boolean(allow_none=True)
    max_velocity = fields.Boolean()
    oil_return = fields.Boolean(allow_none=True)
    flash_gas = fields.Boolean(allow_none=True, metadata={
        "description": "true when no flash gas forms"})
    pressure_rating = fields.Boolean()


class CandidateSchema(Schema):
    nominal_size = fields.String()
    standard = fields.String()
    outside_diameter = Quantity("diameter")
    inside_diameter = Quantity("diameter")
    wall_thickness = Quantity("diameter")
    velocity = Quantity("velocity")
    reynolds_number = Quantity("dimensionless")
    friction_factor = Quantity("dimensionless")
    fittings_loss_coefficient = Quantity("dimensionless", attribute="loss_coefficient")
    pressure_drop = Quantity("pressure_drop")
    pressure_drop_parts = fields.Nested(PressureDropPartsSchema)
    temperature_penalty = Quantity(_TD, allow_none=True)
    outlet_pressure = Quantity("pressure")
    outlet_temperature = Quantity("temperature")
    oil_return = fields.Nested(OilReturnSchema, allow_none=True)
    subcooling_remaining = Quantity(_TD, allow_none=True)
    flash_gas = fields.Boolean(allow_none=True)
    pressure_rating = fields.Nested(PressureRatingSchema)
    checks = fields.Nested(ChecksSchema)
    verdict = fields.String(metadata={"enum": ["ok", "undersized", "oversized", "unsuitable"]})
    reasons = fields.Function(lambda c: render_remarks(c.reasons))
    segments = fields.Integer()


class RiserTubeSchema(Schema):
    nominal_size = fields.String()
    inside_diameter = Quantity("diameter")
    mass_flow = Quantity("mass_flow")
    velocity = Quantity("velocity")
    minimum_velocity = Quantity("velocity")
    carries_oil_at_full_load = fields.Boolean()
    carries_oil_at_minimum_load = fields.Boolean(allow_none=True)


class RiserDesignSchema(Schema):
    arrangement = fields.String(metadata={"enum": ["single", "double"]})
    horizontal_size = fields.String()
    risers = fields.List(fields.Nested(RiserTubeSchema))
    riser_length = Quantity("length")
    horizontal_length = Quantity("length")
    pressure_drop = Quantity("pressure_drop")
    temperature_penalty = Quantity(_TD, allow_none=True)
    ok = fields.Boolean()
    reasons = fields.Function(lambda d: render_remarks(d.reasons))


class DutySchema(Schema):
    basis = fields.String(metadata={"enum": ["cycle", "cooling_capacity", "mass_flow"]})
    inlet_label = fields.String(allow_none=True)
    inlet = fields.Nested(StateSchema)
    mass_flow = Quantity("mass_flow")
    cooling_capacity = Quantity("power", allow_none=True)


class LimitsSchema(Schema):
    max_temperature_penalty = Quantity(_TD)
    min_velocity = Quantity("velocity")
    max_velocity = Quantity("velocity")
    minimum_load_fraction = Quantity("dimensionless")
    max_pressure_drop = Quantity("pressure_drop", allow_none=True)


class DesignSchema(Schema):
    side = fields.String(metadata={"enum": ["low", "high"]})
    design_pressure = Quantity("pressure")
    design_temperature = Quantity("temperature", allow_none=True)


class _LineResultSchema(Schema):
    refrigerant = fields.String()
    line = fields.String()
    standard = fields.String()
    schedule = fields.String(allow_none=True)
    duty = fields.Nested(DutySchema)
    limits = fields.Nested(LimitsSchema)
    design = fields.Nested(DesignSchema)
    caution = fields.String()


class SizingResultSchema(_LineResultSchema):
    recommended = fields.Nested(CandidateSchema, allow_none=True)
    riser_design = fields.Nested(RiserDesignSchema, allow_none=True)
    candidates = fields.List(fields.Nested(CandidateSchema))


class SizingReplySchema(SizingResultSchema):
    meta = fields.Nested(MetaSchema)


class CheckResultSchema(_LineResultSchema):
    candidate = fields.Nested(CandidateSchema)


class CheckReplySchema(CheckResultSchema):
    meta = fields.Nested(MetaSchema)


class TubesQuerySchema(QueryUnitSettingsSchema):
    standard = fields.String(validate=validate.Length(min=1, max=40), metadata={
        "description": f"one of {', '.join(STANDARDS)}; all when left out"})
    schedule = ScheduleField(metadata={"description": "ASME B36.10 only: 40 or 80"})


class TubeRowSchema(Schema):
    standard = fields.String()
    nominal_size = fields.String()
    schedule = fields.String(allow_none=True)
    outside_diameter = Quantity("diameter")
    wall_thickness = Quantity("diameter")
    inside_diameter = Quantity("diameter")
    temper = fields.String(allow_none=True)
    material = fields.String(attribute="material.name")
    roughness = Quantity("diameter")
    dimensions_source = fields.String()
    roughness_source = fields.String(attribute="material.roughness_source")


class TubesSchema(Schema):
    tubes = fields.List(fields.Nested(TubeRowSchema))


class TubesReplySchema(TubesSchema):
    meta = fields.Nested(MetaSchema)


class FittingTypeSchema(Schema):
    type = fields.String()
    description = fields.String()


class FittingTypesSchema(Schema):
    fittings = fields.List(fields.Nested(FittingTypeSchema))


class FittingTypesReplySchema(FittingTypesSchema):
    meta = fields.Nested(MetaSchema)
