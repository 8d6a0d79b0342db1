"""The multi-element E–pH construction (engine/assemblage.py, Persson et al., Phys. Rev. B 85, 235438, 2012)."""

import numpy as np
import pytest

from electrosieve.engine.assemblage import check_composition, material_diagram, parse_composition
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import PlotLimits
from electrosieve.engine.errors import InputError
from electrosieve.engine.mixing import Interaction, mixing_gibbs


@pytest.mark.parametrize("element", sorted(default_catalog().systems))
def test_one_element_reduces_to_the_single_element_diagram(element):
    single = diagram(element)
    material = material_diagram({element: 1.0})
    expected = {d.species.name: d.area for d in single.domains}
    got = {d.assemblage.name: d.area for d in material.domains}
    assert got.keys() == expected.keys()
    for name, value in expected.items():
        assert abs(got[name] - value) <= 1e-9
    assert material.mixing.startswith("no metallic solution")


def test_one_element_reduces_at_80_celsius_and_another_activity():
    single = diagram("Fe", activity=1e-4, temperature_c=80.0)
    material = material_diagram({"Fe": 1.0}, activity=1e-4, temperature_c=80.0)
    assert sorted((d.species.name, round(d.area, 9)) for d in single.domains) == \
        sorted((d.assemblage.name, round(d.area, 9)) for d in material.domains)


@pytest.mark.parametrize("composition", [{"Fe": 2, "Ni": 1}, {"Fe": 0.7, "Cr": 0.18, "Ni": 0.12}, {"Ni": 0.7, "Cu": 0.3}])
def test_domains_tile_the_window_and_agree_with_the_lowest_plane_sampled(composition):
    # brute-force cross-check by sampling (only here): the point answer is the domain holding the point
    d = material_diagram(composition)
    assert abs(sum(dom.area for dom in d.domains) - d.window.area) < 1e-9 * d.window.area
    rng = np.random.default_rng(1)
    from electrosieve.engine.geometry import contains
    for ph, e in zip(rng.uniform(-2, 16, 300), rng.uniform(-3, 3, 300)):
        values = d.planes.at(ph, e)
        best = int(np.argmin(values))
        holder = [dom for dom in d.domains if contains(dom.vertices, ph, e, 1e-9)]
        assert any(values[dom.index] <= values[best] + 1e-9 for dom in holder)


def test_amounts_rebuild_the_bulk_composition():
    d = material_diagram({"Fe": 0.7, "Cr": 0.18, "Ni": 0.12})
    for dom in d.domains:
        total = {}
        for phase, amount in zip(dom.assemblage.phases, dom.assemblage.amounts):
            assert amount > 0
            for element, atoms in phase.atoms:
                total[element] = total.get(element, 0.0) + amount * atoms
        assert total == pytest.approx(dict(d.composition), abs=1e-12)


def test_ideal_mixing_stabilises_the_alloy_by_rt_sum_x_ln_x():
    # Persson et al. (2012): the hull includes alloys; ideal mixing lowers the alloy by R·T·Σ x ln x per atom
    d = material_diagram({"Fe": 0.5, "Ni": 0.5})
    alloy = d.assemblage_at(7.0, -1.0)
    assert alloy.name == "Fe–Ni alloy"
    assert alloy.phases[0].mixing == pytest.approx(mixing_gibbs({"Fe": 1, "Ni": 1}, 298.15))
    assert alloy.phases[0].mixing == pytest.approx(-1718.3, abs=0.1)   # R·T·ln(1/2) at 298.15 K [J/mol]
    apart = material_diagram({"Fe": 0.5, "Ni": 0.5}, mixing="none").assemblage_at(7.0, -1.0)
    assert apart.name == "Fe + Ni"


def test_regular_solution_excess_is_symmetric_and_peaks_at_half():
    pair = Interaction(("A", "B"), ((10000.0, 0.0),), "x")
    assert pair.excess(0.5, 0.5, 300.0) == pytest.approx(2500.0)
    assert pair.excess(0.2, 0.8, 300.0) == pytest.approx(pair.excess(0.8, 0.2, 300.0))


def test_point_answers_and_window_fractions():
    d = material_diagram({"Ni": 0.7, "Cu": 0.3})
    fates = {c.element: c for c in d.components_over(np.array([[1.0, -0.1], [3.0, -0.1], [3.0, 0.1], [1.0, 0.1]]))}
    assert fates["Ni"].region == "corrosion" and fates["Ni"].fractions == {"Ni^2+": pytest.approx(1.0)}
    assert fates["Cu"].region == "immunity" and set(fates["Cu"].species) == {"Cu"}
    point = {c.element: c for c in d.components_over(np.array([[2.0, 0.0]]))}
    assert point["Ni"].species == ("Ni^2+",)
    segment = d.components_over(np.array([[2.0, -0.6], [2.0, 0.0]]))
    ni = segment[0]
    assert 0 < ni.region_fractions["immunity"] < 1 and ni.region == "corrosion"
    assert sum(ni.fractions.values()) == pytest.approx(1.0)


def test_bad_inputs_name_their_field():
    catalog = default_catalog()
    for bad in ({}, {"Xx": 1.0}, {"Fe": -1.0}, {"Fe": "a lot"}, {"Fe": 0.0}):
        with pytest.raises(Exception) as caught:
            check_composition(bad, catalog)
        assert getattr(caught.value, "field", None) in ("composition", "element")
    with pytest.raises(InputError, match="mixing"):
        material_diagram({"Fe": 1.0}, mixing="regular")
    with pytest.raises(InputError, match="composition"):
        parse_composition("Fe:0.7")
    with pytest.raises(InputError, match="amount of Fe"):
        parse_composition("Fe=lots")
    with pytest.raises(InputError, match="ph"):
        material_diagram({"Fe": 1.0}, window=PlotLimits(0, 14, -1, 1)).assemblage_at(15.0, 0.0)
    assert parse_composition("Fe=0.7,Cr=0.18,Ni=0.1,Mo=0.02") == {"Fe": 0.7, "Cr": 0.18, "Ni": 0.1, "Mo": 0.02}
