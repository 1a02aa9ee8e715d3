"""The dual certificate behind ``pairings verify``: its checker, its proof, and verify at scale.

The references are networkx on the full graph (an independent solver) and
hand-made duals whose faults are known.
"""

from __future__ import annotations

import random

import numpy as np
import pytest

from tests.engine.engine_support import columns, new_event, play, simulate, state_of
from pairings.engine import candidates, draft_round, implicit, proof, rebuild, solver, swap, verify_round
from pairings.engine.blossom import Dual, perfect_matching
from pairings.engine.certificate import check
from pairings.engine.criteria import Field


def test_check_accepts_an_optimal_dual_and_names_each_fault() -> None:
    rng = random.Random(5)
    n = 12
    edges = [(i, j, rng.randint(0, 40)) for i in range(n) for j in range(i + 1, n) if rng.random() < 0.6]
    solved = perfect_matching(n, edges)
    assert solved is not None
    pairs, dual = solved
    u, v, w = columns(edges)
    assert check(n, u, v, w, pairs, dual).ok
    low = Dual([y - 10**6 if k == 0 else y for k, y in enumerate(dual.y2)], dual.blossoms)
    assert check(n, u, v, w, pairs, low).violated > 0
    high = Dual([y + 2 if k == 0 else y for k, y in enumerate(dual.y2)], dual.blossoms)
    found = check(n, u, v, w, pairs, high)
    assert found.violated == 0 and found.loose == 1 and not found.ok  # feasible, but one board is not tight
    assert not check(n, u, v, w, pairs[1:], dual).perfect
    assert not check(n, u, v, w, pairs, Dual(dual.y2, [(frozenset({0, 1, 2}), -1)])).sound


def test_check_finds_a_blossom_the_matching_does_not_fill() -> None:
    # Triangle 0-1-2 of weight 1 and the spokes 0-3, 1-4, 2-5 and 3-4 of weight 0: y = 0 and z = 1 on
    # the triangle make every edge tight, yet the spokes pairing leaves the triangle empty (weight 0 < 1).
    edges = [(0, 1, 1), (1, 2, 1), (0, 2, 1), (0, 3, 0), (1, 4, 0), (2, 5, 0), (3, 4, 0)]
    u, v, w = columns(edges)
    dual = Dual([0] * 6, [(frozenset({0, 1, 2}), 1)])
    spokes = check(6, u, v, w, [(0, 3), (1, 4), (2, 5)], dual)
    assert spokes.violated == 0 and spokes.loose == 0 and spokes.short == 1 and not spokes.ok
    assert check(6, u, v, w, [(0, 1), (2, 5), (3, 4)], dual).ok


def _field(state):  # type: ignore[no-untyped-def]
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    return fld, list(fld.order)


@pytest.mark.parametrize("compiled", [True, False])
def test_proof_agrees_with_networkx_on_optimal_and_worse_pairings(compiled: bool,
                                                                  monkeypatch: pytest.MonkeyPatch) -> None:
    if not compiled:
        monkeypatch.setattr(implicit, "available", lambda: False)
    for seed in range(4):
        state = state_of(simulate(22 + seed, 3, seed=seed, byes=0.05))
        fld, players = _field(state)
        best = draft_round(state, reference=True)  # networkx on the full graph
        rng = random.Random(seed)
        worse = swap(state, best, *rng.sample([b.first for b in best.boards], 2))
        for drafted in (best, worse):
            pairs = [(b.first, b.second) for b in drafted.boards]
            matched = proof.index_pairs(players, pairs, drafted.pairing_bye)
            assert matched is not None
            found = proof.prove(fld, players, (), matched)
            assert found is not None and found.checker == ("pair scan" if compiled else "numpy")
            assert found.optimal == (drafted.key() == best.key())
            cheapest = rebuild(state, fld.round, [(players[i], players[j]) for i, j in found.best
                                                  if j < len(players)],
                               next((players[i] for i, j in found.best if j == len(players)), None))
            assert cheapest.key() == best.key()


def test_index_pairs_refuses_a_pairing_that_misses_or_repeats_a_player() -> None:
    players = ["a", "b", "c", "d", "e"]
    assert proof.index_pairs(players, [("a", "b"), ("d", "c")], "e") == [(0, 1), (2, 3), (4, 5)]
    assert proof.index_pairs(players, [("a", "b"), ("d", "c")], None) is None
    assert proof.index_pairs(players, [("a", "b"), ("a", "c")], "e") is None


def _no_networkx(*_: object) -> object:
    raise AssertionError("networkx re-solve at a size the certificate covers")


def test_verify_of_a_large_field_proves_rounds_without_networkx(monkeypatch: pytest.MonkeyPatch) -> None:
    log = simulate(proof_size := 320, 2, seed=3)
    rng = random.Random(3)
    state = state_of(log)
    draft = draft_round(state)
    worse = swap(state, draft, draft.boards[0].first, draft.boards[-1].first)
    play(log, worse, rng)  # stored with source "engine" though it is not the optimum
    monkeypatch.setattr(solver, "reference_matching", _no_networkx)
    state = state_of(log)
    assert len(state.available(1)) == proof_size
    fine = verify_round(state, 2)
    assert fine.ok and fine.optimal is True
    assert any("dual certificate" in line and "optimal" in line for line in fine.lines())
    bad = verify_round(state, 3)
    assert bad.optimal is False and not bad.ok
    assert any("dual certificate" in line and "cheaper pairing" in line for line in bad.lines())
    with pytest.raises(AssertionError, match="networkx"):
        verify_round(state, 3, deep=True)


def test_verify_below_the_limit_also_asks_networkx() -> None:
    state = state_of(simulate(30, 3, seed=8))
    check3 = verify_round(state, 3)
    text = "\n".join(check3.lines())
    assert check3.optimal is True and "dual certificate" in text and "reference solver" in text


def test_bound_of_the_stored_pairing_keeps_its_own_pairs() -> None:
    state = state_of(simulate(40, 3, seed=2))
    fld, players = _field(state)
    draft = draft_round(state)
    matched = proof.index_pairs(players, [(b.first, b.second) for b in draft.boards], draft.pairing_bye)
    assert matched is not None
    n = len(players)
    costs = [fld.bye(players[i]) if j == n else fld.pair(players[i], players[j])[1] for i, j in matched]
    pr = candidates.pruned_edges(fld, players, (), candidates.bound_of(fld, players, (), costs, matched))
    assert pr is not None
    keys = set((pr.u * pr.n + pr.v).tolist())
    assert all(i * pr.n + j in keys for i, j in matched)
    assert np.all(pr.u < pr.v)
