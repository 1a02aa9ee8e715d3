"""The event-log simulator: deterministic, valid logs that fold, with plausible results."""

from __future__ import annotations

from collections import Counter, defaultdict

import pytest

from pairings import events as ev
from pairings.errors import InputError
from pairings.fold import fold
from pairings.simulate import ENGINE_VERSION, expected_score, simulate_events, simulate_state
from pairings.state import ByeKind, EventState, PlayerId, RoundState, Side


def _meetings(state: EventState) -> Counter[frozenset[PlayerId]]:
    return Counter(
        frozenset((g.first, g.second))
        for r in state.rounds for g in r.games if g.result is not None and g.result.played
    )


def _top_against_bottom(state: EventState) -> list[tuple[PlayerId, PlayerId]]:
    """Top half against bottom half in initial-rank order; the odd one out has the bye."""
    ids = list(state.available(state.next_round_number))
    half = len(ids) // 2
    return list(zip(ids[:half], ids[half:2 * half]))


def test_same_seed_same_log() -> None:
    a = [ev.dump_event(e) for e in simulate_events(60, 7, 5, seed=11)]
    b = [ev.dump_event(e) for e in simulate_events(60, 7, 5, seed=11)]
    c = [ev.dump_event(e) for e in simulate_events(60, 7, 5, seed=12)]
    assert a == b
    assert a != c


def test_log_shape_and_sizes() -> None:
    log = simulate_events(40, 9, 4, seed=3, name="Lakeside autumn open")
    assert isinstance(log[0], ev.EventCreated)
    assert log[0].name == "Lakeside autumn open" and log[0].rounds == 9
    assert log[0].sides == ("White", "Black")
    registered = [e for e in log if isinstance(e, ev.PlayerRegistered)]
    assert len(registered) == 40 and log[1:41] == registered
    drafts = [e for e in log if isinstance(e, ev.RoundDrafted)]
    assert [d.round for d in drafts] == [1, 2, 3, 4]
    assert all(d.source == "engine" and d.engine_version == ENGINE_VERSION and d.reason == "" for d in drafts)
    assert [e.round for e in log if isinstance(e, ev.RoundPublished)] == [1, 2, 3, 4]
    for d in drafts:
        recorded = [e.board for e in log if isinstance(e, ev.ResultRecorded) and e.round == d.round]
        assert recorded == [b.board for b in d.boards] == list(range(1, len(d.boards) + 1))


def test_no_rounds_played_gives_roster_only() -> None:
    state = simulate_state(12, 5, 0)
    assert len(state.players) == 12
    assert state.rounds == () and state.next_round_number == 1


def test_field_is_invented_and_plausible() -> None:
    state = simulate_state(2000, 1, 0, seed=5)
    players = list(state.players.values())
    assert len({p.name for p in players}) == len(players)  # unique names
    assert len({p.id for p in players}) == len(players)
    rated = [p.rating for p in players if p.rating is not None]
    assert all(1000 <= r <= 2800 for r in rated)
    assert 0.01 < 1 - len(rated) / len(players) < 0.1  # a few unrated
    mean = sum(rated) / len(rated)
    assert 1750 < mean < 1850  # normal(1800, 300), clipped: common practice, no source
    assert any(p.club is None for p in players) and any(p.club for p in players)
    assert len({p.club for p in players}) > 5


@pytest.mark.parametrize(("n", "rounds", "seed"), [(2, 1, 0), (3, 3, 1), (9, 5, 2), (50, 9, 3), (201, 9, 4)])
def test_every_round_is_a_valid_complete_pairing(n: int, rounds: int, seed: int) -> None:
    state = simulate_state(n, rounds, rounds, seed, withdrawals=0.05, requested_byes=0.05)
    settings = state.settings
    assert len(state.rounds) == rounds
    for rnd in state.rounds:
        assert rnd.state is RoundState.COMPLETE
        available = set(state.available(rnd.number))
        seated = [p for g in rnd.games for p in (g.first, g.second)]
        assert len(seated) == len(set(seated)) and set(seated) <= available
        pairing_byes = [b.player for b in rnd.byes if b.kind is ByeKind.PAIRING]
        assert len(pairing_byes) == len(available) % 2
        assert set(seated) | set(pairing_byes) == available
        announced = {b.player: b for b in rnd.byes if b.kind is not ByeKind.PAIRING}
        assert set(announced) == set(state.requests.get(rnd.number, {}))
        for pid, bye in announced.items():
            assert bye.kind is state.requests[rnd.number][pid]
            points = settings.requested_bye_points if bye.kind is ByeKind.REQUESTED else 0.0
            assert bye.points == points
        assert all(b.points == settings.bye_points for b in rnd.byes if b.kind is ByeKind.PAIRING)
        assert all(g.result is not None for g in rnd.games)


def test_withdrawn_players_are_not_paired_again() -> None:
    log = simulate_events(80, 9, 9, seed=8, withdrawals=0.1)
    withdrawn = {e.player: e.from_round for e in log if isinstance(e, ev.PlayerWithdrawn)}
    assert withdrawn and min(withdrawn.values()) >= 2
    state = fold(enumerate(log, 1))
    for pid, since in withdrawn.items():
        assert all(e.round < since for e in state.records[PlayerId(pid)].entries)


def test_announced_byes_come_in_both_kinds() -> None:
    log = simulate_events(300, 5, 5, seed=2, requested_byes=0.05)
    kinds = Counter(e.kind for e in log if isinstance(e, ev.ByeRequested))
    assert kinds[ByeKind.REQUESTED] > kinds[ByeKind.ABSENCE] > 0


def test_zero_rates_give_no_extras() -> None:
    log = simulate_events(60, 6, 6, seed=4, withdrawals=0, requested_byes=0, forfeit_rate=0, draw_rate=0)
    assert not [e for e in log if isinstance(e, (ev.PlayerWithdrawn, ev.ByeRequested))]
    results = [e.result for e in log if isinstance(e, ev.ResultRecorded)]
    assert results and all(r is not None and r.played and r.value != "1/2-1/2" for r in results)


@pytest.mark.parametrize(("n", "seed"), [(16, 0), (17, 1), (24, 2), (45, 3), (100, 4), (257, 5)])
def test_greedy_pairer_avoids_rematches_and_second_byes(n: int, seed: int) -> None:
    state = simulate_state(n, 9, 9, seed)
    assert max(_meetings(state).values()) == 1
    assert all(
        sum(1 for e in r.entries if e.bye is ByeKind.PAIRING) <= 1 for r in state.records.values()
    )


def test_greedy_pairer_pairs_by_score_and_evens_sides() -> None:
    state = simulate_state(400, 9, 9, seed=6)
    gaps = [abs(state.records[g.first].score_before(r.number) - state.records[g.second].score_before(r.number))
            for r in state.rounds for g in r.games]
    assert sum(1 for x in gaps if x == 0) / len(gaps) > 0.8  # most boards inside a score group
    sd = [abs(rec.side_difference) for rec in state.records.values()]
    assert max(sd) <= 3
    assert sum(1 for x in sd if x <= 1) / len(sd) > 0.9


def test_without_sides() -> None:
    state = simulate_state(30, 5, 3, seed=1, sides=False)
    assert state.settings.sides is None
    assert len(state.rounds) == 3


def test_results_follow_the_rating_difference() -> None:
    # top half against bottom half, so that most boards are mismatches
    state = simulate_state(1000, 3, 3, seed=9, withdrawals=0, requested_byes=0, pair=_top_against_bottom)
    strong_points = 0.0
    games = forfeits = 0
    for rnd in state.rounds:
        for g in rnd.games:
            assert g.result is not None
            if not g.result.played:
                forfeits += 1
                continue
            a, b = state.players[g.first], state.players[g.second]
            if a.rating is None or b.rating is None or abs(a.rating - b.rating) < 200:
                continue
            games += 1
            strong = Side.FIRST if a.rating > b.rating else Side.SECOND
            strong_points += state.settings.scoring.points(g.result.outcome(strong))
    total = sum(len(r.games) for r in state.rounds)
    assert games > 100
    # Elo: a 200-point favourite expects about 0.76 (FIDE Handbook B.02 table, from memory)
    assert strong_points / games > 0.7
    assert 0 < forfeits / total < 0.03


def test_draws_near_the_draw_rate_between_close_opponents() -> None:
    # the greedy pairer meets neighbours in rank, so most boards are close in strength
    for rate in (0.1, 0.3, 0.6):
        state = simulate_state(600, 5, 5, seed=13, draw_rate=rate)
        results = [g.result for r in state.rounds for g in r.games]
        draws = sum(1 for x in results if x is not None and x.value == "1/2-1/2")
        assert 0.75 * rate < draws / len(results) < 1.1 * rate


def test_scores_fold_consistently() -> None:
    # independent recount of every player's points from the boards and byes
    state = simulate_state(70, 7, 7, seed=10, withdrawals=0.03, requested_byes=0.05, forfeit_rate=0.05)
    points: defaultdict[PlayerId, float] = defaultdict(float)
    for rnd in state.rounds:
        for g in rnd.games:
            assert g.result is not None
            points[g.first] += state.settings.scoring.points(g.result.outcome(Side.FIRST))
            points[g.second] += state.settings.scoring.points(g.result.outcome(Side.SECOND))
        for b in rnd.byes:
            points[b.player] += b.points
    assert {pid: rec.score for pid, rec in state.records.items() if rec.score} == {
        pid: p for pid, p in points.items() if p
    }


def test_expected_score() -> None:
    # Elo expected score 1 / (1 + 10^(-d/400)); FIDE Handbook B.02 table values (from memory)
    assert expected_score(0) == 0.5
    assert round(expected_score(200), 2) == 0.76
    assert round(expected_score(400), 2) == 0.91
    assert round(expected_score(-100), 2) == 0.36
    assert expected_score(150) + expected_score(-150) == pytest.approx(1.0)


def test_given_pair_function_is_used() -> None:
    calls: list[int] = []

    def recording(state: EventState) -> list[tuple[PlayerId, PlayerId]]:
        calls.append(state.next_round_number)
        return _top_against_bottom(state)

    state = simulate_state(21, 4, 3, seed=7, pair=recording)
    assert calls == [1, 2, 3]
    for rnd in state.rounds:
        ids = list(state.available(rnd.number))
        half = len(ids) // 2
        assert [(g.first, g.second) for g in rnd.games] == list(zip(ids[:half], ids[half:2 * half]))
        assert [b.player for b in rnd.byes if b.kind is ByeKind.PAIRING] == ids[2 * half:]


def test_bad_pair_function_is_refused() -> None:
    def twice(state: EventState) -> list[tuple[PlayerId, PlayerId]]:
        a, b = state.available(1)[:2]
        return [(a, b), (a, b)]

    def lazy(state: EventState) -> list[tuple[PlayerId, PlayerId]]:
        return []

    with pytest.raises(InputError):
        simulate_events(6, 3, 1, pair=twice)
    with pytest.raises(InputError):
        simulate_events(6, 3, 1, pair=lazy)


@pytest.mark.parametrize(
    ("args", "kwargs"),
    [((1, 3, 1), {}), ((10, 0, 0), {}), ((10, 3, 4), {}), ((10, 3, -1), {}),
     ((10, 3, 1), {"draw_rate": 1.5}), ((10, 3, 1), {"withdrawals": -0.1})],
)
def test_bad_arguments(args: tuple[int, int, int], kwargs: dict[str, float]) -> None:
    with pytest.raises(InputError):
        simulate_events(*args, **kwargs)  # type: ignore[arg-type]
