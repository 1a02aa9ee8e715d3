"""Standings points and points-based tiebreaks stay exact under any scoring (pairings.points).

The hand case, 3-1-0 scoring, a requested bye of 1 point (a third of a win),
a pairing bye of 3, unplayed rounds against a virtual opponent (FIDE 2009
decision, as restated in C.07; Svon = SPR + (win + loss - SfPR) + draw * (n - R)):

  R1  A-B 1-0   C-D ½-½   E pairing bye (3)
  R2  A-C ½-½   B-E 0-1   D requested bye (1)

Points: A 3+1 = 4   B 0+0 = 0   C 1+1 = 2   D 1+1 = 2   E 3+3 = 6.
Towards other players' tiebreaks a player's own unplayed rounds count as draws (1):
  A 4, B 0, C 2, D 1+1 = 2, E 1+3 = 4.
Virtual opponents (n = 2):
  E R1: SPR 0 + opposite of 3 (a loss, 0) + 1 * (2 - 1) = 1
  D R2: SPR 1 + opposite of 1 (a draw, 1) + 1 * (2 - 2) = 2
Buchholz: A B 0 + C 2 = 2;  B A 4 + E 4 = 8;  C D 2 + A 4 = 6;  D C 2 + V 2 = 4;  E V 1 + B 0 = 1.
Sonneborn-Berger (a game weighs 1, ½, 0; an unplayed round its points as a share of a win):
  A 1·0 + ½·2 = 1;  B 0;  C ½·2 + ½·4 = 3;  D ½·2 + ⅓·2 = 5/3;  E 1·1 + 1·0 = 1.
D's 5/3 is where floats went wrong: 1.6666666666666665, which only the old rounding to six places hid.
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

from hypothesis import given, settings, strategies as st

from pairings.points import points_number
from pairings.standings import standings
from pairings.state import Result, Side, Unplayed
from tests.standings.conftest import build_state

PLAYERS = [("A", "Ada Quill", 2000), ("B", "Bo Renn", 1900), ("C", "Cy Tarn", 1800),
           ("D", "Di Vell", 1700), ("E", "Ed Wyne", 1600)]
THREE_ONE_ZERO: dict[str, Any] = {"scoring": {"win": 3, "draw": 1, "loss": 0}, "bye_points": 3,
                                  "requested_bye_points": 1}


def test_buchholz_and_sonneborn_berger_exact_under_three_one_zero() -> None:
    state = build_state(PLAYERS, [
        ([("A", "B", "1-0"), ("C", "D", "1/2-1/2")], [("E", "pairing", 3)]),
        ([("A", "C", "1/2-1/2"), ("B", "E", "0-1")], [("D", "requested", 1)]),
    ], **THREE_ONE_ZERO)
    table = standings(state, tiebreaks=["BH", "SB"], unplayed=Unplayed.VIRTUAL_OPPONENT)
    rows = {r.player: r for r in table.rows}
    assert {p: r.points for p, r in rows.items()} == {"A": 4, "B": 0, "C": 2, "D": 2, "E": 6}
    assert {p: r.tiebreaks["BH"] for p, r in rows.items()} == {"A": 2, "B": 8, "C": 6, "D": 4, "E": 1}
    assert {p: r.tiebreaks["SB"] for p, r in rows.items()} == {
        "A": 1, "B": 0, "C": 3, "D": Fraction(5, 3), "E": 1}
    assert all(isinstance(v, Fraction) for r in rows.values() for v in (r.points, *r.tiebreaks.values()))
    # Data writes at most six decimals; the sheet two.
    assert points_number(rows["D"].tiebreaks["SB"]) == 1.666667


SCORINGS = [("1", "0.5", "0"), ("3", "1", "0"), ("2", "1", "0"), ("0.1", "0.05", "0"), ("1", "0.25", "0")]
"""Win, draw, loss as an organiser types them (decimal text, read by Fraction here, not by the product)."""
RESULTS = list(Result)


@st.composite
def events(draw: st.DrawFn) -> tuple[tuple[str, str, str], str, list[str], list[Any]]:
    scoring = draw(st.sampled_from(SCORINGS))
    bye = draw(st.sampled_from(scoring[:2]))
    n = draw(st.integers(2, 7))
    players = [f"P{i}" for i in range(n)]
    rounds = []
    for _ in range(draw(st.integers(1, 30))):
        order = draw(st.permutations(players))
        games = [(order[i], order[i + 1], draw(st.sampled_from(RESULTS)).value) for i in range(0, n - 1, 2)]
        byes = [(order[-1], "pairing", bye)] if n % 2 else []
        rounds.append((games, byes))
    return scoring, bye, players, rounds


@settings(max_examples=60, deadline=None)
@given(events())
def test_standings_points_are_the_exact_sum_of_the_results(case: tuple[Any, ...]) -> None:
    (win, half, loss), bye, players, rounds = case
    value = {"win": Fraction(win), "draw": Fraction(half), "loss": Fraction(loss)}
    state = build_state([(p, f"Player {p}", 1500) for p in players],
                        [(g, [(p, k, Fraction(b)) for p, k, b in y]) for g, y in rounds],
                        scoring={"win": win, "draw": half, "loss": loss}, bye_points=bye, tiebreaks=["BH", "SB"])
    expected = {p: Fraction(0) for p in players}
    for games, byes in rounds:
        for first, second, code in games:
            result = Result(code)
            expected[first] += value[result.outcome(Side.FIRST)]
            expected[second] += value[result.outcome(Side.SECOND)]
        for p, _, points in byes:
            expected[p] += Fraction(points)
    table = standings(state)
    assert {r.player: r.points for r in table.rows} == expected
    assert all(isinstance(r.points, Fraction) for r in table.rows)
    # The rows follow the exact points, best first.
    assert [r.points for r in table.rows] == sorted(expected.values(), reverse=True)
