"""Fold the event log into an :class:`~pairings.state.EventState`.

One plain function per event type, applied in order to a mutable builder that is
frozen once at the end (so folding is linear in the log's length). Events named
by an :class:`~pairings.events.Undone` are skipped: undo compensates, it never
rewrites history.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import singledispatch
from types import MappingProxyType
from typing import Iterable

from pairings import events as ev
from pairings.errors import InputError
from pairings.points import ZERO, Points
from pairings.standings.tiebreaks import check_tiebreaks
from pairings.state import (
    DEFAULT_TIEBREAKS,
    Bye,
    ByeKind,
    Category,
    CategoryRule,
    EventState,
    Float,
    ForbiddenPair,
    Game,
    Player,
    PlayerDetails,
    PlayerId,
    PlayerRecord,
    Prize,
    PrizePolicy,
    Round,
    RoundEntry,
    RoundState,
    Scoring,
    Side,
    Settings,
    Status,
    late_entry_points,
)


@dataclass
class _Builder:
    settings: Settings | None = None
    players: dict[PlayerId, Player] = field(default_factory=dict)
    rounds: list[_RoundBuilder] = field(default_factory=list)
    forbidden: list[ForbiddenPair] = field(default_factory=list)
    requests: dict[int, dict[PlayerId, ByeKind]] = field(default_factory=dict)
    head: int = 0
    kept: set[tuple[PlayerId, int]] = field(default_factory=set)
    categories: dict[str, Category] = field(default_factory=dict)
    prizes: dict[tuple[str | None, int], Prize] = field(default_factory=dict)
    prize_policy: PrizePolicy = PrizePolicy()


@singledispatch
def _apply(event: object, b: _Builder) -> None:
    raise TypeError(f"no fold rule for {type(event).__name__}")


@_apply.register
def _(e: ev.EventCreated, b: _Builder) -> None:
    b.settings = Settings(
        name=e.name,
        rounds=e.rounds,
        scoring=Scoring(e.scoring.win, e.scoring.draw, e.scoring.loss),
        sides=e.sides,
        bye_points=e.bye_points,
        requested_bye_points=e.requested_bye_points,
        tiebreaks=_tiebreaks(e.tiebreaks) if e.tiebreaks is not None else DEFAULT_TIEBREAKS,
        late_entry_points=e.late_entry_points,
        requested_bye_limit=e.requested_bye_limit,
        requested_bye_last_round=e.requested_bye_last_round,
        unplayed=e.unplayed,
        default_rating=e.default_rating,
        max_meetings=e.max_meetings,
        final_round_side_exception=e.final_round_side_exception,
        system=e.system,
        double_round=e.double_round,
        seed=e.seed,
        acceleration=e.acceleration,
        forfeit_is_meeting=e.forfeit_is_meeting,
        city=e.city, federation=e.federation, start_date=e.start_date, end_date=e.end_date,
        chief_arbiter=e.chief_arbiter, deputy_arbiters=tuple(e.deputy_arbiters), time_control=e.time_control,
        round_dates=tuple(e.round_dates),
    )


@_apply.register
def _(e: ev.SettingsChanged, b: _Builder) -> None:
    assert b.settings is not None
    changes = e.given()
    changes.update({k: None for k in e.cleared})
    if e.after_round:
        changes["changed_after"] = b.settings.changed_after + tuple((e.after_round, k) for k in changes)
    if "tiebreaks" in changes:
        changes["tiebreaks"] = _tiebreaks(changes["tiebreaks"])
    for key in ("deputy_arbiters", "round_dates"):
        if key in changes:
            changes[key] = tuple(changes[key])
    if e.scoring is not None:
        changes["scoring"] = Scoring(e.scoring.win, e.scoring.draw, e.scoring.loss)
    b.settings = replace(b.settings, **changes)


@_apply.register
def _(e: ev.PlayerRegistered, b: _Builder) -> None:
    pid = PlayerId(e.id)
    b.players[pid] = Player(
        id=pid, name=e.name, rating=e.rating, club=e.club, status=Status.ACTIVE,
        order=len(b.players), entry_round=e.entry_round, details=_details(e.details), first_round=e.entry_round,
    )


@_apply.register
def _(e: ev.PlayerEdited, b: _Builder) -> None:
    pid = PlayerId(e.id)
    old = b.players[pid]
    details = old.details if e.details is None else _details(e.details)
    b.players[pid] = replace(old, name=e.name, rating=e.rating, club=e.club, details=details)


def _tiebreaks(stored: Iterable[str]) -> tuple[str, ...]:
    """A stored list as C.07 acronyms (older files stored snake_case names); a list that does not
    read is kept as stored, so the file still opens and the standings name what is wrong."""
    names = tuple(stored)
    try:
        return check_tiebreaks(names)
    except InputError:
        return names


def _details(m: ev.PlayerDetailsModel | None) -> PlayerDetails:
    if m is None:
        return PlayerDetails()
    return PlayerDetails(
        title=m.title, federation=m.federation, fide_id=m.fide_id, national_id=m.national_id,
        birth=m.birth, sex=m.sex, ratings=tuple(sorted(m.ratings.items())), categories=tuple(m.categories),
    )


@_apply.register
def _(e: ev.PlayerWithdrawn, b: _Builder) -> None:
    pid = PlayerId(e.player)
    b.players[pid] = replace(b.players[pid], status=Status.WITHDRAWN, withdrawn_from=e.from_round)


@_apply.register
def _(e: ev.PlayerReinstated, b: _Builder) -> None:
    pid = PlayerId(e.player)
    p = b.players[pid]
    b.players[pid] = replace(
        p, status=Status.ACTIVE, withdrawn_from=None, entry_round=max(p.entry_round, e.from_round)
    )


@_apply.register
def _(e: ev.ByeRequested, b: _Builder) -> None:
    b.requests.setdefault(e.round, {})[PlayerId(e.player)] = ByeKind(e.kind)


@_apply.register
def _(e: ev.ByeCancelled, b: _Builder) -> None:
    b.requests.get(e.round, {}).pop(PlayerId(e.player), None)


@_apply.register
def _(e: ev.PairForbidden, b: _Builder) -> None:
    b.forbidden.append(ForbiddenPair(PlayerId(e.a), PlayerId(e.b), e.until_round, e.reason))


@dataclass
class _RoundBuilder:
    """A round while folding: games by board, so a result is one dict update."""

    number: int
    games: dict[int, Game]
    byes: tuple[Bye, ...]
    cost: dict[str, int]
    engine_version: str | None
    source: str
    notes: tuple[str, ...]
    published: bool
    paired_before: tuple[str, ...] = ()
    accepted: str = ""
    frozen: Round | None = None
    """The last frozen form, kept until the round changes (so unchanged rounds are the same object)."""

    def changed(self) -> "_RoundBuilder":
        self.frozen = None
        return self

    def freeze(self) -> Round:
        if self.frozen is not None:
            return self.frozen
        games = tuple(self.games[k] for k in sorted(self.games))
        if not self.published:
            state = RoundState.DRAFT
        elif all(g.result is not None for g in games):
            state = RoundState.COMPLETE
        else:
            state = RoundState.PUBLISHED
        self.frozen = Round(
            number=self.number, state=state, games=games, byes=self.byes,
            cost=MappingProxyType(dict(self.cost)), engine_version=self.engine_version,
            source=self.source, notes=self.notes, paired_before=self.paired_before, accepted=self.accepted,
        )
        return self.frozen


@_apply.register
def _(e: ev.RoundDrafted, b: _Builder) -> None:
    games = {
        x.board: Game(
            board=x.board, first=PlayerId(x.first), second=PlayerId(x.second), result=x.result,
            flags=x.flags, cost=MappingProxyType(dict(x.cost)),
        )
        for x in e.boards
    }
    byes = tuple(Bye(PlayerId(x.player), x.kind, x.points) for x in e.byes)
    previous = b.rounds[e.round - 1] if len(b.rounds) >= e.round else None
    notes = previous.notes if previous is not None else ()
    if e.reason:
        notes = notes + (e.reason,)
    new = _RoundBuilder(
        number=e.round, games=games, byes=byes, cost=dict(e.cost), engine_version=e.engine_version,
        source=e.source, notes=notes, published=False,
    )
    if previous is not None:
        b.rounds[e.round - 1] = new
    else:
        b.rounds.append(new)


@_apply.register
def _(e: ev.DraftDiscarded, b: _Builder) -> None:
    if b.rounds and b.rounds[-1].number == e.round:
        b.rounds.pop()


@_apply.register
def _(e: ev.RoundPublished, b: _Builder) -> None:
    b.rounds[e.round - 1].changed().published = True


@_apply.register
def _(e: ev.RoundUnpublished, b: _Builder) -> None:
    r = b.rounds[e.round - 1].changed()
    r.published = False
    r.notes = r.notes + (e.reason,)


@_apply.register
def _(e: ev.ResultRecorded, b: _Builder) -> None:
    games = b.rounds[e.round - 1].changed().games
    games[e.board] = replace(games[e.board], result=e.result)


@_apply.register
def _(e: ev.ResultCorrected, b: _Builder) -> None:
    games = b.rounds[e.round - 1].changed().games
    old = games[e.board].result
    games[e.board] = replace(games[e.board], result=e.result)
    note = f"round {e.round} board {e.board}: {old.value if old else 'no result'} → {e.result.value} ({e.reason})"
    for later in b.rounds[e.round:]:
        later.changed().paired_before += (note,)


@_apply.register
def _(e: ev.BreachAccepted, b: _Builder) -> None:
    b.rounds[e.round - 1].changed().accepted = e.reason


@_apply.register
def _(e: ev.NoShowKept, b: _Builder) -> None:
    b.kept.add((PlayerId(e.player), e.round))


@_apply.register
def _(e: ev.CategoryDefined, b: _Builder) -> None:
    rule = CategoryRule(**e.rule.model_dump()) if e.rule is not None else None
    old = b.categories.get(e.name)
    b.categories[e.name] = replace(old, rule=rule) if old is not None else Category(e.name, rule)


@_apply.register
def _(e: ev.CategoryRemoved, b: _Builder) -> None:
    b.categories.pop(e.name, None)
    for key in [k for k in b.prizes if k[0] == e.name]:
        del b.prizes[key]


@_apply.register
def _(e: ev.CategoryMember, b: _Builder) -> None:
    c = b.categories[e.category]
    pid = PlayerId(e.player)
    if e.member:
        b.categories[e.category] = replace(c, added=c.added | {pid}, excluded=c.excluded - {pid})
    else:
        b.categories[e.category] = replace(c, added=c.added - {pid}, excluded=c.excluded | {pid})


@_apply.register
def _(e: ev.PrizeSet, b: _Builder) -> None:
    if e.amount is None:
        b.prizes.pop((e.category, e.place), None)
    else:
        b.prizes[e.category, e.place] = Prize(e.category, e.place, e.amount)


@_apply.register
def _(e: ev.PrizePolicySet, b: _Builder) -> None:
    changes = {k: v for k, v in e.model_dump(exclude={"type"}).items() if v is not None}
    b.prize_policy = replace(b.prize_policy, **changes)


@dataclass(frozen=True)
class _Played:
    """One counted round's entries and the scores after it (reused while the rounds before it stay)."""

    round: Round
    entries: dict[PlayerId, RoundEntry]
    score_after: dict[PlayerId, Points]
    late: tuple[Points, tuple[tuple[PlayerId, int], ...]] | None = None
    """The late-entry points and late entrants this round was counted with (a change recounts it)."""


def _round_entries(
    scoring: Scoring, rnd: Round, before: dict[PlayerId, Points], late: dict[PlayerId, Points]
) -> _Played:
    """``late``: each late entrant's points for this round if it is one they missed before entry."""
    entries: dict[PlayerId, RoundEntry] = {}
    score = dict(before)
    for pid, credit in late.items():
        score[pid] = score.get(pid, ZERO) + credit
    for g in rnd.games:
        for pid, opp, side in ((g.first, g.second, Side.FIRST), (g.second, g.first, Side.SECOND)):
            mine, theirs = before.get(pid, ZERO), before.get(opp, ZERO)
            fl = Float.DOWN if mine > theirs else Float.UP if mine < theirs else None
            pts = scoring.points(g.result.outcome(side)) if g.result is not None else None
            entries[pid] = RoundEntry(
                round=rnd.number, opponent=opp, side=side, result=g.result, bye=None,
                points=pts, played=g.result is not None and g.result.played, score_before=mine, float=fl,
            )
            if pts is not None:
                score[pid] = mine + pts
    for bye in rnd.byes:
        mine = before.get(bye.player, ZERO)
        entries[bye.player] = RoundEntry(
            round=rnd.number, opponent=None, side=None, result=None, bye=bye.kind, points=bye.points,
            played=False, score_before=mine, float=Float.DOWN if bye.kind is ByeKind.PAIRING else None,
        )
        score[bye.player] = mine + bye.points
    return _Played(rnd, entries, score)


def _records(
    settings: Settings, players: dict[PlayerId, Player], rounds: tuple[Round, ...], cache: list[_Played]
) -> dict[PlayerId, PlayerRecord]:
    """Each player's round-by-round history over the published and complete rounds.

    ``cache`` holds the previous call's counted rounds: a round is recomputed only
    when it, or a round before it, is a different object (frozen rounds are reused
    by the builder until they change).
    """
    counted = [r for r in rounds if r.state is not RoundState.DRAFT]
    per_round = settings.late_entry_points
    late_key = (per_round, tuple((pid, p.first_round) for pid, p in players.items() if p.first_round > 1))
    keep = 0
    while keep < min(len(cache), len(counted)) and cache[keep].round is counted[keep] and cache[keep].late == late_key:
        keep += 1
    del cache[keep:]
    for rnd in counted[keep:]:
        late = {pid: pts for pid, p in players.items()
                if (pts := late_entry_points(per_round, p.first_round, rnd.number))} if per_round else {}
        played = _round_entries(settings.scoring, rnd, cache[-1].score_after if cache else {}, late)
        cache.append(replace(played, late=late_key))
    final = cache[-1].score_after if cache else {}
    return {
        pid: PlayerRecord(
            player=pid,
            entries=tuple(p.entries[pid] for p in cache if pid in p.entries),
            score=final.get(pid, ZERO),
            late_points=per_round,
            first_round=players[pid].first_round,
        )
        for pid in players
    }


class Folder:
    """An incremental fold: new events are applied to the builder kept from the last call.

    An undo changes what earlier events mean, so a batch holding one refolds
    the whole log; anything else costs only the new events plus one freeze.
    """

    def __init__(self) -> None:
        self._items: list[tuple[int, ev.Event]] = []
        self._builder = _Builder()
        self._played: list[_Played] = []

    def extend(self, log: Iterable[tuple[int, ev.Event]]) -> "Folder":
        items = list(log)
        self._items.extend(items)
        if any(isinstance(e, ev.Undone) for _, e in items):
            undone = {e.target for _, e in self._items if isinstance(e, ev.Undone)}
            self._builder = _Builder()
            self._played = []
            self._apply_all(self._items, undone)
        else:
            self._apply_all(items, set())
        return self

    def _apply_all(self, items: list[tuple[int, ev.Event]], undone: set[int]) -> None:
        b = self._builder
        for seq, event in items:
            b.head = seq
            if seq in undone or isinstance(event, ev.Undone):
                continue
            _apply(event, b)

    def state(self) -> EventState:
        b = self._builder
        if b.settings is None:
            raise ValueError("the log holds no event-created record")
        rounds = tuple(r.freeze() for r in b.rounds)
        return EventState(
            settings=b.settings,
            players=MappingProxyType(dict(b.players)),
            rounds=rounds,
            forbidden=tuple(b.forbidden),
            requests=MappingProxyType({k: MappingProxyType(dict(v)) for k, v in b.requests.items()}),
            records=MappingProxyType(_records(b.settings, b.players, rounds, self._played)),
            head=b.head,
            kept_after_no_show=frozenset(b.kept),
            categories=MappingProxyType(dict(b.categories)),
            prizes=tuple(b.prizes.values()),
            prize_policy=b.prize_policy,
        )


def fold(log: Iterable[tuple[int, ev.Event]]) -> EventState:
    """Fold ``(sequence number, event)`` pairs, oldest first, into the event's state."""
    return Folder().extend(log).state()
