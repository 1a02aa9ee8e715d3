"""Random but realistic event logs, for tests, benchmarks and demo data.

:func:`simulate_events` writes the log an organiser would produce over some
rounds of a Swiss-system event: the event, an invented field, announced byes,
absences and withdrawals, one engine-like draft per round, its publication and
every board's result. Results follow the Elo expected score of a hidden
playing strength.

The built-in pairer is a fast greedy *data generator*, not the product's
engine: it honours no rule beyond availability, one pairing bye per player
where possible and (greedily) no rematch. Pass ``pair`` to draft the rounds
with a real pairing function instead.

Everything is seeded: the same arguments always give the same log.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass, field
from typing import Callable, Literal

from pairings import events as ev
from pairings.errors import InputError
from pairings.fold import fold
from pairings.points import ZERO, Points
from pairings.state import ByeKind, EventState, PlayerId, Result, Scoring, Side

PairFunction = Callable[[EventState], list[tuple[PlayerId, PlayerId]]]

ENGINE_VERSION = "simulate/1"

# Invented syllables and clubs: generated names are not meant to match anyone's.
_GIVEN = ("ka", "zu", "mir", "ela", "quen", "brin", "dal", "yr", "lun", "sha", "pel", "noa",
          "tam", "ix", "ro", "fen", "wyn", "sel", "kai", "rha", "zen", "mo", "vi", "ta")
_FAMILY = ("tov", "ost", "vek", "gri", "dru", "bo", "ul", "ther", "mak", "orn", "sil", "var",
           "kel", "dun", "ash", "pry", "zal", "hem", "rud", "wen", "quil", "nor", "bask", "lir")
_CLUBS = ("Riverbend Knights", "Harbour Lane Board Club", "Oakfield Academy", "Northgate Pawns",
          "Millbrook Circle", "Saltmarsh Gambit", "Copperhill Club", "Lanternway Players",
          "Thornbury Rooks", "Fernwick Board Society", "Glassworks Social", "Upper Weir Club")
_UNRATED = 0.05
_NO_CLUB = 0.15
_ABSENCE_SHARE = 0.25
"""Share of the announced byes that are absences (0 points) rather than requested byes."""


@dataclass
class _Entrant:
    """The generator's running tally for one player (kept beside the log, never folded)."""

    id: PlayerId
    name: str
    rating: int | None
    strength: float
    """Hidden playing strength that decides results."""
    order: int
    score: Points = ZERO
    side_difference: int = 0
    last_side: Side | None = None
    met: set[PlayerId] = field(default_factory=set)
    """Opponents met over the board (forfeits are not meetings)."""
    had_pairing_bye: bool = False
    withdrawn: bool = False


def _name(rng: random.Random, taken: set[str]) -> str:
    while True:
        given = "".join(rng.choice(_GIVEN) for _ in range(rng.randint(2, 3))).capitalize()
        family = "".join(rng.choice(_FAMILY) for _ in range(rng.randint(2, 3))).capitalize()
        name = f"{given} {family}"
        if name not in taken:
            taken.add(name)
            return name


def _field(n_players: int, rng: random.Random) -> list[_Entrant]:
    taken: set[str] = set()
    out = []
    for i in range(n_players):
        strength = min(2800.0, max(1000.0, rng.gauss(1800, 300)))
        rated = rng.random() >= _UNRATED
        rating = round(min(2800.0, max(1000.0, strength + rng.gauss(0, 75)))) if rated else None
        # ids as the desk gives them (pairings.actions.new_id): p1, p2, ...
        out.append(_Entrant(PlayerId(f"p{i + 1}"), _name(rng, taken), rating, strength, i))
    return out


def expected_score(difference: float) -> float:
    """Elo expected score of a player rated ``difference`` points above the opponent.

    ``1 / (1 + 10 ** (-difference / 400))`` (Elo, "The Rating of Chessplayers",
    1978; the curve tabulated in FIDE Handbook B.02, from memory).
    """
    return 1.0 / (1.0 + math.pow(10.0, -difference / 400.0))


def _result(first: _Entrant, second: _Entrant, rng: random.Random, draw_rate: float, forfeit_rate: float) -> Result:
    """Draw a result: a forfeit now and then, else win/draw/loss from the expected score.

    Draws come at ``draw_rate`` between equals and fall off as ``4 E (1 - E)``
    for a mismatch; wins then make up the rest of the expected score ``E``.
    """
    if rng.random() < forfeit_rate:
        pick = rng.random()
        if pick < 0.45:
            return Result.FIRST_WINS_BY_FORFEIT
        return Result.SECOND_WINS_BY_FORFEIT if pick < 0.9 else Result.DOUBLE_FORFEIT
    e = expected_score(first.strength - second.strength)
    p_draw = min(draw_rate * 4 * e * (1 - e), 2 * min(e, 1 - e))
    u = rng.random()
    if u < e - p_draw / 2:
        return Result.FIRST_WINS
    return Result.DRAW if u < e + p_draw / 2 else Result.SECOND_WINS


def _rank_key(default_rating: int) -> Callable[[_Entrant], tuple[Points, int, str, int]]:
    """Score descending, then the initial rank of ``EventState.initial_rank``."""
    return lambda p: (
        -p.score, -(p.rating if p.rating is not None else default_rating), p.name.casefold(), p.order
    )


def _repair_rematches(pairs: list[tuple[_Entrant, _Entrant]]) -> None:
    """Swap partners with another pair, nearest the tail first, wherever that removes a rematch."""
    for i in range(len(pairs) - 1, -1, -1):
        a, b = pairs[i]
        if b.id in a.met:
            swap = next(
                ((j, x, y) for j in range(len(pairs) - 1, -1, -1) if j != i
                 for x, y in (pairs[j], pairs[j][::-1]) if x.id not in a.met and y.id not in b.met),
                None,
            )
            if swap is not None:
                j, x, y = swap
                pairs[i], pairs[j] = (a, x), (b, y)


def _greedy_pairs(
    ranked: list[_Entrant], sides: bool
) -> tuple[list[tuple[_Entrant, _Entrant]], _Entrant | None]:
    """Pair neighbours in rank order, skipping opponents already met; the lowest gets the bye."""
    rest = list(ranked)
    bye = None
    if len(rest) % 2:
        index = next((i for i in range(len(rest) - 1, -1, -1) if not rest[i].had_pairing_bye), len(rest) - 1)
        bye = rest.pop(index)
    rest.reverse()  # highest ranked last, so pops are cheap
    pairs: list[tuple[_Entrant, _Entrant]] = []
    while rest:
        a = rest.pop()
        j = next((k for k in range(len(rest) - 1, -1, -1) if rest[k].id not in a.met), len(rest) - 1)
        pairs.append((a, rest.pop(j)))
    _repair_rematches(pairs)
    return [_allot_sides(a, b, board, sides) for board, (a, b) in enumerate(pairs, 1)], bye


def _allot_sides(a: _Entrant, b: _Entrant, board: int, sides: bool) -> tuple[_Entrant, _Entrant]:
    """First side to the lower side difference, then to whoever last had the second side,
    then alternately by board; without sides the higher ranked is listed first."""
    if not sides:
        return a, b
    if a.side_difference != b.side_difference:
        return (a, b) if a.side_difference < b.side_difference else (b, a)
    if a.last_side != b.last_side:
        return (a, b) if a.last_side is not Side.FIRST and b.last_side is not Side.SECOND else (b, a)
    return (a, b) if board % 2 else (b, a)


def _given_pairs(
    pair: PairFunction, log: list[ev.Event], round_number: int, available: list[_Entrant],
    by_id: dict[PlayerId, _Entrant],
) -> tuple[list[tuple[_Entrant, _Entrant]], _Entrant | None]:
    """Call ``pair`` on the folded log and check its answer against the available players."""
    state = fold(enumerate(log, 1))
    pairs = pair(state)
    free = {p.id for p in available}
    seated: set[PlayerId] = set()
    for a, b in pairs:
        for pid in (a, b):
            if pid not in free or pid in seated:
                raise InputError(f"round {round_number}: the pair function seats {pid} wrongly")
            seated.add(pid)
    left = [p for p in available if p.id not in seated]
    if len(left) > 1:
        raise InputError(f"round {round_number}: the pair function leaves {len(left)} players unpaired")
    return [(by_id[a], by_id[b]) for a, b in pairs], (left[0] if left else None)


def _check(n_players: int, rounds_total: int, rounds_played: int, rates: dict[str, float]) -> None:
    if n_players < 2:
        raise InputError(f"a simulated event needs at least 2 players, not {n_players}")
    if rounds_total < 1 or not 0 <= rounds_played <= rounds_total:
        raise InputError(f"cannot play {rounds_played} of {rounds_total} rounds")
    for label, value in rates.items():
        if not 0.0 <= value <= 1.0:
            raise InputError(f"{label} must lie between 0 and 1, not {value}")


def simulate_events(
    n_players: int,
    rounds_total: int,
    rounds_played: int,
    seed: int = 0,
    *,
    withdrawals: float = 0.01,
    requested_byes: float = 0.01,
    draw_rate: float = 0.3,
    forfeit_rate: float = 0.01,
    pair: PairFunction | None = None,
    name: str = "Simulated open",
    sides: bool = True,
) -> list[ev.Event]:
    """The event log of a simulated Swiss-system event.

    Parameters
    ----------
    n_players
        Field size (at least 2). Ratings are normal(1800, 300) clipped to
        1000-2800, about 5 % unrated; names and clubs are invented.
    rounds_total, rounds_played
        Rounds announced in the event, and rounds drafted, published and
        completed in the log (0..rounds_total).
    seed
        Seeds :class:`random.Random`; the same arguments give the same log.
    withdrawals
        Chance per active player and round (from round 2) of withdrawing
        before the round is drafted.
    requested_byes
        Chance per active player and round of announcing a bye; three in four
        are requested byes (the event's requested-bye points), the rest
        absences (0 points).
    draw_rate
        Draw chance between equally strong players (fewer in mismatches).
    forfeit_rate
        Chance per board of a forfeit: ``+-`` or ``-+`` (45 % each) or ``--``.
    pair
        Pairing function called on the folded log before each round; returns
        (first, second) pairs of available players, leaving at most one out
        (who gets the pairing bye). None uses the built-in greedy pairer.
    name, sides
        Event name; ``sides=False`` makes an event without sides.

    Returns
    -------
    list of Event
        EventCreated, one PlayerRegistered per player, then per round: its
        ByeRequested and PlayerWithdrawn events, RoundDrafted (source
        ``engine``, engine version ``simulate/1``), RoundPublished and one
        ResultRecorded per board.

    Raises
    ------
    InputError
        For arguments out of range, or a ``pair`` function that seats an
        unavailable player, seats one twice or leaves more than one unpaired.
    """
    _check(n_players, rounds_total, rounds_played, {
        "withdrawals": withdrawals, "requested_byes": requested_byes,
        "draw_rate": draw_rate, "forfeit_rate": forfeit_rate,
    })
    rng = random.Random(seed)
    created = ev.EventCreated(name=name, rounds=rounds_total, sides=("White", "Black") if sides else None, seed=seed)
    entrants = _field(n_players, rng)
    by_id = {p.id: p for p in entrants}
    log: list[ev.Event] = [created]
    for p in entrants:
        club = None if rng.random() < _NO_CLUB else rng.choice(_CLUBS)
        log.append(ev.PlayerRegistered(id=p.id, name=p.name, rating=p.rating, club=club))
    rank_key = _rank_key(created.default_rating)
    bye_points = {ByeKind.PAIRING: created.bye_points, ByeKind.REQUESTED: created.requested_bye_points,
                  ByeKind.ABSENCE: ZERO}

    for rnd in range(1, rounds_played + 1):
        asked: dict[PlayerId, ByeKind] = {}
        for p in entrants:
            if p.withdrawn:
                continue
            if rnd > 1 and rng.random() < withdrawals:
                p.withdrawn = True
                log.append(ev.PlayerWithdrawn(player=p.id, from_round=rnd))
            elif rng.random() < requested_byes:
                announced: Literal[ByeKind.REQUESTED, ByeKind.ABSENCE] = (
                    ByeKind.ABSENCE if rng.random() < _ABSENCE_SHARE else ByeKind.REQUESTED
                )
                asked[p.id] = announced
                log.append(ev.ByeRequested(player=p.id, round=rnd, kind=announced))
        available = sorted((p for p in entrants if not p.withdrawn and p.id not in asked), key=rank_key)
        if pair is None:
            pairs, bye = _greedy_pairs(available, sides)
        else:
            pairs, bye = _given_pairs(pair, log, rnd, available, by_id)
        byes = [(bye.id, ByeKind.PAIRING)] if bye is not None else []
        byes += sorted(asked.items())
        log.append(ev.RoundDrafted(
            round=rnd,
            # an explicit empty cost spares pydantic a deep copy of the default per board
            boards=tuple(
                ev.BoardModel(board=i, first=a.id, second=b.id, cost={}) for i, (a, b) in enumerate(pairs, 1)
            ),
            byes=tuple(ev.ByeModel(player=pid, kind=kind, points=bye_points[kind]) for pid, kind in byes),
            engine_version=ENGINE_VERSION, source="engine",
        ))
        log.append(ev.RoundPublished(round=rnd))
        for pid, kind in byes:
            by_id[pid].score += bye_points[kind]
            by_id[pid].had_pairing_bye |= kind is ByeKind.PAIRING
        scoring = Scoring(created.scoring.win, created.scoring.draw, created.scoring.loss)
        for board, (a, b) in enumerate(pairs, 1):
            result = _result(a, b, rng, draw_rate, forfeit_rate)
            log.append(ev.ResultRecorded(round=rnd, board=board, result=result))
            a.score += scoring.points(result.outcome(Side.FIRST))
            b.score += scoring.points(result.outcome(Side.SECOND))
            if result.played:
                a.met.add(b.id)
                b.met.add(a.id)
                a.side_difference += 1
                b.side_difference -= 1
                a.last_side, b.last_side = Side.FIRST, Side.SECOND
    return log


def simulate_state(
    n_players: int,
    rounds_total: int,
    rounds_played: int,
    seed: int = 0,
    *,
    withdrawals: float = 0.01,
    requested_byes: float = 0.01,
    draw_rate: float = 0.3,
    forfeit_rate: float = 0.01,
    pair: PairFunction | None = None,
    name: str = "Simulated open",
    sides: bool = True,
) -> EventState:
    """The folded state of :func:`simulate_events` with the same arguments."""
    return fold(enumerate(simulate_events(
        n_players, rounds_total, rounds_played, seed,
        withdrawals=withdrawals, requested_byes=requested_byes, draw_rate=draw_rate,
        forfeit_rate=forfeit_rate, pair=pair, name=name, sides=sides,
    ), 1))
