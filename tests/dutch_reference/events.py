"""Random small Dutch-system events, played round by round along the product's drafts.

Each event (seeded): 4-14 players (ratings with ties, a few unrated and titled,
late entries), every round to the last, with draws, forfeits (``+-``, ``-+``,
``--``), requested byes, absences and withdrawals; one in ten events scores
3-1-0, one in seven does not count a forfeited pairing as a meeting, one in ten
gives a win's points for a requested bye, one in ten has a do-not-pair entry, and
about one in seven standard-scored events is accelerated (Baku). Before each round the
``compare`` callback gets the folded state; the event continues with the
product's draft (its public entry point ``draft_round``).
"""

from __future__ import annotations

import random
from dataclasses import dataclass
from typing import Callable

from pairings import events as ev
from pairings.engine import Draft, draft_round
from pairings.errors import NoPairingError
from pairings.fold import fold
from pairings.state import Acceleration, ByeKind, EventState, Result, System

_SYLLABLES = ("ka", "ro", "mel", "tin", "sa", "bor", "li", "vek", "du", "nar", "ose", "pim")
_TITLES = ("GM", "IM", "FM", "WGM", "CM", "WIM")


@dataclass
class RoundCheck:
    seed: int
    round: int
    state: EventState
    draft: Draft | None
    """None when the product refused to pair."""


def _name(rng: random.Random, i: int) -> str:
    return "".join(rng.choice(_SYLLABLES) for _ in range(3)).capitalize() + f" {chr(65 + i % 26)}"


def _result(rng: random.Random) -> Result:
    u = rng.random()
    if u < 0.06:
        return rng.choice((Result.FIRST_WINS_BY_FORFEIT, Result.SECOND_WINS_BY_FORFEIT, Result.DOUBLE_FORFEIT))
    if u < 0.36:
        return Result.DRAW
    return Result.FIRST_WINS if u < 0.68 else Result.SECOND_WINS


def play_event(seed: int, check: Callable[[RoundCheck], None], players: tuple[int, int] = (4, 14),
               most_rounds: int = 8) -> int:
    """Play event ``seed`` to its last round (or until the product refuses a round); returns rounds checked."""
    rng = random.Random(seed)
    n = rng.randint(*players)
    rounds = rng.randint(3, max(3, min(n - 1, most_rounds)))
    # now and then: 3-1-0 scoring, forfeits that are no meeting, full-point requested byes
    scoring = ev.ScoringModel(win=3.0, draw=1.0, loss=0.0) if rng.random() < 0.1 else ev.ScoringModel()
    forfeit_is_meeting = rng.random() >= 0.15
    requested = scoring.win if rng.random() < 0.1 else scoring.draw
    # one in seven standard-scored events is accelerated (Baku); its field is whole in round 1
    baku = scoring.win == 1.0 and rng.random() < 0.15
    log: list[ev.Event] = [ev.EventCreated(
        name=f"Reference check {seed}", rounds=rounds, system=System.DUTCH, seed=seed, scoring=scoring,
        bye_points=scoring.win, requested_bye_points=requested, forfeit_is_meeting=forfeit_is_meeting,
        acceleration=Acceleration.BAKU if baku else Acceleration.NONE)]
    for i in range(n):
        rating = None if rng.random() < 0.08 else rng.choice((1500, 1600, 1700)) if rng.random() < 0.2 \
            else rng.randint(1200, 2400)
        title = rng.choice(_TITLES) if rng.random() < 0.1 else None
        late = rng.random() < 0.1 and not baku
        log.append(ev.PlayerRegistered(
            id=f"p{i + 1}", name=_name(rng, i), rating=rating,
            entry_round=rng.randint(2, min(3, rounds)) if late else 1,
            details=ev.PlayerDetailsModel(title=title) if title else None,
        ))
    if rng.random() < 0.1:  # a do-not-pair entry, kept as absolutely as a meeting
        x, y = rng.sample(range(1, n + 1), 2)
        log.append(ev.PairForbidden(a=f"p{x}", b=f"p{y}", reason="same family"))
    withdrawn: set[str] = set()
    checked = 0
    for rnd in range(1, rounds + 1):
        for i in range(n):
            pid = f"p{i + 1}"
            if pid in withdrawn:
                continue
            if rnd > 1 and rng.random() < 0.03:
                withdrawn.add(pid)
                log.append(ev.PlayerWithdrawn(player=pid, from_round=rnd))
            elif rng.random() < 0.05 and not (baku and rnd == 1):
                kind = ByeKind.ABSENCE if rng.random() < 0.3 else ByeKind.REQUESTED
                log.append(ev.ByeRequested(player=pid, round=rnd, kind=kind))  # type: ignore[arg-type]
        state = fold(enumerate(log, 1))
        if len(state.available(rnd)) < 2:
            return checked
        try:
            draft: Draft | None = draft_round(state)
        except NoPairingError:
            draft = None
        check(RoundCheck(seed, rnd, state, draft))
        checked += 1
        if draft is None:
            return checked
        log.append(ev.RoundDrafted(
            round=rnd,
            boards=tuple(ev.BoardModel(board=b.board, first=b.first, second=b.second, cost={})
                         for b in draft.boards),
            byes=tuple(ev.ByeModel(player=b.player, kind=b.kind, points=b.points) for b in draft.byes),
            engine_version=draft.engine_version, source="engine",
        ))
        log.append(ev.RoundPublished(round=rnd))
        for b in draft.boards:
            log.append(ev.ResultRecorded(round=rnd, board=b.board, result=_result(rng)))
    return checked


def hand_event(rounds: int, n: int, history: list[list[tuple[int, int, str]]], seed: int = 0,
               pab: dict[int, int] | None = None, requested: dict[int, list[int]] | None = None,
               absent: dict[int, list[int]] | None = None) -> EventState:
    """A hand-written Dutch event: players p1..pn numbered by rating (p1 highest), then
    ``history[r]`` = round r+1's boards as (white, black, result code); ``pab`` round -> player,
    ``requested`` (half-point byes) and ``absent`` round -> players (also for the round to draft)."""
    log: list[ev.Event] = [ev.EventCreated(name="Hand case", rounds=rounds, system=System.DUTCH, seed=seed)]
    for i in range(1, n + 1):
        log.append(ev.PlayerRegistered(id=f"p{i}", name=f"Player {i:02d}", rating=2500 - 10 * i))
    asked: dict[int, list[tuple[int, ByeKind, float]]] = {}
    for kind, points, table in ((ByeKind.REQUESTED, 0.5, requested), (ByeKind.ABSENCE, 0.0, absent)):
        for r, players in (table or {}).items():
            for p in players:
                log.append(ev.ByeRequested(player=f"p{p}", round=r, kind=kind))  # type: ignore[arg-type]
                asked.setdefault(r, []).append((p, kind, points))
    for r, boards in enumerate(history, 1):
        byes = [(pab[r], ByeKind.PAIRING, 1.0)] if pab and r in pab else []
        log.append(ev.RoundDrafted(
            round=r, boards=tuple(ev.BoardModel(board=b, first=f"p{w}", second=f"p{k}", cost={})
                                  for b, (w, k, _) in enumerate(boards, 1)),
            byes=tuple(ev.ByeModel(player=f"p{p}", kind=kind, points=pts) for p, kind, pts in byes + asked.get(r, [])),
            engine_version="hand", source="engine"))
        log.append(ev.RoundPublished(round=r))
        for b, (_, _, res) in enumerate(boards, 1):
            log.append(ev.ResultRecorded(round=r, board=b, result=Result.parse(res)))
    return fold(enumerate(log, 1))
