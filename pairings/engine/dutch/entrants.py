"""The players of one Dutch round as the FIDE (Dutch) System sees them.

:class:`Entrants` holds, for the players to pair in one round: pairing numbers
(C.04.2 initial order), pairing scores (real points plus any Baku virtual
points, C.04.5.1), the ranking order of C.04.3 Art. 1.2, colour preferences,
float history, pairing-allocated-bye eligibility and who has met whom.

Editions (see docs/engine.md, "The FIDE (Dutch) System"):

- Initial order / pairing numbers (C.04.2, from memory): rating descending
  (unrated players take the event's default rating), then FIDE title
  (GM, IM, WGM, FM, WIM, CM, WFM, WCM, none), then name; registration order
  breaks any remaining tie (our decision).
- Order (C.04.3 2025 Art. 1.2, read; 2026 the same with TPN): pairing score
  descending, then pairing number ascending.
- PAB eligibility (C.04.1 2025 rule 4, read): no earlier PAB and never
  credited, without playing, with as many points as a win.
- Floats (C.04.3 2026 edition as briefed): paired against a different pairing
  score makes the higher player downfloat and the lower upfloat (played or
  forfeited); a PAB always gives a downfloat; nothing else creates a float
  (our reading of "only the listed cases create floats").
- Colour preferences (2017 A.6 mechanics, from memory): absolute, strong,
  mild, none as in :func:`pairings.engine.criteria.preference`.
- Topscorers (from memory): in the final round, players with more than half
  the maximum possible score.
- Meetings: no two players meet twice (C.04.1 rule 2); a forfeited pairing
  counts as a meeting when the event's ``forfeit_is_meeting`` says so. The
  event's do-not-pair list is kept as an absolute rule too (ours).
"""

from __future__ import annotations

from fractions import Fraction
from math import gcd, lcm
from typing import Iterable, Mapping

from pairings.engine.acceleration import virtual_points
from pairings.engine.criteria import ABSOLUTE, Preference, preference, score_unit
from pairings.state import ByeKind, EventState, Float, PlayerId, Side, initial_order

def pairing_numbers(state: EventState) -> tuple[PlayerId, ...]:
    """Every registered player in initial order (rating, title, name: :meth:`EventState.initial_rank` of a
    Dutch event): pairing number ``k`` is position ``k - 1``."""
    return initial_order(state.players.values(), state.settings.default_rating, by_title=True)


def _unit(state: EventState, extra: Iterable[Fraction]) -> Fraction:
    values = [score_unit(state), *(v for v in extra if v)]
    den = lcm(*(v.denominator for v in values))
    return Fraction(gcd(*(int(v * den) for v in values)), den)


class Entrants:
    """The players to pair in round ``round_number`` and every fact the Dutch criteria use.

    Scores are integers in units of :attr:`unit` (the largest step dividing
    every score and virtual point).
    """

    def __init__(self, state: EventState, round_number: int, players: Iterable[PlayerId],
                 extra_forbidden: Iterable[tuple[PlayerId, PlayerId]] = (),
                 no_bye: Iterable[PlayerId] = ()) -> None:
        s = state.settings
        self.state = state
        self.round = round_number
        self.numbers = pairing_numbers(state)
        self.tpn: dict[PlayerId, int] = {p: i + 1 for i, p in enumerate(self.numbers)}
        self.virtual: Mapping[PlayerId, Fraction] = virtual_points(state, round_number, self.numbers)
        self._vp: dict[int, Mapping[PlayerId, Fraction]] = {round_number: self.virtual}
        self.unit = _unit(state, [Fraction(1, 2)] if self.virtual else [])
        self.win = int(Fraction(s.scoring.win).limit_denominator(1000) / self.unit)
        recs = state.records
        self.score: dict[PlayerId, int] = {
            p: self._units(recs[p].score_before(round_number)) + int(self.virtual.get(p, 0) / self.unit)
            for p in players
        }
        self.order: tuple[PlayerId, ...] = tuple(sorted(self.score, key=lambda p: (-self.score[p], self.tpn[p])))
        self.rank = {p: i for i, p in enumerate(self.order)}
        self.colours = s.sides is not None
        self.sides: dict[PlayerId, tuple[Side, ...]] = {p: recs[p].played_sides for p in self.order}
        self.pref: dict[PlayerId, Preference] = {p: preference(self.sides[p]) for p in self.order}
        final = round_number == s.rounds and round_number > 1
        best = Fraction(s.scoring.win).limit_denominator(1000) * (round_number - 1)
        self.topscorers = frozenset(
            p for p in self.order
            if final and 2 * Fraction(recs[p].score_before(round_number)).limit_denominator(1000) > best
        )
        self.met: dict[PlayerId, frozenset[PlayerId]] = {
            p: frozenset(e.opponent for e in recs[p].entries if e.opponent is not None
                         and (e.played or s.forfeit_is_meeting))
            for p in self.order
        }
        self.forbidden = {frozenset((f.a, f.b)) for f in state.forbidden if f.applies(round_number)}
        self.forbidden.update(frozenset(x) for x in extra_forbidden)
        refused = set(no_bye)
        self.pab_eligible = frozenset(p for p in self.order if p not in refused and self._may_get_bye(p))
        self.must: dict[PlayerId, Side | None] = {p: self.absolute(p) for p in self.order}
        self._before: dict[tuple[PlayerId, int], Fraction] = {}
        self.floats: dict[PlayerId, tuple[Float | None, Float | None]] = {
            p: (self.float_in(p, round_number - 1), self.float_in(p, round_number - 2)) for p in self.order
        }

    def _units(self, score: Fraction) -> int:
        return int(round(Fraction(score).limit_denominator(1000) / self.unit))

    def _may_get_bye(self, p: PlayerId) -> bool:
        """C.04.1 (2025) rule 4: no PAB before, never a win's points without playing."""
        win = self.state.settings.scoring.win
        for e in self.state.records[p].entries:
            if e.bye is ByeKind.PAIRING:
                return False
            if not e.played and e.points is not None and e.points > 0 and e.points >= win:
                return False
        return True

    def float_in(self, p: PlayerId, rnd: int) -> Float | None:
        """The float ``p`` got in round ``rnd`` (2026 edition: pairing-score floats and the PAB)."""
        if rnd < 1:
            return None
        rec = self.state.records[p]
        e = rec.entry(rnd)
        if e is None:
            return None
        if e.bye is ByeKind.PAIRING:
            return Float.DOWN
        if e.opponent is None or e.opponent not in self.state.records:
            return None
        if rnd not in self._vp:
            self._vp[rnd] = virtual_points(self.state, rnd, self.numbers)
        vp = self._vp[rnd]
        mine = self._score_before(p, rnd) + vp.get(p, 0)
        theirs = self._score_before(e.opponent, rnd) + vp.get(e.opponent, 0)
        return Float.DOWN if mine > theirs else Float.UP if mine < theirs else None

    def _score_before(self, p: PlayerId, rnd: int) -> Fraction:
        """``p``'s exact score before round ``rnd`` (each opponent's is asked for again: kept)."""
        key = (p, rnd)
        if key not in self._before:
            self._before[key] = self.state.records[p].score_before(rnd)
        return self._before[key]

    def absolute(self, p: PlayerId) -> Side | None:
        """The side ``p`` must have (absolute preference), or None."""
        pref = self.pref[p]
        return pref.side if self.colours and pref.strength == ABSOLUTE else None

    def compatible(self, p: PlayerId, q: PlayerId) -> bool:
        """C.1 (no rematch, no do-not-pair entry) and C.3 (two non-topscorers with one absolute colour)."""
        if q in self.met[p] or (self.forbidden and frozenset((p, q)) in self.forbidden):
            return False
        side = self.must[p]
        if side is not None and side is self.must[q]:
            return p in self.topscorers or q in self.topscorers
        return True

    def points(self, units: int) -> str:
        """A score in units as points for a message (``2``, ``1.5``)."""
        value = units * self.unit
        return str(int(value)) if value.denominator == 1 else str(float(value))

    def groups(self) -> list[list[PlayerId]]:
        """Score groups (C.04.3 Art. 1.3.1), highest first, each in order (Art. 1.2)."""
        out: list[list[PlayerId]] = []
        for p in self.order:
            if out and self.score[out[-1][0]] == self.score[p]:
                out[-1].append(p)
            else:
                out.append([p])
        return out

