"""The pairing engine: optimal, explainable Swiss pairings by maximum-weight matching.

Pure: no I/O, no UI, no SQLite. Criteria and weights are explained for
arbiters in ``docs/engine.md``; the rules are ``shared/rules.md``.
"""

from pairings.engine.draft import draft_round, rebuild, swap
from pairings.engine.types import CRITERIA, ENGINE_VERSION, Draft, DraftBoard, Overrides

__all__ = [
    "CRITERIA", "ENGINE_VERSION", "Draft", "DraftBoard", "Overrides",
    "draft_round", "rebuild", "swap",
]
