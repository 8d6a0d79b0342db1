"""Benchmark: resident memory under 10 000 distinct scenarios, in process.

Each scenario is new (random pH range, potential range, reference scale, temperature 5–95 °C, activity), screened
over the whole catalog and turned into its JSON payload, as a request would; every tenth also opens a material
page's diagram view. Prints one JSON object: RSS [MB] before, along the way and after, the size of every cache,
and the bound the cache sizes imply (entries × the measured size of one entry, ``entry_kb``).
"""

import gc
import json
import os
import random
import sys
import time
import tracemalloc
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from electrosieve.app import diagramviews  # noqa: E402
from electrosieve.app.payloads import screen_payload  # noqa: E402
from electrosieve.engine import diagram as diagram_module  # noqa: E402
from electrosieve.engine import screen as screen_module  # noqa: E402
from electrosieve.engine.catalog import default_catalog  # noqa: E402
from electrosieve.engine.domains import PlotLimits  # noqa: E402
from electrosieve.engine.errors import InputError  # noqa: E402

SCENARIOS = int(os.environ.get("ELECTROSIEVE_BENCH_SCENARIOS", "10000"))
SCALES = ("SHE", "RHE", "SCE", "AgAgCl-3M")


def rss_mb() -> float:
    """Resident set size of this process [MB] (Linux /proc)."""
    for line in Path("/proc/self/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def random_scenario(rng: random.Random, catalog):
    """A scenario never asked before (reference electrodes outside their tabulated temperatures are redrawn)."""
    while True:
        ph = sorted(round(rng.uniform(-1, 15), 3) for _ in range(2))
        low = round(rng.uniform(-2.0, 2.0), 4)
        try:
            return screen_module.make_scenario(
                ph=ph, potential=(low, round(low + rng.uniform(0.0, 1.0), 4)), scale=rng.choice(SCALES),
                activity=10 ** round(rng.uniform(-8, 0), 3), temperature=round(rng.uniform(5, 95), 3),
                catalog=catalog)
        except InputError:
            continue


def entry_kb(catalog) -> dict:
    """Measured size [KB] of one entry of each cache (tracemalloc), under conditions not yet cached."""
    gc.collect()
    tracemalloc.start()
    start = tracemalloc.get_traced_memory()[0]
    diagrams = diagram_module._catalog_diagrams(catalog, 1e-5, 33.3, PlotLimits())
    built = tracemalloc.get_traced_memory()[0]
    scenario = screen_module.make_scenario(ph=(3, 5), potential=(0, 0.5), temperature=33.3, activity=1e-5,
                                           catalog=catalog)
    screen_module.screen(scenario, catalog)  # adds the outline stacks and the verdicts
    judged = tracemalloc.get_traced_memory()[0]
    diagramviews.diagram_view(catalog, "Fe", 1e-5, 33.3, axis="SHE", operating_window=[[3, 0], [5, 0], [5, 0.5]])
    viewed = tracemalloc.get_traced_memory()[0]
    tracemalloc.stop()
    del diagrams
    return {"catalog_diagrams": round((built - start) / 1024, 1), "verdicts_of_a_question": round((judged - built) / 1024, 1),
            "diagram_view": round((viewed - judged) / 1024, 1)}


def memory_figures() -> dict:
    catalog = default_catalog()
    rng = random.Random(10_000)
    sizes = entry_kb(catalog)
    counts = {"diagram_conditions": diagram_module.CONDITIONS, "verdict_questions": screen_module.VERDICTS.size,
              "diagram_views": diagramviews.SIZE}
    # a question under new conditions keeps its own catalog of diagrams alive through its verdicts
    bound_mb = (counts["diagram_conditions"] * sizes["catalog_diagrams"]
                + counts["verdict_questions"] * (sizes["catalog_diagrams"] + sizes["verdicts_of_a_question"])
                + counts["diagram_views"] * sizes["diagram_view"]) / 1024
    for _ in range(200):  # warm: imports, data files, first caches
        screen_payload(screen_module.screen(random_scenario(rng, catalog), catalog))
    gc.collect()
    before = rss_mb()
    along = {}
    start = time.perf_counter()
    for done in range(1, SCENARIOS + 1):
        scenario = random_scenario(rng, catalog)
        screen_payload(screen_module.screen(scenario, catalog))
        if done % 10 == 0:
            element = rng.choice(list(catalog.systems))
            diagramviews.diagram_view(catalog, element, scenario.activity, scenario.temperature, axis="SHE")
        if done % (SCENARIOS // 5 or 1) == 0:
            along[str(done)] = round(rss_mb(), 1)
    seconds = time.perf_counter() - start
    gc.collect()
    return {"scenarios": SCENARIOS, "rss_mb_before": round(before, 1), "rss_mb_along": along,
            "rss_mb_after": round(rss_mb(), 1), "growth_mb": round(rss_mb() - before, 1),
            "cache_entries": counts, "entry_kb": sizes, "cache_bound_mb": round(bound_mb, 1),
            "ms_per_scenario": round(1000 * seconds / SCENARIOS, 2),
            "kept_now": {"diagram_conditions": diagram_module._catalog_diagrams.cache_info().currsize,
                         "verdict_questions": len(screen_module.VERDICTS._questions),
                         "diagram_views": len(diagramviews._views)}}


if __name__ == "__main__":
    print(json.dumps(memory_figures(), indent=1))
