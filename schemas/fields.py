"""The ``Quantity`` field: every physical quantity enters and leaves the service through it.

On load it accepts a bare number (read in the request's unit system), a string with its unit
(``"45 psig"``) or an object ``{"value": 45, "unit": "psig"}`` and gives an SI float. On dump it
renders an SI float as ``{"value", "unit"}`` in the request's output units. The request's
:class:`~schemas.units.UnitContext` is held in a context variable set by the web layer.
"""

from __future__ import annotations

import math
from contextlib import contextmanager
from contextvars import ContextVar
from typing import Any

from marshmallow import ValidationError, fields

from schemas.units import UnitContext, UnitError, split_quantity_text, units_for

_DEFAULT = UnitContext()
_current: ContextVar[UnitContext] = ContextVar("heatlift_units", default=_DEFAULT)  # noqa: B039


def current_units() -> UnitContext:
    """The unit context of the request being handled (SI by default)."""
    return _current.get()


@contextmanager
def using_units(ctx: UnitContext):  # type: ignore[no-untyped-def]
    token = _current.set(ctx)
    try:
        yield ctx
    finally:
        _current.reset(token)


def _finite(number: Any, name: str = "value") -> float:
    if isinstance(number, bool) or not isinstance(number, int | float):
        raise ValidationError(f"{name} must be a number, not {type(number).__name__}")
    try:
        value = float(number)
    except OverflowError:  # a JSON integer with hundreds of digits
        value = math.inf
    if not math.isfinite(value):
        raise ValidationError(f"{name} must be a finite number (NaN and Infinity are not accepted)")
    return value


class Quantity(fields.Field):
    """A physical quantity of one ``kind`` (see :data:`schemas.units.KINDS`).

    ``minimum``/``maximum`` [SI] bound the value where no physics is needed to know the range
    (a superheat cannot be negative, an efficiency lies in (0, 1]); the message gives the bound
    in the caller's units. ``exclusive`` makes both bounds strict.
    """

    def __init__(
        self,
        kind: str,
        *,
        minimum: float | None = None,
        maximum: float | None = None,
        exclusive: bool = False,
        **kwargs: Any,
    ) -> None:
        self.kind = kind
        self.minimum = minimum
        self.maximum = maximum
        self.exclusive = exclusive
        metadata = kwargs.pop("metadata", {})
        metadata.setdefault("x-quantity-kind", kind)
        super().__init__(metadata=metadata, **kwargs)

    def _deserialize(self, value: Any, attr: str | None, data: Any, **kwargs: Any) -> float:
        ctx = current_units()
        unit: str | None
        if isinstance(value, dict):
            extra = set(value) - {"value", "unit"}
            if "value" not in value or extra:
                raise ValidationError(
                    'a quantity object has exactly the keys "value" and "unit", e.g. '
                    f'{{"value": 7, "unit": "{ctx.input_unit(self.kind)}"}}'
                )
            number = _finite(value["value"])
            unit = value.get("unit")
            if unit is not None and not isinstance(unit, str):
                example = units_for(self.kind)[0]
                raise ValidationError(f"unit must be a string such as '{example}'")
        elif isinstance(value, str):
            try:
                number, unit = split_quantity_text(value)
            except UnitError as exc:
                raise ValidationError(str(exc)) from exc
            number = _finite(number)
        else:
            number, unit = _finite(value), None
        try:
            si = ctx.to_si(number, unit, self.kind)
        except UnitError as exc:
            raise ValidationError(str(exc)) from exc
        if not math.isfinite(si):  # finite in the caller's unit, too large in SI
            raise ValidationError(f"{number:g} {unit or ctx.input_unit(self.kind)} is too large")
        self._check_bounds(si, ctx)
        return si

    def _check_bounds(self, si: float, ctx: UnitContext) -> None:
        if self.kind == "temperature" and si <= 0.0:
            raise ValidationError(
                f"{ctx.text(si, self.kind)} is below absolute zero; temperatures must be above "
                f"{ctx.text(0.0, self.kind)}"
            )
        if self.kind == "pressure" and si <= 0.0:
            unit = ctx.output_unit("pressure")
            atm = ctx.from_si(ctx.atmospheric_pressure, "pressure", unit)
            raise ValidationError(
                f"this gives an absolute pressure of {ctx.text(si, self.kind)}; absolute "
                f"pressures must be above 0 {unit}, gauge pressures above -{atm:.6g} {unit} "
                "of gauge (the atmospheric pressure)"
            )
        low, high = self.minimum, self.maximum
        too_low = low is not None and (si <= low if self.exclusive else si < low)
        too_high = high is not None and (si >= high if self.exclusive else si > high)
        if too_low or too_high:
            parts = []
            word_low, word_high = ("above", "below") if self.exclusive else ("at least", "at most")
            if low is not None:
                parts.append(f"{word_low} {ctx.text(low, self.kind)}")
            if high is not None:
                parts.append(f"{word_high} {ctx.text(high, self.kind)}")
            raise ValidationError(
                f"{ctx.text(si, self.kind)} is out of range; it must be {' and '.join(parts)}"
            )

    def _serialize(self, value: Any, attr: str | None, obj: Any, **kwargs: Any) -> Any:
        if value is None:
            return None
        return current_units().render(float(value), self.kind)


def quantity_json_schema(kind: str) -> dict[str, Any]:
    """OpenAPI schema of a quantity (used by the apispec plugin)."""
    return {
        "description": f"{kind.replace('_', ' ')}: a number, a string with unit or {{value, unit}}",
        "x-quantity-kind": kind,
    }
