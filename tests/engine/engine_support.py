"""Build event states for the engine tests straight from events (invented names only)."""

from __future__ import annotations

import random
from typing import Any, Sequence

import networkx as nx  # type: ignore[import-untyped]
import numpy as np

from pairings import events as ev
from pairings.engine import Draft, draft_round
from pairings.engine.blossom import Dual, perfect_matching
from pairings.engine.certificate import certify
from pairings.errors import NoPairingError
from pairings.fold import fold
from pairings.state import EventState, Result


Edges = list[tuple[int, int, int]]


def networkx_perfect(n: int, edges: Edges) -> list[tuple[int, int]] | None:
    """networkx as independent solver: a perfect matching exists iff its maximum-cardinality one is perfect."""
    g = nx.Graph()
    g.add_nodes_from(range(n))
    g.add_weighted_edges_from(edges)
    m = nx.max_weight_matching(g, maxcardinality=True)
    return None if 2 * len(m) < n else [(min(a, b), max(a, b)) for a, b in m]


def weight(edges: Edges, pairs: Sequence[tuple[int, int]]) -> int:
    table = {(min(u, v), max(u, v)): w for u, v, w in edges}
    return sum(table[(min(u, v), max(u, v))] for u, v in pairs)


def columns(edges: Edges) -> tuple[Any, Any, Any]:
    """Edges as arrays ``u, v, w``: ``w`` int64 when every weight fits, Python integers otherwise."""
    u = np.array([e[0] for e in edges], dtype=np.int64)
    v = np.array([e[1] for e in edges], dtype=np.int64)
    ws = [e[2] for e in edges]
    exact = np.int64 if not ws or max(abs(x) for x in ws) < 2**62 else object
    return u, v, np.array(ws, dtype=exact)


def checked_perfect(n: int, edges: Edges, warm: Sequence[int]) -> tuple[list[tuple[int, int]], Dual] | None:
    """``blossom.perfect_matching`` checked against networkx (independent solver) and weak LP duality.

    None exactly when networkx finds no perfect matching either.
    """
    expected = networkx_perfect(n, edges)
    got = perfect_matching(n, edges, warm)
    if expected is None:
        assert got is None
        return None
    assert got is not None
    pairs, dual = got
    assert weight(edges, pairs) == weight(edges, expected)
    assert certify(n, *columns(edges), pairs, dual)
    return got


def assert_optimal_dual(n: int, edges: Edges, pairs: Sequence[tuple[int, int]], dual: Dual) -> None:
    """Optimality of a perfect matching from its dual, checked here edge by edge (not by the solver).

    Edmonds (1965b)'s perfect matching polytope: ``dual`` must be feasible
    (``z_B > 0`` on odd sets of at least 3 vertices, doubled reduced cost
    ``y2_u + y2_v + 2 sum(z_B : u, v in B) - 2 w_uv >= 0`` on every edge) and
    complementary to ``pairs`` (a perfect matching of edges, each tight, with
    exactly ``(|B| - 1) / 2`` of them inside every blossom). Weak LP duality
    then makes ``pairs`` a maximum-weight perfect matching, and its weight
    equals the dual objective.
    """
    table = {(min(u, v), max(u, v)): w for u, v, w in edges}
    ends = sorted(x for p in pairs for x in p)
    assert ends == list(range(n)), "not a perfect matching"
    assert all((min(p), max(p)) in table for p in pairs), "a pair that is no edge"
    assert len(dual.y2) == n
    for members, z in dual.blossoms:
        assert z > 0 and len(members) >= 3 and len(members) % 2 == 1, (len(members), z)

    def reduced2(u: int, v: int, w: int) -> int:
        inside = sum(z for members, z in dual.blossoms if u in members and v in members)
        return dual.y2[u] + dual.y2[v] + 2 * inside - 2 * w

    assert all(reduced2(u, v, w) >= 0 for u, v, w in edges), "infeasible dual"
    assert all(reduced2(u, v, table[(min(u, v), max(u, v))]) == 0 for u, v in pairs), "a loose matched edge"
    for members, _ in dual.blossoms:
        assert sum(u in members and v in members for u, v in pairs) == (len(members) - 1) // 2
    assert dual.objective2() == 2 * weight(edges, pairs)


def new_event(ratings: Sequence[int | None], rounds: int = 9, **settings: object) -> list[ev.Event]:
    log: list[ev.Event] = [ev.EventCreated(name="Test Open", rounds=rounds, **settings)]  # type: ignore[arg-type]
    for i, rating in enumerate(ratings):
        log.append(ev.PlayerRegistered(id=f"p{i + 1:05d}", name=f"Player {i + 1:05d}", rating=rating))
    return log


def state_of(log: Sequence[ev.Event]) -> EventState:
    return fold(enumerate(log, 1))


def draft_events(draft: Draft, source: str = "engine") -> ev.RoundDrafted:
    return ev.RoundDrafted(
        round=draft.round,
        boards=tuple(ev.BoardModel(board=b.board, first=b.first, second=b.second, flags=b.flags,
                                   cost=dict(b.cost)) for b in draft.boards),
        byes=tuple(ev.ByeModel(player=y.player, kind=y.kind, points=y.points) for y in draft.byes),
        cost=dict(draft.cost), engine_version=draft.engine_version, source=source,  # type: ignore[arg-type]
    )


def random_result(rng: random.Random, forfeits: bool = True) -> Result:
    x = rng.random()
    if forfeits and x < 0.03:
        return rng.choice([Result.FIRST_WINS_BY_FORFEIT, Result.SECOND_WINS_BY_FORFEIT])
    return Result.FIRST_WINS if x < 0.4 else Result.SECOND_WINS if x < 0.75 else Result.DRAW


def play(log: list[ev.Event], draft: Draft, rng: random.Random, forfeits: bool = True) -> None:
    """Append the draft, its publication and random results to ``log``."""
    log.append(draft_events(draft))
    log.append(ev.RoundPublished(round=draft.round))
    for b in draft.boards:
        log.append(ev.ResultRecorded(round=draft.round, board=b.board, result=random_result(rng, forfeits)))


def announce(log: list[ev.Event], r: int, rng: random.Random, withdraw: float, byes: float,
             kinds: tuple[str, ...]) -> None:
    """Withdraw a random share of round ``r``'s players and give another share an announced bye."""
    for pid in state_of(log).available(r):
        x = rng.random()
        if x < withdraw:
            log.append(ev.PlayerWithdrawn(player=pid, from_round=r))
        elif x < withdraw + byes:
            kind = kinds[0] if len(kinds) == 1 else rng.choice(kinds)
            log.append(ev.ByeRequested(player=pid, round=r, kind=kind))  # type: ignore[arg-type]


def simulate(n: int, rounds_played: int, seed: int = 1, withdraw: float = 0.0, byes: float = 0.0,
             **settings: object) -> list[ev.Event]:
    """A log of ``rounds_played`` engine-paired rounds with random results."""
    rng = random.Random(seed)
    log = new_event([rng.randint(1000, 2600) for _ in range(n)], **settings)
    for r in range(1, rounds_played + 1):
        announce(log, r, rng, withdraw, byes, ("requested",))
        play(log, draft_round(state_of(log)), rng)
    return log


def random_history(n: int, rounds_played: int, seed: int, withdraw: float = 0.0, byes: float = 0.0,
                   engine_rounds: bool = False, **settings: object) -> list[ev.Event]:
    """A log whose rounds are random pairings with random sides (or engine drafts).

    Random pairings make rematches, side imbalances and repeated byes likely, so
    later rounds exercise every hard-rule relaxation.
    """
    rng = random.Random(seed)
    log = new_event([rng.choice([None, rng.randint(1000, 2600)]) for _ in range(n)],
                    rounds=max(rounds_played + 1, 1), **settings)
    for r in range(1, rounds_played + 1):
        announce(log, r, rng, withdraw, byes, ("requested", "absence"))
        state = state_of(log)
        here = list(state.available(r))
        if len(here) < 2:
            break
        if engine_rounds:
            try:
                play(log, draft_round(state), rng)
                continue
            except NoPairingError:
                pass  # fall back to a random pairing (a forced full rematch round)
        rng.shuffle(here)
        byes_out = []
        if len(here) % 2:
            byes_out.append(ev.ByeModel(player=here.pop(), kind="pairing", points=1.0))  # type: ignore[arg-type]
        boards = tuple(ev.BoardModel(board=k + 1, first=here[2 * k], second=here[2 * k + 1])
                       for k in range(len(here) // 2))
        asked = state.requests.get(r, {})
        byes_out += [ev.ByeModel(player=p, kind=k, points=0.5 if k == "requested" else 0.0)  # type: ignore[arg-type]
                     for p, k in asked.items()]
        log.append(ev.RoundDrafted(round=r, boards=boards, byes=tuple(byes_out), source="override"))
        log.append(ev.RoundPublished(round=r))
        for b in boards:
            log.append(ev.ResultRecorded(round=r, board=b.board, result=random_result(rng)))
    return log
