"""How robust is a verdict: the probability it holds when the Gibbs energies vary within their uncertainties.

Each draw shifts every species' ΔGf° by a normal deviate of standard deviation ``Species.uncertainty``
(a documented default where none is stated; the element itself and water are exact): Monte Carlo
propagation of distributions (GUM Supplement 1, JCGM 101:2008), seeded, all draws at once with numpy.

Per draw the verdict is decided exactly, not on a grid. Φ_i(pH, E) is linear (``engine.planes``), so
where an unacceptable species lies below every acceptable one is the window clipped by half-planes: a
convex polygon (Pourbaix 1966, ch. 2; clipping as Sutherland & Hodgman 1974). The unacceptable side meets
the window exactly when one such polygon has positive area (or length, for a segment), and alike for the
acceptable side; a point window keeps the engine's tie rule (``engine.domains.stable_index_at``: the more
severe region wins). Species that no draw can bring to the lower envelope are set aside first, and a
verdict that no draw can change (each side surely met or surely missed) needs no draws at all.
"""

from dataclasses import dataclass, replace
from functools import lru_cache
from pathlib import Path

import numpy as np
from pydantic import BaseModel, ConfigDict, Field

from .catalog import builtin_data_dir
from .constants import KJ_PER_EV
from .datafiles import Number, read_toml
from .domains import SEVERITY, TIE
from .geometry import stack_areas
from .errors import CatalogError, InputError
from .planes import Planes

__all__ = ["VERDICTS", "Robustness", "RobustnessSettings", "robustness", "robustness_settings", "species_present"]

VERDICTS = ("acceptable", "partly acceptable", "rejected")
"""A window's verdict: wholly, partly or not at all in acceptable domains (the screen's words)."""

CLIP_SIGMA = 4.0
"""Deviates beyond this many standard deviations are set at it (a 6e-5 share of a normal distribution), so a species
that another beats everywhere in the window by more than both can move is set aside exactly."""


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


def _window_polygon(corners) -> np.ndarray:
    """The window's corners counter-clockwise (pH, E)."""
    corners = np.asarray(corners, dtype=float).reshape(-1, 2)
    if len(corners) >= 3 and float(stack_areas(corners[None])[0]) < 0:
        corners = corners[::-1]
    return corners


def _vertices(offsets: np.ndarray, ph_slope: np.ndarray, e_slope: np.ndarray, corners: np.ndarray,
              rows: np.ndarray, rivals: np.ndarray):
    """Where each species of ``rows`` lies at or below every species of ``rivals``, per draw.

    That set is the window cut by the half-planes A + B·pH + C·E ≤ 0 (A = Δoffset, B = Δph_slope,
    C = Δe_slope): a convex polygon whose vertices are window corners, crossings of a line A + B·pH + C·E = 0
    with a window edge, or crossings of two such lines. Returns (points (D, R, K, 2), feasible (D, R, K),
    (A (D, R, G), B (R, G), C (R, G))).
    """
    draws, count = len(offsets), len(rows)
    same = rows[:, None] == rivals[None, :]
    a = np.where(same, -1.0, offsets[:, rows, None] - offsets[:, None, rivals])  # a species never bars itself
    b = np.where(same, 0.0, ph_slope[rows, None] - ph_slope[None, rivals])
    c = np.where(same, 0.0, e_slope[rows, None] - e_slope[None, rivals])
    starts = corners if len(corners) > 2 else corners[:1]
    steps = np.roll(corners, -1, axis=0) - corners if len(corners) > 2 else corners[1:] - corners[:1]
    along = b[..., None] * steps[:, 0] + c[..., None] * steps[:, 1]
    at_start = a[..., None] + b[..., None] * starts[:, 0] + c[..., None] * starts[:, 1]
    with np.errstate(divide="ignore", invalid="ignore"):
        t = -at_start / along
    crossing_ok = (np.abs(along) > 1e-12) & (t >= -1e-12) & (t <= 1 + 1e-12)
    t = np.clip(np.where(crossing_ok, t, 0.0), 0.0, 1.0)
    crossings = starts + t[..., None] * steps
    rim = np.empty((draws, count, len(corners), 2))
    rim[:] = corners
    points = [rim, crossings.reshape(draws, count, -1, 2)]
    valid = [np.ones((draws, count, len(corners)), dtype=bool), crossing_ok.reshape(draws, count, -1)]
    if len(corners) > 2 and len(rivals) > 1:
        first, second = np.triu_indices(len(rivals), 1)
        det = b[:, first] * c[:, second] - b[:, second] * c[:, first]
        solvable = np.abs(det) > 1e-12
        safe = np.where(solvable, det, 1.0)
        x = (-a[..., first] * c[:, second] + a[..., second] * c[:, first]) / safe
        y = (-b[:, first] * a[..., second] + b[:, second] * a[..., first]) / safe
        meet = np.stack([x, y], axis=-1)
        rel = meet[..., None, :] - corners
        cross = steps[:, 0] * rel[..., 1] - steps[:, 1] * rel[..., 0]
        points.append(meet)
        valid.append(solvable & (cross >= -1e-12).all(axis=-1))
    points, valid = np.concatenate(points, axis=2), np.concatenate(valid, axis=2)
    slack = a[:, :, None, :] + b[:, None, :] * points[..., :1] + c[:, None, :] * points[..., 1:]
    return points, valid & (slack <= TIE).all(axis=-1), (a, b, c)


def _meets(offsets: np.ndarray, ph_slope: np.ndarray, e_slope: np.ndarray, corners: np.ndarray,
           rows: np.ndarray, rivals: np.ndarray) -> np.ndarray:
    """(D, R): does species ``rows[r]`` lie strictly below every rival over a positive share of the window?

    The mean of a convex polygon's vertices is interior when the polygon has positive area (or length),
    and lies on a bounding line when it is degenerate: one strict test at that mean decides.
    """
    points, feasible, (a, b, c) = _vertices(offsets, ph_slope, e_slope, corners, rows, rivals)
    count = feasible.sum(axis=2)
    mean = (points * feasible[..., None]).sum(axis=2) / np.maximum(count, 1)[..., None]
    slack = a + b * mean[..., :1] + c * mean[..., 1:]
    return (count > 0) & (slack < -TIE).all(axis=-1)


def species_present(planes: Planes, offsets: np.ndarray, corners) -> np.ndarray:
    """Which species meet the window in each draw: a (draws, species) boolean array.

    ``offsets`` (draws, species) replace ``planes.offset`` [eV per metal atom]; ``corners`` are the
    window's vertices [(pH, E vs SHE), …]: four (or more) for an area, two for a segment, one for a point.
    A species counts when its domain covers a positive share of the window (area or length); a point
    window takes the engine's tie rule.
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
    everyone = np.arange(n)
    return _meets(offsets, ph_slope, e_slope, corners, everyone, everyone)


def _sides_present(planes: Planes, offsets: np.ndarray, corners: np.ndarray, bad: np.ndarray,
                   known: tuple[bool, bool] = (False, False)) -> np.ndarray:
    """Index into :data:`VERDICTS` per draw. The unacceptable side meets the window exactly when one of its
    species lies below every acceptable species over a positive share (the bad envelope dips below the
    good one), and alike for the acceptable side: each side is weighed against the other side only.
    ``known`` = (bad side surely met, good side surely met) spares computing a side already decided."""
    if len(corners) == 1:
        return _verdicts(species_present(planes, offsets, corners), bad)
    good_rows, bad_rows = np.flatnonzero(~bad), np.flatnonzero(bad)
    args = (offsets, planes.ph_slope, planes.e_slope, corners)
    everywhere, nowhere = np.ones(len(offsets), dtype=bool), np.zeros(len(offsets), dtype=bool)

    def side(rows, rivals, surely):
        if not len(rows):
            return nowhere
        if surely or not len(rivals):
            return everywhere
        return _meets(*args, rows, rivals).any(axis=1)

    has_bad, has_good = side(bad_rows, good_rows, known[0]), side(good_rows, bad_rows, known[1])
    return np.where(~has_bad, 0, np.where(~has_good, 2, 1))


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
    names = list(planes.index_of)
    bad = np.array([(s.region not in accept or name in blocking) and name not in waived
                    for s, name in zip(species, names)])
    sigma = np.array([0.0 if s.is_element else (settings.default_uncertainty_kj_mol if s.uncertainty is None
                                                 else s.uncertainty) for s in species])
    spread = sigma / (KJ_PER_EV * planes.metal_atoms)
    corners = _window_polygon(corners)
    reach = CLIP_SIGMA * spread
    keep = _undominated(planes, corners, reach)
    if bad[keep].any() and not bad[keep].all() and not all(_surely_met(_subset(planes, keep), corners, reach[keep],
                                                                        bad[keep])):
        keep[keep] = _contenders(_subset(planes, keep), corners, reach[keep])
    contenders = _subset(planes, keep)
    bad = bad[keep]
    if verdict is None:
        nominal = _sides_present(contenders, contenders.offset[None, :], corners, bad)[0]
    elif verdict in VERDICTS:
        nominal = VERDICTS.index(verdict)
    else:
        raise InputError(f"verdict must be one of {', '.join(VERDICTS)} (given {verdict!r})", field="verdict")
    defaulted = tuple(name for s, name in zip(species, names) if s.uncertainty is None and not s.is_element)
    bad_sure, good_sure = _surely_met(contenders, corners, reach[keep], bad)
    bad_sure, good_sure = bad_sure or not bad.any(), good_sure or bad.all()  # a side with no contender is surely missed
    if bad_sure and good_sure:  # no draw can change the verdict
        fixed = 0 if not bad.any() else (2 if bad.all() else 1)
        return Robustness(verdict_probability=float(fixed == nominal), draws=draws, verdict=VERDICTS[nominal],
                          defaulted=defaulted)
    rng = np.random.default_rng(settings.seed if seed is None else seed)
    deviates = np.clip(rng.standard_normal((draws, len(species))), -CLIP_SIGMA, CLIP_SIGMA)
    offsets = (planes.offset + deviates * spread)[:, keep]
    outcome = _sides_present(contenders, offsets, corners, bad, known=(bad_sure and bad.any(), good_sure and not bad.all()))
    return Robustness(verdict_probability=float(np.mean(outcome == nominal)), draws=draws,
                      verdict=VERDICTS[nominal], defaulted=defaulted)


def _undominated(planes: Planes, corners: np.ndarray, reach: np.ndarray) -> np.ndarray:
    """A quick first sieve for :func:`_contenders`: species i is set aside when one species lies below it at
    every corner (so everywhere in the window: the difference is linear) by more than both can move."""
    values = planes.offset + planes.ph_slope * corners[:, :1] + planes.e_slope * corners[:, 1:]
    gap = (values[:, :, None] - values[:, None, :]).min(axis=0)
    return ~(gap > reach[:, None] + reach[None, :]).any(axis=1)


def _contenders(planes: Planes, corners: np.ndarray, reach: np.ndarray) -> np.ndarray:
    """Species that may be the most stable somewhere in the window in some draw (a boolean mask).

    Φ_i − min Φ over the window is least at a vertex of the domains clipped by the window (it is linear on
    each), found with the tabulated data. Species i cannot reach the lower envelope in any draw when that
    least gap exceeds what Φ_i can rise plus what the envelope can fall (``reach`` [eV per metal atom]:
    the clipped deviates' bound).
    """
    everyone = np.arange(len(reach))
    if len(corners) == 1:
        values = planes.offset + planes.ph_slope * corners[0, 0] + planes.e_slope * corners[0, 1]
        return values - values.min() <= reach + reach.max() + 1e-12
    points, feasible, _ = _vertices(planes.offset[None, :], planes.ph_slope, planes.e_slope, corners, everyone, everyone)
    points, feasible = points[0], feasible[0]
    values = planes.offset + planes.ph_slope * points[..., :1] + planes.e_slope * points[..., 1:]
    lowest = np.take_along_axis(values, everyone[:, None, None], axis=2)
    gaps = np.where(feasible[..., None], values - lowest, np.inf).min(axis=(0, 1))
    return gaps <= reach + reach.max() + 1e-12


def _surely_met(planes: Planes, corners: np.ndarray, reach: np.ndarray, bad: np.ndarray) -> tuple[bool, bool]:
    """(bad side surely met, good side surely met) in every draw.

    A side is surely met when at some probe — a corner, an edge's midpoint, the centre, or halfway from
    the centre to those — one of its species lies below every species of the other side by more than any
    draw can close (strictly, so the side holds a positive share of the window around that probe).
    """
    rim = np.concatenate([corners, (corners + np.roll(corners, -1, axis=0)) / 2])
    centre = corners.mean(axis=0)
    probes = np.concatenate([rim, (rim + centre) / 2, centre[None]])
    values = planes.offset + planes.ph_slope * probes[:, :1] + planes.e_slope * probes[:, 1:]
    highest, lowest = values + reach, values - reach
    good_top = np.where(bad, np.inf, highest).min(axis=1)
    bad_top = np.where(bad, highest, np.inf).min(axis=1)
    good_floor = np.where(bad, np.inf, lowest).min(axis=1)
    bad_floor = np.where(bad, lowest, np.inf).min(axis=1)
    return bool((bad_top < good_floor).any()), bool((good_top < bad_floor).any())


def _subset(planes: Planes, keep: np.ndarray) -> Planes:
    """The planes of the species flagged in ``keep`` only."""
    return replace(planes, species=tuple(s for s, k in zip(planes.species, keep) if k), offset=planes.offset[keep],
                   ph_slope=planes.ph_slope[keep], e_slope=planes.e_slope[keep],
                   metal_atoms=planes.metal_atoms[keep], dissolved=planes.dissolved[keep])
