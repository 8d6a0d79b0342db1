"""The dissolved conditions of a question: an electrolyte recipe, per-ion activities and free chloride.

Every door (``screen``, ``point``, ``diagram``) may give three things besides the one activity of every
dissolved species: a recipe (``engine.electrolyte``), the activities of named ions and the free chloride
activity. The recipe sets the activities of the catalog's ions it contains and of its free ligands
(Cl−, SO4²−); named ions and ``chloride`` override it for those species only. A pH the user gives is
checked against what water allows at the temperature (``electrolyte.ph_warnings``) and against the
recipe's own pH; without a given pH the recipe's is used.
"""

from dataclasses import dataclass

from .catalog import Catalog
from .diagram import check_ion_activities, check_ligand_activities
from .electrolyte import Electrolyte, electrolyte as make_electrolyte, ph_warnings
from .errors import InputError
from .inputs import LIGAND_ACTIVITY_RANGE, check_number

__all__ = ["CHLORIDE", "PH_MISMATCH", "Solution", "make_solution"]

CHLORIDE = "Cl^-"
"""The free chloride ion's name, as ``data/ligands/chloride.toml`` spells it."""

PH_MISMATCH = 0.3
"""A given pH further than this from the recipe's computed pH [pH units] is pointed out (0.3 is well beyond
the 0.02 of the activity convention and the few hundredths of a calibrated glass electrode; common practice)."""


@dataclass(frozen=True)
class Solution:
    """What the diagram takes from the electrolyte: per-ion and ligand activities (sorted (name, activity)
    pairs), the recipe's result when one was given, and the warnings for the user."""

    electrolyte: Electrolyte | None = None
    ion_activities: tuple[tuple[str, float], ...] = ()
    ligand_activities: tuple[tuple[str, float], ...] = ()
    warnings: tuple[str, ...] = ()

    @property
    def chloride(self) -> float | None:
        """The free chloride activity, None when none was given."""
        return dict(self.ligand_activities).get(CHLORIDE)

    def diagram_arguments(self) -> dict:
        """The keyword arguments ``engine.diagram.diagram`` takes for this solution."""
        return {"ion_activities": dict(self.ion_activities) or None,
                "ligand_activities": dict(self.ligand_activities) or None}


def make_solution(*, catalog: Catalog, temperature_c: float = 25.0, ph=None, electrolyte: str | None = None,
                  ion_activities: dict | None = None, chloride=None) -> Solution:
    """The checked :class:`Solution` of a recipe, named ion activities and chloride at ``temperature_c`` [°C];
    ``ph`` (a number or a (low, high) pair, or None) is the user's own pH, checked for the warnings.

    >>> from electrosieve.engine.catalog import default_catalog
    >>> s = make_solution(catalog=default_catalog(), electrolyte="0.6 M NaCl", ion_activities={"Cu^2+": 0.1})
    >>> s.ion_activities, round(s.chloride, 2)
    ((('Cu^2+', 0.1),), 0.41)
    """
    warnings: list[str] = []
    result = None
    ions: dict[str, float] = {}
    ligands: dict[str, float] = {}
    if electrolyte is not None and str(electrolyte).strip():
        result = make_electrolyte(str(electrolyte), temperature_c, "electrolyte")
        known = {s.name for system in catalog.systems.values() for s in system.species if s.is_dissolved}
        ions = {name: a for name, a in result.ion_activities.items() if name in known}
        ligands = result.ligand_activities(catalog.ligands)
        warnings.extend(result.warnings)
    if ion_activities:
        if not isinstance(ion_activities, dict):
            raise InputError(f"ion_activities must map ion names to activities, e.g. {{'Cu^2+': 0.1}} "
                             f"(given {ion_activities!r})", field="ion_activities")
        ions.update(ion_activities)
    if chloride is not None:
        ligands[CHLORIDE] = check_number(chloride, "chloride", *LIGAND_ACTIVITY_RANGE)
    if ph is not None:
        low, high = (ph, ph) if isinstance(ph, (int, float)) else (ph[0], ph[-1])
        for value in dict.fromkeys((low, high)):
            warnings.extend(ph_warnings(float(value), temperature_c))
        if result is not None and not low - PH_MISMATCH <= result.ph <= high + PH_MISMATCH:
            given = f"{low:g}" if low == high else f"{low:g} to {high:g}"
            warnings.append(f"the recipe {result.recipe!r} is about pH {result.ph:.2f} at {temperature_c:g} °C, "
                            f"but pH {given} was given and is used")
    return Solution(electrolyte=result, ion_activities=check_ion_activities(ions, None, catalog),
                    ligand_activities=check_ligand_activities(ligands, catalog),
                    warnings=tuple(dict.fromkeys(warnings)))
