"""HTML sheets (jinja2, autoescaped) and the static publish folder.

Every value reaches the page through ``{{ }}`` with autoescaping on, names sit
in ``<bdi>`` so right-to-left text cannot reorder the row around it, and the
stylesheet carries print rules for A4 and Letter. The publish folder holds
plain files with relative links only: it works from a USB stick or any static
host, with no server and no script.
"""

from __future__ import annotations

from dataclasses import replace
from datetime import datetime
from pathlib import Path

from jinja2 import Environment, FileSystemLoader, StrictUndefined

from pairings.errors import InputError
from pairings.reports.clean import PREVAIL, plain, show, stamp
from pairings.reports.files import write_files
from pairings.reports.paper import default_paper
from pairings.reports.sheets import Builder, Sheet, crosstable_sheet, name_sheet, pairing_sheet, standings_sheet
from pairings.state import EventState, RoundState
from pairings.text import counted

_TEMPLATES = Path(__file__).parent / "templates"
_ENV = Environment(loader=FileSystemLoader(_TEMPLATES), autoescape=True, undefined=StrictUndefined,
                   trim_blocks=True, lstrip_blocks=True)
_NUMERIC = ("number", "points", "rank")


def stylesheet() -> str:
    return (_TEMPLATES / "style.css").read_text(encoding="utf-8")


_PAGE_SIZE = {"a4": "A4", "letter": "letter"}


def _page(sheet: Sheet, nav: list[tuple[str, str]] | None = None, css_href: str | None = None,
          paper: str = "a4") -> str:
    first, second = sheet.sides or ("Player", "Player")
    return _ENV.get_template("sheet.html").render(
        sheet=sheet, show=show, clean=plain, numeric=_NUMERIC, prevail=PREVAIL,
        first=plain(first), second=plain(second), nav=nav or [], css_href=css_href,
        css="" if css_href else stylesheet(), page_size=_PAGE_SIZE[paper],
    )


def render_html(sheet: Sheet, paper: str = "a4") -> str:
    """One self-contained page (stylesheet inlined) for printing or mailing, sized for ``paper``."""
    return _page(sheet, paper=paper)


NAV = [("index.html", "Event"), ("pairings.html", "Pairings"), ("standings.html", "Standings"),
       ("crosstable.html", "Crosstable")]


def _published(state: EventState) -> EventState:
    """The state without draft rounds: nothing unpublished ever reaches the web."""
    return replace(state, rounds=tuple(r for r in state.rounds if r.state is not RoundState.DRAFT))


def _or_message(state: EventState, build: Builder, title: str, now: datetime) -> Sheet:
    """The sheet, or an empty sheet carrying the reason there is none yet."""
    try:
        return build(state, None, now)
    except InputError as error:
        return Sheet(kind="message", title=title, event=state.settings.name, round_number=0,
                     round_label="not yet", printed=stamp(now), notes=(str(error).capitalize() + ".",),
                     tables=(), sides=state.settings.sides)


def _round_page(state: EventState, number: int | None, now: datetime) -> Sheet:
    """A round's boards with their results, then the by-name list; or why there is none yet."""
    sheet = _or_message(state, lambda st, _, at: pairing_sheet(st, number, at), "Pairings", now)
    if sheet.kind == "pairings":
        names = name_sheet(state, sheet.round_number, now)
        sheet = replace(sheet, tables=sheet.tables + names.tables)
    return sheet


def publish_web(state: EventState, directory: Path, now: datetime | None = None) -> list[Path]:
    """Write index, pairings (the latest round's boards and by-name list), one page per published
    round (``round-N.html``: its pairings and results, kept for every round), standings and
    crosstable pages.

    Only published and complete rounds appear. Every page is written beside its
    target first and renamed into place (:mod:`.files`), so a failure (a full disk)
    leaves the pages that were there whole. Returns the files written, in order.
    """
    moment = now or datetime.now().astimezone()
    public = _published(state)
    directory.mkdir(parents=True, exist_ok=True)
    pages = {
        "pairings.html": _round_page(public, None, moment),
        "standings.html": _or_message(public, standings_sheet, "Standings", moment),
        "crosstable.html": _or_message(public, crosstable_sheet, "Crosstable", moment),
    }
    rounds = {f"round-{r.number}.html": _round_page(public, r.number, moment) for r in public.rounds}
    last = public.rounds[-1].number if public.rounds else 0
    summary = f"Round {last} of {state.settings.rounds}" if last else f"{counted(state.settings.rounds, 'round')}, none published yet"
    listed = [(href, label, pages[href].round_label) for href, label in NAV[1:]]
    listed += [(href, f"Round {page.round_number}", "pairings and results") for href, page in rounds.items()]
    index = _ENV.get_template("index.html").render(
        event=plain(state.settings.name), summary=summary, printed=stamp(moment), prevail=PREVAIL, pages=listed,
    )
    paper = default_paper()
    files = [(directory / "index.html", index)]
    files += [(directory / name, _page(sheet, nav=NAV, css_href="style.css", paper=paper))
              for name, sheet in {**pages, **rounds}.items()]
    files.append((directory / "style.css", stylesheet()))
    write_files(files)
    return [path for path, _ in files]
