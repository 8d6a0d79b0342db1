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

import zlib
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

import numpy as np
from pydantic import BaseModel, ConfigDict, Field

from .catalog import builtin_data_dir
from .constants import KJ_PER_EV
from .datafiles import Number, read_toml
from .domains import SEVERITY, TIE
from .errors import CatalogError, InputError
from .geometry import SLIVER, clip_stack, stack_areas
from .planes import Planes

__all__ = ["VERDICTS", "Question", "Robustness", "RobustnessSettings", "robustness", "robustness_many",
           "robustness_settings", "species_present"]

VERDICTS = ("acceptable", "partly acceptable", "rejected")
"""A window's verdict: wholly, partly or not at all in acceptable domains (the screen's words)."""

CLIP_SIGMA = 4.0
"""Deviates beyond this many standard deviations are set at it (a 6e-5 share of a normal distribution), so a species
that another beats everywhere in the window by more than both can move is set aside exactly."""


class RobustnessSettings(BaseModel):
    """``data/robustness.toml``: the number of draws, the seed and the fragile-verdict threshold."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    draws: int = Field(ge=200)
    seed: int
    method_source: str
    fragile_below: Number = Field(gt=0, le=1)


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

    Every species carries its own uncertainty (``Species.uncertainty``, filled from its data class where the
    compilation states none: ``data/uncertainty.toml``).
    """

    verdict_probability: float
    draws: int
    verdict: str


@dataclass(frozen=True, eq=False)
class Question:
    """One verdict to test: an element's planes, the species that count against the material, and the
    verdict to test (one of :data:`VERDICTS`; None for the one the tabulated data give)."""

    planes: Planes
    unacceptable: frozenset[str]
    verdict: str | None = None


INERT = 1e6
"""Φ offset [eV] of the padding that evens out element systems of different sizes: never the most stable."""


def _window_polygon(corners) -> np.ndarray:
    """The window's corners counter-clockwise (pH, E)."""
    corners = np.asarray(corners, dtype=float).reshape(-1, 2)
    if len(corners) >= 3 and float(stack_areas(corners[None])[0]) < 0:
        corners = corners[::-1]
    return corners


def _gather(values: np.ndarray, index: np.ndarray) -> np.ndarray:
    """values[b, index[b, k]] for every row b (index −1, padding, reads column 0)."""
    return np.take_along_axis(values, np.maximum(index, 0), axis=1)


def _extent(polygons: np.ndarray, corners: np.ndarray) -> np.ndarray:
    """Each polygon's share of the window: area over the window's area, or length over the segment's."""
    if len(corners) > 2:
        return stack_areas(polygons) / float(stack_areas(corners[None])[0])
    span = np.linalg.norm(polygons - polygons[:, :1, :], axis=-1).max(axis=1)
    return span / float(np.linalg.norm(corners[1] - corners[0]))


def _cells(off, ph, e, corners, rows, rivals) -> tuple[np.ndarray, np.ndarray]:
    """Where species ``rows[b, r]`` lies at or below every species ``rivals[b, g]`` (−1 pads either):
    the window clipped, row by row, by each rival's half-plane. Returns (polygons of the rows that kept any
    point, their flat indices into (batch, R))."""
    skip = (rivals[:, None, :] < 0) | (rows[:, :, None] == rivals[:, None, :])  # padding, or a species itself
    a = np.where(skip, -1.0, _gather(off, rows)[:, :, None] - _gather(off, rivals)[:, None, :]).reshape(-1, rivals.shape[1])
    b = np.where(skip, 0.0, _gather(ph, rows)[:, :, None] - _gather(ph, rivals)[:, None, :]).reshape(a.shape)
    c = np.where(skip, 0.0, _gather(e, rows)[:, :, None] - _gather(e, rivals)[:, None, :]).reshape(a.shape)
    alive = np.flatnonzero((rows >= 0).ravel())
    polygons = np.empty((len(alive), len(corners), 2))
    polygons[:] = corners
    for rival in range(a.shape[1]):
        polygons, kept = clip_stack(polygons, np.ones(len(alive), dtype=bool), a[alive, rival], b[alive, rival],
                                    c[alive, rival])
        polygons, alive = polygons[kept], alive[kept]
    return polygons, alive


def _meets(off, ph, e, corners, rows, rivals) -> np.ndarray:
    """(batch, R): does species ``rows[b, r]`` lie below every rival over a positive share of the window?

    What is left of the window after clipping (a convex polygon) must cover more than
    :data:`engine.geometry.SLIVER` of it (an area, or a length for a segment window): a touching point or
    line does not count.
    """
    polygons, alive = _cells(off, ph, e, corners, rows, rivals)
    met = np.zeros(rows.size, dtype=bool)
    met[alive] = _extent(polygons, corners) > SLIVER
    return met.reshape(rows.shape)


def _indices(mask: np.ndarray) -> np.ndarray:
    """Per row, the column indices where ``mask`` holds, padded with −1 to a common width (at least 1)."""
    width = max(int(mask.sum(axis=1).max(initial=0)), 1)
    order = np.argsort(~mask, axis=1, kind="stable")[:, :width]
    return np.where(np.take_along_axis(mask, order, axis=1), order, -1)


def _point_verdicts(off, ph, e, corners, bad, keep, severity) -> np.ndarray:
    """Verdict index per row for a point window: the engine's tie rule (the more severe region wins)."""
    values = np.where(keep, off + ph * corners[0, 0] + e * corners[0, 1], np.inf)
    tied = values <= values.min(axis=1, keepdims=True) + TIE
    n = values.shape[1]
    score = np.where(tied, severity * (n + 1) - np.arange(n), -np.inf)
    return np.where(np.take_along_axis(bad, np.argmax(score, axis=1)[:, None], axis=1)[:, 0], 2, 0)


def _side_verdicts(off, ph, e, corners, bad, keep, sure_bad, sure_good) -> np.ndarray:
    """Verdict index per row: each side meets the window when one of its species lies below every species
    of the other side over a positive share (the two envelopes cross), computed only where not already sure."""
    bad_rows, good_rows = _indices(bad & keep), _indices(~bad & keep)
    any_bad, any_good = (bad & keep).any(axis=1), (~bad & keep).any(axis=1)
    seen_bad, seen_good = _seen(off, ph, e, corners, bad, keep)
    has_bad = any_bad & (sure_bad | ~any_good | seen_bad)
    has_good = any_good & (sure_good | ~any_bad | seen_good)
    sure_bad, sure_good = sure_bad | seen_bad, sure_good | seen_good
    ask = any_bad & any_good & ~sure_bad
    if ask.any():
        has_bad[ask] = _meets(off[ask], ph[ask], e[ask], corners, bad_rows[ask], good_rows[ask]).any(axis=1)
    ask = any_bad & any_good & ~sure_good
    if ask.any():
        has_good[ask] = _meets(off[ask], ph[ask], e[ask], corners, good_rows[ask], bad_rows[ask]).any(axis=1)
    return np.where(~has_bad, 0, np.where(~has_good, 2, 1))


def _probes(corners: np.ndarray) -> np.ndarray:
    """Points of the window that show which side holds where: corners, edge midpoints, the centre and
    the points halfway from the centre to those."""
    rim = np.concatenate([corners, (corners + np.roll(corners, -1, axis=0)) / 2])
    centre = corners.mean(axis=0)
    return np.concatenate([rim, (rim + centre) / 2, centre[None]])


def _seen(off, ph, e, corners, bad, keep) -> tuple[np.ndarray, np.ndarray]:
    """(bad side seen, good side seen) per row: at some probe one side's species lies strictly lowest, so
    that side holds a positive share of the window there. Seeing decides presence; only absence needs
    the exact test."""
    probes = _probes(corners)[: 2 * len(corners)]
    probes = np.concatenate([probes, corners.mean(axis=0)[None]])  # corners, edge midpoints, centre
    values = np.where(keep[:, None, :], off[:, None, :] + ph[:, None, :] * probes[:, :1]
                      + e[:, None, :] * probes[:, 1:], np.inf)
    bad_low = np.where(bad[:, None, :], values, np.inf).min(axis=2)
    good_low = np.where(bad[:, None, :], np.inf, values).min(axis=2)
    return (bad_low < good_low - TIE).any(axis=1), (good_low < bad_low - TIE).any(axis=1)


def _surely_met(off, ph, e, corners, reach, bad, keep) -> tuple[np.ndarray, np.ndarray]:
    """(bad side surely met, good side surely met) per row, in every draw.

    A side is surely met when at some probe — a corner, an edge's midpoint, the centre, or halfway from
    the centre to those — one of its species lies below every species of the other side by more than any
    draw can close (strictly, so the side holds a positive share of the window around that probe).
    """
    probes = _probes(corners)
    values = off[:, None, :] + ph[:, None, :] * probes[:, :1] + e[:, None, :] * probes[:, 1:]
    highest, lowest = values + reach[:, None, :], values - reach[:, None, :]
    is_bad, is_good = (bad & keep)[:, None, :], (~bad & keep)[:, None, :]
    bad_top = np.where(is_bad, highest, np.inf).min(axis=2)
    good_top = np.where(is_good, highest, np.inf).min(axis=2)
    bad_floor = np.where(is_bad, lowest, np.inf).min(axis=2)
    good_floor = np.where(is_good, lowest, np.inf).min(axis=2)
    return (bad_top < good_floor).any(axis=1), (good_top < bad_floor).any(axis=1)


def _contenders(off, ph, e, corners, reach, keep) -> np.ndarray:
    """Species that may be the most stable somewhere in the window in some draw (a (batch, species) mask).

    Species i is first set aside when one species lies below it at every corner (so everywhere: the
    difference is linear) by more than both can move (``reach`` [eV per metal atom]: the clipped deviates'
    bound). Then exactly: Φ_i − min Φ over the window is least at a vertex of the domains clipped by the
    window (it is linear on each); i cannot reach the lower envelope in any draw when that least gap
    exceeds what Φ_i can rise plus what the envelope can fall.
    """
    values = off[:, None, :] + ph[:, None, :] * corners[:, :1] + e[:, None, :] * corners[:, 1:]
    gap = (values[:, :, :, None] - values[:, :, None, :]).min(axis=1)
    keep = keep & ~((gap > reach[:, :, None] + reach[:, None, :]) & keep[:, None, :]).any(axis=2)
    if len(corners) == 1:
        return keep
    everyone = _indices(keep)
    polygons, alive = _cells(off, ph, e, corners, everyone, everyone)
    batch = alive // everyone.shape[1]
    own = everyone.ravel()[alive]
    at = off[batch, None, :] + ph[batch, None, :] * polygons[..., :1] + e[batch, None, :] * polygons[..., 1:]
    gap = (at - np.take_along_axis(at, own[:, None, None], axis=2)).min(axis=1)
    least = np.full(off.shape, np.inf)
    np.minimum.at(least, batch, gap)
    return keep & (least <= reach + reach.max(axis=1, keepdims=True) + 1e-12)


def species_present(planes: Planes, offsets: np.ndarray, corners) -> np.ndarray:
    """Which species meet the window in each draw: a (draws, species) boolean array.

    ``offsets`` (draws, species) replace ``planes.offset`` [eV per metal atom]; ``corners`` are the
    window's vertices [(pH, E vs SHE), …]: four (or more) for an area, two for a segment, one for a point.
    A species counts when its domain covers a positive share of the window (area or length); a point
    window takes the engine's tie rule.
    """
    offsets = np.atleast_2d(offsets)
    corners = _window_polygon(corners)
    n, draws = len(planes.species), len(offsets)
    ph, e = np.broadcast_to(planes.ph_slope, offsets.shape), np.broadcast_to(planes.e_slope, offsets.shape)
    if len(corners) == 1:
        values = offsets + planes.ph_slope * corners[0, 0] + planes.e_slope * corners[0, 1]
        tied = values <= values.min(axis=1, keepdims=True) + TIE
        severity = np.array([SEVERITY[s.region] for s in planes.species], dtype=float)
        score = np.where(tied, severity * (n + 1) - np.arange(n), -np.inf)
        return np.eye(n, dtype=bool)[np.argmax(score, axis=1)]
    everyone = np.broadcast_to(np.arange(n), (draws, n))
    return _meets(offsets, ph, e, corners, everyone, everyone)


@lru_cache(maxsize=1024)
def _species_data(species: tuple) -> tuple[np.ndarray, np.ndarray]:
    """Per species: the uncertainty of ΔGf° [kJ/mol] (0 for the element) and the region's severity."""
    sigma = np.array([0.0 if s.is_element else s.uncertainty for s in species])
    severity = np.array([SEVERITY[s.region] for s in species], dtype=float)
    return sigma, severity


def _padded(questions: list[Question], settings: RobustnessSettings):
    """The questions' planes as (question, species) arrays, padded with inert species."""
    width = max(len(q.planes.species) for q in questions)
    shape = (len(questions), width)
    off, ph, e = np.full(shape, INERT), np.zeros(shape), np.zeros(shape)
    spread, severity = np.zeros(shape), np.zeros(shape)
    bad, real = np.zeros(shape, dtype=bool), np.zeros(shape, dtype=bool)
    for row, question in enumerate(questions):
        planes, n = question.planes, len(question.planes.species)
        off[row, :n], ph[row, :n], e[row, :n] = planes.offset, planes.ph_slope, planes.e_slope
        sigma, severity[row, :n] = _species_data(planes.species)
        spread[row, :n] = sigma / (KJ_PER_EV * planes.metal_atoms)
        bad[row, :n] = [name in question.unacceptable for name in planes.index_of]
        real[row, :n] = True
    return off, ph, e, spread, severity, bad, real


def robustness_many(questions: list[Question], corners, *, draws: int | None = None, seed: int | None = None,
                    settings: RobustnessSettings | None = None) -> list[Robustness]:
    """:func:`robustness` of many questions over one window, computed together (one vectorised pass).

    Each question's draws come from its own generator, seeded by the settings' seed and its species'
    names, so an answer does not depend on which other questions share the pass.
    """
    settings = settings or robustness_settings()
    draws = settings.draws if draws is None else int(draws)
    if draws < 1:
        raise InputError(f"draws must be a positive whole number (given {draws})", field="draws")
    for question in questions:
        if question.verdict is not None and question.verdict not in VERDICTS:
            raise InputError(f"verdict must be one of {', '.join(VERDICTS)} (given {question.verdict!r})",
                             field="verdict")
    if not questions:
        return []
    distinct = {(id(q.planes), q.unacceptable, q.verdict): q for q in questions}
    if len(distinct) < len(questions):  # materials of one element often ask the same question
        answers = dict(zip(distinct, robustness_many(list(distinct.values()), corners, draws=draws, seed=seed,
                                                     settings=settings)))
        return [answers[(id(q.planes), q.unacceptable, q.verdict)] for q in questions]
    corners = _window_polygon(corners)
    off, ph, e, spread, severity, bad, real = _padded(questions, settings)
    reach = CLIP_SIGMA * spread
    keep = _contenders(off, ph, e, corners, reach, real)
    if len(corners) == 1:
        nominal = _point_verdicts(off, ph, e, corners, bad, keep, severity)
    else:
        nothing = np.zeros(len(questions), dtype=bool)
        nominal = _side_verdicts(off, ph, e, corners, bad, keep, nothing, nothing)
    nominal = np.array([VERDICTS.index(q.verdict) if q.verdict else v for q, v in zip(questions, nominal)])
    sure_bad, sure_good = _surely_met(off, ph, e, corners, reach, bad, keep)
    any_bad, any_good = (bad & keep).any(axis=1), (~bad & keep).any(axis=1)
    fixed = (sure_bad | ~any_bad) & (sure_good | ~any_good)
    outcome_share = np.where(fixed, (np.where(~any_bad, 0, np.where(~any_good, 2, 1)) == nominal).astype(float), 0.0)
    ask = np.flatnonzero(~fixed)
    if len(ask):
        base = settings.seed if seed is None else seed
        deviates = np.zeros((len(ask), draws, off.shape[1]))
        for row, k in enumerate(ask):
            names = list(questions[k].planes.index_of)
            rng = np.random.default_rng([base, zlib.crc32("|".join(names).encode())])
            deviates[row, :, :len(names)] = np.clip(rng.standard_normal((draws, len(names))), -CLIP_SIGMA, CLIP_SIGMA)
        columns = _indices(keep[ask])  # the contenders only, from here on
        unused = columns < 0

        def narrow(values: np.ndarray, fill) -> np.ndarray:
            out = _gather(values[ask], columns)
            out[unused] = fill
            return out

        off, ph, e, spread = narrow(off, INERT), narrow(ph, 0.0), narrow(e, 0.0), narrow(spread, 0.0)
        severity, bad, keep = narrow(severity, 0.0), narrow(bad, False), ~unused
        deviates = np.take_along_axis(deviates, np.maximum(columns, 0)[:, None, :], axis=2)
        drawn = (off[:, None, :] + deviates * spread[:, None, :]).reshape(-1, off.shape[1])
        repeat = lambda values: np.repeat(values, draws, axis=0)  # noqa: E731
        if len(corners) == 1:
            verdicts = _point_verdicts(drawn, repeat(ph), repeat(e), corners, repeat(bad), repeat(keep),
                                       repeat(severity))
        else:
            verdicts = _side_verdicts(drawn, repeat(ph), repeat(e), corners, repeat(bad), repeat(keep),
                                      repeat(sure_bad[ask]), repeat(sure_good[ask]))
        outcome_share[ask] = (verdicts.reshape(len(ask), draws) == nominal[ask, None]).mean(axis=1)
    return [Robustness(verdict_probability=float(share), draws=draws, verdict=VERDICTS[code])
            for share, code in zip(outcome_share, nominal)]


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
    accept = set(accept)
    unknown = accept - set(SEVERITY)
    if unknown:
        raise InputError(f"accept: unknown region {sorted(unknown)[0]!r}; allowed: {', '.join(SEVERITY)}", field="accept")
    unacceptable = frozenset(name for name, region in zip(planes.index_of, planes.regions)
                             if (region not in accept or name in blocking) and name not in waived)
    return robustness_many([Question(planes, unacceptable, verdict)], corners, draws=draws, seed=seed,
                           settings=settings)[0]
