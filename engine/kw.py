"""The ionic product of water Kw(T) and the neutral pH, from 0 to 150 °C.

Kw follows the IAPWS formulation of Bandura & Lvov (2006), J. Phys. Chem. Ref.
Data 35, 15 (IAPWS R11-07, revised as R11-24), which gives pKw from the
temperature T [K] and the density of liquid water ρ [g/cm³]:

    pKw = −2n·[log10(1 + Q) − Q/(Q + 1)·ρ·(β0 + β1/T + β2·ρ)] + pKw_G(T) + 2·log10(M_w/1000)
    Q   = ρ·exp(α0 + α1/T + α2·ρ^(2/3)/T²)
    pKw_G(T) = γ0 + γ1/T + γ2/T² + γ3/T³

The density is that of the saturated liquid, from the equation of Wagner &
Pruss (1993), J. Phys. Chem. Ref. Data 22, 783 (IAPWS SR1-86, rev. 1992):
liquid water at its saturation pressure above 100 °C; below 100 °C the
difference from 0.1 MPa moves pKw by less than 0.001. All coefficients are read
from ``data/water_iapws.toml``.
"""

import math
from functools import lru_cache

from .catalog import builtin_data_dir
from .constants import T_STANDARD
from .datafiles import read_toml
from .errors import CatalogError

WATER_PROPERTIES_FILE = "water_iapws.toml"
"""Data file holding the Kw and saturated-density coefficients, with their source keys."""


@lru_cache(maxsize=1)
def _coefficients() -> dict:
    path = builtin_data_dir() / WATER_PROPERTIES_FILE
    document = read_toml(path)
    for table, keys in (("ionization", ("n", "alpha0", "alpha1", "alpha2", "beta0", "beta1", "beta2", "gamma0",
                                        "gamma1", "gamma2", "gamma3", "molar_mass", "source")),
                        ("saturated_liquid_density", ("critical_temperature", "critical_density", "b",
                                                      "exponent_numerators", "exponent_denominator", "source")),
                        ("saturation_pressure", ("critical_temperature", "critical_pressure", "a", "exponents",
                                                 "source"))):
        missing = [key for key in keys if key not in document.get(table, {})]
        if missing:
            raise CatalogError(f"{path}: [{table}]: missing field(s) {', '.join(missing)}")
    return document


def saturated_liquid_density(temperature_k: float) -> float:
    """Density of liquid water at its saturation pressure ρ' [kg/m³] at ``temperature_k`` [K].

    ρ'/ρc = 1 + Σ b_i·τ^(e_i), τ = 1 − T/Tc (Wagner & Pruss 1993, eq. 2).

    >>> round(saturated_liquid_density(373.15), 2)   # IAPWS-95: 958.35 kg/m³ at 100 °C
    958.35
    """
    data = _coefficients()["saturated_liquid_density"]
    tau = 1.0 - temperature_k / data["critical_temperature"]
    if tau <= 0.0:
        raise ValueError(f"no liquid water at or above the critical temperature (given {temperature_k} K)")
    denominator = data["exponent_denominator"]
    total = sum(b * tau ** (numerator / denominator)
                for b, numerator in zip(data["b"], data["exponent_numerators"], strict=True))
    return data["critical_density"] * (1.0 + total)


def saturation_pressure(temperature_k: float) -> float:
    """Vapour pressure of water p_sat [MPa] at ``temperature_k`` [K].

    ln(p_sat/p_c) = (T_c/T)·Σ a_i·τ^(e_i), τ = 1 − T/T_c (Wagner & Pruss 1993, eq. 1).

    >>> round(saturation_pressure(373.15), 5)   # IAPWS-95: 0.101418 MPa at 100 °C
    0.10142
    """
    data = _coefficients()["saturation_pressure"]
    critical = data["critical_temperature"]
    tau = 1.0 - temperature_k / critical
    if tau <= 0.0:
        raise ValueError(f"no liquid water at or above the critical temperature (given {temperature_k} K)")
    total = sum(a * tau ** e for a, e in zip(data["a"], data["exponents"], strict=True))
    return data["critical_pressure"] * math.exp(critical / temperature_k * total)


def pkw(temperature_k: float = T_STANDARD, density: float | None = None) -> float:
    """pKw = −log10 Kw at ``temperature_k`` [K] and liquid ``density`` [kg/m³] (saturated liquid by default).

    Kw is in (mol/kg)²; equation of Bandura & Lvov (2006), IAPWS R11-07.

    >>> round(pkw(300.0, 1000.0), 6)   # IAPWS R11-07, Table 3 check value: 13.906565
    13.906565
    >>> round(pkw(298.15), 3)
    13.995
    """
    return _pkw(float(temperature_k), None if density is None else float(density))


@lru_cache(maxsize=256)
def _pkw(temperature_k: float, density: float | None) -> float:
    c = _coefficients()["ionization"]
    rho = (saturated_liquid_density(temperature_k) if density is None else density) / 1000.0  # [g/cm³]
    t = temperature_k
    q = rho * math.exp(c["alpha0"] + c["alpha1"] / t + c["alpha2"] / t ** 2 * rho ** (2.0 / 3.0))
    gas = c["gamma0"] + c["gamma1"] / t + c["gamma2"] / t ** 2 + c["gamma3"] / t ** 3
    liquid = -2.0 * c["n"] * (math.log10(1.0 + q) - q / (q + 1.0) * rho * (c["beta0"] + c["beta1"] / t + c["beta2"] * rho))
    return liquid + gas + 2.0 * math.log10(c["molar_mass"] / 1000.0)


def kw(temperature_k: float = T_STANDARD) -> float:
    """Ionic product of water Kw = a(H+)·a(OH−) [(mol/kg)²] at ``temperature_k`` [K], saturated liquid.

    >>> f"{kw(298.15):.3e}"
    '1.012e-14'
    """
    return 10.0 ** -pkw(temperature_k)


def neutral_ph(temperature_k: float = T_STANDARD) -> float:
    """pH of neutral water, pKw/2, at ``temperature_k`` [K] (a(H+) = a(OH−)).

    >>> round(neutral_ph(298.15), 3), round(neutral_ph(353.15), 3)
    (6.997, 6.299)
    """
    return pkw(temperature_k) / 2.0


def sources() -> tuple[str, ...]:
    """Source keys of the coefficients (keys of ``data/sources.toml``)."""
    data = _coefficients()
    keys = [data["ionization"]["source"], data["ionization"].get("also"),
            data["saturated_liquid_density"]["source"], data["saturation_pressure"]["source"]]
    return tuple(dict.fromkeys(key for key in keys if key))
