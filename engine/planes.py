"""Free-energy planes: each species' Gibbs energy per metal atom as a linear function of pH and E.

For a species M_m H_h O_o^z formed by m M + o H2O -> species + (2o-h) H+ + (2o-h+z) e-,

    Φ(pH, E) = [ΔGf° − o·ΔGf°(H2O) + RT ln a − (2o − h)·RT ln10·pH − (2o − h + z)·F·E] / m

in eV per metal atom (Pourbaix 1966, Atlas, ch. 2, eq. 1-3 rewritten per atom).
Solids, liquids and gases are at unit activity (gases at 1 bar); dissolved
species at the activity ``a``, or at their own activity where ``ion_activities``
names them. A species binding n ligands L (``engine.species``) takes them from
the solution at the ligand activity a_L, which adds −n·[ΔGf°(L) + RT ln a_L]/m.
"""

from dataclasses import dataclass
from functools import cached_property

import numpy as np

from .constants import KJ_PER_EV, T_STANDARD, nernst_slope, thermal_voltage
from .species import Species
from .thermo import formation_gibbs


@dataclass(frozen=True)
class Planes:
    """Coefficients of Φ_i = offset_i + ph_slope_i·pH + e_slope_i·E [eV per metal atom] for each species i."""

    species: tuple[Species, ...]
    offset: np.ndarray
    ph_slope: np.ndarray
    e_slope: np.ndarray
    metal_atoms: np.ndarray
    dissolved: np.ndarray
    activity: float
    temperature_k: float
    ion_activities: tuple[tuple[str, float], ...] = ()
    ligand_activities: tuple[tuple[str, float], ...] = ()

    def at(self, ph: float, potential: float) -> np.ndarray:
        """Φ of every species at one point (pH, E vs SHE [V])."""
        return self.offset + self.ph_slope * ph + self.e_slope * potential

    @cached_property
    def regions(self) -> tuple[str, ...]:
        """Each species' region: immunity, passivation or corrosion."""
        return tuple(s.region for s in self.species)

    @cached_property
    def index_of(self) -> dict[str, int]:
        """Each species' column, by formula."""
        return {s.name: k for k, s in enumerate(self.species)}


def build_planes(species: tuple[Species, ...], water_gibbs: float, activity: float,
                 temperature_k: float = T_STANDARD, catalog=None, *,
                 ion_activities: tuple[tuple[str, float], ...] = (),
                 ligand_activities: tuple[tuple[str, float], ...] = ()) -> Planes:
    """Planes for ``species`` with dissolved species at ``activity``.

    ``water_gibbs`` is ΔGf°(H2O, l) [kJ/mol] at ``temperature_k`` [K]; ``catalog`` supplies the
    element and water data that temperature corrections need (the built-in catalog by default).
    ``ion_activities`` gives (name, activity) of dissolved species held at their own activity;
    ``ligand_activities`` (ligand name, activity) for every ligand a species in ``species`` binds.

    >>> from electrosieve.engine.species import Species
    >>> zinc = Species.create("Zn", formula="Zn", charge=0, phase="solid", dgf=0.0, source="x")
    >>> ion = Species.create("Zn", formula="Zn", charge=2, phase="aqueous", dgf=-147.06, source="x")
    >>> p = build_planes((zinc, ion), -237.129, 1.0)
    >>> round(float(-p.offset[1] / p.e_slope[1]), 4)   # E° of Zn2+/Zn [V]
    -0.7621
    """
    kt = thermal_voltage(temperature_k)
    slope = nernst_slope(temperature_k)
    own = dict(ion_activities)
    ligands = dict(ligand_activities)
    offset, ph_slope, e_slope = [], [], []
    for s in species:
        m = s.metal_atoms
        energy = (formation_gibbs(s, temperature_k, catalog) - s.oxygen_atoms * water_gibbs) / KJ_PER_EV
        if s.is_dissolved:
            energy += kt * np.log(own.get(s.name, activity))
        if s.ligand is not None:
            free = formation_gibbs(s.ligand.species, temperature_k, catalog) / KJ_PER_EV
            energy -= s.ligand_count * (free + kt * np.log(ligands[s.ligand.name]))
        offset.append(energy / m)
        ph_slope.append(-s.protons_released * slope / m)
        e_slope.append(-s.electrons_released / m)
    return Planes(
        species=tuple(species), offset=np.array(offset), ph_slope=np.array(ph_slope), e_slope=np.array(e_slope),
        metal_atoms=np.array([s.metal_atoms for s in species], dtype=float),
        dissolved=np.array([s.is_dissolved for s in species], dtype=bool),
        activity=activity, temperature_k=temperature_k, ion_activities=tuple(ion_activities),
        ligand_activities=tuple(ligand_activities),
    )
