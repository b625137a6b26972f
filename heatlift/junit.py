"""A datasheet validation report as JUnit XML, the test-report format CI servers read.

Works on the report as the service writes it in JSON (plain dicts, values already in the
caller's units), so that the service (``format=junit``) and ``heatlift check --junit`` write the
same file. One test case per datasheet row, so that CI lists each failing model by name: a row
that fails gets a ``<failure>`` naming its failing checks; a row that warns passes, with its
checks in ``<system-out>``.
"""

from __future__ import annotations

import re
from collections.abc import Mapping, Sequence
from typing import Any
from xml.etree.ElementTree import Element, SubElement, indent, tostring

# characters XML 1.0 does not allow, even escaped
_ILLEGAL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")


def _clean(text: object, limit: int = 4000) -> str:
    return _ILLEGAL.sub("\ufffd", str(text))[:limit]


def check_line(check: Mapping[str, Any]) -> str:
    """``"fail capacity (check 1): claimed ... against ..."``."""
    number = check.get("number")
    where = f" (check {number})" if number else ""
    return f"{check.get('verdict')} {check.get('name')}{where}: {check.get('message', '')}"


def junit_xml(rows: Sequence[Mapping[str, Any]],
              suite: str = "heatlift datasheet validation") -> str:
    """JUnit XML of validated rows (each with ``row``, ``model``, ``verdict``, ``checks``)."""
    failures = sum(1 for r in rows if r.get("verdict") == "fail")
    root = Element("testsuites", name=_clean(suite), tests=str(len(rows)),
                   failures=str(failures), errors="0")
    group = SubElement(root, "testsuite", name="datasheets", tests=str(len(rows)),
                       failures=str(failures), errors="0", skipped="0")
    for row in rows:
        refrigerant = row.get("refrigerant") or "unknown"
        model = row.get("model") or "(no model)"
        case = SubElement(group, "testcase", classname=_clean(f"datasheet.{refrigerant}", 200),
                          name=_clean(f"row {row.get('row')}: {model}", 300))
        checks = row.get("checks") or []
        lines = "\n".join(_clean(check_line(c)) for c in checks)
        if row.get("verdict") == "fail":
            failing = [c for c in checks if c.get("verdict") == "fail"]
            failure = SubElement(case, "failure",
                                 message=_clean("; ".join(check_line(c) for c in failing), 1000),
                                 type=_clean(",".join(str(c.get("name")) for c in failing), 200))
            failure.text = lines
        elif lines:
            SubElement(case, "system-out").text = lines
    indent(root)  # one element a line (the texts inside are left as they are)
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + tostring(root, encoding="unicode") + "\n"
