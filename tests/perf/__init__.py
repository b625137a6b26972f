"""Benchmarks for issue 8 (not part of the test gate: tests/perf is not in pytest's testpaths)."""
