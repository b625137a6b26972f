"""heatlift: refrigeration and heat-pump calculations in SI base units.

The engine is pure Python over the CoolProp property library: no web framework, no unit
library. Every function takes and returns SI base units (K, Pa, J/kg, J/kg/K, kg/m^3, W, kg/s,
m, m^3, kg).
"""

__version__ = "0.1.0"
