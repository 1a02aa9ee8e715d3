"""Long names: wrapped at spaces and after hyphens in text and PDF alike, cut with "…" on one-line cells.

The names are invented. Each word of them is shorter than a name column, so no
word may ever be broken; a name longer than the column must still be there whole.
"""

from __future__ import annotations

import io
import re
import unicodedata
from datetime import datetime
from pathlib import Path

import pytest
from pypdf import PdfReader

from pairings import events as ev
from pairings.cli import main
from pairings.fold import fold
from pairings.reports import render
from pairings.reports.text import NAME_WIDTH
from pairings.state import EventState
from pairings.store import EventStore
from pairings.text import cells, fit, wrap

LONG = ("Maximiliane Schwarzenau-Oberhollenzer von Ravensburg", "Bartholomäus Quellenhausen-Wintergrund",
        "Konstantina Fledermausgarten Überlingen-Sankt", "Ann Bo")


def _event() -> list[ev.Event]:
    players = [ev.PlayerRegistered(id=f"p{i}", name=n, rating=1900 - 100 * i) for i, n in enumerate(LONG, 1)]
    boards = (ev.BoardModel(board=1, first="p1", second="p2"), ev.BoardModel(board=2, first="p3", second="p4"))
    return [ev.EventCreated(name="Lindenhof Schachfreunde Herbstturnier", rounds=3, seed=2), *players,
            ev.RoundDrafted(round=1, boards=boards), ev.RoundPublished(round=1)]


@pytest.fixture
def state() -> EventState:
    return fold(enumerate(_event(), 1))


def _words(name: str) -> list[str]:
    """The pieces a line may end with: words, and hyphenated parts with their hyphen."""
    return re.findall(r"[^\s-]*-|[^\s-]+", name)


def test_wrap_breaks_at_spaces_and_after_hyphens_only() -> None:
    assert wrap("Maximiliane Schwarzenau-Oberhollenzer von Ravensburg", 20) == [
        "Maximiliane", "Schwarzenau-", "Oberhollenzer von", "Ravensburg"]
    assert wrap("Ann Bo", 20) == ["Ann Bo"] and wrap("", 5) == [""]
    assert wrap("Xiphosurananda Bo", 6) == ["Xiphos", "uranan", "da Bo"]  # only a word wider than a line
    assert all(cells(line) <= 4 for line in wrap("王小明 李四", 4))


def test_cells_counts_by_the_unicode_tables() -> None:
    """Wide (W, F) two cells, combining marks none, the rest one (UAX #11, Unicode's combining class);
    every ASCII character, which takes the shortcut, included."""
    def by_tables(text: str) -> int:
        return sum(0 if unicodedata.combining(c) else 2 if unicodedata.east_asian_width(c) in "WF" else 1
                   for c in text)

    for text in ["".join(map(chr, range(128))), "Ann Bo", "Zoë", "王小明", "e\u0301", "Ærø-Ødegård"]:
        assert cells(text) == by_tables(text)
    assert cells("王小明 Li") == 9 and cells("e\u0301") == 1


def test_fit_cuts_with_an_ellipsis() -> None:
    assert fit("Bartholomäus Quellenhausen-Wintergrund", 28) == "Bartholomäus Quellenhausen-…"
    assert fit("Ann Bo", 28) == "Ann Bo" and cells(fit("王小明王小明", 5)) <= 5


def test_text_sheets_never_break_a_word(state: EventState) -> None:
    for kind in ("pairings", "names"):
        out = render(state, kind, "text", now=datetime(2026, 3, 1, 10, 0))
        assert isinstance(out, str)
        for name in LONG:
            for word in _words(name):
                assert word in out, (kind, word)
        assert max(len(line) for line in out.splitlines()) < 200


def test_pdf_sheets_never_break_a_word(state: EventState) -> None:
    for kind in ("pairings", "names", "slips"):
        data = render(state, kind, "pdf", now=datetime(2026, 3, 1, 10, 0))
        assert isinstance(data, bytes)
        raw = "\n".join(page.extract_text() for page in PdfReader(io.BytesIO(data)).pages)  # pypdf, independent
        for name in LONG:
            for word in _words(name):
                assert word in raw, (kind, word)


def test_pair_output_cuts_long_names_with_an_ellipsis(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    event = tmp_path / "long.pairings"
    EventStore.create_from(event, _event()[:5]).close()
    assert main(["pair", str(event)]) == 0
    out = capsys.readouterr().out
    assert "Maximiliane Schwarzenau-Obe…" in out and "Bartholomäus Quellenhausen-…" in out
    boards = [line for line in out.splitlines() if line.strip()[:1].isdigit()]
    assert len(boards) == 2 and len({line.index(" - ") for line in boards}) == 1  # the columns still line up
    assert NAME_WIDTH >= max(len(w) for n in LONG for w in _words(n))


def test_a_name_of_hyphenated_parts_breaks_after_a_hyphen(hostile: EventState, now: datetime) -> None:
    """The hostile roster's 303-character name (tests/reports/conftest.py): lines end after "Auberon-"."""
    for fmt in ("text", "pdf"):
        out = render(hostile, "standings", fmt, now=now)
        text = out if isinstance(out, str) else "\n".join(p.extract_text() for p in PdfReader(io.BytesIO(out)).pages)
        fragments = re.findall(r"[A-Za-z]*ube[A-Za-z]*|Aub[A-Za-z]*", text)
        assert fragments and set(fragments) == {"Auberon"}, (fmt, sorted(set(fragments)))


def test_pdf_column_headings_are_never_broken(state: EventState) -> None:
    """A heading narrower than its column's share ("Board" in a 5-character number column) stays whole."""
    from pairings.reports import sheet

    moment = datetime(2026, 3, 1, 10, 0)
    for kind in ("pairings", "names", "standings", "crosstable", "start-list"):
        data = render(state, kind, "pdf", now=moment)
        assert isinstance(data, bytes)
        lines = {line.strip() for p in PdfReader(io.BytesIO(data)).pages for line in p.extract_text().splitlines()}
        words = " ".join(lines).split()
        for table in sheet(state, kind, now=moment).tables:
            for i in table.printed_columns():
                for word in table.columns[i].label.split():
                    assert word in words, (kind, word)
