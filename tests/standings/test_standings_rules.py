"""Standings: the FIDE 2009 worked examples, the B.02 table, direct encounter, bad input."""

from __future__ import annotations

import json
import math
import subprocess
import sys
from statistics import NormalDist
from typing import Callable

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from pairings import events as ev
from pairings.errors import InputError
from pairings.state import EventState, PlayerId, Unplayed
from pairings.standings import TIEBREAKS, build_context, check_tiebreaks, dp_from_fraction, standings

Build = Callable[..., EventState]


def circle_rounds(n: int, count: int) -> list[list[tuple[int, int]]]:
    """The circle method (player 0 fixed, the others rotate): ``count`` rounds for ``n`` players."""
    others = list(range(1, n))
    out = []
    for _ in range(count):
        ring = [0] + others
        out.append([(ring[i], ring[n - 1 - i]) for i in range(n // 2)])
        others = others[-1:] + others[:-1]
    return out


@pytest.fixture
def nine_rounds(build: Build) -> tuple[EventState, str, str]:
    """12 players, 9 rounds: A and B play out the two worked examples; all other games drawn.

    A: won R1, R2 (2 points after R2), forfeit win in R3, six draws → 6.
    B: won R1-R4, lost R5-R6 (4 points after R6), absent R7, won R8-R9 → 6.
    """
    schedule = circle_rounds(12, 9)
    a = 0
    b = next(y for x, y in circle_rounds(12, 11)[9] if x == a)  # meets A only in round 10
    wanted = {a: {1: "win", 2: "win", 3: "forfeit"}, b: {1: "win", 2: "win", 3: "win", 4: "win",
                                                         5: "loss", 6: "loss", 8: "win", 9: "win"}}
    rounds = []
    for number, pairs in enumerate(schedule, 1):
        games: list[tuple[str, str, str | None]] = []
        byes: list[tuple[str, str, float]] = []
        for x, y in pairs:
            if b in (x, y) and number == 7:
                byes.append((f"P{b}", "absence", 0.0))
                byes.append((f"P{x if y == b else y}", "pairing", 1.0))
                continue
            hero = x if x in wanted else y if y in wanted else None
            outcome = wanted.get(hero, {}).get(number, "draw") if hero is not None else "draw"
            code = {"win": "1-0", "loss": "0-1", "draw": "1/2-1/2", "forfeit": "+-"}[outcome]
            games.append((f"P{hero}", f"P{y if hero == x else x}", code) if hero is not None
                         else (f"P{x}", f"P{y}", code))
        rounds.append((games, byes))
    players = [(f"P{i}", f"Player {i:02d}", 2000 - 10 * i) for i in range(12)]
    return build(players, rounds, total=9), f"P{a}", f"P{b}"


def test_virtual_opponent_worked_examples(nine_rounds: tuple[EventState, str, str]) -> None:
    # FIDE 2009 Congress decision on unplayed games, worked examples as restated in docs/tiebreaks.md.
    state, a, b = nine_rounds
    assert (state.score(PlayerId(a)), state.score(PlayerId(b))) == (6, 6)
    ctx = build_context(state, 9, Unplayed.VIRTUAL_OPPONENT)
    virtual = {slot.round: value for slot, value in ctx.opponent_values(PlayerId(a)) if slot.opponent is None}
    assert virtual == {3: 5}            # 2 + 0 + 6·0.5
    assert ctx.for_others[PlayerId(a)] == 5.5
    virtual = {slot.round: value for slot, value in ctx.opponent_values(PlayerId(b)) if slot.opponent is None}
    assert virtual == {7: 6}            # 4 + 1 + 2·0.5
    assert ctx.for_others[PlayerId(b)] == 6.5


@pytest.mark.parametrize(("p", "dp"), [(0.50, 0), (0.75, 193), (0.90, 366), (1.00, 800),
                                       (0.25, -193), (0.10, -366), (0.0, -800)])
def test_dp_table_values(p: float, dp: int) -> None:
    # FIDE Handbook B.02 p → dp table (from memory); below 0.50 the table mirrors.
    assert dp_from_fraction(p) == dp


def test_dp_table_against_the_normal_model() -> None:
    # Independent check: Elo's normal model, dp ≈ 200·√2·Φ⁻¹(p) (statistics.NormalDist);
    # the published table keeps within 8 points of it from 0.50 to 0.97 and rises strictly.
    values = [dp_from_fraction(h / 100) for h in range(50, 101)]
    assert values == sorted(values) and len(set(values)) == len(values)
    for h in range(50, 98):
        model = 200 * math.sqrt(2) * NormalDist().inv_cdf(h / 100)
        assert abs(dp_from_fraction(h / 100) - model) <= 8, h
    with pytest.raises(ValueError):
        dp_from_fraction(1.01)


def test_direct_encounter_separates_the_tied(build: Build) -> None:
    # Hand-worked (C.07 direct encounter, from memory): P beat Q and R beat S in round 1,
    # so of the tied pairs (P, Q on 2; R, S on 1) P and R score 1 in their mutual game.
    players = [("P", "Pia Lund", 1500), ("Q", "Quin Marr", 1600), ("R", "Ria Nolt", 1700),
               ("S", "Sol Ostby", 1800)]
    rounds = [
        ([("P", "Q", "1-0"), ("R", "S", "1-0")], []),
        ([("Q", "R", "1-0"), ("S", "P", "1-0")], []),
        ([("P", "R", "1-0"), ("Q", "S", "1-0")], []),
    ]
    table = standings(build(players, rounds), tiebreaks=("direct_encounter",))
    assert [(r.rank, r.player, r.tiebreaks["DE"]) for r in table.rows] == [
        (1, "P", 1), (2, "Q", 0), (3, "R", 1), (4, "S", 0)]
    # Without it the pairs are split by initial rank only, and share their ranks.
    plain = standings(build(players, rounds), tiebreaks=())
    assert [(r.rank, r.player) for r in plain.rows] == [("1-2", "Q"), ("1-2", "P"), ("3-4", "S"), ("3-4", "R")]


def test_json_shape(build: Build) -> None:
    # design.md interchange: rank, player, name, points, tiebreaks in the event's order.
    players = [("x", "Xia", None), ("y", "Yann", None), ("z", "Zoë Ødegård", None)]
    state = build(players, [([("x", "y", "1/2-1/2")], [("z", "pairing", 1.0)])])
    rows = json.loads(json.dumps(standings(state).to_json()))
    # z's bye meets a virtual opponent on 0 + (1 - 1) + 0.5·0 = 0 (the formula of docs/tiebreaks.md, n = 1).
    assert rows[0] == {"rank": 1, "player": "z", "name": "Zoë Ødegård", "points": 1.0,
                       "tiebreaks": {"buchholz_cut1": 0.0, "buchholz": 0.0, "sonneborn_berger": 0.0,
                                     "wins": 1.0}}
    assert [r["rank"] for r in rows] == [1, "2-3", "2-3"]
    # The state holds the C.07 acronyms (old files' snake_case names are mapped on fold); JSON keeps the
    # snake_case keys, in the event's order.
    assert state.settings.tiebreaks == ("BH-C1", "BH", "SB", "WIN")
    assert list(rows[1]["tiebreaks"]) == ["buchholz_cut1", "buchholz", "sonneborn_berger", "wins"]


def test_provisional_and_drafts(build: Build) -> None:
    players = [("x", "Xia", None), ("y", "Yann", None), ("z", "Zed", None), ("w", "Wim", None)]
    r1 = ([("x", "y", "1-0"), ("z", "w", "0-1")], [])
    r2 = ([("x", "w", None), ("y", "z", "1-0")], [])
    state = build(players, [r1, r2])
    table = standings(state)
    assert table.provisional and table.after_round == 2
    assert table.row_of(PlayerId("x")).points == 1       # the missing result counts nothing yet
    assert not standings(state, after_round=1).provisional
    drafted = build(players, [r1, r2], drafts=1)          # a draft round is never counted
    assert standings(drafted).after_round == 1 and not standings(drafted).provisional


def test_bad_input(build: Build) -> None:
    players = [("x", "Xia", None), ("y", "Yann", None)]
    with pytest.raises(InputError, match="no round has been published"):
        standings(build(players, []))
    with pytest.raises(InputError, match="no round has been published"):
        standings(build(players, [([("x", "y", None)], [])], drafts=1))
    unread = build(players, [([("x", "y", "1-0")], [])], tiebreaks=("buchholz", "XYZ"))  # the file still opens
    with pytest.raises(InputError, match="unknown tiebreak 'XYZ'"):  # and the standings name the problem
        standings(unread)
    state = build(players, [([("x", "y", "1-0")], [])], tiebreaks=("buchholz",))
    with pytest.raises(InputError, match="listed twice"):
        standings(state, tiebreaks=("wins", "wins"))
    with pytest.raises(InputError, match="rounds 1 to 1"):
        standings(state, tiebreaks=(), after_round=3)


def test_aliases_and_registry() -> None:
    assert check_tiebreaks(["ARO", "tpr", "buchholz"]) == ("ARO", "TPR", "BH")
    for acronym, kind in TIEBREAKS.items():
        assert kind.acronym == acronym and kind.name and kind.key.islower()
        assert (kind.measure is None) != (kind.group_measure is None)


def test_withdrawn_player_keeps_a_row(build: Build) -> None:
    players = [("x", "Xia", None), ("y", "Yann", None), ("z", "Zed", None)]
    extra = {2: [ev.PlayerWithdrawn(player="z", from_round=2)]}
    rounds = [([("x", "y", "1-0")], [("z", "pairing", 1.0)]), ([("y", "x", "0-1")], [])]
    table = standings(build(players, rounds, extra=extra))
    assert [(r.player, r.withdrawn) for r in table.rows] == [("x", False), ("z", True), ("y", False)]


def test_standings_import_without_rich_or_textual() -> None:
    code = "import sys, pairings.standings; print(sorted(m for m in sys.modules if m.split('.')[0] in ('rich', 'textual')))"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


RESULT_CODES = ("1-0", "0-1", "1/2-1/2", "+-", "-+", "--")


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.lists(st.sampled_from(RESULT_CODES), min_size=15, max_size=15))
def test_as_they_stand_matches_a_direct_count(build: Build, codes: list[str]) -> None:
    # Independent recount straight from the rounds' games (not through the standings context):
    # points, Buchholz (opponents over the board, actual scores) and SB (C.07 definitions).
    schedule = circle_rounds(6, 5)
    rounds = [([(f"P{x}", f"P{y}", codes[3 * r + i]) for i, (x, y) in enumerate(pairs)], [])
              for r, pairs in enumerate(schedule)]
    state = build([(f"P{i}", f"Player {i}", None) for i in range(6)], rounds)
    share = {"1-0": (1, 0), "0-1": (0, 1), "1/2-1/2": (0.5, 0.5), "+-": (1, 0), "-+": (0, 1), "--": (0, 0)}
    points = {f"P{i}": 0.0 for i in range(6)}
    met: dict[str, list[tuple[str, float]]] = {p: [] for p in points}
    for games, _ in rounds:
        for a, b, code in games:
            assert code is not None
            pa, pb = share[code]
            points[a] += pa
            points[b] += pb
            if code in ("1-0", "0-1", "1/2-1/2"):
                met[a].append((b, pa))
                met[b].append((a, pb))
    table = standings(state, tiebreaks=("buchholz", "sonneborn_berger"), unplayed=Unplayed.AS_THEY_STAND)
    for row in table.rows:
        assert row.points == points[row.player]
        assert row.tiebreaks["BH"] == sum(points[o] for o, _ in met[row.player])
        assert row.tiebreaks["SB"] == sum(points[o] * s for o, s in met[row.player])
