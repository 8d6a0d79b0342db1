"""Reactions written in text, evaluated from the catalog's ΔGf° values, for cross-checks against handbooks.

A reaction is written "reactants = products" with species named as the
catalog names them (``Zn^2+``, ``HZnO2^-``, ``H2O``, ``H^+``, ``OH^-``) and
``e-`` for the electron, e.g. ``"Zn^2+ + 2 e- = Zn"``.
"""

import re
from dataclasses import dataclass

from electrosieve.engine.catalog import Catalog, default_catalog
from electrosieve.engine.constants import KJ_PER_EV, LN10, T_STANDARD, GAS_CONSTANT

_TERM = re.compile(r"^\s*(?:(\d+(?:\.\d+)?)\s+)?(.+?)\s*$")


def _species_gibbs(catalog: Catalog, name: str) -> float:
    if name == "e-":
        return 0.0
    if name in catalog.water:
        return catalog.water[name].dgf
    for system in catalog.systems.values():
        for species in system.species:
            if species.name == name:
                return species.dgf
    raise KeyError(f"no species named {name!r} in the catalog")


def _side(text: str) -> list[tuple[float, str]]:
    terms = []
    for part in re.split(r"\s\+\s", text):
        match = _TERM.match(part)
        if not match:
            raise ValueError(f"cannot read term {part!r}")
        terms.append((float(match.group(1) or 1), match.group(2)))
    return terms


def reaction_gibbs(reaction: str, catalog: Catalog | None = None) -> tuple[float, float]:
    """(ΔrG° [kJ/mol], electrons consumed) of ``reaction`` from the catalog."""
    catalog = catalog or default_catalog()
    left, right = reaction.split("=")
    reactants, products = _side(left), _side(right)
    gibbs = sum(n * _species_gibbs(catalog, s) for n, s in products) - sum(n * _species_gibbs(catalog, s) for n, s in reactants)
    electrons = sum(n for n, s in reactants if s == "e-") - sum(n for n, s in products if s == "e-")
    return gibbs, electrons


def standard_potential(reaction: str, catalog: Catalog | None = None) -> float:
    """E° [V vs SHE] of a reduction ``Ox + n e- = Red``: E° = −ΔrG°/(nF)."""
    gibbs, electrons = reaction_gibbs(reaction, catalog)
    if electrons == 0:
        raise ValueError(f"{reaction!r} has no electrons")
    return -gibbs / (electrons * KJ_PER_EV)


def log10_k(reaction: str, catalog: Catalog | None = None) -> float:
    """log10 K of ``reaction`` at 298.15 K: log K = −ΔrG°/(RT ln10)."""
    gibbs, _ = reaction_gibbs(reaction, catalog)
    return -gibbs * 1000.0 / (GAS_CONSTANT * T_STANDARD * LN10)


@dataclass(frozen=True)
class Check:
    """One published value to reproduce from the catalog.

    ``kind`` is "E0" (standard potential [V], tolerance in V) or "logK"
    (tolerance in log units); ``source`` names the table it comes from.
    """

    element: str
    reaction: str
    kind: str
    expected: float
    tolerance: float
    source: str

    def computed(self, catalog: Catalog | None = None) -> float:
        return standard_potential(self.reaction, catalog) if self.kind == "E0" else log10_k(self.reaction, catalog)

    def __str__(self) -> str:
        return f"{self.element}: {self.reaction}"
