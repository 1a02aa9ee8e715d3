"""The Handbook's generation order (C.04.3; 2017 D.1-D.3 mechanics, from memory).

Check values: the worked sequences for 6 and 8 players of our standards brief
(transpositions, single and double exchanges), computed by hand from the
ordering rules as stated there.
"""

from __future__ import annotations

import random
from itertools import islice

from pairings.engine.dutch.generation import (
    exchanges, generation_key, heterogeneous, homogeneous, transpositions,
)


def _swaps(s1: list[int], s2: list[int], size: int) -> list[tuple[set[int], set[int]]]:
    out = []
    for new1, _ in exchanges(s1, s2):
        gave = set(s1) - set(new1)
        if len(gave) == size:
            out.append((gave, set(new1) - set(s1)))
    return out


def test_transpositions_six_and_eight() -> None:
    assert [''.join(map(str, t)) for t in transpositions([4, 5, 6], 3)] == \
        ["456", "465", "546", "564", "645", "654"]
    eight = [''.join(map(str, t)) for t in transpositions([5, 6, 7, 8], 4)]
    assert eight[:7] == ["5678", "5687", "5768", "5786", "5867", "5876", "6578"]
    assert eight[-1] == "8765" and len(eight) == 24


def test_single_exchanges_six() -> None:
    # 3<->4; 3<->5; 2<->4; 3<->6; 2<->5; 1<->4; 2<->6; 1<->5; 1<->6
    expected = [(3, 4), (3, 5), (2, 4), (3, 6), (2, 5), (1, 4), (2, 6), (1, 5), (1, 6)]
    assert [(a.pop(), b.pop()) for a, b in _swaps([1, 2, 3], [4, 5, 6], 1)] == expected


def test_first_exchange_restarts_transpositions() -> None:
    # After 3<->4: S1 = 1 2 4, S2 = 3 5 6; first candidate 1-3, 2-5, 4-6.
    order = list(exchanges([1, 2, 3], [4, 5, 6]))
    assert order[0] == ((1, 2, 3), (4, 5, 6))
    assert order[1] == ((1, 2, 4), (3, 5, 6))
    first_after = [c for c in homogeneous(range(1, 7), 3)][6]
    assert first_after == (((1, 3), (2, 5), (4, 6)), ())


def test_double_exchanges_start_six() -> None:
    doubles = _swaps([1, 2, 3], [4, 5, 6], 2)
    assert doubles[:3] == [({2, 3}, {4, 5}), ({2, 3}, {4, 6}), ({1, 3}, {4, 5})]


def test_single_exchanges_eight() -> None:
    expected = [(4, 5), (4, 6), (3, 5), (4, 7), (3, 6), (2, 5), (4, 8), (3, 7), (2, 6), (1, 5), (3, 8),
                (2, 7), (1, 6), (2, 8), (1, 7), (1, 8)]
    assert [(a.pop(), b.pop()) for a, b in _swaps([1, 2, 3, 4], [5, 6, 7, 8], 1)] == expected


def test_double_exchanges_start_eight() -> None:
    doubles = _swaps([1, 2, 3, 4], [5, 6, 7, 8], 2)
    assert doubles[:8] == [({3, 4}, {5, 6}), ({3, 4}, {5, 7}), ({2, 4}, {5, 6}), ({3, 4}, {5, 8}),
                           ({3, 4}, {6, 7}), ({2, 4}, {5, 7}), ({1, 4}, {5, 6}), ({2, 3}, {5, 6})]


def test_odd_bracket_ignores_the_last_place() -> None:
    # Seven players, MaxPairs 3: 456(7), 457(6), 465(7): the last S2 player floats.
    first = list(islice(homogeneous(range(1, 8), 3), 3))
    assert first == [(((1, 4), (2, 5), (3, 6)), (7,)), (((1, 4), (2, 5), (3, 7)), (6,)),
                     (((1, 4), (2, 6), (3, 5)), (7,))]


def test_heterogeneous_order() -> None:
    # MDPs 1-2, residents 3..7, M1 = 2: 20 MDP-pairing transpositions, remainder of 3 inside.
    cands = list(heterogeneous([1, 2], [3, 4, 5, 6, 7], 2, 1))
    mdp_parts = list(dict.fromkeys(c[0][:2] for c in cands))
    assert len(mdp_parts) == 20 and mdp_parts[0] == ((1, 3), (2, 4)) and mdp_parts[-1] == ((1, 7), (2, 6))
    assert cands[0] == (((1, 3), (2, 4), (5, 6)), (7,))
    # M1 = 1: S1 = 1, Limbo = 2; the exchange 1<->2 comes after every candidate pairing MDP 1.
    one = list(heterogeneous([1, 2], [3, 4, 5], 1, 1))
    firsts = [c[0][0][0] for c in one]
    assert firsts == sorted(firsts) and firsts[0] == 1 and firsts[-1] == 2


def test_generation_key_is_the_first_appearance() -> None:
    """generation_key orders candidates as their first appearance in the generation (brute force)."""
    rng = random.Random(4)
    for _ in range(40):
        n_mdp = rng.randint(0, 3)
        n_res = rng.randint(2, 6)
        mdps, residents = list(range(1, n_mdp + 1)), list(range(n_mdp + 1, n_mdp + n_res + 1))
        m1 = rng.randint(0, min(n_mdp, n_res))
        rest = rng.randint(0, (n_res - m1) // 2)
        seen: dict[frozenset[tuple[int, int]], int] = {}
        for i, (pairs, _) in enumerate(heterogeneous(mdps, residents, m1, rest)):
            seen.setdefault(frozenset((min(a, b), max(a, b)) for a, b in pairs), i)
        by_key = sorted(seen, key=lambda c: generation_key(mdps, residents, tuple(c)))
        assert by_key == sorted(seen, key=seen.__getitem__)
