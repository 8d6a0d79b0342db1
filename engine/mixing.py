"""Gibbs energy of mixing of a metallic solid solution: ideal (Raoult) mixing plus Redlich–Kister excess terms.

Per mole of atoms of a solution of mole fractions x_i at temperature T:

    ΔG_mix = R·T·Σ x_i ln x_i + Σ_{i<j} x_i·x_j·Σ_v L_v,ij·(x_i − x_j)^v,    L_v,ij = a_v + b_v·T   [J/mol]

the ideal term (activity = mole fraction) and the binary excess terms of Redlich & Kister (1948, Ind.
Eng. Chem. 40, 345) summed over the pairs present (Muggianu's extension to several components, as
in CALPHAD assessments). Pairs without a published term mix ideally.
"""

import math
from dataclasses import dataclass

from .constants import GAS_CONSTANT

__all__ = ["Interaction", "mixing_gibbs", "mixing_model"]


@dataclass(frozen=True)
class Interaction:
    """Redlich–Kister terms of one binary pair: ``terms`` = ((a_0, b_0), (a_1, b_1), …) with L_v = a_v + b_v·T [J/mol].

    The order of ``elements`` fixes the sign of the odd terms: (x_first − x_second)^v.
    """

    elements: tuple[str, str]
    terms: tuple[tuple[float, float], ...]
    source: str
    uncertainty: float | None = None
    from_memory: bool = False
    note: str = ""

    def excess(self, first: float, second: float, temperature_k: float) -> float:
        """x_1·x_2·Σ L_v·(x_1 − x_2)^v [J/mol of atoms] for mole fractions ``first`` and ``second``.

        >>> Interaction(("A", "B"), ((4000.0, 0.0),), "x").excess(0.5, 0.5, 298.15)
        1000.0
        """
        return first * second * sum((a + b * temperature_k) * (first - second) ** v for v, (a, b) in enumerate(self.terms))


def mixing_gibbs(composition: dict[str, float], temperature_k: float,
                 interactions: tuple[Interaction, ...] = ()) -> float:
    """ΔG_mix [J per mole of atoms] of a solution of ``composition`` (element → amount, normalised here) at ``temperature_k`` [K].

    >>> round(mixing_gibbs({"Ni": 0.5, "Cu": 0.5}, 298.15), 1)   # ideal: R·T·ln(1/2)
    -1718.3
    """
    total = sum(composition.values())
    fractions = {element: amount / total for element, amount in composition.items() if amount > 0}
    ideal = GAS_CONSTANT * temperature_k * sum(x * math.log(x) for x in fractions.values())
    excess = sum(pair.excess(fractions[pair.elements[0]], fractions[pair.elements[1]], temperature_k)
                 for pair in interactions if pair.elements[0] in fractions and pair.elements[1] in fractions)
    return ideal + excess


def mixing_model(elements: tuple[str, ...], interactions: tuple[Interaction, ...], solution: bool) -> str:
    """The mixing model in words, as results state it."""
    if not solution or len(elements) < 2:
        return "no metallic solution: each metal is its own phase"
    pairs = [f"{'–'.join(p.elements)} (Redlich–Kister terms, {p.source})" for p in interactions
             if set(p.elements) <= set(elements)]
    if not pairs:
        return "ideal metallic solution (activity = mole fraction)"
    return "ideal metallic solution (activity = mole fraction) with excess terms for " + ", ".join(pairs)
