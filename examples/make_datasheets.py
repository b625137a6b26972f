"""Writes examples/datasheets.csv and datasheets-expected.csv (the demo scenario).

Kestrel Compressors is an INVENTED compressor maker, and every model, coefficient and figure
here is invented for the heatlift demo. The figures come from heatlift's own engine: each model
is an invented physical compressor (a displacement, a volumetric efficiency falling with the
pressure ratio, an overall isentropic efficiency peaking at a design ratio), evaluated at each
rating point with the refrigerant states of heatlift.properties; the 10-coefficient polynomials
are least-squares fits of the same model over its envelope, as a maker would publish them.
Figures are rounded as a datasheet prints them. Some rows then get one planted error each; the
expected verdicts are written beside them.

    python examples/make_datasheets.py        # rewrites the three files

It also writes examples/compressor-polynomial.json, the request of the README's polynomial
example (model KSC-045's coefficients).

numpy is needed for the fit (it comes with matplotlib); the service does not need it.
"""

from __future__ import annotations

import csv
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from heatlift.compressor import BTU_PER_HOUR_PER_WATT, operating_point, polynomial
from heatlift.properties import model

HERE = Path(__file__).resolve().parent
KELVIN = 273.15
SUPPLY = math.sqrt(3.0) * 400.0 * 0.82  # three-phase 400 V, power factor 0.82 [V]


@dataclass(frozen=True)
class Compressor:
    """An invented compressor: displacement [m^3/h], a volumetric efficiency falling with the
    lift ``1 - loss * (tc - te)`` and an overall isentropic efficiency
    ``eta_peak - curvature * (tc - te - lift_design)^2``."""

    model: str
    refrigerant: str
    displacement: float
    loss: float
    eta_peak: float
    lift_design: float
    curvature: float
    te_range: tuple[float, float]
    tc_range: tuple[float, float]

    def figures(self, te: float, tc: float, superheat: float, subcooling: float) -> dict:
        """SI figures at dew points te, tc [degC], superheat, subcooling [K]."""
        op = operating_point(self.refrigerant, te + KELVIN, tc + KELVIN, superheat, subcooling)
        lift = tc - te
        eta_v = 1.0 - self.loss * lift
        eta_s = self.eta_peak - self.curvature * (lift - self.lift_design) ** 2
        mass = eta_v * op.suction.density * self.displacement / 3600.0
        capacity = mass * op.refrigerating_effect
        power = mass * op.isentropic_work / eta_s
        return {"capacity": capacity, "power": power, "mass_flow": mass,
                "current": power / SUPPLY + 0.8, "op": op, "eta_s": eta_s, "eta_v": eta_v}

    def fit(self) -> dict[str, list[float]]:
        """10-coefficient polynomials (SI basis: degC, W, kg/s, A) at 10 K / 0 K."""
        points = [(te, tc) for te in np.arange(self.te_range[0], self.te_range[1] + 0.1, 2.5)
                  for tc in np.arange(self.tc_range[0], self.tc_range[1] + 0.1, 2.5)
                  if tc - te >= 20.0]
        basis = np.array([[1, s, d, s * s, s * d, d * d, s ** 3, d * s * s, s * d * d, d ** 3]
                          for s, d in points])
        values = [self.figures(float(s), float(d), 10.0, 0.0) for s, d in points]
        out = {}
        for name in ("capacity", "power", "mass_flow", "current"):
            target = np.array([v[name] for v in values])
            coefficients, *_ = np.linalg.lstsq(basis, target, rcond=None)
            out[name] = [float(f"{c:.7g}") for c in coefficients]
        return out


KESTREL = [
    Compressor("KSC-045", "R454B", 11.5, 0.0025, 0.70, 40.0, 4e-5, (-20.0, 12.5), (25.0, 60.0)),
    Compressor("KSC-090", "R410A", 23.0, 0.0025, 0.71, 40.0, 4e-5, (-20.0, 12.5), (25.0, 60.0)),
    Compressor("KRH-120", "R134a", 36.0, 0.0040, 0.66, 40.0, 5e-5, (-25.0, 10.0), (25.0, 60.0)),
    Compressor("KPR-030", "R290", 8.5, 0.0035, 0.67, 40.0, 5e-5, (-25.0, 10.0), (25.0, 60.0)),
]
BY_MODEL = {c.model: c for c in KESTREL}

HEADER = [
    "model", "refrigerant", "evaporating_temperature [degC]", "condensing_temperature [degC]",
    "superheat [K]", "return_gas_temperature [degC]", "subcooling [K]",
    "cooling_capacity [kW]", "power [kW]", "cop", "eer [Btu/Wh]", "mass_flow [kg/h]",
    "current [A]", "displacement [m^3/h]", "pressure_evaporating [bar]",
    "pressure_condensing [bar]", "basis", "coefficients.capacity", "coefficients.power",
    "coefficients.mass_flow", "coefficients.current", "notes",
]


def _g(value: float, digits: int) -> str:
    """A figure rounded to ``digits`` significant digits, as a datasheet prints it."""
    return f"{value:.{digits}g}"


def row(compressor: Compressor, te: float, tc: float, *, superheat: float | None = 10.0,
        return_gas: str | None = None, subcooling: float = 0.0, polynomials: bool = True,
        notes: str = "", change: dict | None = None, drop: tuple[str, ...] = ()) -> dict:
    """One datasheet row; ``change`` replaces printed cells, ``drop`` blanks them."""
    if return_gas is not None:
        rg_kelvin = (float(return_gas.split()[0]) - 32) / 1.8 + KELVIN \
            if return_gas.endswith("degF") else float(return_gas) + KELVIN
        sh = rg_kelvin - (te + KELVIN)
    else:
        sh = float(superheat or 0.0)
    f = published(compressor, te, tc, sh, subcooling)
    op = f["op"]
    cop = f["capacity"] / f["power"]
    cells = {
        "model": compressor.model, "refrigerant": compressor.refrigerant,
        "evaporating_temperature [degC]": _g(te, 4), "condensing_temperature [degC]": _g(tc, 4),
        "superheat [K]": "" if return_gas is not None else _g(sh, 3),
        "return_gas_temperature [degC]": return_gas or "",
        "subcooling [K]": _g(subcooling, 3),
        "cooling_capacity [kW]": _g(f["capacity"] / 1e3, 3),
        "power [kW]": _g(f["power"] / 1e3, 3),
        "cop": f"{cop:.2f}", "eer [Btu/Wh]": f"{cop * BTU_PER_HOUR_PER_WATT:.2f}",
        "mass_flow [kg/h]": _g(f["mass_flow"] * 3600, 4),
        "current [A]": f"{f['current']:.1f}",
        "displacement [m^3/h]": f"{compressor.displacement:.1f}",
        "pressure_evaporating [bar]": f"{op.pressure_evaporating / 1e5:.2f}",
        "pressure_condensing [bar]": f"{op.pressure_condensing / 1e5:.2f}",
        "basis": "", "notes": notes,
    }
    if polynomials:
        cells["basis"] = "SI"
        for name, coefficients in FITS[compressor.model].items():
            cells[f"coefficients.{name}"] = ";".join(f"{c:.7g}" for c in coefficients)
    cells.update(change or {})
    for name in drop:
        cells[name] = ""
    return cells


FITS = {c.model: c.fit() for c in KESTREL}


def published(compressor: Compressor, te: float, tc: float, superheat: float,
              subcooling: float) -> dict:
    """The figures a datasheet prints: at the polynomials' own conditions (10 K superheat,
    0 K subcooling) the polynomials' values, as AHRI 540 makes the coefficients the primary
    rating; elsewhere the compressor model's figures."""
    f = compressor.figures(te, tc, superheat, subcooling)
    if superheat == 10.0 and subcooling == 0.0:
        for name, coefficients in FITS[compressor.model].items():
            f[name] = polynomial(coefficients, te, tc)
    return f


def rows() -> list[tuple[dict, str, str]]:
    """(cells, expected verdict, checks expected to warn or fail)."""
    ksc45, ksc90, krh, kpr = (BY_MODEL[m] for m in ("KSC-045", "KSC-090", "KRH-120", "KPR-030"))
    out: list[tuple[dict, str, str]] = []
    # consistent rows: EN 12900-style points at 10 K superheat, 0 K subcooling, with polynomials
    for c in KESTREL:
        for te, tc in ((-10.0, 45.0), (5.0, 50.0), (-5.0, 40.0)):
            out.append((row(c, te, tc), "pass", ""))
    # consistent rows at an AHRI-style point: return gas 65 degF, 8.3 K subcooling (no
    # polynomial: the coefficients hold at 10 K / 0 K only)
    out.append((row(ksc90, 7.2, 54.4, superheat=None, return_gas="65 degF", subcooling=8.3,
                    polynomials=False, notes="AHRI-style rating point; no polynomial"),
                "pass", ""))
    out.append((row(krh, -6.7, 48.9, superheat=None, return_gas="18.3", subcooling=8.3,
                    polynomials=False, notes="AHRI-style rating point; no polynomial"),
                "pass", ""))

    def planted(c: Compressor, te: float, tc: float, note: str, verdict: str, checks: str,
                **kwargs: object) -> None:
        out.append((row(c, te, tc, notes="planted: " + note, **kwargs), verdict, checks))

    base = published(ksc45, -10.0, 45.0, 10.0, 0.0)
    q_wrong = base["capacity"] * 1.12
    planted(ksc45, -10.0, 45.0, "capacity 12 % above mass flow x (h1 - h4); COP and EER "
            "printed from it", "fail", "capacity", polynomials=False, change={
                "cooling_capacity [kW]": _g(q_wrong / 1e3, 3),
                "cop": f"{q_wrong / base['power']:.2f}",
                "eer [Btu/Wh]": f"{q_wrong / base['power'] * BTU_PER_HOUR_PER_WATT:.2f}"})
    planted(ksc45, -5.0, 40.0, "capacity 3 % above mass flow x (h1 - h4): a warning only",
            "warn", "capacity", polynomials=False, drop=("cop", "eer [Btu/Wh]"), change={
                "cooling_capacity [kW]": _g(published(ksc45, -5.0, 40.0, 10, 0)["capacity"]
                                            * 1.03 / 1e3, 3)})
    planted(ksc90, 5.0, 50.0, "COP 8.60 above the Carnot COP of the dew points (a typo)",
            "fail", "carnot", polynomials=False,
            drop=("cooling_capacity [kW]", "power [kW]", "eer [Btu/Wh]"),
            change={"cop": "8.60"})
    f = published(kpr, -10.0, 45.0, 10.0, 0.0)
    p_low = f["mass_flow"] * f["op"].isentropic_work / 1.02
    planted(kpr, -10.0, 45.0, "power below the isentropic power (implied efficiency 1.02)",
            "fail", "isentropic_efficiency", polynomials=False, drop=("eer [Btu/Wh]",),
            change={"power [kW]": _g(p_low / 1e3, 3),
                    "cop": f"{f['capacity'] / p_low:.2f}"})
    f = published(krh, -10.0, 45.0, 10.0, 0.0)
    planted(krh, -10.0, 45.0, "EER printed as 3.6 x COP instead of 3.412 x COP", "fail", "eer",
            polynomials=False,
            change={"eer [Btu/Wh]": f"{3.6 * f['capacity'] / f['power']:.2f}"})
    f = published(ksc90, 5.0, 40.0, 10.0, 0.0)
    planted(ksc90, 5.0, 40.0, "the heating COP (Q + P) / P printed as the cooling COP", "fail",
            "cop", polynomials=False, drop=("eer [Btu/Wh]",),
            change={"cop": f"{(f['capacity'] + f['power']) / f['power']:.2f}"})
    wrong = list(FITS["KRH-120"]["capacity"])
    wrong[1] = wrong[1] * 10.0  # a slipped decimal point in C2
    planted(krh, 5.0, 50.0, "capacity coefficient C2 with a slipped decimal point", "fail",
            "polynomial_capacity",
            change={"coefficients.capacity": ";".join(f"{c:.7g}" for c in wrong)})
    f = published(ksc45, 5.0, 50.0, 10.0, 0.0)
    planted(ksc45, 5.0, 50.0, "condensing pressure printed as gauge in an absolute column",
            "fail", "pressure_condensing", polynomials=False, change={
                "pressure_condensing [bar]":
                    f"{(f['op'].pressure_condensing - 101325.0) / 1e5:.2f}"})
    p_bubble = model("R454B").saturated_at_temperature(-10.0 + KELVIN, 0.0).pressure
    planted(ksc45, -10.0, 45.0, "evaporating pressure of the bubble point (R454B glides)",
            "fail", "pressure_evaporating", polynomials=False,
            change={"pressure_evaporating [bar]": f"{p_bubble / 1e5:.2f}"})
    planted(kpr, 5.0, 50.0, "displacement of the 50 Hz model for a 60 Hz rating", "fail",
            "volumetric_efficiency", polynomials=False,
            change={"displacement [m^3/h]": f"{kpr.displacement / 1.2 / 1.1:.1f}"})
    planted(ksc90, -10.0, 45.0, "refrigerant misspelt", "fail", "input", polynomials=False,
            change={"refrigerant": "R-410X"})
    return out


def polynomial_request() -> str:
    """examples/compressor-polynomial.json: KSC-045's polynomials at -10 / 45 degC, corrected to
    5 K superheat and 3 K subcooling (the README's curl example)."""
    items = ",\n".join(f'  "{name}": [{", ".join(f"{c:.7g}" for c in coefficients)}]'
                        for name, coefficients in FITS["KSC-045"].items())
    return "\n".join([
        "{", ' "refrigerant": "R454B", "basis": "SI",', ' "coefficients": {', items, " },",
        ' "rating": {"superheat": 10, "subcooling": 0},',
        ' "evaporating_temperature": -10, "condensing_temperature": 45,',
        ' "superheat": 5, "subcooling": 3, "displacement": "11.5 m^3/h",',
        ' "envelope": [[-20, 25], [12.5, 25], [12.5, 60], [-5, 60], [-20, 50]]', "}", ""])


def main() -> None:
    (HERE / "compressor-polynomial.json").write_text(polynomial_request(), encoding="utf-8")
    data = rows()
    with open(HERE / "datasheets.csv", "w", newline="", encoding="utf-8") as handle:
        handle.write("# Kestrel Compressors is an invented compressor maker: every model and "
                     "figure in this file is invented for the heatlift demo.\n")
        handle.write("# Generated by examples/make_datasheets.py from heatlift's own engine. "
                     "Rows whose notes begin with 'planted' carry a deliberate error; "
                     "datasheets-expected.csv gives each row's expected verdict.\n")
        writer = csv.DictWriter(handle, HEADER, lineterminator="\n")
        writer.writeheader()
        for cells, _, _ in data:
            writer.writerow(cells)
    with open(HERE / "datasheets-expected.csv", "w", newline="", encoding="utf-8") as handle:
        handle.write("# Expected verdicts of examples/datasheets.csv (Kestrel Compressors, "
                     "invented); checks: those expected to warn or fail.\n")
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(["row", "model", "verdict", "checks", "notes"])
        for i, (cells, verdict, checks) in enumerate(data, start=1):
            writer.writerow([i, cells["model"], verdict, checks, cells["notes"]])


if __name__ == "__main__":
    main()
