"""The water lines and neutral pH at temperature against published values."""

import pytest

from electrosieve.engine import water
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import FARADAY, ZERO_CELSIUS, nernst_slope
from electrosieve.engine.diagram import diagram
from electrosieve.engine.kw import neutral_ph

# CODATA Key Values (Cox, Wagman & Medvedev 1989), S° at 298.15 K [J/(mol K)]: H2O(l) 69.95, H2(g) 130.680,
# O2(g) 205.152 (from memory). ΔfS°(H2O, l) = −163.31 J/(mol K), so d E°(O2/H2O)/dT = ΔfS°/(2F).
CODATA_DFS_WATER = 69.95 - 130.680 - 205.152 / 2
CODATA_SLOPE = CODATA_DFS_WATER / (2 * FARADAY)   # [V/K], −0.846 mV/K


def leroy_reversible_voltage(temperature_k: float) -> float:
    """Reversible water-splitting voltage [V] at 1 atm, LeRoy, Bowen & LeRoy (1980), J. Electrochem. Soc.
    127, 1954 (correlation of the NBS/JANAF data for liquid water, 0–250 °C; coefficients from memory)."""
    from math import log

    t = temperature_k
    return 1.5184 - 1.5421e-3 * t + 9.523e-5 * t * log(t) + 9.84e-8 * t * t


def test_reversible_o2_potential_is_1_229_v_at_25_c():
    # 1.229 V: Bard, Parsons & Jordan 1985, ch. 4 (O2 + 4H+ + 4e- = 2H2O).
    assert water.water_lines_at(298.15).oxygen(0.0) == pytest.approx(1.229, abs=0.0005)


def test_reversible_o2_potential_falls_by_0_85_mv_per_kelvin():
    lines = [water.water_lines_at(t) for t in (297.15, 299.15)]
    slope = (lines[1].oxygen_intercept - lines[0].oxygen_intercept) / 2.0
    assert slope == pytest.approx(CODATA_SLOPE, abs=0.01e-3)     # from the CODATA entropies
    assert slope == pytest.approx(-0.846e-3, abs=0.005e-3)       # Bratsch 1989, Table (from memory)


@pytest.mark.parametrize("celsius", [0.0, 60.0, 80.0, 100.0, 150.0])
def test_reversible_voltage_follows_the_published_correlation(celsius):
    temperature = celsius + ZERO_CELSIUS
    assert water.reversible_cell_voltage(temperature) == pytest.approx(leroy_reversible_voltage(temperature), abs=0.002)


@pytest.mark.parametrize("celsius", [0.0, 25.0, 80.0, 150.0])
def test_hydrogen_line_is_zero_at_ph_0_and_lines_follow_the_nernst_slope(celsius):
    # SHE = 0 at every temperature (IUPAC Green Book 2007, §2.13); slope RT ln10/F.
    temperature = celsius + ZERO_CELSIUS
    lines = water.water_lines_at(temperature)
    assert lines.hydrogen(0.0) == 0.0
    assert lines.slope == nernst_slope(temperature)
    assert lines.hydrogen(7.0) == pytest.approx(-7.0 * nernst_slope(temperature))
    assert lines.oxygen(14.0) - lines.hydrogen(14.0) == pytest.approx(lines.oxygen_intercept)


def test_nernst_slope_at_80_c():
    # RT ln10/F at 353.15 K = 0.070072 V (CODATA 2018 constants: 8.314462618·353.15·ln10/96485.33212).
    assert nernst_slope(353.15) == pytest.approx(0.070072, abs=1e-6)


def test_diagram_water_lines_move_with_temperature():
    cold, warm = diagram("Zn", temperature_c=25.0), diagram("Zn", temperature_c=80.0)
    assert cold.water.oxygen_intercept == pytest.approx(1.2288, abs=1e-4)
    assert warm.water.oxygen_intercept == pytest.approx(leroy_reversible_voltage(353.15), abs=0.002)
    assert warm.water.slope > cold.water.slope
    assert warm.water.neutral_ph == pytest.approx(neutral_ph(353.15))
    assert warm.water.neutral_ph == pytest.approx(6.30, abs=0.01)   # pKw(80 °C) = 12.60, Bandura & Lvov 2006 (memory)
    assert cold.water.neutral_ph == pytest.approx(6.998, abs=0.001)


def test_water_lines_at_25_c_unchanged():
    gibbs = default_catalog().water["H2O"].dgf
    assert water.water_lines_at(298.15) == water.water_lines(gibbs, 298.15)
    assert water.water_lines(gibbs).oxygen_intercept == -gibbs / (2 * FARADAY / 1000)


def test_conditions_note_names_saturation_pressure_only_above_100_c():
    assert "saturation" not in water.conditions_note(80.0)
    assert "1 bar" in water.conditions_note(25.0)
    # IAPWS-95 saturation pressure at 150 °C: 0.4762 MPa (Wagner & Pruss 2002, from memory).
    assert "4.76 bar" in water.conditions_note(150.0)
