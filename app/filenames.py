"""Download file names and human dates: what a person sees of a saved shortlist's title and time.

>>> download_name("electrosieve-shortlist", "Acid OER anodes: Ir vs Pt!", "2026-12-04T18:31:12+00:00", "csv")
'electrosieve-shortlist-acid-oer-anodes-ir-vs-pt-2026-12-04.csv'
>>> human_date("2026-12-04T18:31:12+00:00")
'4 Dec 2026, 18:31 UTC'
"""

import re
import unicodedata
from datetime import datetime, timezone

__all__ = ["download_name", "human_date", "slug"]

SLUG_CHARS = 60
"""Longest slug of a title in a file name."""


def slug(title: str) -> str:
    """``title`` as lowercase ASCII words joined by hyphens (at most :data:`SLUG_CHARS`), or ``untitled``."""
    ascii_text = unicodedata.normalize("NFKD", title).encode("ascii", "ignore").decode()
    words = re.sub(r"[^a-z0-9]+", "-", ascii_text.lower()).strip("-")
    return words[:SLUG_CHARS].rstrip("-") or "untitled"


def _moment(iso: str) -> datetime | None:
    try:
        moment = datetime.fromisoformat(str(iso).replace("Z", "+00:00"))
    except ValueError:
        return None
    return moment if moment.tzinfo else moment.replace(tzinfo=timezone.utc)


def download_name(prefix: str, title: str, iso: str, extension: str) -> str:
    """``<prefix>-<title slug>-<YYYY-MM-DD>.<extension>`` (the date left out when ``iso`` is not a date)."""
    moment = _moment(iso)
    date = f"-{moment.astimezone(timezone.utc):%Y-%m-%d}" if moment else ""
    return f"{prefix}-{slug(title)}{date}.{extension}"


def human_date(iso: str) -> str:
    """An ISO 8601 moment as a person reads it, in UTC: ``4 Dec 2026, 18:31 UTC`` (unchanged if not a date)."""
    moment = _moment(iso)
    if moment is None:
        return str(iso)
    moment = moment.astimezone(timezone.utc)
    return f"{moment.day} {moment:%b %Y, %H:%M} UTC"
