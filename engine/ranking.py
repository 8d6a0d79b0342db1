"""Ranking screened candidates by a transparent rule, and the one-line reason shown for each.

Default rule: fewest unacceptable window share first, then least instability of the
candidate's own phase, then least dissolved metal, then lowest price. A user may give
another order of these keys, or weights: a weighted sum of each key scaled to 0–1 across
the candidates (price on a log scale), lowest first.
"""

import math

from .errors import InputError
from .ordering import dissolved_words

RANK_KEYS = {
    "unacceptable": "least window share outside the acceptable regions",
    "instability": "least free energy of the candidate's own phase above the stable state",
    "dissolved": "least equilibrium dissolved metal (unknown last)",
    "price": "lowest price per kg (unknown prices last)",
    "margin": "widest potential margin before an unacceptable region",
}
"""What each ranking key prefers."""

DEFAULT_ORDER = ("unacceptable", "instability", "dissolved", "price")


def check_order(order) -> tuple[str, ...]:
    """A ranking order: a non-empty list of distinct keys of :data:`RANK_KEYS`."""
    if not order:
        raise InputError(f"rank_by must list at least one of: {', '.join(RANK_KEYS)}", field="rank_by")
    keys = tuple(str(key).strip().lower() for key in order)
    unknown = [key for key in keys if key not in RANK_KEYS]
    if unknown:
        raise InputError(f"unknown ranking key {unknown[0]!r}; allowed: {', '.join(RANK_KEYS)}", field="rank_by")
    if len(set(keys)) != len(keys):
        raise InputError("rank_by lists a key twice", field="rank_by")
    return keys


def check_weights(weights: dict) -> dict[str, float]:
    """Ranking weights: keys of :data:`RANK_KEYS`, finite non-negative numbers, not all zero."""
    checked = {}
    for key, value in weights.items():
        key = str(key).strip().lower()
        if key not in RANK_KEYS:
            raise InputError(f"unknown weight {key!r}; allowed: {', '.join(RANK_KEYS)}", field="weights")
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value < 0:
            raise InputError(f"weight {key!r} must be a finite number ≥ 0 (given {value!r})", field="weights")
        checked[key] = float(value)
    if not checked or not any(checked.values()):
        raise InputError("weights must give at least one key a positive weight", field="weights")
    return checked


RESOLUTION = {"unacceptable": 9, "instability": 6, "dissolved": 6, "margin": 3}
"""Decimal places at which each key is compared [fraction, eV, log10 units, mV], so that float noise never
reorders candidates that are equal for every practical purpose."""


def sort_value(row, key: str) -> float:
    """The number a key compares for one row (``engine.screen.ScreenRow``; lower ranks first)."""
    if key == "unacceptable":
        return round(row.unacceptable_fraction, RESOLUTION[key])
    if key == "instability":
        return round(row.instability_ev, RESOLUTION[key])
    if key == "dissolved":
        value = row.log10_dissolved
        return math.inf if value is None else round(value, RESOLUTION[key])  # unknown is never best
    if key == "price":
        price = row.price_usd_per_kg
        return math.inf if price is None else price
    if key == "margin":
        return -round(1000 * row.margin_v, RESOLUTION[key])
    raise KeyError(key)


def rank(rows: list, order=DEFAULT_ORDER, weights: dict | None = None) -> list:
    """The rows sorted by ``order`` (lexicographic) or by ``weights`` (weighted sum), best first; ties by id."""
    if weights:
        scores = _weighted_scores(rows, weights)
        ordered = sorted(zip(rows, scores), key=lambda pair: (pair[1], pair[0].id.lower()))
        return [row for row, _ in ordered]
    return sorted(rows, key=lambda row: (*[sort_value(row, key) for key in order], row.id.lower()))


def _weighted_scores(rows: list, weights: dict[str, float]) -> list[float]:
    scores = [0.0] * len(rows)
    for key, weight in weights.items():
        values = []
        for row in rows:
            value = sort_value(row, key)
            if key == "price" and math.isfinite(value):
                value = math.log10(max(value, 1e-9))
            values.append(value)
        finite = [v for v in values if math.isfinite(v)]
        low, high = (min(finite), max(finite)) if finite else (0.0, 0.0)
        for i, value in enumerate(values):
            if not math.isfinite(value):
                scaled = 1.0 if value > 0 else 0.0
            else:
                scaled = 0.0 if high == low else (value - low) / (high - low)
            scores[i] += weight * scaled
    return scores


REGION_WORDS = {"immunity": "immune as {}", "passivation": "passive as {}", "hydride": "takes up hydrogen as {}",
                "corrosion": "dissolves as {}"}


def reason(row) -> str:
    """One line in plain words: what the window meets, how far the phase sits above the stable state."""
    pieces = row.judged.pieces
    if len(pieces) == 1:
        where = REGION_WORDS[pieces[0].region].format(pieces[0].species) + (
            " at this point" if row.window_dimension == 0 else " over the whole window")
    else:
        shown = [f"{REGION_WORDS[p.region].format(p.species)} over {100 * p.fraction:.0f}%" for p in pieces[:3]]
        if len(pieces) > 3:
            shown.append(f"{len(pieces) - 3} more")
        where = ", ".join(shown)
    energy = row.instability_ev
    own = row.material.phase
    if energy < 0.005:
        tail = f"{own} is the stable state ({energy:.2f} eV above it)"
    else:
        tail = f"{own} is up to {energy:.2f} eV per atom above the stable state"
    text = f"{where}; {tail}"
    dissolved = row.log10_dissolved
    if dissolved is not None and dissolved > -6 + 1e-9:
        text += "; " + dissolved_words(dissolved)
    return text
