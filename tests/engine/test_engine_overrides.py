"""Overrides, explanations and the round check."""

from __future__ import annotations

import random
from itertools import combinations

import pytest

from tests.engine.engine_support import new_event, play, simulate, state_of
from pairings import events as ev
from pairings.engine import (
    Overrides, compare, draft_round, explain, rebuild, swap, verify_round,
)
from pairings.errors import NoPairingError
from pairings.state import ByeKind


def test_rebuild_of_the_optimum_costs_the_same() -> None:
    state = state_of(simulate(40, 4, seed=4, byes=0.05))
    draft = draft_round(state)
    again = rebuild(state, draft.round, [(b.first, b.second) for b in draft.boards], draft.pairing_bye)
    assert again.key() == draft.key()
    assert compare(draft, again).describe() == "no change"


def test_swap_marks_changed_and_costs_at_least_the_optimum() -> None:
    state = state_of(simulate(30, 3, seed=9))
    draft = draft_round(state)
    a, b = draft.boards[0].first, draft.boards[-1].second
    other = swap(state, draft, a, b)
    changed = [x for x in other.boards if "changed" in x.flags]
    assert len(changed) == 2 and {a, b} <= {p for x in changed for p in (x.first, x.second)}
    delta = compare(draft, other)
    assert other.key() >= draft.key()
    assert delta.worse == (other.key() > draft.key())
    assert (delta.describe() == "no change") == (not delta.worse and other.key() == draft.key())
    with pytest.raises(NoPairingError):
        swap(state, draft, draft.boards[0].first, draft.boards[0].second)


def test_swap_with_the_bye() -> None:
    state = state_of(simulate(15, 2, seed=3))
    draft = draft_round(state)
    bye = draft.pairing_bye
    assert bye is not None
    other = swap(state, draft, bye, draft.boards[0].first)
    assert other.pairing_bye == draft.boards[0].first
    assert any(bye in (x.first, x.second) and "changed" in x.flags for x in other.boards)


def test_pin_keeps_the_board_and_its_sides() -> None:
    state = state_of(simulate(20, 3, seed=5))
    optimum = draft_round(state)
    top = state.available(state.next_round_number)
    pin = (top[-1], top[0])
    draft = draft_round(state, Overrides(pinned=(pin,)))
    board = next(b for b in draft.boards if b.first == pin[0])
    assert board.second == pin[1] and "pinned" in board.flags
    assert draft.key() >= optimum.key()


def test_override_absent_and_forced_bye() -> None:
    state = state_of(simulate(12, 2, seed=8))
    players = state.available(3)
    draft = draft_round(state, Overrides(absent=frozenset({players[0]}), bye=players[1]))
    assert draft.pairing_bye == players[1]
    assert any(y.player == players[0] and y.kind is ByeKind.ABSENCE for y in draft.byes)
    with pytest.raises(NoPairingError, match="odd"):
        draft_round(state, Overrides(bye=players[1]))


def test_no_bye_is_respected() -> None:
    state = state_of(simulate(9, 1, seed=2))
    first = draft_round(state)
    assert first.pairing_bye is not None
    again = draft_round(state, Overrides(no_bye=frozenset({first.pairing_bye})))
    assert again.pairing_bye not in (None, first.pairing_bye)


def test_explain_gives_the_exact_cheapest_alternative() -> None:
    state = state_of(simulate(16, 3, seed=6))
    draft = draft_round(state)
    for board in (1, len(draft.boards)):
        why = explain(state, draft, board)
        b = draft.boards[board - 1]
        assert why.alternative is not None and why.delta is not None
        assert why.alternative.key() >= draft.key()
        assert why.first_instead != b.second and why.second_instead != b.first
        # exact: equal to the optimum with this pair forbidden.
        forced = draft_round(state, Overrides(forbidden=((b.first, b.second),)))
        assert forced.key() == why.alternative.key()
        text = "\n".join(why.lines())
        assert "cheapest alternative" in text and why.delta.describe() in text


def test_describe_words() -> None:
    state = state_of(simulate(30, 4, seed=12))
    draft = draft_round(state)
    worst = None
    for a, b in combinations([x.first for x in draft.boards[:6]], 2):
        other = swap(state, draft, a, b)
        if compare(draft, other).worse:
            worst = compare(draft, other)
            break
    assert worst is not None
    text = worst.describe()
    assert text != "no change" and text[0] in "+-"


def test_verify_engine_rounds_are_optimal_and_certified() -> None:
    log = simulate(24, 4, seed=21, withdraw=0.03, byes=0.05)
    state = state_of(log)
    for r in range(1, 5):
        check = verify_round(state, r)
        assert check.ok and check.optimal is True and check.certified, check.lines()
        assert any("Berge certificate" in line for line in check.lines())


def test_verify_reports_each_breach() -> None:
    rng = random.Random(1)
    log = new_event([2000, 1900, 1800, 1700])
    play(log, draft_round(state_of(log)), rng)
    state = state_of(log)
    first = state.rounds[0].games
    log.append(ev.PairForbidden(a=first[1].first, b=first[1].second))
    # Round 2 as the organiser made it: both round-1 pairs again.
    log.append(ev.RoundDrafted(round=2, boards=tuple(
        ev.BoardModel(board=g.board, first=g.first, second=g.second) for g in first), source="override"))
    log.append(ev.RoundPublished(round=2))
    check = verify_round(state_of(log), 2)
    text = "\n".join(check.lines())
    assert not check.ok
    assert text.count("H1") == 2 and "H5" in text
    assert check.optimal is None  # an override round is not compared with the optimum


def test_verify_catches_a_round_that_is_not_the_optimum() -> None:
    rng = random.Random(2)
    log = new_event([2000, 1900, 1800, 1700, 1600, 1500])
    draft = draft_round(state_of(log))
    worse = swap(state_of(log), draft, draft.boards[0].first, draft.boards[1].second)
    play(log, worse, rng)  # stored with source "engine" though it is not the optimum
    check = verify_round(state_of(log), 1)
    assert check.optimal is False and not check.ok


def test_round_robin_from_the_berger_tables() -> None:
    rng = random.Random(4)
    log = new_event([2000 - 10 * i for i in range(5)], rounds=5, system="round_robin")
    met = set()
    for r in range(1, 6):
        draft = draft_round(state_of(log))
        assert len(draft.boards) == 2 and draft.pairing_bye is not None
        for b in draft.boards:
            key = frozenset((b.first, b.second))
            assert key not in met
            met.add(key)
        play(log, draft, rng)
        assert verify_round(state_of(log), r).ok
    assert len(met) == 10  # every pair of 5 met once (FIDE C.05 Annex 1)


def test_without_a_greedy_pairing_the_full_graph_is_solved() -> None:
    # Four players, rank order p1..p4 (ratings). The greedy pairing gives p1 the first of its
    # equally cheap partners, p2, and p3-p4 is forbidden: no greedy pairing, but p1-p4 and p2-p3
    # pair everyone (worked by hand), as networkx on the full graph confirms.
    state = state_of(new_event([2400, 2300, 2200, 2100]))
    ov = Overrides(forbidden=(("p00003", "p00004"), ("p00001", "p00003")))
    draft = draft_round(state, ov)
    assert {frozenset((b.first, b.second)) for b in draft.boards} == \
        {frozenset(("p00001", "p00004")), frozenset(("p00002", "p00003"))}
    assert draft_round(state, ov, reference=True).key() == draft.key()


def test_a_player_without_a_legal_partner_is_named() -> None:
    # p1 may meet nobody: a maximum matching (route.most_paired) leaves p1 and one other unpaired.
    state = state_of(new_event([2400, 2300, 2200, 2100]))
    ov = Overrides(forbidden=(("p00001", "p00002"), ("p00001", "p00003"), ("p00001", "p00004")))
    with pytest.raises(NoPairingError, match="no pairing gives Player 00001, Player 0000[234] an opponent"):
        draft_round(state, ov)
