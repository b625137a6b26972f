"""Dumping results fast, from the schemas themselves.

marshmallow's ``Schema.dump`` walks every declared field through several layers of generic
calls (accessor, default handling, per-field hooks): for a cycle result of about ninety fields
that costs more than the cycle's physics. :func:`plan` reads a schema's ``dump_fields`` once
and builds a plain function per field (of the object and the request's unit context, looked
up once per dump), so the schema stays the one description of the output
(names, units, nesting, OpenAPI) and the result is exactly what ``Schema.dump`` gives:

- a :class:`~schemas.fields.Quantity` renders its SI value in the request's units;
- a ``Nested`` or a ``List`` of ``Nested`` uses the nested schema's own plan;
- a plain String, Float, Integer, Boolean or Raw field formats its value itself;
- every other field goes through its own ``serialize`` (Method, Function, custom fields);
- a schema with ``pre_dump`` or ``post_dump`` hooks is dumped by marshmallow itself.

Missing attributes are skipped and ``dump_default`` applies, as in marshmallow.
"""

from __future__ import annotations

import operator
from collections.abc import Callable
from typing import Any

from marshmallow import Schema, fields, missing
from marshmallow.decorators import POST_DUMP, PRE_DUMP
from marshmallow.utils import get_value

from schemas.fields import Quantity, current_units
from schemas.units import UnitContext

# the compiled form: a function of the object and of the request's unit context, which is
# looked up once per dump rather than once per quantity
Plan = Callable[[Any, UnitContext], Any]
_KEPT = "_heatlift_plan"


def dump(schema: Schema, obj: Any) -> Any:
    """``schema.dump(obj)``, by the schema's compiled plan, in the request's units."""
    return plan(schema)(obj, current_units())


def plan(schema: Schema) -> Plan:
    """The compiled plan of ``schema`` (built on first use, kept on the instance)."""
    found: Plan | None = schema.__dict__.get(_KEPT)
    if found is None:
        found = _compile(schema)
        setattr(schema, _KEPT, found)
    return found


def _getter(attribute: str) -> Callable[[Any], Any]:
    """marshmallow's value lookup (item first, then attribute; dotted paths), for one name."""
    if "." in attribute:  # a path: each step as below (a missing step stays missing)
        steps = [_getter(part) for part in attribute.split(".")]

        def path(obj: Any) -> Any:
            for step in steps:
                obj = step(obj)
            return obj
        return path

    def get(obj: Any) -> Any:
        if type(obj) is dict:
            return obj[attribute] if attribute in obj else getattr(obj, attribute, missing)
        if hasattr(obj, "__getitem__"):
            return get_value(obj, attribute)
        return getattr(obj, attribute, missing)
    return get


def _value(field: fields.Field, attr: str) -> Callable[[Any], Any]:
    """The value of ``field`` on an object, with ``dump_default`` where it is missing."""
    get = _getter(field.attribute or attr)
    default = field.dump_default
    if default is missing:
        return get

    def with_default(obj: Any) -> Any:
        value = get(obj)
        if value is missing:
            return default() if callable(default) else default
        return value
    return with_default


def _fast_value(field: fields.Field, attr: str) -> Callable[[Any], Any]:
    """:func:`_value`, by one C-level attribute lookup (dotted paths too) where the object
    has the attributes (engine results are dataclasses and named tuples); anything else
    (a dict, a missing attribute) takes marshmallow's way."""
    slow = _value(field, attr)
    fetch = operator.attrgetter(field.attribute or attr)

    def value(obj: Any) -> Any:
        if type(obj) is dict:
            return slow(obj)
        try:
            return fetch(obj)
        except AttributeError:
            return slow(obj)
    return value


def _quantity(field: Quantity, attr: str) -> Plan:
    value_of, kind = _fast_value(field, attr), field.kind

    def render(obj: Any, ctx: UnitContext) -> Any:
        value = value_of(obj)
        if value is missing or value is None:
            return value
        return ctx.renderer(kind)(float(value))
    return render


def _nested(field: fields.Field, attr: str, schema: Schema, each: bool) -> Plan:
    """A nested object (``each``: a list of them) by ``schema``'s own plan."""
    value_of, inner = _fast_value(field, attr), plan(schema)

    def nested(obj: Any, ctx: UnitContext) -> Any:
        value = value_of(obj)
        if value is missing or value is None:
            return value
        return [inner(v, ctx) for v in value] if each else inner(value, ctx)
    return nested


_PLAIN = (fields.String, fields.Float, fields.Integer, fields.Boolean, fields.Raw)


def _plain(field: fields.Field, attr: str) -> Plan:
    """A field of one of marshmallow's plain types: its value, formatted by the field."""
    value_of, serialize = _fast_value(field, attr), field._serialize

    def plain(obj: Any, _ctx: UnitContext) -> Any:
        value = value_of(obj)
        if value is missing:
            return missing
        return serialize(value, attr, obj)
    return plain


def _generic(schema: Schema, field: fields.Field, attr: str) -> Plan:
    accessor = schema.get_attribute
    return lambda obj, _ctx: field.serialize(attr, obj, accessor=accessor)


def _field(schema: Schema, field: fields.Field, attr: str) -> Plan:
    if type(field) is Quantity:
        return _quantity(field, attr)
    if type(field) is fields.Nested:
        # a many schema's plan takes the list itself
        return _nested(field, attr, field.schema, bool(field.many) and not field.schema.many)
    inner = getattr(field, "inner", None)
    if type(field) is fields.List and type(inner) is fields.Nested and not inner.many \
            and not inner.schema.many:
        return _nested(field, attr, inner.schema, True)
    if type(field) in _PLAIN:
        return _plain(field, attr)
    return _generic(schema, field, attr)


def _compile(schema: Schema) -> Plan:
    if schema._hooks[PRE_DUMP] or schema._hooks[POST_DUMP] \
            or type(schema).get_attribute is not Schema.get_attribute:
        return lambda obj, _ctx: schema.dump(obj)
    steps = [(field.data_key if field.data_key is not None else attr,
              _field(schema, field, attr)) for attr, field in schema.dump_fields.items()]

    def one(obj: Any, ctx: UnitContext) -> dict[str, Any]:
        out = {}
        for key, make in steps:
            value = make(obj, ctx)
            if value is not missing:
                out[key] = value
        return out

    if schema.many:
        return lambda objs, ctx: None if objs is None else [one(o, ctx) for o in objs]
    return one
