"""Benchmark: a temperature change for the whole catalog, in process.

Prints one JSON object: the median time [ms] of a whole-catalog screen at a temperature never asked before
(5–95 °C, so every element's diagram is built anew: ΔfG(T) of every species, the domains, the boundaries), done
by the engine (``engine.envelope``: all domains in one numpy pass) and, in the same run, by the former path that
clipped one polygon at a time (``engine.domains.stability_domains`` per element); also the diagrams alone, and
a fresh 25 °C screen (new window, diagrams cached) for scale. The issue's target: at most 10 ms.
Process CPU time is reported beside wall time: the machine is shared, and CPU time is less disturbed by it.
"""

import json
import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from electrosieve.engine import diagram as diagram_module  # noqa: E402
from electrosieve.engine.catalog import default_catalog  # noqa: E402
from electrosieve.engine.constants import ZERO_CELSIUS  # noqa: E402
from electrosieve.engine.domains import PlotLimits, boundaries, stability_domains  # noqa: E402
from electrosieve.engine.screen import VERDICTS, make_scenario, screen  # noqa: E402

REPEATS = 40


def one_polygon_at_a_time(catalog, elements, activity, temperature_c, limits):
    """Diagrams as the engine built them before ``engine.envelope``: each element's domains clipped one by one."""
    built = {}
    kelvin = temperature_c + ZERO_CELSIUS
    water = diagram_module.water_lines(diagram_module.water_gibbs(catalog, kelvin), kelvin)
    for element in elements:
        planes = diagram_module.planes_for(catalog.systems[element], catalog, activity, temperature_c)
        domains = stability_domains(planes, limits)
        built[element] = diagram_module.Diagram(
            element=element, activity=activity, temperature_c=temperature_c, limits=limits, planes=planes,
            domains=tuple(domains), boundaries=tuple(boundaries(planes, domains)), water=water)
    return built


def _timed(action, arguments) -> dict:
    """Median wall and CPU time [ms] of ``action(a)`` over ``arguments``."""
    wall, cpu = [], []
    for argument in arguments:
        start_wall, start_cpu = time.perf_counter(), time.process_time()
        action(argument)
        wall.append((time.perf_counter() - start_wall) * 1000)
        cpu.append((time.process_time() - start_cpu) * 1000)
    return {"wall_ms_median": round(statistics.median(wall), 3), "cpu_ms_median": round(statistics.median(cpu), 3)}


def temperature_figures() -> dict:
    catalog = default_catalog()
    elements = tuple(catalog.systems)
    rng = random.Random(18)
    screen(make_scenario(ph=(3, 5), potential=(0, 0.5)), catalog)  # data files read, caches warm at 25 °C

    def new_temperature_screen(temperature):
        screen(make_scenario(ph=(3, 5), potential=(0, 0.5), temperature=temperature), catalog)

    def fresh_window_screen(high):
        VERDICTS.clear()
        screen(make_scenario(ph=(3, high), potential=(0, 0.5)), catalog)

    temperatures = lambda: [round(rng.uniform(5, 95), 4) for _ in range(REPEATS)]  # noqa: E731
    figures = {"elements": len(elements), "materials": len(catalog.materials), "repeats": REPEATS, "target_ms": 10.0}
    figures["screen_new_temperature"] = _timed(new_temperature_screen, temperatures())
    figures["diagrams_new_temperature"] = _timed(
        lambda t: diagram_module.build_diagrams(catalog, elements, 1e-6, t, PlotLimits()), temperatures())
    figures["screen_fresh_window_25C"] = _timed(fresh_window_screen, [5 + k / REPEATS for k in range(REPEATS)])
    engine_builder = diagram_module.build_diagrams
    diagram_module.build_diagrams = one_polygon_at_a_time
    try:
        figures["former_screen_new_temperature"] = _timed(new_temperature_screen, temperatures())
        figures["former_diagrams_new_temperature"] = _timed(
            lambda t: one_polygon_at_a_time(catalog, elements, 1e-6, t, PlotLimits()), temperatures())
    finally:
        diagram_module.build_diagrams = engine_builder
    figures["speedup_screen_cpu"] = round(figures["former_screen_new_temperature"]["cpu_ms_median"]
                                          / figures["screen_new_temperature"]["cpu_ms_median"], 2)
    return figures


if __name__ == "__main__":
    print(json.dumps(temperature_figures(), indent=1))
