"""The blossom bracket choice against brute force (every candidate, in the Handbook's order).

The brute force pairs each bracket as C.04.3 describes it (from memory): it
generates every candidate in the generation order (:mod:`.generation`, itself
checked against the worked sequences), drops those breaking an absolute
criterion or the completion criterion (the rest of the round must stay
pairable: every pairing of the rest is enumerated), evaluates C.5-C.19 one
candidate at a time (C.7: the best next bracket over every pairing of the
rest) and keeps the first best. The engine must choose the same pairs,
floaters and PAB in every bracket of every round (events with draws,
forfeits, requested byes, withdrawals and late entries).
"""

from __future__ import annotations

import random
from collections import Counter
from typing import Iterator, Sequence

import pytest

from tests.engine.engine_support import new_event, play, state_of
from pairings import events as ev
from pairings.engine import draft_round
from pairings.engine.dutch import plan
from pairings.engine.dutch.criteria import (
    Bracket, Costs, float_costs, next_float_costs, next_pair_costs, pair_costs,
)
from pairings.engine.dutch.entrants import Entrants
from pairings.engine.dutch.generation import heterogeneous
from pairings.engine.dutch.rounds import bracket_of, players_of
from pairings.engine.types import Overrides
from pairings.errors import NoPairingError
from pairings.state import Acceleration, EventState, PlayerId, System

Pair = tuple[PlayerId, PlayerId]


def better(a: Costs, b: Costs) -> int:
    """-1 if ``a`` is the better quality vector (criteria compared one by one, C.5 first), 1 if ``b``, 0 if equal."""
    for layer in sorted(set(a) | set(b)):
        x, y = a.get(layer, 0), b.get(layer, 0)
        if x != y:
            return -1 if x < y else 1
    return 0


def complete_pairings(ent: Entrants, players: Sequence[PlayerId]) -> Iterator[tuple[list[Pair], PlayerId | None]]:
    """Every way to pair ``players`` (C.1, C.3), one PAB to an eligible player if the count is odd."""
    if len(players) % 2:
        for bye in players:
            if bye in ent.pab_eligible:
                for pairs, _ in complete_pairings(ent, [p for p in players if p != bye]):
                    yield pairs, bye
        return
    if not players:
        yield [], None
        return
    first, rest = players[0], players[1:]
    for k, other in enumerate(rest):
        if ent.compatible(first, other):
            for tail, _ in complete_pairings(ent, [*rest[:k], *rest[k + 1:]]):
                yield [(first, other)] + tail, None


def best_rest(ent: Entrants, br: Bracket, floaters: Sequence[PlayerId]) -> Costs | None:
    """C.4 and C.7: None when the rest cannot be paired, else the next bracket's best (pairs, then PSD)."""
    best: Costs | None = None
    nxt = set(floaters) | set(br.next)
    for pairs, bye in complete_pairings(ent, list(floaters) + list(br.lower)):
        c: Costs = Counter()
        for x, y in pairs:
            if x in nxt and y in nxt and not (x in floaters and y in floaters):
                c += next_pair_costs(ent, br, x, y)
            else:
                for z in (x, y):
                    if z in nxt:
                        c += next_float_costs(ent, br, z)
        if bye is not None and bye in nxt:
            c += next_float_costs(ent, br, bye)
        if best is None or better(c, best) < 0:
            best = c
    return best


def brute_bracket(ent: Entrants, br: Bracket) -> tuple[set[frozenset[PlayerId]], set[PlayerId]] | None:
    members = list(br.members)
    num = {p: i + 1 for i, p in enumerate(members)}
    mdps = [num[p] for p in members if p in br.mdps] if br.heterogeneous else []
    residents = [num[p] for p in members if num[p] not in mdps]
    best: tuple[Costs, set[frozenset[PlayerId]], set[PlayerId]] | None = None
    for m1 in range(min(len(mdps), len(residents)), -1, -1):
        for rest in range((len(residents) - m1) // 2, -1, -1):
            for pairs_b, floaters_b in heterogeneous(mdps, residents, m1, rest):
                pairs = [(members[a - 1], members[b - 1]) for a, b in pairs_b]
                floaters = [members[a - 1] for a in floaters_b]
                if not all(br.allows(ent, a, b) for a, b in pairs):
                    continue
                if br.last:
                    if len(floaters) > 1 or any(f not in ent.pab_eligible for f in floaters):
                        continue
                    c: Costs = Counter()
                else:
                    found = best_rest(ent, br, floaters)
                    if found is None:
                        continue
                    c = found
                for a, b in pairs:
                    c += pair_costs(ent, br, a, b)[0]
                for f in floaters:
                    c += float_costs(ent, br, f)
                if best is None or better(c, best[0]) < 0:
                    best = (c, {frozenset(p) for p in pairs}, set(floaters))
    return None if best is None else (best[1], best[2])


def brute_plan(state: EventState) -> list[tuple[set[frozenset[PlayerId]], set[PlayerId]]]:
    ent = Entrants(state, state.next_round_number, players_of(state, Overrides()))
    groups = ent.groups()
    out = []
    carried: list[PlayerId] = []
    for top in range(len(groups)):
        br = bracket_of(ent, groups, top, carried)
        got = brute_bracket(ent, br)
        if got is None:
            assert br.last
            got = brute_bracket(ent, Bracket(br.members, br.mdps, br.score, br.next, br.lower, collapsed=True))
        assert got is not None
        out.append(got)
        carried = sorted(got[1], key=ent.rank.__getitem__)
    return out


def _events(seed: int, **settings: object) -> Iterator[EventState]:
    rng = random.Random(seed)
    n = rng.randint(4, 9)
    rounds = rng.randint(3, 6)
    log = new_event([rng.choice([None, rng.randint(1200, 2400)]) for _ in range(n)], rounds=rounds,
                    system=System.DUTCH, seed=seed, **settings)
    for r in range(1, rounds + 1):
        state = state_of(log)
        if r > 1 and rng.random() < 0.15:  # a late entry
            log.append(ev.PlayerRegistered(id=f"late{r}", name=f"Late Entrant {r}", rating=rng.randint(1200, 2400),
                                           entry_round=r))
        for pid in state.available(r):
            x = rng.random()
            if x < 0.06:
                log.append(ev.ByeRequested(player=pid, round=r, kind="requested"))  # type: ignore[arg-type]
            elif x < 0.09 and r > 1:
                log.append(ev.PlayerWithdrawn(player=pid, from_round=r))
        state = state_of(log)
        if len(state.available(r)) < 2:
            return
        try:
            draft = draft_round(state)
        except NoPairingError:  # small fields run out of legal pairings (tested apart)
            return
        yield state
        play(log, draft, rng)


@pytest.mark.parametrize("seed", range(60))
def test_blossom_matches_brute_force(seed: int) -> None:
    for state in _events(seed):
        mine = plan(state)
        got = [({frozenset(p) for p in b.pairs}, set(b.floaters)) for b in mine.brackets]
        assert got == brute_plan(state), f"round {state.next_round_number}"


@pytest.mark.parametrize("seed", range(100, 115))
def test_blossom_matches_brute_force_without_sides_and_accelerated(seed: int) -> None:
    settings: dict[str, object] = {"sides": None} if seed % 2 else {"acceleration": Acceleration.BAKU}
    for state in _events(seed, **settings):
        mine = plan(state)
        got = [({frozenset(p) for p in b.pairs}, set(b.floaters)) for b in mine.brackets]
        assert got == brute_plan(state), f"round {state.next_round_number}"
