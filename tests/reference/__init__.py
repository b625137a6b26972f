"""Checks of the engine against sources outside the project.

This package file holds no expected values. Every test module here names the source beside each
expected value (a standard, a handbook table, a paper, an independent library such as iapws,
chemicals or fluids, or "common practice, no source"), says "from memory" where a value is
recalled, and uses a tolerance that fits that source.
"""
