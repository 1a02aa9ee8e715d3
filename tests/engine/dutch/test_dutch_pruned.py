"""The pruned, certified bracket solves give the same Dutch drafts as solves on every edge.

Each pruned solve is exact by its dual certificate, and the generation order
is a total order, so the route cannot change a draft (pairings.engine.dutch.graph's
notes). Checked on random simulated fields (16-72 players, rounds 2-9, with
and without the narrowest pruning, which makes the certificate fail and the
solve widen more often).
"""

from __future__ import annotations

import random
from dataclasses import replace

import pytest

from pairings.engine import draft_round
from pairings.engine.dutch import graph
from pairings.engine.types import Draft
from pairings.fold import fold
from pairings.simulate import simulate_events
from pairings.state import EventState, System

FIELDS = 240


def _fields() -> list[tuple[int, int, int]]:
    rng = random.Random(11)
    out = []
    for seed in range(FIELDS):
        played = rng.randint(1, 8)
        out.append((rng.randint(16, 72), played, seed))
    return out


def _state(n: int, played: int, seed: int) -> EventState:
    state = fold(enumerate(simulate_events(n, 9, played, seed), 1))
    return replace(state, settings=replace(state.settings, system=System.DUTCH))


def _key(d: Draft) -> tuple[object, ...]:
    return tuple((b.first, b.second) for b in d.boards), d.pairing_bye


@pytest.mark.parametrize("narrow", [False, True])
def test_pruned_solves_draft_as_the_whole_graph(narrow: bool, monkeypatch: pytest.MonkeyPatch) -> None:
    if narrow:
        monkeypatch.setattr(graph, "PRUNE_WINDOW", 0)
        monkeypatch.setattr(graph, "PRUNE_BEST", 1)
        monkeypatch.setattr(graph, "PRUNE_ADD", 1)
    for n, played, seed in _fields()[::2] if not narrow else _fields()[1::2]:
        state = _state(n, played, seed)
        pruned = draft_round(state)
        monkeypatch.setattr(graph, "PRUNE", False)
        whole = draft_round(state)
        monkeypatch.setattr(graph, "PRUNE", True)
        assert _key(pruned) == _key(whole), (n, played, seed)


def test_the_narrow_pruning_needs_the_certificate(monkeypatch: pytest.MonkeyPatch) -> None:
    # The comparison above means something only if pruned graphs do miss optimal edges.
    monkeypatch.setattr(graph, "PRUNE_WINDOW", 0)
    monkeypatch.setattr(graph, "PRUNE_BEST", 1)
    monkeypatch.setattr(graph, "PRUNE_ADD", 1)
    solves: list[int] = []
    repeats: list[int] = []
    real = graph.blossom.perfect_matching_arrays
    certified = graph.certified

    def counted(*args: object, **kw: object) -> object:
        solves.append(1)
        return real(*args, **kw)  # type: ignore[arg-type]

    def rounds(*args: object) -> object:
        solves.clear()
        out = certified(*args)  # type: ignore[arg-type]
        repeats.append(len(solves))
        return out

    monkeypatch.setattr(graph.blossom, "perfect_matching_arrays", counted)
    monkeypatch.setattr(graph, "certified", rounds)
    draft_round(_state(60, 4, 3))
    assert max(repeats) > 1
