"""Kinetic water windows: Tafel onsets from published exchange currents and benchmark overpotentials."""

import math

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog
from electrosieve.engine.errors import CatalogError, InputError
from electrosieve.engine.diagram import diagram
from electrosieve.engine.kinetics import kinetic_table, load_kinetics, medium_of, onset_overpotential, tafel_overpotential
from electrosieve.engine.kinetics import kinetics as onsets

WATER = diagram("Pt").water
O2_LINE = WATER.oxygen_intercept - WATER.hydrogen_intercept  # 1.229 V at 25 °C (Bard, Parsons & Jordan 1985)
ACID = (0.0, 1.0)


def kinetics(material, ph, current_density=1.0, oxygen_reversible_v_rhe=O2_LINE):
    return onsets(material, ph, current_density, oxygen_reversible_v_rhe=oxygen_reversible_v_rhe)


def test_oxygen_line_is_the_standard_value():
    assert O2_LINE == pytest.approx(1.229, abs=0.001)
ALKALINE = (13.5, 14.0)


def test_every_row_names_a_material_of_the_catalog_and_a_known_source():
    catalog = default_catalog()
    table = load_kinetics(builtin_data_dir() / "kinetics.toml", catalog.sources)
    for reaction in (table.hydrogen, table.oxygen):
        for (material, _), row in reaction.items():
            assert material in catalog.materials, material
            assert row.source in catalog.sources


def test_checksum_of_the_data_file():
    # A deliberate edit of data/kinetics.toml updates these numbers.
    table = kinetic_table()
    assert (len(table.hydrogen), len(table.oxygen)) == (25, 13)
    assert math.isclose(sum(r.log10_j0 for r in table.hydrogen.values()), -167.6, abs_tol=1e-9)
    assert math.isclose(sum(r.overpotential_v for r in table.oxygen.values()), 6.03, abs_tol=1e-9)


def test_tafel_equation_worked_example():
    # Bard & Faulkner (2001), eq. 3.4.13: η = b·log10(j/j0); j0 = 1e-6 A cm^-2, b = 120 mV, j = 1 mA cm^-2 → 0.360 V.
    assert tafel_overpotential(1.0, -6.0, 120) == pytest.approx(0.360, abs=1e-12)
    # One decade more current costs one Tafel slope.
    assert tafel_overpotential(10.0, -6.0, 120) - tafel_overpotential(1.0, -6.0, 120) == pytest.approx(0.120)


def test_mercury_hydrogen_overpotential_matches_the_classic_value():
    # Hg in acid: η ≈ 1.0-1.1 V at 1 mA cm^-2 (Bockris & Reddy 2000, ch. 7; Trasatti 1972 j0 ≈ 10^-12.3 A cm^-2).
    k = kinetics("Hg", ACID)
    assert -1.2 < k.hydrogen_onset_v_rhe < -0.95


def test_platinum_evolves_hydrogen_at_the_reversible_potential():
    # Pt in acid: j0 ≈ 10^-3 A cm^-2 (Trasatti 1972), so at 1 mA cm^-2 the overpotential is a few mV at most.
    k = kinetics("Pt", ACID)
    assert abs(k.hydrogen_onset_v_rhe) < 0.02
    assert k.medium == "acid"


def test_hydrogen_overpotential_order_of_the_classic_cathodes():
    # Volcano order (Trasatti 1972): Pt-group < Ni, Fe < Cd, Zn < Pb, Hg in hydrogen overpotential.
    onset = {m: kinetics(m, ACID).hydrogen_onset_v_rhe for m in ("Pt", "Ni", "Fe", "Cd", "Pb", "Hg")}
    assert onset["Pt"] > onset["Ni"] > onset["Cd"] > onset["Pb"]
    assert onset["Fe"] > onset["Cd"] and onset["Ni"] > onset["Hg"]


def test_alkaline_oxygen_benchmark_is_reproduced_at_its_own_current_density():
    # McCrory et al. (2013), JACS 135, 16977: NiOx 0.42 V, IrOx 0.32 V at 10 mA cm^-2 in 1 M NaOH.
    assert kinetics("Ni", ALKALINE, 10.0).oxygen_onset_v_rhe == pytest.approx(O2_LINE + 0.42)
    assert kinetics("IrO2", ALKALINE, 10.0).oxygen_onset_v_rhe == pytest.approx(O2_LINE + 0.32)


def test_acid_oxygen_order_follows_the_oxide_volcano():
    # Trasatti (1984), Electrochim. Acta 29, 1503: RuO2 < IrO2 < Pt < PbO2-type in oxygen overpotential (roughly).
    onset = {m: kinetics(m, ACID).oxygen_onset_v_rhe for m in ("RuO2", "IrO2", "Pt")}
    assert onset["RuO2"] < onset["IrO2"] < onset["Pt"]


def test_unknown_stays_unknown_with_a_reason():
    k = kinetics("Os", ACID)
    assert k.hydrogen_onset_v_rhe is None and k.oxygen_onset_v_rhe is None and k.window_v is None
    assert any("no hydrogen-evolution data for Os in acid solution" in text for text in k.unknown)


def test_a_medium_without_data_is_unknown_not_borrowed_from_another():
    k = kinetics("Hg", (7.0, 7.0))
    assert k.medium == "neutral" and k.hydrogen_onset_v_rhe is None


def test_a_range_across_media_is_unknown_and_says_why():
    assert medium_of((2.0, 12.0)) is None
    k = kinetics("Pt", (2.0, 12.0))
    assert k.hydrogen_onset_v_rhe is None and "spans more than one medium" in k.unknown[0]


def test_uncertainty_propagates_from_the_exchange_current_and_slope():
    row = kinetic_table().hydrogen[("Hg", "acid")]
    onset = onset_overpotential(row, 1.0)
    decades = -3 - row.log10_j0
    expected = math.hypot(row.tafel_mv / 1000 * row.log10_j0_uncertainty, decades * row.tafel_uncertainty_mv / 1000)
    assert onset.uncertainty_v == pytest.approx(expected)
    assert kinetics("Hg", ACID).hydrogen_uncertainty_v == pytest.approx(expected)


def test_window_width_is_oxygen_minus_hydrogen_onset():
    k = kinetics("Pt", ACID)
    assert k.window_v == pytest.approx(k.oxygen_onset_v_rhe - k.hydrogen_onset_v_rhe)


def test_onsets_follow_the_oxygen_line_of_the_temperature():
    assert kinetics("IrO2", ACID, oxygen_reversible_v_rhe=O2_LINE - 0.029).oxygen_onset_v_rhe == pytest.approx(
        kinetics("IrO2", ACID).oxygen_onset_v_rhe - 0.029)


@pytest.mark.parametrize("given", [0.0, -1.0, 1e6, float("nan"), "1", True])
def test_a_bad_current_density_names_the_field(given):
    with pytest.raises(InputError) as caught:
        kinetics("Pt", ACID, given)
    assert caught.value.field == "current_density"


def test_a_row_needs_one_form_of_data(tmp_path):
    path = tmp_path / "kinetics.toml"
    path.write_text('[[hydrogen]]\nmaterial = "Pt"\nmedium = "acid"\ntafel_mv = 30\ntafel_uncertainty_mv = 5\n'
                    'source = "trasatti1972"\n')
    with pytest.raises(CatalogError, match="either log10_j0"):
        load_kinetics(path)
