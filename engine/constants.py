"""Physical constants used by the engine, each with its source.

CODATA 2018 exact SI values: Tiesinga, Mohr, Newell & Taylor, Rev. Mod. Phys. 93, 025010 (2021).
"""

import math

FARADAY = 96485.33212
"""Faraday constant F [C/mol] (CODATA 2018, exact: N_A·e)."""

GAS_CONSTANT = 8.314462618
"""Molar gas constant R [J/(mol K)] (CODATA 2018, exact: N_A·k)."""

LN10 = math.log(10.0)
"""Natural logarithm of 10 (mathematics)."""

T_STANDARD = 298.15
"""Standard temperature of the thermodynamic tables [K] (IUPAC)."""

ZERO_CELSIUS = 273.15
"""0 °C in kelvin [K] (SI definition of the Celsius scale)."""

KJ_PER_EV = FARADAY / 1000.0
"""One electronvolt per particle expressed in kJ/mol: F/1000 [kJ/(mol eV)]."""


def thermal_voltage(temperature_k: float = T_STANDARD) -> float:
    """RT/F [V] at ``temperature_k`` [K].

    >>> round(thermal_voltage(298.15), 6)
    0.025693
    """
    return GAS_CONSTANT * temperature_k / FARADAY


def nernst_slope(temperature_k: float = T_STANDARD) -> float:
    """Nernst slope RT·ln10/F [V per decade] at ``temperature_k`` [K].

    >>> round(nernst_slope(298.15), 5)
    0.05916
    """
    return LN10 * thermal_voltage(temperature_k)
