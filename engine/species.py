"""A species of an element system and its formation reaction.

Every species M_m H_h O_o^z of element M is formed from the metal, water,
hydrogen ions and electrons:

    m M + o H2O  ->  M_m H_h O_o^z + (2o - h) H+ + (2o - h + z) e-

so its molar Gibbs energy relative to the metal is linear in pH and E
(Pourbaix 1966, Atlas of Electrochemical Equilibria, ch. 2). A species that
binds n ligands L^y (Cl^-, SO4^2-; see ``engine.ligands``) takes them from the
solution as well, and h and o count only the atoms outside the ligands:

    m M + o H2O + n L^y  ->  M_m H_h O_o L_n^z + (2o - h) H+ + (2o - h + z - n·y) e-
"""

from dataclasses import dataclass, field

from .formula import ion_name, parse_formula

PHASES = ("solid", "liquid", "aqueous", "gas")
"""Phases a species may have."""

DISSOLVED_PHASES = ("aqueous",)
"""Phases at the user's dissolved-ion activity; the others are pure phases at unit activity."""

# Elements of the solvent that may accompany the metal in a species.
SOLVENT_ELEMENTS = ("H", "O")

REGIONS = ("immunity", "passivation", "hydride", "corrosion")
"""The regions a species' domain belongs to, from least to most severe (see :attr:`Species.region`)."""


@dataclass(frozen=True)
class Ligand:
    """A ligand taken up from the solution: its free species (``Cl^-``) and the element counting it (``Cl``)."""

    species: "Species"
    counting_element: str

    @property
    def name(self) -> str:
        """The free ligand's name, as ligand activities are keyed (``Cl^-``, ``SO4^2-``)."""
        return self.species.name


@dataclass(frozen=True)
class Species:
    """One species with its standard data at 298.15 K.

    ``dgf`` and ``dhf`` [kJ/mol], ``s`` and ``cp`` [J/(mol K)], ``uncertainty``
    [kJ/mol, on ``dgf``]; ``source`` is a key of ``data/sources.toml``.
    """

    element: str
    formula: str
    charge: int
    phase: str
    dgf: float
    source: str
    dhf: float | None = None
    s: float | None = None
    cp: float | None = None
    uncertainty: float | None = None
    from_memory: bool = False
    label: str | None = None
    note: str = ""
    composition: dict[str, int] = field(default_factory=dict, compare=False, hash=False)
    ligand: Ligand | None = None

    @classmethod
    def create(cls, element: str, **values) -> "Species":
        """Build a species and read its composition from the formula."""
        return cls(element=element, composition=parse_formula(values["formula"]), **values)

    @property
    def name(self) -> str:
        """The species' name as shown to users: formula with charge, or its label.

        >>> Species.create("Zn", formula="Zn", charge=2, phase="aqueous", dgf=-147.1, source="x").name
        'Zn^2+'
        """
        return self.label or ion_name(self.formula, self.charge)

    @property
    def metal_atoms(self) -> int:
        """m: atoms of the system's element in one formula unit."""
        return self.composition.get(self.element, 0)

    @property
    def ligand_count(self) -> int:
        """n: ligands bound in one formula unit (0 without a ligand)."""
        if self.ligand is None:
            return 0
        element = self.ligand.counting_element
        return self.composition.get(element, 0) // self.ligand.species.composition[element]

    def _outside_ligands(self, element: str) -> int:
        inside = self.ligand_count * self.ligand.species.composition.get(element, 0) if self.ligand else 0
        return self.composition.get(element, 0) - inside

    @property
    def hydrogen_atoms(self) -> int:
        """h: hydrogen atoms in one formula unit outside its ligands (0 for the hydrogen-free species)."""
        return self._outside_ligands("H") if self.element != "H" else 0

    @property
    def oxygen_atoms(self) -> int:
        """o: oxygen atoms in one formula unit outside its ligands."""
        return self._outside_ligands("O") if self.element != "O" else 0

    @property
    def protons_released(self) -> int:
        """2o - h: hydrogen ions released when the species forms from M and H2O."""
        return 2 * self.oxygen_atoms - self.hydrogen_atoms

    @property
    def electrons_released(self) -> int:
        """2o - h + z - n·y: electrons released when the species forms from M, H2O and its ligands.

        >>> chloride = Species.create("Cl", formula="Cl", charge=-1, phase="aqueous", dgf=-131.228, source="x")
        >>> gold = Species.create("Au", formula="AuCl4", charge=-1, phase="aqueous", dgf=-235.14, source="x",
        ...                       ligand=Ligand(chloride, "Cl"))
        >>> gold.ligand_count, gold.electrons_released
        (4, 3)
        """
        return self.protons_released + self.charge - (self.ligand_count * self.ligand.species.charge
                                                       if self.ligand else 0)

    @property
    def is_dissolved(self) -> bool:
        """True for species held at the user's dissolved activity."""
        return self.phase in DISSOLVED_PHASES

    @property
    def is_element(self) -> bool:
        """True for the element itself (the metal, liquid mercury, graphite)."""
        return self.composition == {self.element: self.metal_atoms} and self.charge == 0 and not self.is_dissolved

    @property
    def is_hydride(self) -> bool:
        """True for a condensed metal hydride: the element and hydrogen, no oxygen (TiH2, ZrH2).

        >>> Species.create("Ti", formula="TiH2", charge=0, phase="solid", dgf=-105.1, source="x").is_hydride
        True
        """
        return (not self.is_dissolved and self.phase != "gas" and self.hydrogen_atoms > 0
                and self.oxygen_atoms == 0 and self.charge == 0)

    @property
    def region(self) -> str:
        """The corrosion-diagram region: immunity, passivation, corrosion (Pourbaix 1966, ch. 3) or hydride.

        A hydride is neither the metal nor a protective film: the metal takes up hydrogen, swells and
        embrittles (hydrogen embrittlement of titanium and zirconium cathodes, common practice).
        """
        if self.is_element:
            return "immunity"
        if self.is_dissolved or self.phase == "gas":
            return "corrosion"
        if self.is_hydride:
            return "hydride"
        return "passivation"
