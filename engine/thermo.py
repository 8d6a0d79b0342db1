"""Gibbs energies of species and of water at the working temperature."""

from .constants import T_STANDARD
from .errors import InputError
from .species import Species


def formation_gibbs(species: Species, temperature_k: float = T_STANDARD) -> float:
    """Standard Gibbs energy of formation of ``species`` [kJ/mol] at ``temperature_k`` [K].

    At 298.15 K this is the tabulated ΔGf°.
    """
    if abs(temperature_k - T_STANDARD) > 1e-9:
        raise InputError("only 25 °C (298.15 K) is supported by this build", field="temperature")
    return species.dgf
