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


def one_line(text: str) -> str:
    """An error message as exactly one printable line (control characters shown escaped)."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text.replace("\n", " ").replace("\r", " "))


def counted(n: int, word: str, plural: str | None = None) -> str:
    """``n`` and the noun agreeing with it: ``1 bye``, ``2 byes``, ``0 boards``, ``1 match``/``2 matches``."""
    return f"{n} {word if n == 1 else plural or word + 's'}"
