"""A hand-worked crosstable: 7 players, 4 rounds, a pairing bye each of rounds 1-2,
a forfeit in round 2 and a withdrawal from round 3.

Every expected number below was worked out by hand from the definitions of FIDE
Handbook C.07 (from memory: the text was not at hand) and the FIDE 2009 Congress
decision on unplayed games as restated in docs/tiebreaks.md ("Unplayed rounds"); the working is
in the comments. Scoring 1-½-0, pairing bye 1 point.

Results (first side listed first):
  R1  A-E 1-0   F-B 0-1   C-G ½-½   D pairing bye (1)
  R2  B-A ½-½   D-C 1-0   G-E +- (G wins by forfeit)   F pairing bye (1)
  R3  A-D 0-1   C-B 0-1   E-F ½-½   (G withdrawn from round 3)
  R4  D-B ½-½   F-A 0-1   C-E 1-0

Round by round (points), final score:
  A  1  ½  0  1   = 2½      B  1  ½  1  ½   = 3       C  ½  0  0  1  = 1½
  D  1b 1  1  ½   = 3½      E  0  0f ½  0   = ½       F  0  1b ½  0  = 1½
  G  ½  1f -  -   = 1½      (b = bye, f = forfeit, - = withdrawn)
"""

from __future__ import annotations

from fractions import Fraction
from typing import Callable

import pytest

from pairings import events as ev
from pairings.state import EventState, PlayerId, Unplayed
from pairings.standings import check_tiebreaks, standings

PLAYERS = [
    ("A", "Ada Quill", 2000), ("B", "Bo Renn", 1900), ("C", "Cy Tarn", 1800),
    ("D", "Di Vell", 1700), ("E", "Ed Wyne", 1600), ("F", "Fay Xol", 1500), ("G", "Gus Yarr", None),
]
ROUNDS = [
    ([("A", "E", "1-0"), ("F", "B", "0-1"), ("C", "G", "1/2-1/2")], [("D", "pairing", 1.0)]),
    ([("B", "A", "1/2-1/2"), ("D", "C", "1-0"), ("G", "E", "+-")], [("F", "pairing", 1.0)]),
    ([("A", "D", "0-1"), ("C", "B", "0-1"), ("E", "F", "1/2-1/2")], []),
    ([("D", "B", "1/2-1/2"), ("F", "A", "0-1"), ("C", "E", "1-0")], []),
]
ALL = ("buchholz", "buchholz_cut1", "median_buchholz", "sonneborn_berger", "direct_encounter",  # stored names
       "wins", "games_second", "progressive", "average_rating_opponents", "performance_rating")


@pytest.fixture
def hand(build: Callable[..., EventState]) -> EventState:
    withdraw = [ev.PlayerWithdrawn(player="G", from_round=3, reason="left the venue")]
    return build(PLAYERS, ROUNDS, extra={3: withdraw}, total=4)


def column(state: EventState, key: str, unplayed: Unplayed) -> dict[str, float]:
    """One tiebreak's values, by its acronym or its snake_case name (as older files stored it)."""
    acronym = check_tiebreaks([key])[0]
    chosen = ALL if acronym in check_tiebreaks(ALL) else (key,)
    table = standings(state, tiebreaks=chosen, unplayed=unplayed)
    return {row.player: row.tiebreaks[acronym] for row in table.rows}


def test_points(hand: EventState) -> None:
    table = standings(hand, tiebreaks=(), unplayed=Unplayed.AS_THEY_STAND)
    assert {r.player: r.points for r in table.rows} == {
        "A": 2.5, "B": 3, "C": 1.5, "D": 3.5, "E": 0.5, "F": 1.5, "G": 1.5}


# --- unplayed games as they stand: an unplayed round adds no opponent ------------------
# Opponents over the board, with their final scores:
#   A: E ½, B 3, D 3½, F 1½         B: F 1½, A 2½, C 1½, D 3½      C: G 1½, D 3½, B 3, E ½
#   D: (bye) C 1½, A 2½, B 3        E: A 2½, (forfeit) F 1½, C 1½   F: B 3, (bye) E ½, A 2½
#   G: C 1½, (forfeit, withdrawn)
AS_THEY_STAND = {
    # Buchholz: the sum.               A 8½  B 9  C 8½  D 7  E 5½  F 6  G 1½
    "buchholz": {"A": 8.5, "B": 9, "C": 8.5, "D": 7, "E": 5.5, "F": 6, "G": 1.5},
    # Cut 1: less the lowest.          A 8½-½  B 9-1½  C 8½-½  D 7-1½  E 5½-1½  F 6-½  G 1½-1½
    "buchholz_cut1": {"A": 8, "B": 7.5, "C": 8, "D": 5.5, "E": 4, "F": 5.5, "G": 0},
    # Median: less lowest and highest. A 8½-½-3½  B 9-1½-3½  C 8½-½-3½  D 7-1½-3  E 5½-1½-2½ ...
    "median_buchholz": {"A": 4.5, "B": 4, "C": 4.5, "D": 2.5, "E": 1.5, "F": 2.5, "G": 0},
    # SB: beaten opponents' scores + half of drawn ones.
    #   A: E ½ + ½·B 3 + F 1½ = 3½          B: F 1½ + ½·A 2½ + C 1½ + ½·D 3½ = 6
    #   C: ½·G 1½ + E ½ = 1¼                D: C 1½ + A 2½ + ½·B 3 = 5½
    #   E: ½·F 1½ = ¾    F: ½·E ½ = ¼        G: ½·C 1½ = ¾
    "sonneborn_berger": {"A": 3.5, "B": 6, "C": 1.25, "D": 5.5, "E": 0.75, "F": 0.25, "G": 0.75},
}


@pytest.mark.parametrize("key", sorted(AS_THEY_STAND))
def test_as_they_stand(hand: EventState, key: str) -> None:
    # Hand-worked above from FIDE Handbook C.07 definitions (from memory).
    assert column(hand, key, Unplayed.AS_THEY_STAND) == AS_THEY_STAND[key]


# --- virtual opponent (FIDE 2009 decision; docs/tiebreaks.md) ---------------------------------
# Score counted towards others (own unplayed rounds as draws, n = 4):
#   A 2½  B 3  C 1½  D ½+1+1+½ = 3  E 0+½+½+0 = 1  F 0+½+½+0 = 1  G ½+½+½+½ = 2
# Virtual opponents, Svon = SPR + (1 - SfPR) + ½(n - R):
#   D R1 bye:       0 + 0 + ½·3 = 1½       E R2 forfeit loss: 0 + 1 + ½·2 = 2
#   F R2 bye:       0 + 0 + ½·2 = 1        G R2 forfeit win:  ½ + 0 + ½·2 = 1½
#   G R3 withdrawn: 1½ + 1 + ½·1 = 3       G R4 withdrawn:    1½ + 1 + 0 = 2½
# Opponent values per player:
#   A: E 1, B 3, D 3, F 1            B: F 1, A 2½, C 1½, D 3       C: G 2, D 3, B 3, E 1
#   D: V 1½, C 1½, A 2½, B 3         E: A 2½, V 2, F 1, C 1½       F: B 3, V 1, E 1, A 2½
#   G: C 1½, V 1½, V 3, V 2½
VIRTUAL = {
    "buchholz": {"A": 8, "B": 8, "C": 9, "D": 8.5, "E": 7, "F": 7.5, "G": 8.5},
    "buchholz_cut1": {"A": 7, "B": 7, "C": 8, "D": 7, "E": 6, "F": 6.5, "G": 7},
    # sorted values, middle ones: A [1,1,3,3]→4  B [1,1½,2½,3]→4  C [1,2,3,3]→5  D [1½,1½,2½,3]→4
    #                              E [1,1½,2,2½]→3½  F [1,1,2½,3]→3½  G [1½,1½,2½,3]→4
    "median_buchholz": {"A": 4, "B": 4, "C": 5, "D": 4, "E": 3.5, "F": 3.5, "G": 4},
    # SB, the virtual opponent weighted by the points the player got that round:
    #   A: E 1 + ½·B 3 + F 1 = 3½            B: F 1 + ½·2½ + C 1½ + ½·D 3 = 5¼
    #   C: ½·G 2 + E 1 = 2                   D: V 1½·1 + C 1½ + A 2½ + ½·B 3 = 7
    #   E: ½·F 1 + V 2·0 = ½                 F: V 1·1 + ½·E 1 = 1½
    #   G: ½·C 1½ + V 1½·1 = 2¼
    "sonneborn_berger": {"A": 3.5, "B": 5.25, "C": 2, "D": 7, "E": 0.5, "F": 1.5, "G": 2.25},
}


@pytest.mark.parametrize("key", sorted(VIRTUAL))
def test_virtual_opponent(hand: EventState, key: str) -> None:
    # Hand-worked above: FIDE 2009 Congress decision on unplayed games (docs/tiebreaks.md; from memory).
    assert column(hand, key, Unplayed.VIRTUAL_OPPONENT) == VIRTUAL[key]


def test_dummy_opponent(hand: EventState) -> None:
    # C.07 of 2023 (as remembered, low confidence): an unplayed round counts as a game against
    # a dummy opponent holding the player's own final score; towards others a player counts
    # with the adjusted score, voluntary unplayed rounds (forfeit loss, absence, withdrawal)
    # as draws, a pairing bye and a forfeit win as given:
    #   A 2½  B 3  C 1½  D 3½ (bye kept)  E 0+½+½+0 = 1 (R2 forfeit loss → ½)  F 1½ (bye kept)
    #   G ½+1+½+½ = 2½ (forfeit win kept, R3-R4 withdrawn → ½ each)
    #   A: E 1 + B 3 + D 3½ + F 1½ = 9            D: dummy 3½ + C 1½ + A 2½ + B 3 = 10½
    #   E: A 2½ + dummy ½ + F 1½ + C 1½ = 6       F: B 3 + dummy 1½ + E 1 + A 2½ = 8
    #   G: C 1½ + 3 × dummy 1½ = 6
    bh = column(hand, "BH", Unplayed.DUMMY_OPPONENT)
    assert (bh["A"], bh["D"], bh["E"], bh["F"], bh["G"]) == (9, 10.5, 6, 8, 6)
    #   SB D: 3½·1 + 1½ + 2½ + ½·3 = 9      G: ½·1½ + 1½·1 (forfeit win) + 0 + 0 = 2¼
    sb = column(hand, "SB", Unplayed.DUMMY_OPPONENT)
    assert (sb["D"], sb["G"]) == (9, 2.25)


def test_counts_and_progressive(hand: EventState) -> None:
    # Wins with or without play (C.07 2023, from memory): A 2, B 2, C 1, D 3 (bye, R2, R3),
    # E 0, F 1 (bye), G 1 (forfeit).
    assert column(hand, "wins", Unplayed.AS_THEY_STAND) == {
        "A": 2, "B": 2, "C": 1, "D": 3, "E": 0, "F": 1, "G": 1}
    # Progressive (C.07): running totals summed.
    #   A 1+1½+1½+2½ = 6½   B 1+1½+2½+3 = 8   C ½+½+½+1½ = 3   D 1+2+3+3½ = 9½
    #   E 0+0+½+½ = 1       F 0+1+1½+1½ = 4   G ½+1½+1½+1½ = 5
    assert column(hand, "progressive", Unplayed.AS_THEY_STAND) == {
        "A": 6.5, "B": 8, "C": 3, "D": 9.5, "E": 1, "F": 4, "G": 5}
    # Games played with the second side (forfeits are not games): A R2,R4; B R1,R3,R4;
    # C R2; D R3; E R1,R4 (R2 was a forfeit); F R3; G R1.
    assert column(hand, "games_second", Unplayed.AS_THEY_STAND) == {
        "A": 2, "B": 3, "C": 1, "D": 1, "E": 2, "F": 1, "G": 1}


def test_ratings_based(hand: EventState) -> None:
    # ARO over games played (C.07): A: (1600+1900+1700+1500)/4 = 1675;
    # C: G unrated → default 1000: (1000+1700+1900+1600)/4 = 1550; E: (2000+1500+1800)/3 = 1766.7 → 1767.
    aro = column(hand, "average_rating_opponents", Unplayed.AS_THEY_STAND)
    assert (aro["A"], aro["C"], aro["E"], aro["G"]) == (1675, 1550, 1767, 1800)
    # TPR = ARO + dp(p), FIDE B.02 table (from memory):
    # A p = 2½/4 = 0.625 → 0.63 → +95 → 1770;  C p = 1½/4 = 0.375 → 0.38 → -87 → 1463;
    # E p = ½/3 = 0.17 → -273 → 1494;  G p = ½/1 = 0.50 → 0 → 1800.
    tpr = column(hand, "performance_rating", Unplayed.AS_THEY_STAND)
    assert (tpr["A"], tpr["C"], tpr["E"], tpr["G"]) == (1770, 1463, 1494, 1800)


def test_ranking_by_default_tiebreaks(hand: EventState) -> None:
    # Default list: cut 1, Buchholz, SB, wins; virtual opponent (the default treatment).
    # Points: D 3½, B 3, A 2½, then C, F, G on 1½ split by cut 1 (C 8, G 7, F 6½), E ½.
    table = standings(hand)
    assert table.tiebreaks == ("BH-C1", "BH", "SB", "WIN")   # stored by fold for a file without a list
    assert table.unplayed is Unplayed.VIRTUAL_OPPONENT
    assert [(r.rank, r.player) for r in table.rows] == [
        (1, "D"), (2, "B"), (3, "A"), (4, "C"), (5, "G"), (6, "F"), (7, "E")]
    assert [r.player for r in table.rows if r.withdrawn] == [PlayerId("G")]
    assert not table.provisional and table.after_round == 4


def test_shared_ranks(hand: EventState) -> None:
    # With wins only, C, F and G (1½ points, 1 win each) cannot be split: they share 4-6,
    # listed in initial-rank order (rating: C 1800, F 1500, G unrated = 1000).
    table = standings(hand, tiebreaks=("wins",))
    assert [(r.rank, r.player) for r in table.rows][3:6] == [("4-6", "C"), ("4-6", "F"), ("4-6", "G")]


def test_direct_encounter_needs_every_pair_to_have_met(hand: EventState) -> None:
    # C, F, G are tied on points; C-G met but F met neither: direct encounter does not apply
    # (C.07, from memory), so it is 0 for all three and for the untied players.
    assert set(column(hand, "direct_encounter", Unplayed.AS_THEY_STAND).values()) == {0}


def test_after_an_earlier_round(hand: EventState) -> None:
    # After round 2: A 1½, B 1½, C ½, D 2, E 0, F 1, G 1½. Virtual opponents with n = 2:
    # D R1 bye: 0 + 0 + ½·1 = ½. D's Buchholz = ½ + C (½ played + 0 = ½) = 1.
    table = standings(hand, tiebreaks=("buchholz",), after_round=2)
    assert table.after_round == 2
    assert {r.player: r.points for r in table.rows} == {
        "A": 1.5, "B": 1.5, "C": 0.5, "D": 2, "E": 0, "F": 1, "G": 1.5}
    assert table.row_of(PlayerId("D")).tiebreaks["BH"] == 1


# --- the other C.07 tiebreaks on the same crosstable (worked by hand, as they stand) ----
def test_wins_over_the_board_and_with_black(hand: EventState) -> None:
    # WON, games won over the board: A R1, R4; B R1, R3; C R4; D R2, R3 (G's forfeit win does
    # not count). BWG, of those with Black (second side): A R4; B R1, R3; D R3.
    assert column(hand, "WON", Unplayed.AS_THEY_STAND) == {
        "A": 2, "B": 2, "C": 1, "D": 2, "E": 0, "F": 0, "G": 0}
    assert column(hand, "bwg", Unplayed.AS_THEY_STAND) == {
        "A": 1, "B": 2, "C": 0, "D": 1, "E": 0, "F": 0, "G": 0}


def test_koya(hand: EventState) -> None:
    # KS: limit half of 4 rounds × 1 = 2 points, reached by A 2½, B 3, D 3½. Points against them
    # in games played: A ½ (B) + 0 (D); B ½ (A) + ½ (D); C 0 + 0; D 1 (A) + ½ (B); E 0; F 0; G none.
    assert column(hand, "KS", Unplayed.AS_THEY_STAND) == {
        "A": 0.5, "B": 1, "C": 0, "D": 1.5, "E": 0, "F": 0, "G": 0}


def test_progressive_cut(hand: EventState) -> None:
    # PS-C1 drops the earliest running score (from memory): the PS totals above less round 1's
    # running score: A 6½-1  B 8-1  C 3-½  D 9½-1  E 1-0  F 4-0  G 5-½.
    assert column(hand, "PS-C1", Unplayed.AS_THEY_STAND) == {
        "A": 5.5, "B": 7, "C": 2.5, "D": 8.5, "E": 1, "F": 4, "G": 4.5}


def test_buchholz_cut2_and_median2(hand: EventState) -> None:
    # Opponent scores as they stand, sorted: A ½ 1½ 3 3½; B 1½ 1½ 2½ 3½; D 1½ 2½ 3; E 1½ 1½ 2½; G 1½.
    # Cut 2 drops the two lowest; median 2 the two lowest and two highest (nothing left of 4).
    bh_c2 = column(hand, "BH-C2", Unplayed.AS_THEY_STAND)
    assert (bh_c2["A"], bh_c2["B"], bh_c2["D"], bh_c2["E"], bh_c2["G"]) == (6.5, 6, 3, 2.5, 0)
    assert set(column(hand, "BH-M2", Unplayed.AS_THEY_STAND).values()) == {0}


def test_sonneborn_berger_cut1(hand: EventState) -> None:
    # SB-C1 drops the opponent with the lowest score (of equal scores, the smaller contribution):
    #   A: E ½ (won, ½) dropped → 3½ - ½ = 3      B: F or C 1½ (both won, 1½) → 6 - 1½ = 4½
    #   C: E ½ (won, ½) → 1¼ - ½ = ¾              D: C 1½ (won) → 5½ - 1½ = 4
    #   E: F 1½ drawn (¾) and C 1½ lost (0): C's 0 dropped → ¾
    sb = column(hand, "SB-C1", Unplayed.AS_THEY_STAND)
    assert (sb["A"], sb["B"], sb["C"], sb["D"], sb["E"]) == (3, 4.5, 0.75, 4, 0.75)


def test_fore_buchholz(hand: EventState) -> None:
    # FB: round 4's games (D-B, F-A, C-E) all count as draws, so the final scores become
    # A 1½+½ = 2, B 2½+½ = 3, C ½+½ = 1, D 3+½ = 3½, E ½+½ = 1, F 1½+½ = 2, G 1½ (withdrawn).
    #   A: E 1 + B 3 + D 3½ + F 2 = 9½     B: F 2 + A 2 + C 1 + D 3½ = 8½   C: G 1½ + D 3½ + B 3 + E 1 = 9
    #   D: C 1 + A 2 + B 3 = 6 (bye: none)  E: A 2 + F 2 + C 1 = 5   F: B 3 + E 1 + A 2 = 6   G: C 1
    assert column(hand, "FB", Unplayed.AS_THEY_STAND) == {
        "A": 9.5, "B": 8.5, "C": 9, "D": 6, "E": 5, "F": 6, "G": 1}


def test_average_of_opponents_buchholz(hand: EventState) -> None:
    # AOB: the mean of the opponents' Buchholz (as they stand: A 8½ B 9 C 8½ D 7 E 5½ F 6 G 1½).
    #   A: (E 5½ + B 9 + D 7 + F 6) / 4 = 6.875     D: (C 8½ + A 8½ + B 9) / 3 = 8.666…
    #   E: (A 8½ + F 6 + C 8½) / 3 = 7.666…        G: C 8½
    aob = column(hand, "AOB", Unplayed.AS_THEY_STAND)
    assert (aob["A"], aob["D"], aob["E"], aob["G"]) == (
        Fraction(55, 8), Fraction(26, 3), Fraction(23, 3), Fraction(17, 2))


def test_rating_cuts(hand: EventState) -> None:
    # ARO-C1 drops the lowest rating: A (1600+1900+1700)/3 = 1733.3 → 1733; C drops G's default
    # 1000: (1700+1900+1600)/3 → 1733; E (2000+1800)/2 = 1900; G's only opponent dropped → 0.
    aro = column(hand, "ARO-C1", Unplayed.AS_THEY_STAND)
    assert (aro["A"], aro["C"], aro["E"], aro["G"]) == (1733, 1733, 1900, 0)
    # ARO-M1 also drops the highest: A (1600+1700)/2 = 1650; E 1800.
    aro = column(hand, "ARO-M1", Unplayed.AS_THEY_STAND)
    assert (aro["A"], aro["E"]) == (1650, 1800)


def test_perfect_performance(hand: EventState) -> None:
    # PTP with the B.02 table 8.1(b) (from memory), worked by hand:
    # A scored 2½ against 1600, 1900, 1700, 1500. At 1776 the expected scores are
    # .73 + .33 + .60 + .83 = 2.49; at 1777 and 1778 they are 2.50; at 1779 2.52: the middle of
    # 1777..1778 is 1777.5 → 1778.
    # E scored ½ against 2000, 1500, 1800: .02 + .39 + .09 = .50 from 1417 to 1423 → 1420.
    # G drew with 1800: .50 from D = −3 to +3 → 1800.
    # C scored 1½ against 1000, 1700, 1900, 1600: 1.49 at 1454, 1.51 at 1455 (two bands change
    # at once), never exactly 1.50: the lowest rating past it, 1455.
    ptp = column(hand, "PTP", Unplayed.AS_THEY_STAND)
    assert (ptp["A"], ptp["E"], ptp["G"], ptp["C"]) == (1778, 1420, 1800, 1455)
    # APPO: the mean PTP of the opponents; G met only C → 1455.
    assert column(hand, "APPO", Unplayed.AS_THEY_STAND)["G"] == 1455


def test_average_performance_of_opponents(hand: EventState) -> None:
    # TPRs (B.02 table 8.1(a)): A 1770, C 1463, E 1494, G 1800 (above); B: ARO 1750, p .75 → +193
    # = 1943; D: ARO 1900, p 2½/3 → .83 → +273 = 2173; F: ARO 5500/3 → 1833, p ½/3 → .17 → −273 = 1560.
    # APRO: A (E 1494 + B 1943 + D 2173 + F 1560) / 4 = 1792.5 → 1793;  E (1770 + 1560 + 1463)/3
    # = 1597.7 → 1598;  G: C 1463.
    apro = column(hand, "APRO", Unplayed.AS_THEY_STAND)
    assert (apro["A"], apro["E"], apro["G"]) == (1793, 1598, 1463)
