"""api/encoding.py: a body with a list encoded a part at a time is the body encoded whole."""

from __future__ import annotations

import json

import pytest

from api.encoding import to_json, to_json_with_items


@pytest.mark.parametrize("head", [
    {"summary": {"rows": 3}, "rows": None, "meta": {"warnings": ["a \"rows\": b"]}},
    {"big": 1 << 70, "rows": None},  # beyond orjson: the standard library's fallback
])
def test_items_in_parts_are_the_list_encoded_whole(head):
    items = [{"row": 1, "v": 0.1}, {"row": 2, "v": [1.5, None]}, {"row": 3, "v": "x\u00e9"}]
    parts = [to_json(items[:2])[1:-1], b"", to_json(items[2:])[1:-1]]
    whole = {**head, "rows": items}
    encoded = to_json_with_items(head, "rows", parts)
    assert json.loads(encoded) == whole
    assert list(json.loads(encoded)) == list(whole)  # the keys keep their order


def test_no_parts_give_an_empty_list():
    assert to_json_with_items({"rows": None, "n": 0}, "rows", []) == b'{"rows":[],"n":0}'
