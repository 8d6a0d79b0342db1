"""The ``screen`` table for a terminal: a few deciding columns that fit 80 characters, or every column with ``--wide``.

By default a row shows its rank, material, verdict, at most three figures (the first keys of the
ranking rule, so the figures shown are the ones that decided the order) and its reason cut to the
space left. No cell wraps: one candidate is one line at any width.
"""

from dataclasses import dataclass
from typing import Callable

__all__ = ["Column", "FIGURES", "MAX_FIGURES", "deciding_keys", "screen_columns", "table_lines"]


@dataclass(frozen=True)
class Column:
    """One column of the table: its heading, how to write a row's cell, and its alignment."""

    heading: str
    cell: Callable[[dict], str]
    justify: str = "right"


def _margin(row: dict) -> str:
    return f"{row['margin_mv']:.0f}" + ("+" if row["margin_capped"] and row["margin_mv"] > 0 else "")


def _price(row: dict) -> str:
    price = row["price_usd_per_kg"]
    return "-" if price is None else f"{price:,.0f}"


def _dissolved(row: dict) -> str:
    return "-" if row["log10_dissolved"] is None else f"{row['log10_dissolved']:.1f}"


FIGURES = {
    "unacceptable": Column("unacc %", lambda r: f"{100 * r['unacceptable_fraction']:.0f}"),
    "instability": Column("ΔΦ eV", lambda r: f"{r['instability_ev']:.2f}"),
    "dissolved": Column("log c", _dissolved),
    "margin": Column("margin mV", _margin),
    "price": Column("USD/kg", _price),
}
"""The figure behind each ranking key (``engine.ranking.RANK_KEYS``), as the short table shows it."""

MAX_FIGURES = 3
"""Figures in the default table: with rank, material, verdict and a reason this fits 80 columns."""

_RANK = Column("#", lambda r: str(r["rank"]))
_MATERIAL = Column("material", lambda r: r["material"], "left")
_VERDICT = Column("verdict", lambda r: r["verdict"], "left")
_REASON = Column("reason", lambda r: r["reason"], "left")


def deciding_keys(scenario: dict) -> list[str]:
    """The ranking keys that decide the order, most decisive first: the blend's heaviest weights, else the order.

    >>> deciding_keys({"rank_by": ["unacceptable", "instability", "dissolved", "price"], "weights": {}})
    ['unacceptable', 'instability', 'dissolved']
    >>> deciding_keys({"rank_by": ["unacceptable"], "weights": {"price": 0.2, "unacceptable": 1.0}})
    ['unacceptable', 'price']
    """
    weights = scenario.get("weights") or {}
    if weights:
        keys = [key for key, w in sorted(weights.items(), key=lambda kv: -kv[1]) if w > 0]
    else:
        keys = list(scenario.get("rank_by") or [])
    return [key for key in keys if key in FIGURES][:MAX_FIGURES]


def screen_columns(result: dict, wide: bool = False) -> list[Column]:
    """The columns of the ``screen`` table (a screen payload): the deciding ones, or all of them when ``wide``."""
    if wide:
        regions = list(result["results"][0]["fractions"]) if result["results"] else []
        fractions = [Column(f"{region[:4]} %", lambda r, region=region: f"{100 * r['fractions'].get(region, 0):.0f}")
                     for region in regions]
        figures = [FIGURES[key] for key in ("instability", "dissolved", "margin", "price")]
        return [_RANK, _MATERIAL, _VERDICT, *fractions, *figures, _REASON]
    return [_RANK, _MATERIAL, _VERDICT, *(FIGURES[key] for key in deciding_keys(result["scenario"])), _REASON]


GAP = "  "
"""Between two columns."""


def _fit(text: str, width: int) -> str:
    """``text`` cut to ``width`` characters, an ellipsis marking the cut."""
    return text if len(text) <= width else text[: max(width - 1, 0)] + "…"


def table_lines(columns: list[Column], rows: list[dict], width: int | None = None) -> list[str]:
    """The table as lines of text: a heading, a rule, one line per row; with ``width`` the last column is cut to fit.

    >>> cols = [Column("#", lambda r: str(r["rank"])), Column("reason", lambda r: r["reason"], "left")]
    >>> table_lines(cols, [{"rank": 1, "reason": "passive over the whole window"}], width=16)
    ['#  reason', '-  -------------', '1  passive over…']
    """
    cells = [[column.cell(row) for column in columns] for row in rows]
    widths = [max([len(column.heading)] + [len(line[i]) for line in cells]) for i, column in enumerate(columns)]
    if width is not None:
        room = width - sum(widths[:-1]) - len(GAP) * (len(columns) - 1)
        widths[-1] = max(min(widths[-1], room), len(columns[-1].heading))

    def line(values: list[str]) -> str:
        parts = [_fit(value, w).rjust(w) if column.justify == "right" else _fit(value, w).ljust(w)
                 for value, w, column in zip(values, widths, columns)]
        return GAP.join(parts).rstrip()

    return [line([column.heading for column in columns]), GAP.join("-" * w for w in widths).rstrip(),
            *(line(values) for values in cells)]
