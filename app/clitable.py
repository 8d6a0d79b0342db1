"""The ``screen`` table for a terminal: a few deciding columns that fit 80 characters, or every column with ``--wide``.

By default a row shows its rank, material, verdict, at most three figures (the first keys of the
ranking rule, so the figures shown are the ones that decided the order) and its reason cut to the
space left. No cell wraps: one candidate is one line at any width.
"""

from dataclasses import dataclass
from typing import Callable

from electrosieve.engine.roles import roles

__all__ = ["Column", "FIGURES", "KINETIC_FIGURES", "MAX_FIGURES", "ROLE_FIGURES", "deciding_keys", "legend", "role_columns",
           "screen_columns", "table_lines"]


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


def _surface(row: dict) -> str:
    surface = row.get("surface")
    return "-" if surface is None else CONDUCTION_SHORT.get(surface["conduction"], surface["conduction"])


def _probability(row: dict) -> str:
    robust = row.get("robustness")
    if robust is None:
        return "-"
    return f"{robust['verdict_probability']:.2f}" + ("~" if row.get("order_robust") is False else "")


def _onset(quantity: str) -> Callable[[dict], str]:
    """The cell of a role's kinetic criterion [V vs RHE]; ? where the catalog has no data."""
    def cell(row: dict) -> str:
        kinetics = row.get("kinetics") or {}
        hydrogen, oxygen = kinetics.get("hydrogen_onset_v_rhe"), kinetics.get("oxygen_onset_v_rhe")
        if quantity == "window-width":
            value = None if hydrogen is None or oxygen is None else oxygen - hydrogen
        else:
            value = oxygen if quantity == "oxygen-onset" else hydrogen
        return "?" if value is None else f"{value:.2f}"
    return cell


CONDUCTION_SHORT = {"semiconductor": "semicond."}
ROLE_FIGURES = {
    "surface": Column("surface", _surface, "left"),
    "probability": Column("p", _probability),
}
"""What the role's own rule decides on: the surface's conduction and how often the verdict holds (``~``: may swap
with the next row within the data's uncertainties)."""
KINETIC_FIGURES = {
    "oxygen-onset": Column("O2 V", _onset("oxygen-onset")),
    "hydrogen-onset": Column("H2 V", _onset("hydrogen-onset")),
    "hydrogen-held-back": Column("H2 V", _onset("hydrogen-held-back")),
    "window-width": Column("width V", _onset("window-width")),
}
"""Each role criterion's onset figure [V vs RHE] (``engine.roles``)."""


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


def role_columns(result: dict) -> list[Column]:
    """Surface, robustness and the role's kinetic figure, shown when the role's own rule ranks (no order, no blend)."""
    scenario = result["scenario"]
    if scenario.get("rank_by") or scenario.get("weights"):
        return []
    criterion = roles()[scenario["role"]].criterion
    deciding = (KINETIC_FIGURES[criterion.name] if criterion is not None and criterion.name in KINETIC_FIGURES
                else FIGURES["dissolved"])  # without a kinetic criterion the least dissolved metal decides next
    return [ROLE_FIGURES["surface"], ROLE_FIGURES["probability"], deciding]


def screen_columns(result: dict, wide: bool = False) -> list[Column]:
    """The columns of the ``screen`` table (a screen payload): the deciding ones, or all of them when ``wide``."""
    if wide:
        regions = list(result["results"][0]["fractions"]) if result["results"] else []
        fractions = [Column(f"{region[:4]} %", lambda r, region=region: f"{100 * r['fractions'].get(region, 0):.0f}")
                     for region in regions]
        figures = [FIGURES[key] for key in ("instability", "dissolved", "margin", "price")]
        return [_RANK, _MATERIAL, _VERDICT, *role_columns(result), *fractions, *figures, _REASON]
    deciding = role_columns(result) or [FIGURES[key] for key in deciding_keys(result["scenario"])]
    return [_RANK, _MATERIAL, _VERDICT, *deciding, _REASON]


_MEANINGS = {
    "surface": "surface: conduction of the surface phase over the window",
    "p": "p: share of {draws} draws within the data's uncertainties that keep the verdict (~: may swap with the next)",
    "log c": "log c: log10 of the most dissolved metal [mol/kg]",
    "unacc %": "unacc %: share of the window outside the accepted regions",
    "ΔΦ eV": "ΔΦ eV: largest driving force to change phase",
    "margin mV": "margin mV: distance to the nearest unacceptable region (+: at least)",
    "USD/kg": "USD/kg: indicative price",
    "O2 V": "O2 V: oxygen-evolution onset, V vs RHE at {current} mA cm^-2 (?: no data)",
    "H2 V": "H2 V: hydrogen-evolution onset, V vs RHE at {current} mA cm^-2 (?: no data)",
    "width V": "width V: oxygen onset minus hydrogen onset at {current} mA cm^-2 (?: no data)",
}


def legend(columns: list[Column], result: dict) -> str:
    """What each figure column means, with its units, in one sentence under the table.

    >>> legend([Column("log c", _dissolved)], {"scenario": {"current_density": 1.0}, "results": []})
    'log c: log10 of the most dissolved metal [mol/kg].'
    """
    draws = next((row["robustness"]["draws"] for row in result["results"] if row.get("robustness")), 0)
    current = f"{result['scenario'].get('current_density') or 1.0:g}"
    meanings = [_MEANINGS[c.heading].format(draws=draws, current=current) for c in columns if c.heading in _MEANINGS]
    return "; ".join(meanings) + "." if meanings else ""


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
