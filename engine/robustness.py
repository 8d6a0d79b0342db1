"""How robust is a verdict: the probability it holds when the Gibbs energies vary within their uncertainties.

Each draw shifts every species' ΔGf° by a normal deviate of standard deviation ``Species.uncertainty``
(a documented default where none is stated; the element itself and water are exact): Monte Carlo
propagation of distributions (GUM Supplement 1, JCGM 101:2008), seeded, all draws at once with numpy.

Per draw the verdict is decided exactly, not on a grid. Φ_i(pH, E) is linear (``engine.planes``), so the
part of the window where species i is the most stable is a convex polygon whose vertices are window
corners, crossings of a boundary Φ_i = Φ_j with a window edge, or triple points Φ_i = Φ_j = Φ_k inside
the window. All these candidates are evaluated; species i meets the window with positive area (or
length) exactly when the mean of the candidates where i is lowest lies strictly inside its domain (a
convex combination of all the polygon's vertices with positive weights is interior). A point window
keeps the engine's tie rule (``engine.domains.stable_index_at``: the more severe region wins).
"""

from dataclasses import dataclass
from functools import lru_cache
from itertools import combinations
from pathlib import Path

import numpy as np
from pydantic import BaseModel, ConfigDict, Field

from .catalog import builtin_data_dir
from .constants import KJ_PER_EV
from .datafiles import Number, read_toml
from .domains import SEVERITY, TIE
from .errors import CatalogError, InputError
from .planes import Planes

__all__ = ["VERDICTS", "Robustness", "RobustnessSettings", "robustness", "robustness_settings", "species_present"]

VERDICTS = ("acceptable", "partly acceptable", "rejected")
"""A window's verdict: wholly, partly or not at all in acceptable domains (the screen's words)."""

_CHUNK_VALUES = 2_000_000
"""Draws are evaluated in chunks of at most this many plane values (memory stays near 16 MB)."""


class RobustnessSettings(BaseModel):
    """``data/robustness.toml``: the default uncertainty [kJ/mol], the number of draws and the seed."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    default_uncertainty_kj_mol: Number = Field(gt=0)
    default_note: str
    draws: int = Field(ge=200)
    seed: int
    method_source: str


@lru_cache(maxsize=4)
def robustness_settings(data_dir: Path | None = None) -> RobustnessSettings:
    """The settings of the built-in ``data/`` directory (or of ``data_dir``), read once."""
    path = (Path(data_dir) if data_dir else builtin_data_dir()) / "robustness.toml"
    try:
        return RobustnessSettings.model_validate(read_toml(path))
    except ValueError as error:
        raise CatalogError(f"{path}: {error}") from None


@dataclass(frozen=True)
class Robustness:
    """The share of draws [0–1] whose verdict equals ``verdict``, out of ``draws``.

    ``defaulted`` names the species whose uncertainty was not stated and took the default.
    """

    verdict_probability: float
    draws: int
    verdict: str
    defaulted: tuple[str, ...] = ()


def _window_polygon(corners: np.ndarray) -> np.ndarray:
    """The window's corners counter-clockwise (pH, E)."""
    corners = np.asarray(corners, dtype=float).reshape(-1, 2)
    if len(corners) >= 3:
        x, y = corners[:, 0], corners[:, 1]
        if np.dot(x, np.roll(y, -1)) - np.dot(np.roll(x, -1), y) < 0:
            corners = corners[::-1]
    return corners


def _candidates(offsets: np.ndarray, ph_slope: np.ndarray, e_slope: np.ndarray,
                corners: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Every possible vertex of the domains inside the window, per draw: (points (D, C, 2), valid (D, C))."""
    draws, n = offsets.shape
    points = [np.broadcast_to(corners, (draws, len(corners), 2))]
    valid = [np.ones((draws, len(corners)), dtype=bool)]
    pairs = np.array(list(combinations(range(n), 2)), dtype=int).reshape(-1, 2)
    edges = [(corners[k], corners[(k + 1) % len(corners)]) for k in range(len(corners))] if len(corners) > 1 else []
    if len(corners) == 2:
        edges = edges[:1]
    d_offset = offsets[:, pairs[:, 0]] - offsets[:, pairs[:, 1]]
    d_ph = ph_slope[pairs[:, 0]] - ph_slope[pairs[:, 1]]
    d_e = e_slope[pairs[:, 0]] - e_slope[pairs[:, 1]]
    for start, end in edges:
        step = end - start
        along = d_ph * step[0] + d_e * step[1]
        at_start = d_offset + d_ph * start[0] + d_e * start[1]
        with np.errstate(divide="ignore", invalid="ignore"):
            t = -at_start / along
        ok = (np.abs(along) > 1e-12) & (t >= -1e-12) & (t <= 1 + 1e-12)
        t = np.clip(np.nan_to_num(t), 0.0, 1.0)
        points.append(start + t[..., None] * step)
        valid.append(ok)
    if len(corners) >= 3 and n >= 3:
        triples = np.array(list(combinations(range(n), 3)), dtype=int)
        i, j, k = triples.T
        matrix = np.stack([np.stack([ph_slope[i] - ph_slope[j], e_slope[i] - e_slope[j]], -1),
                           np.stack([ph_slope[i] - ph_slope[k], e_slope[i] - e_slope[k]], -1)], -2)
        solvable = np.abs(np.linalg.det(matrix)) > 1e-12
        matrix, triples = matrix[solvable], triples[solvable]
        if len(triples):
            i, j, k = triples.T
            rhs = -np.stack([offsets[:, i] - offsets[:, j], offsets[:, i] - offsets[:, k]], -1)
            inside_points = np.einsum("tab,dtb->dta", np.linalg.inv(matrix), rhs)
            starts, ends = corners, np.roll(corners, -1, axis=0)
            step = ends - starts
            rel = inside_points[:, :, None, :] - starts[None, None]
            cross = step[:, 0] * rel[..., 1] - step[:, 1] * rel[..., 0]
            points.append(inside_points)
            valid.append((cross >= -1e-12).all(-1))
    return np.concatenate(points, axis=1), np.concatenate(valid, axis=1)


def species_present(planes: Planes, offsets: np.ndarray, corners) -> np.ndarray:
    """Which species meet the window in each draw: a (draws, species) boolean array.

    ``offsets`` (draws, species) replace ``planes.offset`` [eV per metal atom]; ``corners`` are the
    window's vertices [(pH, E vs SHE), …]: four (or more) for an area, two for a segment, one for a point.
    Positive area (or length) counts; a point window takes the engine's tie rule.
    """
    offsets = np.atleast_2d(offsets)
    corners = _window_polygon(corners)
    ph_slope, e_slope = planes.ph_slope, planes.e_slope
    n = len(ph_slope)
    if len(corners) == 1:
        ph, e = corners[0]
        values = offsets + ph_slope * ph + e_slope * e
        tied = values <= values.min(axis=1, keepdims=True) + TIE
        severity = np.array([SEVERITY[s.region] for s in planes.species], dtype=float)
        score = np.where(tied, severity * (n + 1) - np.arange(n), -np.inf)
        return np.eye(n, dtype=bool)[np.argmax(score, axis=1)]
    present = []
    size = max(1, _CHUNK_VALUES // (n * (len(corners) + n * n * (len(corners) + n))))
    for first in range(0, len(offsets), size):
        chunk = offsets[first:first + size]
        points, valid = _candidates(chunk, ph_slope, e_slope, corners)
        values = chunk[:, None, :] + ph_slope * points[..., :1] + e_slope * points[..., 1:]
        lowest = values <= values.min(axis=2, keepdims=True) + TIE
        lowest &= valid[..., None]
        count = lowest.sum(axis=1)
        mean = np.einsum("dcs,dcx->dsx", lowest.astype(float), points) / np.maximum(count, 1)[..., None]
        at_mean = chunk[:, None, :] + ph_slope * mean[..., :1] + e_slope * mean[..., 1:]
        own = np.take_along_axis(at_mean, np.arange(n)[None, :, None], axis=2)[..., 0]
        others = np.where(np.eye(n, dtype=bool)[None], np.inf, at_mean).min(axis=2)
        present.append((count > 0) & (own < others - TIE))
    return np.concatenate(present, axis=0)


def _verdicts(present: np.ndarray, bad: np.ndarray) -> np.ndarray:
    """Index into :data:`VERDICTS` for each draw, from the species present and which of them are unacceptable."""
    has_bad = (present & bad).any(axis=1)
    has_good = (present & ~bad).any(axis=1)
    return np.where(~has_bad, 0, np.where(~has_good, 2, 1))


def robustness(planes: Planes, corners, accept, *, blocking=frozenset(), waived=frozenset(),
               verdict: str | None = None, draws: int | None = None, seed: int | None = None,
               settings: RobustnessSettings | None = None) -> Robustness:
    """The probability that the window's verdict holds over draws of the Gibbs energies.

    ``corners``: the window's vertices [(pH, E vs SHE), …]; ``accept``: acceptable regions; ``blocking``:
    species unacceptable whatever their region (e.g. insulating films for a role that passes current);
    ``waived``: species that do not count against the material (kinetically negligible, e.g. methane on
    carbon). ``verdict``: the verdict to test (one of :data:`VERDICTS`); by default the one found with the
    tabulated data. Draws shift ΔGf° [kJ/mol] by N(0, u²) and Φ by that over F per metal atom.

    >>> from electrosieve.engine.diagram import diagram
    >>> zinc = diagram("Zn")
    >>> robustness(zinc.planes, [(7.0, -1.2)], {"immunity"}).verdict_probability
    1.0
    """
    settings = settings or robustness_settings()
    draws = settings.draws if draws is None else int(draws)
    if draws < 1:
        raise InputError(f"draws must be a positive whole number (given {draws})", field="draws")
    accept = set(accept)
    unknown = accept - set(SEVERITY)
    if unknown:
        raise InputError(f"accept: unknown region {sorted(unknown)[0]!r}; allowed: {', '.join(SEVERITY)}", field="accept")
    species = planes.species
    bad = np.array([(s.region not in accept or s.name in blocking) and s.name not in waived for s in species])
    nominal = _verdicts(species_present(planes, planes.offset[None, :], corners), bad)[0]
    if verdict is not None:
        if verdict not in VERDICTS:
            raise InputError(f"verdict must be one of {', '.join(VERDICTS)} (given {verdict!r})", field="verdict")
        nominal = VERDICTS.index(verdict)
    sigma = np.array([0.0 if s.is_element else (settings.default_uncertainty_kj_mol if s.uncertainty is None
                                                 else s.uncertainty) for s in species])
    rng = np.random.default_rng(settings.seed if seed is None else seed)
    shifts = rng.standard_normal((draws, len(species))) * sigma / (KJ_PER_EV * planes.metal_atoms)
    outcome = _verdicts(species_present(planes, planes.offset + shifts, corners), bad)
    defaulted = tuple(s.name for s in species if s.uncertainty is None and not s.is_element)
    return Robustness(verdict_probability=float(np.mean(outcome == nominal)), draws=draws,
                      verdict=VERDICTS[nominal], defaulted=defaulted)
