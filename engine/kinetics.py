"""Each electrode's own water window: where hydrogen and oxygen evolution actually start on it.

The water lines say where water can react; the electrode material decides at what potential it does.
At a current density j the overpotential follows the Tafel equation (Bard & Faulkner 2001, eq. 3.4.13):

    η = b·log10(j / j0)

with the Tafel slope b [V/decade] and the exchange current density j0. Oxygen-evolution data are
published as an overpotential η_ref at a reference current density j_ref (the 10 mA cm^-2 benchmark
of McCrory et al. 2013), which is the same line: log10 j0 = log10 j_ref − η_ref/b. Onsets are reported
vs RHE: hydrogen at −η, oxygen at E(O2/H2O) + η. Below j0 the Tafel line does not hold and the
electrode is at its reversible potential (η = 0). Data live in ``data/kinetics.toml`` per material and
medium; a material without data stays unknown (None), never a default number.
"""

import math
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field, model_validator

from .catalog import builtin_data_dir
from .datafiles import Number, read_toml, validate_rows
from .diagram import check_number
from .errors import CatalogError

__all__ = ["DEFAULT_CURRENT_DENSITY", "CURRENT_DENSITY_RANGE", "Kinetics", "KineticTable", "Onset", "kinetics",
           "kinetic_table", "load_kinetics", "medium_of", "onset_overpotential", "tafel_overpotential"]

DEFAULT_CURRENT_DENSITY = 1.0
"""Current density at which onsets are reported unless the user says otherwise [mA cm^-2] (common practice)."""

CURRENT_DENSITY_RANGE = (1e-3, 1e4)
"""Current densities a user may ask for [mA cm^-2]: 1 µA cm^-2 to 10 A cm^-2."""

class MediumRow(BaseModel):
    """A pH band within which kinetic data of one medium apply."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    name: Literal["acid", "neutral", "alkaline"]
    ph_min: Number
    ph_max: Number


class RateRow(BaseModel):
    """One ``[[hydrogen]]`` or ``[[oxygen]]`` row: a Tafel line of one material in one medium."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    material: str
    medium: Literal["acid", "neutral", "alkaline"]
    tafel_mv: Number = Field(gt=0, description="Tafel slope [mV/decade]")
    tafel_uncertainty_mv: Number = Field(ge=0)
    log10_j0: Number | None = Field(None, description="log10 of the exchange current density [A cm^-2]")
    log10_j0_uncertainty: Number | None = Field(None, ge=0)
    overpotential_v: Number | None = Field(None, ge=0, description="overpotential at at_ma_cm2 [V]")
    at_ma_cm2: Number | None = Field(None, gt=0)
    overpotential_uncertainty_v: Number | None = Field(None, ge=0)
    source: str
    from_memory: bool = False
    note: str = ""

    @model_validator(mode="after")
    def _one_form(self) -> "RateRow":
        by_j0 = self.log10_j0 is not None and self.log10_j0_uncertainty is not None
        by_point = None not in (self.overpotential_v, self.at_ma_cm2, self.overpotential_uncertainty_v)
        if by_j0 == by_point:
            raise ValueError("give either log10_j0 with log10_j0_uncertainty, or overpotential_v, at_ma_cm2 "
                             "and overpotential_uncertainty_v")
        return self


@dataclass(frozen=True)
class KineticTable:
    """The kinetic data: media bands and Tafel lines keyed by (material, medium)."""

    media: tuple[MediumRow, ...]
    hydrogen: dict[tuple[str, str], RateRow]
    oxygen: dict[tuple[str, str], RateRow]


@dataclass(frozen=True)
class Onset:
    """An overpotential [V, ≥ 0] at a current density and its uncertainty [V, one standard uncertainty]."""

    overpotential_v: float
    uncertainty_v: float


@dataclass(frozen=True)
class Kinetics:
    """Where water reacts on one material at ``current_density_ma_cm2`` [mA cm^-2], vs RHE [V].

    ``None`` where there is no data; ``unknown`` says why in plain words. ``sources`` are keys of
    ``data/sources.toml``; uncertainties [V] propagate those of j0 (or η_ref) and of the Tafel slope.
    """

    current_density_ma_cm2: float
    hydrogen_onset_v_rhe: float | None
    oxygen_onset_v_rhe: float | None
    sources: tuple[str, ...]
    hydrogen_uncertainty_v: float | None = None
    oxygen_uncertainty_v: float | None = None
    medium: str | None = None
    unknown: tuple[str, ...] = ()

    @property
    def window_v(self) -> float | None:
        """Width of the material's own water window, oxygen onset − hydrogen onset [V]; None if either is unknown."""
        if self.hydrogen_onset_v_rhe is None or self.oxygen_onset_v_rhe is None:
            return None
        return self.oxygen_onset_v_rhe - self.hydrogen_onset_v_rhe


def tafel_overpotential(current_density_ma_cm2: float, log10_j0: float, tafel_mv: float) -> float:
    """η = b·log10(j/j0) [V], floored at 0 below j0 (Bard & Faulkner 2001, eq. 3.4.13).

    ``log10_j0`` [log10 A cm^-2], ``tafel_mv`` [mV/decade].

    >>> round(tafel_overpotential(1.0, -12.3, 118), 3)   # mercury in acid at 1 mA cm^-2
    1.097
    >>> tafel_overpotential(1.0, -2.0, 30)                # below j0: reversible
    0.0
    """
    decades = math.log10(current_density_ma_cm2 / 1000.0) - log10_j0
    return max(0.0, tafel_mv / 1000.0 * decades)


def onset_overpotential(row: RateRow, current_density_ma_cm2: float) -> Onset:
    """The overpotential of one Tafel line at ``current_density_ma_cm2`` [mA cm^-2], with its uncertainty.

    u(η)² = (b·u(log j0))² + (log10(j/j0)·u(b))², or from a reference point
    u(η)² = u(η_ref)² + (log10(j/j_ref)·u(b))² (first-order propagation, GUM, JCGM 100:2008).
    """
    b = row.tafel_mv / 1000.0
    u_b = row.tafel_uncertainty_mv / 1000.0
    if row.log10_j0 is not None:
        decades = math.log10(current_density_ma_cm2 / 1000.0) - row.log10_j0
        eta = max(0.0, b * decades)
        spread = math.hypot(b * row.log10_j0_uncertainty, max(decades, 0.0) * u_b)
        return Onset(eta, spread)
    decades = math.log10(current_density_ma_cm2 / row.at_ma_cm2)
    eta = max(0.0, row.overpotential_v + b * decades)
    return Onset(eta, math.hypot(row.overpotential_uncertainty_v, decades * u_b))


def load_kinetics(path: Path, sources: dict | None = None) -> KineticTable:
    """Read ``kinetics.toml``; each (material, medium) once per reaction, each source key known."""
    document = read_toml(path)
    media = tuple(validate_rows(path, document.get("medium", []), MediumRow, "medium"))
    tables = {}
    for reaction in ("hydrogen", "oxygen"):
        table: dict[tuple[str, str], RateRow] = {}
        for row in validate_rows(path, document.get(reaction, []), RateRow, reaction):
            where = f"{path}: {reaction} {row.material!r} ({row.medium})"
            if (row.material, row.medium) in table:
                raise CatalogError(f"{where}: appears twice")
            if sources is not None and row.source not in sources:
                raise CatalogError(f"{where}: field 'source': unknown source key {row.source!r}")
            table[(row.material, row.medium)] = row
        tables[reaction] = table
    return KineticTable(media=media, **tables)


@lru_cache(maxsize=4)
def kinetic_table(data_dir: Path | None = None) -> KineticTable:
    """The kinetic data of the built-in ``data/`` directory (or of ``data_dir``), read once."""
    base = Path(data_dir) if data_dir else builtin_data_dir()
    return load_kinetics(base / "kinetics.toml", read_toml(base / "sources.toml"))


def medium_of(ph: tuple[float, float], table: KineticTable | None = None) -> str | None:
    """The medium whose pH band holds the whole range ``ph``, or None when the range spans two.

    >>> medium_of((0.0, 1.0)), medium_of((13.5, 14.0)), medium_of((2.0, 12.0))
    ('acid', 'alkaline', None)
    """
    table = table or kinetic_table()
    for medium in table.media:
        if medium.ph_min <= ph[0] and ph[1] <= medium.ph_max:
            return medium.name
    return None


def kinetics(material: str, ph: tuple[float, float], current_density_ma_cm2: float = DEFAULT_CURRENT_DENSITY, *,
             oxygen_reversible_v_rhe: float, table: KineticTable | None = None) -> Kinetics:
    """Hydrogen and oxygen onsets vs RHE [V] of ``material`` (an id of ``materials.toml``) over pH ``ph``.

    ``oxygen_reversible_v_rhe`` is E(O2/H2O) − E(H+/H2) at the cell's temperature [V]
    (``WaterLines.oxygen_intercept − WaterLines.hydrogen_intercept``); the kinetic data themselves are at 25 °C.

    >>> from electrosieve.engine.diagram import diagram
    >>> water = diagram("Pt").water
    >>> k = kinetics("Pt", (0.0, 1.0), oxygen_reversible_v_rhe=water.oxygen_intercept - water.hydrogen_intercept)
    >>> round(k.hydrogen_onset_v_rhe, 3), round(k.oxygen_onset_v_rhe, 2), k.medium
    (-0.003, 1.76, 'acid')
    """
    table = table or kinetic_table()
    j = check_number(current_density_ma_cm2, "current_density", *CURRENT_DENSITY_RANGE, what=" mA cm^-2")
    medium = medium_of(ph, table)
    if medium is None:
        why = f"pH {ph[0]:g} to {ph[1]:g} spans more than one medium; kinetic data hold within one"
        return Kinetics(j, None, None, (), unknown=(f"hydrogen onset unknown: {why}", f"oxygen onset unknown: {why}"))
    onsets, sources, unknown = {}, [], []
    for reaction, words in (("hydrogen", "hydrogen-evolution"), ("oxygen", "oxygen-evolution")):
        row = getattr(table, reaction).get((material, medium))
        if row is None:
            unknown.append(f"{reaction} onset unknown: no {words} data for {material} in {medium} solution")
            continue
        onsets[reaction] = onset_overpotential(row, j)
        sources.append(row.source)
    hydrogen, oxygen = onsets.get("hydrogen"), onsets.get("oxygen")
    return Kinetics(
        current_density_ma_cm2=j,
        hydrogen_onset_v_rhe=None if hydrogen is None else -hydrogen.overpotential_v,
        oxygen_onset_v_rhe=None if oxygen is None else oxygen_reversible_v_rhe + oxygen.overpotential_v,
        sources=tuple(dict.fromkeys(sources)),
        hydrogen_uncertainty_v=None if hydrogen is None else hydrogen.uncertainty_v,
        oxygen_uncertainty_v=None if oxygen is None else oxygen.uncertainty_v,
        medium=medium, unknown=tuple(unknown))
