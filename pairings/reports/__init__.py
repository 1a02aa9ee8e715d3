"""Printed sheets and files: pairing sheet, names list, result slips, standings, crosstable,
starting rank list, round-robin grid, prize list (the kinds are named in :mod:`pairings.printouts`).

:func:`render` turns the event's state into one kind of sheet in one format;
:func:`publish_web` writes a static folder of pages. Imports rich (terminal
text) but never textual; the HTML templates (jinja2) and the PDF writer are
imported only when a page or a PDF is made.
"""

from __future__ import annotations

from datetime import datetime
from pathlib import Path

from pairings.errors import InputError
from pairings.reports.data import render_csv, render_json, standings_json
from pairings.printouts import FORMATS, KINDS, PAPERS
from pairings.reports.paper import default_paper
from pairings.reports.posted import grid_sheet, prize_sheet, start_list_sheet
from pairings.reports.rated import rating_report_sheet, with_rating_columns
from pairings.reports.sheets import BUILDERS, Builder, Sheet, standings_sheet
from pairings.reports.text import render_text
from pairings.standings import standings
from pairings.state import EventState

ALL_BUILDERS: dict[str, Builder] = {**BUILDERS, "start-list": start_list_sheet, "grid": grid_sheet,
                                    "prizes": prize_sheet, "rating-report": rating_report_sheet}
assert tuple(ALL_BUILDERS) == KINDS, "pairings.printouts.KINDS lists every sheet, in order"


def sheet(state: EventState, kind: str, round_number: int | None = None, now: datetime | None = None,
          category: str | None = None) -> Sheet:
    """The format-neutral sheet behind :func:`render` (for the desk's own views)."""
    if kind not in KINDS:
        raise InputError(f"unknown sheet {kind!r}: use one of {', '.join(KINDS)}")
    moment = now or datetime.now().astimezone()
    if category is not None:
        if kind != "standings":
            raise InputError(f"a category applies to the standings, not to the {kind} sheet")
        return standings_sheet(state, round_number, moment, category)
    return ALL_BUILDERS[kind](state, round_number, moment)


def render(state: EventState, kind: str, fmt: str, round_number: int | None = None,
           now: datetime | None = None, category: str | None = None, paper: str | None = None,
           ratings: bool = False) -> str | bytes:
    """Render sheet ``kind`` of round ``round_number`` (default: the latest) in format ``fmt``.

    Pairings, names and slips default to the latest round in any state (a draft
    is printed with a DRAFT banner); standings, crosstable, grid and prizes count
    the rounds up to ``round_number`` (default: the last published one); the
    start list needs no round. ``category`` narrows the standings to one prize
    category; ``paper`` (``a4`` or ``letter``, default from the locale) sizes PDF
    and HTML pages; ``ratings`` adds the expected score, rating change and
    performance to the standings (FIDE B.02 as remembered, :mod:`.rated`).
    Returns ``bytes`` for ``pdf``, ``str`` otherwise. JSON of the standings is
    the interchange list (with ``ratings``, the sheet's JSON).

    Raises
    ------
    InputError : unknown kind, format, paper or category, no such round, nothing to print yet.
    """
    if fmt not in FORMATS:
        raise InputError(f"unknown format {fmt!r}: use one of {', '.join(FORMATS)}")
    size = paper.lower() if paper is not None else default_paper()
    if size not in PAPERS:
        raise InputError(f"unknown paper {paper!r}: use a4 or letter")
    moment = now or datetime.now().astimezone()
    built = sheet(state, kind, round_number, moment, category)
    if ratings:  # the standings' optional rating columns (pairings.reports.rated)
        if kind != "standings":
            raise InputError("the rating columns go with the standings (the rating-report sheet has its own)")
        built = with_rating_columns(built, state)
    if fmt == "text":
        return render_text(built)
    if fmt == "csv":
        return render_csv(built)
    if fmt == "json":
        if kind == "standings" and category is None and not ratings:
            return standings_json(standings(state, after_round=round_number).to_json())
        return render_json(built)
    if fmt == "html":
        from pairings.reports.html import render_html

        return render_html(built, size)
    from pairings.reports.pdf import render_pdf

    return render_pdf(built, moment, size)


def publish_web(state: EventState, directory: Path, now: datetime | None = None) -> list[Path]:
    """:func:`pairings.reports.html.publish_web` (imported here on first use, with the templates)."""
    from pairings.reports.html import publish_web as publish

    return publish(state, directory, now)


__all__ = ["FORMATS", "KINDS", "PAPERS", "default_paper", "publish_web", "render", "sheet"]
