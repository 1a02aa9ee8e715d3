"""The pairing engine: optimal, explainable Swiss pairings by maximum-weight matching.

Pure: no I/O, no UI, no SQLite. Criteria and weights are explained for
arbiters in ``docs/engine.md``; the rules (H1-H5, S1-S6) are stated there too.
"""

from pairings.engine.draft import draft_round, rebuild, swap
from pairings.engine.explain import CostDelta, Explanation, compare, explain
from pairings.engine.types import CRITERIA, ENGINE_VERSION, Draft, DraftBoard, Overrides
from pairings.engine.roundcheck import RoundCheck
from pairings.engine.verify import verify_round

__all__ = [
    "CRITERIA", "ENGINE_VERSION", "CostDelta", "Draft", "DraftBoard", "Explanation", "Overrides",
    "RoundCheck", "compare", "draft_round", "explain", "rebuild", "swap", "verify_round",
]
