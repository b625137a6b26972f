"""Dumping results fast, from the schemas themselves.

marshmallow's ``Schema.dump`` walks every declared field through several layers of generic
calls (accessor, default handling, per-field hooks): for a cycle result of about ninety fields
that costs more than the cycle's physics. :func:`dumper` reads a schema's ``dump_fields`` once
and builds a plain function per field, so the schema stays the one description of the output
(names, units, nesting, OpenAPI) and the result is exactly what ``Schema.dump`` gives:

- a :class:`~schemas.fields.Quantity` renders its SI value in the request's units;
- a ``Nested`` or a ``List`` of ``Nested`` uses the nested schema's own dumper;
- every other field goes through its own ``serialize`` (Method, Function, String, ...);
- a schema with ``pre_dump`` or ``post_dump`` hooks is dumped by marshmallow itself.

Missing attributes are skipped and ``dump_default`` applies, as in marshmallow.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from marshmallow import Schema, fields, missing
from marshmallow.decorators import POST_DUMP, PRE_DUMP
from marshmallow.utils import get_value

from schemas.fields import Quantity, current_units

Dump = Callable[[Any], Any]
_KEPT = "_heatlift_dumper"


def dump(schema: Schema, obj: Any) -> Any:
    """``schema.dump(obj)``, by the schema's compiled dumper."""
    return dumper(schema)(obj)


def dumper(schema: Schema) -> Dump:
    """The compiled dump function of ``schema`` (built on first use, kept on the instance)."""
    found: Dump | None = schema.__dict__.get(_KEPT)
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


def _quantity(field: Quantity, attr: str) -> Dump:
    value_of, kind = _value(field, attr), field.kind

    def render(obj: Any) -> Any:
        value = value_of(obj)
        if value is missing or value is None:
            return value
        return current_units().render(float(value), kind)
    return render


def _nested(field: fields.Nested, attr: str) -> Dump:
    value_of = _value(field, attr)
    inner = dumper(field.schema)
    each = field.many and not field.schema.many  # a many schema's dumper takes the list

    def nested(obj: Any) -> Any:
        value = value_of(obj)
        if value is missing or value is None:
            return value
        return [inner(v) for v in value] if each else inner(value)
    return nested


def _nested_list(field: fields.List, attr: str) -> Dump:
    value_of = _value(field, attr)
    assert isinstance(field.inner, fields.Nested)
    schema = field.inner.schema
    inner = dumper(schema)

    def listed(obj: Any) -> Any:
        value = value_of(obj)
        if value is missing or value is None:
            return value
        return [inner(v) for v in value]
    return listed


def _generic(schema: Schema, field: fields.Field, attr: str) -> Dump:
    accessor = schema.get_attribute
    return lambda obj: field.serialize(attr, obj, accessor=accessor)


def _field(schema: Schema, field: fields.Field, attr: str) -> Dump:
    if type(field) is Quantity:
        return _quantity(field, attr)
    if type(field) is fields.Nested:
        return _nested(field, attr)
    inner = getattr(field, "inner", None)
    if type(field) is fields.List and type(inner) is fields.Nested and not inner.many \
            and not inner.schema.many:
        return _nested_list(field, attr)
    return _generic(schema, field, attr)


def _compile(schema: Schema) -> Dump:
    if schema._hooks[PRE_DUMP] or schema._hooks[POST_DUMP] \
            or type(schema).get_attribute is not Schema.get_attribute:
        return schema.dump
    plan = [(field.data_key if field.data_key is not None else attr, _field(schema, field, attr))
            for attr, field in schema.dump_fields.items()]

    def one(obj: Any) -> dict[str, Any]:
        out = {}
        for key, make in plan:
            value = make(obj)
            if value is not missing:
                out[key] = value
        return out

    if schema.many:
        return lambda objs: None if objs is None else [one(o) for o in objs]
    return one
