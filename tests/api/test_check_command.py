"""``heatlift check``: exit status, table, JUnit, both in-process and against a real gunicorn."""

from __future__ import annotations

import csv
import json
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from tests.conftest import free_port

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "datasheets.csv"
EXPECTED = ROOT / "examples" / "datasheets-expected.csv"


def check(*args: str, stdin: str | None = None) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "heatlift.cli", "check", *args], cwd=ROOT,
                          capture_output=True, text=True, timeout=300, input=stdin)


def expected() -> list[dict[str, str]]:
    lines = [line for line in EXPECTED.read_text("utf-8").splitlines()
             if not line.startswith("#")]
    return list(csv.DictReader(lines))


@pytest.fixture(scope="module")
def passing_file(tmp_path_factory) -> Path:
    """The example datasheet without the rows that fail (a warning row stays in)."""
    keep = {int(w["row"]) for w in expected() if w["verdict"] != "fail"}
    lines = EXAMPLE.read_text("utf-8").splitlines()
    header_at = next(i for i, line in enumerate(lines) if not line.startswith("#"))
    data = lines[header_at + 1:]
    path = tmp_path_factory.mktemp("sheets") / "passing.csv"
    path.write_text("\n".join([lines[header_at]] + [data[i - 1] for i in sorted(keep)]) + "\n",
                    encoding="utf-8")
    return path


@pytest.fixture(scope="module")
def local_runs(passing_file, tmp_path_factory) -> dict[str, object]:
    """The two in-process runs (each loads the property library: a few seconds)."""
    report = tmp_path_factory.mktemp("junit") / "local.xml"
    return {"fail": check(str(EXAMPLE), "--local", "--junit", str(report)), "junit": report,
            "pass": check(str(passing_file), "--local")}


def _assert_failing_run(done: subprocess.CompletedProcess, report: Path) -> None:
    assert done.returncode == 1, done.stderr
    assert "25 rows: 14 pass, 1 warn, 10 fail -> FAIL" in done.stdout
    assert "KSC-045" in done.stdout and "capacity +12.0%" in done.stdout
    root = ET.parse(report).getroot()
    assert root.get("tests") == "25" and root.get("failures") == "10"
    failed = {c.get("name") for c in root.iter("testcase") if c.find("failure") is not None}
    assert failed == {f"row {w['row']}: {w['model']}" for w in expected()
                      if w["verdict"] == "fail"}


def test_local_failing_datasheet_exits_1(local_runs):
    _assert_failing_run(local_runs["fail"], local_runs["junit"])  # type: ignore[arg-type]


def test_local_passing_datasheet_exits_0(local_runs):
    done = local_runs["pass"]
    assert done.returncode == 0, done.stdout + done.stderr  # type: ignore[attr-defined]
    assert "0 fail -> WARN" in done.stdout  # type: ignore[attr-defined]


def test_url_failing_datasheet_exits_1_with_the_same_table(server, local_runs, tmp_path):
    report = tmp_path / "report.xml"
    done = check(str(EXAMPLE), "--url", server, "--junit", str(report))
    _assert_failing_run(done, report)
    assert done.stdout == local_runs["fail"].stdout  # type: ignore[attr-defined]


def test_url_passing_datasheet_exits_0(server, passing_file, tmp_path):
    done = check(str(passing_file), "--url", server, "--junit", str(tmp_path / "r.xml"))
    assert done.returncode == 0, done.stdout + done.stderr
    assert "0 fail -> WARN" in done.stdout  # the warning row warns and does not fail the run
    assert ET.parse(tmp_path / "r.xml").getroot().get("failures") == "0"


def test_small_batches_keep_row_and_line_numbers(server):
    done = check(str(EXAMPLE), "--url", server, "--json", "--batch-size", "4")
    report = json.loads(done.stdout)
    assert report["summary"] == {"rows": 25, "pass": 14, "warn": 1, "fail": 10,
                                 "verdict": "fail"}
    assert [r["row"] for r in report["rows"]] == list(range(1, 26))
    assert [r["line"] for r in report["rows"]] == list(range(4, 29))
    assert [r["verdict"] for r in report["rows"]] == [w["verdict"] for w in expected()]


def test_tolerance_option_changes_verdicts(server):
    done = check(str(EXAMPLE), "--url", server, "--json", "--tolerance", "capacity_warn=0.15",
                 "--tolerance", "capacity_fail=20 %")
    rows = json.loads(done.stdout)["rows"]
    assert rows[14]["verdict"] == "pass" and rows[15]["verdict"] == "pass"


def test_stdin_and_only_problems(server):
    done = check("-", "--url", server, "--only-problems", stdin=EXAMPLE.read_text("utf-8"))
    assert done.returncode == 1
    table = done.stdout.split("\n\n")[0].splitlines()
    assert len(table) == 1 + 11  # header, 1 warn and 10 fail rows


@pytest.mark.parametrize("args,words", [
    (["no-such-file.csv", "--local"], "cannot read"),
    ([str(EXAMPLE), "--local", "--tolerance", "nonsense=1"], "unknown tolerance"),
    ([str(EXAMPLE), "--local", "--tolerance", "capacity_fail"], "NAME=VALUE"),
    ([str(EXAMPLE), "--local", "--url", "http://x"], "not allowed"),
    ([str(EXAMPLE), "--batch-size", "0"], "batch-size"),
    ([str(EXAMPLE), "--url", "{server}", "--tolerance", "capacity_warn=0.9"], "capacity_warn"),
])
def test_usage_errors_exit_2(args, words, server):
    done = check(*[a.replace("{server}", server) for a in args])
    assert done.returncode == 2, done.stdout + done.stderr
    assert words in done.stderr


def test_file_the_service_refuses_exits_2(tmp_path, server):
    bad = tmp_path / "bad.csv"
    bad.write_text("model,colour\nA,red\n", encoding="utf-8")
    done = check(str(bad), "--url", server)
    assert done.returncode == 2
    assert "unknown column" in done.stderr


def test_unreachable_service_exits_3():
    done = check(str(EXAMPLE), "--url", f"http://127.0.0.1:{free_port()}", "--retries", "0")
    assert done.returncode == 3
    assert "cannot reach" in done.stderr


def test_progress_bar_draws_only_on_a_terminal():
    import io

    from heatlift.check_command import Progress

    class Terminal(io.StringIO):
        def isatty(self) -> bool:
            return True

    screen, log = Terminal(), io.StringIO()
    for stream in (screen, log):
        bar = Progress(1000, stream)
        bar.update(500)
        bar.update(1000)
        bar.close()
    assert "500/1000 rows" in screen.getvalue() and "1000/1000 rows" in screen.getvalue()
    assert screen.getvalue().count("\r") == 2 and screen.getvalue().endswith("\n")
    assert log.getvalue() == ""  # a CI log gets no bar
