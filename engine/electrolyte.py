"""Electrolyte recipes as users write them → the free ions, their activities and the pH at temperature.

A recipe is a sum of parts joined by ``+``; each part is an amount, a unit and a solute, or the name
of a medium (case does not matter)::

    1 M KOH                      30 wt% KOH                 0.5 M H2SO4 + 0.1 M CuSO4
    0.6 mol/kg NaCl              seawater + 10 mM CuSO4     saline

Units: ``M``, ``mM``, ``mol/L``, ``mmol/L`` and ``g/L`` (per litre of solution); ``mol/kg`` and
``mmol/kg`` (per kg of water); ``wt%`` (mass per cent of the whole solution; ``%`` is read the same).
Solutes and media are those of ``data/electrolytes.toml``. A recipe may mix per-litre and per-kg
parts, or per-kg parts and ``wt%``, but not ``wt%`` with per-litre parts.

Conversions: wt% to molality exactly, m_i = w_i/[M_i (1 − Σw)]. Molarity to molality through the
solution density ρ = ρ_w + Σ c_i (M_i − ρ_w V_i) from the apparent molar volumes at infinite dilution
V_i (Millero 1972), i.e. m_i = c_i/[ρ_w (1 − Σ c_i V_i)] with ρ_w of pure water at the temperature
(``engine.kw``). Apparent volumes grow by a few cm³/mol with concentration, so the molality is off by
under 0.5 % up to 1 M and by 1–2 % at 5 M for these solutes.

Speciation: strong electrolytes dissociate fully; water (Kw of IAPWS R11-07) and HSO4^- = H^+ + SO4^2-
(Pitzer, Roy & Silvester 1977) are solved with the activity coefficients of ``engine.activity`` by the
proton balance m(H+) + m(HSO4−) − m(OH−) = Σ acid protons − Σ base hydroxide. pH = −log10 a(H+).
"""

import math
import re
from dataclasses import dataclass
from functools import lru_cache

from pydantic import BaseModel, ConfigDict, Field

from .activity import DAVIES_LIMIT, PITZER, Activities, PitzerData, ion_charge, pitzer_data, solution_activities
from .constants import GAS_CONSTANT, T_STANDARD, ZERO_CELSIUS
from .datafiles import Number, read_toml, validate_rows
from .errors import CatalogError, InputError
from .kw import kw, pkw, saturated_liquid_density
from .catalog import builtin_data_dir
from .inputs import check_temperature

__all__ = ["Solute", "Medium", "Electrolyte", "electrolyte", "parse_recipe", "known_solutes", "known_media",
           "reachable_ph", "ph_warnings", "UNITS"]

ELECTROLYTES_FILE = "electrolytes.toml"
"""Data file of solutes and media."""

UNITS = {"M": ("molar", 1.0), "mM": ("molar", 1e-3), "mol/L": ("molar", 1.0), "mmol/L": ("molar", 1e-3),
         "g/L": ("mass_per_litre", 1.0), "mol/kg": ("molal", 1.0), "mmol/kg": ("molal", 1e-3),
         "wt%": ("mass_percent", 1.0), "%": ("mass_percent", 1.0)}
"""Units a recipe may use: kind and factor to mol/L, mol/kg, g/L or per cent."""

_PART = re.compile(r"^\s*(?P<amount>[0-9]*\.?[0-9]+(?:[eE][-+]?[0-9]+)?)\s*(?P<unit>[A-Za-z/%]+)\s+"
                   r"(?P<solute>[A-Za-z0-9()]+)\s*$")

STRONG_REFERENCE = 1.0
"""Molality [mol/kg] of the HCl and KOH solutions that :func:`reachable_ph` quotes."""


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True)


class SoluteRow(_Strict):
    formula: str
    ions: dict[str, int]
    molar_mass: Number = Field(gt=0)
    apparent_volume: Number
    volume_uncertainty: Number = Field(ge=0)
    solubility: Number | None = Field(None, gt=0)
    solubility_uncertainty: Number | None = Field(None, ge=0)
    solubility_note: str = ""
    source: str
    solubility_source: str | None = None
    from_memory: bool = False
    note: str = ""


class MediumRow(_Strict):
    name: str
    description: str
    ions: dict[str, Number] | None = None
    per_kg_solution: bool = False
    solution_salinity: Number | None = None
    recipe: str | None = None
    ph: Number | None = None
    ph_note: str = ""
    uncertainty: Number = Field(ge=0)
    source: str
    from_memory: bool = False


@dataclass(frozen=True)
class Solute:
    """A solute a recipe may name: the ions it gives, its molar mass [g/mol], apparent molar volume
    [cm³/mol] and solubility at 25 °C [mol/kg] (None when miscible)."""

    formula: str
    ions: tuple[tuple[str, int], ...]
    molar_mass: float
    apparent_volume: float
    solubility: float | None
    solubility_text: str
    source: str
    solubility_source: str | None


@dataclass(frozen=True)
class Medium:
    """A named medium: its ions [mol/kg of water] or its recipe, and the pH its buffer sets (or None)."""

    name: str
    description: str
    ions: tuple[tuple[str, float], ...]
    recipe: str | None
    ph: float | None
    ph_note: str
    source: str


@dataclass(frozen=True)
class Electrolyte:
    """What a recipe is at a temperature.

    ``ph`` = −log10 a(H+); ``ionic_strength`` [mol/kg]; ``activities`` and ``molalities`` of the free
    ions [mol/kg basis], H+ and OH− first; ``model`` names the activity model and ``validity`` its range;
    ``warnings`` are for the user; ``sources`` are keys of ``data/sources.toml``. ``ion_activities`` and
    ``ligand_activities(catalog.ligands)`` are what ``engine.diagram.diagram`` takes.
    """

    recipe: str
    temperature_c: float
    ph: float
    ionic_strength: float
    activities: dict[str, float]
    molalities: dict[str, float]
    water_activity: float
    model: str
    validity: str
    warnings: tuple[str, ...]
    sources: tuple[str, ...]

    @property
    def ion_activities(self) -> dict[str, float]:
        """Activities of the dissolved metal ions, keyed as the diagram's ``ion_activities`` expects."""
        return {ion: a for ion, a in self.activities.items()
                if ion_charge(ion) > 0 and ion not in ("H^+",) and a > 0.0}

    def ligand_activities(self, ligands) -> dict[str, float]:
        """Activities of the free ligands among ``ligands`` (names such as ``catalog.ligands`` holds: ``Cl^-``)."""
        return {ion: self.activities[ion] for ion in ligands if self.activities.get(ion, 0.0) > 0.0}


@dataclass(frozen=True, eq=False)
class _Data:
    solutes: dict[str, Solute]
    media: dict[str, Medium]


@lru_cache(maxsize=1)
def _data() -> _Data:
    path = builtin_data_dir() / ELECTROLYTES_FILE
    document = read_toml(path)
    solutes = {}
    for row in validate_rows(path, document.get("solute", []), SoluteRow, "solute"):
        charge = sum(n * ion_charge(ion) for ion, n in row.ions.items())
        if charge != 0:
            raise CatalogError(f"{path}: solute {row.formula}: field 'ions': charges do not balance ({charge:+d})")
        text = ""
        if row.solubility is not None:
            text = (f"{row.solubility:g} mol/kg at 25 °C ({row.solubility_note + '; ' if row.solubility_note else ''}"
                    f"{row.solubility_source})")
        solutes[row.formula.lower()] = Solute(
            formula=row.formula, ions=tuple(row.ions.items()), molar_mass=row.molar_mass,
            apparent_volume=row.apparent_volume, solubility=row.solubility, solubility_text=text, source=row.source,
            solubility_source=row.solubility_source)
    media = {}
    for row in validate_rows(path, document.get("medium", []), MediumRow, "medium"):
        if (row.ions is None) == (row.recipe is None):
            raise CatalogError(f"{path}: medium {row.name}: give either 'ions' or 'recipe'")
        ions = ()
        if row.ions is not None:
            water = 1.0 - (row.solution_salinity or 0.0) / 1000.0 if row.per_kg_solution else 1.0
            ions = tuple((ion, amount / water) for ion, amount in row.ions.items())
            imbalance = sum(m * ion_charge(ion) for ion, m in ions)
            if abs(imbalance) > 1e-3 * sum(m * abs(ion_charge(ion)) for ion, m in ions):
                raise CatalogError(f"{path}: medium {row.name}: field 'ions': charges do not balance")
        media[row.name.lower()] = Medium(name=row.name, description=row.description, ions=ions, recipe=row.recipe,
                                         ph=row.ph, ph_note=row.ph_note, source=row.source)
    return _Data(solutes=solutes, media=media)


def known_solutes() -> list[str]:
    """Formulas a recipe may name.

    >>> "KOH" in known_solutes()
    True
    """
    return [s.formula for s in _data().solutes.values()]


def known_media() -> list[str]:
    """Names of the media a recipe may name.

    >>> known_media()
    ['seawater', 'saline']
    """
    return [m.name for m in _data().media.values()]


@dataclass(frozen=True)
class _Part:
    solute: Solute | None
    medium: Medium | None
    kind: str
    amount: float
    text: str


def parse_recipe(recipe: str, field: str = "electrolyte") -> tuple[_Part, ...]:
    """The parts of ``recipe``, or an :class:`InputError` naming ``field`` and what is allowed.

    >>> [(p.solute.formula, p.kind, p.amount) for p in parse_recipe("0.5 M H2SO4 + 100 mM CuSO4")]
    [('H2SO4', 'molar', 0.5), ('CuSO4', 'molar', 0.1)]
    """
    if not isinstance(recipe, str) or not recipe.strip():
        raise InputError(f"{field} must be a recipe such as '1 M KOH' or '0.5 M H2SO4 + 0.1 M CuSO4' "
                         f"(given {recipe!r})", field=field)
    data = _data()
    parts = []
    for text in recipe.split("+"):
        text = " ".join(text.split())
        if text.lower() in data.media:
            parts.append(_Part(None, data.media[text.lower()], "medium", 1.0, text))
            continue
        match = _PART.match(text)
        if match is None:
            raise InputError(f"{field}: cannot read {text!r}: write an amount, a unit and a solute ('1 M KOH', "
                             f"'30 wt% KOH', '0.6 mol/kg NaCl') or a medium ({', '.join(known_media())})", field=field)
        unit, name = match["unit"], match["solute"]
        if unit not in UNITS:
            hint = " (write mol/kg for molal or M for molar)" if unit == "m" else ""
            raise InputError(f"{field}: unknown unit {unit!r} in {text!r}{hint}; units: {', '.join(UNITS)}",
                             field=field)
        solute = data.solutes.get(name.lower())
        if solute is None:
            raise InputError(f"{field}: unknown solute {name!r}; known solutes: {', '.join(known_solutes())}; "
                             f"media: {', '.join(known_media())}", field=field)
        kind, factor = UNITS[unit]
        amount = float(match["amount"]) * factor
        if not math.isfinite(amount) or amount <= 0.0:
            raise InputError(f"{field}: the amount of {solute.formula} must be positive (given {text!r})", field=field)
        parts.append(_Part(solute, None, kind, amount, text))
    kinds = {p.kind for p in parts}
    if "mass_percent" in kinds and kinds & {"molar", "mass_per_litre"}:
        raise InputError(f"{field}: give amounts per litre (M, g/L) or as wt%, not both in one recipe", field=field)
    return tuple(parts)


def _molalities(parts: tuple[_Part, ...], temperature_k: float, field: str) -> tuple[dict[str, float], dict, list]:
    """Molality of each ion [mol/kg] from the parts; also each solute's molality and the media used."""
    per_solute: dict[str, float] = {}
    solutes: dict[str, Solute] = {}
    media = []
    expanded = []
    for part in parts:
        if part.medium is not None:
            media.append(part.medium)
            if part.medium.recipe:
                expanded += parse_recipe(part.medium.recipe, field)
            continue
        expanded.append(part)
    percent = [p for p in expanded if p.kind == "mass_percent"]
    total_percent = sum(p.amount for p in percent)
    if total_percent >= 100.0:
        raise InputError(f"{field}: the mass per cents add up to {total_percent:g} %: no water is left", field=field)
    litre = [p for p in expanded if p.kind in ("molar", "mass_per_litre")]
    molar = {id(p): p.amount / p.solute.molar_mass if p.kind == "mass_per_litre" else p.amount for p in litre}
    volume_fraction = sum(molar[id(p)] * p.solute.apparent_volume / 1000.0 for p in litre)
    water_density = saturated_liquid_density(temperature_k) / 1000.0   # kg/L
    for p in expanded:
        if p.kind == "mass_percent":
            molality = p.amount / 100.0 / (p.solute.molar_mass / 1000.0 * (1.0 - total_percent / 100.0))
        elif p.kind == "molal":
            molality = p.amount
        else:
            molality = molar[id(p)] / (water_density * (1.0 - volume_fraction))
        per_solute[p.solute.formula] = per_solute.get(p.solute.formula, 0.0) + molality
        solutes[p.solute.formula] = p.solute
    for formula, molality in per_solute.items():
        solute = solutes[formula]
        if solute.solubility is not None and molality > solute.solubility * 1.0001:
            raise InputError(f"{field}: {molality:.3g} mol/kg {formula} is above its solubility, "
                             f"{solute.solubility_text}", field=field)
    ions: dict[str, float] = {}
    for formula, molality in per_solute.items():
        for ion, count in solutes[formula].ions:
            ions[ion] = ions.get(ion, 0.0) + count * molality
    for medium in media:
        for ion, molality in medium.ions:
            ions[ion] = ions.get(ion, 0.0) + molality
    return ions, solutes, media


def _hso4_constant(temperature_k: float, data: PitzerData) -> float:
    """K of HSO4^- = H^+ + SO4^2- at ``temperature_k`` [K]: van 't Hoff with a constant ΔrCp.

    ln K(T) = ln K0 − ΔrH/R (1/T − 1/T0) + ΔrCp/R (T0/T − 1 + ln(T/T0)).
    """
    h = data.hso4
    t0 = T_STANDARD
    ln_k = (h["log_k"] * math.log(10.0) - h["dh"] * 1000.0 / GAS_CONSTANT * (1.0 / temperature_k - 1.0 / t0)
            + h["dcp"] / GAS_CONSTANT * (t0 / temperature_k - 1.0 + math.log(temperature_k / t0)))
    return math.exp(ln_k)


def _speciate(ions: dict[str, float], fixed_ph: float | None, own_pairs: list[tuple[str, str]],
              temperature_k: float, data: PitzerData) -> Activities:
    """Free-ion molalities and activities: proton balance (or the fixed pH) solved with the activity model."""
    strong = {ion: m for ion, m in ions.items() if ion not in ("H^+", "OH^-", "SO4^2-")}
    proton_excess = ions.get("H^+", 0.0) - ions.get("OH^-", 0.0)
    sulfate = ions.get("SO4^2-", 0.0)
    water_k = kw(temperature_k)
    sulfate_k = _hso4_constant(temperature_k, data)
    gammas: dict[str, float] = {}
    water_activity = 1.0
    result = None
    for _ in range(200):
        def g(ion: str, gammas: dict = gammas) -> float:
            return gammas.get(ion, 1.0)

        def composition(m_h: float, g=g, water_activity: float = water_activity) -> dict[str, float]:
            ratio = m_h * g("H^+") * g("SO4^2-") / (sulfate_k * g("HSO4^-"))
            return {"H^+": m_h, "OH^-": water_k * water_activity / (m_h * g("H^+") * g("OH^-")),
                    "HSO4^-": sulfate * ratio / (1.0 + ratio), "SO4^2-": sulfate / (1.0 + ratio)}

        if fixed_ph is not None:
            free = composition(10.0 ** -fixed_ph / g("H^+"))
        else:
            low, high = -80.0, math.log(max(proton_excess, 0.0) + sulfate + 10.0)
            for _ in range(120):   # bisection on ln m(H+): the balance rises monotonically with m(H+)
                middle = 0.5 * (low + high)
                c = composition(math.exp(middle))
                if c["H^+"] + c["HSO4^-"] - c["OH^-"] > proton_excess:
                    high = middle
                else:
                    low = middle
            free = composition(math.exp(0.5 * (low + high)))
        molalities = {**strong, **{ion: m for ion, m in free.items() if m > 0.0 or ion in ("H^+", "OH^-")}}
        result = solution_activities(molalities, own_pairs, temperature_k, data)
        change = max(abs(math.log(result.gammas[ion] / g(ion))) for ion in result.gammas)
        gammas, water_activity = dict(result.gammas), result.water_activity
        if change < 1e-10:
            return result
    return Activities(**{**result.__dict__, "notes": (*result.notes, "activity coefficients did not converge to "
                                                      "1e-10 in 200 iterations: the last values are shown")})


def electrolyte(recipe: str, temperature_c: float = 25.0, field: str = "electrolyte") -> Electrolyte:
    """The free ions, activities and pH of ``recipe`` at ``temperature_c`` [°C] (module docstring).

    >>> e = electrolyte("0.01 mol/kg HCl")
    >>> round(e.ph, 2), round(e.ionic_strength, 4)
    (2.04, 0.01)
    """

    temperature_c = check_temperature(temperature_c)
    temperature_k = temperature_c + ZERO_CELSIUS
    data = pitzer_data()
    parts = parse_recipe(recipe, field)
    ions, solutes, media = _molalities(parts, temperature_k, field)
    warnings: list[str] = []
    fixed = [m for m in media if m.ph is not None]
    fixed_ph = fixed[0].ph if fixed else None
    acid_or_base = [s.formula for s in solutes.values() if any(ion in ("H^+", "OH^-") for ion, _ in s.ions)]
    if fixed and (acid_or_base or len(fixed) > 1):
        others = ", ".join(acid_or_base) or "another buffered medium"
        raise InputError(f"{field}: {fixed[0].name}'s pH is set by a buffer the engine does not model; it cannot be "
                         f"combined with {others}. Describe the solution by its solutes instead.", field=field)
    for medium in media:
        if medium.ph_note:
            warnings.append(f"{medium.name}: {medium.ph_note}")
    own_pairs = [(c, a) for s in solutes.values() for c, _ in s.ions if ion_charge(c) > 0
                 for a, _ in s.ions if ion_charge(a) < 0]
    if "SO4^2-" in ions and ("H^+" in ions or fixed_ph is not None):
        own_pairs.append(("H^+", "HSO4^-"))
    result = _speciate(ions, fixed_ph, own_pairs, temperature_k, data)
    warnings += result.notes
    ph = -math.log10(result.activity("H^+"))
    activities = {ion: result.activity(ion) for ion in ("H^+", "OH^-")}
    activities.update({ion: result.activity(ion) for ion in sorted(result.molalities) if ion not in activities
                       and result.molalities[ion] > 0.0})
    molalities = {ion: result.molalities[ion] for ion in activities}
    validity, sources = _validity(result, data, temperature_c)
    sources += [s.source for s in solutes.values()] + [m.source for m in media]
    sources += [s.solubility_source for s in solutes.values() if s.solubility_source]
    sources += ["bandura_lvov2006"]
    return Electrolyte(recipe=" + ".join(p.text for p in parts), temperature_c=temperature_c, ph=ph,
                       ionic_strength=result.ionic_strength, activities=activities, molalities=molalities,
                       water_activity=result.water_activity, model=result.model, validity=validity,
                       warnings=tuple(dict.fromkeys(warnings)), sources=tuple(dict.fromkeys(sources)))


def _validity(result: Activities, data: PitzerData, temperature_c: float) -> tuple[str, list[str]]:
    """The range of the model used, in words, and the source keys of the parameters that entered."""
    if result.model != PITZER:
        return f"ionic strength up to about {DAVIES_LIMIT:g} mol/kg", [data.fallback_source, data.sources[1]]
    used = [p for (c, a), p in data.pairs.items() if result.molalities.get(c, 0.0) > 0.0
            and result.molalities.get(a, 0.0) > 0.0]
    fitted = min((p.max_molality, f"{p.cation}–{p.anion}") for p in used) if used else None
    low, high = data.t_range_c
    text = f"{low:g}–{high:g} °C"
    if fitted:
        text = f"each pair up to the molality it was fitted to (narrowest: {fitted[1]}, {fitted[0]:g} mol/kg); " + text
    keys = list(data.sources[:3]) + [p.source for p in used]
    return text, keys


def reachable_ph(temperature_c: float = 25.0) -> tuple[float, float]:
    """The pH range [low, high] the engine can vouch for at ``temperature_c`` [°C]: the pH of HCl and KOH at
    the highest molalities their activity parameters were fitted to (6 and 5.5 mol/kg; Pitzer & Mayorga 1973).

    >>> low, high = reachable_ph(80.0)
    >>> round(low, 1), round(high, 1)
    (-1.1, 13.7)
    """
    return _reachable(float(temperature_c))


@lru_cache(maxsize=64)
def _reachable(temperature_c: float) -> tuple[float, float]:
    pairs = pitzer_data().pairs
    acid, base = pairs[("H^+", "Cl^-")].max_molality, pairs[("K^+", "OH^-")].max_molality
    return _strong_ph("H^+", "Cl^-", acid, temperature_c), _strong_ph("K^+", "OH^-", base, temperature_c)


@lru_cache(maxsize=128)
def _strong_ph(cation: str, anion: str, molality: float, temperature_c: float) -> float:
    """pH of a strong acid or base at ``molality`` [mol/kg] and ``temperature_c`` [°C]."""
    result = _speciate({cation: molality, anion: molality}, None, [(cation, anion)],
                       temperature_c + ZERO_CELSIUS, pitzer_data())
    return -math.log10(result.activity("H^+"))


def ph_warnings(ph: float, temperature_c: float = 25.0) -> tuple[str, ...]:
    """Warnings for a pH given by a user that water cannot reach, or reaches only in concentrated acid or
    caustic, at ``temperature_c`` [°C] (empty for ordinary values).

    Beyond :func:`reachable_ph` the pH "cannot be reached"; more than half a unit beyond 1 mol/kg HCl or
    KOH it needs concentrated acid or caustic, which is said with the activity it needs.

    >>> ph_warnings(14.0, 80.0)[0]
    'pH 14 cannot be reached at 80 °C: even 1 M KOH is about pH 12.5 there (pKw 12.6), and 5.5 mol/kg KOH, ...'
    >>> ph_warnings(12.0, 80.0)
    ()
    """
    t = float(temperature_c)
    low, high = reachable_ph(t)
    water = pkw(t + ZERO_CELSIUS)
    base = _strong_ph("K^+", "OH^-", STRONG_REFERENCE, t)
    acid = _strong_ph("H^+", "Cl^-", STRONG_REFERENCE, t)
    limits = pitzer_data().pairs
    if ph > high:
        return (f"pH {ph:g} cannot be reached at {t:g} °C: even 1 M KOH is about pH {base:.1f} there "
                f"(pKw {water:.1f}), and {limits[('K^+', 'OH^-')].max_molality:g} mol/kg KOH, the strongest caustic "
                f"the activity data cover, about pH {high:.1f}",)
    if ph < low:
        return (f"pH {ph:g} cannot be reached at {t:g} °C: even 1 M HCl is about pH {acid:.1f} there, and "
                f"{limits[('H^+', 'Cl^-')].max_molality:g} mol/kg HCl, the strongest acid the activity data cover, "
                f"about pH {low:.1f}",)
    if ph > base + 0.5:
        return (f"pH {ph:g} at {t:g} °C needs a hydroxide activity of about {10 ** (ph - water):.2g} "
                f"(pKw {water:.1f}): 1 M KOH is about pH {base:.1f} there; check that the electrolyte is that "
                "concentrated",)
    if ph < acid - 0.5:
        return (f"pH {ph:g} at {t:g} °C needs a hydrogen-ion activity of about {10 ** -ph:.2g}: 1 M HCl is about "
                f"pH {acid:.1f} there; check that the electrolyte is that concentrated",)
    return ()
