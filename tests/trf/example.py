"""The small event of the report-file tests, built event by event (invented players and place)."""

from __future__ import annotations

from pairings import events as ev
from pairings.fold import fold
from pairings.state import ByeKind, EventState, Result, System


def _player(n: int, name: str, rating: int, sex: str, title: str | None, fed: str, birth: str) -> ev.PlayerRegistered:
    details = ev.PlayerDetailsModel(title=title, federation=fed, fide_id=f"990000{n}{n}", birth=birth, sex=sex,  # type: ignore[arg-type]
                                    ratings={"fide": rating})
    return ev.PlayerRegistered(id=f"p{n}", name=name, rating=rating, details=details)


def _round(number: int, boards: list[tuple[str, str, Result]], byes: list[tuple[str, ByeKind, float]]) -> list[ev.Event]:
    return [
        ev.RoundDrafted(round=number, source="restored",
                        boards=tuple(ev.BoardModel(board=i, first=a, second=b, result=r)
                                     for i, (a, b, r) in enumerate(boards, 1)),
                        byes=tuple(ev.ByeModel(player=p, kind=k, points=pts) for p, k, pts in byes)),
        ev.RoundPublished(round=number),
    ]


def spring_open_events() -> list[ev.Event]:
    """Five players, three rounds: every kind of entry of a 001 record but H and F (see the test)."""
    out: list[ev.Event] = [
        ev.EventCreated(name="Example Spring Open", rounds=3, system=System.DUTCH, seed=0,
                        tiebreaks=("sonneborn_berger",), city="Springfield", federation="ENG",
                        start_date="2026-04-03", end_date="2026-04-05", chief_arbiter="IA Jane Arbiter",
                        time_control="90 min for 40 moves + 30 min, 30 s per move from move 1",
                        round_dates=("2026-04-03", "2026-04-04", "2026-04-05")),
        _player(1, "Alder, Ann", 2310, "f", "WGM", "NOR", "1995-02-14"),
        _player(2, "Birch, Bob", 2205, "m", "FM", "DEN", "2001-07-30"),
        _player(3, "Cedar, Carl", 2050, "m", None, "SWE", "1988-11-02"),
        _player(4, "Dogwood, Dana", 1980, "f", None, "FIN", "2008-03-09"),
        _player(5, "Elm, Eric", 1725, "m", None, "ISL", "2010-12-24"),
    ]
    out += _round(1, [("p1", "p3", Result.FIRST_WINS), ("p4", "p2", Result.DRAW)], [("p5", ByeKind.PAIRING, 1.0)])
    out += _round(2, [("p5", "p1", Result.SECOND_WINS), ("p2", "p3", Result.FIRST_WINS)],
                  [("p4", ByeKind.PAIRING, 1.0)])
    out += _round(3, [("p1", "p2", Result.DRAW), ("p5", "p4", Result.SECOND_WINS_BY_FORFEIT)],
                  [("p3", ByeKind.ABSENCE, 0.0)])
    return out


def spring_open() -> EventState:
    return fold(enumerate(spring_open_events(), 1))
