"""The generation order's shortcuts change no Dutch draft.

Two steps of :mod:`pairings.engine.dutch.bracket` skip a tie-break solve when
a cheaper argument gives the same answer: an S1 player is given his first
possible partner by an alternating cycle that keeps the matching optimal
(:meth:`pairings.engine.dutch.graph.BracketGraph.swap_in`), and the exchange
solve is skipped when S1 is already the first players in every copy, or can
be made so by repairing the matching with alternating paths
(:meth:`pairings.engine.dutch.graph.BracketGraph.repair`). The
generation order is a total order, so neither may change a draft: checked
against the same engine with both shortcuts switched off, on random
simulated fields (16-120 players, rounds 2-9), and both are shown to act.
"""

from __future__ import annotations

import random
from dataclasses import replace

import numpy as np
import pytest
from numpy.typing import NDArray

from pairings.engine import draft_round
from pairings.engine.dutch import bracket, graph
from pairings.engine.types import Draft
from pairings.fold import fold
from pairings.simulate import simulate_events
from pairings.state import EventState, PlayerId, System


def _state(n: int, played: int, seed: int) -> EventState:
    state = fold(enumerate(simulate_events(n, 9, played, seed), 1))
    return replace(state, settings=replace(state.settings, system=System.DUTCH))


def _key(d: Draft) -> tuple[object, ...]:
    return tuple((b.first, b.second) for b in d.boards), d.pairing_bye


def _fields(count: int) -> list[tuple[int, int, int]]:
    rng = random.Random(23)
    return [(rng.randint(16, 120), rng.randint(1, 8), seed) for seed in range(count)]


def test_shortcuts_draft_as_the_solves(monkeypatch: pytest.MonkeyPatch) -> None:
    rerouted: list[bool] = []
    repaired: list[bool] = []
    swap_in, repair = graph.BracketGraph.swap_in, graph.BracketGraph.repair

    def counted(self: graph.BracketGraph, p: PlayerId, q: PlayerId) -> bool:
        out = swap_in(self, p, q)
        rerouted.append(out)
        return out

    def mended(self: graph.BracketGraph, banned: NDArray[np.bool_]) -> bool:
        out = repair(self, banned)
        repaired.append(out)
        return out

    monkeypatch.setattr(graph.BracketGraph, "swap_in", counted)
    monkeypatch.setattr(graph.BracketGraph, "repair", mended)
    for n, played, seed in _fields(60):
        state = _state(n, played, seed)
        fast = draft_round(state)
        with monkeypatch.context() as off:
            off.setattr(bracket, "SHORTCUTS", False)
            slow = draft_round(state)
        assert _key(fast) == _key(slow), (n, played, seed)
    assert any(rerouted), "no S1 player was given his partner by an alternating cycle"
    assert not all(rerouted), "every alternating-cycle search succeeded: the fallback solve went untested"
    assert any(repaired), "no exchange solve was replaced by repairing the matching"
