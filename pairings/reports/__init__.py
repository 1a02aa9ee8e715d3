"""Printed sheets and files: pairing sheet, names list, result slips, standings, crosstable.

:func:`render` turns the event's state into one kind of sheet in one format;
:func:`publish_web` writes a static folder of pages. Imports rich (terminal
text) but never textual.
"""

from __future__ import annotations

from datetime import datetime

from pairings.errors import InputError
from pairings.reports.data import render_csv, render_json, standings_json
from pairings.reports.html import publish_web, render_html
from pairings.reports.pdf import render_pdf
from pairings.reports.sheets import BUILDERS, Sheet
from pairings.reports.text import render_text
from pairings.standings import standings
from pairings.state import EventState

KINDS = ("pairings", "names", "slips", "standings", "crosstable")
FORMATS = ("text", "csv", "json", "html", "pdf")


def sheet(state: EventState, kind: str, round_number: int | None = None, now: datetime | None = None) -> Sheet:
    """The format-neutral sheet behind :func:`render` (for the desk's own views)."""
    if kind not in KINDS:
        raise InputError(f"unknown sheet {kind!r}: use one of {', '.join(KINDS)}")
    return BUILDERS[kind](state, round_number, now or datetime.now().astimezone())


def render(state: EventState, kind: str, fmt: str, round_number: int | None = None,
           now: datetime | None = None) -> str | bytes:
    """Render sheet ``kind`` of round ``round_number`` (default: the latest) in format ``fmt``.

    Pairings, names and slips default to the latest round in any state (a draft
    is printed with a DRAFT banner); standings and crosstable count the rounds
    up to ``round_number`` (default: the last published one). Returns ``bytes``
    for ``pdf``, ``str`` otherwise. JSON of the standings is the interchange list.

    Raises
    ------
    InputError : unknown kind or format, no such round, nothing to print yet.
    """
    if fmt not in FORMATS:
        raise InputError(f"unknown format {fmt!r}: use one of {', '.join(FORMATS)}")
    moment = now or datetime.now().astimezone()
    built = sheet(state, kind, round_number, moment)
    if fmt == "text":
        return render_text(built)
    if fmt == "csv":
        return render_csv(built)
    if fmt == "json":
        if kind == "standings":
            return standings_json(standings(state, after_round=round_number).to_json())
        return render_json(built)
    if fmt == "html":
        return render_html(built)
    return render_pdf(built, moment)


__all__ = ["FORMATS", "KINDS", "publish_web", "render", "sheet"]
