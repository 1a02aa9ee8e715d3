"""`pairings verify` on Dutch rounds: a drafted round passes (one paired by the PPB route too), a hand-made
rematch and a wrong PAB fail."""

from __future__ import annotations

import random

from tests.engine.engine_support import new_event, play, state_of
from pairings import events as ev
from pairings.engine import draft_round, verify_round
from pairings.state import System


def test_drafted_rounds_verify_and_tampered_ones_do_not() -> None:
    rng = random.Random(2)
    log = new_event([rng.randint(1200, 2400) for _ in range(11)], rounds=5, system=System.DUTCH, seed=2)
    for _ in range(3):
        play(log, draft_round(state_of(log)), rng)
    st = state_of(log)
    for r in (1, 2, 3):
        check = verify_round(st, r)
        assert check.ok and check.optimal and check.certified, check.lines()
    # Round 4 drafted, then two boards swapped by hand into a rematch of round 1's board 1.
    draft = draft_round(st)
    first = st.round(1)
    assert first is not None
    a, b = first.games[0].first, first.games[0].second
    pairs = [(x.first, x.second) for x in draft.boards]
    others = [p for pair in pairs for p in pair if p not in (a, b)]
    bye = draft.pairing_bye
    forged = ev.RoundDrafted(round=4, boards=(ev.BoardModel(board=1, first=a, second=b),) + tuple(
        ev.BoardModel(board=i // 2 + 2, first=others[i], second=others[i + 1]) for i in range(0, len(others), 2)),
        byes=tuple(ev.ByeModel(player=y.player, kind=y.kind, points=y.points) for y in draft.byes))
    check = verify_round(state_of(log + [forged]), 4)
    assert any(x.startswith("C.1: board 1") for x in check.breaches)
    assert check.optimal is False
    # The PAB given twice: round 2's PAB receiver forced onto round 4's PAB.
    second = st.round(2)
    assert second is not None and bye is not None
    again = next(y.player for y in second.byes if y.kind.value == "pairing")
    swapped = [(again if p == bye else bye if p == again else p) for pair in pairs for p in pair]
    forged = ev.RoundDrafted(round=4, boards=tuple(
        ev.BoardModel(board=i // 2 + 1, first=swapped[i], second=swapped[i + 1]) for i in range(0, len(swapped), 2)),
        byes=(ev.ByeModel(player=again, kind="pairing", points=1.0),))  # type: ignore[arg-type]
    check = verify_round(state_of(log + [forged]), 4)
    assert any(x.startswith("C.2") for x in check.breaches)


def test_a_round_paired_by_the_ppb_route_verifies() -> None:
    # seven players, round 4: a bracket's floaters leave the rest unpairable, so it is paired again as the
    # PPB and the rest as the CLB (C.04.3 C.4, from memory); the re-run in verify takes the same route
    from pairings.engine.dutch import plan

    rng = random.Random(1)
    log = new_event([rng.randint(1200, 2400) for _ in range(7)], rounds=6, system=System.DUTCH, seed=1)
    for _ in range(3):
        play(log, draft_round(state_of(log)), rng)
    shown = plan(state_of(log))
    assert any(b.bracket.ppb for b in shown.brackets) and shown.brackets[-1].bracket.last
    play(log, draft_round(state_of(log)), rng)
    check = verify_round(state_of(log), 4)
    assert check.ok and check.optimal and check.certified, check.lines()
