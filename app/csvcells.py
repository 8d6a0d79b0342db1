"""CSV that a spreadsheet opens as data: every CSV the product writes (pages, shortlists, the CLI) goes through here.

A text cell starting with ``=``, ``+``, ``-`` or ``@`` (after optional spaces, tabs or carriage returns)
would be read by a spreadsheet as a formula, e.g. a note ``=HYPERLINK("http://…","x")``. Such cells get a
leading apostrophe, the common practice (OWASP, "CSV Injection"), which spreadsheets show as text.
Numbers are numbers: ``-0.5`` stays ``-0.5`` when it is a number, and becomes ``'-0.5`` only when it is text.

>>> inert_cell('=1+1'), inert_cell(' \\t@SUM(A1)'), inert_cell(-0.5), inert_cell('Pt')
("'=1+1", "' \\t@SUM(A1)", -0.5, 'Pt')
"""

import csv
import re
from collections.abc import Iterable

__all__ = ["FORMULA_START", "inert_cell", "write_csv"]

FORMULA_START = re.compile(r"^[ \t\r]*[=+\-@]")
"""A text cell a spreadsheet would take for a formula."""


def inert_cell(value):
    """``value`` with a leading apostrophe when it is text a spreadsheet would run as a formula; else unchanged."""
    if isinstance(value, str) and FORMULA_START.match(value):
        return "'" + value
    return value


def write_csv(stream, columns: Iterable[str], rows: Iterable[dict]) -> None:
    """Write a header and ``rows`` (dicts keyed by ``columns``) to ``stream``, every text cell made inert."""
    columns = list(columns)
    writer = csv.DictWriter(stream, fieldnames=columns, lineterminator="\n")
    writer.writerow({column: inert_cell(column) for column in columns})
    for row in rows:
        writer.writerow({key: inert_cell(value) for key, value in row.items()})
