"""The ionic product of water, the saturated-liquid density and pressure, and neutral pH against published values.

Published values here are recalled from the papers (from memory), to the
digits printed there; the general-purpose libraries (thermo, chemicals) are
independent implementations of the same IAPWS formulations.
"""

import math

import pytest

from electrosieve.engine import kw
from electrosieve.engine.constants import ZERO_CELSIUS
from electrosieve.engine.datafiles import read_toml
from electrosieve.engine.catalog import builtin_data_dir

# IAPWS R11-07 (2007), Table 3: "values for verification of computer programs", pKw at (T [K], ρ [kg/m³]).
# From memory; the thermo library's docstring of Kweq_IAPWS quotes the (600 K, 700 kg/m³) value, 11.203153.
IAPWS_CHECK_VALUES = [
    (300.0, 1000.0, 13.906565),
    (600.0, 70.0, 21.048874),
    (600.0, 700.0, 11.203153),
    (800.0, 200.0, 15.089765),
    (800.0, 1200.0, 6.438330),
]

# Bandura & Lvov (2006), J. Phys. Chem. Ref. Data 35, 15, table of pKw of liquid water: at 0.1 MPa up to
# 100 °C, on the saturation curve at 150 °C (from memory, printed to 3 decimals). The engine uses the
# saturated-liquid density throughout, which moves pKw by < 0.001 below 100 °C.
BANDURA_LVOV_TABLE = [
    (0.0, 14.946),
    (25.0, 13.995),
    (100.0, 12.252),
    (150.0, 11.641),
]


@pytest.mark.parametrize(("temperature_k", "density", "expected"), IAPWS_CHECK_VALUES)
def test_pkw_reproduces_the_iapws_check_values(temperature_k, density, expected):
    # IAPWS R11-07 Table 3, given to 6 decimals: agreement to 1e-6 proves every coefficient.
    assert kw.pkw(temperature_k, density) == pytest.approx(expected, abs=1.5e-6)


@pytest.mark.parametrize(("celsius", "expected"), BANDURA_LVOV_TABLE)
def test_pkw_of_liquid_water_matches_the_published_table(celsius, expected):
    assert kw.pkw(celsius + ZERO_CELSIUS) == pytest.approx(expected, abs=0.002)


@pytest.mark.parametrize("celsius", [0.0, 25.0, 60.0, 100.0, 150.0])
def test_pkw_matches_a_reference_library_with_its_iapws95_density(celsius):
    # thermo.electrochem.Kweq_IAPWS (Bandura & Lvov 2006) with the IAPWS-95 density of chemicals.iapws:
    # at 0.1 MPa below 100 °C, saturated liquid at and above 100 °C (as the issue asks).
    electrochem = pytest.importorskip("thermo.electrochem")
    iapws = pytest.importorskip("chemicals.iapws")
    temperature = celsius + ZERO_CELSIUS
    density = iapws.iapws95_rho(temperature, 1e5) if celsius < 100 else iapws.iapws95_rhol_sat(temperature)
    library = -math.log10(electrochem.Kweq_IAPWS(temperature, density))
    assert kw.pkw(temperature, density) == pytest.approx(library, abs=1e-9)   # same equation, same density
    assert kw.pkw(temperature) == pytest.approx(library, abs=0.001)           # the engine's own density


@pytest.mark.parametrize("celsius", [0.01, 25.0, 60.0, 100.0, 150.0])
def test_saturated_liquid_density_matches_iapws95(celsius):
    # Wagner & Pruss 1993 eq. 2 is a fit to IAPWS-95 saturated liquid within about 0.0001 relative.
    iapws = pytest.importorskip("chemicals.iapws")
    temperature = celsius + ZERO_CELSIUS
    assert kw.saturated_liquid_density(temperature) == pytest.approx(iapws.iapws95_rhol_sat(temperature), rel=1e-4)


def test_saturated_density_and_pressure_at_100_c_match_the_steam_tables():
    # IAPWS-95 saturation table (Wagner & Pruss 2002, J. Phys. Chem. Ref. Data 31, 387), 373.15 K:
    # p = 0.101418 MPa, ρ' = 958.35 kg/m³ (from memory).
    assert kw.saturation_pressure(373.15) == pytest.approx(0.101418, rel=1e-4)
    assert kw.saturated_liquid_density(373.15) == pytest.approx(958.35, abs=0.02)


@pytest.mark.parametrize("celsius", [25.0, 100.0, 150.0])
def test_saturation_pressure_matches_iapws95(celsius):
    iapws = pytest.importorskip("chemicals.iapws")
    temperature = celsius + ZERO_CELSIUS
    assert kw.saturation_pressure(temperature) * 1e6 == pytest.approx(iapws.iapws95_Psat(temperature), rel=1e-4)


def test_density_at_0_1_mpa_instead_of_saturation_moves_pkw_by_less_than_0_001():
    # The data file's claim: below 100 °C, saturated-liquid density stands in for 0.1 MPa.
    iapws = pytest.importorskip("chemicals.iapws")
    for celsius in (0.0, 25.0, 60.0, 95.0):
        temperature = celsius + ZERO_CELSIUS
        assert abs(kw.pkw(temperature) - kw.pkw(temperature, iapws.iapws95_rho(temperature, 1e5))) < 0.001


def test_neutral_ph_is_half_pkw_and_falls_with_temperature():
    # Definition of neutrality, a(H+) = a(OH-) (common practice); 7.00 at 25 °C to 3 digits, 6.1 near 100 °C.
    assert kw.neutral_ph(298.15) == pytest.approx(13.995 / 2, abs=0.001)
    values = [kw.neutral_ph(c + ZERO_CELSIUS) for c in (0, 25, 60, 80, 100, 150)]
    assert values == sorted(values, reverse=True)
    assert kw.neutral_ph(373.15) == pytest.approx(12.252 / 2, abs=0.001)   # Bandura & Lvov 2006 (memory)
    assert kw.kw(298.15) == pytest.approx(10 ** -13.995, rel=0.005)


def test_coefficients_live_in_the_data_file_with_resolvable_sources():
    document = read_toml(builtin_data_dir() / kw.WATER_PROPERTIES_FILE)
    sources = read_toml(builtin_data_dir() / "sources.toml")
    for table in document.values():
        assert table["source"] in sources
    assert set(kw.sources()) <= set(sources)
    assert document["ionization"]["n"] == 6   # Bandura & Lvov 2006, Table 2


def test_no_liquid_above_the_critical_point():
    with pytest.raises(ValueError):
        kw.saturated_liquid_density(700.0)
    with pytest.raises(ValueError):
        kw.saturation_pressure(650.0)
