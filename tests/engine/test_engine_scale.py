"""Fast path against the reference on simulated fields (not timed; speed is in pairings.bench).

networkx max_weight_matching as independent solver, on the full candidate graph:
the engine (pruned graph, fastest exact back end) must reach the same cost vector.
"""

from __future__ import annotations

import random

import pytest

from pairings.engine import draft_round
from pairings.errors import NoPairingError
from pairings.fold import fold
from pairings.simulate import simulate_events


def sizes(count: int, seed: int) -> list[tuple[int, int, int]]:
    """(players, rounds played, seed): mostly small fields, some up to 300."""
    rng = random.Random(seed)
    out = []
    for k in range(count):
        low, top = (200, 300) if k % 40 == 0 else (4, 120) if k % 8 == 0 else (4, 48)
        out.append((rng.randint(low, top), rng.randint(0, 8), rng.randint(0, 10**6)))
    return out


@pytest.mark.parametrize(("n", "played", "seed"), sizes(200, 1))
def test_fast_path_equals_reference(n: int, played: int, seed: int) -> None:
    log = simulate_events(n, 9, played, seed, withdrawals=0.02, requested_byes=0.03)
    state = fold(enumerate(log, 1))
    try:
        fast = draft_round(state)
    except NoPairingError:  # tiny fields run out of opponents: the reference must agree
        with pytest.raises(NoPairingError):
            draft_round(state, reference=True)
        return
    assert fast.key() == draft_round(state, reference=True).key()


@pytest.mark.full
@pytest.mark.parametrize("seed", range(3))
def test_fast_path_equals_reference_at_1000(seed: int) -> None:
    log = simulate_events(1000, 9, 4, seed)
    state = fold(enumerate(log, 1))
    assert draft_round(state).key() == draft_round(state, reference=True).key()
