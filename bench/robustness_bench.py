"""Robustness benchmark: a whole-catalog screen with and without the robustness of every verdict.

Target (issue 14): the screen with robustness takes at most three times the screen without it.
Both sides start fresh (element verdicts cleared; diagrams cached, as they depend only on element,
temperature and activity). ``with robustness``: one ``robustness_many`` pass over the elements with the
role's blocking films (the verdict is the element's, shared by its materials). ``with judgement``: the
whole ``judge_all`` of every material for the matching role (surface, kinetics, notes, robustness per
material, as the screen will attach them to each row). Times are CPU times of this process (the machine
is shared), medians of several runs.
"""

import json
import statistics
import time

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.conduction import surfaces
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import PlotLimits
from electrosieve.engine.judgement import Conditions, ElementState, judge_all
from electrosieve.engine.metrics import overlays
from electrosieve.engine.robustness import Question, robustness_many
from electrosieve.engine.roles import roles
from electrosieve.engine.screen import VERDICTS, make_scenario, screen
from electrosieve.engine.window import operating_window

SCENARIOS = {
    "alkaline OER anode, pH 13-14, 1.5-1.7 V vs RHE":
        (dict(ph=[13, 14], potential=[1.5, 1.7], scale="RHE", role="anode"), "oer-anode"),
    "acid cathode, pH 0-1, -0.2-0 V vs SHE": (dict(ph=[0, 1], potential=[-0.2, 0.0], role="cathode"), "her-cathode"),
    "wide window, pH 0-14, 0.2-1.0 V vs SHE": (dict(ph=[0, 14], potential=[0.2, 1.0], role="anode"), "anode"),
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
    """Median CPU times [ms] of a fresh whole-catalog screen, alone, with robustness and with the judgement."""
    catalog = default_catalog()
    blocking = frozenset(phase for phase, s in surfaces().items() if not s.passes_current)
    materials = list(catalog.materials.values())
    elements = list(dict.fromkeys(m.element for m in materials))
    figures = {}
    for name, (given, role_name) in SCENARIOS.items():
        scenario = make_scenario(**given)
        role = roles()[role_name]
        window = operating_window(catalog.scales, scenario.ph, scenario.potential, scenario.scale,
                                  scenario.temperature, PlotLimits())
        diagrams = [diagram(e, scenario.activity, scenario.temperature) for e in elements]

        def plain():
            VERDICTS.clear()
            screen(scenario)

        def with_robustness():
            plain()
            questions = [Question(d.planes, frozenset(n for n, r in zip(d.planes.index_of, d.planes.regions)
                                                      if r not in scenario.accept or n in blocking))
                         for d in diagrams]
            robustness_many(questions, window.vertices)

        def with_judgement():
            plain()
            states = {e: ElementState.of(d.planes, o.pieces, o.dissolved)
                      for e, d, o in zip(elements, diagrams, overlays(diagrams, window))}
            judge_all(materials, role, states, Conditions(window.vertices, window.ph, diagrams[0].water))

        without = _median_ms(plain, repeats)
        robust = _median_ms(with_robustness, repeats)
        judged = _median_ms(with_judgement, repeats)
        figures[name] = {"screen_ms": round(without, 1), "screen_with_robustness_ms": round(robust, 1),
                         "ratio": round(robust / without, 2), "screen_with_judgement_ms": round(judged, 1),
                         "judgement_ratio": round(judged / without, 2), "role": role_name,
                         "materials": len(materials)}
    return figures


if __name__ == "__main__":
    print(json.dumps(robustness_figures(), indent=2))
