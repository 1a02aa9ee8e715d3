"""The C.07 tiebreak list: acronyms, modifiers, defaults, direct encounter by sub-groups,
the 2023 unplayed-round rules (as remembered) and the B.02 tables behind the ratings."""

from __future__ import annotations

import json
import shutil
from pathlib import Path
from typing import Callable

import pytest

from pairings import actions
from pairings.errors import InputError
from pairings.standings import TIEBREAKS, check_tiebreaks, default_tiebreaks, legend, standings, tiebreak
from pairings.standings.ratings import _DP_TABLE, expected_hundredths
from pairings.state import EventState, PlayerId, System, Unplayed
from pairings.store import EventStore

Build = Callable[..., EventState]
FIXTURE = Path(__file__).parents[1] / "fixtures" / "event-v1.pairings"


def test_acronyms_any_case_and_stored_names() -> None:
    assert check_tiebreaks(["bh-c1", " BH ", "sb", "Win"]) == ("BH-C1", "BH", "SB", "WIN")
    assert check_tiebreaks("bh-c1, BH,sb,Win") == ("BH-C1", "BH", "SB", "WIN")   # one string, as typed
    # The snake_case names older event files stored read as the same tiebreaks.
    assert check_tiebreaks(["buchholz_cut1", "median_buchholz", "sonneborn_berger", "wins", "games_second",
                            "progressive", "average_rating_opponents", "performance_rating",
                            "direct_encounter"]) == (
        "BH-C1", "BH-M1", "SB", "WIN", "BPG", "PS", "ARO", "TPR", "DE")
    # Every acronym with every modifier it allows reads back as itself, and its JSON key as itself.
    for kind in TIEBREAKS.values():
        for acronym in (kind.acronym, *(f"{kind.acronym}-{m}" for m in kind.modifiers)):
            assert check_tiebreaks([acronym.lower()]) == (acronym,)
            assert check_tiebreaks([tiebreak(acronym).key]) == (acronym,)


@pytest.mark.parametrize(("names", "message"), [
    (["BH", "XYZ"], "unknown tiebreak 'XYZ'"),
    (["DE-C1"], "DE takes no modifier 'C1'"),
    (["KS-M1"], "KS takes no modifier"),
    (["PS-M1"], r"allowed: PS-C1, PS-C2"),
    (["BH-C3"], "BH takes no modifier 'C3'"),
    (["bh", "BH"], "BH is listed twice"),
    (["buchholz", "bh"], "BH is listed twice"),
])
def test_bad_lists_are_refused(names: list[str], message: str) -> None:
    with pytest.raises(InputError, match=message):
        check_tiebreaks(names)


def test_defaults_by_system() -> None:
    # C.07 recommendations as remembered (section 7 of our brief; decision documented in docs/tiebreaks.md).
    assert default_tiebreaks(System.SWISS) == ("BH-C1", "BH", "DE", "WIN", "BPG")
    assert default_tiebreaks(System.DUTCH, sides=False) == ("BH-C1", "BH", "DE", "WIN", "WON")
    assert default_tiebreaks(System.ROUND_ROBIN) == ("DE", "WIN", "SB", "KS")
    assert actions.new_event("Open", 5, seed=1).tiebreaks == ("BH-C1", "BH", "DE", "WIN", "BPG")
    assert actions.new_event("All", 5, seed=1, round_robin=True).tiebreaks == ("DE", "WIN", "SB", "KS")


def test_old_files_keep_their_list(tmp_path: Path) -> None:
    # A version-1 file stored no list: it keeps the one it had (BH-C1, BH, SB, WIN), not the new defaults.
    copy = tmp_path / "old.pairings"
    shutil.copy(FIXTURE, copy)
    with EventStore.open(copy) as store:
        assert standings(store.state).tiebreaks == ("BH-C1", "BH", "SB", "WIN")


def test_json_keeps_snake_case_keys_in_the_chosen_order(build: Build) -> None:
    players = [("x", "Xia", 1500), ("y", "Yann", 1400), ("z", "Zed", 1300)]
    state = build(players, [([("x", "y", "1/2-1/2")], [("z", "pairing", 1.0)])])
    rows = json.loads(json.dumps(standings(state, tiebreaks=("KS", "bh-m1", "SB-C1", "ARO")).to_json()))
    assert list(rows[0]["tiebreaks"]) == ["koya", "median_buchholz", "sonneborn_berger_cut1",
                                          "average_rating_opponents"]


def test_legend_names_each_in_full_and_the_edition() -> None:
    lines = legend(("BH-C1", "DE", "PS-C2"))
    assert lines[:3] == ("BH-C1 = Buchholz, cut 1", "DE = Direct encounter", "PS-C2 = Progressive score, cut 2")
    assert "2023" in lines[3] and "as remembered" in lines[3]


def _rr(build: Build) -> EventState:
    """Four players W, X, Y, Z tied on 2 points after 4 rounds; outsiders O1-O4.

    Among W, X, Y, Z (rounds 1-3): W draws X and Y and beats Z, X beats Y, Z beats X, Y beats Z.
    So W 2, X 1½, Y 1½, Z 1 among them; round 4 against the outsiders brings all four to 2:
    W loses to O1, X draws O2, Y draws O3, Z beats O4. Outsiders: O1 1, O2 3, O3 3, O4 1.
    """
    players = [(p, f"Player {p}", 2000 - 10 * i) for i, p in enumerate(
        ("W", "X", "Y", "Z", "O1", "O2", "O3", "O4"))]
    rounds = [
        ([("W", "X", "1/2-1/2"), ("Y", "Z", "1-0"), ("O1", "O2", "0-1"), ("O3", "O4", "1-0")], []),
        ([("W", "Y", "1/2-1/2"), ("Z", "X", "1-0"), ("O3", "O1", "1-0"), ("O2", "O4", "1-0")], []),
        ([("Z", "W", "0-1"), ("X", "Y", "1-0"), ("O4", "O1", "1-0"), ("O2", "O3", "1/2-1/2")], []),
        ([("O1", "W", "1-0"), ("X", "O2", "1/2-1/2"), ("Y", "O3", "1/2-1/2"), ("Z", "O4", "1-0")], []),
    ]
    return build(players, rounds)


def test_direct_encounter_is_recomputed_for_each_still_tied_sub_group(build: Build) -> None:
    # Hand-worked (C.07, from memory): DE among W, X, Y, Z gives W 2, X 1½, Y 1½, Z 1; X and Y
    # are still tied, and DE among them alone (X beat Y) puts X first. O2 and O3 (3 points) drew
    # their game: still tied, they share 1-2. O1 and O4 (1 point each) met in round 3, O4 won.
    table = standings(_rr(build), tiebreaks=("DE",))
    assert [(r.rank, r.player, r.tiebreaks["DE"]) for r in table.rows] == [
        ("1-2", "O2", 0.5), ("1-2", "O3", 0.5), (3, "W", 2), (4, "X", 1.5), (5, "Y", 1.5), (6, "Z", 1),
        (7, "O4", 1), (8, "O1", 0)]


def test_direct_encounter_when_not_all_have_met(build: Build) -> None:
    # P, Q, R end on 2 points; P beat Q and R, but Q and R never met. No result of the missing
    # game lifts Q or R above P's 2 (each could reach 1), so P ranks first; Q and R stay tied
    # (C.07 as remembered: DE applies when the missing games cannot change the order).
    players = [("P", "Pia", 1500), ("Q", "Quin", 1600), ("R", "Ria", 1700), ("X", "Xan", 1400),
               ("Y", "Yul", 1300), ("Z", "Zia", 1200)]
    rounds = [
        ([("P", "Q", "1-0"), ("R", "X", "1-0"), ("Y", "Z", "1/2-1/2")], []),
        ([("R", "P", "0-1"), ("Q", "Y", "1-0"), ("X", "Z", "1-0")], []),
        ([("P", "Z", "0-1"), ("Q", "X", "1-0"), ("R", "Y", "1-0")], []),
    ]
    table = standings(build(players, rounds), tiebreaks=("DE",))
    assert [(r.rank, r.player, r.tiebreaks["DE"]) for r in table.rows][:3] == [
        (1, "P", 2), ("2-3", "R", 0), ("2-3", "Q", 0)]


def _absent(build: Build) -> EventState:
    """X wins rounds 1-2 and is absent in round 3 (a voluntary unplayed round).

    R1 X-A 1-0, B-C ½-½;  R2 B-X 0-1, A-C 0-1;  R3 A-B 1-0, C pairing bye, X absent.
    Final: X 2, A 1, B ½, C 2½.
    """
    players = [("X", "Xan", 1800), ("A", "Abe", 1700), ("B", "Bea", 1600), ("C", "Cal", 1500)]
    rounds = [
        ([("X", "A", "1-0"), ("B", "C", "1/2-1/2")], []),
        ([("B", "X", "0-1"), ("A", "C", "0-1")], []),
        ([("A", "B", "1-0")], [("C", "pairing", 1.0), ("X", "absence", 0.0)]),
    ]
    return build(players, rounds)


def test_dummy_opponent_cuts_the_voluntary_unplayed_round_first(build: Build) -> None:
    # C.07 2023 as remembered (low confidence): X's absence meets a dummy opponent on X's own
    # score 2, so BH = A 1 + B ½ + 2 = 3½; BH-C1 cuts the voluntary unplayed round first (not B's
    # ½, the lowest): 1½. C's pairing bye is not voluntary: C's dummy (2½) stays and B's ½ goes:
    # C: B ½ + A 1 + dummy 2½ = 4, cut 1 → 3½.
    state = _absent(build)
    table = standings(state, tiebreaks=("BH", "BH-C1"), unplayed=Unplayed.DUMMY_OPPONENT)
    x, c = table.row_of(PlayerId("X")), table.row_of(PlayerId("C"))
    assert (x.tiebreaks["BH"], x.tiebreaks["BH-C1"]) == (3.5, 1.5)
    assert (c.tiebreaks["BH"], c.tiebreaks["BH-C1"]) == (4, 3.5)
    # X counts with the adjusted score in A's and B's Buchholz: 1 + 1 + ½ (absence as a draw) = 2½.
    # A: X 2½ + C 2½ + B ½ = 5½.
    assert table.row_of(PlayerId("A")).tiebreaks["BH"] == 5.5
    # The virtual opponent (FIDE 2009) cuts the lowest whatever it is: X's round 3 meets
    # 2 + 1 + 0 = 3, B's ½ is cut: 1 + 3 = 4.
    virtual = standings(state, tiebreaks=("BH-C1",), unplayed=Unplayed.VIRTUAL_OPPONENT)
    assert virtual.row_of(PlayerId("X")).tiebreaks["BH-C1"] == 4


def test_b02_tables_agree() -> None:
    # FIDE Handbook B.02 (from memory): every dp of table 8.1(a) falls in the rating-difference
    # band that table 8.1(b) maps back to the same expected score (checked both sides of 0.50).
    for hundredths, dp in _DP_TABLE.items():
        if hundredths < 100:
            assert expected_hundredths(dp) == hundredths, (hundredths, dp)
            assert expected_hundredths(-dp) == 100 - hundredths
    assert expected_hundredths(736) == 100 and expected_hundredths(-736) == 0
