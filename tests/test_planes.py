"""Free-energy planes reproduce handbook standard potentials and the Nernst slope."""

import math

import pytest

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import nernst_slope, thermal_voltage
from electrosieve.engine.diagram import diagram

# Bard, Parsons & Jordan (1985), Standard Potentials in Aqueous Solution (IUPAC), chapters on Zn and Fe,
# recalled from memory; the same values are in the CRC Handbook's electrochemical series.
HANDBOOK_E0 = {
    ("Zn", "Zn^2+"): -0.762,
    ("Fe", "Fe^2+"): -0.447,
}


def _metal_ion_potential(element: str, ion: str, activity: float) -> float:
    """The potential where the metal and its ion have equal Φ at pH 0 (a vertical-free boundary)."""
    result = diagram(element, activity=activity)
    planes = result.planes
    names = [s.name for s in planes.species]
    i, j = names.index(element), names.index(ion)
    return float(-(planes.offset[j] - planes.offset[i]) / (planes.e_slope[j] - planes.e_slope[i]))


@pytest.mark.parametrize("element, ion", list(HANDBOOK_E0))
def test_standard_potential_matches_handbook(element, ion):
    assert _metal_ion_potential(element, ion, 1.0) == pytest.approx(HANDBOOK_E0[(element, ion)], abs=0.010)


@pytest.mark.parametrize("element, ion, charge", [("Zn", "Zn^2+", 2), ("Fe", "Fe^2+", 2)])
def test_potential_moves_by_nernst_slope_per_decade(element, ion, charge):
    # Nernst equation: E = E° + (RT ln10 / nF) log a (common practice).
    shift = _metal_ion_potential(element, ion, 1e-6) - _metal_ion_potential(element, ion, 1e-5)
    assert shift == pytest.approx(-nernst_slope() / charge, abs=1e-9)


def test_ferric_ferrous_couple_matches_handbook():
    # Bard, Parsons & Jordan (1985), iron chapter: Fe3+ + e- = Fe2+, E° = 0.771 V (from memory).
    catalog = default_catalog()
    fe2 = catalog.systems["Fe"].find("Fe^2+").dgf
    fe3 = catalog.systems["Fe"].find("Fe^3+").dgf
    assert -(fe2 - fe3) / 96.48533212 == pytest.approx(0.771, abs=0.010)


def test_solids_ignore_activity():
    low = diagram("Zn", activity=1e-8).planes
    high = diagram("Zn", activity=1.0).planes
    names = [s.name for s in low.species]
    zno = names.index("ZnO")
    assert low.offset[zno] == high.offset[zno]
    ion = names.index("Zn^2+")
    # RT ln(a2/a1) per metal atom (Nernst, common practice)
    assert high.offset[ion] - low.offset[ion] == pytest.approx(thermal_voltage() * math.log(1e8), rel=1e-12)
