"""The all-at-once domain finder (engine.envelope) against the one-polygon-at-a-time path it replaces.

The reference is :func:`engine.domains.stability_domains`, the clipping of one polygon at a time that built
every diagram before; the random conditions are a sample (a check, not a method), seeded so a failure repeats.
"""

import random

import numpy as np
import pytest

from electrosieve.app.payloads import screen_payload
from electrosieve.engine import diagram as diagram_module
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.domains import PlotLimits, boundaries, stability_domains
from electrosieve.engine.envelope import Job, domains_of
from electrosieve.engine.errors import InputError
from electrosieve.engine.screen import VERDICTS, make_scenario, screen

CATALOG = default_catalog()


def _conditions(seed: int, count: int):
    """(activity, temperature [°C], limits) drawn at random: activities 1e-8–1, 5–95 °C, limits the default or a
    random smaller rectangle."""
    rng = random.Random(seed)
    for trial in range(count):
        limits = PlotLimits() if trial % 2 else PlotLimits(rng.uniform(-2, 5), rng.uniform(8, 16), rng.uniform(-3, -1),
                                                           rng.uniform(0.5, 3))
        yield 10 ** rng.uniform(-8, 0), round(rng.uniform(5, 95), 3), limits


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_domains_are_those_of_one_polygon_at_a_time_bit_for_bit(seed):
    for activity, temperature, limits in _conditions(seed, 10):
        planes = [diagram_module.planes_for(CATALOG.systems[e], CATALOG, activity, temperature) for e in CATALOG.systems]
        jobs = [Job(p, limits) for p in planes] + [Job(p, limits, ~p.dissolved) for p in planes]
        for job, found in zip(jobs, domains_of(jobs)):
            expected = stability_domains(job.planes, job.limits, job.competitors)
            assert [index for index, _, _ in found] == [d.index for d in expected]
            for (_, vertices, labels), domain in zip(found, expected):
                assert np.array_equal(vertices, domain.vertices) and np.array_equal(labels, domain.neighbours)


def test_a_window_corner_on_a_triple_point_is_tidied_the_same_way():
    # Zn at 25 °C and 1e-6: the limits' corner placed on the Zn/Zn2+/ZnO triple point, so clips pass through vertices
    planes = diagram_module.planes_for(CATALOG.systems["Zn"], CATALOG, 1e-6, 25.0)
    domains = stability_domains(planes, PlotLimits())
    corner = next(v for d in domains for v in d.vertices if abs(v[0] - 2) > 0.5 and abs(v[0] - 16) > 1e-9
                  and abs(v[1]) < 2.9)
    limits = PlotLimits(float(corner[0]), 16.0, float(corner[1]), 3.0)
    [found] = domains_of([Job(planes, limits)])
    expected = stability_domains(planes, limits)
    assert [i for i, _, _ in found] == [d.index for d in expected]
    assert all(np.array_equal(v, d.vertices) and np.array_equal(n, d.neighbours) for (_, v, n), d in zip(found, expected))


def _one_at_a_time(catalog, elements, activity, temperature_c, limits):
    """Diagrams built as before engine.envelope: each element's domains clipped one polygon at a time."""
    built = {}
    for element in elements:
        planes = diagram_module.planes_for(catalog.systems[element], catalog, activity, temperature_c)
        domains = stability_domains(planes, limits)
        kelvin = temperature_c + 273.15
        built[element] = diagram_module.Diagram(
            element=element, activity=activity, temperature_c=temperature_c, limits=limits, planes=planes,
            domains=tuple(domains), boundaries=tuple(boundaries(planes, domains)),
            water=diagram_module.water_lines(diagram_module.water_gibbs(catalog, kelvin), kelvin))
    return built


def _random_scenarios(count: int):
    rng = random.Random(18)
    scales = ["SHE", "RHE", "SCE", "AgAgCl-3M"]
    made = []
    while len(made) < count:
        ph = sorted(round(rng.uniform(-1, 15), 2) for _ in range(2))
        low = round(rng.uniform(-2.0, 2.0), 3)
        potential = (low, round(low + rng.uniform(0.0, 1.0), 3))
        try:
            made.append(make_scenario(ph=ph, potential=potential, scale=rng.choice(scales),
                                      activity=10 ** round(rng.uniform(-8, 0), 2),
                                      temperature=round(rng.uniform(5, 95), 2)))
        except InputError:
            continue  # e.g. a reference electrode outside its tabulated temperatures
    return made


def _answers(scenarios):
    VERDICTS.clear()
    diagram_module._catalog_diagrams.cache_clear()
    answers = []
    for scenario in scenarios:
        result = screen(scenario)
        raw = [(r.id, r.rank, r.unacceptable_fraction, r.log10_dissolved, r.margin_v, r.instability_ev, r.reason)
               for r in result.rows]
        answers.append((screen_payload(result), raw))
    VERDICTS.clear()
    diagram_module._catalog_diagrams.cache_clear()
    return answers


@pytest.mark.slow
def test_screens_of_100_random_scenarios_are_unchanged(monkeypatch):
    scenarios = _random_scenarios(100)
    now = _answers(scenarios)
    monkeypatch.setattr(diagram_module, "build_diagrams", _one_at_a_time)
    before = _answers(scenarios)
    for scenario, new, old in zip(scenarios, now, before):
        assert new == old, scenario
