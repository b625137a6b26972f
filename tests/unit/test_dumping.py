"""The compiled dumps (schemas/dumping.py) give exactly what marshmallow's own dump gives.

The service writes every result through a plan compiled from its schema; marshmallow's
``Schema.dump`` is the definition of the output. Both are run on the same engine results (a
cycle of each circuit, a saturation table, a state) in SI, in IP and with unit overrides,
and must agree to the last key and the last digit.
"""

from __future__ import annotations

import pytest

from heatlift import cycle, saturation, state
from schemas.cycle import CycleRequestSchema, CycleResultSchema
from schemas.dumping import dump, plan
from schemas.fields import using_units
from schemas.saturation import SaturationSchema, SaturationTableSchema
from schemas.state import StateReportSchema
from schemas.units import UnitContext

C = 273.15
CYCLES = {
    "single_stage": {"refrigerant": "R134a", "evaporating": {"temperature": "-10 degC"},
                     "condensing": {"temperature": "40 degC"}, "superheat": "6 K",
                     "subcooling": "3 K", "compressor": {"isentropic_efficiency": 0.7},
                     "cooling_capacity": "12 kW"},
    "two_stage": {"refrigerant": "R717", "circuit": "two_stage",
                  "evaporating": {"temperature": "-35 degC"},
                  "condensing": {"temperature": "35 degC"}, "superheat": "5 K",
                  "subcooling": "2 K", "compressor": {"isentropic_efficiency": 0.72},
                  "cooling_capacity": "100 kW"},
    "transcritical": {"refrigerant": "R744", "circuit": "transcritical",
                      "evaporating": {"temperature": "-8 degC"},
                      "gas_cooler": {"outlet_temperature": "35 degC", "pressure": "optimal"},
                      "superheat": "5 K", "compressor": {"isentropic_efficiency": 0.7},
                      "cooling_capacity": "30 kW"},
    "blend": {"refrigerant": "R454B", "evaporating": {"temperature": "-5 degC"},
              "condensing": {"temperature": "45 degC"}, "superheat": "5 K",
              "subcooling": "4 K", "compressor": {"isentropic_efficiency": 0.68},
              "cooling_capacity": "20 kW"},
}
UNITS = [UnitContext(), UnitContext("IP"),
         UnitContext("SI", {"pressure": "barg", "temperature": "degF", "power": "TR"})]


def results() -> list[tuple[object, object]]:
    out: list[tuple[object, object]] = []
    loader = CycleRequestSchema()
    for body in CYCLES.values():
        out.append((CycleResultSchema(), cycle.solve(loader.load(body))))
    out.append((SaturationTableSchema(), saturation.table("R407C", "temperature", -30 + C,
                                                          30 + C, 7.5, 500)))
    out.append((SaturationSchema(), saturation.at_pressure("R454B", 8e5)))
    out.append((StateReportSchema(), state.evaluate("R290", pressure=4e5, temperature=C)))
    out.append((StateReportSchema(), state.evaluate("R32", pressure=1e6, quality=0.4)))
    return out


@pytest.mark.parametrize("ctx", UNITS, ids=["SI", "IP", "overrides"])
def test_compiled_dump_equals_marshmallow(ctx):
    with using_units(ctx):
        for schema, result in results():
            assert dump(schema, result) == schema.dump(result), type(result).__name__


def test_a_plan_is_built_once_per_schema_instance():
    schema = CycleResultSchema()
    assert plan(schema) is plan(schema)
    assert plan(schema) is not plan(CycleResultSchema())
