"""Untrusted text made safe for a terminal or a printed line.

Names come from rosters typed or imported by anyone, so every place that shows
one (command line, desk, text and PDF sheets) passes it through :func:`plain`:
escape sequences are removed whole (ECMA-48 CSI and OSC, in their 7-bit and
8-bit forms), then every remaining control, format (bidirectional overrides,
invisible joiners), surrogate and private-use character is dropped, and line
breaks become spaces.

Names that do not fit follow one rule everywhere (terminal text, PDF, the
command line): :func:`wrap` breaks them into lines at spaces and after hyphens
(inside a word only when the word alone is wider than a line), and :func:`fit`
cuts a one-line cell with an ellipsis. Both
take the measure of the medium: terminal cells here, the font's width in a PDF.
"""

from __future__ import annotations

import re
import unicodedata
from typing import Callable

Measure = Callable[[str], float]

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


def counted(n: int, word: str, plural: str | None = None) -> str:
    """``n`` and the noun agreeing with it: ``1 bye``, ``2 byes``, ``0 boards``, ``1 match``/``2 matches``."""
    return f"{n} {word if n == 1 else plural or word + 's'}"


def cells(text: str) -> int:
    """Terminal cells ``text`` takes: wide East Asian characters two, combining marks none."""
    if text.isascii():  # no ASCII character is wide or combining: the common case, without a lookup each
        return len(text)
    return sum(0 if unicodedata.combining(c) else 2 if unicodedata.east_asian_width(c) in "WF" else 1 for c in text)


ELLIPSIS = "…"


def fit(text: str, width: float, measure: Measure = cells) -> str:
    """``text`` on one line no wider than ``width``; a longer text is cut and ends in "…"."""
    if measure(text) <= width:
        return text
    cut = text
    while cut and measure(cut.rstrip() + ELLIPSIS) > width:
        cut = cut[:-1]
    return cut.rstrip() + ELLIPSIS


_PIECES = re.compile(r"[^\s-]*-+|[^\s-]+")
"""A word's pieces: each hyphenated part keeps its hyphen, a line may break after it."""


def wrap(text: str, width: float, measure: Measure = cells) -> list[str]:
    """``text`` as lines no wider than ``width``, broken at spaces and after hyphens.

    Only a piece wider than a whole line (a word with no space or hyphen in it) is
    broken inside, where the line is full: nothing of a name is ever lost.
    """
    lines: list[str] = []
    line = ""
    for word in text.split():
        for n, piece in enumerate(_PIECES.findall(word)):
            joined = line + (" " if line and n == 0 else "") + piece
            if measure(joined) <= width:
                line = joined
                continue
            if line:
                lines.append(line)
            line = piece
            while measure(line) > width and len(line) > 1:
                cut = _longest_start(line, width, measure)
                lines.append(line[:cut])
                line = line[cut:]
    return [*lines, line] if line else lines or [""]


def _longest_start(text: str, width: float, measure: Measure) -> int:
    """How many leading characters of ``text`` fit in ``width`` (at least one)."""
    cut = 1
    while cut < len(text) and measure(text[: cut + 1]) <= width:
        cut += 1
    return cut
