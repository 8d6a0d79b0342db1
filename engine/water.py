"""The water-stability window: the H2/H2O and O2/H2O lines at 1 bar.

    2 H+ + 2 e- = H2(g)          E = −(RT ln10/F)·pH
    O2(g) + 4 H+ + 4 e- = 2 H2O  E = −ΔGf°(H2O)/(2F) − (RT ln10/F)·pH

(Pourbaix 1966, Atlas, ch. 4, lines a and b; 1.229 V at 25 °C.)
"""

from dataclasses import dataclass

from .constants import KJ_PER_EV, T_STANDARD, nernst_slope


@dataclass(frozen=True)
class WaterLines:
    """Both water lines as E = intercept − slope·pH [V vs SHE]."""

    hydrogen_intercept: float
    oxygen_intercept: float
    slope: float

    def hydrogen(self, ph: float) -> float:
        """E of the H2/H2O line at ``ph`` [V vs SHE]."""
        return self.hydrogen_intercept - self.slope * ph

    def oxygen(self, ph: float) -> float:
        """E of the O2/H2O line at ``ph`` [V vs SHE]."""
        return self.oxygen_intercept - self.slope * ph


def water_lines(water_gibbs: float, temperature_k: float = T_STANDARD) -> WaterLines:
    """The water lines from ΔGf°(H2O, l) [kJ/mol] at ``temperature_k`` [K].

    >>> lines = water_lines(-237.129)
    >>> round(lines.oxygen(0.0), 4), round(lines.slope, 4)
    (1.2288, 0.0592)
    """
    return WaterLines(
        hydrogen_intercept=0.0,
        oxygen_intercept=-water_gibbs / (2 * KJ_PER_EV),
        slope=nernst_slope(temperature_k),
    )
