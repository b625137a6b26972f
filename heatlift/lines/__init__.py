"""Refrigerant line sizing: suction, discharge and liquid lines from standard tube catalogues.

``size(request)`` judges every size of a catalogue and recommends the smallest that meets every
limit; ``check(request, tube)`` reports one given size. See :mod:`heatlift.lines.sizing`.
"""

from __future__ import annotations

from heatlift.lines.duty import LINES, Duty, InletSpec, from_conditions, from_cycle, from_mass_flow
from heatlift.lines.hydraulics import FITTING_TYPES, Fitting
from heatlift.lines.sizing import (
    DEFAULT_LIMITS,
    Candidate,
    CheckResult,
    Limits,
    LineRequest,
    Route,
    SizingResult,
    check,
    size,
)
from heatlift.lines.tubes import STANDARDS, Tube, catalogue, find, sizes

__all__ = [
    "LINES", "Duty", "InletSpec", "from_conditions", "from_cycle", "from_mass_flow",
    "FITTING_TYPES", "Fitting", "DEFAULT_LIMITS", "Candidate", "CheckResult", "Limits",
    "LineRequest", "Route", "SizingResult", "check", "size", "STANDARDS", "Tube", "catalogue",
    "find", "sizes",
]
