"""The Why panel's second half: the engine's explanation of one board of the open draft."""

from __future__ import annotations

import re

from pairings import actions
from pairings.state import EventState

_TOKEN = re.compile(r"[^\s():,]+")


def named(state: EventState, text: str) -> str:
    """``text`` with every player id in it replaced by the player's name."""
    return _TOKEN.sub(lambda m: state.players[m.group()].name if m.group() in state.players else m.group(), text)  # type: ignore[index]


def why_lines(state: EventState, board: int) -> list[str]:
    """Why the engine made ``board`` of the open draft and its cheapest alternative (engine.explain)."""
    from pairings import engine

    x = engine.explain(state, actions.draft_of(state), board)
    lines = [named(state, r) for r in x.reasons if not r.startswith("flag: ")]
    if x.alternative is None or x.delta is None:
        pinned = "pinned" in next((b.flags for b in actions.draft_of(state).boards if b.board == board), ())
        lines.append("pinned: no alternative is worked out" if pinned
                     else "no other pairing of this round leaves this board out")
        return lines
    first = state.players[x.first].name
    second = state.players[x.second].name
    a = state.players[x.first_instead].name if x.first_instead else "the bye"
    b = state.players[x.second_instead].name if x.second_instead else "the bye"
    lines += ["", "Cheapest alternative without this board:", f"{first} meets {a},", f"{second} meets {b}:",
              f"  {x.delta.describe()}"]
    return lines
