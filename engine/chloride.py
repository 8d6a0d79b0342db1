"""Chloride and passive films: the pitting caution a passive verdict carries in a chloride medium.

Equilibrium diagrams say where an oxide film is stable, not whether it survives locally: chloride
breaks passive films at pits and crevices above a breakdown potential that depends on the alloy,
the chloride level, the temperature and the pH (Szklarska-Smialowska 2005, ch. 1–3). The engine
cannot compute that potential, so a passive verdict in chloride is said to be open to pitting, with
the trade's guidance on which film-formers resist it (common practice, as summarised there).
"""

__all__ = ["NOBLE", "PITTING_SOURCE", "RESISTANT", "SUSCEPTIBLE", "pitting_caution"]

PITTING_SOURCE = "szklarska2005"
"""Source key of the guidance below (``data/sources.toml``); the ranking of film-formers is common practice."""

RESISTANT = {
    "Ti": "titanium's film resists pitting in seawater and brine to several volts; only crevices in hot brine "
          "(above about 70 °C) attack it",
    "Ta": "tantalum's film resists chloride pitting even in hot acid chloride",
    "Nb": "niobium's film resists chloride pitting nearly as well as tantalum's",
}
"""Film-formers whose passivity holds in chloride well beyond that of stainless steel (common practice)."""

NOBLE = ("Au", "Ag", "Pt", "Pd", "Rh", "Ir", "Ru", "Os")
"""Noble metals: chloride acts on them by dissolving them as chloro-complexes and salts, which the diagram
holds (``data/ligands/chloride.toml``), not by pitting an oxide film; no pitting caution."""

SUSCEPTIBLE = ("Fe", "Cr", "Ni", "Co", "Al", "Zr", "Zn", "Mg", "Cu", "Sn", "Pb", "Hf", "Mn")
"""Elements whose passive films chloride is known to break locally (common practice)."""


def pitting_caution(region: str, element: str, chloride_activity: float | None) -> str | None:
    """The caution for a material judged in ``region`` on ``element``'s diagram with free chloride at
    ``chloride_activity``, or None when there is nothing to say (not passive, or no chloride given).

    >>> pitting_caution("passivation", "Fe", 0.5)[:60]
    'Passive here, but chloride (activity 0.5) breaks passive fil'
    >>> pitting_caution("immunity", "Pt", 0.5) is None
    True
    """
    if region != "passivation" or not chloride_activity or element in NOBLE:
        return None
    head = (f"Passive here, but chloride (activity {chloride_activity:.2g}) breaks passive films locally "
            "(pitting and crevice corrosion), which this equilibrium verdict cannot show")
    if element in RESISTANT:
        return f"{head}; {RESISTANT[element]}."
    advice = ("titanium, tantalum and niobium resist it far better; among stainless steels the high-molybdenum "
              "grades (as 6 % Mo austenitic or super-duplex) outlast plain 304/316 and aluminium")
    if element in SUSCEPTIBLE:
        return f"{head}: expect pits on this metal in chloride at anodic potentials; {advice}. Test before use."
    return f"{head}; {advice}. Test before use."
