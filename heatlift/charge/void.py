"""Void-fraction models: the share of a tube's cross-section the vapour fills in two-phase flow.

Each model is one function of the quality ``x`` [1] (vapour mass fraction), the phase densities
``rho_l``, ``rho_g`` [kg/m^3] and, for the drift-flux models, the surface tension ``sigma``
[N/m] and the mass flux ``G`` [kg/m^2/s] (total mass flow over the flow area of the tube). The
two-phase density of a tube section is then ``rho_tp = alpha rho_g + (1 - alpha) rho_l``.

Every model here is written out from its published equation (the fluids library holds the same
equations and serves the tests as an independent check; the engine does not call it). The
homogeneous model (no slip between the phases) gives the largest void fraction of the four at
every quality, so the smallest charge: Zivi's slip ratio exceeds 1 and the drift-flux models'
distribution parameter ``C0 >= 1`` and drift velocity ``>= 0`` both lower the void fraction.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

G_STANDARD = 9.80665  # standard acceleration of gravity [m/s^2]


def homogeneous(x: float, rho_l: float, rho_g: float) -> float:
    r"""Homogeneous void fraction: both phases move at one velocity (slip ratio 1).

    .. math:: \alpha = \left[1 + \frac{1-x}{x}\frac{\rho_g}{\rho_l}\right]^{-1}

    :param x: quality [1]
    :param rho_l: liquid density [kg/m^3]
    :param rho_g: vapour density [kg/m^3]
    :returns: void fraction [1]

    Source: the no-slip limit of the slip-ratio relation, e.g. Collier and Thome, *Convective
    Boiling and Condensation*, 3rd ed. (1994), chapter 2.

    >>> round(homogeneous(0.4, 800.0, 2.5), 6)
    0.995334
    """
    if x <= 0.0:
        return 0.0
    if x >= 1.0:
        return 1.0
    return 1.0 / (1.0 + (1.0 - x) / x * (rho_g / rho_l))


def zivi(x: float, rho_l: float, rho_g: float) -> float:
    r"""Zivi (1964) void fraction: the slip ratio of minimum entropy production,
    :math:`S = (\rho_l/\rho_g)^{1/3}`.

    .. math:: \alpha = \left[1 + \frac{1-x}{x}\left(\frac{\rho_g}{\rho_l}\right)^{2/3}\right]^{-1}

    :param x: quality [1]
    :param rho_l: liquid density [kg/m^3]
    :param rho_g: vapour density [kg/m^3]
    :returns: void fraction [1]

    Source: Zivi, S. M., "Estimation of steady-state steam void-fraction by means of the
    principle of minimum entropy production", J. Heat Transfer 86 (1964) 247-252.

    >>> round(zivi(0.4, 800.0, 2.5), 6)
    0.968934
    """
    if x <= 0.0:
        return 0.0
    if x >= 1.0:
        return 1.0
    return 1.0 / (1.0 + (1.0 - x) / x * (rho_g / rho_l) ** (2.0 / 3.0))


def _drift_flux(x: float, rho_l: float, rho_g: float, sigma: float, mass_flux: float,
                c0: float, g: float) -> float:
    """The drift-flux void fraction with distribution parameter ``c0`` and the drift velocity
    ``v_gj = 1.18 (1-x) [g sigma (rho_l - rho_g)]^(1/4) / rho_l^(1/2)`` (Rouhani-Axelsson form)."""
    if x <= 0.0:
        return 0.0
    if x >= 1.0:
        return 1.0
    drift = 1.18 * (1.0 - x) * (g * sigma * (rho_l - rho_g)) ** 0.25 / math.sqrt(rho_l)
    return (x / rho_g) / (c0 * (x / rho_g + (1.0 - x) / rho_l) + drift / mass_flux)


def rouhani_axelsson(x: float, rho_l: float, rho_g: float, sigma: float, mass_flux: float,
                     g: float = G_STANDARD) -> float:
    r"""Rouhani and Axelsson (1970) drift-flux void fraction, with the distribution parameter
    :math:`C_0 = 1 + 0.2(1-x)`.

    .. math::
        \alpha = \frac{x}{\rho_g}\left[C_0\left(\frac{x}{\rho_g} + \frac{1-x}{\rho_l}\right)
        + \frac{1.18(1-x)\,[g\sigma(\rho_l-\rho_g)]^{1/4}}{G\,\rho_l^{1/2}}\right]^{-1}

    :param x: quality [1]
    :param rho_l: liquid density [kg/m^3]
    :param rho_g: vapour density [kg/m^3]
    :param sigma: surface tension [N/m]
    :param mass_flux: total mass flux G [kg/m^2/s]
    :param g: acceleration of gravity [m/s^2]
    :returns: void fraction [1]

    Source: Rouhani, S. Z., Axelsson, E., "Calculation of void volume fraction in the subcooled
    and quality boiling regions", Int. J. Heat Mass Transfer 13 (1970) 383-393, in the form
    quoted by Xu and Fang, Appl. Therm. Eng. 64 (2014) 242-251 and Woldesemayat and Ghajar,
    Int. J. Multiphase Flow 33 (2007) 347-370 (the fluids library's ``Rouhani_1``).

    >>> round(rouhani_axelsson(0.4, 800.0, 2.5, 0.02, 1.0 / (math.pi * 0.3**2 / 4)), 6)
    0.858842
    """
    return _drift_flux(x, rho_l, rho_g, sigma, mass_flux, 1.0 + 0.2 * (1.0 - x), g)


def steiner(x: float, rho_l: float, rho_g: float, sigma: float, mass_flux: float,
            g: float = G_STANDARD) -> float:
    r"""Steiner (1993) void fraction for horizontal tubes: the Rouhani-Axelsson drift-flux form
    with the distribution parameter :math:`C_0 = 1 + 0.12(1-x)`.

    .. math::
        \alpha = \frac{x}{\rho_g}\left[C_0\left(\frac{x}{\rho_g} + \frac{1-x}{\rho_l}\right)
        + \frac{1.18(1-x)\,[g\sigma(\rho_l-\rho_g)]^{1/4}}{G\,\rho_l^{1/2}}\right]^{-1}

    :param x: quality [1]
    :param rho_l: liquid density [kg/m^3]
    :param rho_g: vapour density [kg/m^3]
    :param sigma: surface tension [N/m]
    :param mass_flux: total mass flux G [kg/m^2/s]
    :param g: acceleration of gravity [m/s^2]
    :returns: void fraction [1]

    Source: Steiner, D., in VDI-Wärmeatlas (VDI Heat Atlas), chapter Hbb (1993; 2nd English
    edition 2010), as quoted by Xu and Fang (2014) (the fluids library's ``Steiner``).

    >>> round(steiner(0.4, 800.0, 2.5, 0.02, 1.0 / (math.pi * 0.3**2 / 4)), 6)
    0.89595
    """
    return _drift_flux(x, rho_l, rho_g, sigma, mass_flux, 1.0 + 0.12 * (1.0 - x), g)


@dataclass(frozen=True)
class VoidModel:
    """A void-fraction model as offered by the API: its name, its source, whether it needs the
    mass flux and surface tension, and the function ``alpha(x, rho_l, rho_g, sigma, G)``."""

    name: str
    source: str
    needs_mass_flux: bool
    alpha: Callable[[float, float, float, float, float], float]


MODELS: dict[str, VoidModel] = {
    "homogeneous": VoidModel(
        "homogeneous", "homogeneous flow, no slip", False,
        lambda x, rl, rg, _s, _g: homogeneous(x, rl, rg)),
    "zivi": VoidModel(
        "zivi", "Zivi (1964)", False,
        lambda x, rl, rg, _s, _g: zivi(x, rl, rg)),
    "rouhani_axelsson": VoidModel(
        "rouhani_axelsson", "Rouhani and Axelsson (1970)", True,
        lambda x, rl, rg, s, g: rouhani_axelsson(x, rl, rg, s, g)),
    "steiner": VoidModel(
        "steiner", "Steiner (1993), Rouhani-Axelsson form for horizontal tubes", True,
        lambda x, rl, rg, s, g: steiner(x, rl, rg, s, g)),
}
DEFAULT_MODEL = "zivi"
