"""Which characters free text (shortlist titles and notes) may not hold.

C0 control characters and DEL (PostgreSQL cannot store NUL; no title needs a control character) and
the bidirectional formatting characters (Unicode Standard Annex #9, "Unicode Bidirectional
Algorithm", explicit formatting characters; listed in Unicode Technical Standard #39 and in
CVE-2021-42574 ("Trojan Source"), where they make text read differently from what it holds).

>>> refused_characters("ab\\u202ec", allowed="")
['U+202E']
>>> refused_characters("line\\nbreak", allowed="\\n")
[]
"""

import re

__all__ = ["BIDI_CONTROLS", "pattern_refusing", "refused_characters"]

BIDI_CONTROLS = "\u061c\u200e\u200f\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069"
"""ALM, LRM, RLM, LRE, RLE, PDF, LRO, RLO, LRI, RLI, FSI, PDI."""
_BIDI_CLASS = "\\u061c\\u200e\\u200f\\u202a-\\u202e\\u2066-\\u2069"


def refused_characters(text: str, allowed: str) -> list[str]:
    """The refused characters in ``text`` (as ``U+XXXX``, sorted), sparing the control characters in ``allowed``."""
    bad = {c for c in text if ((ord(c) < 32 or ord(c) == 127) and c not in allowed) or c in BIDI_CONTROLS}
    return [f"U+{ord(c):04X}" for c in sorted(bad)]


def pattern_refusing(control_class: str) -> str:
    """A JSON-schema pattern matching text without ``control_class`` (a regex class body) and bidi controls."""
    pattern = f"^[^{control_class}{_BIDI_CLASS}]*$"
    re.compile(pattern)
    return pattern
