"""Activity coefficients of dissolved ions: Pitzer's ion-interaction equations, Davies' form as fallback.

For a solution of cations c and anions a at molalities m [mol/kg] (Pitzer 1991, ch. 3, eqs. 1-9;
binary terms only, the mixing terms θ and ψ left out):

    ln γ_M = z_M²·F + Σ_a m_a (2 B_Ma + Z C_Ma) + |z_M| Σ_c Σ_a m_c m_a C_ca
    ln γ_X = z_X²·F + Σ_c m_c (2 B_cX + Z C_cX) + |z_X| Σ_c Σ_a m_c m_a C_ca
    φ − 1  = (2/Σm) [−A_φ I^{3/2}/(1 + b√I) + Σ_c Σ_a m_c m_a (B^φ_ca + Z C_ca)]
    F      = −A_φ [√I/(1 + b√I) + (2/b) ln(1 + b√I)] + Σ_c Σ_a m_c m_a B'_ca
    B      = β0 + β1 g(α1√I) + β2 g(α2√I),   g(x) = 2[1 − (1 + x) e^{−x}]/x²
    B'     = [β1 g'(α1√I) + β2 g'(α2√I)]/I,  g'(x) = −2[1 − (1 + x + x²/2) e^{−x}]/x²
    B^φ    = β0 + β1 e^{−α1√I} + β2 e^{−α2√I},  C = C^φ/(2√|z_c z_a|),  Z = Σ m_i |z_i|

and the water activity ln a_w = −φ·Σm·M_w. The Debye–Hückel slope is
A_φ = (1/3)(2π N_A ρ_w)^{1/2} [e²/(4π ε0 ε_r k T)]^{3/2}, with ρ_w from ``engine.kw`` and ε_r of
Malmberg & Maryott (1956). Parameters and their sources are read from ``data/pitzer.toml``.

Single-ion coefficients follow Pitzer's split of the equations above (the usual convention for
individual-ion activities with this model; measurable combinations are independent of it).

When a solute's own ion pair has no parameters, the Davies equation is used instead for every ion,
log10 γ_i = −A z_i² [√I/(1 + √I) − 0.3 I] with A = 3A_φ/ln 10 (Davies 1962), valid to I ≈ 0.5 mol/kg.
"""

import math
from dataclasses import dataclass
from functools import lru_cache

from pydantic import BaseModel, ConfigDict, Field

from .constants import FARADAY, GAS_CONSTANT, LN10, T_STANDARD, ZERO_CELSIUS
from .datafiles import Number, read_toml, validate_rows
from .errors import CatalogError
from .kw import saturated_liquid_density
from .catalog import builtin_data_dir

__all__ = ["IonPair", "PitzerData", "Activities", "ion_charge", "debye_huckel_slope", "relative_permittivity",
           "pitzer", "davies", "solution_activities", "mean_activity_coefficient", "pitzer_data",
           "WATER_MOLAR_MASS", "DAVIES_LIMIT", "PITZER", "DAVIES"]

PITZER_FILE = "pitzer.toml"
"""Data file of the Pitzer parameters."""

WATER_MOLAR_MASS = 0.01801528
"""Molar mass of water M_w [kg/mol] (IUPAC 2013 standard atomic weights: 2·1.00794 + 15.9994 g/mol)."""

AVOGADRO = 6.02214076e23
"""Avogadro constant N_A [1/mol] (CODATA 2018, exact)."""

VACUUM_PERMITTIVITY = 8.8541878128e-12
"""Vacuum permittivity ε0 [F/m] (CODATA 2018)."""

DAVIES_LIMIT = 0.5
"""Ionic strength [mol/kg] up to which the Davies equation is used without a warning (Davies 1962, ch. 3)."""

MAJOR_SHARE = 0.1
"""A pair whose scarcer ion carries at least this share of the ionic strength is checked against its fitted range."""

PITZER = "Pitzer ion-interaction model, binary parameters (Pitzer 1991)"
"""Name of the model, as shown to users."""

DAVIES = "Davies equation (extended Debye–Hückel form)"
"""Name of the fallback model, as shown to users."""


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True)


class PairRow(_Strict):
    """One ``[[pair]]`` of ``pitzer.toml``."""

    cation: str
    anion: str
    beta0: Number
    beta1: Number
    beta2: Number = 0.0
    cphi: Number
    alpha1: Number = 2.0
    alpha2: Number = 12.0
    dbeta0_dt: Number | None = None
    dbeta1_dt: Number | None = None
    dbeta2_dt: Number | None = None
    dcphi_dt: Number | None = None
    max_molality: Number = Field(gt=0)
    uncertainty: Number = Field(ge=0, description="relative error of the mean activity coefficient in range")
    source: str
    derivative_source: str | None = None
    from_memory: bool = False
    note: str = ""


@dataclass(frozen=True)
class IonPair:
    """Pitzer parameters of one cation–anion pair at 25 °C with their temperature derivatives [per K]."""

    cation: str
    anion: str
    beta0: float
    beta1: float
    beta2: float
    cphi: float
    alpha1: float
    alpha2: float
    derivatives: tuple[float, float, float, float] | None
    max_molality: float
    uncertainty: float
    source: str

    def at(self, temperature_k: float) -> tuple[float, float, float, float]:
        """(β0, β1, β2, C^φ) at ``temperature_k`` [K]: linear in T about 298.15 K, or the 25 °C values.

        >>> IonPair("Na^+", "Cl^-", 0.0765, 0.2664, 0.0, 0.00127, 2.0, 12.0,
        ...         (7.159e-4, 7.005e-4, 0.0, -1.054e-4), 6.0, 0.01, "x").at(308.15)[0]
        0.08365...
        """
        values = (self.beta0, self.beta1, self.beta2, self.cphi)
        if self.derivatives is None:
            return values
        delta = temperature_k - T_STANDARD
        return tuple(v + d * delta for v, d in zip(values, self.derivatives))  # type: ignore[return-value]


@dataclass(frozen=True, eq=False)
class PitzerData:
    """Everything read from ``pitzer.toml`` (hashed by identity, so it can key caches)."""

    pairs: dict[tuple[str, str], IonPair]
    b: float
    t_range_c: tuple[float, float]
    t_note: str
    dielectric: tuple[float, ...]
    dielectric_range_c: tuple[float, float]
    hso4: dict
    sources: tuple[str, ...]
    fallback_source: str


@dataclass(frozen=True)
class Activities:
    """Activity coefficients of every ion of a solution, and what the model said about itself.

    ``molalities`` and ``gammas`` are keyed by ion name (``Cu^2+``); ``ionic_strength`` [mol/kg];
    ``notes`` are the warnings a user must see (range exceeded, parameters missing).
    """

    molalities: dict[str, float]
    gammas: dict[str, float]
    ionic_strength: float
    osmotic_coefficient: float
    water_activity: float
    model: str
    notes: tuple[str, ...]

    def activity(self, ion: str) -> float:
        """a = γ·m of ``ion`` (0 when absent)."""
        return self.gammas.get(ion, 1.0) * self.molalities.get(ion, 0.0)


def ion_charge(name: str) -> int:
    """The charge of an ion written ``Cu^2+``, ``Cl^-``, ``SO4^2-``; 0 for a neutral name.

    >>> ion_charge("Cu^2+"), ion_charge("Cl^-"), ion_charge("SO4^2-"), ion_charge("B(OH)3")
    (2, -1, -2, 0)
    """
    _, caret, suffix = name.partition("^")
    if not caret:
        return 0
    if not suffix or suffix[-1] not in "+-" or not (suffix[:-1] == "" or suffix[:-1].isdigit()):
        raise ValueError(f"cannot read the charge of {name!r}: write it like Cu^2+ or SO4^2-")
    magnitude = int(suffix[:-1] or 1)
    return magnitude if suffix[-1] == "+" else -magnitude


@lru_cache(maxsize=1)
def pitzer_data() -> PitzerData:
    """The built-in Pitzer parameters, read and checked once."""
    return load_pitzer(builtin_data_dir() / PITZER_FILE)


def load_pitzer(path) -> PitzerData:
    """Read and validate a Pitzer parameter file."""
    document = read_toml(path)
    rows = validate_rows(path, document.get("pair", []), PairRow, "pair")
    try:
        model, dielectric, hso4 = document["model"], document["dielectric"], document["hso4"]
        b = float(model["b"])
        t_range = (float(model["t_min"]), float(model["t_max"]))
        coefficients = tuple(float(c) for c in dielectric["coefficients"])
        dielectric_range = (float(dielectric["t_min"]), float(dielectric["t_max"]))
        hso4 = {key: hso4[key] for key in ("log_k", "dh", "dcp", "uncertainty", "source")}
        sources = [model["source"], dielectric["source"], hso4["source"], document["hso4"].get("thermal_source")]
        fallback_source = str(model["fallback_source"])
    except (KeyError, TypeError, ValueError) as error:
        raise CatalogError(f"{path}: [model], [dielectric] and [hso4] need their fields ({error})") from None
    pairs = {}
    for row in rows:
        if ion_charge(row.cation) <= 0 or ion_charge(row.anion) >= 0:
            raise CatalogError(f"{path}: pair {row.cation}-{row.anion}: field 'cation'/'anion': a cation then an anion")
        if (row.cation, row.anion) in pairs:
            raise CatalogError(f"{path}: pair {row.cation}-{row.anion} appears twice")
        given = (row.dbeta0_dt, row.dbeta1_dt, row.dbeta2_dt, row.dcphi_dt)
        derivatives = None if all(d is None for d in given) else tuple(d or 0.0 for d in given)
        pairs[(row.cation, row.anion)] = IonPair(
            cation=row.cation, anion=row.anion, beta0=row.beta0, beta1=row.beta1, beta2=row.beta2, cphi=row.cphi,
            alpha1=row.alpha1, alpha2=row.alpha2, derivatives=derivatives, max_molality=row.max_molality,
            uncertainty=row.uncertainty, source=row.source)
        sources += [row.source, row.derivative_source]
    return PitzerData(pairs=pairs, b=b, t_range_c=t_range, t_note=str(model.get("t_note", "")),
                      dielectric=coefficients, dielectric_range_c=dielectric_range, hso4=hso4,
                      sources=tuple(dict.fromkeys(s for s in sources if s)), fallback_source=fallback_source)


def relative_permittivity(temperature_k: float, data: PitzerData | None = None) -> float:
    """Relative permittivity of water ε_r = Σ a_k t^k, t [°C] (Malmberg & Maryott 1956, eq. 1).

    >>> round(relative_permittivity(298.15), 2)
    78.3
    """
    t = temperature_k - ZERO_CELSIUS
    return sum(a * t ** k for k, a in enumerate((data or pitzer_data()).dielectric))


def debye_huckel_slope(temperature_k: float = T_STANDARD, data: PitzerData | None = None) -> float:
    """Osmotic Debye–Hückel slope A_φ [(kg/mol)^½] at ``temperature_k`` [K].

    A_φ = (1/3)(2π N_A ρ_w)^{1/2} [e²/(4π ε0 ε_r k T)]^{3/2} (Pitzer 1991, ch. 3, eq. 4).

    >>> round(debye_huckel_slope(298.15), 3)   # Pitzer (1991): 0.3915; Harvie et al. (1984): 0.392
    0.392
    """
    charge = FARADAY / AVOGADRO
    boltzmann = GAS_CONSTANT / AVOGADRO
    density = saturated_liquid_density(temperature_k)   # kg/m³
    bjerrum = charge ** 2 / (4.0 * math.pi * VACUUM_PERMITTIVITY * relative_permittivity(temperature_k, data)
                             * boltzmann * temperature_k)
    return math.sqrt(2.0 * math.pi * AVOGADRO * density) * bjerrum ** 1.5 / 3.0


def _g(x: float) -> float:
    return 2.0 * (1.0 - (1.0 + x) * math.exp(-x)) / x ** 2


def _g_prime(x: float) -> float:
    return -2.0 * (1.0 - (1.0 + x + x * x / 2.0) * math.exp(-x)) / x ** 2


def _ionic_strength(molalities: dict[str, float]) -> float:
    return 0.5 * sum(m * ion_charge(ion) ** 2 for ion, m in molalities.items())


def _water_activity(osmotic: float, molalities: dict[str, float]) -> float:
    return math.exp(-osmotic * WATER_MOLAR_MASS * sum(molalities.values()))


def pitzer(molalities: dict[str, float], temperature_k: float = T_STANDARD,
           data: PitzerData | None = None) -> Activities:
    """Activity coefficients of every ion in ``molalities`` [mol/kg] at ``temperature_k`` [K] (module docstring).

    Pairs without parameters count as zero interaction; those present above 0.01 mol/kg each are named
    in the notes.

    >>> a = pitzer({"H^+": 1.0, "Cl^-": 1.0})
    >>> round(math.sqrt(a.gammas["H^+"] * a.gammas["Cl^-"]), 3)   # Robinson & Stokes (1959): 0.809
    0.811
    """
    data = data or pitzer_data()
    ions = {ion: m for ion, m in molalities.items() if m > 0.0 and ion_charge(ion) != 0}
    cations = [ion for ion in ions if ion_charge(ion) > 0]
    anions = [ion for ion in ions if ion_charge(ion) < 0]
    ionic_strength = _ionic_strength(ions)
    total = sum(ions.values())
    if ionic_strength == 0.0:
        return Activities(molalities=dict(molalities), gammas={ion: 1.0 for ion in molalities}, ionic_strength=0.0,
                          osmotic_coefficient=1.0, water_activity=1.0, model=PITZER, notes=())
    root = math.sqrt(ionic_strength)
    slope = debye_huckel_slope(temperature_k, data)
    b = data.b
    z_sum = sum(m * abs(ion_charge(ion)) for ion, m in ions.items())
    terms: dict[tuple[str, str], tuple[float, float, float, float]] = {}   # B, B', B^φ, C per pair
    missing = []
    for c in cations:
        for a in anions:
            pair = data.pairs.get((c, a))
            if pair is None:
                if min(ions[c], ions[a]) > 0.01:
                    missing.append(f"{c}–{a}")
                continue
            beta0, beta1, beta2, cphi = pair.at(temperature_k)
            x1, x2 = pair.alpha1 * root, pair.alpha2 * root
            big_b = beta0 + beta1 * _g(x1) + beta2 * _g(x2)
            b_prime = (beta1 * _g_prime(x1) + beta2 * _g_prime(x2)) / ionic_strength
            b_phi = beta0 + beta1 * math.exp(-x1) + beta2 * math.exp(-x2)
            c_term = cphi / (2.0 * math.sqrt(abs(ion_charge(c) * ion_charge(a))))
            terms[(c, a)] = (big_b, b_prime, b_phi, c_term)
    f = -slope * (root / (1.0 + b * root) + 2.0 / b * math.log(1.0 + b * root))
    f += sum(ions[c] * ions[a] * t[1] for (c, a), t in terms.items())
    cc = sum(ions[c] * ions[a] * t[3] for (c, a), t in terms.items())
    gammas = {}
    for ion in ions:
        z = ion_charge(ion)
        partners = [(a, terms[(ion, a)]) for a in anions if (ion, a) in terms] if z > 0 else \
                   [(c, terms[(c, ion)]) for c in cations if (c, ion) in terms]
        ln_gamma = z * z * f + sum(ions[p] * (2.0 * t[0] + z_sum * t[3]) for p, t in partners) + abs(z) * cc
        gammas[ion] = math.exp(ln_gamma)
    osmotic = 1.0 + 2.0 / total * (-slope * ionic_strength ** 1.5 / (1.0 + b * root)
                                   + sum(ions[c] * ions[a] * (t[2] + z_sum * t[3]) for (c, a), t in terms.items()))
    for ion in molalities:
        gammas.setdefault(ion, 1.0)   # neutral solutes: activity coefficient 1 (no λ parameters held)
    notes = [f"no Pitzer parameters for {', '.join(missing)}: their interaction is taken as zero"] if missing else []
    notes += _range_notes(ions, temperature_k, data)
    return Activities(molalities=dict(molalities), gammas=gammas, ionic_strength=ionic_strength,
                      osmotic_coefficient=osmotic, water_activity=_water_activity(osmotic, ions),
                      model=PITZER, notes=tuple(notes))


def _range_notes(ions: dict[str, float], temperature_k: float, data: PitzerData) -> list[str]:
    """Warnings for a solution beyond the fitted molality of a pair present, or a temperature out of range."""
    notes = []
    ionic_strength = _ionic_strength(ions)
    t_c = temperature_k - ZERO_CELSIUS
    held = []
    for (c, a), pair in data.pairs.items():
        if c not in ions or a not in ions:
            continue
        zc, za = ion_charge(c), -ion_charge(a)
        share = min(ions[c] * zc * zc, ions[a] * za * za) / (2.0 * ionic_strength)
        if share < MAJOR_SHARE:
            continue
        fitted = 0.5 * pair.max_molality * (za * zc * zc + zc * za * za)   # I of the pure salt at max_molality
        if ionic_strength > fitted * 1.0001:
            notes.append(f"ionic strength {ionic_strength:.2f} mol/kg is beyond the range of the {c}–{a} parameters "
                         f"(fitted to {pair.max_molality:g} mol/kg, I = {fitted:.2f}): activities less certain")
        if pair.derivatives is None and abs(t_c - 25.0) > 5.0:
            held.append(f"{c}–{a}")
    if held:
        notes.append(f"no temperature derivatives for {', '.join(held)}: their 25 °C parameters are used at {t_c:g} °C")
    low, high = data.t_range_c
    if not low <= t_c <= high:
        notes.append(f"{t_c:g} °C is outside {low:g}–{high:g} °C, where the parameters' linear temperature "
                     f"dependence and the permittivity equation hold: activities are extrapolated")
    return notes


def davies(molalities: dict[str, float], temperature_k: float = T_STANDARD,
           data: PitzerData | None = None) -> Activities:
    """Activity coefficients by the Davies equation, log10 γ = −A z² [√I/(1 + √I) − 0.3 I] (Davies 1962).

    >>> round(davies({"Na^+": 0.01, "Cl^-": 0.01}).gammas["Na^+"], 3)
    0.902
    """
    ions = {ion: m for ion, m in molalities.items() if m > 0.0 and ion_charge(ion) != 0}
    ionic_strength = _ionic_strength(ions)
    a = 3.0 * debye_huckel_slope(temperature_k, data) / LN10
    root = math.sqrt(ionic_strength)
    shape = root / (1.0 + root) - 0.3 * ionic_strength
    gammas = {ion: 10.0 ** (-a * ion_charge(ion) ** 2 * shape) for ion in molalities}
    osmotic = 1.0   # Davies gives no osmotic coefficient; water activity from the ideal mixing term
    notes = []
    if ionic_strength > DAVIES_LIMIT:
        notes.append(f"ionic strength {ionic_strength:.2f} mol/kg is beyond the Davies equation's range "
                     f"(up to about {DAVIES_LIMIT:g} mol/kg): activities are rough")
    return Activities(molalities=dict(molalities), gammas=gammas, ionic_strength=ionic_strength,
                      osmotic_coefficient=osmotic, water_activity=_water_activity(osmotic, ions),
                      model=DAVIES, notes=tuple(notes))


def solution_activities(molalities: dict[str, float], own_pairs: list[tuple[str, str]],
                        temperature_k: float = T_STANDARD, data: PitzerData | None = None) -> Activities:
    """Pitzer's model when every pair in ``own_pairs`` (the solutes' own cation–anion pairs) has parameters,
    else the Davies equation with a note naming the pairs that lack them."""
    data = data or pitzer_data()
    lacking = [f"{c}–{a}" for c, a in own_pairs if (c, a) not in data.pairs]
    if not lacking:
        return pitzer(molalities, temperature_k, data)
    result = davies(molalities, temperature_k, data)
    note = f"no Pitzer parameters for {', '.join(lacking)}: the Davies equation is used instead"
    return Activities(**{**result.__dict__, "notes": (note, *result.notes)})


def mean_activity_coefficient(cation: str, anion: str, molality: float, temperature_k: float = T_STANDARD,
                              data: PitzerData | None = None) -> float:
    """γ± of the single electrolyte of ``cation`` and ``anion`` at ``molality`` [mol/kg of the salt].

    >>> round(mean_activity_coefficient("Na^+", "Cl^-", 1.0), 3)   # Robinson & Stokes (1959): 0.657
    0.655
    """
    zc, za = ion_charge(cation), -ion_charge(anion)
    nu_c, nu_a = za // math.gcd(zc, za), zc // math.gcd(zc, za)
    result = pitzer({cation: nu_c * molality, anion: nu_a * molality}, temperature_k, data)
    ln_mean = (nu_c * math.log(result.gammas[cation]) + nu_a * math.log(result.gammas[anion])) / (nu_c + nu_a)
    return math.exp(ln_mean)
