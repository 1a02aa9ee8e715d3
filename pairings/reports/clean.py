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

from pairings.text import plain

__all__ = ["plain", "csv_cell", "points", "shared_rank", "stamp", "show", "PREVAIL"]

_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")
_NUMBER = re.compile(r"-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?")

_FRACTIONS = {0.25: "¼", 0.5: "½", 0.75: "¾"}

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


def points(value: float) -> str:
    """Points as a sheet prints them: ``2½``, ``0``, ``5¼``, ``1675``."""
    sign = "−" if value < 0 else ""
    whole, part = divmod(round(abs(value), 6), 1)
    part = round(part, 6)
    if part == 0:
        return f"{sign}{int(whole)}"
    if part in _FRACTIONS:
        return f"{sign}{int(whole) if whole else ''}{_FRACTIONS[part]}"
    return f"{sign}{abs(value):.2f}".rstrip("0")


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
    if kind == "points" and isinstance(value, (int, float)):
        return points(float(value))
    if kind == "result":
        return str(value).replace("1/2", "½")
    return plain(str(value))
