"""``heatlift check FILE.csv``: validate a datasheet file, for a person or a CI job.

    heatlift check datasheets.csv --junit report.xml          # in-process
    heatlift check datasheets.csv --url http://heatlift:8080  # against a running service

The file goes to ``POST /v1/datasheets/validate`` in parts of ``--batch-size`` rows: with
``--url`` (or ``HEATLIFT_URL``) through :class:`heatlift.client.Client`; otherwise (``--local``,
the default) in-process through the Flask application's test client, so that both ways read
the file with the same code and give the same verdicts. The parts' results are joined, row
numbers and line numbers refer to the whole file.

Exit status: 0 when no row fails (warnings allowed), 1 when any row fails, 2 for a usage error
(bad option, unreadable file, a file the service refuses as a whole), 3 when the service cannot
be reached or fails.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any, TextIO

from heatlift.client import Client, HeatliftClientError
from heatlift.csvfile import CsvError, CsvTable, read_table, write_table
from heatlift.junit import junit_xml
from heatlift.tolerances import Tolerances

EXIT_PASS, EXIT_FAIL, EXIT_USAGE, EXIT_SERVICE = 0, 1, 2, 3
DEFAULT_BATCH = 500
PATH = "/v1/datasheets/validate"

Validator = Callable[[str, dict[str, str]], dict[str, Any]]


def add_check_parser(sub: Any) -> None:
    """The ``check`` subcommand (``sub`` is the parser's subparsers object)."""
    check = sub.add_parser(
        "check", help="validate a datasheet CSV (exit 1 when any row fails)",
        description=__doc__.split("\n\n")[0] if __doc__ else None)
    check.add_argument("file", help="the datasheet CSV ('-' reads standard input)")
    where = check.add_mutually_exclusive_group()
    where.add_argument("--url", default=os.environ.get("HEATLIFT_URL"),
                       help="base URL of a running service (default HEATLIFT_URL)")
    where.add_argument("--local", action="store_true",
                       help="check in-process (the default when no URL is given)")
    check.add_argument("--junit", metavar="PATH", help="write a JUnit XML report to PATH")
    check.add_argument("--units", choices=("SI", "IP"), type=str.upper,
                       help="unit system of columns without a [unit] in the header (default SI)")
    check.add_argument("--tolerance", action="append", default=[], metavar="NAME=VALUE",
                       help="change one tolerance, e.g. capacity_fail=0.08 or "
                            "'capacity_fail=8 %%' (repeatable)")
    check.add_argument("--api-key", default=os.environ.get("HEATLIFT_API_KEY"),
                       help="API key for --url (default HEATLIFT_API_KEY)")
    check.add_argument("--timeout", type=float, default=120.0,
                       help="seconds to wait for each part's answer (default 120)")
    check.add_argument("--retries", type=int, default=3,
                       help="retries on connection errors and 502/503/504 (default 3)")
    check.add_argument("--batch-size", type=int, default=DEFAULT_BATCH,
                       help=f"rows per request (default {DEFAULT_BATCH})")
    check.add_argument("--only-problems", action="store_true",
                       help="list only rows that warn or fail")
    check.add_argument("--json", action="store_true",
                       help="print the joined report as JSON instead of a table")
    check.set_defaults(func=run)


class UsageError(Exception):
    """A command line or file the check cannot use (exit code 2)."""


def _tolerances(items: list[str]) -> dict[str, str]:
    out: dict[str, str] = {}
    for item in items:
        name, sep, value = item.partition("=")
        name = name.strip()
        if not sep or not value.strip():
            raise UsageError(f"--tolerance takes NAME=VALUE, not '{item}'")
        if name not in Tolerances.names():
            raise UsageError(f"unknown tolerance '{name}'; the names are "
                             f"{', '.join(Tolerances.names())}")
        out[name] = value.strip()
    return out


def _remote(url: str, api_key: str | None, timeout: float, retries: int) -> Validator:
    client = Client(url, api_key=api_key, timeout=(10.0, timeout), retries=retries)

    def validate(text: str, params: dict[str, str]) -> dict[str, Any]:
        tolerances = {k: v for k, v in params.items() if k != "units"}
        extra: dict[str, Any] = {"units": params["units"]} if "units" in params else {}
        result = client.validate_datasheet(csv=text, tolerances=tolerances, **extra)
        if not isinstance(result, dict):
            raise HeatliftClientError("the service did not answer with a JSON report")
        return result

    return validate


def _local() -> Validator:
    from api import create_app

    # in-process: no key check, no access log on the console, properties loaded on demand
    app = create_app({"HEATLIFT_WARM_UP": False, "HEATLIFT_API_KEYS": frozenset(),
                      "HEATLIFT_ACCESS_LOG": False})
    test_client = app.test_client()

    def validate(text: str, params: dict[str, str]) -> dict[str, Any]:
        response = test_client.post(PATH, data=text.encode("utf-8"),
                                    content_type="text/csv; charset=utf-8",
                                    query_string={**params, "format": "json"})
        body = response.get_json(silent=True) or {}
        if response.status_code >= 400:
            raise HeatliftClientError(
                f"{response.status_code} {body.get('title', '')}: {body.get('detail', '')}",
                status=response.status_code, problem=body)
        return body

    return validate


class Progress:
    """A one-line progress bar on stderr, drawn only when stderr is a terminal."""

    def __init__(self, total: int, stream: TextIO = sys.stderr) -> None:
        self.total = total
        self.stream = stream
        self.active = total > 0 and stream.isatty()

    def update(self, done: int) -> None:
        if not self.active:
            return
        width = 30
        filled = int(width * done / self.total)
        self.stream.write(f"\rchecking [{'#' * filled}{'.' * (width - filled)}] "
                          f"{done}/{self.total} rows")
        self.stream.flush()

    def close(self) -> None:
        if self.active:
            self.stream.write("\n")
            self.stream.flush()


def _read_file(name: str) -> str:
    try:
        if name == "-":
            return sys.stdin.read()
        return Path(name).read_text(encoding="utf-8-sig")
    except OSError as exc:
        raise UsageError(f"cannot read {name}: {exc.strerror or exc}") from exc
    except UnicodeDecodeError as exc:
        raise UsageError(f"{name} is not UTF-8 text; save it as CSV UTF-8") from exc


def read_file_table(text: str) -> CsvTable:
    try:
        table = read_table(text)
    except CsvError as exc:
        raise UsageError(str(exc)) from exc
    if not table.records:
        raise UsageError("the file has a header but no rows")
    return table


def validate_file(table: CsvTable, validate: Validator, params: dict[str, str],
                  batch_size: int, progress: Progress | None = None) -> dict[str, Any]:
    """The joined report of ``table`` checked in parts of ``batch_size`` rows."""
    rows: list[dict[str, Any]] = []
    report: dict[str, Any] = {}
    for start in range(0, len(table.records), batch_size):
        part = table.records[start:start + batch_size]
        chunk = write_table(table.delimiter, table.header, [cells for _, cells in part])
        report = validate(chunk, params)
        for row in report.get("rows", []):
            index = int(row["row"]) - 1
            row["row"] = start + index + 1
            row["line"] = part[index][0]
            rows.append(row)
        if progress is not None:
            progress.update(start + len(part))
    counts = {v: sum(1 for r in rows if r.get("verdict") == v) for v in ("pass", "warn", "fail")}
    verdict = "fail" if counts["fail"] else "warn" if counts["warn"] else "pass"
    return {"summary": {"rows": len(rows), **counts, "verdict": verdict},
            "tolerances": report.get("tolerances", {}), "rows": rows,
            "meta": report.get("meta", {})}


def _short(check: dict[str, Any]) -> str:
    deviation = (check.get("deviation") or {}).get("value")
    if deviation is None:
        return str(check.get("name"))
    if str(check.get("measure", "")).endswith("- 1"):
        return f"{check.get('name')} {deviation:+.1%}"
    return f"{check.get('name')} {deviation:.2f}"


def format_table(report: dict[str, Any], only_problems: bool = False) -> str:
    """The report as a plain-text table, then the failing and warning checks in full."""
    rows = report["rows"]
    shown = [r for r in rows if not only_problems or r.get("verdict") != "pass"]
    header = ("row", "line", "model", "refrigerant", "verdict", "checks")
    lines_out: list[tuple[str, ...]] = []
    for r in shown:
        checks = r.get("checks", [])
        bad = [c for c in checks if c.get("verdict") != "pass"]
        note = ", ".join(_short(c) for c in bad) if bad else f"{len(checks)} passed"
        lines_out.append((str(r.get("row", "")), str(r.get("line") or ""),
                          str(r.get("model") or ""), str(r.get("refrigerant") or ""),
                          str(r.get("verdict", "")).upper() if r.get("verdict") != "pass"
                          else "pass", note))
    widths = [max([len(h)] + [min(len(x[i]), 40) for x in lines_out])
              for i, h in enumerate(header[:-1])]

    def fmt(cells: tuple[str, ...]) -> str:
        parts = [c[:40].rjust(w) if i < 2 else c[:40].ljust(w)
                 for i, (c, w) in enumerate(zip(cells[:-1], widths, strict=True))]
        return "  ".join([*parts, cells[-1]]).rstrip()

    text = [fmt(header)] + [fmt(x) for x in lines_out]
    details = [f"  row {r['row']} ({r.get('model') or '?'}) {c.get('verdict')} {c.get('name')}: "
               f"{c.get('message')}"
               for r in shown for c in r.get("checks", []) if c.get("verdict") != "pass"]
    if details:
        text += ["", "Checks that warn or fail:", *details]
    s = report["summary"]
    text += ["", f"{s['rows']} rows: {s['pass']} pass, {s['warn']} warn, {s['fail']} fail "
                 f"-> {s['verdict'].upper()}"]
    return "\n".join(text)


def run(args: argparse.Namespace) -> int:
    """The ``check`` subcommand; returns the exit status."""
    try:
        if args.batch_size < 1:
            raise UsageError("--batch-size must be at least 1")
        params = _tolerances(args.tolerance)
        if args.units:
            params["units"] = args.units
        text = _read_file(args.file)
        if args.url and not args.local:
            validate = _remote(args.url, args.api_key, args.timeout, args.retries)
        else:
            validate = _local()
        table = read_file_table(text)
        # a bar only when there is more than one part to wait for
        progress = Progress(len(table.records) if len(table.records) > args.batch_size else 0)
        try:
            report = validate_file(table, validate, params, args.batch_size, progress)
        finally:
            progress.close()
    except UsageError as exc:
        print(f"heatlift check: {exc}", file=sys.stderr)
        return EXIT_USAGE
    except HeatliftClientError as exc:
        errors = exc.errors
        if errors:  # the problem's detail repeats them: list each once
            print(f"heatlift check: the service refused the file ({exc.status} {exc.title}):",
                  file=sys.stderr)
            for field, messages in list(errors.items())[:20]:
                print(f"  {field}: {' '.join(messages)}", file=sys.stderr)
        else:
            print(f"heatlift check: {exc}", file=sys.stderr)
        if exc.status is not None and 400 <= exc.status < 500:
            return EXIT_USAGE
        return EXIT_SERVICE
    if args.junit:
        try:
            Path(args.junit).write_text(junit_xml(report["rows"]), encoding="utf-8")
        except OSError as exc:
            print(f"heatlift check: cannot write {args.junit}: {exc.strerror or exc}",
                  file=sys.stderr)
            return EXIT_USAGE
    if args.json:
        print(json.dumps(report, indent=2, ensure_ascii=False))
    else:
        print(format_table(report, args.only_problems))
    return EXIT_FAIL if report["summary"]["fail"] else EXIT_PASS
