"""The one table of the cost criteria (pairings.costs): its checks, the docs, and a reordered table.

Reordering two soft criteria is one edit of ``pairings.costs.CRITERIA``; the test below makes that
edit in a fresh interpreter (before any engine module reads the table) and runs there the tests that
compare the Python cost (Field.pair), the numpy cost (vector.Arrays) and the compiled scan pair by
pair, the brute-force optimum, and networkx's optimum on the full graph.
"""

from __future__ import annotations

import random
import re
import subprocess
import sys
from dataclasses import replace
from pathlib import Path

import pytest

from tests.engine.engine_support import random_history, state_of
from pairings import costs
from pairings.engine import draft_round, route
from pairings.engine.criteria import GAP, Cost, Field
from pairings.errors import NoPairingError

ROOT = Path(__file__).resolve().parents[2]

REORDERED = """
import sys
from pairings import costs
assert not any(m.startswith("pairings.engine") for m in sys.modules), "the engine read the table already"
first, second = sys.argv[1:3]
order = list(costs.CRITERIA)
a, b = (next(k for k, c in enumerate(order) if c.key == key) for key in (first, second))
order[a], order[b] = order[b], order[a]
costs.LAYOUT = costs.Layout(order)
from pairings.engine.types import CRITERIA
assert CRITERIA == tuple(c.key for c in order) != tuple(c.key for c in costs.CRITERIA)
import pytest
raise SystemExit(pytest.main(["-q", "-x", "-p", "no:cacheprovider", *sys.argv[3:]]))
"""
"""Swap two criteria of the table, then run pytest on the given tests."""

AGREEMENT = [
    "tests/engine/test_engine_certified.py::test_vector_costs_equal_field_pair",  # numpy == Field.pair
    "tests/engine/test_scan_kernel.py::test_scan_equals_numpy_path",  # compiled scan == numpy path
    "tests/engine/test_engine_rules.py::test_lexicographic_minimum_by_brute_force",
    "tests/engine/test_cost_table.py::test_draft_is_optimal_per_networkx",
]


def key_of(pair_costs: list[Cost]) -> tuple[object, ...]:
    """A pairing's lexicographic key from its costs (docs/engine.md): sums, S2 as the sorted gap list."""
    sums: list[object] = [sum(column) for column in zip(*pair_costs)]
    sums[GAP] = tuple(sorted((c[GAP] for c in pair_costs), reverse=True))
    return tuple(sums)


@pytest.mark.parametrize("seed", range(25))
def test_draft_is_optimal_per_networkx(seed: int) -> None:
    # networkx max_weight_matching on the full candidate graph as the independent solver.
    rng = random.Random(seed)
    state = state_of(random_history(rng.randint(2, 40), rng.randint(0, 6), seed, withdraw=0.03, byes=0.03,
                                    engine_rounds=rng.random() < 0.5))
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    order = list(fld.order)
    try:
        pairs, bye = route.optimal_pairs(fld, order, (), reference=True)
    except NoPairingError:
        with pytest.raises(NoPairingError):
            draft_round(state)
        return
    reference = [fld.pair(p, q)[1] for _, (p, q) in pairs] + ([fld.bye(bye)] if bye is not None else [])
    assert draft_round(state).key() == key_of(reference)


@pytest.mark.parametrize(("first", "second"), [
    ("pref_mild", "float_repeat"),  # two columns the compiled scan fills
    ("score_gap", "bye_rank"),      # the gap levels move: the weights, the bound and the scan follow
])
def test_reordered_soft_criteria_still_agree(first: str, second: str) -> None:
    ran = subprocess.run([sys.executable, "-c", REORDERED, first, second, *AGREEMENT], cwd=ROOT,
                         capture_output=True, text=True)
    assert ran.returncode == 0, ran.stdout[-3000:] + ran.stderr[-3000:]
    assert " passed" in ran.stdout and "failed" not in ran.stdout


def test_the_table_refuses_an_order_the_engine_cannot_weigh() -> None:
    table = list(costs.CRITERIA)
    with pytest.raises(ValueError, match="hard"):
        costs.Layout([table[3], *table[:3], *table[4:]])  # score_gap above the hard rules
    with pytest.raises(ValueError, match="distinct"):
        costs.Layout([*table, table[0]])
    with pytest.raises(ValueError, match="distinct"):
        costs.Layout([c for c in table if c.key != "score_gap"])
    with pytest.raises(ValueError, match="flag"):
        costs.Layout([replace(table[0], flag="met")] + table[1:])


def test_board_flags_come_from_the_table() -> None:
    # Each flag the criteria raise is one the desk explains, and each is raised by some criterion's cost.
    raised = {c.flag for c in costs.CRITERIA if c.flag is not None}
    assert raised == {"rematch", "side", "gap", "float", "pref"}
    assert raised <= set(costs.FLAG_MEANINGS)
    state = state_of(random_history(12, 3, 4))
    fld = Field(state, state.next_round_number, state.available(state.next_round_number))
    cost = [0] * costs.LAYOUT.width
    for key in ("pref_strong", "float_repeat", "rank_order"):
        cost[costs.LAYOUT.column(key)] = 1
    p, q = fld.order[:2]
    assert fld.flags(p, q, tuple(cost)) == ("float", "pref")  # in FLAGS order, rank_order raises none


def test_docs_list_the_criteria_in_the_table_order() -> None:
    # docs/engine.md "The order of the rules" is what arbiters read: the same keys, the same order.
    text = (ROOT / "docs" / "engine.md").read_text(encoding="utf-8")
    table = text.split("## The order of the rules", 1)[1].split("\n\n", 2)[1]
    rows = [line for line in table.splitlines() if line.startswith("| S") or line.startswith("| H")]
    keys = [key for row in rows for key in re.findall(r"`([a-z_0-9]+)`", row.split("|")[2])]
    assert tuple(keys) == costs.LAYOUT.keys
