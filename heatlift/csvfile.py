"""Reading the records of a datasheet CSV file: delimiter, comment lines, line numbers.

Shared by the service (``POST /v1/datasheets/validate``) and ``heatlift check``, so that both
split a file the same way. Plain text in, lists of cells out; what the cells mean is the
schemas' business.

- The delimiter is the one of ``,``, ``;`` or tab that the header line uses most (spreadsheets
  set to a decimal-comma locale write ``;``).
- A record whose first cell starts with ``#`` is a comment; records with only blank cells are
  skipped.
- Each record keeps the line number it starts on, for messages a person can find in the file.
"""

from __future__ import annotations

import csv
import io
from collections.abc import Iterator
from dataclasses import dataclass

DELIMITERS = (",", ";", "\t")


class CsvError(ValueError):
    """A file that is not readable CSV."""


class TooManyRows(ValueError):
    """More data rows than the limit; ``limit`` is that limit."""

    def __init__(self, limit: int) -> None:
        super().__init__(f"more than {limit} rows")
        self.limit = limit


@dataclass(frozen=True)
class CsvTable:
    delimiter: str
    header: list[str]
    header_line: int
    records: list[tuple[int, list[str]]]


def sniff_delimiter(text: str) -> str:
    """The delimiter of the first non-comment line: the most frequent of ``,`` ``;`` tab."""
    for line in text.splitlines():
        if line.strip() and not line.lstrip().startswith("#"):
            counts = {d: line.count(d) for d in DELIMITERS}
            best = max(DELIMITERS, key=lambda d: counts[d])
            return best if counts[best] else ","
    return ","


def _records(text: str, delimiter: str) -> Iterator[tuple[int, list[str]]]:
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delimiter, strict=True)
    start = 1
    try:
        for cells in reader:
            line, start = start, reader.line_num + 1
            if not cells or all(not c.strip() for c in cells):
                continue
            if cells[0].lstrip().startswith("#"):
                continue
            yield line, cells
    except csv.Error as exc:
        raise CsvError(f"the CSV cannot be read near line {reader.line_num}: {exc}") from exc


def read_table(text: str, max_rows: int | None = None) -> CsvTable:
    """Header and data records of ``text``; raises :class:`CsvError` or :class:`TooManyRows`."""
    if text.startswith("\ufeff"):
        text = text[1:]
    delimiter = sniff_delimiter(text)
    records = _records(text, delimiter)
    first = next(records, None)
    if first is None:
        raise CsvError("the CSV has no header line")
    header_line, header = first
    rows: list[tuple[int, list[str]]] = []
    for line, cells in records:
        if len(cells) > len(header) and any(c.strip() for c in cells[len(header):]):
            raise CsvError(f"line {line} has {len(cells)} cells, the header only {len(header)}")
        rows.append((line, (cells + [""] * len(header))[: len(header)]))
        if max_rows is not None and len(rows) > max_rows:
            raise TooManyRows(max_rows)
    return CsvTable(delimiter, [h.strip() for h in header], header_line, rows)


def write_table(delimiter: str, header: list[str], records: list[list[str]]) -> str:
    """CSV text of ``header`` and ``records`` with ``delimiter`` (for splitting a file)."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, delimiter=delimiter, lineterminator="\r\n")
    writer.writerow(header)
    writer.writerows(records)
    return buffer.getvalue()
