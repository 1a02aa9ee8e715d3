"""Making untrusted text and numbers safe and readable in each output format.

Names come from rosters typed or imported by anyone, so every format defends
itself: terminal text and PDF drop control characters, escape sequences and
bidirectional overrides; CSV cells that a spreadsheet would run as a formula
get a leading apostrophe (common practice, no source: the OWASP advice on CSV
injection); HTML relies on the templates' autoescaping (see :mod:`.html`).
"""

from __future__ import annotations

import re
from datetime import datetime

from pairings.points import Points, points_text
from pairings.text import plain

__all__ = ["plain", "csv_cell", "shared_rank", "stamp", "show", "PREVAIL"]

_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")
_NUMBER = re.compile(r"-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?")

PREVAIL = "The event's regulations and the chief arbiter's decisions prevail over this printout."
"""Printed on every sheet."""


def csv_cell(value: object) -> object:
    """A CSV cell a spreadsheet shows as text: formula starters get a leading apostrophe.

    Numbers (also negative ones, as numbers or numeric text) are left as they are.
    """
    if not isinstance(value, str):
        return "" if value is None else value
    value = plain(value)
    if value.startswith(_FORMULA_START) and not _NUMBER.fullmatch(value):
        return "'" + value
    return value


def shared_rank(rank: int | str) -> str:
    """A rank for print: a shared ``"3-5"`` becomes ``"3–5"`` (an en dash: no spreadsheet reads it as a date)."""
    return str(rank).replace("-", "–")


def stamp(now: datetime) -> str:
    """The printing time, to the minute, with the time zone when known."""
    zone = now.tzname()
    return now.strftime("%Y-%m-%d %H:%M") + (f" {zone}" if zone else "")


def show(value: object, kind: str) -> str:
    """A sheet cell as printed text (terminal, HTML, PDF), by its column kind."""
    if value is None:
        return "–" if kind == "number" else ""
    if kind == "rank":
        return shared_rank(value if isinstance(value, int) else str(value))
    if kind == "points" and isinstance(value, (int, Points)):
        return points_text(Points(value), "sheet")
    if kind == "result":
        return str(value).replace("1/2", "½")
    return plain(str(value))
