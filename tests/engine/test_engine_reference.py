"""The engine's optimum against independent solvers.

networkx max_weight_matching as independent solver: on the full candidate
graph (every pair, no pruning) with the same integer weights, the engine's
pairing has equal total weight and an equal cost vector.
"""

from __future__ import annotations

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from tests.engine.engine_support import random_history, simulate, state_of
from pairings.engine import draft_round
from pairings.engine.candidates import full_graph
from pairings.engine.criteria import Field
from pairings.engine.solver import matching_weight, reference_matching
from pairings.errors import NoPairingError
from pairings.state import ByeKind, EventState

fields = st.fixed_dictionaries({
    "n": st.integers(2, 26),
    "rounds_played": st.integers(0, 7),
    "seed": st.integers(0, 10**6),
    "withdraw": st.sampled_from([0.0, 0.05, 0.15]),
    "byes": st.sampled_from([0.0, 0.05, 0.1]),
    "engine_rounds": st.booleans(),
    "extra": st.sampled_from([
        {}, {"sides": None}, {"scoring": {"win": 3, "draw": 1, "loss": 0}}, {"max_meetings": 2},
        {"final_round_side_exception": True},
    ]),
})


def check_against_networkx(state: EventState) -> None:
    try:
        fast = draft_round(state)
    except NoPairingError:
        with pytest.raises(NoPairingError):
            draft_round(state, reference=True)
        return
    ref = draft_round(state, reference=True)
    assert fast.key() == ref.key()
    # Equal total weight on the full graph's weights (networkx as independent solver).
    rnd = state.next_round_number
    players = [p for b in fast.boards for p in (b.first, b.second)]
    bye = fast.pairing_bye
    fld = Field(state, rnd, players + ([bye] if bye else []))
    g = full_graph(fld, list(fld.order), ())
    wedges = g.weighted()
    where = {p: i for i, p in enumerate(g.players)}
    mine = [(where[b.first], where[b.second]) for b in fast.boards]
    if bye is not None:
        mine.append((where[bye], g.bye_vertex))
    assert matching_weight(wedges, mine) == matching_weight(wedges, reference_matching(g.n, wedges))


@settings(max_examples=250, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(fields)
def test_equal_to_networkx_on_random_fields(spec: dict[str, object]) -> None:
    extra = spec.pop("extra")
    check_against_networkx(state_of(random_history(**spec, **extra)))  # type: ignore[arg-type]


@pytest.mark.full
@settings(max_examples=3000, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(fields)
def test_equal_to_networkx_on_thousands_of_fields(spec: dict[str, object]) -> None:
    extra = spec.pop("extra")
    check_against_networkx(state_of(random_history(**spec, **extra)))  # type: ignore[arg-type]


@pytest.mark.parametrize("seed", range(3))
def test_forced_rematches_match_networkx(seed: int) -> None:
    # 6 players, 5 random rounds: most pairs have met, rematches are forced.
    state = state_of(random_history(6, 5, seed))
    check_against_networkx(state)


def test_bye_falls_to_lowest_score_and_is_never_repeated_when_avoidable() -> None:
    state = state_of(simulate(11, 4, seed=5))
    draft = draft_round(state)
    bye = draft.pairing_bye
    assert bye is not None
    assert not state.records[bye].had_unplayed_point
    assert [b.kind for b in draft.byes].count(ByeKind.PAIRING) == 1
