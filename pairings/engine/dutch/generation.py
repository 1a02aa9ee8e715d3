"""The Handbook's order of candidates in a bracket: transpositions and exchanges (C.04.3, from memory).

This is the order in which the FIDE (Dutch) System generates a bracket's
candidate pairings; among candidates equally good by every criterion, the one
generated first wins. The module gives the order itself (used by the tests'
brute force and by :mod:`pairings.engine.dutch.verify`) and
:func:`generation_key`, the position of a candidate in it, which the bracket
matching reproduces with weight digits (see :mod:`pairings.engine.dutch.bracket`).

Players are given by their bracket sequence numbers (BSN, 1-based, Art. 1.2).

- Transpositions (2017 D.1): the orderings of S2 in lexicographic order of
  their first ``len(S1)`` BSNs; later places are ignored (those players float,
  or form the remainder).
- Exchanges (2017 D.2, D.3): swaps of equal-sized groups between the original
  S1 and S2 (or S1 and Limbo), ordered by (1) fewer players swapped, (2) the
  smaller sum of BSNs moved S2 to S1 minus the sum moved S1 to S2, (3) the
  option whose S1-to-S2 group holds the highest BSN that differs, (4) the
  option whose S2-to-S1 group holds the lowest BSN that differs. S1 and S2 are
  re-sorted by BSN after the swap. The first option is no swap at all.
- Homogeneous bracket (or remainder): S1 = the first ``pairs`` BSNs, S2 the
  rest; exchanges outermost, transpositions inside.
- Heterogeneous bracket: S1 = the ``m1`` highest MDPs, Limbo = the other MDPs
  (they float), S2 = all residents; loops from outermost: MDP exchanges,
  transpositions of the MDP-pairing's S2, then the remainder (the residents
  left) as a homogeneous bracket. MDPs are never paired with each other.
"""

from __future__ import annotations

from itertools import combinations, permutations
from typing import Iterator, Sequence

Pairs = tuple[tuple[int, int], ...]
Candidate = tuple[Pairs, tuple[int, ...]]
"""Pairs (S1 member, S2 member) and the players left unpaired, all as BSNs."""


def exchange_key(moved_out: Sequence[int], moved_in: Sequence[int]) -> tuple[object, ...]:
    """Sort key of one exchange: S1 gives ``moved_out`` and takes ``moved_in`` (tests 1-4 above)."""
    return (len(moved_out), sum(moved_in) - sum(moved_out),
            tuple(-x for x in sorted(moved_out, reverse=True)), tuple(sorted(moved_in)))


def exchanges(s1: Sequence[int], s2: Sequence[int]) -> Iterator[tuple[tuple[int, ...], tuple[int, ...]]]:
    """Every ``(S1, S2)`` after one exchange, in the Handbook's order; the first is the split itself."""
    yield tuple(sorted(s1)), tuple(sorted(s2))
    for k in range(1, min(len(s1), len(s2)) + 1):
        options = [(a, b) for a in combinations(s1, k) for b in combinations(s2, k)]
        options.sort(key=lambda ab: exchange_key(*ab))
        for a, b in options:
            new1 = sorted(set(s1) - set(a) | set(b))
            new2 = sorted(set(s2) - set(b) | set(a))
            yield tuple(new1), tuple(new2)


def transpositions(s2: Sequence[int], places: int) -> Iterator[tuple[int, ...]]:
    """The distinct first ``places`` BSNs of S2's orderings, in lexicographic order."""
    yield from permutations(sorted(s2), places)


def homogeneous(bsns: Sequence[int], pairs: int) -> Iterator[Candidate]:
    """Candidates of a homogeneous bracket (or remainder) giving ``pairs`` pairs, in generation order."""
    ordered = sorted(bsns)
    for s1, s2 in exchanges(ordered[:pairs], ordered[pairs:]):
        for t in transpositions(s2, pairs):
            yield tuple(zip(s1, t)), tuple(x for x in s2 if x not in t)


def heterogeneous(mdps: Sequence[int], residents: Sequence[int], m1: int, remainder_pairs: int
                  ) -> Iterator[Candidate]:
    """Candidates of a heterogeneous bracket: ``m1`` MDP-resident pairs and ``remainder_pairs`` more."""
    ordered = sorted(mdps)
    for s1, limbo in exchanges(ordered[:m1], ordered[m1:]):
        for t in transpositions(residents, m1):
            left = [r for r in sorted(residents) if r not in t]
            for rest, floaters in homogeneous(left, remainder_pairs):
                yield tuple(zip(s1, t)) + rest, tuple(sorted(limbo + floaters))


def generation_key(mdps: Sequence[int], residents: Sequence[int], pairs: Pairs) -> tuple[object, ...]:
    """The position of a candidate in the generation order (smaller is generated first).

    ``pairs`` as BSN pairs in any orientation. A candidate can be generated
    under several exchanges; it counts where it first appears. In a
    homogeneous bracket (or remainder) of ``k`` pairs that is the exchange
    whose S1 is the set of each pair's lower BSN: it alone swaps the fewest
    players (a pair holding an original S1 player gives it to S1) and, among
    those, has the smallest sum (tests 1 and 2), so tests 3 and 4 never have
    to choose between two ways of generating one candidate. In a heterogeneous
    bracket the MDPs are S1's side of every MDP pair.
    """
    mdp_set = set(mdps)
    mdp_pairs = sorted((min(a, b), max(a, b)) for a, b in pairs if (a in mdp_set) != (b in mdp_set))
    m1 = len(mdp_pairs)
    ordered = sorted(mdps)
    paired_mdps = [a for a, _ in mdp_pairs]
    key: list[object] = [-m1]
    if mdps:
        key.append(exchange_key(sorted(set(ordered[:m1]) - set(paired_mdps)),
                                sorted(set(paired_mdps) - set(ordered[:m1]))))
        key.append(tuple(b for _, b in mdp_pairs))
    used = {x for pair in mdp_pairs for x in pair}
    rest = sorted((min(a, b), max(a, b)) for a, b in pairs if a not in used)
    left = sorted(r for r in residents if r not in used)
    s1 = set(left[:len(rest)])
    lows = [a for a, _ in rest]
    key.append(exchange_key(sorted(s1 - set(lows)), sorted(set(lows) - s1)))
    key.append(tuple(b for _, b in rest))
    return tuple(key)
