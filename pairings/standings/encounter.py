"""DE, direct encounter, among the players still tied (FIDE Handbook C.07, from memory).

C.07 as remembered: among the tied players, the points each scored in the
games they played against one another rank them, when every pair of them has
met; when some have not, a player still ranks above the others if no result of
the missing games could change that. Players left equal are ranked again by
their games among themselves only, until nothing changes (the "recomputed on
the reduced group" rule). Forfeits are not meetings, so they do not count.
"""

from __future__ import annotations

from typing import Iterable

from pairings.points import ZERO, Points
from pairings.standings.context import Context, SlotKind
from pairings.standings.measures import Values
from pairings.state import PlayerId


def _among(ctx: Context, group: frozenset[PlayerId]) -> tuple[dict[PlayerId, Points], dict[PlayerId, int]]:
    """Each player's points against the group, and how many of the group they never met."""
    scores: dict[PlayerId, Points] = {}
    missing: dict[PlayerId, int] = {}
    for pid in group:
        met = set()
        total = ZERO
        for slot in ctx.slots[pid]:
            if slot.kind is SlotKind.PLAYED and slot.opponent in group:
                met.add(slot.opponent)
                total += slot.points
        scores[pid] = total
        missing[pid] = len(group) - 1 - len(met)
    return scores, missing


def levels(ctx: Context, group: frozenset[PlayerId]) -> list[frozenset[PlayerId]]:
    """The group split into ordered levels, best first; players in one level stay tied."""
    if len(group) < 2:
        return [group]
    scores, missing = _among(ctx, group)
    if not any(missing.values()):
        split = sorted({scores[p] for p in group}, reverse=True)
        if len(split) == 1:
            return [group]
        out: list[frozenset[PlayerId]] = []
        for value in split:
            out += levels(ctx, frozenset(p for p in group if scores[p] == value))
        return out
    win = ctx.scoring.win
    best = {p: scores[p] + win * missing[p] for p in group}   # every missing game won
    # Only the top scorer can stay ahead of all, only the lowest best can stay behind all:
    # compare each with the extreme of the others (linear in the group, not quadratic).
    top = max(group, key=lambda p: scores[p])
    if scores[top] > max(best[q] for q in group if q != top):  # no missing result can catch it
        return [frozenset({top})] + levels(ctx, group - {top})
    bottom = min(group, key=lambda p: best[p])
    if best[bottom] < min(scores[q] for q in group if q != bottom):   # it cannot catch anyone
        return levels(ctx, group - {bottom}) + [frozenset({bottom})]
    return [group]


def direct_encounter(ctx: Context, groups: Iterable[frozenset[PlayerId]]) -> tuple[Values, Values]:
    """DE for every player: the shown value (points against the others tied with them) and the
    sort key (higher ranks first). A player tied with nobody, or in a group DE cannot order
    at all because of missing games, is shown 0."""
    shown: Values = {}
    key: Values = {}
    for group in groups:
        scores, missing = _among(ctx, group)
        ordered = levels(ctx, group)
        applies = len(group) > 1 and (len(ordered) > 1 or not any(missing.values()))
        for n, level in enumerate(ordered):
            for pid in level:
                shown[pid] = scores[pid] if applies else ZERO
                key[pid] = Points(len(ordered) - 1 - n)
    return shown, key
