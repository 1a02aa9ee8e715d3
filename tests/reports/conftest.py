"""A small event full of hostile and international names, for the report tests."""

from __future__ import annotations

from datetime import datetime, timezone
from typing import Any

import pytest

from pairings import events as ev
from pairings.fold import fold
from pairings.state import EventState

NOW = datetime(2025, 5, 3, 14, 5, tzinfo=timezone.utc)
LONG = "Wendeline " + "Auberon-" * 36 + "Quist"          # 303 characters
NAMES = {
    "p1": "Zoë Ødegård",
    "p2": "Łucja Nowak",
    "p3": "<script>alert(1)</script>",
    "p4": '"><img src=x onerror=alert(1)>',
    "p5": "\u202eRTL Override\u202c Tamsin",
    "p6": "Kai 🐉 Mori",
    "p7": LONG,
    "p8": '=HYPERLINK("http://example.invalid","x")',
    "p9": "-5",
    "p10": "\x1b[31mRed\x1b[0m Ray [bold]Markup[/bold]",
    "p11": "@Odile +Ferrand",
}


def hostile_log(**settings: Any) -> list[Any]:
    """Round 1 complete (a forfeit, a pairing bye), round 2 published with board 3 still open;
    a prize category given by hand (p3, p5) and three prizes."""
    log: list[Any] = [ev.EventCreated(name=settings.pop("name", "Riverside <b>Spring</b> Open"), rounds=5, **settings)]
    log += [ev.PlayerRegistered(id=pid, name=name, rating=2000 - 50 * i if i % 3 else None)
            for i, (pid, name) in enumerate(NAMES.items())]
    r1 = [("p1", "p2", "1-0"), ("p3", "p4", "+-"), ("p5", "p6", "1/2-1/2"), ("p7", "p8", "0-1"), ("p9", "p10", "1-0")]
    r2 = [("p1", "p9", "1/2-1/2"), ("p8", "p3", "0-1"), ("p11", "p5", None), ("p6", "p7", "1-0"), ("p2", "p10", "1-0")]
    for number, games, bye in ((1, r1, "p11"), (2, r2, "p4")):
        log.append(ev.RoundDrafted(
            round=number,
            boards=tuple(ev.BoardModel(board=i, first=a, second=b, result=r) for i, (a, b, r) in enumerate(games, 1)),
            byes=(ev.ByeModel(player=bye, kind="pairing", points=1.0),),
        ))
        log.append(ev.RoundPublished(round=number))
    log += [ev.CategoryDefined(name="Juniors <i>U20</i>"), ev.CategoryMember(category="Juniors <i>U20</i>", player="p3"),
            ev.CategoryMember(category="Juniors <i>U20</i>", player="p5"),
            ev.PrizeSet(place=1, amount=10000), ev.PrizeSet(place=2, amount=5000),
            ev.PrizeSet(category="Juniors <i>U20</i>", place=1, amount=2500)]
    return log


def state_of(log: list[Any]) -> EventState:
    return fold(enumerate(log, 1))


@pytest.fixture
def hostile() -> EventState:
    return state_of(hostile_log())


@pytest.fixture
def now() -> datetime:
    return NOW


@pytest.fixture
def names() -> dict[str, str]:
    return dict(NAMES)


@pytest.fixture
def make_state() -> Any:
    """Build a variant of the hostile event: ``make_state(extra_events, **settings)``."""
    def make(extra: list[Any] | None = None, **settings: Any) -> EventState:
        return state_of(hostile_log(**settings) + list(extra or []))
    return make
