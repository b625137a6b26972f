"""Warn and fail limits of the datasheet checks (:mod:`heatlift.datasheet`).

Kept apart from the checks so that ``heatlift check`` can name and test them without loading
the property library.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

from heatlift.errors import InvalidInput


@dataclass(frozen=True)
class Tolerances:
    """Warn and fail limits of every check (fractions; efficiencies as fractions of 1).

    Defaults (the README gives the reasons at length):

    - ``capacity`` 2 % / 5 %: capacity and mass flow come from one test or one model, so they
      agree but for the property data behind them (another equation of state differs by well
      under 1 % in ``h_1 - h_4``) and the rounding of two published figures.
    - ``cop``, ``eer`` 1.5 % / 3 %: a COP printed with two or three significant figures is off
      by up to 1.7 % (2.9 stands for 2.85 to 2.95); a real error (heating COP for cooling
      COP, EER from the wrong factor) is 5 % or more.
    - ``polynomial`` 1.5 % / 3 %: tabulated ratings are the polynomial's own values (AHRI 540
      makes the coefficients the primary rating), so they agree but for rounding, which for a
      current printed to 0.1 A on a 3.5 A compressor is already 1.4 %; a slipped digit in a
      coefficient is tens of percent.
    - ``pressure`` 1 % / 3 %: equations of state agree on saturation pressures within a few
      tenths of a percent for pure fluids, within about 1 % for blends; a gauge-for-absolute or
      bubble-for-dew slip is 10 % or more.
    - ``carnot`` 0.85 / 1.0: a COP at or above the Carnot COP of the dew points is impossible;
      above 85 % of it no hermetic compressor gets (common practice, no source).
    - isentropic efficiency: pass 0.45 to 0.85, warn down to 0.25 and up to 0.95, fail outside
      (overall, electrical input; common practice, no source).
    - volumetric efficiency: pass 0.45 to 1.00, warn down to 0.25 and up to 1.05 (rounding of
      displacement and mass flow), fail outside.
    """

    capacity_warn: float = 0.02
    capacity_fail: float = 0.05
    cop_warn: float = 0.015
    cop_fail: float = 0.03
    eer_warn: float = 0.015
    eer_fail: float = 0.03
    polynomial_warn: float = 0.015
    polynomial_fail: float = 0.03
    pressure_warn: float = 0.01
    pressure_fail: float = 0.03
    carnot_warn: float = 0.85
    carnot_fail: float = 1.0
    isentropic_low_fail: float = 0.25
    isentropic_low_warn: float = 0.45
    isentropic_high_warn: float = 0.85
    isentropic_high_fail: float = 0.95
    volumetric_low_fail: float = 0.25
    volumetric_low_warn: float = 0.45
    volumetric_high_warn: float = 1.00
    volumetric_high_fail: float = 1.05

    @classmethod
    def names(cls) -> tuple[str, ...]:
        return tuple(f.name for f in fields(cls))

    def checked(self) -> Tolerances:
        """``self`` after checking that every limit is positive and the limits are in order."""
        for name in self.names():
            if not getattr(self, name) > 0.0:
                raise InvalidInput(f"the tolerance {name} must be above 0", field=name)
        for prefix in ("capacity", "cop", "eer", "polynomial", "pressure", "carnot"):
            if getattr(self, f"{prefix}_warn") > getattr(self, f"{prefix}_fail"):
                raise InvalidInput(f"{prefix}_warn must not exceed {prefix}_fail",
                                   field=f"{prefix}_warn")
        for prefix in ("isentropic", "volumetric"):
            order = [f"{prefix}_low_fail", f"{prefix}_low_warn", f"{prefix}_high_warn",
                     f"{prefix}_high_fail"]
            values = [getattr(self, n) for n in order]
            if values != sorted(values):
                raise InvalidInput(f"the limits must be in the order {' <= '.join(order)}",
                                   field=order[0])
        return self
