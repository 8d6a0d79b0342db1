"""Benchmarks of materials of several elements (engine/assemblage.py): a three-element alloy's exact
diagram, built fresh (every cache cleared) and repeated, with its candidate and domain counts; the same
for four and five elements; and every material of data/alloys.toml in turn. Prints one JSON object."""

import json
import statistics
import time

from electrosieve.engine import assemblage
from electrosieve.engine.alloydata import alloy_data
from electrosieve.engine.diagram import _catalog_diagrams

COMPOSITIONS = {
    "Fe-Cr-Ni (3 elements, 18/10 stainless by atoms)": {"Fe": 0.72, "Cr": 0.18, "Ni": 0.10},
    "SS316 (4 elements)": "SS316",
    "C276 (5 elements)": "C276",
}


def _clear() -> None:
    assemblage._cached.cache_clear()
    _catalog_diagrams.cache_clear()


def _median_ms(action, repeats: int, fresh: bool) -> float:
    times = []
    for _ in range(repeats):
        if fresh:
            _clear()
        start = time.perf_counter()
        action()
        times.append((time.perf_counter() - start) * 1000)
    return round(statistics.median(times), 2)


def alloy_figures(repeats: int = 5) -> dict:
    """Median build times [ms] and sizes of the multi-element diagrams."""
    data = alloy_data()
    figures = {}
    for label, spec in COMPOSITIONS.items():
        composition = data.composition_of(spec) if isinstance(spec, str) else spec

        def build(composition=composition):
            return assemblage.material_diagram(composition)

        result = build()
        figures[label] = {
            "fresh_ms": _median_ms(build, repeats, fresh=True),
            "repeated_ms": _median_ms(build, repeats * 10, fresh=False),
            "candidate_assemblages": len(result.planes.assemblages),
            "domains": len(result.domains),
        }
    _clear()
    start = time.perf_counter()
    for material_id in data.alloys:
        assemblage.material_exposures(material_id)
    figures["every material of alloys.toml, fresh"] = {"total_ms": round((time.perf_counter() - start) * 1000, 2),
                                                        "materials": len(data.alloys)}
    return figures


if __name__ == "__main__":
    print(json.dumps(alloy_figures(), indent=2))
