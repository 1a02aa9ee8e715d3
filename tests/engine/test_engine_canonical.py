"""The canonical optimum (engine/canonical.py): the same draft on every route, and the documented order.

Checks: brute force (every perfect matching enumerated, the lexicographically
smallest partner sequence among the heaviest) on random graphs with many ties
and on small fields through the whole engine; the engine with the compiled
kernels and rustworkx against the pure-Python blossom and networkx on 300
simulated fields (Swiss and round robin, odd and even, forfeits, withdrawals,
byes), boards, sides, board numbers and byes compared.
"""

from __future__ import annotations

import random
from typing import Any, Iterator, Sequence

import numpy as np
import pytest

from tests.engine.engine_support import announce, new_event, play, random_history, state_of
from pairings import events as ev
from pairings.engine import blossom, canonical, draft_round, implicit, route
from pairings.engine.berger import berger_rounds
from pairings.engine.criteria import Field
from pairings.engine.types import CRITERIA, Draft
from pairings.errors import NoPairingError
from pairings.fold import fold
from pairings.simulate import simulate_events
from pairings.state import EventState, PlayerId, System

Pairs = list[tuple[int, int]]


def perfect_matchings(n: int, edges: dict[tuple[int, int], int]) -> Iterator[Pairs]:
    """Every perfect matching of vertices ``0..n-1`` (brute force: the least free vertex takes each partner)."""
    def grow(free: tuple[int, ...], chosen: Pairs) -> Iterator[Pairs]:
        if not free:
            yield list(chosen)
            return
        a = free[0]
        for b in free[1:]:
            if (a, b) in edges:
                yield from grow(tuple(x for x in free[1:] if x != b), chosen + [(a, b)])
    yield from grow(tuple(range(n)), [])


def partner_sequence(n: int, pairs: Sequence[tuple[int, int]]) -> list[int]:
    mate = [0] * n
    for a, b in pairs:
        mate[a], mate[b] = b, a
    return mate


def brute_canonical(n: int, edges: dict[tuple[int, int], int]) -> Pairs | None:
    """The heaviest perfect matching with the lexicographically smallest partner sequence, by enumeration."""
    best: tuple[int, list[int]] | None = None
    found: Pairs | None = None
    for m in perfect_matchings(n, edges):
        key = (-sum(edges[p] for p in m), partner_sequence(n, m))
        if best is None or key < best:
            best, found = key, m
    return found


def random_graph(rng: random.Random, n: int) -> dict[tuple[int, int], int]:
    density = rng.choice([0.4, 0.7, 1.0])
    values = rng.choice([[0, 1], [0, 1, 2], [3, 5, 8, 13], [10**30, 10**30 + 1]])
    return {(a, b): rng.choice(values) for a in range(n) for b in range(a + 1, n) if rng.random() < density}


def canonical_of(n: int, edges: dict[tuple[int, int], int]) -> Pairs | None:
    pairs = sorted(edges)
    u = np.array([a for a, _ in pairs], dtype=np.int64)
    v = np.array([b for _, b in pairs], dtype=np.int64)
    w = np.array([edges[p] for p in pairs], dtype=object)
    solved = blossom.perfect_matching_arrays(n, u, v, w)
    if solved is None:
        return None
    return canonical.settle(n, u, v, w, solved[0])


@pytest.mark.parametrize("compiled", [True, False])
@pytest.mark.parametrize("seed", range(150))
def test_canonical_is_the_brute_force_lex_smallest_heaviest(seed: int, compiled: bool,
                                                           monkeypatch: pytest.MonkeyPatch) -> None:
    # Brute force: every perfect matching of a random graph with few distinct weights (many
    # optima; blossoms with z > 0 appear), the least partner sequence among the heaviest.
    rng = random.Random(seed)
    n = rng.choice([2, 4, 6, 8, 10])
    edges = random_graph(rng, n)
    monkeypatch.setattr(blossom, "USE_COMPILED", compiled)
    if seed % 3 == 0:  # tiny batches: many solves, each settling one or two players
        monkeypatch.setattr(canonical, "BATCH_BITS", 8)
    assert canonical_of(n, edges) == brute_canonical(n, edges)


def test_the_graphs_above_have_ties_and_positive_blossoms() -> None:
    ties = blossoms = 0
    for seed in range(150):
        rng = random.Random(seed)
        n = rng.choice([2, 4, 6, 8, 10])
        edges = random_graph(rng, n)
        weights = [sum(edges[p] for p in m) for m in perfect_matchings(n, edges)]
        ties += bool(weights) and weights.count(max(weights)) > 1
        pairs = sorted(edges)
        solved = blossom.perfect_matching(n, [(a, b, edges[(a, b)]) for a, b in pairs])
        blossoms += solved is not None and any(z > 0 for _, z in solved[1].blossoms)
    assert ties >= 40 and blossoms >= 10, (ties, blossoms)  # the kernel's duals: 14 of 150 with blossoms


@pytest.mark.parametrize("seed", range(150))
def test_solves_alone_give_the_same_optimum(seed: int, monkeypatch: pytest.MonkeyPatch) -> None:
    # The first-choice swap (canonical.py Notes) only saves solves: with it switched off every
    # step is decided by the batch solve, and the answer is still the brute-force one.
    rng = random.Random(seed)
    n = rng.choice([2, 4, 6, 8, 10])
    edges = random_graph(rng, n)
    monkeypatch.setattr(canonical._Settler, "swap_in", lambda self, x, c: False)
    assert canonical_of(n, edges) == brute_canonical(n, edges)


def test_an_alternating_cycle_settles_the_first_choice_without_a_solve(monkeypatch: pytest.MonkeyPatch) -> None:
    # Two 4-cycles of equal weights (no blossom), each matched the other way round: player 0's
    # first choice 1 and player 4's first choice 5 come by swapping a cycle, never by a solve.
    def no_solve(self: object, x: int) -> None:
        raise AssertionError(f"solved for player {x}")
    monkeypatch.setattr(canonical._Settler, "solve_batch", no_solve)
    u = np.array([0, 1, 2, 0, 4, 5, 6, 4], dtype=np.int64)
    v = np.array([1, 2, 3, 3, 5, 6, 7, 7], dtype=np.int64)
    got = canonical.canonical(8, u, v, np.zeros(8, dtype=np.int64), [(0, 3), (1, 2), (4, 7), (5, 6)])
    assert got == [(0, 1), (2, 3), (4, 5), (6, 7)]


def test_a_cycle_that_would_empty_a_blossom_is_not_swapped() -> None:
    # Blossom {1, 2, 3} (d = 1 on its edges, so an optimum holds one pair inside it) and 4 tied to 3.
    # The alternating cycle 0-1=2-6=7-5=0 would give 0 its first choice 1 but leave the blossom
    # without a pair (balance -1): no optimum pairs 0 with 1, so 0 keeps 5.
    u = np.array([0, 0, 1, 1, 2, 2, 3, 5, 6], dtype=np.int64)
    v = np.array([1, 5, 2, 3, 3, 6, 4, 7, 7], dtype=np.int64)
    depth = np.array([0, 0, 1, 1, 1, 0, 0, 0, 0], dtype=np.int64)
    got = canonical.canonical(8, u, v, depth, [(0, 5), (1, 2), (3, 4), (6, 7)])
    assert got == [(0, 5), (1, 2), (3, 4), (6, 7)]


def _key(fld: Field, players: Sequence[PlayerId], pairs: Sequence[tuple[int, int]]) -> tuple[object, ...]:
    """A pairing's cost key as Draft.key (docs/engine.md: criteria in order, S2 as the sorted gap list)."""
    n = len(players)
    costs = [fld.bye(players[a]) if b == n else fld.pair(players[a], players[b])[1] for a, b in pairs]
    totals = [sum(col) for col in zip(*costs)]
    gap = CRITERIA.index("score_gap")
    return tuple(tuple(sorted((c[gap] for c in costs), reverse=True)) if k == gap else totals[k]
                 for k in range(len(CRITERIA)))


def brute_draft(state: EventState) -> tuple[list[frozenset[PlayerId]], PlayerId | None]:
    """Every full pairing of the round's players (rank order, the bye vertex last) by enumeration: the least
    cost key, then the lexicographically smallest partner sequence (engine/canonical.py's documented order)."""
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    players = list(fld.order)
    n = len(players) + len(players) % 2
    edges = {(a, b): 0 for a in range(len(players)) for b in range(a + 1, n)
             if b == len(players) or not fld.forbidden(players[a], players[b])}
    best = min(perfect_matchings(n, edges), key=lambda m: (_key(fld, players, m), partner_sequence(n, m)))
    boards = [frozenset((players[a], players[b])) for a, b in best if b < len(players)]
    bye = next((players[a] for a, b in best if b == len(players)), None)
    return boards, bye


def _small_fields(count: int) -> list[tuple[int, int, int]]:
    rng = random.Random(11)
    return [(rng.randint(3, 11), rng.randint(0, 5), rng.randint(0, 10**6)) for _ in range(count)]


@pytest.mark.parametrize(("n", "played", "seed"), _small_fields(80))
def test_draft_is_the_brute_force_canonical_optimum(n: int, played: int, seed: int) -> None:
    # Random-pairing histories (rematches, side imbalances, repeated byes), 3-11 players.
    state = state_of(random_history(n, played, seed, withdraw=0.05, byes=0.05))
    try:
        draft = draft_round(state)
    except NoPairingError:
        return
    boards, bye = brute_draft(state)
    assert sorted(map(sorted, (frozenset((b.first, b.second)) for b in draft.boards))) == sorted(map(sorted, boards))
    assert draft.pairing_bye == bye
    assert _drawn(draft_round(state, reference=True)) == _drawn(draft)  # networkx on the full graph


def _swiss_fields(count: int) -> Iterator[list[ev.Event]]:
    rng = random.Random(5)
    for k in range(count):
        n = rng.randint(4, 70)
        played = rng.randint(0, 8)
        yield simulate_events(n, 9, played, rng.randint(0, 10**6), withdrawals=rng.choice([0.0, 0.03]),
                              requested_byes=rng.choice([0.0, 0.05]), forfeit_rate=rng.choice([0.02, 0.15]),
                              sides=k % 7 != 0)


def _round_robin_fields(count: int) -> Iterator[list[ev.Event]]:
    rng = random.Random(6)
    for _ in range(count):
        n = rng.randint(3, 12)
        double = rng.random() < 0.5
        total = berger_rounds(n, double)
        log = new_event([rng.randint(1000, 2600) for _ in range(n)], rounds=total,
                        system=System.ROUND_ROBIN, double_round=double)
        for r in range(1, rng.randint(1, total - 1) + 1):
            announce(log, r, rng, 0.03, 0.05, ("requested", "absence"))
            play(log, draft_round(state_of(log)), rng)
        yield log


def _drawn(draft: Draft) -> tuple[object, ...]:
    return (tuple((b.board, b.first, b.second, b.flags) for b in draft.boards),
            tuple((y.player, y.kind, y.points) for y in draft.byes), dict(draft.cost))


FIELDS = 300


def _draft_or_none(state: EventState) -> tuple[object, ...] | None:
    try:
        return _drawn(draft_round(state))
    except NoPairingError:
        return None


@pytest.mark.skipif(not implicit.available(), reason="compiled kernels not built")
def test_both_routes_draft_the_same_round(monkeypatch: pytest.MonkeyPatch) -> None:
    # The whole engine (draft_round) on the implicit route (compiled scan and blossom), then on the
    # listed route with the compiled blossom, then with its pure-Python twin: identical boards, sides,
    # numbers and byes (the canonical tie-break among equal-cost optima, canonical.py).
    logs = [*_swiss_fields(FIELDS - 60), *_round_robin_fields(60)]
    states = [fold(enumerate(log, 1)) for log in logs]
    taken: list[str] = []
    choose = implicit.implicit_matching

    def implicit_seen(*args: Any) -> Any:
        found = choose(*args)
        taken.append("implicit" if found is not None else "listed")
        return found

    monkeypatch.setattr(implicit, "implicit_matching", implicit_seen)
    drafted = [(state, _draft_or_none(state)) for state in states]
    assert taken.count("implicit") >= 200, f"{taken.count('implicit')} of {len(taken)} on the implicit route"
    monkeypatch.setattr(route, "USE_IMPLICIT", False)
    for python_blossom in (False, True):
        monkeypatch.setattr(blossom, "USE_COMPILED", not python_blossom)
        compared = 0
        for state, fast in drafted:
            assert _draft_or_none(state) == fast
            compared += fast is not None
        assert compared >= 280
