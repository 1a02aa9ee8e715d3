"""The array-built bracket graphs give every pair edge the pair's own costs.

:mod:`pairings.engine.dutch.graph` enumerates the edges in numpy and gives
each the cost object of its class of player profiles (score, colour
preference, float history, MDP or not), made from the class's first pair.
Every bracket pair edge of every graph built for these drafts (the last
brackets, PPBs and CLBs of small late rounds included) must hold what
:func:`pairings.engine.dutch.criteria.pair_costs` gives for that very pair
(the criteria's own reading, pair by pair).
"""

from __future__ import annotations

import random
from dataclasses import replace

import pytest

from pairings.engine import draft_round
from pairings.engine.dutch import graph
from pairings.engine.dutch.bracket import BracketSolver
from pairings.engine.dutch.criteria import Costs, pair_costs
from pairings.errors import NoPairingError
from pairings.fold import fold
from pairings.simulate import simulate_events
from pairings.state import System


def _nonzero(c: Costs) -> dict[tuple[int, int], int]:
    return {layer: n for layer, n in c.items() if n}


def test_every_pair_edge_holds_its_own_costs(monkeypatch: pytest.MonkeyPatch) -> None:
    built = graph.BracketGraph.__init__
    checked: list[bool] = []
    routes: list[str] = []
    refused: list[int] = []

    def checking(self: graph.BracketGraph, solver: BracketSolver, form: str, slots: int = 0) -> None:
        built(self, solver, form, slots)
        # a PPB's graphs are followed by its CLB's (a last bracket with MDPs)
        routes.append("ppb" if solver.br.ppb else "last" if solver.br.last and solver.br.mdps else "mdp"
                      if solver.br.mdps else "other")
        for k in range(len(self.u)):
            if self.pair[k] and self.u[k] < self.real and self.v[k] < self.real:
                u, v = self.vertices[int(self.u[k])], self.vertices[int(self.v[k])]
                own = pair_costs(solver.ent, solver.br, u, v)[0]
                checked.append(_nonzero(self.table.costs[int(self.which[k])]) == _nonzero(own))

    monkeypatch.setattr(graph.BracketGraph, "__init__", checking)
    rng = random.Random(7)
    for seed in range(60):
        n, played = (rng.randint(5, 12), rng.randint(3, 8)) if seed % 2 else (rng.randint(16, 64), rng.randint(1, 8))
        state = fold(enumerate(simulate_events(n, 9, played, seed), 1))
        try:
            draft_round(replace(state, settings=replace(state.settings, system=System.DUTCH)))
        except NoPairingError:  # no legal pairing of the round: nothing to check
            refused.append(1)
    assert len(checked) > 1000 and {"ppb", "last", "mdp"} <= set(routes) and len(refused) < 30
    assert all(checked)
