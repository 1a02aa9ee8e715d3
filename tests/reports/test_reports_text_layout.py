"""The text sheets' own table layout gives exactly what rich's table renderer gives.

:mod:`pairings.reports.text` lays tables out itself (rich's general renderer
took seconds for a thousand rows) and leaves to rich only what needs its
wrapping; rich, forced to lay out everything, is the reference here.
"""

from __future__ import annotations

from datetime import datetime

import pytest

from pairings import events as ev
from pairings.printouts import KINDS
from pairings.reports import render, text
from pairings.reports.samples import SCENARIO, demo_state
from pairings.simulate import simulate_state
from pairings.state import EventState
from tests.reports.conftest import LONG, state_of


def _compare(state: EventState, now: datetime | None, monkeypatch: pytest.MonkeyPatch) -> int:
    ours = {}
    for kind in KINDS:
        try:
            ours[kind] = render(state, kind, "text", now=now) if now else render(state, kind, "text")
        except ValueError:  # a kind this event has no sheet of (the grid of a Swiss event)
            continue
    with monkeypatch.context() as m:
        m.setattr(text, "OWN_LAYOUT", False)
        for kind, out in ours.items():
            theirs = render(state, kind, "text", now=now) if now else render(state, kind, "text")
            assert out == theirs, kind
    return len(ours)


def test_hostile_names_lay_out_as_rich_does(hostile: EventState, now: datetime,
                                            monkeypatch: pytest.MonkeyPatch) -> None:
    assert _compare(hostile, now, monkeypatch) >= 6


@pytest.mark.skipif(not SCENARIO.exists(), reason="no demo event data file")
def test_the_demo_event_lays_out_as_rich_does(monkeypatch: pytest.MonkeyPatch) -> None:
    assert _compare(demo_state(), None, monkeypatch) >= 6


def test_wide_characters_long_titles_and_wide_tables_lay_out_as_rich_does(
        now: datetime, monkeypatch: pytest.MonkeyPatch) -> None:
    names = ["王小明 李四", "Zoë Ødegård", "e\u0301tienne Combining", LONG, "Ann Bo", "Kai 🐉 Mori"]
    log: list[ev.Event] = [ev.EventCreated(name="Club " + "Weitläufig " * 30, rounds=3, seed=2,
                                           tiebreaks=("BH-C1", "BH", "SB", "WIN", "PS", "AOB", "DE", "BPG"))]
    log += [ev.PlayerRegistered(id=f"p{i}", name=n, rating=1800 - 10 * i) for i, n in enumerate(names, 1)]
    log += [ev.RoundDrafted(round=1, boards=(ev.BoardModel(board=1, first="p1", second="p2"),
                                            ev.BoardModel(board=2, first="p3", second="p4"),
                                            ev.BoardModel(board=3, first="p5", second="p6"))),
            ev.RoundPublished(round=1)]
    assert _compare(state_of(log), now, monkeypatch) >= 6


def test_a_large_field_lays_out_as_rich_does(now: datetime, monkeypatch: pytest.MonkeyPatch) -> None:
    assert _compare(simulate_state(120, 5, 3, seed=4), now, monkeypatch) >= 6


def test_every_page_width_lays_out_as_rich_does(hostile: EventState, now: datetime) -> None:
    from pairings.reports import sheet

    for kind in ("standings", "crosstable", "pairings"):
        for table in sheet(hostile, kind, None, now).tables:
            natural = max(len(line) for line in text._table(table, 10**4))  # the table's own width
            for width in (30, natural - 1, natural, natural + 1, 250):  # rich wraps below ``natural``
                ours = [line.rstrip() for line in text._table(table, width)]
                assert ours == [line.rstrip() for line in text._by_rich(width, table)], (kind, width)
