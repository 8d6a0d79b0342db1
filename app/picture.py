"""A picture of the whole ranking: one strip per candidate showing the fate of the operating window.

Each candidate is a row: its rank and name, then a strip as wide as the window whose segments are the shares
of the window where each stable phase holds (from the exact region fractions of the screen), ordered from the
metal's best fate to its worst (immunity, passivation, insulating film, hydride, corrosion: light to dark, as in
the diagrams), then its verdict in words. A column of strips is read top to bottom at a glance: where the dark
begins is where the candidates stop being safe. Built on the server as SVG (``ranking_picture.svg``).
"""

import re

from .figures import REGION_STYLE

__all__ = ["LAYOUT", "picture_data"]

LAYOUT = {"width": 760, "label": 250, "strip": 360, "verdict_gap": 12, "row": 22, "gap": 6, "top": 58, "bottom": 40,
          "char": 6.6}
"""Geometry of the picture [px]: total width, label column, strip width, row height and gap, margins, and the
width of one character of the 12 px labels (to decide whether a species name fits its segment)."""

ORDER = {region: i for i, region in enumerate(REGION_STYLE)}
SUB = str.maketrans("0123456789", "₀₁₂₃₄₅₆₇₈₉")
SUP = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")


def formula_text(name: str) -> str:
    """An ion or solid name in plain Unicode (SVG text has no markup here): counts low, charges high.

    >>> formula_text("CrO4^2-"), formula_text("TiO2 (rutile)")
    ('CrO₄²⁻', 'TiO₂ (rutile)')
    """
    body, _, charge = name.partition("^")
    formula, space, note = body.partition(" ")
    return re.sub(r"(?<=[A-Za-z)])(\d+)", lambda m: m.group(1).translate(SUB), formula) + charge.translate(SUP) + space + note
MARKS = {"acceptable": "✓", "partly acceptable": "◐", "rejected": "✕"}
VERDICT_INK = {"acceptable": "#1f5c3b", "partly acceptable": "#5a5012", "rejected": "#8d1d52"}


def picture_data(result: dict, title: str) -> dict:
    """Rows, segments and legend of the picture, in pixels, from a screen payload.

    >>> row = {"rank": 1, "material": "Pt", "name": "Platinum", "verdict": "acceptable",
    ...        "stable_phases": [{"species": "PtO2", "region": "passivation", "fraction": 0.25},
    ...                          {"species": "Pt", "region": "immunity", "fraction": 0.75}]}
    >>> data = picture_data({"results": [row]}, "t")
    >>> [(s["species"], s["x"], s["width"]) for s in data["rows"][0]["segments"]]
    [('Pt', 250.0, 270.0), ('PtO₂', 520.0, 90.0)]
    """
    g = LAYOUT
    rows = []
    for i, row in enumerate(result["results"]):
        y = g["top"] + i * (g["row"] + g["gap"])
        x = float(g["label"])
        segments = []
        phases = sorted(row["stable_phases"], key=lambda p: (ORDER.get(p["region"], len(ORDER)), -p["fraction"]))
        for phase in phases:
            width = g["strip"] * phase["fraction"]
            if width <= 0:
                continue
            style = REGION_STYLE.get(phase["region"], {"fill": "#cccccc", "line": "#444444"})
            segments.append({"species": formula_text(phase["species"]), "region": phase["region"], "x": round(x, 2),
                             "width": round(width, 2), "fill": style["fill"], "line": style["line"],
                             "share": phase["fraction"],
                             "labelled": width >= g["char"] * len(phase["species"]) + 8})
            x += width
        rows.append({"rank": row["rank"], "material": row["material"], "name": row["name"], "y": y,
                     "verdict": row["verdict"], "mark": MARKS.get(row["verdict"], ""),
                     "verdict_ink": VERDICT_INK.get(row["verdict"], "#1d262b"), "segments": segments})
    used = {s["region"] for r in rows for s in r["segments"]}
    legend = [{"region": region, **style} for region, style in REGION_STYLE.items() if region in used]
    height = g["top"] + len(rows) * (g["row"] + g["gap"]) + g["bottom"]
    return {"title": title, "rows": rows, "legend": legend, "height": height, **g,
            "verdict_x": g["label"] + g["strip"] + g["verdict_gap"]}
