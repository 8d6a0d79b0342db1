"""Plain-words cautions shown wherever results appear (CLI, API, pages)."""

CAUTIONS = (
    "Thermodynamics says what can happen, not how fast: a 'stable' verdict ignores kinetics, and a "
    "'corrosion' verdict may be slow in practice.",
    "Passivation does not guarantee protection: films can be porous or poorly adherent, and chlorides break them.",
    "Below the H2/H2O line the cell evolves hydrogen, a flammable gas; above the O2/H2O line it evolves oxygen, "
    "and chloride electrolytes can release chlorine, a toxic gas. Ventilate and keep ignition sources away.",
    "A 'hydride' region means the metal takes up hydrogen: titanium, zirconium and similar cathodes below it "
    "absorb hydrogen, form brittle hydrides and can crack or shed; never rely on them as hydrogen-evolving cathodes "
    "without tests.",
    "Dissolved metals can be toxic: Cr(VI), Pb, Cd, Hg, Ni and others. Handle and dispose of electrolytes as hazardous waste.",
    "Confirm every choice experimentally and follow your institution's safety rules and local codes.",
)
