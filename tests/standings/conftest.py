"""Builders of small events for the standings tests (states come from folded event logs)."""

from __future__ import annotations

from typing import Any, Callable

import pytest

from pairings import events as ev
from pairings.fold import fold
from pairings.state import EventState

Games = list[tuple[str, str, str | None]]
Byes = list[tuple[str, str, float]]


def build_state(
    players: list[tuple[str, str, int | None]],
    rounds: list[tuple[Games, Byes]],
    *,
    drafts: int = 0,
    extra: dict[int, list[ev._Event]] | None = None,
    **settings: Any,
) -> EventState:
    """Fold an event: ``players`` as (id, name, rating); each round as (games, byes).

    ``extra[r]`` holds events appended before round ``r`` is drafted (withdrawals...);
    the last ``drafts`` rounds stay unpublished drafts.
    """
    log: list[Any] = [ev.EventCreated(name=settings.pop("name", "Test Open"), rounds=settings.pop("total", len(rounds) or 1), **settings)]
    log += [ev.PlayerRegistered(id=pid, name=name, rating=rating) for pid, name, rating in players]
    for number, (games, byes) in enumerate(rounds, 1):
        log += (extra or {}).get(number, [])
        log.append(ev.RoundDrafted(
            round=number,
            boards=tuple(ev.BoardModel(board=i, first=a, second=b, result=r) for i, (a, b, r) in enumerate(games, 1)),
            byes=tuple(ev.ByeModel(player=p, kind=k, points=x) for p, k, x in byes),
        ))
        if number <= len(rounds) - drafts:
            log.append(ev.RoundPublished(round=number))
    return fold(enumerate(log, 1))


@pytest.fixture
def build() -> Callable[..., EventState]:
    return build_state
