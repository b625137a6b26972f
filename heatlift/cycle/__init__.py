"""Vapour-compression cycles: single-stage, economised, two-stage and transcritical R744.

``solve(spec)`` takes a :class:`~heatlift.cycle.spec.CycleSpec` and returns a
:class:`~heatlift.cycle.result.CycleResult`, all in SI units.
"""

from __future__ import annotations

from heatlift.cycle import economized, single_stage, transcritical, two_stage
from heatlift.cycle.assemble import assemble
from heatlift.cycle.result import CyclePoint, CycleResult, Performance
from heatlift.cycle.spec import (
    CIRCUITS,
    CompressorSpec,
    CycleSpec,
    GasCoolerSpec,
    PressureDrop,
    PressureDrops,
    SaturationSpec,
)
from heatlift.errors import InvalidInput
from heatlift.properties import model

__all__ = [
    "CIRCUITS", "CompressorSpec", "CycleSpec", "GasCoolerSpec", "PressureDrop", "PressureDrops",
    "SaturationSpec", "CyclePoint", "CycleResult", "Performance", "solve",
]

_SOLVERS = {
    "single_stage": single_stage.solve,
    "economized": economized.solve,
    "two_stage": two_stage.solve,
    "transcritical": transcritical.solve,
}


def solve(spec: CycleSpec) -> CycleResult:
    """Solve the circuit of ``spec`` and size it."""
    m = model(spec.refrigerant)
    if spec.circuit not in _SOLVERS:
        raise InvalidInput(f"circuit must be one of {', '.join(CIRCUITS)}", field="circuit")
    if spec.compressor.polynomial is not None:
        from heatlift.cycle.rated import solve_rated

        return solve_rated(m, spec)
    if spec.circuit == "transcritical":
        return transcritical.solve_sized(m, spec)
    return assemble(m, spec, _SOLVERS[spec.circuit](m, spec))
