"""Side allocation that breaks the side rule for as few as it can, and forfeits as meetings (H1)."""

from __future__ import annotations

from typing import Sequence

import numpy as np
import pytest

from tests.engine.engine_support import new_event, state_of
from pairings import events as ev
from pairings.engine import blossom, draft_round, explain, rebuild, verify
from pairings.engine.criteria import Field
from pairings.engine.vector import Arrays
from pairings.errors import NoPairingError
from pairings.state import EventState, PlayerId, Result

P = [PlayerId(f"p{i:05d}") for i in range(1, 7)]


def _history(rounds: Sequence[Sequence[tuple[int, int]]], results: Sequence[Result] | None = None,
             **settings: object) -> list[ev.Event]:
    """Imported rounds (organiser-made boards, first side listed first) of the six players p1..p6."""
    log = new_event([2000 - 10 * i for i in range(6)], rounds=len(rounds) + 1, **settings)
    for r, boards in enumerate(rounds, 1):
        log.append(ev.RoundDrafted(round=r, boards=tuple(
            ev.BoardModel(board=k, first=P[a - 1], second=P[b - 1]) for k, (a, b) in enumerate(boards, 1)),
            byes=(), source="override"))
        log.append(ev.RoundPublished(round=r))
        for k in range(1, len(boards) + 1):
            result = results[(r - 1) * len(boards) + k - 1] if results else Result.DRAW
            log.append(ev.ResultRecorded(round=r, board=k, result=result))
    return log


# p2 played first four times (SD +4: the side rule breaks whatever side he gets, H3); p6 played
# S S F F (wants the second side absolutely, the first breaks H3). Every other pair except p2-p6,
# p1-p3, p4-p5 has met: that pairing is the only one without a rematch.
FFFF = [[(2, 1), (5, 6), (3, 4)], [(2, 3), (4, 6), (5, 1)], [(2, 4), (6, 1), (3, 5)], [(2, 5), (6, 3), (1, 4)]]


def test_a_player_who_breaks_the_side_rule_anyway_does_not_make_his_opponent_break_it() -> None:
    # docs/engine.md "Sides and boards": first, the sides that break H3 for fewer players. Before the fix
    # p2's larger |SD| won him the second side and p6 broke H3 too (2 breaks on the board, not 1).
    state = state_of(_history(FFFF))
    fld = Field(state, 5, state.available(5))
    p2, p6 = P[1], P[5]
    assert fld.forced(p2) and not fld.forced(p6) and fld.pref[p6].side is fld.pref[p2].side
    assert fld.allocate(p2, p6) == (p2, p6) == fld.allocate(p6, p2)
    assert fld.pair(p6, p2)[1][1] == 1  # side_rule: p2's own break only
    draft = draft_round(state)
    assert (p2, p6) in {(b.first, b.second) for b in draft.boards}
    assert draft.cost["rematch"] == 0 and draft.cost["side_rule"] == _fewest_breaks(fld)
    # The numpy costs (vector.py) allocate alike; the compiled scan is compared with them in
    # test_scan_kernel.py, and the route test below drafts the same round without it.
    order = list(fld.order)
    arrays = Arrays(fld, order)
    i, j = np.triu_indices(len(order), 1)
    rows = arrays.costs(i.astype(np.int64), j.astype(np.int64)).tolist()
    assert rows == [list(fld.pair(order[a], order[b])[1]) for a, b in zip(i.tolist(), j.tolist())]


def _fewest_breaks(fld: Field) -> int:
    """Brute force over every pairing of the six and every side assignment of its boards: the fewest
    side-rule breaks among the pairings without a rematch (costs with the sides given, not allocated)."""
    best: int | None = None
    players = list(fld.order)

    def pairings(rest: list[PlayerId]) -> list[list[tuple[PlayerId, PlayerId]]]:
        if not rest:
            return [[]]
        return [[(rest[0], q)] + tail for k, q in enumerate(rest[1:], 1)
                for tail in pairings(rest[1:k] + rest[k + 1:])]

    for pairing in pairings(players):
        if any(fld.pair(a, b, (a, b))[1][0] > 0 for a, b in pairing):
            continue
        breaks = sum(min(fld.pair(a, b, (a, b))[1][1], fld.pair(a, b, (b, a))[1][1]) for a, b in pairing)
        best = breaks if best is None else min(best, breaks)
    assert best is not None
    return best


# A random imported history (found by search) where the engine used to avoid the board of the player
# who breaks H3 anyway: it drafted p3-p1, p5-p2, p6-p4 with 3 breaks; p1-p6, p3-p5, p2-p4 has 2 and
# the same score gaps. p2 played F F F F, p6 S S S S (both break H3 whatever side they get).
AVOIDED = [[(2, 3), (1, 4), (5, 6)], [(2, 6), (1, 5), (4, 3)], [(2, 1), (4, 5), (3, 6)], [(2, 6), (4, 3), (5, 1)]]
AVOIDED_RESULTS = [Result.SECOND_WINS, Result.FIRST_WINS, Result.DRAW, Result.SECOND_WINS, Result.DRAW,
                   Result.FIRST_WINS, Result.SECOND_WINS, Result.SECOND_WINS, Result.FIRST_WINS, Result.DRAW,
                   Result.FIRST_WINS, Result.DRAW]


def test_the_engine_no_longer_avoids_the_board_of_a_player_who_breaks_the_side_rule_anyway() -> None:
    state = state_of(_history(AVOIDED, AVOIDED_RESULTS))
    fld = Field(state, 5, state.available(5))
    draft = draft_round(state)
    assert {frozenset((b.first, b.second)) for b in draft.boards} == {
        frozenset((P[0], P[5])), frozenset((P[2], P[4])), frozenset((P[1], P[3]))}
    assert draft.cost["side_rule"] == 2 == _fewest_breaks(fld)


def test_the_side_rule_fix_holds_on_the_pure_python_route(monkeypatch: pytest.MonkeyPatch) -> None:
    state = state_of(_history(FFFF))
    fast = draft_round(state)
    monkeypatch.setattr(blossom, "USE_COMPILED", False)
    slow = draft_round(state)
    assert [(b.first, b.second) for b in slow.boards] == [(b.first, b.second) for b in fast.boards]


# Forfeits (H1). Round 1: p1-p2 ends +- (p1 wins by forfeit), p3-p4 and p5-p6 are played. Round 2 pairs
# p1-p3, p2-p5, p4-p6 (all played). Round 3: p1 and p2 have not met over the board.
FORFEITED = [[(1, 2), (3, 4), (5, 6)], [(1, 3), (5, 2), (4, 6)]]
RESULTS = [Result.FIRST_WINS_BY_FORFEIT, Result.DRAW, Result.DRAW, Result.DRAW, Result.DRAW, Result.DRAW]


def _forfeit_state(counts: bool | None) -> EventState:
    settings = {} if counts is None else {"forfeit_is_meeting": counts}
    return state_of(_history(FORFEITED, RESULTS, **settings))


def test_a_forfeited_pairing_is_a_meeting_by_default() -> None:
    # Settings.forfeit_is_meeting defaults to True: the current Handbook's rule as we remember it
    # (C.04.1 b: two players meet at most once; a pairing that ended in a forfeit counts, from memory).
    state = _forfeit_state(None)
    fld = Field(state, 3, state.available(3))
    assert fld.pair(P[0], P[1])[1][0] == 1  # rematch
    draft = draft_round(state)
    assert frozenset((P[0], P[1])) not in {frozenset((b.first, b.second)) for b in draft.boards}
    assert draft.cost["rematch"] == 0


def test_with_the_setting_off_a_forfeited_pair_may_meet_again() -> None:
    # The older Handbook's final remarks: such a pairing "is not illegal in future rounds".
    state = _forfeit_state(False)
    fld = Field(state, 3, state.available(3))
    assert fld.pair(P[0], P[1])[1][0] == 0
    assert fld.pair(P[0], P[2])[1][0] == 1  # a game played over the board stays a meeting


@pytest.mark.parametrize("counts", [True, False])
def test_verify_and_the_explanation_follow_the_setting(counts: bool) -> None:
    # Round 3 stored with p1-p2 again (an organiser's pairing) after their forfeited round 1.
    rounds = FORFEITED + [[(2, 1), (3, 6), (4, 5)]]
    state = state_of(_history(rounds, RESULTS + [Result.DRAW] * 3, forfeit_is_meeting=counts))
    h1 = [b for b in verify.verify_round(state, 3).breaches if b.startswith("H1")]
    assert bool(h1) is counts
    before = verify.state_before(state, 3)
    made = rebuild(before, 3, [(P[1], P[0]), (P[2], P[5]), (P[3], P[4])], None)
    board = next(b for b in made.boards if {b.first, b.second} == {P[0], P[1]})
    assert ("rematch" in board.flags) is counts
    assert ("flag: rematch" in explain(before, made, board.board).reasons) is counts


def test_an_event_where_every_pair_met_by_forfeit_counts_them() -> None:
    # Four players; round 1 and 2 forfeited, round 3 played: with forfeits as meetings everyone has met.
    rounds = [[(1, 2), (3, 4)], [(1, 3), (2, 4)], [(1, 4), (2, 3)]]
    log = new_event([2000, 1990, 1980, 1970], rounds=4)
    for r, boards in enumerate(rounds, 1):
        log.append(ev.RoundDrafted(round=r, boards=tuple(
            ev.BoardModel(board=k, first=P[a - 1], second=P[b - 1]) for k, (a, b) in enumerate(boards, 1)),
            byes=(), source="override"))
        log.append(ev.RoundPublished(round=r))
        for k in range(1, 3):
            log.append(ev.ResultRecorded(round=r, board=k, result=Result.DOUBLE_FORFEIT if r < 3 else Result.DRAW))
    with pytest.raises(NoPairingError, match="already met"):
        draft_round(state_of(log))
