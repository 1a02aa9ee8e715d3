"""The pairing rules (docs/engine.md) as costs of one pair (or of the pairing bye).

A :class:`Field` holds everything the rules need about the players to pair in
one round: scores in integer scoring units, score groups, ranks, side
preferences and float history. :meth:`Field.pair` returns the pair's sides
(allocated per docs/engine.md "Sides and boards") and its cost tuple in
:data:`pairings.costs.LAYOUT` order (each value placed by its criterion's name);
:meth:`Field.bye` the cost of giving one player the pairing bye. Hard rule H4
(availability) is the choice of the field; H5 (do-not-pair) is :meth:`Field.forbidden`, never relaxed.

References
----------
FIDE Handbook C.04.1 "Basic rules for Swiss systems" (b, c, d, f, g), restated
in docs/engine.md (H1-H5, S1-S6).
"""

from __future__ import annotations

import random
from collections import Counter
from dataclasses import dataclass
from fractions import Fraction
from math import gcd, lcm
from typing import Iterable

from pairings.costs import LAYOUT
from pairings.engine.acceleration import virtual_points
from pairings.state import EventState, Float, PlayerId, Side

ABSOLUTE, STRONG, MILD, NONE = 3, 2, 1, 0
Cost = tuple[int, ...]
"""A cost tuple in :data:`pairings.costs.LAYOUT` order."""
REMATCH, SIDE_RULE, REPEAT_BYE, GAP, BYE_RANK, RANK_ORDER = (
    LAYOUT.column(k) for k in ("rematch", "side_rule", "repeat_bye", "score_gap", "bye_rank", "rank_order"))
PREF_ABSOLUTE, PREF_STRONG, PREF_MILD, FLOAT_REPEAT, FLOAT_REPEAT_2 = (
    LAYOUT.column(k) for k in ("pref_absolute", "pref_strong", "pref_mild", "float_repeat", "float_repeat_2"))


def score_unit(state: EventState) -> Fraction:
    """Largest step dividing every possible score (game points and bye points)."""
    s = state.settings
    values = [Fraction(v).limit_denominator(1000) for v in
              (s.scoring.win, s.scoring.draw, s.scoring.loss, s.bye_points, s.requested_bye_points)]
    values = [abs(v) for v in values if v]
    if not values:
        return Fraction(1)
    den = lcm(*(v.denominator for v in values))
    return Fraction(gcd(*(int(v * den) for v in values)), den)


@dataclass(frozen=True, slots=True)
class Preference:
    """A player's side wish before the round (docs/engine.md S4) and what H3 forbids."""

    side: Side | None
    strength: int
    sd: int
    breaks: frozenset[Side]
    """Sides that would break H3 for this player this round."""


def preference(sides: tuple[Side, ...]) -> Preference:
    """Side preference from the played sides, oldest first (docs/engine.md S4, H3).

    absolute: SD <= -2 or the last two on the second side (wants first), or the
    mirror case; strong: SD = +-1; mild: SD = 0 after at least one game.
    """
    sd = sides.count(Side.FIRST) - sides.count(Side.SECOND)
    breaks = set()
    for s in (Side.FIRST, Side.SECOND):
        new_sd = sd + (1 if s is Side.FIRST else -1)
        if abs(new_sd) > 2 or (len(sides) >= 2 and sides[-1] is s and sides[-2] is s):
            breaks.add(s)
    if sd <= -2:
        return Preference(Side.FIRST, ABSOLUTE, sd, frozenset(breaks))
    if sd >= 2:
        return Preference(Side.SECOND, ABSOLUTE, sd, frozenset(breaks))
    if len(sides) >= 2 and sides[-1] is sides[-2]:
        return Preference(sides[-1].other, ABSOLUTE, sd, frozenset(breaks))
    if sd != 0:
        return Preference(Side.SECOND if sd > 0 else Side.FIRST, STRONG, sd, frozenset(breaks))
    if sides:
        return Preference(sides[-1].other, MILD, sd, frozenset(breaks))
    return Preference(None, NONE, sd, frozenset(breaks))


class Field:
    """The players to pair in one round and the rules' view of each of them.

    Parameters
    ----------
    state
        The event state; records hold only published and complete rounds.
    round_number
        The round being paired.
    players
        The players to pair (H4 already applied), any order.
    extra_forbidden
        Do-not-pair pairs for this draft only, besides ``state.forbidden``.
    """

    def __init__(self, state: EventState, round_number: int, players: Iterable[PlayerId],
                 extra_forbidden: Iterable[tuple[PlayerId, PlayerId]] = ()) -> None:
        s = state.settings
        self.state = state
        self.round = round_number
        self.unit = score_unit(state)
        initial = {pid: i for i, pid in enumerate(state.initial_rank())}
        recs = state.records
        in_units: dict[float, int] = {}  # few distinct scores; Fraction arithmetic is slow per player

        def units(score: float) -> int:
            if score not in in_units:
                in_units[score] = int(round(Fraction(score).limit_denominator(1000) / self.unit))
            return in_units[score]

        # Pairing score: the real score plus any virtual points of an accelerated round (C.04.5.1).
        self.virtual = virtual_points(state, round_number, state.initial_rank())
        self.units: dict[PlayerId, int] = {
            pid: units(recs[pid].score_before(round_number) + float(self.virtual.get(pid, 0))) for pid in players
        }
        # Rank during the event: score descending, then initial rank (docs/engine.md).
        self.order: tuple[PlayerId, ...] = tuple(sorted(self.units, key=lambda p: (-self.units[p], initial[p])))
        self.index = {pid: i for i, pid in enumerate(self.order)}
        self.group_rank: dict[PlayerId, int] = {}
        self.group_size: dict[int, int] = Counter(self.units.values())
        seen: Counter[int] = Counter()
        for pid in self.order:
            self.group_rank[pid] = seen[self.units[pid]]
            seen[self.units[pid]] += 1
        self.min_units = min(self.units.values(), default=0)
        self.sides = s.sides is not None
        self.pref = {pid: preference(recs[pid].played_sides) for pid in self.order}
        max_score = Fraction(s.scoring.win).limit_denominator(1000) * (round_number - 1) / self.unit
        self.exempt = frozenset(
            pid for pid in self.order
            if s.final_round_side_exception and round_number == s.rounds and 2 * self.units[pid] > max_score
        )
        # H1 counts pairings that ended in a forfeit as meetings when the event says so (docs/engine.md H1).
        self.meetings = {pid: Counter(recs[pid].met(s.forfeit_is_meeting)) for pid in self.order}
        self.max_meetings = s.max_meetings
        self.prev_float = {pid: self._float(pid, round_number - 1) for pid in self.order}
        self.prev_float_2 = {pid: self._float(pid, round_number - 2) for pid in self.order}
        self.unplayed_point = {pid: recs[pid].had_unplayed_point for pid in self.order}
        self.sides_by_round = {
            pid: {e.round: e.side for e in recs[pid].entries if e.played and e.side is not None}
            for pid in self.order
        }
        self._forbidden: set[frozenset[PlayerId]] = {
            frozenset((f.a, f.b)) for f in state.forbidden if f.applies(round_number)
        }
        self._forbidden.update(frozenset(p) for p in extra_forbidden)
        self.lot: Side = Side.FIRST if random.Random(s.seed).random() < 0.5 else Side.SECOND

    def _float(self, pid: PlayerId, rnd: int) -> Float | None:
        entry = self.state.records[pid].entry(rnd) if rnd >= 1 else None
        return entry.float if entry is not None else None

    def __len__(self) -> int:
        return len(self.order)

    def forced(self, p: PlayerId) -> bool:
        """H3 breaks for ``p`` whichever side they get (e.g. SD already beyond 2): unavoidable on any board."""
        return self.sides and len(self.pref[p].breaks) == 2 and p not in self.exempt

    def forbidden(self, p: PlayerId, q: PlayerId) -> bool:
        """H5: the pair is on the do-not-pair list for this round (never relaxed)."""
        return frozenset((p, q)) in self._forbidden

    def allocate(self, p: PlayerId, q: PlayerId) -> tuple[PlayerId, PlayerId] | None:
        """Sides inside a pair per docs/engine.md; None when neither has any preference.

        Order: first the sides that break H3 for fewer of the two (a player
        who breaks it whatever side he gets must not make his opponent break it
        too); then compatible wishes are both granted; else the stronger
        preference wins; equal: larger |SD|; then alternate from the most recent
        round in which the two played different sides; then the higher-ranked
        player.
        """
        if not self.sides:
            return (p, q) if self.index[p] < self.index[q] else (q, p)
        a, b = self.pref[p], self.pref[q]
        if a.side is None and b.side is None:
            return None
        p_first, q_first = self.side_costs(p, q)[0], self.side_costs(q, p)[0]
        if p_first != q_first:
            return (p, q) if p_first < q_first else (q, p)
        if a.side is not None and a.side != b.side:
            return (p, q) if a.side is Side.FIRST else (q, p)
        if b.side is not None and a.side is None:
            return (q, p) if b.side is Side.FIRST else (p, q)
        # Both want the same side: decide who gets it.
        want = a.side
        winner: PlayerId | None = None
        if a.strength != b.strength:
            winner = p if a.strength > b.strength else q
        elif abs(a.sd) != abs(b.sd):
            winner = p if abs(a.sd) > abs(b.sd) else q
        else:
            sp, sq = self.sides_by_round[p], self.sides_by_round[q]
            for rnd in sorted(set(sp) & set(sq), reverse=True):
                if sp[rnd] != sq[rnd]:
                    # Alternate: whoever had the wanted side then gives it up now.
                    winner = q if sp[rnd] is want else p
                    break
        if winner is None:
            winner = p if self.index[p] < self.index[q] else q
        loser = q if winner == p else p
        return (winner, loser) if want is Side.FIRST else (loser, winner)

    def side_costs(self, first: PlayerId, second: PlayerId) -> tuple[int, int, int, int]:
        """(side_rule, pref_absolute, pref_strong, pref_mild) for a pair with sides given."""
        if not self.sides:
            return (0, 0, 0, 0)
        rule, missed = 0, [0, 0, 0, 0]
        for pid, side in ((first, Side.FIRST), (second, Side.SECOND)):
            pref = self.pref[pid]
            if side in pref.breaks and pid not in self.exempt:
                rule += 1
            if pref.side is not None and pref.side is not side:
                missed[pref.strength] += 1
        return (rule, missed[ABSOLUTE], missed[STRONG], missed[MILD])

    def pair(self, p: PlayerId, q: PlayerId, sides: tuple[PlayerId, PlayerId] | None = None
             ) -> tuple[tuple[PlayerId, PlayerId] | None, Cost]:
        """Sides and cost of pairing ``p`` with ``q`` (``sides`` fixes them, for pins)."""
        alloc = sides if sides is not None else self.allocate(p, q)
        hi, lo = (p, q) if self.index[p] < self.index[q] else (q, p)
        rematch = 1 if self.meetings[p][q] >= self.max_meetings else 0
        side_rule, absolute, strong, mild = self.side_costs(*alloc) if alloc is not None else (0, 0, 0, 0)
        gap = self.units[hi] - self.units[lo]
        f1 = f2 = 0
        if gap:
            f1 = (self.prev_float[hi] is Float.DOWN) + (self.prev_float[lo] is Float.UP)
            f2 = (self.prev_float_2[hi] is Float.DOWN) + (self.prev_float_2[lo] is Float.UP)
            # Down-floater meets the top of the group below; the lowest-ranked floats down
            # (the latter is common practice, no source).
            rank = self.group_rank[lo] + (self.group_size[self.units[hi]] - 1 - self.group_rank[hi])
        else:
            half = self.group_size[self.units[hi]] // 2
            rank = abs(self.group_rank[lo] - self.group_rank[hi] - half)
        cost = [0] * LAYOUT.width
        cost[REMATCH], cost[SIDE_RULE], cost[GAP] = rematch, side_rule, gap
        cost[PREF_ABSOLUTE], cost[PREF_STRONG], cost[PREF_MILD] = absolute, strong, mild
        cost[FLOAT_REPEAT], cost[FLOAT_REPEAT_2], cost[RANK_ORDER] = f1, f2, rank
        return alloc, tuple(cost)

    def bye(self, p: PlayerId) -> Cost:
        """Cost of the pairing bye for ``p``: a pair against a virtual lowest-score player (S2)."""
        repeat = 1 if self.unplayed_point[p] else 0
        f1 = 1 if self.prev_float[p] is Float.DOWN else 0
        f2 = 1 if self.prev_float_2[p] is Float.DOWN else 0
        cost = [0] * LAYOUT.width
        cost[REPEAT_BYE], cost[GAP] = repeat, self.units[p] - self.min_units
        cost[BYE_RANK] = len(self.order) - 1 - self.index[p]  # players ranked below
        cost[FLOAT_REPEAT], cost[FLOAT_REPEAT_2] = f1, f2
        return tuple(cost)

    def flags(self, p: PlayerId, q: PlayerId, cost: Cost) -> tuple[str, ...]:
        """Board flags (:data:`pairings.costs.FLAGS`, in their order): each raised by its criteria's costs."""
        out = []
        for word, columns in LAYOUT.flags:
            if any(cost[k] for k in columns):
                out.append(f"gap {_points(cost[GAP] * self.unit)}" if GAP in columns else word)
        return tuple(out)


def _points(value: Fraction) -> str:
    return str(int(value)) if value.denominator == 1 else str(float(value))
