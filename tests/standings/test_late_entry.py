"""A late entrant in the standings (issue 15, item 15): one rule for every table.

Listed with their points; their tiebreaks come from the rounds they were in the event; rounds
before their entry are no virtual opponents (pairings.standings.entry). Values worked by hand
below, with the virtual-opponent treatment (FIDE 2009 decision on unplayed games) for the
pairing bye of Cy Rill, which still counts as a draw towards others.
"""

from __future__ import annotations

from functools import partial
from pathlib import Path

from pairings import actions
from pairings.reports import render
from pairings.standings import standings
from pairings.state import EventState
from pairings.store import EventStore


def late_event(path: Path) -> EventStore:
    """Round 1: Ada-Cy 1-0, Dee-Bo 1-0; Lou enters for round 2: Dee-Ada 0-1, Bo-Lou 1-0, Cy the bye."""
    store = EventStore.create(path, actions.new_event("Late Night Rapid", 3, seed=1))
    for name, rating in (("Ada Quince", 1800), ("Bo Rill", 1700), ("Cy Rill", 1600), ("Dee Marsh", 1500)):
        store.apply(partial(actions.add_player, name=name, rating=rating))
    store.apply(actions.pair)
    store.apply(actions.publish)
    for board in (1, 2):
        store.apply(partial(actions.record_result, board=board, result="1-0"))
    store.apply(lambda s: actions.add_player(s, "Late Lou", 1650))
    return store


def row(state: EventState, name: str) -> tuple[float, dict[str, float]]:
    r = next(r for r in standings(state).rows if r.name == name)
    return r.points, dict(r.tiebreaks)


def test_before_their_first_game_they_are_listed_with_no_virtual_opponent(tmp_path: Path) -> None:
    with late_event(tmp_path / "late.pairings") as store:
        state = store.state
    assert state.players[actions.find_player(state, "Late Lou")].entry_round == 2
    points, tb = row(state, "Late Lou")
    assert points == 0 and tb == {"BH-C1": 0, "BH": 0, "DE": 0, "WIN": 0, "BPG": 0}  # the Swiss default list
    assert "Late Lou" in render(state, "standings", "text")


def test_after_their_first_game_only_their_own_rounds_count(tmp_path: Path) -> None:
    with late_event(tmp_path / "late.pairings") as store:
        store.apply(actions.pair)
        rnd = store.state.rounds[1]
        assert [(store.state.players[g.first].name, store.state.players[g.second].name) for g in rnd.games] == [
            ("Dee Marsh", "Ada Quince"), ("Bo Rill", "Late Lou")]
        store.apply(actions.publish)
        store.apply(lambda s: actions.record_result(s, 1, "0-1"))
        store.apply(lambda s: actions.record_result(s, 2, "1-0"))
        state = store.state
    # Lou met Bo only; Bo counts with 1 (lost to Dee, beat Lou). Round 1 adds no virtual opponent
    # (it would add SPR 0 + 1 + 0.5 * (2 - 1) = 1.5).
    assert row(state, "Late Lou") == (0, {"BH-C1": 0, "BH": 1, "DE": 0, "WIN": 0, "BPG": 1})  # Lou had the second side
    # Towards Bo's Buchholz, Lou counts with the 0 points Lou has, not with a draw for round 1.
    points, tb = row(state, "Bo Rill")
    assert points == 1 and tb["BH"] == 1  # Dee 1 + Lou 0
