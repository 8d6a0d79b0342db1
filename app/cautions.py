"""Plain-words cautions shown wherever results appear (CLI, API, pages)."""

CAUTIONS = (
    "Thermodynamics says what can happen, not how fast: a 'stable' verdict ignores kinetics, and a "
    "'corrosion' verdict may be slow in practice.",
    "Passivation does not guarantee protection: films can be porous or poorly adherent, and chlorides break them.",
    "Below the H2/H2O line the cell evolves hydrogen, a flammable gas; above the O2/H2O line it evolves oxygen, "
    "and chloride electrolytes can release chlorine, a toxic gas. Ventilate and keep ignition sources away.",
    "Dissolved metals can be toxic: Cr(VI), Pb, Cd, Hg, Ni and others. Handle and dispose of electrolytes as hazardous waste.",
    "Confirm every choice experimentally and follow your institution's safety rules and local codes.",
)

ELECTROLYTE_CAUTIONS = (
    "Strong acids and caustic burn skin and eyes, hot caustic (KOH, NaOH) worst of all: wear eye protection and "
    "gloves, add acid or caustic to water slowly, never water to concentrated acid.",
    "Chloride electrolytes evolve chlorine, a toxic gas, at anodes above about 1.36 V vs SHE; hydrochloric acid fumes.",
    "Dissolved metals such as copper, nickel, lead and mercury salts are toxic: handle and dispose of the "
    "electrolyte as hazardous waste under your institution's rules and local codes.",
)
