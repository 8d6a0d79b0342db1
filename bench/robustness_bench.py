"""Robustness benchmark: a whole-catalog screen with and without the role's judgement and robustness.

Target (issue 14): the screen with robustness takes at most three times the screen without it.
``screen_without_robustness_ms``: the thermodynamic screen alone (every element's exact overlay, each
material's row, the ranking), as ``engine.screen`` did before roles; ``screen_ms``: ``screen()`` as it runs
now, with ``judge_all`` adding surface, kinetics, notes and the Monte Carlo robustness of every verdict.
Both start fresh (element verdicts cleared; diagrams cached, as they depend only on element, temperature
and activity). Times are CPU times of this process (the machine is shared), medians of several runs.
"""

import json
import statistics
import time

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.ranking import DEFAULT_ORDER, rank
from electrosieve.engine.screen import VERDICTS, candidates, judge_elements, make_scenario, screen, screen_material

SCENARIOS = {
    "alkaline OER anode, pH 13-14, 1.5-1.7 V vs RHE": dict(ph=[13, 14], potential=[1.5, 1.7], scale="RHE",
                                                           role="oer-anode"),
    "acid HER cathode, pH 0-1, -0.2-0 V vs SHE": dict(ph=[0, 1], potential=[-0.2, 0.0], role="her-cathode"),
    "wide window anode, pH 0-14, 0.2-1.0 V vs SHE": dict(ph=[0, 14], potential=[0.2, 1.0], role="anode"),
}


def _median_ms(action, repeats: int) -> float:
    action()
    times = []
    for _ in range(repeats):
        start = time.process_time()
        action()
        times.append((time.process_time() - start) * 1000)
    return statistics.median(times)


def robustness_figures(repeats: int = 9) -> dict[str, dict[str, float]]:
    """Median CPU times [ms] of a fresh whole-catalog screen without and with robustness, and their ratio."""
    catalog = default_catalog()
    figures = {}
    for name, given in SCENARIOS.items():
        scenario = make_scenario(**given)

        def thermodynamic(scenario=scenario):
            VERDICTS.clear()
            chosen = candidates(catalog, scenario)
            verdicts = judge_elements(catalog, scenario, list(dict.fromkeys(m.element for m in chosen)))
            rank([screen_material(m, scenario.window, verdicts[m.element]) for m in chosen], DEFAULT_ORDER)

        def judged(scenario=scenario):
            VERDICTS.clear()
            screen(scenario, catalog)

        without = _median_ms(thermodynamic, repeats)
        full = _median_ms(judged, repeats)
        figures[name] = {"screen_without_robustness_ms": round(without, 1), "screen_ms": round(full, 1),
                         "ratio": round(full / without, 2), "role": scenario.role,
                         "materials": len(catalog.materials)}
    return figures


if __name__ == "__main__":
    print(json.dumps(robustness_figures(), indent=2))
