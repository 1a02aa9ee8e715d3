"""Rating changes under the FIDE Rating Regulations (B.02, as remembered): expected score, K, change.

Every value here is from memory (the Handbook text in force was not at hand; the
article numbers follow the current numbering as remembered: tables 8.1(a)/(b),
rating change 8.3):

* each game played over the board against a rated opponent counts; forfeits,
  byes and games against unrated opponents do not;
* D = own rating − opponent's rating, cut to ±400 (the 400-point rule); from the
  amendment in force since 1 October 2025 (known from press reports only, low
  confidence) a player rated :data:`CAP_EXEMPT_FROM` or more uses the real
  difference;
* the expected score PD comes from table 8.1(b) as a lookup table (the one in
  :mod:`pairings.standings.ratings`), the change is K × (score − PD) per game,
  summed, and the new rating is rounded to the nearest whole number (half up, an
  unconfirmed convention);
* K: 40 until the end of the year of the 18th birthday while below 2300; 10 once
  rated 2400 or more; else 20; K × games never above 700. The desk does not know
  how many rated games a player has had (K 40 for the first 30 games) nor
  whether a published rating was ever 2400 or more: it takes the rating held;
* the performance rating is Ra + dp with table 8.1(a) (also the one in
  :mod:`pairings.standings.ratings`), over the same rated games;
* an unrated player's first rating from this event (at least five rated games, a
  point at least) counts two hypothetical 1800-rated opponents drawn with (the rule
  of 1 March 2024 as remembered, low confidence).
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import Decimal

from pairings.points import Points
from pairings.standings.ratings import dp_from_fraction, expected_hundredths, round_half_up
from pairings.state import EventState, Player, PlayerId, RoundState

CAP = 400
"""The 400-point rule (B.02 8.3, from memory)."""
CAP_EXEMPT_FROM = 2650
"""From 1 October 2025 (press reports, low confidence): players rated this much or more use the real difference."""
K_CAP = 700
FIRST_RATING_GAMES = 5
"""Games against rated opponents a first rating needs (from memory)."""
HYPOTHETICAL = 1800
"""The rating of the two hypothetical opponents of a first rating (from memory, low confidence)."""
SCORE = {"win": Decimal(1), "draw": Decimal("0.5"), "loss": Decimal(0)}
"""A rated game's score whatever the event's own points (1, ½, 0)."""


def fide_rating(player: Player) -> int | None:
    """The rating the rating body knows: the player's ``fide`` list rating, else the event's rating (0 = none)."""
    listed = dict(player.details.ratings).get("fide")
    rating = listed if listed is not None else player.rating
    return rating or None


def used_difference(own: int, opponent: int) -> int:
    """D after the 400-point rule (kept whole for a player rated :data:`CAP_EXEMPT_FROM` or more)."""
    d = own - opponent
    if own >= CAP_EXEMPT_FROM:
        return d
    return max(-CAP, min(CAP, d))


def k_factor(rating: int, birth_year: int | None, event_year: int | None, games: int) -> int:
    """K for a rated player (B.02, from memory; see the module's note on what the desk cannot know)."""
    if rating >= 2400:
        k = 10
    elif birth_year is not None and event_year is not None and event_year - birth_year <= 18 and rating < 2300:
        k = 40
    else:
        k = 20
    if games and k * games > K_CAP:
        k = K_CAP // games
    return k


@dataclass(frozen=True, slots=True)
class RatedGame:
    round: int
    opponent: PlayerId
    opponent_rating: int
    difference: int
    """D as used (after the 400-point rule)."""
    expected: Decimal
    """PD from table 8.1(b)."""
    score: Decimal
    change: Decimal
    """K × (score − PD)."""


@dataclass(frozen=True, slots=True)
class RatingChange:
    player: PlayerId
    rating: int | None
    """None for an unrated player: no change, only the games toward a first rating."""
    k: int | None
    games: tuple[RatedGame, ...]
    unrated_opponents: int
    """Games played over the board against unrated opponents (not rated)."""

    @property
    def scored(self) -> Decimal:
        return sum((g.score for g in self.games), Decimal(0))

    @property
    def expected(self) -> Decimal:
        return sum((g.expected for g in self.games), Decimal(0))

    @property
    def change(self) -> Decimal | None:
        return sum((g.change for g in self.games), Decimal(0)) if self.rating is not None else None

    @property
    def new_rating(self) -> int | None:
        change = self.change
        return None if self.rating is None or change is None else self.rating + round_half_up(change)

    @property
    def performance(self) -> int | None:
        """Ra + dp(p) over the rated games (table 8.1(a); p rounded half up to two decimals)."""
        if not self.games:
            return None
        average = round_half_up(Decimal(sum(g.opponent_rating for g in self.games)) / len(self.games))
        return average + dp_from_fraction(Points(self.scored) / len(self.games))


    @property
    def first_rating(self) -> int | None:
        """An unrated player's first rating from this event alone, by the rule of 1 March 2024 as remembered
        (low confidence): Ra + dp(p) with two hypothetical 1800 opponents drawn with, i.e. Ra the average
        of the rated opponents and two 1800s, p = (points + 1) / (games + 2). None for a rated player, with
        fewer than :data:`FIRST_RATING_GAMES` rated games, or without a point (such an event is ignored)."""
        if self.rating is not None or len(self.games) < FIRST_RATING_GAMES or not self.scored:
            return None
        ratings = [g.opponent_rating for g in self.games] + [HYPOTHETICAL] * 2
        average = round_half_up(Decimal(sum(ratings)) / len(ratings))
        return average + dp_from_fraction((Points(self.scored) + 1) / (len(self.games) + 2))


def _year(text: str | None) -> int | None:
    return int(text[:4]) if text and text[:4].isdigit() else None


def _event_year(state: EventState) -> int | None:
    s = state.settings
    return _year(s.start_date or (s.round_dates[0] if s.round_dates else None))


def rating_changes(state: EventState, after_round: int | None = None) -> dict[PlayerId, RatingChange]:
    """Each player's rated games and rating change over the published rounds up to ``after_round``."""
    last = max((r.number for r in state.rounds if r.state is not RoundState.DRAFT), default=0)
    upto = last if after_round is None else min(after_round, last)
    ratings = {pid: fide_rating(p) for pid, p in state.players.items()}
    year = _event_year(state)
    out: dict[PlayerId, RatingChange] = {}
    for pid, player in state.players.items():
        own = ratings[pid]
        played = [e for e in state.records[pid].entries
                  if e.round <= upto and e.played and e.opponent is not None and e.result is not None
                  and e.side is not None]
        rated = [e for e in played if ratings[e.opponent] is not None]  # type: ignore[index]
        k = k_factor(own, _year(player.details.birth), year, len(rated)) if own is not None else None
        games = []
        for e in rated:
            assert e.opponent is not None and e.side is not None and e.result is not None
            theirs = ratings[e.opponent]
            assert theirs is not None
            score = SCORE[e.result.outcome(e.side)]
            if own is not None and k is not None:
                d = used_difference(own, theirs)
                expected = Decimal(expected_hundredths(d)) / 100
                change = k * (score - expected)
            else:
                d, expected, change = 0, Decimal(0), Decimal(0)
            games.append(RatedGame(e.round, e.opponent, theirs, d, expected, score, change))
        out[pid] = RatingChange(pid, own, k, tuple(games), len(played) - len(rated))
    return out
