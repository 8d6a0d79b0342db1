"""The water-stability window at temperature T: the H2/H2O and O2/H2O lines, and neutral pH.

    2 H+ + 2 e- = H2(g)          E = −(RT ln10/F)·pH
    O2(g) + 4 H+ + 4 e- = 2 H2O  E = −ΔfG(H2O, l, T)/(2F) − (RT ln10/F)·pH

(Pourbaix 1966, Atlas, ch. 4, lines a and b; 1.229 V at 25 °C.) The H2 line
stays at 0 V at pH 0 at every temperature because the SHE is zero at every
temperature by convention (IUPAC Green Book 2007, §2.13); ΔfG(H2O, l, T) comes
from :func:`engine.thermo.formation_gibbs`, so the O2 line falls by
ΔfS°(H2O)/(2F) ≈ 0.85 mV/K. Neutral pH is pKw/2 with Kw from the IAPWS
formulation (:mod:`engine.kw`). Liquid water is assumed, at its saturation
pressure above 100 °C, with H2 and O2 at 1 bar partial pressure.
"""

from dataclasses import dataclass

from .catalog import default_catalog
from .constants import KJ_PER_EV, T_STANDARD, ZERO_CELSIUS, nernst_slope
from .kw import neutral_ph as _neutral_ph
from .kw import pkw as _pkw
from .kw import saturation_pressure
from .thermo import formation_gibbs

CONDITIONS = ("liquid water; H2 and O2 at 1 bar partial pressure; dissolved species at the stated activity")
"""What is assumed at every temperature, in words for the user."""

BAR_PER_MPA = 10.0
"""1 MPa = 10 bar (SI definition of the bar, 10^5 Pa)."""


@dataclass(frozen=True)
class WaterLines:
    """Both water lines as E = intercept − slope·pH [V vs SHE], at ``temperature_k`` [K]."""

    hydrogen_intercept: float
    oxygen_intercept: float
    slope: float
    temperature_k: float = T_STANDARD

    def hydrogen(self, ph: float) -> float:
        """E of the H2/H2O line at ``ph`` [V vs SHE]."""
        return self.hydrogen_intercept - self.slope * ph

    def oxygen(self, ph: float) -> float:
        """E of the O2/H2O line at ``ph`` [V vs SHE]."""
        return self.oxygen_intercept - self.slope * ph

    @property
    def pkw(self) -> float:
        """pKw of liquid water at this temperature (IAPWS R11-07)."""
        return _pkw(self.temperature_k)

    @property
    def neutral_ph(self) -> float:
        """pH of neutral water, pKw/2, at this temperature."""
        return _neutral_ph(self.temperature_k)


def water_lines(water_gibbs: float, temperature_k: float = T_STANDARD) -> WaterLines:
    """The water lines from ΔfG(H2O, l) [kJ/mol] at ``temperature_k`` [K].

    Intercepts: H2 line 0 V; O2 line −ΔfG(H2O, l)/(2F) [V]; slope RT ln10/F [V per pH].

    >>> lines = water_lines(-237.129)
    >>> round(lines.oxygen(0.0), 4), round(lines.slope, 4), round(lines.neutral_ph, 3)
    (1.2288, 0.0592, 6.997)
    """
    return WaterLines(
        hydrogen_intercept=0.0,
        oxygen_intercept=-water_gibbs / (2 * KJ_PER_EV),
        slope=nernst_slope(temperature_k),
        temperature_k=temperature_k,
    )


def water_lines_at(temperature_k: float = T_STANDARD, catalog=None) -> WaterLines:
    """The water lines at ``temperature_k`` [K], with ΔfG(H2O, l, T) from ``catalog``'s water file.

    >>> round(water_lines_at(353.15).oxygen(0.0), 4)   # reversible O2/H2O potential at 80 °C [V]
    1.1831
    """
    catalog = catalog or default_catalog()
    return water_lines(formation_gibbs(catalog.water["H2O"], temperature_k, catalog), temperature_k)


def conditions_note(temperature_c: float) -> str:
    """The assumptions behind a result at ``temperature_c`` [°C], in words.

    >>> print(conditions_note(120.0))
    At 120 °C: liquid water; H2 and O2 at 1 bar partial pressure; dissolved species at the stated activity;
    the liquid at its saturation pressure, 1.99 bar.
    """
    note = f"At {temperature_c:g} °C: {CONDITIONS}"
    if temperature_c > 100.0:
        pressure = saturation_pressure(temperature_c + ZERO_CELSIUS) * BAR_PER_MPA
        note += f"; the liquid at its saturation pressure, {pressure:.3g} bar"
    return note + "."


def reversible_cell_voltage(temperature_k: float = T_STANDARD, catalog=None) -> float:
    """Reversible voltage of water splitting, −ΔfG(H2O, l, T)/(2F) [V], at ``temperature_k`` [K].

    >>> round(reversible_cell_voltage(298.15), 4)
    1.2288
    """
    return water_lines_at(temperature_k, catalog).oxygen_intercept

