"""The static publish folder: self-contained pages, relative links, nothing unpublished."""

from __future__ import annotations

from datetime import datetime
from html.parser import HTMLParser
from pathlib import Path
from typing import Any

from pairings import events as ev
from pairings.fold import fold
from pairings.reports import publish_web


class Links(HTMLParser):
    """Python's html.parser: every href/src and every tag name."""

    def __init__(self) -> None:
        super().__init__()
        self.refs: list[str] = []
        self.tags: set[str] = set()
        self.text: list[str] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.add(tag)
        self.refs += [v or "" for k, v in attrs if k in ("href", "src")]

    def handle_data(self, data: str) -> None:
        self.text.append(data)


def parse(path: Path) -> Links:
    parser = Links()
    parser.feed(path.read_text(encoding="utf-8"))
    return parser


def test_folder_works_offline(make_state: Any, tmp_path: Path, now: datetime) -> None:
    draft = ev.RoundDrafted(round=3, boards=(ev.BoardModel(board=1, first="p1", second="p8"),))
    state = make_state([ev.ResultRecorded(round=2, board=3, result="0-1"), draft])
    out = tmp_path / "stick" / "web"
    written = publish_web(state, out, now=now)
    assert [p.name for p in written] == ["index.html", "pairings.html", "standings.html", "crosstable.html",
                                         "round-1.html", "round-2.html", "style.css"]
    for page in written[:-1]:
        parsed = parse(page)
        assert "script" not in parsed.tags and "img" not in parsed.tags
        for ref in parsed.refs:                       # relative links to files in the folder only
            assert "://" not in ref and not ref.startswith("/") and (out / ref).is_file(), ref
    pairings = " ".join(parse(out / "pairings.html").text)
    assert "Round 2" in pairings and "Round 3" not in pairings   # the draft never reaches the web
    assert "Players" in pairings and "Zoë Ødegård" in pairings   # boards and the by-name list
    assert "After round 2" in " ".join(parse(out / "standings.html").text)
    # Every published round keeps its own page with its pairings and results, listed on the index.
    first = " ".join(parse(out / "round-1.html").text)
    assert "Round 1" in first and "Round 2" not in first and "1-0" in first
    index = parse(out / "index.html")
    assert {"round-1.html", "round-2.html"} <= set(index.refs) and not (out / "round-3.html").exists()


def test_folder_of_an_event_without_rounds(tmp_path: Path, now: datetime) -> None:
    state = fold(enumerate([ev.EventCreated(name="Quiet Cup", rounds=5),
                            ev.PlayerRegistered(id="a", name="Ann Aldous")], 1))
    written = publish_web(state, tmp_path, now=now)
    assert len(written) == 5
    standings = " ".join(parse(tmp_path / "standings.html").text)
    assert "No standings yet" in standings and "Quiet Cup" in standings
    assert "none published yet" in (tmp_path / "index.html").read_text(encoding="utf-8")


def test_index_names_each_page_once(hostile: Any, tmp_path: Path, now: datetime) -> None:
    publish_web(hostile, tmp_path, now=now)
    items = [" ".join(line.split()) for line in " ".join(parse(tmp_path / "index.html").text).split("\n")]
    listed = [line for line in items if line.startswith(("Pairings", "Standings", "Crosstable"))]
    assert listed == ["Pairings — Round 2", "Standings — After round 2", "Crosstable — After round 2"]


def test_index_of_a_one_round_event_says_one_round(tmp_path: Path, now: datetime) -> None:
    state = fold(enumerate([ev.EventCreated(name="Lightning Final", rounds=1, seed=1)], 1))
    publish_web(state, tmp_path, now=now)
    assert "1 round, none published yet" in " ".join(parse(tmp_path / "index.html").text)
