"""Untrusted text made safe for a terminal or a printed line.

Names come from rosters typed or imported by anyone, so every place that shows
one (command line, desk, text and PDF sheets) passes it through :func:`plain`:
escape sequences are removed whole (ECMA-48 CSI and OSC, in their 7-bit and
8-bit forms), then every remaining control, format (bidirectional overrides,
invisible joiners), surrogate and private-use character is dropped, and line
breaks become spaces.
"""

from __future__ import annotations

import re
import unicodedata

_ESCAPES = re.compile(
    r"(?:\x1b\[|\x9b)[0-?]*[ -/]*[@-~]"                      # CSI: colours, cursor moves, clears
    r"|(?:\x1b[\]PX^_]|[\x90\x98\x9d\x9e\x9f])[^\x07\x1b\x9c]*(?:\x07|\x1b\\|\x9c)?"  # OSC, DCS, SOS, PM, APC
    r"|\x1b[ -/]*[0-~]?"                                     # any other escape
)
_BREAKS = re.compile(r"[\t\n\r\v\f\u0085\u2028\u2029]+")
_DROPPED = ("Cc", "Cf", "Cs", "Co")


def plain(text: str) -> str:
    """``text`` on one line, without escape sequences, control characters or bidi overrides."""
    if text.isprintable():  # the common case: nothing to remove
        return text.strip()
    text = _ESCAPES.sub("", _BREAKS.sub(" ", text))
    return "".join(c for c in text if unicodedata.category(c) not in _DROPPED).strip()


_UNDECOMPOSED = str.maketrans({"ø": "o", "ł": "l", "đ": "d", "ħ": "h", "ı": "i", "æ": "ae", "œ": "oe", "þ": "th"})
"""Letters with a stroke or ligatures that Unicode does not decompose into a base letter and a mark."""


def fold(text: str) -> str:
    """``text`` for matching what a person typed: case and accents ignored ("Zoe" finds "Zoë").

    Unicode compatibility decomposition (NFKD) splits "ë" into "e" and a
    combining diaeresis; the combining marks are dropped and the rest is
    casefolded ("ß" becomes "ss"). A few letters that do not decompose
    ("ø", "ł", "æ", ...) are mapped to the letters they are typed as on a plain
    keyboard (common practice, no source).
    """
    decomposed = unicodedata.normalize("NFKD", text.casefold())
    return "".join(c for c in decomposed if not unicodedata.combining(c)).translate(_UNDECOMPOSED)


def one_line(text: str) -> str:
    """An error message as exactly one printable line (control characters shown escaped)."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text.replace("\n", " ").replace("\r", " "))
