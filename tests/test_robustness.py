"""Robustness of verdicts: Monte Carlo over Gibbs-energy uncertainties, decided exactly per draw."""

import math

import numpy as np
import pytest

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import FARADAY
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import PlotLimits
from electrosieve.engine.errors import InputError
from electrosieve.engine.metrics import overlays
from electrosieve.engine.robustness import VERDICTS, robustness, robustness_settings, species_present
from electrosieve.engine.window import operating_window


FARADAY_KJ = FARADAY / 1000
"""[kJ mol^-1 V^-1]"""


def _zinc_boundary():
    """E [V vs SHE] of the Zn/Zn2+ line at the diagram's activity (no pH dependence)."""
    planes = diagram("Zn").planes
    i, j = planes.index_of["Zn"], planes.index_of["Zn^2+"]
    return planes, float(-(planes.offset[j] - planes.offset[i]) / (planes.e_slope[j] - planes.e_slope[i]))


def test_a_point_on_a_boundary_holds_about_half_the_time():
    planes, e = _zinc_boundary()
    result = robustness(planes, [(5.0, e)], {"immunity"}, draws=2000)
    # The tie goes to the corroding side (engine convention); either side wins about half the draws.
    assert result.verdict == "rejected"
    assert result.verdict_probability == pytest.approx(0.5, abs=0.05)
    assert result.draws == 2000


def test_a_thin_window_across_a_boundary_is_rarely_still_partly_acceptable():
    # The window straddles the Zn/Zn2+ line by ±1 mV, i.e. ±0.19 kJ/mol of Zn2+ (2 e-); the verdict stays
    # "partly acceptable" only while the drawn line stays inside: P(|N(0, u)| < 0.19) for Zn2+'s u (normal law).
    planes, e = _zinc_boundary()
    corners = [(4.0, e - 0.001), (6.0, e - 0.001), (6.0, e + 0.001), (4.0, e + 0.001)]
    result = robustness(planes, corners, {"immunity"}, draws=2000)
    u = planes.species[planes.index_of["Zn^2+"]].uncertainty
    assert result.verdict == "partly acceptable"
    assert result.verdict_probability == pytest.approx(math.erf(2 * FARADAY_KJ * 0.001 / (u * math.sqrt(2))), abs=0.04)
    assert result.verdict_probability < 0.5


def test_a_window_deep_inside_a_domain_always_holds():
    planes, e = _zinc_boundary()
    corners = [(4.0, e - 0.5), (6.0, e - 0.5), (6.0, e - 0.4), (4.0, e - 0.4)]
    assert robustness(planes, corners, {"immunity"}).verdict_probability == 1.0


def test_uncertainty_decides_how_robust_a_near_boundary_verdict_is():
    # d mV from the Zn/Zn2+ line: 2 e- x d of Zn2+'s Gibbs energy; the normal probability of not crossing is
    # Φ(2 F d / u) (GUM Supplement 1, JCGM 101:2008: propagation by Monte Carlo matches the normal law here).
    planes, e = _zinc_boundary()
    u = planes.species[planes.index_of["Zn^2+"]].uncertainty
    for d in (0.001, 0.003):
        near = robustness(planes, [(5.0, e - d)], {"immunity"}, draws=4000)
        expected = 0.5 * (1 + math.erf(2 * FARADAY_KJ * d / (u * math.sqrt(2))))
        assert near.verdict_probability == pytest.approx(expected, abs=0.03), d
    assert robustness(planes, [(5.0, e - 0.020)], {"immunity"}, draws=4000).verdict_probability > 0.99


def test_same_seed_same_answer():
    planes, e = _zinc_boundary()
    first = robustness(planes, [(5.0, e)], {"immunity"}, seed=3)
    assert robustness(planes, [(5.0, e)], {"immunity"}, seed=3) == first


def test_species_met_match_the_exact_overlay_across_the_catalog():
    """Cross-check against the exact clipped domains of engine.metrics (areas, segments and points)."""
    catalog = default_catalog()
    checked = 0
    for element in catalog.systems:
        d = diagram(element)
        for ph in [(0.0, 1.0), (4.0, 9.0), (13.0, 14.0), (7.0, 7.0)]:
            for potential in [(-1.0, -0.5), (0.0, 0.5), (1.2, 1.6), (0.3, 0.3)]:
                window = operating_window(catalog.scales, ph, potential, "SHE", 25.0, PlotLimits())
                exact = {p.species for p in overlays([d], window)[0].pieces if p.fraction > 1e-9}
                present = species_present(d.planes, d.planes.offset[None], window.vertices)[0]
                assert {s.name for s, hit in zip(d.planes.species, present) if hit} == exact, (element, ph, potential)
                checked += 1
    assert checked == 16 * len(catalog.systems)


def test_blocking_species_count_against_the_verdict():
    # Titanium over an anodic window meets TiO2 (passivation): acceptable to an anode, unless the film blocks current.
    planes = diagram("Ti").planes
    corners = [(6.0, 0.8), (8.0, 0.8), (8.0, 1.0), (6.0, 1.0)]
    assert robustness(planes, corners, {"immunity", "passivation"}).verdict == "acceptable"
    blocked = robustness(planes, corners, {"immunity", "passivation"},
                         blocking=frozenset({"TiO2 (rutile)", "TiO2 (anatase)"}))
    assert blocked.verdict == "rejected" and blocked.verdict_probability == 1.0


def test_waived_species_do_not_count_against_the_verdict():
    planes = diagram("C").planes
    point = [(7.0, -0.6)]  # below the CH4/C line: methane is the stable species
    assert robustness(planes, point, {"immunity"}).verdict == "rejected"
    assert robustness(planes, point, {"immunity"}, waived=frozenset({"CH4"})).verdict == "acceptable"


def test_given_verdict_is_tested_and_checked():
    planes, e = _zinc_boundary()
    assert robustness(planes, [(5.0, e - 0.3)], {"immunity"}, verdict="rejected").verdict_probability == 0.0
    with pytest.raises(InputError, match="verdict must be one of"):
        robustness(planes, [(5.0, e)], {"immunity"}, verdict="fine")
    with pytest.raises(InputError, match="accept: unknown region"):
        robustness(planes, [(5.0, e)], {"immunity", "bliss"})
    assert VERDICTS == ("acceptable", "partly acceptable", "rejected")


def test_draws_are_at_least_two_hundred_by_default():
    assert robustness_settings().draws >= 200


def test_segment_windows_are_exact_too():
    planes, e = _zinc_boundary()
    across = [(5.0, e - 0.1), (5.0, e + 0.1)]
    present = species_present(planes, planes.offset[None], np.array(across))[0]
    assert present[planes.index_of["Zn"]] and present[planes.index_of["Zn^2+"]]


def test_one_pass_over_many_questions_answers_as_each_alone():
    from electrosieve.engine.robustness import Question, robustness_many

    corners = [(4.0, -0.9), (6.0, -0.9), (6.0, -0.7), (4.0, -0.7)]
    questions = []
    for element in ("Zn", "Cd", "Fe", "Ni"):
        planes = diagram(element).planes
        questions.append(Question(planes, frozenset(n for n, r in zip(planes.index_of, planes.regions)
                                                    if r != "immunity")))
    together = robustness_many(questions, corners)
    alone = [robustness_many([q], corners)[0] for q in questions]
    assert together == alone
