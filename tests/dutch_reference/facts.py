"""The facts the reference Dutch pairing needs, read from the product's state model only.

Nothing here comes from ``pairings.engine``: pairing numbers, scores, colour
histories, floats, meetings and PAB eligibility are recomputed from the
state's players and round records by the rules as the spec states them
(FIDE Handbook C.04.1 / C.04.2 / C.04.3, edition effective 1 July 2025, with
the 1 February 2026 float rule; much of it from memory, as the spec marks).
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass
from typing import Callable

from pairings.state import Acceleration, ByeKind, EventState, Player, PlayerId, Side

WHITE, BLACK = "W", "B"
NONE, MILD, STRONG, ABSOLUTE = 0, 1, 2, 3
"""Colour-preference strengths (C.04.3 terms, from memory)."""

TITLE_ORDER = ("GM", "IM", "WGM", "FM", "WIM", "CM", "WFM", "WCM")
"""C.04.2 initial order's title ranking (from memory), then untitled."""


@dataclass(frozen=True)
class Entrant:
    """One player to pair, as the reference sees him."""

    id: PlayerId
    pn: int
    """Pairing number: position in the initial order, 1-based."""
    score: float
    """The pairing score: points plus Baku virtual points."""
    colours: tuple[str, ...]
    """Colours of the games played over the board, oldest first (unplayed rounds removed)."""
    met: frozenset[PlayerId]
    pab_ok: bool
    float1: str | None
    """'D' / 'U' / None: the float received in the previous round (2026 rule)."""
    float2: str | None
    """The same, two rounds before."""
    topscorer: bool

    @property
    def cd(self) -> int:
        return self.colours.count(WHITE) - self.colours.count(BLACK)

    @property
    def preference(self) -> tuple[str | None, int]:
        """(colour, strength) by C.04.3's colour preferences (absolute, strong, mild, none; from memory)."""
        if not self.colours:
            return None, NONE
        cd = self.cd
        if cd < -1:
            return WHITE, ABSOLUTE
        if cd > 1:
            return BLACK, ABSOLUTE
        if len(self.colours) >= 2 and self.colours[-1] == self.colours[-2]:
            return (BLACK if self.colours[-1] == WHITE else WHITE), ABSOLUTE
        if cd == -1:
            return WHITE, STRONG
        if cd == 1:
            return BLACK, STRONG
        return (BLACK if self.colours[-1] == WHITE else WHITE), MILD


@dataclass(frozen=True)
class Facts:
    round: int
    entrants: dict[PlayerId, Entrant]
    win: float
    initial_colour: str
    """The colour player 1 gets in round 1 (the event's seeded lot)."""

    def rank(self, pid: PlayerId) -> tuple[float, int]:
        """Art. 1.2 order key: score descending, then pairing number."""
        e = self.entrants[pid]
        return (-e.score, e.pn)

    def compatible(self, a: PlayerId, b: PlayerId) -> bool:
        """C.1 (no rematch) and C.3 (non-topscorers with the same absolute colour preference)."""
        x, y = self.entrants[a], self.entrants[b]
        if b in x.met:
            return False
        (cx, sx), (cy, sy) = x.preference, y.preference
        if sx == ABSOLUTE and sy == ABSOLUTE and cx == cy and not (x.topscorer or y.topscorer):
            return False
        return True


def pairing_numbers(state: EventState) -> dict[PlayerId, int]:
    """C.04.2 initial order (from memory): rating desc, title, name; registration order last."""
    default = state.settings.default_rating

    def key(p: Player) -> tuple[int, int, str, int]:
        title = p.details.title
        t = TITLE_ORDER.index(title) if title in TITLE_ORDER else len(TITLE_ORDER)
        return (-(p.rating if p.rating is not None else default), t, p.name.casefold(), p.order)

    ordered = sorted(state.players.values(), key=key)
    return {p.id: i for i, p in enumerate(ordered, 1)}


def initial_colour(state: EventState) -> str:
    """The round-1 lot: the event's seed decides player 1's colour (the product's documented lot)."""
    return WHITE if random.Random(state.settings.seed).random() < 0.5 else BLACK


def virtual_points(state: EventState, pns: dict[PlayerId, int]) -> Callable[[PlayerId, int], float]:
    """C.04.5.1 Baku acceleration (pre-2025 text, as the spec reads it): group A = the top
    2 * ceil(N / 4) of the field before round 1 by pairing number (a late entrant joins A when ranked
    at or above A's last player); A carries 1 point in rounds 1..ceil(ceil(R/2)/2), 1/2 up to
    round ceil(R/2), nothing later."""
    s = state.settings
    if s.acceleration is not Acceleration.BAKU:
        return lambda pid, rnd: 0.0
    start = sorted((p for p in state.players.values() if p.entry_round == 1), key=lambda p: pns[p.id])
    size = 2 * math.ceil(len(start) / 4)
    boundary = pns[start[size - 1].id] if size else 0
    accelerated = math.ceil(s.rounds / 2)
    full = math.ceil(accelerated / 2)

    def vp(pid: PlayerId, rnd: int) -> float:
        if pns[pid] > boundary or rnd > accelerated:
            return 0.0
        return 1.0 if rnd <= full else 0.5

    return vp


def _float_in(state: EventState, pid: PlayerId, rnd: int,
              vp: Callable[[PlayerId, int], float]) -> str | None:
    """The float received in round ``rnd``: a PAB, or a pairing against a different score (2026 rule)."""
    if rnd < 1:
        return None
    record = state.records[pid]
    entry = record.entry(rnd)
    if entry is None:
        return None
    if entry.bye is ByeKind.PAIRING:
        return "D"
    if entry.opponent is None:
        return None
    mine = record.score_before(rnd) + vp(pid, rnd)
    theirs = state.records[entry.opponent].score_before(rnd) + vp(entry.opponent, rnd)
    if mine > theirs:
        return "D"
    if mine < theirs:
        return "U"
    return None


def read_facts(state: EventState, players: tuple[PlayerId, ...] | None = None) -> Facts:
    """The facts of round ``state.next_round_number`` for the players available in it."""
    rnd = state.next_round_number
    s = state.settings
    win = s.scoring.win
    pns = pairing_numbers(state)
    vp = virtual_points(state, pns)
    final = rnd == s.rounds
    to_pair = players if players is not None else state.available(rnd)
    entrants: dict[PlayerId, Entrant] = {}
    for pid in to_pair:
        record = state.records[pid]
        entries = [e for e in record.entries if e.round < rnd]
        colours = tuple(WHITE if e.side is Side.FIRST else BLACK for e in entries if e.played and e.side)
        met = {e.opponent for e in entries
               if e.opponent is not None and (e.played or s.forfeit_is_meeting)}
        met |= {f.b if f.a == pid else f.a for f in state.forbidden
                if pid in (f.a, f.b) and f.applies(rnd)}
        pab_ok = not any(e.bye is ByeKind.PAIRING for e in entries) and not any(
            not e.played and (e.points or 0.0) >= win for e in entries)
        score = record.score_before(rnd) + vp(pid, rnd)  # the pairing score
        entrants[pid] = Entrant(
            id=pid, pn=pns[pid], score=score, colours=colours, met=frozenset(met), pab_ok=pab_ok,
            float1=_float_in(state, pid, rnd - 1, vp), float2=_float_in(state, pid, rnd - 2, vp),
            topscorer=final and score > 0.5 * (rnd - 1) * win,
        )
    return Facts(rnd, entrants, win, initial_colour(state))
