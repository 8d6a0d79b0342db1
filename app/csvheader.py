"""The block of ``#`` lines above a downloaded CSV: what was asked, with which data, when.

A CSV opened months later must say its scenario, catalog version and date by itself. Each line starts
with ``#`` (read as text by spreadsheets, skipped by ``pandas.read_csv(comment="#")``); line breaks in
user text are folded into spaces so one fact stays one line, and a comma in user text is followed by a
space, so no cell a spreadsheet splits off begins with a formula character (``= + - @``).
"""

import re

__all__ = ["csv_preamble", "scenario_text"]


def _span(value) -> str:
    return f"{value[0]:g} to {value[1]:g}" if isinstance(value, (list, tuple)) else f"{value:g}"


def scenario_text(scenario: dict) -> str:
    """A scenario payload in words.

    >>> scenario_text({"role": "anode", "ph": [0, 1], "potential": 1.6, "scale": "RHE", "temperature": 25,
    ...                "activity": 1e-6, "accept": ["immunity", "passivation"]})
    'anode at pH 0 to 1, 1.6 V vs RHE, 25 °C, dissolved species at activity 1e-06; acceptable: immunity, passivation'
    """
    return (f"{scenario['role']} at pH {_span(scenario['ph'])}, {_span(scenario['potential'])} V vs {scenario['scale']}, "
            f"{scenario['temperature']:g} °C, dissolved species at activity {scenario['activity']:g}; "
            f"acceptable: {', '.join(scenario['accept'])}")


def csv_preamble(facts: list[tuple[str, str]]) -> list[str]:
    """``# name: value`` lines, one per fact, line breaks folded.

    >>> csv_preamble([("title", "Acid\\nanodes"), ("catalog version", "2026.1")])
    ['# title: Acid anodes', '# catalog version: 2026.1']
    >>> csv_preamble([("title", "x,=1+2")])
    ['# title: x, =1+2']
    """
    return [re.sub(r",(?=[=+\-@])", ", ", f"# {name}: {' '.join(str(value).split())}") for name, value in facts]
