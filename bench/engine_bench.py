"""Engine benchmarks: diagram build time for a catalog element, and growth with species count.

The synthetic systems are invented for timing only (random ΔGf°, charges and
compositions of a made-up element "Xx"); they are never part of the catalog.
"""

import random
import statistics
import time

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.diagram import build_diagrams
from electrosieve.engine.domains import PlotLimits, boundaries, stability_domains
from electrosieve.engine.planes import build_planes
from electrosieve.engine.screen import VERDICTS, make_scenario, screen
from electrosieve.engine.species import Species

WINDOW = PlotLimits()


def median_ms(action, repeats: int = 30) -> float:
    """Median wall time of ``action()`` [ms] over ``repeats`` runs after one warm-up."""
    action()
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        action()
        times.append((time.perf_counter() - start) * 1000)
    return statistics.median(times)


def diagram_ms(element: str = "Fe") -> float:
    """Median time to build one element's diagram, uncached [ms]."""
    catalog = default_catalog()
    return median_ms(lambda: build_diagrams(catalog, (element,), 1e-6, 25.0, WINDOW)[element])


def synthetic_species(count: int, seed: int = 1) -> tuple[Species, ...]:
    """``count`` invented species of a made-up element, the metal first (timing data only)."""
    rng = random.Random(seed)
    species = [Species.create("Xx", formula="Xx", charge=0, phase="solid", dgf=0.0, source="synthetic")]
    while len(species) < count:
        m, o, h = rng.randint(1, 3), rng.randint(0, 4), rng.randint(0, 3)
        charge = rng.randint(-3, 3)
        phase = "aqueous" if charge else rng.choice(["solid", "aqueous"])
        formula = f"Xx{m if m > 1 else ''}" + (f"O{o}" if o else "") + (f"H{h}" if h else "")
        oxidation = 2 * o - h + charge
        dgf = -120.0 * o + 60 * h - 90 * max(oxidation, 0) * rng.uniform(0.2, 1.2) + rng.uniform(-80, 80)
        species.append(Species.create("Xx", formula=formula, charge=charge, phase=phase, dgf=dgf,
                                      source="synthetic", label=f"s{len(species)}"))
    return tuple(species)


def growth_ms(counts=(10, 50, 200)) -> dict[str, float]:
    """Median diagram time [ms] for synthetic systems of each size in ``counts``."""
    figures = {}
    for count in counts:
        species = synthetic_species(count)

        def build(species=species):
            planes = build_planes(species, -237.129, 1e-6)
            boundaries(planes, stability_domains(planes, WINDOW))

        figures[str(count)] = round(median_ms(build, repeats=10 if count > 50 else 30), 3)
    return figures


SCREEN_WINDOWS = {
    "alkaline OER anode, pH 13-14, 1.5-1.7 V vs RHE": dict(ph=[13, 14], potential=[1.5, 1.7], scale="RHE", role="anode"),
    "acid cathode, pH 0-1, -0.2-0 V vs SHE": dict(ph=[0, 1], potential=[-0.2, 0.0], role="cathode"),
    "wide window, pH 0-14, 0.2-1.0 V vs SHE": dict(ph=[0, 14], potential=[0.2, 1.0], role="anode"),
}


def screen_ms() -> dict[str, dict[str, float]]:
    """Median time to screen the whole catalog for one window [ms], diagrams cached (they depend only on element, T, a):
    ``fresh`` with the element verdicts cleared before every run (a scenario never seen), ``repeated`` with them kept."""
    catalog = default_catalog()
    figures = {}
    for name, window in SCREEN_WINDOWS.items():
        scenario = make_scenario(**window, catalog=catalog)

        def fresh(scenario=scenario):
            VERDICTS.clear()
            screen(scenario, catalog)

        def repeated(scenario=scenario):
            screen(scenario, catalog)

        figures[name] = {"fresh": round(median_ms(fresh, repeats=20), 3),
                         "repeated": round(median_ms(repeated, repeats=20), 3)}
    figures["materials"] = len(catalog.materials)
    return figures


def engine_figures() -> dict:
    """All engine figures as one dict."""
    return {
        "diagram_ms_median": {element: round(diagram_ms(element), 3) for element in ("Zn", "Fe", "Mn")},
        "diagram_ms_by_species_count": growth_ms(),
        "screen_catalog_ms_median": screen_ms(),
    }
