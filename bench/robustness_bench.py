"""Robustness benchmark: a whole-catalog screen with and without a robustness figure for every material.

Target (issue 14): the screen with robustness takes at most three times the screen without it.
Both sides start fresh (element verdicts cleared; diagrams cached, as they depend only on element,
temperature and activity). Robustness is computed once per element with the role's blocking films
(the verdict is the element's, shared by its materials), every element in one pass
(``robustness_many``), as the screen would attach it to each row. Times are CPU times of this
process (the machine is shared), medians of several runs.
"""

import json
import statistics
import time

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.conduction import surfaces
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import Window
from electrosieve.engine.robustness import Question, robustness_many
from electrosieve.engine.screen import VERDICTS, make_scenario, screen
from electrosieve.engine.window import operating_window

SCENARIOS = {
    "alkaline OER anode, pH 13-14, 1.5-1.7 V vs RHE": dict(ph=[13, 14], potential=[1.5, 1.7], scale="RHE", role="anode"),
    "acid cathode, pH 0-1, -0.2-0 V vs SHE": dict(ph=[0, 1], potential=[-0.2, 0.0], role="cathode"),
    "wide window, pH 0-14, 0.2-1.0 V vs SHE": dict(ph=[0, 14], potential=[0.2, 1.0], role="anode"),
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
    """Median times [ms] of a fresh whole-catalog screen, and of the same screen plus robustness for every row."""
    catalog = default_catalog()
    blocking = frozenset(phase for phase, s in surfaces().items() if not s.passes_current)
    figures = {}
    for name, given in SCENARIOS.items():
        scenario = make_scenario(**given)
        window = operating_window(catalog.scales, scenario.ph, scenario.potential, scenario.scale,
                                  scenario.temperature, Window())

        def plain():
            VERDICTS.clear()
            screen(scenario)

        def with_robustness():
            VERDICTS.clear()
            result = screen(scenario)
            questions = []
            for element in dict.fromkeys(row["element"] for row in result["results"]):
                planes = diagram(element, scenario.activity, scenario.temperature).planes
                questions.append(Question(planes, frozenset(
                    name for name, region in zip(planes.index_of, planes.regions)
                    if region not in scenario.accept or name in blocking)))
            robustness_many(questions, window.vertices)

        without = _median_ms(plain, repeats)
        withal = _median_ms(with_robustness, repeats)
        figures[name] = {"screen_ms": round(without, 1), "screen_with_robustness_ms": round(withal, 1),
                         "ratio": round(withal / without, 2), "materials": len(catalog.materials)}
    return figures


if __name__ == "__main__":
    print(json.dumps(robustness_figures(), indent=2))
