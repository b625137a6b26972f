"""Schemas of POST /v1/charge: the request loads into a :class:`heatlift.charge.ChargeSpec`."""

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

from heatlift.charge import (
    DEFAULT_MODEL,
    INSTALLATION_HEIGHTS,
    LINE_KINDS,
    MODELS,
    OCCUPANCIES,
    ROLES,
    ChargeSpec,
    HeatExchangerSpec,
    LineSpec,
    SpaceSpec,
    VesselSpec,
)
from heatlift.cycle import CompressorSpec, CycleSpec, SaturationSpec
from heatlift.refrigerants import GWP_BASES
from schemas.common import MetaSchema, UnitSettingsSchema
from schemas.cycle import CyclePointSchema, CycleRequestSchema, SaturationConditionSchema
from schemas.fields import Quantity

_TD = "temperature_difference"
ZONE_NAMES = ("desuperheating", "superheating", "two_phase", "subcooled", "supercritical")


class SaturationOrTemperature(fields.Field):
    """A saturation condition: ``{"temperature": ..., "basis": "dew"}`` (or ``pressure``) as in
    the cycle request, or just a temperature (``-6``, ``"21 degF"``, ``{"value", "unit"}``),
    read as the dew point."""

    def _deserialize(self, value: Any, attr: Any, data: Any, **kwargs: Any) -> SaturationSpec:
        if isinstance(value, dict) and ("temperature" in value or "pressure" in value
                                        or "basis" in value):
            spec: SaturationSpec = SaturationConditionSchema().load(value)
            return spec
        return SaturationSpec(temperature=Quantity("temperature")._deserialize(value, attr, data))


class InstallationHeightField(fields.Field):
    """h0: a height, or the position of the indoor unit (floor, window, wall, ceiling)."""

    def _deserialize(self, value: Any, attr: Any, data: Any, **kwargs: Any) -> float:
        words = ", ".join(f"{k} ({v} m)" for k, v in INSTALLATION_HEIGHTS.items())
        if isinstance(value, str) and value.strip().lower() in INSTALLATION_HEIGHTS:
            return INSTALLATION_HEIGHTS[value.strip().lower()]
        if isinstance(value, str) and not any(ch.isdigit() for ch in value):
            raise ValidationError(f"give a height such as 2.2 m, or one of {words}")
        try:
            return Quantity("length", minimum=0.0, exclusive=True)._deserialize(value, attr, data)
        except ValidationError as exc:
            raise ValidationError(
                f"{' '.join(str(m) for m in exc.messages)} (or name the position: {words})"  # type: ignore[union-attr]
            ) from exc


class LineSchema(Schema):
    line = fields.String(required=True, validate=validate.OneOf(LINE_KINDS))
    length = Quantity("length", required=True, minimum=0.0, maximum=10_000.0, exclusive=True)
    inside_diameter = Quantity("diameter", minimum=0.0, maximum=2.0, exclusive=True)
    size = fields.String(validate=validate.Length(min=1, max=40), metadata={
        "description": 'a catalogue label: "7/8", "1-3/8" (ASTM B280), "22 x 1.0" '
                       '(EN 12735-1), "2 sch 40" (ASME B36.10)'})
    standard = fields.String(validate=validate.Length(min=1, max=40), metadata={
        "description": "ASTM B280, EN 12735-1 or ASME B36.10 (default: from the size's form)"})
    schedule = fields.String(validate=validate.OneOf(["40", "80"]))
    name = fields.String(validate=validate.Length(min=1, max=80))

    @validates_schema
    def _diameter(self, data: dict, **_: Any) -> None:
        if ("inside_diameter" in data) == ("size" in data):
            raise ValidationError("give exactly one of inside_diameter or size (with standard)",
                                  field_name="inside_diameter")

    @post_load
    def _make(self, data: dict, **_: Any) -> LineSpec:
        return LineSpec(**data)


class HeatExchangerSchema(Schema):
    role = fields.String(required=True, validate=validate.OneOf(ROLES))
    internal_volume = Quantity("volume", required=True, minimum=0.0, maximum=100.0,
                               exclusive=True, metadata={
                                   "description": "refrigerant-side volume (bare number: L)"})
    model = fields.String(load_default=DEFAULT_MODEL, validate=validate.OneOf(list(MODELS)),
                          metadata={"description": "void-fraction model: homogeneous, zivi "
                                    "(default), rouhani_axelsson, steiner (the last two need "
                                    "tube_inside_diameter and a cycle size)"})
    tube_inside_diameter = Quantity("diameter", minimum=0.0, maximum=0.5, exclusive=True)
    circuits = fields.Integer(load_default=1, validate=validate.Range(min=1, max=10_000))
    zone_shares = fields.Dict(keys=fields.String(validate=validate.OneOf(ZONE_NAMES)),
                              values=Quantity("dimensionless", minimum=0.0, maximum=1.0),
                              metadata={"description": "share of the volume per zone, instead "
                                        "of the enthalpy shares"})
    name = fields.String(validate=validate.Length(min=1, max=80))

    @post_load
    def _make(self, data: dict, **_: Any) -> HeatExchangerSpec:
        return HeatExchangerSpec(
            role=data["role"], internal_volume=data["internal_volume"], void_model=data["model"],
            tube_inside_diameter=data.get("tube_inside_diameter"), circuits=data["circuits"],
            zone_shares=data.get("zone_shares"), name=data.get("name"),
        )


class VesselSchema(Schema):
    volume = Quantity("volume", required=True, minimum=0.0, maximum=100.0, exclusive=True,
                      metadata={"description": "internal volume (bare number: L)"})
    fill_fraction = Quantity("dimensionless", required=True, minimum=0.0, maximum=1.0,
                             metadata={"description": "share of the volume filled with liquid"})
    pressure = Quantity("pressure", metadata={
        "description": "default: condenser outlet (receiver), suction (accumulator)"})
    name = fields.String(validate=validate.Length(min=1, max=80))

    @post_load
    def _make(self, data: dict, **_: Any) -> VesselSpec:
        return VesselSpec(**data)


class SpaceSchema(Schema):
    floor_area = Quantity("area", required=True, minimum=0.0, maximum=1e6, exclusive=True)
    room_height = Quantity("length", minimum=0.0, maximum=100.0, exclusive=True)
    volume = Quantity("room_volume", minimum=0.0, maximum=1e8, exclusive=True)
    installation_height = InstallationHeightField(metadata={
        "description": "h0 of the indoor part: a height, or floor (0.6 m), window (1.0 m), "
                       "wall (1.8 m), ceiling (2.2 m)"})
    occupancy = fields.String(load_default="a", validate=validate.OneOf(OCCUPANCIES),
                              metadata={"description": "access category a, b or c"})

    @validates_schema
    def _volume(self, data: dict, **_: Any) -> None:
        if ("room_height" in data) == ("volume" in data):
            raise ValidationError("give exactly one of room_height or volume",
                                  field_name="room_height")

    @post_load
    def _make(self, data: dict, **_: Any) -> SpaceSpec:
        return SpaceSpec(**data)


class ChargeRequestSchema(UnitSettingsSchema):
    """A charge estimate. The operating point is either a full ``cycle`` request (as for POST
    /v1/cycle) or the single-stage conditions inline: ``refrigerant``, ``evaporating``,
    ``condensing``, ``superheat``, ``subcooling`` (and a size for the drift-flux models)."""

    refrigerant = fields.String(validate=validate.Length(min=1, max=64), metadata={
        "description": "ISO 817 / ASHRAE 34 designation (with the inline conditions)"})
    cycle = fields.Nested(CycleRequestSchema)
    evaporating = SaturationOrTemperature(metadata={
        "description": "a temperature (dew point) or {temperature|pressure, basis}"})
    condensing = SaturationOrTemperature(metadata={
        "description": "a temperature (dew point) or {temperature|pressure, basis}"})
    superheat = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=5.0)
    subcooling = Quantity(_TD, minimum=0.0, maximum=100.0, load_default=2.0)
    isentropic_efficiency = Quantity("dimensionless", minimum=0.0, maximum=1.0, exclusive=True,
                                     load_default=0.7)
    cooling_capacity = Quantity("power", minimum=0.0, exclusive=True)
    mass_flow = Quantity("mass_flow", minimum=0.0, exclusive=True)
    lines = fields.List(fields.Nested(LineSchema), load_default=list,
                        validate=validate.Length(max=100))
    heat_exchangers = fields.List(fields.Nested(HeatExchangerSchema), load_default=list,
                                  validate=validate.Length(max=100))
    receivers = fields.List(fields.Nested(VesselSchema), load_default=list,
                            validate=validate.Length(max=20))
    accumulators = fields.List(fields.Nested(VesselSchema), load_default=list,
                               validate=validate.Length(max=20))
    gwp_basis = fields.String(load_default="AR6", validate=validate.OneOf(GWP_BASES))
    space = fields.Nested(SpaceSchema)

    _INLINE = ("evaporating", "condensing", "cooling_capacity", "mass_flow")

    @validates_schema
    def _operating_point(self, data: dict, **_: Any) -> None:
        if "cycle" in data:
            inline = [k for k in self._INLINE if k in data]
            if inline:
                raise ValidationError(
                    f"give the operating point once: either cycle or the inline "
                    f"{', '.join(inline)}", field_name="cycle")
            refrigerant = data.get("refrigerant")
            if refrigerant is not None and refrigerant.lower() != data["cycle"].refrigerant.lower():
                raise ValidationError("refrigerant differs from cycle.refrigerant; give it once",
                                      field_name="refrigerant")
            return
        missing = [k for k in ("refrigerant", "evaporating", "condensing") if k not in data]
        if missing:
            raise ValidationError(
                f"give {', '.join(missing)} (or a cycle request under cycle)",
                field_name=missing[0])
        if "cooling_capacity" in data and "mass_flow" in data:
            raise ValidationError("give one of cooling_capacity or mass_flow",
                                  field_name="cooling_capacity")

    @post_load
    def _make(self, data: dict, **_: Any) -> ChargeSpec:
        cycle: CycleSpec = data.get("cycle") or CycleSpec(
            refrigerant=data["refrigerant"],
            evaporating=data["evaporating"],
            condensing=data["condensing"],
            superheat=data["superheat"],
            subcooling=data["subcooling"],
            compressor=CompressorSpec(isentropic_efficiency=data["isentropic_efficiency"]),
            cooling_capacity=data.get("cooling_capacity"),
            mass_flow=data.get("mass_flow"),
        )
        return ChargeSpec(
            cycle=cycle, lines=tuple(data["lines"]),
            heat_exchangers=tuple(data["heat_exchangers"]), receivers=tuple(data["receivers"]),
            accumulators=tuple(data["accumulators"]), gwp_basis=data["gwp_basis"],
            space=data.get("space"),
        )


# -- responses ----------------------------------------------------------------------------------


class ZoneSchema(Schema):
    name = fields.String(metadata={"enum": list(ZONE_NAMES)})
    volume_share = Quantity("dimensionless")
    enthalpy_share = Quantity("dimensionless")
    volume = Quantity("volume")
    mean_density = Quantity("density")
    mass = Quantity("mass")
    quality_in = Quantity("dimensionless", allow_none=True)
    quality_out = Quantity("dimensionless", allow_none=True)
    mean_void_fraction = Quantity("dimensionless", allow_none=True)

    @post_dump
    def _drop_none(self, data: dict, **_: Any) -> dict:
        return {k: v for k, v in data.items() if v is not None}


class ComponentSchema(Schema):
    name = fields.String()
    kind = fields.String(metadata={"enum": ["line", "heat_exchanger", "receiver",
                                            "accumulator"]})
    role = fields.String()
    mass = Quantity("mass")
    share = Quantity("dimensionless")
    internal_volume = Quantity("volume")
    mean_density = Quantity("density")
    length = Quantity("length", allow_none=True)
    inside_diameter = Quantity("diameter", allow_none=True)
    size = fields.String(allow_none=True)
    standard = fields.String(allow_none=True)
    pressure = Quantity("pressure", allow_none=True)
    fill_fraction = Quantity("dimensionless", allow_none=True)
    void_model = fields.String(allow_none=True)
    mass_flux = Quantity("mass_flux", allow_none=True)
    zones = fields.List(fields.Nested(ZoneSchema))

    @post_dump
    def _drop_empty(self, data: dict, **_: Any) -> dict:
        return {k: v for k, v in data.items() if v is not None and v != []}


class LeakCheckThresholdSchema(Schema):
    co2_equivalent = Quantity("co2_equivalent")
    interval_months = fields.Integer()
    interval_with_detection_months = fields.Integer()
    leak_detection_required = fields.Boolean()


class LeakChecksSchema(Schema):
    regulation = fields.String()
    fluorinated = fields.Boolean()
    thresholds = fields.List(fields.Nested(LeakCheckThresholdSchema))
    reached = fields.Nested(LeakCheckThresholdSchema, allow_none=True)


class LimitRuleSchema(Schema):
    basis = fields.String()
    allowed_charge = Quantity("mass")
    concentration = Quantity("concentration")


class ChargeLimitSchema(Schema):
    allowed_charge = Quantity("mass", allow_none=True)
    basis = fields.String()
    within_limit = fields.Boolean(allow_none=True)
    charge = Quantity("mass")
    room_volume = Quantity("room_volume")
    floor_area = Quantity("area")
    installation_height = Quantity("length", allow_none=True)
    occupancy = fields.String()
    rules = fields.List(fields.Nested(LimitRuleSchema))
    m1 = Quantity("mass", allow_none=True)
    m2 = Quantity("mass", allow_none=True)
    m3 = Quantity("mass", allow_none=True)


class OperatingPointSchema(Schema):
    circuit = fields.String(attribute="cycle.circuit")
    mass_flow = Quantity("mass_flow", allow_none=True)
    mass_flow_known = fields.Boolean()
    states = fields.List(fields.Nested(CyclePointSchema), attribute="cycle.states")


class ChargeResultSchema(Schema):
    refrigerant = fields.String()
    safety_class = fields.String()
    total_charge = Quantity("mass")
    components = fields.List(fields.Nested(ComponentSchema))
    gwp_basis = fields.String()
    gwp = Quantity("dimensionless", allow_none=True)
    co2_equivalent = Quantity("co2_equivalent", allow_none=True)
    leak_checks = fields.Nested(LeakChecksSchema)
    charge_limit = fields.Nested(ChargeLimitSchema, allow_none=True)
    operating_point = fields.Nested(OperatingPointSchema)
    assumptions = fields.List(fields.String())
    caution = fields.String()


class ChargeReplySchema(ChargeResultSchema):
    meta = fields.Nested(MetaSchema)
