"""JSON bodies of the service's answers, encoded by orjson.

orjson writes the same JSON as the standard library (shortest round-trip floats, UTF-8, keys in
insertion order) several times faster: for a cycle result of some ninety numbers the standard
encoder costs a fifth of the request. Non-finite floats are written as null (the schemas already
render them so). What orjson refuses (integers beyond 64 bits echoed from a request, say) is
encoded by the standard library instead.
"""

from __future__ import annotations

import json
import uuid
from typing import Any

import orjson


def to_json(body: Any) -> bytes:
    """``body`` as UTF-8 JSON."""
    try:
        return orjson.dumps(body)
    except (orjson.JSONEncodeError, TypeError):
        return json.dumps(body, default=str).encode("utf-8")


def to_json_with_items(body: dict[str, Any], key: str, parts: list[bytes]) -> bytes:
    """``body`` as UTF-8 JSON, ``body[key]`` being the JSON array whose items are the
    already-encoded ``parts`` (each the items of one part, comma-separated, no brackets).
    A long list is so encoded a part at a time: only one part's Python objects are alive at
    once. ``key`` is a plain name (no character that JSON escapes)."""
    marker = f"\x00{uuid.uuid4().hex}"  # no text of a body holds it
    encoded = to_json({**body, key: marker})
    name, items = f'"{key}"'.encode(), b"[" + b",".join(p for p in parts if p) + b"]"
    for colon in (b":", b": "):  # orjson; the standard library's fallback
        head, found, tail = encoded.partition(name + colon + to_json(marker))
        if found:
            return b"".join((head, name, colon, items, tail))
    raise ValueError(f"no item {key!r} in the body")  # unreachable: the body has it
