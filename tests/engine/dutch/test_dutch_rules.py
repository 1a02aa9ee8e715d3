"""The FIDE (Dutch) System's rules on hand-checked cases (C.04.1 / C.04.3, 2025; C.04.5.1 Baku).

Round 1 check values follow from the Handbook's rules (C.04.3 round-1 pairing
of the top half against the bottom half, colours by the initial-colour rule;
from memory); later rounds are derived by hand in the comments.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from tests.cli.conftest import Ran
from tests.engine.engine_support import new_event, state_of
from pairings import events as ev
from pairings.cli import main
from pairings.engine import draft_round
from pairings.engine.acceleration import accelerated_rounds, group_a, virtual_points
from pairings.engine.dutch import plan
from pairings.engine.dutch.colours import initial_colour
from pairings.engine.dutch.entrants import Entrants, pairing_numbers
from pairings.errors import NoPairingError
from pairings.interchange import export_event, restore_events
from pairings.reports.sheets import start_numbers
from pairings.state import Acceleration, PlayerId, Result, Side, System

P = [PlayerId(f"p{i:05d}") for i in range(1, 17)]


def _event(n: int, rounds: int = 5, **settings: object) -> list[ev.Event]:
    return new_event([2400 - 10 * i for i in range(n)], rounds=rounds, system=System.DUTCH, **settings)


def _boards(log: list[ev.Event]) -> list[tuple[str, str]]:
    return [(b.first, b.second) for b in draft_round(state_of(log)).boards]


def _white_first(log: list[ev.Event]) -> bool:
    st = state_of(log)
    return initial_colour(Entrants(st, 1, st.available(1))) is Side.FIRST


def _seed_with_white() -> int:
    return next(s for s in range(100) if _white_first(_event(2, seed=s)))


def _record(log: list[ev.Event], rnd: int, results: list[Result]) -> None:
    draft = draft_round(state_of(log))
    log.append(ev.RoundDrafted(round=rnd, boards=tuple(ev.BoardModel(board=b.board, first=b.first, second=b.second)
                                                     for b in draft.boards),
                               byes=tuple(ev.ByeModel(player=y.player, kind=y.kind, points=y.points)
                                          for y in draft.byes)))
    log.append(ev.RoundPublished(round=rnd))
    for b, r in zip(draft.boards, results):
        log.append(ev.ResultRecorded(round=rnd, board=b.board, result=r))


def test_round_one_eight_players() -> None:
    # C.04.3 round 1 (from memory): S1 = 1-4 against S2 = 5-8; colours rule 5: 1 (odd) gets the initial colour,
    # board 2's higher player 2 (even) the other one, ...: 1-5, 6-2, 3-7, 8-4 with White for player 1.
    log = _event(8, seed=_seed_with_white())
    assert _boards(log) == [(P[0], P[4]), (P[5], P[1]), (P[2], P[6]), (P[7], P[3])]


def test_round_one_other_initial_colour() -> None:
    seed = next(s for s in range(100) if not _white_first(_event(2, seed=s)))
    assert _boards(_event(8, seed=seed)) == [(P[4], P[0]), (P[1], P[5]), (P[6], P[2]), (P[3], P[7])]


def test_round_one_nine_players_bye_to_the_lowest() -> None:
    # C.04.1 rule 3 / C.04.3: the odd player out of the only bracket is the lowest: S2 = 5..9, 9 is left over.
    draft = draft_round(state_of(_event(9, seed=_seed_with_white())))
    assert [(b.first, b.second) for b in draft.boards] == [(P[0], P[4]), (P[5], P[1]), (P[2], P[6]), (P[7], P[3])]
    assert draft.pairing_bye == P[8]


def test_round_two_by_hand() -> None:
    # Round 1 (White for 1): 1-4, 5-2, 3-6. Results: 1 wins, 2 wins with Black, 3-6 drawn.
    # Round 2 score groups: {1, 2} (1 point), {3, 6} (0.5), {4, 5} (0).
    # Bracket {1, 2}: one pair 1-2; 1 had White, 2 Black (mild preferences) -> rule 1: 2 White.
    # Bracket {3, 6}: they have met (C.1): no pair; both float down (C.5).
    # Bracket {3, 6 | 4, 5}: MDPs 3, 6 with residents 4, 5; first MDP transposition 3-4, 6-5 meets every
    # criterion: 3 had White, 4 Black -> 4 White; 6 had Black, 5 White -> 6 White.
    # Boards: 2-1 (1 point), then the 0.5-point pairs by their higher player's rank: 3 before 6.
    log = _event(6, seed=_seed_with_white())
    assert _boards(log) == [(P[0], P[3]), (P[4], P[1]), (P[2], P[5])]
    _record(log, 1, [Result.FIRST_WINS, Result.SECOND_WINS, Result.DRAW])
    draft = draft_round(state_of(log))
    assert [(b.first, b.second) for b in draft.boards] == [(P[1], P[0]), (P[3], P[2]), (P[5], P[4])]
    assert [b.flags for b in draft.boards] == [(), ("gap 0.5",), ("gap 0.5",)]


def test_round_two_colours_pick_the_transposition() -> None:
    # Round 1 (White for 1): 1-3, 4-2; 1 and 2 win. Round 2: {1, 2} and {3, 4}.
    # {1, 2}: 1 had White, 2 Black: 2-1. {3, 4}: 3 had Black (wants White), 4 White: 3-4.
    log = _event(4, seed=_seed_with_white())
    _record(log, 1, [Result.FIRST_WINS, Result.SECOND_WINS])
    assert _boards(log) == [(P[1], P[0]), (P[2], P[3])]


def test_pab_not_twice() -> None:
    # C.04.1 (2025) rule 4: the round-1 PAB receiver (9) is not eligible again. Round 1 (White for 1):
    # 1-5, 6-2, 3-7, 8-4, all drawn; 9 has the PAB (1 point). Round 2: 9 alone at 1 point floats into the
    # 0.5 bracket (MDP 9, residents 1-8). Mild colour preferences: 1, 3, 6, 8 want Black; 2, 4, 5, 7 White.
    # MDP pairing: 9-1 first (9 has no preference: no colour lost). Remainder 2..8, 3 pairs: S1 = 2 3 4,
    # S2 = 5 6 7 8. C.10 (no preference lost) needs each pair one Black- and one White-wanter: 2 can only
    # take 8 (2-6 met), then 3-5 (3-7 met), 4-6; 7 is left over and takes the PAB (it also has the same
    # C.6 score difference as any other leftover). 9 is never the PAB.
    log = _event(9, seed=_seed_with_white())
    _record(log, 1, [Result.DRAW] * 4)
    draft = draft_round(state_of(log))
    assert {frozenset((b.first, b.second)) for b in draft.boards} == {
        frozenset((P[8], P[0])), frozenset((P[1], P[7])), frozenset((P[2], P[4])), frozenset((P[3], P[5]))}
    assert draft.pairing_bye == P[6]


def test_pab_not_after_a_forfeit_win() -> None:
    # Rule 4: credited a win's points without playing (a forfeit win) -> never the PAB.
    log = _event(3, rounds=3, seed=_seed_with_white())
    _record(log, 1, [Result.FIRST_WINS_BY_FORFEIT])  # 1 wins by forfeit against 2; 3 gets the PAB
    st = state_of(log)
    ent = Entrants(st, 2, st.available(2))
    assert ent.pab_eligible == frozenset({P[1]})
    # Round 2: 1 and 3 (1 point) and 2 (0). 1-2 was paired (a forfeit counts as a meeting by default),
    # so 1 meets 3 and 2 takes the PAB.
    draft = draft_round(st)
    assert {frozenset((b.first, b.second)) for b in draft.boards} == {frozenset((P[0], P[2]))}
    assert draft.pairing_bye == P[1]


def test_no_legal_round() -> None:
    log = _event(2, rounds=3, seed=1)
    _record(log, 1, [Result.DRAW])
    with pytest.raises(NoPairingError):
        draft_round(state_of(log))


def test_pairing_numbers_rating_title_name() -> None:
    # C.04.2 initial order (from memory): rating, then title (GM before IM before FM ...), then name.
    log: list[ev.Event] = [ev.EventCreated(name="Order Open", rounds=3, system=System.DUTCH)]
    for pid, name, rating, title in [("a", "Zed", 2000, None), ("b", "Yan", 2000, "FM"), ("c", "Xia", 2000, "IM"),
                                     ("d", "Abe", 2000, None), ("e", "Wu", 2100, None)]:
        details = ev.PlayerDetailsModel(title=title) if title else None
        log.append(ev.PlayerRegistered(id=pid, name=name, rating=rating, details=details))
    assert pairing_numbers(state_of(log)) == ("e", "c", "b", "d", "a")
    # the sheets' start numbers are the Dutch pairing numbers in a Dutch event
    assert start_numbers(state_of(log)) == {"e": 1, "c": 2, "b": 3, "d": 4, "a": 5}
    # the whole-round system's initial rank has no title step: rating, then name
    whole = [ev.EventCreated(name="Order Open", rounds=3), *log[1:]]
    assert state_of(whole).initial_rank() == ("e", "d", "c", "b", "a")


def test_baku_schedule_and_groups() -> None:
    # C.04.5.1 (read): 9 rounds -> VP 1 in rounds 1-3, 0.5 in 4-5; N = 161 -> GA = 82; N = 9 -> 6.
    assert accelerated_rounds(9) == (3, 5)
    assert accelerated_rounds(7) == (2, 4)
    assert accelerated_rounds(5) == (2, 3)
    st = state_of(new_event([2000] * 161, rounds=9, acceleration=Acceleration.BAKU))
    assert len(group_a(st, st.initial_rank())) == 82
    st9 = state_of(new_event([2000 - i for i in range(9)], rounds=9, acceleration=Acceleration.BAKU))
    assert group_a(st9, st9.initial_rank()) == frozenset(P[:6])
    assert virtual_points(st9, 4, st9.initial_rank())[P[0]] * 2 == 1
    assert virtual_points(st9, 6, st9.initial_rank()) == {}


@pytest.mark.parametrize("system", [System.DUTCH, System.SWISS])
def test_baku_pairs_the_groups_apart(system: System) -> None:
    # Worked illustration (C.04.5.1 as read): 16 players, 7 rounds: GA = 1-8 has pairing score 1 in round 1,
    # GB = 9-16 has 0: two brackets; the Dutch system pairs 1-5, 2-6, 3-7, 4-8 and 9-13, 10-14, 11-15, 12-16.
    log = new_event([2400 - 10 * i for i in range(16)], rounds=7, system=system, acceleration=Acceleration.BAKU,
                    seed=3)
    st = state_of(log)
    pairs = {frozenset((b.first, b.second)) for b in draft_round(st).boards}
    ga = set(P[:8])
    assert all(len(p & ga) in (0, 2) for p in pairs)
    if system is System.DUTCH:
        assert pairs == {frozenset((P[i], P[i + 4])) for i in (0, 1, 2, 3, 8, 9, 10, 11)}
        # Round 2, the higher player always winning: pairing scores 2 (1-4), 1 (5-12), 0 (13-16).
        _record(log, 1, [Result.FIRST_WINS if b[0] < b[1] else Result.SECOND_WINS for b in _boards(log)])
        st = state_of(log)
        groups = [set(b.bracket.members) - b.bracket.mdps for b in plan(st).brackets]
        assert groups == [set(P[:4]), set(P[4:12]), set(P[12:])]
        assert st.score(P[0]) == 1.0  # standings keep the real points


def test_cli_new_dutch_baku(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    def cli(*args: object) -> Ran:
        code = main([str(a) for a in args])
        out = capsys.readouterr()
        return Ran(code, out.out, out.err)

    path = tmp_path / "e.pairings"
    ran = cli("new", path, "--name", "Dutch Open", "--rounds", "5", "--system", "dutch",
                   "--acceleration", "baku", "--seed", "3")
    assert ran.code == 0, ran.err
    from pairings.store import EventStore

    with EventStore.open(path) as store:
        doc = export_event(store.state)
    assert doc["event"]["system"] == "dutch" and doc["event"]["acceleration"] == "baku"
    created = restore_events(doc)[0]
    assert isinstance(created, ev.EventCreated)
    assert created.system is System.DUTCH and created.acceleration is Acceleration.BAKU
    bad = cli("new", tmp_path / "f.pairings", "--name", "X", "--rounds", "5", "--system", "monrad")
    assert bad.code == 2 and "system 'monrad'" in bad.err and not (tmp_path / "f.pairings").exists()
    bad = cli("new", tmp_path / "g.pairings", "--name", "X", "--rounds", "5", "--acceleration", "baku",
              "--scoring", "3,1,0")
    assert bad.code == 2 and "standard scoring" in bad.err


def test_why_panel_speaks_the_dutch_criteria() -> None:
    # The hand-derived round 2 above: 3 and 6 (drawn, they have met) float into the 0-point bracket.
    from pairings.engine import explain

    log = _event(6, seed=_seed_with_white())
    _record(log, 1, [Result.FIRST_WINS, Result.SECOND_WINS, Result.DRAW])
    st = state_of(log)
    draft = draft_round(st)
    lines = explain(st, draft, 2).lines()
    text = "\n".join(lines)
    assert "bracket of 0 points (4 players, 2 moved down)" in text
    assert f"{P[2]} was left unpaired in the 0.5-point bracket: only 0 of its 2 players could be paired" in text
    assert "colours: rule 1: both colour preferences granted" in text
    assert "PAB" not in text
    nine = _event(9, seed=_seed_with_white())
    st9 = state_of(nine)
    text9 = "\n".join(explain(st9, draft_round(st9), 4).lines())
    assert f"PAB: {P[8]}, left over by the last bracket" in text9
    assert "rule 5: the initial colour" in text9


def test_why_panel_names_virtual_points_whole_round() -> None:
    from pairings.engine import explain

    st = state_of(new_event([2400 - 10 * i for i in range(8)], rounds=5, acceleration=Acceleration.BAKU, seed=3))
    draft = draft_round(st)
    text = "\n".join(explain(st, draft, 1).lines())
    assert "carries 1 virtual point(s) this round (Baku acceleration, pairing only)" in text
    dutch = state_of(new_event([2400 - 10 * i for i in range(8)], rounds=5, acceleration=Acceleration.BAKU,
                               system=System.DUTCH, seed=3))
    text = "\n".join(explain(dutch, draft_round(dutch), 1).lines())
    assert "pairing score 1, of which 1 virtual (Baku)" in text


def test_pairing_sheet_says_not_endorsed() -> None:
    from datetime import datetime, timezone

    from pairings.reports.sheets import pairing_sheet

    log = _event(8, seed=3, acceleration=Acceleration.BAKU)
    _record(log, 1, [Result.DRAW] * 4)
    notes = pairing_sheet(state_of(log), 1, datetime(2026, 1, 1, tzinfo=timezone.utc)).notes
    assert any("not endorsed by FIDE" in n for n in notes)
    assert any("virtual points decide the pairing only" in n for n in notes)
    plain = new_event([2000, 1900], rounds=3, seed=1)
    _record(plain, 1, [Result.DRAW])
    assert not any("FIDE" in n for n in pairing_sheet(state_of(plain), 1, datetime(2026, 1, 1)).notes)


def test_same_draft_with_and_without_the_compiled_kernel() -> None:
    # Every accepted form is exact and the generation order is a total order: the route cannot matter.
    import random

    from pairings.engine import blossom
    from tests.engine.engine_support import play

    rng = random.Random(8)
    log = new_event([rng.randint(1200, 2400) for _ in range(23)], rounds=6, system=System.DUTCH, seed=8)
    for _ in range(4):
        st = state_of(log)
        fast = draft_round(st)
        blossom.USE_COMPILED = False
        try:
            slow = draft_round(st)
        finally:
            blossom.USE_COMPILED = True
        assert [(b.first, b.second) for b in fast.boards] == [(b.first, b.second) for b in slow.boards]
        assert fast.pairing_bye == slow.pairing_bye
        play(log, fast, rng)


def test_swap_keeps_the_dutch_colours_and_board_order() -> None:
    # The hand-derived round 2 (2-1, 4-3, 6-5); swapping 3 and 5 re-pairs by hand 3-6 (a rematch of round 1,
    # flagged) and 4-5. Dutch colours: 3 had White, 6 Black: 6 gets White (rule 1); 4 had Black, 5 White:
    # 4 gets White. Board order: 6-3 (0.5 points each) before 4-5.
    from pairings.engine import swap

    log = _event(6, seed=_seed_with_white())
    _record(log, 1, [Result.FIRST_WINS, Result.SECOND_WINS, Result.DRAW])
    st = state_of(log)
    swapped = swap(st, draft_round(st), P[2], P[4])
    assert [(b.first, b.second) for b in swapped.boards] == [(P[1], P[0]), (P[5], P[2]), (P[3], P[4])]
    assert all("changed" in b.flags for b in swapped.boards[1:])
    assert "rematch" in swapped.boards[1].flags and "rematch" not in swapped.boards[2].flags


def test_baku_late_entrant_joins_by_rank() -> None:
    # C.04.5.1 (read): the last GA player stays last of GA; a late entrant ranked above him joins GA
    # (our reading: membership by rank), one ranked below joins GB. N = 8 -> GA = 1-4, boundary player 4.
    log = new_event([2400 - 10 * i for i in range(8)], rounds=9, acceleration=Acceleration.BAKU)
    log.append(ev.PlayerRegistered(id="hi", name="High Late", rating=2395, entry_round=2))
    log.append(ev.PlayerRegistered(id="lo", name="Low Late", rating=2355, entry_round=2))
    st = state_of(log)
    ga = group_a(st, st.initial_rank())
    assert ga == frozenset(P[:4]) | {PlayerId("hi")}


def test_a_dutch_event_from_the_command_line(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    import json

    def ok(*args: object) -> str:
        code = main([str(a) for a in args])
        out = capsys.readouterr()
        assert code == 0, out.err
        return out.out

    path = tmp_path / "d.pairings"
    ok("new", path, "--name", "Dutch Club", "--rounds", "3", "--system", "dutch", "--seed", "5")
    for i, name in enumerate(["Ada Quince", "Bo Rill", "Cy Marsh", "Dee Fenn", "Eli Stowe"]):
        ok("player", "add", path, "--name", name, "--rating", 2000 - 100 * i)
    for rnd in (1, 2):
        doc = json.loads(ok("pair", path, "--json"))
        assert len(doc["games"]) == 2 and all("flags" in g for g in doc["games"])
        ok("publish", path)
        for board in (1, 2):
            ok("result", path, board, "1-0")
    report = ok("verify", path)
    assert "Dutch system run again: same pairs and PAB" in report
