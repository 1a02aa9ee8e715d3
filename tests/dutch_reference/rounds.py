"""One round: brackets from the top, the PPB/CLB route, the PAB, colours and board order.

C.04.3 as the spec states it (2017 A.9 mechanics, from memory): brackets are
paired from the highest score group down; each bracket's floaters join the
next one as MDPs. When the floaters of the bracket just paired, with all the
players below, cannot complete the round, that bracket is the penultimate
pairing bracket (PPB): every player below collapses into one last bracket
(CLB) and the PPB is paired again choosing its floaters so that the CLB can be
completed (C.4). That re-pairing always succeeds: the bracket above let
the rest be completed, and that completion, restricted to this bracket, is one
of its candidates (its MDP-MDP pairs, if any, floating into the CLB). A last
bracket whose MDPs could only be paired with each other is paired as one group
(the product's documented decision).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Callable

from pairings.state import EventState, PlayerId
from tests.dutch_reference.bracket import Bracket, Outcome
from tests.dutch_reference.colours import allocate
from tests.dutch_reference.facts import Facts, read_facts


HANDBOOK, EVERYWHERE = "handbook", "everywhere"
"""The completion routes of :func:`pair_brackets`."""


@dataclass(frozen=True)
class ReferenceRound:
    boards: tuple[tuple[PlayerId, PlayerId], ...]
    """(white, black) in board order."""
    pab: PlayerId | None


class Unpairable(Exception):
    """No pairing of the round keeps the absolute criteria."""


def _completer(facts: Facts) -> Callable[[frozenset[PlayerId]], bool]:
    """Can these players all be paired (C.1, C.3), leaving at most one, PAB-eligible (C.2)?"""

    @lru_cache(maxsize=None)
    def complete(players: frozenset[PlayerId]) -> bool:
        if len(players) <= 1:
            return all(facts.entrants[p].pab_ok for p in players)
        first = min(players, key=facts.rank)
        rest = players - {first}
        if len(players) % 2 and facts.entrants[first].pab_ok and _even_complete(rest):
            return True
        return any(facts.compatible(first, x) and complete(rest - {x}) for x in rest)

    @lru_cache(maxsize=None)
    def _even_complete(players: frozenset[PlayerId]) -> bool:
        if not players:
            return True
        first = min(players, key=facts.rank)
        rest = players - {first}
        return any(facts.compatible(first, x) and _even_complete(rest - {x}) for x in rest)

    return complete


def _last(facts: Facts, mdps: list[PlayerId], residents: list[PlayerId]) -> Outcome | None:
    out = Bracket(facts, mdps, residents, last=True).solve()
    if out is None and mdps:
        out = Bracket(facts, [], mdps + residents, last=True).solve()
    return out


def pair_brackets(facts: Facts, route: str = HANDBOOK) -> list[Outcome]:
    """The outcome of every bracket, top down (the last one's leftover is the PAB).

    ``route`` is :data:`HANDBOOK` (the PPB/CLB route) or :data:`EVERYWHERE`, a
    variant used only to show that the two readings differ: every bracket
    keeps the rest pairable (C.4 everywhere, C.7's look at the next bracket
    too) and nothing collapses.
    """
    ents = facts.entrants
    scores = sorted({e.score for e in ents.values()}, reverse=True)
    groups = [sorted((p for p in ents if ents[p].score == s), key=facts.rank) for s in scores]
    complete = _completer(facts)
    if not complete(frozenset(ents)):
        raise Unpairable("no pairing keeps C.1-C.3")

    def rest_of(k: int) -> frozenset[PlayerId]:
        return frozenset(p for g in groups[k + 1:] for p in g)

    def keeps(k: int) -> Callable[[frozenset[PlayerId]], bool]:
        return lambda f: complete(f | rest_of(k))

    results: list[Outcome] = []
    mdps: list[PlayerId] = []
    for k in range(len(groups) - 1):
        everywhere = route == EVERYWHERE
        nxt_last = k + 1 == len(groups) - 1
        out = Bracket(facts, mdps, groups[k], complete=keeps(k) if everywhere else None,
                      next_residents=groups[k + 1], next_is_last=nxt_last,
                      next_complete=keeps(k + 1) if everywhere and not nxt_last else None).solve()
        assert out is not None  # everyone may float from a bracket that is not the last
        if not complete(frozenset(out.floaters) | rest_of(k)):
            # this bracket is the PPB: paired again by C.4, the rest collapses into the CLB
            ppb = Bracket(facts, mdps, groups[k], complete=keeps(k)).solve()
            assert ppb is not None  # the completion found above restricted to this bracket is a candidate
            clb = _last(facts, list(ppb.floaters), list(rest_of(k)))
            assert clb is not None  # the PPB's floaters with the rest can be completed (C.4)
            return results + [ppb, clb]
        results.append(out)
        mdps = list(out.floaters)
    last = _last(facts, mdps, groups[-1])
    assert last is not None  # the bracket above left a rest that can be completed
    return results + [last]


def reference_round(state: EventState, route: str = HANDBOOK) -> ReferenceRound:
    """The reference's pairing of round ``state.next_round_number`` by the Dutch rules."""
    facts = read_facts(state)
    if len(facts.entrants) < 2:
        raise Unpairable("fewer than two players")
    outcomes = pair_brackets(facts, route)
    pairs = [pair for o in outcomes for pair in o.pairs]
    leftover = outcomes[-1].floaters
    s = facts.entrants

    def board_key(pair: tuple[PlayerId, PlayerId]) -> tuple[float, float, tuple[float, int]]:
        a, b = pair
        return (-max(s[a].score, s[b].score), -(s[a].score + s[b].score), min(facts.rank(a), facts.rank(b)))

    boards = tuple(allocate(facts, a, b) for a, b in sorted(pairs, key=board_key))
    return ReferenceRound(boards, leftover[0] if leftover else None)
