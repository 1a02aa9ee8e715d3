"""Rating changes against values worked by hand from FIDE B.02 (tables 8.1(a)/(b), K, the 400-point rule).

The regulations are from memory (the Handbook text in force was not at hand); the
worked example is our own numbers, worked by hand from the remembered table 8.1(b).
"""

from __future__ import annotations

from decimal import Decimal
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.fold import fold
from pairings.standings.ratingchange import k_factor, rating_changes, used_difference
from pairings.standings.ratings import expected_hundredths
from pairings.state import EventState, PlayerId, Result


def _event(players: list[tuple[str, int | None, str | None]], games: list[tuple[str, str, Result]]) -> EventState:
    """One game per round (the others not paired), each round published."""
    events: list[ev.Event] = [ev.EventCreated(name="Rated Test", rounds=len(games), seed=0, start_date="2026-06-01")]
    for pid, rating, birth in players:
        events.append(ev.PlayerRegistered(id=pid, name=f"Player {pid}", rating=rating,
                                          details=ev.PlayerDetailsModel(birth=birth)))
    for n, (a, b, result) in enumerate(games, 1):
        events += [ev.RoundDrafted(round=n, source="restored", boards=(ev.BoardModel(board=1, first=a, second=b,
                                                                                      result=result),)),
                   ev.RoundPublished(round=n)]
    return fold(enumerate(events, 1))


def test_worked_example_of_the_brief_with_the_400_point_rule() -> None:
    """A player rated 2000 (K 20) beats 2100, draws 1900, loses to 2500, beats 1500 (own numbers).

    By hand, table 8.1(b) as remembered: D −100 → .36, +100 → .64, −500 cut to −400 → .08,
    +500 cut to +400 → .92; changes 20 × (1 − .36) = 12.8, 20 × (.5 − .64) = −2.8,
    20 × (0 − .08) = −1.6, 20 × (1 − .92) = 1.6; ΔR = +10.0, new rating 2010.
    """
    state = _event(
        [("a", 2000, "1990"), ("b", 2100, "1990"), ("c", 1900, "1990"), ("d", 2500, "1990"), ("e", 1500, "1990")],
        [("a", "b", Result.FIRST_WINS), ("c", "a", Result.DRAW), ("a", "d", Result.SECOND_WINS),
         ("e", "a", Result.SECOND_WINS)],
    )
    c = rating_changes(state)[PlayerId("a")]
    assert c.k == 20
    assert [g.difference for g in c.games] == [-100, 100, -400, 400]
    assert [g.expected for g in c.games] == [Decimal("0.36"), Decimal("0.64"), Decimal("0.08"), Decimal("0.92")]
    assert [g.change for g in c.games] == [Decimal("12.8"), Decimal("-2.8"), Decimal("-1.6"), Decimal("1.6")]
    assert c.change == Decimal("10.0") and c.new_rating == 2010
    assert c.expected == Decimal("2.00") and c.scored == Decimal("2.5")
    # Performance: Ra 2000, p = 2.5 / 4 = .625 → .63 (half up; the unresolved rounding case) → dp 95.
    assert c.performance == 2095


def test_the_400_point_rule_and_its_2650_exemption() -> None:
    """2700 (K 10) beats 2200 (K 20). The 2700 player uses the real D +500 → .96 (amendment of
    1 October 2025, press reports, low confidence): 10 × (1 − .96) = +0.4. The 2200 player's D −500
    is cut to −400 → .08: 20 × (0 − .08) = −1.6."""
    assert used_difference(2000, 2500) == -400 and used_difference(2640, 2100) == 400
    assert used_difference(2700, 2200) == 500
    state = _event([("hi", 2700, "1980"), ("lo", 2200, "1980")], [("hi", "lo", Result.FIRST_WINS)])
    changes = rating_changes(state)
    assert changes[PlayerId("hi")].k == 10 and changes[PlayerId("hi")].change == Decimal("0.40")
    assert changes[PlayerId("lo")].k == 20 and changes[PlayerId("lo")].change == Decimal("-1.60")


def test_a_game_against_an_unrated_opponent_is_not_rated() -> None:
    state = _event([("a", 2000, "1990"), ("u", None, "1990"), ("b", 2000, "1990")],
                   [("a", "u", Result.FIRST_WINS), ("b", "a", Result.DRAW), ("u", "b", Result.FIRST_WINS)])
    changes = rating_changes(state)
    a = changes[PlayerId("a")]
    assert a.unrated_opponents == 1 and len(a.games) == 1 and a.change == Decimal("0.0")  # the draw: 20 × (.5 − .5)
    unrated = changes[PlayerId("u")]
    assert unrated.rating is None and unrated.change is None and unrated.new_rating is None
    assert len(unrated.games) == 2  # two games toward a first rating (against a and b)
    b = changes[PlayerId("b")]
    assert b.unrated_opponents == 1 and b.change == Decimal("0.0")  # only the draw with a counts: the loss to u does not


def test_forfeits_are_not_rated() -> None:
    state = _event([("a", 2000, "1990"), ("b", 2000, "1990")], [("a", "b", Result.FIRST_WINS_BY_FORFEIT)])
    assert rating_changes(state)[PlayerId("a")].games == () and rating_changes(state)[PlayerId("a")].change == 0


def test_k_factors() -> None:
    """B.02 (from memory): 40 up to the year of the 18th birthday below 2300, 10 from 2400, else 20; K × n ≤ 700."""
    assert k_factor(2100, 2010, 2026, 9) == 40
    assert k_factor(2100, 2007, 2026, 9) == 20   # 19 in 2026
    assert k_factor(2350, 2010, 2026, 9) == 20   # a junior from 2300 on
    assert k_factor(2400, 1990, 2026, 9) == 10
    assert k_factor(2100, 2010, 2026, 20) == 35  # 40 × 20 = 800 > 700
    assert k_factor(2100, None, 2026, 9) == 20


def test_table_8_1_b_band_edges() -> None:
    """B.02 table 8.1(b) as remembered: 0-3 → .50, 4-10 → .51, 392-411 → .92, 620-735 → .99, above → 1.00."""
    assert [expected_hundredths(d) for d in (0, 3, 4, 10, 11, 392, 411, 412, 735, 736)] == \
        [50, 50, 51, 51, 52, 92, 92, 93, 99, 100]
    assert expected_hundredths(-4) == 49


def test_standings_column_and_rating_report(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    from pairings.cli import main
    from pairings.store import EventStore

    def cli(*args: object) -> tuple[int, str]:
        code = main([str(a) for a in args])
        return code, capsys.readouterr().out

    path = tmp_path / "r.pairings"
    events: list[ev.Event] = [ev.EventCreated(name="Rated Test", rounds=1, seed=0),
                              ev.PlayerRegistered(id="a", name="Ash Able", rating=2000),
                              ev.PlayerRegistered(id="b", name="Bay Brook", rating=2100),
                              ev.RoundDrafted(round=1, source="restored", boards=(
                                  ev.BoardModel(board=1, first="a", second="b", result=Result.FIRST_WINS),)),
                              ev.RoundPublished(round=1)]
    EventStore.create_from(path, events).close()
    code, out = cli("standings", path, "--ratings", "--format", "csv")
    assert code == 0
    header, *rows = out.splitlines()
    assert header.endswith(",expected,change,performance,note")
    ash = next(r for r in rows if "Ash Able" in r)
    assert "0.36" in ash and "12.8" in ash and "2900" in ash  # perf: 2100 + 800 for 1 / 1
    code, out = cli("print", path, "rating-report")
    assert code == 0 and "Rating report" in out and "2013" in out  # 2000 + 12.8 → 2013


def test_first_rating_of_an_unrated_player_with_two_hypothetical_opponents() -> None:
    """The rule of 1 March 2024 as remembered (low confidence): an unrated player scores 3 of 5 against
    2000, 2100, 1900, 2200, 1800. With two 1800 draws: Ra = (2000 + 2100 + 1900 + 2200 + 1800 + 1800 + 1800)
    / 7 = 13600 / 7 = 1942.86 → 1943; p = (3 + 1) / (5 + 2) = .571 → .57 → dp 50; Ru = 1993."""
    rated = [("r1", 2000), ("r2", 2100), ("r3", 1900), ("r4", 2200), ("r5", 1800)]
    results = [Result.FIRST_WINS, Result.FIRST_WINS, Result.FIRST_WINS, Result.SECOND_WINS, Result.SECOND_WINS]
    state = _event([("u", None, "2000"), *((pid, r, "1990") for pid, r in rated)],
                   [("u", pid, res) for (pid, _), res in zip(rated, results)])
    c = rating_changes(state)[PlayerId("u")]
    assert c.scored == 3 and len(c.games) == 5 and c.first_rating == 1993
    fewer = _event([("u", None, "2000"), *((pid, r, "1990") for pid, r in rated[:4])],
                   [("u", pid, res) for (pid, _), res in zip(rated[:4], results)])
    assert rating_changes(fewer)[PlayerId("u")].first_rating is None  # four games: no first rating yet
