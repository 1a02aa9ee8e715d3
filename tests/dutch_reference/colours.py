"""Colour allocation of one pair: the first of the five rules that decides (C.04.3 E, from memory)."""

from __future__ import annotations

from pairings.state import PlayerId
from tests.dutch_reference.facts import ABSOLUTE, BLACK, WHITE, Facts


def _other(colour: str) -> str:
    return BLACK if colour == WHITE else WHITE


def allocate(facts: Facts, a: PlayerId, b: PlayerId) -> tuple[PlayerId, PlayerId]:
    """(white, black) for the pair a-b."""
    x, y = facts.entrants[a], facts.entrants[b]
    (cx, sx), (cy, sy) = x.preference, y.preference

    def giving(player: PlayerId, colour: str) -> tuple[PlayerId, PlayerId]:
        other = b if player == a else a
        return (player, other) if colour == WHITE else (other, player)

    hi = a if facts.rank(a) < facts.rank(b) else b
    if cx is None and cy is None:  # rule 5
        e = facts.entrants[hi]
        colour = facts.initial_colour if e.pn % 2 == 1 else _other(facts.initial_colour)
        return giving(hi, colour)
    if cx is None or cy is None or cx != cy:  # rule 1: both preferences granted
        return giving(a, cx) if cx is not None else giving(b, cy)  # type: ignore[arg-type]
    if sx != sy:  # rule 2: the stronger preference
        return giving(a, cx) if sx > sy else giving(b, cy)
    if sx == ABSOLUTE and abs(x.cd) != abs(y.cd):
        return giving(a, cx) if abs(x.cd) > abs(y.cd) else giving(b, cy)
    for i in range(1, min(len(x.colours), len(y.colours)) + 1):  # rule 3: latest round they differed
        if x.colours[-i] != y.colours[-i]:
            return giving(a, _other(x.colours[-i]))
    return giving(hi, cx)  # rule 4: the higher-ranked player's preference
