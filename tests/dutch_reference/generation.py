"""The Handbook's order of candidates, spelt out procedurally (C.04.3, 2017 D.1-D.3 as the spec
states them, from memory).

Players are given as BSNs (1..n, their place in the bracket by Art. 1.2).
"""

from __future__ import annotations

from itertools import combinations
from typing import Callable, Iterator, Sequence


def exchanges(s1: Sequence[int], s2: Sequence[int]) -> list[tuple[tuple[int, ...], tuple[int, ...]]]:
    """Every exchange (group leaving S1, group entering S1) of equal size, in the Handbook's order.

    The no-exchange comes first. Then: (1) fewer players swapped; (2) the smaller
    [sum of BSNs entering S1] - [sum of BSNs leaving S1]; (3) the option whose
    leaving group holds the highest BSN that differs between the two; (4) the
    option whose entering group holds the lowest differing BSN. For groups of
    equal size test 3 is "the leaving group sorted high to low is the larger
    sequence", test 4 "the entering group sorted low to high is the smaller".
    """
    options: list[tuple[tuple[int, int, tuple[int, ...], tuple[int, ...]], tuple[int, ...], tuple[int, ...]]] = []
    for k in range(0, min(len(s1), len(s2)) + 1):
        for out in combinations(sorted(s1), k):
            for into in combinations(sorted(s2), k):
                key = (k, sum(into) - sum(out), tuple(-b for b in sorted(out, reverse=True)), tuple(sorted(into)))
                options.append((key, out, into))
    options.sort(key=lambda o: o[0])
    return [(out, into) for _, out, into in options]


def transpositions(s1: Sequence[int], s2: Sequence[int],
                   legal: Callable[[int, int], bool]) -> Iterator[tuple[int, ...]]:
    """The orderings of S2 in lexicographic order of their first len(S1) BSNs (D.1).

    Only the first len(S1) places matter (the others float or form the
    remainder), so each distinct prefix is yielded once. Prefixes whose i-th
    pair is illegal are skipped (they cannot give a legal candidate); this
    keeps the lexicographic order of the rest.
    """
    pool = sorted(s2)
    chosen: list[int] = []
    used: set[int] = set()

    def walk(i: int) -> Iterator[tuple[int, ...]]:
        if i == len(s1):
            yield tuple(chosen)
            return
        for b in pool:
            if b in used or not legal(s1[i], b):
                continue
            used.add(b)
            chosen.append(b)
            yield from walk(i + 1)
            chosen.pop()
            used.discard(b)

    yield from walk(0)


def homogeneous(players: Sequence[int], pairs: int,
                legal: Callable[[int, int], bool]) -> Iterator[tuple[tuple[int, int], ...]]:
    """Candidates of a homogeneous bracket (or remainder) giving ``pairs`` pairs, in order.

    S1 = the first ``pairs`` BSNs, S2 = the rest; transpositions of S2, then the
    next exchange between the original S1 and S2 and transpositions again.
    """
    ordered = sorted(players)
    s1, s2 = ordered[:pairs], ordered[pairs:]
    for out, into in exchanges(s1, s2):
        t1 = sorted((set(s1) - set(out)) | set(into))
        t2 = sorted((set(s2) - set(into)) | set(out))
        for trans in transpositions(t1, t2, legal):
            yield tuple(zip(t1, trans))


def heterogeneous(mdps: Sequence[int], residents: Sequence[int], m1: int, pairs: int,
                  legal: Callable[[int, int], bool]) -> Iterator[tuple[tuple[int, int], ...]]:
    """Candidates of a heterogeneous bracket, in order: for each MDP exchange (S1 <-> Limbo), each
    transposition of the residents for the MDP-pairing, each candidate of the remainder."""
    ordered = sorted(mdps)
    s1, limbo = ordered[:m1], ordered[m1:]
    for out, into in exchanges(s1, limbo):
        t1 = sorted((set(s1) - set(out)) | set(into))
        for trans in transpositions(t1, residents, legal):
            mdp_pairs = tuple(zip(t1, trans))
            remainder = [r for r in residents if r not in trans]
            for rest in homogeneous(remainder, pairs - m1, legal):
                yield mdp_pairs + rest
