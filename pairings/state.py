"""The event's state: a plain, immutable projection of the event log.

Built by :func:`pairings.fold.fold`; the only input of the engine, the standings
and the reports. Nothing here touches SQLite, the terminal or the clock.

Derived histories (each player's score, sides and floats round by round) are
computed once when the state is frozen and kept in :attr:`EventState.records`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import StrEnum
from types import MappingProxyType
from typing import Iterable, Mapping, NewType

from pairings.errors import ResultCodeError
from pairings.points import ZERO, Points, total

PlayerId = NewType("PlayerId", str)


class Status(StrEnum):
    ACTIVE = "active"
    WITHDRAWN = "withdrawn"


class RoundState(StrEnum):
    DRAFT = "draft"
    PUBLISHED = "published"
    COMPLETE = "complete"


class ByeKind(StrEnum):
    PAIRING = "pairing"
    REQUESTED = "requested"
    ABSENCE = "absence"


class Side(StrEnum):
    FIRST = "first"
    SECOND = "second"

    @property
    def other(self) -> "Side":
        return Side.SECOND if self is Side.FIRST else Side.FIRST


class Float(StrEnum):
    DOWN = "down"
    UP = "up"


class System(StrEnum):
    """The event's pairing system (stored values; the command line's names are in ``SYSTEM_NAMES``)."""

    SWISS = "swiss"
    """Our whole-round optimum Swiss system (docs/engine.md), named ``whole-round`` to users."""
    DUTCH = "dutch"
    """The FIDE (Dutch) System, C.04.3."""
    ROUND_ROBIN = "round_robin"


class Acceleration(StrEnum):
    """An accelerated-pairing method applied on top of a Swiss system."""

    NONE = "none"
    BAKU = "baku"
    """C.04.5.1 Baku Acceleration: virtual points for the top group in the first rounds."""


class Unplayed(StrEnum):
    """How tiebreaks treat rounds a player did not play (docs/tiebreaks.md, "Unplayed rounds")."""

    AS_THEY_STAND = "as_they_stand"
    VIRTUAL_OPPONENT = "virtual_opponent"
    DUMMY_OPPONENT = "dummy_opponent"


class Result(StrEnum):
    """A game's result, written from the first side's point of view."""

    FIRST_WINS = "1-0"
    SECOND_WINS = "0-1"
    DRAW = "1/2-1/2"
    FIRST_WINS_BY_FORFEIT = "+-"
    SECOND_WINS_BY_FORFEIT = "-+"
    DOUBLE_FORFEIT = "--"
    BOTH_LOSE = "0-0"
    """Arbiter-decided results the Laws of Chess allow (FIDE Laws of Chess, from memory): the game was
    played, and the arbiter scored it a loss for both, or half a point for one side and a loss for the other."""
    FIRST_HALF_SECOND_LOSES = "1/2-0"
    FIRST_LOSES_SECOND_HALF = "0-1/2"

    @classmethod
    def parse(cls, text: str) -> "Result":
        """Read a result code; accepts ``½-½`` and ``0.5-0.5`` for a draw."""
        cleaned = text.strip().replace("½", "1/2").replace("0.5", "1/2")
        try:
            return cls(cleaned)
        except ValueError:
            raise ResultCodeError(
                f"unknown result {text!r}: use 1-0, 0-1, 1/2-1/2, +-, -+, -- "
                "(or the arbiter's 0-0, 1/2-0, 0-1/2)"
            ) from None

    @property
    def played(self) -> bool:
        """True when the game was played over the board (not a forfeit).

        The arbiter-decided 0-0, 1/2-0 and 0-1/2 are played games: the players met over the board
        and the arbiter set the score (a decision of ours where the sources at hand were silent).
        """
        return self not in (Result.FIRST_WINS_BY_FORFEIT, Result.SECOND_WINS_BY_FORFEIT, Result.DOUBLE_FORFEIT)

    def outcome(self, side: Side) -> str:
        """``"win"``, ``"draw"`` or ``"loss"`` for the player on ``side`` (a double forfeit loses both).

        ``"draw"`` means a draw's points: the half point of 1/2-0 and 0-1/2 too.
        """
        return _OUTCOMES[self, side]


_OUTCOMES: dict[tuple[Result, "Side"], str] = {}
for _result, _first, _second in (
    (Result.FIRST_WINS, "win", "loss"), (Result.SECOND_WINS, "loss", "win"), (Result.DRAW, "draw", "draw"),
    (Result.FIRST_WINS_BY_FORFEIT, "win", "loss"), (Result.SECOND_WINS_BY_FORFEIT, "loss", "win"),
    (Result.DOUBLE_FORFEIT, "loss", "loss"),
    (Result.BOTH_LOSE, "loss", "loss"), (Result.FIRST_HALF_SECOND_LOSES, "draw", "loss"),
    (Result.FIRST_LOSES_SECOND_HALF, "loss", "draw"),
):
    _OUTCOMES[_result, Side.FIRST] = _first
    _OUTCOMES[_result, Side.SECOND] = _second


@dataclass(frozen=True, slots=True)
class Scoring:
    """Points for a win, a draw and a loss (forfeits score as a win or a loss), exact (pairings.points)."""

    win: Points = Points(1)
    draw: Points = Points(1, 2)
    loss: Points = ZERO

    def points(self, outcome: str) -> Points:
        return {"win": self.win, "draw": self.draw, "loss": self.loss}[outcome]


DEFAULT_TIEBREAKS: tuple[str, ...] = ("BH-C1", "BH", "SB", "WIN")
"""The list of event files that stored none (new events get the C.07 recommendation instead)."""


@dataclass(frozen=True, slots=True)
class Settings:
    name: str
    rounds: int
    scoring: Scoring = Scoring()
    sides: tuple[str, str] | None = ("White", "Black")
    bye_points: Points = Points(1)
    requested_bye_points: Points = Points(1, 2)
    tiebreaks: tuple[str, ...] = DEFAULT_TIEBREAKS
    unplayed: Unplayed = Unplayed.VIRTUAL_OPPONENT
    default_rating: int = 1000
    max_meetings: int = 1
    final_round_side_exception: bool = False
    system: System = System.SWISS
    double_round: bool = False
    seed: int = 0
    acceleration: Acceleration = Acceleration.NONE
    forfeit_is_meeting: bool = True
    """A pairing that ended in a forfeit counts as a meeting (the current Handbook's rule, from memory)."""
    city: str = ""
    """The header fields of a rated event's report file (pairings.trf); empty when not given."""
    federation: str = ""
    """Three-letter code of the federation the event is held in."""
    start_date: str = ""
    """``YYYY-MM-DD``."""
    end_date: str = ""
    chief_arbiter: str = ""
    deputy_arbiters: tuple[str, ...] = ()
    time_control: str = ""
    """The rate of play as the regulations state it (e.g. ``90 min + 30 s per move``)."""
    round_dates: tuple[str, ...] = ()
    """``YYYY-MM-DD`` per round, from round 1 (may be shorter than the number of rounds)."""
    late_entry_points: Points = ZERO
    """Points a late entrant gets for each round missed before entry (see :func:`late_entry_points`)."""
    requested_bye_limit: int | None = None
    """Most requested byes one player may have (None: no limit)."""
    requested_bye_last_round: int | None = None
    """The last round a requested bye may be asked for (None: any round)."""
    changed_after: tuple[tuple[int, str], ...] = ()
    """(round, setting) for each setting changed once that round was published (the sheets say so)."""


TITLES: tuple[str, ...] = ("GM", "IM", "WGM", "FM", "WIM", "CM", "WFM", "WCM")
"""The FIDE titles, in the precedence of the initial order (C.04.2 initial order; FIDE Handbook B.01 for the
titles; both from memory)."""


def initial_order(players: Iterable[Player], default_rating: int, by_title: bool) -> tuple[PlayerId, ...]:
    """Players by rating descending (``default_rating`` for the unrated), then (``by_title``) title in
    :data:`TITLES` precedence, untitled last, then name casefolded, then registration order."""
    def key(p: Player) -> tuple[int, int, str, int]:
        title = (p.details.title or "").upper() if by_title else ""
        rank = TITLES.index(title) if title in TITLES else len(TITLES)
        return (-(p.rating if p.rating is not None else default_rating), rank, p.name.casefold(), p.order)

    return tuple(p.id for p in sorted(players, key=key))


SYSTEM_NAMES: Mapping[str, tuple[System, bool]] = MappingProxyType({
    "whole-round": (System.SWISS, False),
    "dutch": (System.DUTCH, False),
    "round-robin": (System.ROUND_ROBIN, False),
    "double-round-robin": (System.ROUND_ROBIN, True),
})
"""The pairing systems as users name them (command line, desk, interchange): (system, double round)."""


def system_name(settings: "Settings") -> str:
    """The user's name of the event's system (the inverse of :data:`SYSTEM_NAMES`)."""
    key = (settings.system, settings.double_round and settings.system is System.ROUND_ROBIN)
    return next(name for name, value in SYSTEM_NAMES.items() if value == key)


def late_entry_points(per_round: Points, first_round: int, round_number: int) -> Points:
    """Points for round ``round_number`` to a player registered to start in ``first_round``.

    A late entrant scores the event's ``late_entry_points`` for each round missed
    before entry (a choice of the event's regulations; common practice, no
    source); any other round scores by its game or bye.
    """
    return per_round if round_number < first_round else ZERO


@dataclass(frozen=True, slots=True)
class PlayerDetails:
    """What rated events and category prizes need beyond name, rating and club (all optional)."""

    title: str | None = None
    """FIDE title as its usual abbreviation (GM, IM, WGM, FM, WIM, CM, WFM, WCM)."""
    federation: str | None = None
    """Three-letter federation code, upper case."""
    fide_id: str | None = None
    national_id: str | None = None
    birth: str | None = None
    """Birth year ``YYYY`` or date ``YYYY-MM-DD``."""
    sex: str | None = None
    """``m`` or ``f``."""
    ratings: tuple[tuple[str, int], ...] = ()
    """One rating per list the event uses (e.g. ``("fide", 2010), ("national", 1980)``), sorted by list name."""
    categories: tuple[str, ...] = ()
    """Free category labels given by hand."""


@dataclass(frozen=True, slots=True)
class Player:
    id: PlayerId
    name: str
    rating: int | None
    club: str | None
    status: Status
    order: int
    """Registration order, 0-based; the last tiebreak of the initial rank."""
    entry_round: int = 1
    """First round the player can be paired in (late entries)."""
    withdrawn_from: int | None = None
    """First round the player is no longer paired in, when withdrawn."""
    details: PlayerDetails = PlayerDetails()
    first_round: int = 1
    """The round the player was registered to start in (unlike ``entry_round``, kept on reinstatement)."""


@dataclass(frozen=True, slots=True)
class Game:
    board: int
    first: PlayerId
    second: PlayerId
    result: Result | None = None
    flags: tuple[str, ...] = ()
    cost: Mapping[str, int] = field(default_factory=lambda: MappingProxyType({}))


@dataclass(frozen=True, slots=True)
class Bye:
    player: PlayerId
    kind: ByeKind
    points: Points


@dataclass(frozen=True, slots=True)
class Round:
    number: int
    state: RoundState
    games: tuple[Game, ...]
    byes: tuple[Bye, ...]
    cost: Mapping[str, int] = field(default_factory=lambda: MappingProxyType({}))
    engine_version: str | None = None
    source: str = "engine"
    """``engine`` (as drafted), ``override`` (changed by the organiser) or ``restored``."""
    notes: tuple[str, ...] = ()
    """The organiser's override reasons, in order."""
    paired_before: tuple[str, ...] = ()
    """Corrections of earlier rounds' results made after this round was drafted, one line each
    (e.g. ``"round 3 board 2: 1-0 → 0-1 (scoresheet misread)"``): it was paired on the old scores."""
    accepted: str = ""
    """The organiser's reason for publishing it although an override breaks a hard rule."""

    def game_on(self, board: int) -> Game | None:
        for game in self.games:
            if game.board == board:
                return game
        return None

    @property
    def open_boards(self) -> tuple[int, ...]:
        return tuple(g.board for g in self.games if g.result is None)


@dataclass(frozen=True, slots=True)
class ForbiddenPair:
    """A do-not-pair entry (H5); applies up to and including ``until_round`` if set."""

    a: PlayerId
    b: PlayerId
    until_round: int | None = None
    reason: str = ""

    def applies(self, round_number: int) -> bool:
        return self.until_round is None or round_number <= self.until_round


@dataclass(frozen=True, slots=True)
class RoundEntry:
    """What one player did in one round."""

    round: int
    opponent: PlayerId | None
    side: Side | None
    """The side taken in a game (also for a forfeit); None for a bye."""
    result: Result | None
    bye: ByeKind | None
    points: Points | None
    """None while the game has no result."""
    played: bool
    """True for a game played over the board (not a forfeit, not a bye)."""
    score_before: Points
    float: Float | None
    """Paired against a lower (down) or higher (up) score; a pairing bye is a down float."""


@dataclass(frozen=True, slots=True)
class PlayerRecord:
    player: PlayerId
    entries: tuple[RoundEntry, ...]
    """One entry per round the player took part in (game or bye), in round order."""
    score: Points
    late_points: Points = ZERO
    """The event's points per round missed before entry (see :func:`late_entry_points`)."""
    first_round: int = 1

    def entry(self, round_number: int) -> RoundEntry | None:
        for e in self.entries:
            if e.round == round_number:
                return e
        return None

    def score_before(self, round_number: int) -> Points:
        played = total(e.points for e in self.entries if e.round < round_number and e.points is not None)
        if not self.late_points:
            return played
        return played + total(late_entry_points(self.late_points, self.first_round, r) for r in range(1, round_number))

    @property
    def played_sides(self) -> tuple[Side, ...]:
        """Sides of the games played over the board, oldest first (SD counts only these)."""
        return tuple(e.side for e in self.entries if e.played and e.side is not None)

    @property
    def side_difference(self) -> int:
        sides = self.played_sides
        return sides.count(Side.FIRST) - sides.count(Side.SECOND)

    @property
    def opponents(self) -> tuple[PlayerId, ...]:
        """Opponents actually met over the board (forfeits are not meetings)."""
        return tuple(e.opponent for e in self.entries if e.played and e.opponent is not None)

    def met(self, forfeits: bool) -> tuple[PlayerId, ...]:
        """Opponents met (H1): over the board, and when ``forfeits`` also in pairings that ended in a forfeit.

        ``forfeits`` is the event's ``Settings.forfeit_is_meeting``.
        """
        return tuple(e.opponent for e in self.entries
                     if e.opponent is not None and (e.played or (forfeits and e.result is not None)))

    @property
    def had_pairing_bye(self) -> bool:
        return any(e.bye is ByeKind.PAIRING for e in self.entries)

    @property
    def had_unplayed_point(self) -> bool:
        """Scored a point without playing: a pairing bye or a forfeit win (H2)."""
        for e in self.entries:
            if e.bye is ByeKind.PAIRING:
                return True
            if e.result is not None and not e.played and e.side is not None:
                if e.result.outcome(e.side) == "win":
                    return True
        return False


@dataclass(frozen=True, slots=True)
class CategoryRule:
    """Who belongs to a category by rule (every condition given must hold; see pairings.categories)."""

    age_under: int | None = None
    """Younger than this many whole years on ``age_on``."""
    age_from: int | None = None
    """At least this many whole years old on ``age_on``."""
    age_on: str | None = None
    """The date ages are counted on, ``YYYY-MM-DD``."""
    sex: str | None = None
    rating_from: int | None = None
    rating_below: int | None = None
    rating_list: str | None = None
    """The rating list the band and ``unrated`` read (None: the event's own rating)."""
    unrated: bool = False
    label: str | None = None
    club: str | None = None


@dataclass(frozen=True, slots=True)
class Category:
    name: str
    rule: CategoryRule | None
    """None for a category whose members are all given by hand."""
    added: frozenset[PlayerId] = frozenset()
    """Members given by hand beyond the rule."""
    excluded: frozenset[PlayerId] = frozenset()
    """Players the rule takes in but the organiser left out by hand."""


class BetterPrize(StrEnum):
    """Which of two prizes a player eligible for both receives (one prize per player)."""

    AMOUNT = "amount"
    """The larger amount; between equal amounts the category listed first."""
    ORDER = "order"
    """The category listed first (the overall list first), whatever the amounts."""


class PrizeTies(StrEnum):
    """How players equal on points share prizes (the event's regulations say which)."""

    TIEBREAKS = "tiebreaks"
    """The tiebreaks decide; no sharing."""
    SHARED = "shared"
    """The prizes of the places the tied players occupy are added and shared equally."""
    HORT = "hort"
    """Hort system (from memory): half of each prize by tiebreaks, the other half shared equally."""


@dataclass(frozen=True, slots=True)
class Prize:
    category: str | None
    """None for the overall standings."""
    place: int
    amount: int
    """Integer minor units (cents): never a float."""


@dataclass(frozen=True, slots=True)
class PrizePolicy:
    better: BetterPrize = BetterPrize.AMOUNT
    ties: PrizeTies = PrizeTies.TIEBREAKS
    currency: str = ""
    minor_digits: int = 2
    """Digits of the minor unit: 2 for cents, 0 for a currency without one."""


@dataclass(frozen=True, slots=True)
class EventState:
    settings: Settings
    players: Mapping[PlayerId, Player]
    """In registration order."""
    rounds: tuple[Round, ...]
    forbidden: tuple[ForbiddenPair, ...]
    requests: Mapping[int, Mapping[PlayerId, ByeKind]]
    """Announced byes and absences by round number (requested / absence)."""
    records: Mapping[PlayerId, PlayerRecord]
    head: int
    """Sequence number of the last event folded in (0 for an empty log)."""
    kept_after_no_show: frozenset[tuple[PlayerId, int]] = frozenset()
    """(player, round) of double forfeits after which the organiser kept the player in the event."""
    categories: Mapping[str, Category] = field(default_factory=lambda: MappingProxyType({}))
    """Prize categories by name, in the order defined."""
    prizes: tuple[Prize, ...] = ()
    """In the order defined; one per category and place."""
    prize_policy: PrizePolicy = PrizePolicy()

    @property
    def last_round(self) -> Round | None:
        return self.rounds[-1] if self.rounds else None

    @property
    def next_round_number(self) -> int:
        """The number the next drafted round would get."""
        last = self.last_round
        if last is None:
            return 1
        return last.number + 1 if last.state is not RoundState.DRAFT else last.number

    def round(self, number: int) -> Round | None:
        if 1 <= number <= len(self.rounds):
            return self.rounds[number - 1]
        return None

    def score(self, player: PlayerId) -> Points:
        return self.records[player].score

    def initial_rank(self) -> tuple[PlayerId, ...]:
        """Every registered player in initial order; start (pairing) number ``k`` is position ``k - 1``.

        Rating descending (unrated players take the event's default rating), then name casefolded, then
        registration (docs/engine.md). The FIDE (Dutch) System puts the title between rating and name
        (C.04.2 initial order, from memory; :data:`TITLES` gives the precedence), so that the sheets' start
        numbers are the Dutch pairing numbers.
        """
        return initial_order(self.players.values(), self.settings.default_rating,
                             by_title=self.settings.system is System.DUTCH)

    def available(self, round_number: int) -> tuple[PlayerId, ...]:
        """Players to pair in ``round_number`` (H4), in initial-rank order."""
        asked = self.requests.get(round_number, {})
        out = []
        for pid in self.initial_rank():
            p = self.players[pid]
            if p.entry_round > round_number or pid in asked:
                continue
            if p.withdrawn_from is not None and p.withdrawn_from <= round_number:
                continue
            out.append(pid)
        return tuple(out)
