"""The blossom bracket choice against brute force (every candidate, in the Handbook's order).

The brute force pairs each bracket as C.04.3 describes it (from memory): it
generates every candidate in the generation order (:mod:`.generation`, itself
checked against the worked sequences), drops those breaking an absolute
criterion, evaluates C.5-C.19 one candidate at a time (C.7: the best of every
pairing of the next bracket) and keeps the first best. When that choice
leaves a rest that cannot be paired (every pairing of the rest is
enumerated), the bracket is the PPB: it is paired again among the candidates
that let the rest be paired (C.4), without C.7, and everyone below is paired
as the collapsed last bracket. The engine must choose the same pairs,
floaters and PAB in every bracket of every round (events with draws,
forfeits, requested byes, withdrawals and late entries).
"""

from __future__ import annotations

import random
from collections import Counter
from dataclasses import replace
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
from pairings.engine.dutch.rounds import bracket_of, collapsed_last, players_of
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


def partial_pairings(ent: Entrants, players: Sequence[PlayerId], mdps: frozenset[PlayerId]
                     ) -> Iterator[tuple[list[Pair], list[PlayerId]]]:
    """Every way to pair some of ``players`` (C.1, C.3, no two of ``mdps`` together), with those left unpaired."""
    if not players:
        yield [], []
        return
    first, rest = players[0], players[1:]
    for pairs, left in partial_pairings(ent, rest, mdps):
        yield pairs, [first] + left
    for k, other in enumerate(rest):
        if ent.compatible(first, other) and not (first in mdps and other in mdps):
            for pairs, left in partial_pairings(ent, [*rest[:k], *rest[k + 1:]], mdps):
                yield [(first, other)] + pairs, left


def next_bracket(ent: Entrants, br: Bracket, floaters: Sequence[PlayerId]) -> Costs:
    """C.7: the next bracket (``floaters`` as its MDPs) at its best: players left unpaired, then PSD.

    A last next bracket leaves one player at most, PAB-eligible; failing
    that, it is judged as one group (MDPs with each other), and failing that
    too the candidate is the worst on C.7.
    """
    players = [*floaters, *br.next]
    best: Costs | None = None
    for mdps in (frozenset(floaters), frozenset()) if br.next_is_last else (frozenset(floaters),):
        for pairs, left in partial_pairings(ent, players, mdps):
            if br.next_is_last and (len(left) > 1 or any(p not in ent.pab_eligible for p in left)):
                continue
            c: Costs = Counter()
            for x, y in pairs:
                c += next_pair_costs(ent, br, x, y)
            for z in left:
                c += next_float_costs(ent, br, z)
            if best is None or better(c, best) < 0:
                best = c
        if best is not None:
            return best
    return Counter({(69, 0): 2 * len(players) + 2})


def brute_bracket(ent: Entrants, br: Bracket) -> tuple[set[frozenset[PlayerId]], set[PlayerId]] | None:
    """The first best candidate; the PPB's must let the rest be paired (C.4) and skips C.7."""
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
                c: Costs = Counter()
                if br.last:
                    if len(floaters) > 1 or any(f not in ent.pab_eligible for f in floaters):
                        continue
                elif br.ppb:
                    if next(complete_pairings(ent, floaters + list(br.lower)), None) is None:
                        continue
                else:
                    c = next_bracket(ent, br, floaters)
                for a, b in pairs:
                    c += pair_costs(ent, br, a, b)[0]
                for f in floaters:
                    c += float_costs(ent, br, f)
                if best is None or better(c, best[0]) < 0:
                    best = (c, {frozenset(p) for p in pairs}, set(floaters))
    return None if best is None else (best[1], best[2])


def brute_last(ent: Entrants, br: Bracket) -> tuple[set[frozenset[PlayerId]], set[PlayerId]]:
    got = brute_bracket(ent, br)
    if got is None:
        got = brute_bracket(ent, replace(br, collapsed=True))
    assert got is not None
    return got


def brute_plan(state: EventState) -> list[tuple[set[frozenset[PlayerId]], set[PlayerId]]]:
    """The Handbook's route: brackets top down; the first whose floaters leave the rest unpairable is the PPB."""
    ent = Entrants(state, state.next_round_number, players_of(state, Overrides()))
    groups = ent.groups()
    out = []
    carried: list[PlayerId] = []
    for top in range(len(groups) - 1):
        br = bracket_of(ent, groups, top, carried)
        got = brute_bracket(ent, br)
        assert got is not None
        floaters = sorted(got[1], key=ent.rank.__getitem__)
        if next(complete_pairings(ent, floaters + list(br.lower)), None) is None:
            ppb = br.penultimate()
            got = brute_bracket(ent, ppb)
            assert got is not None
            floaters = sorted(got[1], key=ent.rank.__getitem__)
            return out + [got, brute_last(ent, collapsed_last(ent, ppb, floaters))]
        out.append(got)
        carried = floaters
    return out + [brute_last(ent, bracket_of(ent, groups, len(groups) - 1, carried))]


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
