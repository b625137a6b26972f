"""Schemas of the datasheet validation: rows from JSON or CSV, tolerances, the report.

A row is read in two steps. The *structure* (known columns, units in CSV headers, cells that a
spreadsheet would run as formulas) is checked for the whole request: a fault there is a 422 for
the request. The *values* are read row by row: a cell that is not a usable number fails that row
(check ``input``) and the other rows are still checked.

CSV headers may carry their unit in brackets as the service's own CSV does
(``cooling_capacity [kW]``); bare numbers in a column without one are read in the request's unit
system. Blank cells are claims not made. Coefficient cells hold C1..C10 separated by ``;`` or
blanks (or ``,`` when the file is not comma-delimited ... see :func:`_split_coefficients`).
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
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

from heatlift.compressor import BASES, FIGURES, PolynomialSpec, RatingConditions
from heatlift.csvfile import read_table
from heatlift.datasheet import Check, DatasheetRow, RowReport, Tolerances, input_failure
from schemas.common import MetaSchema, UnitSettingsSchema
from schemas.fields import Quantity, current_units
from schemas.units import UnitContext, UnitError, affine_map, units_for

FORMATS = ("json", "csv", "junit")
EER_UNIT = "Btu/Wh"
_EER_SPELLINGS = {"btu/wh", "btu/(wh)", "btu/(w*h)", "btu/(w.h)", "btu/w/h", "btu/h/w",
                  "btu/(w·h)", "btuh/w"}

TEXT_COLUMNS = ("model", "refrigerant", "basis")
# column -> quantity kind ("eer" is Btu/Wh by definition, whatever the unit system)
QUANTITY_COLUMNS: dict[str, str] = {
    "evaporating_temperature": "temperature",
    "condensing_temperature": "temperature",
    "superheat": "temperature_difference",
    "return_gas_temperature": "temperature",
    "subcooling": "temperature_difference",
    "cooling_capacity": "power",
    "power": "power",
    "cop": "dimensionless",
    "eer": "eer",
    "mass_flow": "mass_flow",
    "current": "current",
    "displacement": "volume_flow",
    "pressure_evaporating": "pressure",
    "pressure_condensing": "pressure",
}
# CSV spellings of the coefficient columns -> polynomial figure
COEFFICIENT_COLUMNS = {
    **{f"coefficients.{f}": f for f in FIGURES},
    **{f"{f}_coefficients": f for f in FIGURES},
}
ROW_KEYS = (*TEXT_COLUMNS, *QUANTITY_COLUMNS, "coefficients")
_FREE_TEXT = re.compile(r"^(note|comment)")
_HEADER = re.compile(r"^\s*([^\[\]]*?)\s*(?:\[([^\[\]]*)\])?\s*$")
_DECIMAL_COMMA = re.compile(r"^([-+]?\d+),(\d+(?:[eE][-+]?\d+)?)")
_NUMBER = re.compile(r"^[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?$")


def formula_like(text: str) -> bool:
    """Whether a spreadsheet would run ``text`` as a formula (``=``, ``@``, ``+x``, ``-x``).

    A signed number (``-10``, ``+5.5``) is not formula-like.
    """
    if text[:1] in ("\t", "\r"):
        return True
    stripped = text.lstrip()
    if stripped[:1] in ("=", "@"):
        return True
    if stripped[:1] in ("+", "-"):
        rest = stripped[1:2]
        return not (rest.isdigit() or rest == ".")
    return False


def _formula_error(where: str, text: str) -> dict[str, list[str]]:
    first = text.lstrip()[:1] if text[:1] not in ("\t", "\r") else "a control character"
    return {where: [f"the cell begins with '{first}', which a spreadsheet runs as a formula; "
                    "datasheet cells must not begin with =, +, -, @ (signed numbers excepted)"]}


# -- tolerances ---------------------------------------------------------------------------------

def _tolerance_fields() -> dict[str, fields.Field]:
    defaults = Tolerances()
    return {
        name: Quantity("dimensionless", minimum=0.0, exclusive=True,
                       metadata={"description": f"default {getattr(defaults, name):g}"})
        for name in Tolerances.names()
    }


TolerancesSchema = Schema.from_dict(_tolerance_fields(), name="DatasheetTolerancesSchema")


# query parameters: output format, unit system, and any tolerance (e.g. capacity_fail=0.08)
DatasheetQuerySchema: type[UnitSettingsSchema] = type(
    "DatasheetQuerySchema",
    (UnitSettingsSchema,),
    {
        "__doc__": "Query parameters: format, unit system, tolerances (each optional).",
        "unit_overrides": fields.String(
            metadata={"description": "kind:unit pairs, e.g. pressure:bar,power:TR"}),
        "format": fields.String(
            validate=validate.OneOf(FORMATS),
            metadata={"description": "json (default), csv or junit; or by the Accept header"}),
        **_tolerance_fields(),
    },
)


class DatasheetBodySchema(UnitSettingsSchema):
    """A JSON object body: ``rows`` and optional ``tolerances`` (a bare array is rows only)."""

    rows = fields.List(fields.Dict(), required=True)
    tolerances = fields.Nested(TolerancesSchema)


def tolerances_from(query: Mapping[str, Any], body: Mapping[str, Any] | None) -> Tolerances:
    """Defaults, overridden by the query string, overridden by the body's ``tolerances``."""
    given = {k: v for k, v in query.items() if k in Tolerances.names()}
    given.update(body or {})
    return Tolerances(**given)


# -- one row ------------------------------------------------------------------------------------

class EerField(fields.Field):
    """An EER in Btu/Wh: a number, ``"10.2 Btu/Wh"`` or ``{"value": 10.2, "unit": "Btu/Wh"}``."""

    def _deserialize(self, value: Any, attr: str | None, data: Any, **kwargs: Any) -> float:
        unit: Any = None
        if isinstance(value, dict):
            if set(value) - {"value", "unit"} or "value" not in value:
                raise ValidationError('an EER object has the keys "value" and "unit" (Btu/Wh)')
            value, unit = value["value"], value.get("unit")
        elif isinstance(value, str):
            match = re.match(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$",
                             value)
            if not match:
                raise ValidationError(f"an EER is a number in {EER_UNIT}, like '10.2'")
            value, unit = float(match.group(1)), match.group(2) or None
        if unit is not None and (not isinstance(unit, str) or not eer_unit(unit)):
            raise ValidationError(f"an EER is given in {EER_UNIT} (Btu/h of cooling per W of "
                                  "input); for W/W give the cop instead")
        if isinstance(value, bool) or not isinstance(value, int | float):
            raise ValidationError(f"an EER is a number in {EER_UNIT}")
        number = float(value)
        if not 0.0 < number < 1e6:
            raise ValidationError(f"{number:g} {EER_UNIT} is out of range; an EER is above 0")
        return number


def eer_unit(unit: str) -> bool:
    return unit.replace(" ", "").lower() in _EER_SPELLINGS


class CoefficientSetField(fields.Dict):
    """``{"capacity": [C1..C10], "power": [...], ...}``: ten finite numbers (or numeric texts)
    per polynomial given. Read by hand rather than by nested schemas: a datasheet repeats the
    coefficients on every row, and a full batch holds up to 400,000 of them."""

    def __init__(self, **kwargs: Any) -> None:
        super().__init__(keys=fields.String(validate=validate.OneOf(FIGURES)),
                         values=fields.List(fields.Float(), validate=validate.Length(equal=10)),
                         **kwargs)

    def _deserialize(self, value: Any, attr: str | None, data: Any,
                     **kwargs: Any) -> dict[str, tuple[float, ...]]:
        if not isinstance(value, dict):
            raise ValidationError("an object of polynomial -> [C1..C10], e.g. "
                                  '{"capacity": [...], "power": [...]}')
        errors: dict[str, list[str]] = {}
        out: dict[str, tuple[float, ...]] = {}
        for name, coefficients in value.items():
            if name not in FIGURES:
                errors[str(name)] = [f"not a polynomial; use {', '.join(FIGURES)}"]
                continue
            try:
                out[name] = _ten_numbers(coefficients)
            except ValueError as exc:
                errors[name] = [str(exc)]
        if errors:
            raise ValidationError(errors)
        return out


def _ten_numbers(values: Any) -> tuple[float, ...]:
    if not isinstance(values, list | tuple) or len(values) != 10:
        count = len(values) if isinstance(values, list | tuple) else "not a list of"
        raise ValueError(f"give 10 coefficients C1..C10 ({count} given)")
    out = []
    for v in values:
        if isinstance(v, bool) or not isinstance(v, int | float | str):
            raise ValueError(f"{str(v)[:20]!r} is not a number")
        try:
            number = float(v)
        except (ValueError, OverflowError) as exc:
            raise ValueError(f"{str(v)[:20]!r} is not a number") from exc
        if not math.isfinite(number):
            raise ValueError("coefficients must be finite numbers")
        out.append(number)
    return tuple(out)


def _positive(kind: str, description: str) -> Quantity:
    return Quantity(kind, minimum=0.0, exclusive=True, metadata={"description": description})


class DatasheetRowSchema(Schema):
    """One datasheet row: a rating point and the claims made there (blank = not claimed)."""

    model = fields.String(required=True, validate=validate.Length(min=1, max=200))
    refrigerant = fields.String(required=True, validate=validate.Length(min=1, max=64))
    evaporating_temperature = Quantity("temperature", required=True,
                                       metadata={"description": "suction dew point"})
    condensing_temperature = Quantity("temperature", required=True,
                                      metadata={"description": "discharge dew point"})
    superheat = Quantity("temperature_difference", minimum=0.0)
    return_gas_temperature = Quantity("temperature")
    subcooling = Quantity("temperature_difference", minimum=0.0, required=True)
    cooling_capacity = _positive("power", "claimed refrigerating capacity")
    power = _positive("power", "claimed power input")
    cop = _positive("dimensionless", "claimed COP (cooling), W/W")
    eer = EerField(metadata={"description": "claimed EER in Btu/Wh"})
    mass_flow = _positive("mass_flow", "claimed mass flow")
    current = _positive("current", "claimed current")
    displacement = _positive("volume_flow", "swept volume flow")
    pressure_evaporating = Quantity("pressure", metadata={
        "description": "claimed saturation pressure at the evaporating dew point"})
    pressure_condensing = Quantity("pressure", metadata={
        "description": "claimed saturation pressure at the condensing dew point"})
    basis = fields.String(validate=validate.OneOf(BASES),
                          metadata={"description": "coefficient basis; default the units"})
    coefficients = CoefficientSetField(metadata={
        "description": "polynomial -> [C1..C10] in the basis, fitted at the row's superheat and "
                       "subcooling"})

    @validates_schema
    def _one_suction_condition(self, data: dict, **_: object) -> None:
        given = [k for k in ("superheat", "return_gas_temperature") if k in data]
        if len(given) != 1:
            raise ValidationError("give exactly one of superheat or return_gas_temperature",
                                  field_name="superheat")

    @post_load
    def _row(self, data: dict[str, Any], **_: object) -> dict[str, Any]:
        """The keyword arguments of a :class:`DatasheetRow` (the caller adds the line)."""
        polynomial = None
        coefficients = data.pop("coefficients", {})
        basis = data.pop("basis", current_units().system)
        if coefficients:
            rating = RatingConditions(data.get("superheat"), data.get("return_gas_temperature"),
                                      data["subcooling"])
            polynomial = PolynomialSpec(
                data["refrigerant"], rating, basis, capacity=coefficients.get("capacity"),
                power=coefficients.get("power"), mass_flow=coefficients.get("mass_flow"),
                current=coefficients.get("current"))
        return {**data, "polynomial": polynomial}


def _messages(exc: ValidationError) -> dict[str, list[str]]:
    out: dict[str, list[str]] = {}

    def walk(node: Any, path: str) -> None:
        if isinstance(node, dict):
            for key, value in node.items():
                walk(value, f"{path}.{key}" if path else str(key))
        elif isinstance(node, list) and all(isinstance(m, str) for m in node):
            out[path or "_row"] = list(node)
        elif isinstance(node, list):
            for i, item in enumerate(node):
                walk(item, f"{path}.{i}")
        else:
            out[path or "_row"] = [str(node)]

    walk(exc.messages, "")
    return out


def load_rows(raw: list[tuple[int | None, dict[str, Any]]]) -> list[DatasheetRow | RowReport]:
    """Each raw row as a :class:`DatasheetRow`, or as a failed report when a value is unusable."""
    schema = DatasheetRowSchema()
    out: list[DatasheetRow | RowReport] = []
    for number, (line, cells) in enumerate(raw, start=1):
        try:
            out.append(DatasheetRow(**schema.load(cells), line=line))
        except ValidationError as exc:
            model = cells.get("model") if isinstance(cells.get("model"), str) else None
            refrigerant = (cells.get("refrigerant")
                           if isinstance(cells.get("refrigerant"), str) else None)
            out.append(input_failure(number, line, model, refrigerant, _messages(exc)))
    return out


# -- structure: JSON rows -------------------------------------------------------------------------

def check_json_rows(rows: list[Any]) -> list[tuple[int | None, dict[str, Any]]]:
    """Structure of JSON rows: objects with known keys, no formula-like text."""
    errors: dict[str, list[str]] = {}
    out: list[tuple[int | None, dict[str, Any]]] = []
    for i, row in enumerate(rows):
        if not isinstance(row, dict):
            errors[f"rows.{i}"] = ["each row is an object of column -> value"]
            continue
        unknown = [k for k in row if k not in ROW_KEYS and not _FREE_TEXT.match(str(k))]
        if unknown:
            errors[f"rows.{i}"] = [f"unknown keys {', '.join(map(repr, unknown[:5]))}; the "
                                   f"keys are {', '.join(ROW_KEYS)}"]
            continue
        for key in TEXT_COLUMNS:
            if isinstance(row.get(key), str) and formula_like(row[key]):
                errors.update(_formula_error(f"rows.{i}.{key}", row[key]))
        out.append((None, {k: v for k, v in row.items() if k in ROW_KEYS}))
    if errors:
        raise ValidationError(errors)
    return out


# -- structure: CSV -------------------------------------------------------------------------------

def _column(header: str, index: int, errors: dict[str, list[str]]) -> tuple[str, str | None]:
    match = _HEADER.match(header)
    if not match or not match.group(1):
        errors[f"columns.{index + 1}"] = [f"'{header[:40]}' is not a column name, like "
                                          "'cooling_capacity [kW]'"]
        return "", None
    name = re.sub(r"[\s\-]+", "_", match.group(1).strip().lower())
    unit = match.group(2).strip() if match.group(2) is not None else None
    return name, unit or None


def _check_unit(name: str, unit: str | None, where: str, errors: dict[str, list[str]]) -> None:
    if unit is None:
        return
    kind = QUANTITY_COLUMNS.get(name)
    if kind is None:
        errors[where] = [f"the column {name} takes no unit"]
    elif kind == "eer":
        if not eer_unit(unit):
            errors[where] = [f"an EER column is in {EER_UNIT}; for W/W use a cop column"]
    else:
        try:
            affine_map(unit, kind)
        except UnitError:
            errors[where] = [f"'{unit}' is not a unit of {kind.replace('_', ' ')}; use "
                             f"{', '.join(units_for(kind))}"]


def _number_text(cell: str, delimiter: str) -> str:
    if delimiter != ",":
        cell = _DECIMAL_COMMA.sub(r"\1.\2", cell)
    return cell


def _split_coefficients(cell: str, delimiter: str) -> list[str]:
    """``"C1;C2;...;C10"`` (or blank-separated, in brackets or not) -> ten texts.

    In a comma-delimited file a quoted cell may also separate them by commas; in a file
    delimited otherwise a comma is a decimal comma.
    """
    text = cell.strip().strip("[]()")
    if delimiter == ",":
        parts = re.split(r"[;,|\s]+", text)
    else:
        parts = [_number_text(p, delimiter) for p in re.split(r"[;|\s]+", text)]
    return [p for p in parts if p]


def _cell_value(name: str, unit: str | None, cell: str, delimiter: str) -> Any:
    text = _number_text(cell.strip(), delimiter)
    if unit is not None and _NUMBER.match(text):
        return {"value": float(text), "unit": unit}
    if _NUMBER.match(text):
        return float(text)
    return text


def csv_rows(text: str, max_rows: int) -> list[tuple[int | None, dict[str, Any]]]:
    """Rows of a CSV body: raises ValidationError (structure), CsvError, TooManyRows."""
    table = read_table(text, max_rows)
    errors: dict[str, list[str]] = {}
    columns: list[tuple[str, str | None]] = []
    unknown = 0
    for index, header in enumerate(table.header):
        name, unit = _column(header, index, errors)
        where = f"columns.{header[:40]}"
        if formula_like(header):
            errors.update(_formula_error(where, header))
        elif name and name not in ROW_KEYS and name not in COEFFICIENT_COLUMNS \
                and not _FREE_TEXT.match(name):
            unknown += 1
            if unknown <= 10:
                errors[where] = [f"unknown column '{name[:40]}'"]
            errors["columns"] = [
                f"{unknown} unknown column(s); the columns are "
                f"{', '.join([*TEXT_COLUMNS, *QUANTITY_COLUMNS])}, coefficients.capacity (and "
                ".power, .mass_flow, .current), and any notes/comment columns (ignored)"]
        elif name == "coefficients":
            errors[where] = ["name the polynomial: coefficients.capacity, coefficients.power, "
                             "coefficients.mass_flow or coefficients.current"]
        elif any(name == seen for seen, _ in columns):
            errors[where] = [f"the column {name} appears twice"]
        else:
            _check_unit(name, unit, where, errors)
        columns.append((name, unit))
    if errors:
        raise ValidationError(errors)
    out: list[tuple[int | None, dict[str, Any]]] = []
    for line, cells in table.records:
        row: dict[str, Any] = {}
        for (name, unit), cell in zip(columns, cells, strict=True):
            if formula_like(cell):
                errors.update(_formula_error(f"line {line}.{name}", cell))
                continue
            if not cell.strip() or _FREE_TEXT.match(name):
                continue
            if name in COEFFICIENT_COLUMNS:
                row.setdefault("coefficients", {})[COEFFICIENT_COLUMNS[name]] = \
                    _split_coefficients(cell, table.delimiter)
            elif name in TEXT_COLUMNS:
                row[name] = cell.strip()
            else:
                row[name] = _cell_value(name, unit, cell, table.delimiter)
        out.append((line, row))
    if errors:
        raise ValidationError(errors)
    return out


# -- the report -----------------------------------------------------------------------------------

def _limit(value: Any) -> Any:
    return list(value) if isinstance(value, tuple) else value


class DatasheetCheckSchema(Schema):
    """One check: claimed and computed values, their deviation and the tolerance applied."""

    name = fields.String()
    number = fields.Integer(metadata={"description": "the check's number, 1 to 5 (0: input)"})
    verdict = fields.String(metadata={"enum": ["pass", "warn", "fail"]})
    claimed = fields.Method("_claimed")
    computed = fields.Method("_computed")
    deviation = Quantity("dimensionless", allow_none=True)
    measure = fields.String(metadata={"description": "how the deviation is formed"})
    tolerance = fields.Method("_tolerance", metadata={
        "description": "warn and fail limits (a [low, high] band for efficiencies)"})
    message = fields.Method("_message")

    @post_dump
    def _omit_absent(self, data: dict[str, Any], **_: object) -> dict[str, Any]:
        """``claimed``, ``computed``, ``deviation``, ``tolerance`` are left out where a check
        (``input``, ``claims``) has none: a quantity is an object, never null."""
        return {k: v for k, v in data.items() if v is not None}

    def _render(self, check: Check, value: float | None) -> Any:
        if value is None:
            return None
        if check.kind == "eer":
            return {"value": float(f"{value:.12g}"), "unit": EER_UNIT}
        return current_units().render(value, check.kind)

    def _claimed(self, check: Check) -> Any:
        return self._render(check, check.claimed)

    def _computed(self, check: Check) -> Any:
        return self._render(check, check.computed)

    def _tolerance(self, check: Check) -> Any:
        if check.warn is None and check.fail is None:
            return None
        return {"warn": _limit(check.warn), "fail": _limit(check.fail)}

    def _message(self, check: Check) -> str:
        ctx = current_units()
        return check.render(lambda v: ctx.text(v.value, v.kind))


def render_check(check: Check, ctx: UnitContext) -> dict[str, Any]:
    """One check as :class:`DatasheetCheckSchema` writes it, in one pass.

    A full batch holds over 100,000 checks; marshmallow's per-field machinery would be most of
    the request's time. A test keeps this equal to the schema's dump.
    """
    def render(value: float | None) -> Any:
        if value is None:
            return None
        if check.kind == "eer":  # Btu/Wh by definition; 12 digits as ctx.render writes
            return {"value": float(f"{value:.12g}"), "unit": EER_UNIT}
        return ctx.render(value, check.kind)

    out: dict[str, Any] = {"name": check.name, "number": check.number,
                           "verdict": check.verdict}
    if check.claimed is not None:
        out["claimed"] = render(check.claimed)
    if check.computed is not None:
        out["computed"] = render(check.computed)
    if check.deviation is not None:
        out["deviation"] = ctx.render(check.deviation, "dimensionless")
    out["measure"] = check.measure
    if check.warn is not None or check.fail is not None:
        out["tolerance"] = {"warn": _limit(check.warn), "fail": _limit(check.fail)}
    out["message"] = check.render(lambda v: ctx.text(v.value, v.kind))
    return out


class CheckList(fields.List):
    """A list of :class:`DatasheetCheckSchema` (so documented), written by
    :func:`render_check`."""

    def __init__(self, **kwargs: Any) -> None:
        super().__init__(fields.Nested(DatasheetCheckSchema), **kwargs)

    def _serialize(self, value: Any, attr: str | None, obj: Any, **kwargs: Any) -> Any:
        if value is None:
            return None
        ctx = current_units()
        return [render_check(check, ctx) for check in value]


class DatasheetRowReportSchema(Schema):
    row = fields.Integer(metadata={"description": "1-based place of the row in the request"})
    line = fields.Integer(allow_none=True, metadata={"description": "CSV line number"})
    model = fields.String(allow_none=True)
    refrigerant = fields.String(allow_none=True)
    verdict = fields.String(metadata={"enum": ["pass", "warn", "fail"]})
    checks = CheckList()


class DatasheetSummarySchema(Schema):
    rows = fields.Integer()
    passed = fields.Integer(data_key="pass")
    warned = fields.Integer(data_key="warn")
    failed = fields.Integer(data_key="fail")
    verdict = fields.String(metadata={"enum": ["pass", "warn", "fail"]})


class DatasheetValidationSchema(Schema):
    summary = fields.Nested(DatasheetSummarySchema)
    tolerances = fields.Method("_tolerances")
    rows = fields.List(fields.Nested(DatasheetRowReportSchema))

    def _tolerances(self, validation: Any) -> dict[str, float]:
        return {name: getattr(validation.tolerances, name) for name in Tolerances.names()}


class DatasheetReplySchema(DatasheetValidationSchema):
    meta = fields.Nested(MetaSchema)
