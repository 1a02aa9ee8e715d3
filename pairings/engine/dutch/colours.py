"""Colour allocation of the FIDE (Dutch) System (C.04.3, 2017 mechanics kept in 2025; from memory).

For each pair the first rule that decides:

1. grant both colour preferences;
2. grant the stronger preference (absolute > strong > mild); if both are
   absolute (only topscorers can meet so), the one with the larger colour
   difference |CD| gets it;
3. go back through both colour histories (unplayed rounds removed, aligned on
   the latest played game) to the latest game where the two had different
   colours: each now gets the colour opposite to the one he had then;
4. grant the preference of the higher-ranked player (Art. 1.2 order);
5. the higher-ranked player gets the initial colour if his pairing number is
   odd, the other colour if it is even.

The initial colour is drawn by lot before round 1 (the event's seed; the same
lot as the whole-round system's round 1).
"""

from __future__ import annotations

import random
from dataclasses import dataclass

from pairings.engine.criteria import ABSOLUTE, NONE
from pairings.engine.dutch.entrants import Entrants
from pairings.state import PlayerId, Side


def initial_colour(ent: Entrants) -> Side:
    """The lot's initial colour for pairing number 1 (seeded, recorded in the log)."""
    return Side.FIRST if random.Random(ent.state.settings.seed).random() < 0.5 else Side.SECOND


@dataclass(frozen=True, slots=True)
class Colours:
    first: PlayerId
    second: PlayerId
    rule: int
    """The allocation rule (1-5 above) that decided; 0 in an event without sides."""


def allocate(ent: Entrants, p: PlayerId, q: PlayerId) -> Colours:
    """Who plays first (White) on a board of ``p`` and ``q``, and by which rule."""
    hi, lo = (p, q) if ent.rank[p] < ent.rank[q] else (q, p)
    if not ent.colours:
        return Colours(hi, lo, 0)
    a, b = ent.pref[hi], ent.pref[lo]
    if a.side is not None and b.side is not None and a.side is not b.side or \
            (a.side is None) != (b.side is None):
        side_hi = a.side if a.side is not None else (b.side.other if b.side is not None else Side.FIRST)
        return _give(hi, lo, side_hi, 1)
    if a.side is not None and b.side is not None:
        if a.strength != b.strength:
            winner = hi if a.strength > b.strength else lo
            return _give(hi, lo, a.side if winner == hi else a.side.other, 2)
        if a.strength == ABSOLUTE and abs(a.sd) != abs(b.sd):
            winner = hi if abs(a.sd) > abs(b.sd) else lo
            return _give(hi, lo, a.side if winner == hi else a.side.other, 2)
        sh, sl = ent.sides[hi], ent.sides[lo]
        for x, y in zip(reversed(sh), reversed(sl)):
            if x is not y:
                return _give(hi, lo, x.other, 3)
        return _give(hi, lo, a.side, 4)
    assert a.strength == NONE and b.strength == NONE
    first = initial_colour(ent)
    return _give(hi, lo, first if ent.tpn[hi] % 2 else first.other, 5)


def _give(hi: PlayerId, lo: PlayerId, side_hi: Side, rule: int) -> Colours:
    return Colours(hi, lo, rule) if side_hi is Side.FIRST else Colours(lo, hi, rule)


def missed(ent: Entrants, c: Colours) -> tuple[PlayerId, ...]:
    """Players of the board who do not get their colour preference (any strength)."""
    out = []
    for pid, side in ((c.first, Side.FIRST), (c.second, Side.SECOND)):
        pref = ent.pref[pid]
        if ent.colours and pref.side is not None and pref.side is not side:
            out.append(pid)
    return tuple(out)


def breaks(ent: Entrants, c: Colours) -> tuple[tuple[PlayerId, ...], tuple[PlayerId, ...]]:
    """Players ending with |CD| > 2, and players getting one colour three times running."""
    wide, third = [], []
    for pid, side in ((c.first, Side.FIRST), (c.second, Side.SECOND)):
        if not ent.colours:
            continue
        sides = ent.sides[pid]
        cd = ent.pref[pid].sd + (1 if side is Side.FIRST else -1)
        if abs(cd) > 2:
            wide.append(pid)
        if len(sides) >= 2 and sides[-1] is side and sides[-2] is side:
            third.append(pid)
    return tuple(wide), tuple(third)
