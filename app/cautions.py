"""Plain-words cautions shown wherever results appear (CLI, API, pages); the last defers to local rules.

Each caution opens with its subject and a colon, so a page can show the subjects as a summary line.
"""

CAUTIONS = (
    "Hydrogen: below the H2/H2O line the cathode gives off hydrogen, which burns and explodes in air. In an "
    "undivided cell it mixes with the anode's oxygen into an explosive gas: separate or vent the gases, keep "
    "sparks and flames away.",
    "Chlorine: chloride electrolytes can give off chlorine at the anode, a toxic gas. Work in a fume hood.",
    "Hot caustic and hot acid: hot alkali and hot acid burn skin and eyes fast and deep. Wear a face shield, "
    "gloves and an apron; keep an eyewash within reach.",
    "Hydrofluoric acid: fluoride in acid etches glass and dissolves titanium and its oxide film; it burns "
    "through skin with delayed pain and poisons. Use plastic ware and have calcium gluconate gel and a plan ready.",
    "Hydrides: in a 'hydride' region the metal takes up hydrogen; titanium, zirconium and similar cathodes "
    "there form brittle hydrides and can crack or shed. Do not use them as hydrogen-evolving cathodes without tests.",
    "Toxic dissolved metals: spent electrolytes can carry Cr(VI), Pb, Cd, Hg, Ni and others. Collect and dispose "
    "of them as hazardous waste.",
    "Electrical supplies: power supplies can shock, spark and overheat leads. Switch off before touching "
    "electrodes or connections, insulate and fuse the circuit.",
    "Limits: thermodynamics says what can happen, not how fast; passive films can be porous or broken by "
    "chloride. Confirm every choice by experiment.",
    "Your rules first: local codes and your institution's safety rules take precedence over these notes.",
)

ELECTROLYTE_CAUTIONS = (
    "Strong acids and caustic burn skin and eyes, hot caustic (KOH, NaOH) worst of all: wear eye protection and "
    "gloves, add acid or caustic to water slowly, never water to concentrated acid.",
    "Chloride electrolytes evolve chlorine, a toxic gas, at anodes above about 1.36 V vs SHE; hydrochloric acid fumes.",
    "Dissolved metals such as copper, nickel, lead and mercury salts are toxic: handle and dispose of the "
    "electrolyte as hazardous waste under your institution's rules and local codes.",
)
