"""Benchmark: cost of an E–pH diagram at 80 °C against the same diagram at 25 °C.

Prints one JSON object: median wall time [s] of an uncached diagram build
(``engine.diagram._cached_diagram.__wrapped__``) at each temperature, per
element, and the ratio of their sums, 80 °C over 25 °C. Thermodynamic caches are
cleared before each build, so the ratio includes ΔfG(T) for every species. The issue's target is a
ratio of at most 2.
"""

import json
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from electrosieve.engine import thermo  # noqa: E402
from electrosieve.engine.catalog import default_catalog  # noqa: E402
from electrosieve.engine.diagram import _cached_diagram  # noqa: E402
from electrosieve.engine.domains import PlotLimits  # noqa: E402

ELEMENTS = ("Zn", "Fe", "Cu", "Ni", "Pt")
REPEATS = 15
ACTIVITY = 1e-6


def _clear_thermo_caches() -> None:
    """Forget every per-(species, T) result, so each build pays for its thermodynamics."""
    thermo._formation_gibbs.cache_clear()
    thermo._temperature_data.cache_clear()


def median_build_time(catalog, element: str, temperature_c: float) -> float:
    """Median time [s] of REPEATS uncached builds of ``element``'s diagram at ``temperature_c``."""
    times = []
    for _ in range(REPEATS):
        _clear_thermo_caches()
        start = time.perf_counter()
        _cached_diagram.__wrapped__(catalog, element, ACTIVITY, temperature_c, PlotLimits())
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def temperature_figures() -> dict:
    """Median uncached diagram build times at 25 and 80 °C per element, and the 80/25 ratio of their sums."""
    catalog = default_catalog()
    elements = [e for e in ELEMENTS if e in catalog.systems]
    _cached_diagram.__wrapped__(catalog, elements[0], ACTIVITY, 80.0, PlotLimits())   # warm the data-file reads
    result = {"elements": {}, "repeats": REPEATS}
    total = {25.0: 0.0, 80.0: 0.0}
    for element in elements:
        row = {}
        for temperature in total:
            row[f"median_s_{temperature:g}C"] = median_build_time(catalog, element, temperature)
            total[temperature] += row[f"median_s_{temperature:g}C"]
        row["ratio"] = row["median_s_80C"] / row["median_s_25C"]
        result["elements"][element] = row
    result["sum_median_s_25C"] = total[25.0]
    result["sum_median_s_80C"] = total[80.0]
    result["ratio_80C_over_25C"] = total[80.0] / total[25.0]
    result["target_ratio"] = 2.0
    return result


if __name__ == "__main__":
    print(json.dumps(temperature_figures(), indent=1))
