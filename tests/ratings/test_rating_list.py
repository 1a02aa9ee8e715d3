"""Rating lists: the FIDE download layout (fixed-width text, as remembered) and a national CSV list."""

from __future__ import annotations

from pathlib import Path

import pytest

from pairings import events as ev
from pairings.errors import RatingListError
from pairings.fold import fold
from pairings.ratinglist import plan_update, scan_fide, scan_national, update_events
from pairings.state import EventState, PlayerId, Result

# The FIDE list's fields and widths as remembered (from memory, low confidence): each field starts
# under its heading. Written out here by hand, independently of the reader's table.
WIDTHS = (("ID Number", 15), ("Name", 61), ("Fed", 4), ("Sex", 4), ("Tit", 5), ("WTit", 5), ("OTit", 15),
          ("FOA", 4), ("SRtng", 6), ("SGm", 4), ("SK", 3), ("RRtng", 6), ("RGm", 4), ("Rk", 3), ("BRtng", 6),
          ("BGm", 4), ("BK", 3), ("B-day", 6), ("Flag", 4))
HEADING = "".join(name.ljust(width) for name, width in WIDTHS).rstrip()


def fide_line(*values: str) -> str:
    return "".join(v.ljust(w) for v, (_, w) in zip(values, WIDTHS)).rstrip()


LIST = [
    HEADING,
    fide_line("1001", "Alder, Ann", "NOR", "F", "FM", "WGM", "", "", "2210", "9", "20", "2150", "0", "20", "2100",
              "0", "20", "1999", ""),
    fide_line("1002", "Birch, Bob", "DEN", "M", "", "", "", "", "21x0", "0", "20", "", "", "", "", "", "", "2001"),
    fide_line("1003", "Cedar, Carl", "SWE", "M", "", "", "", "", "2050", "0", "20", "", "", "", "", "", "", "1988"),
    "1004           Short",
    fide_line("1003", "Cedar, Carla", "SWE", "F", "", "", "", "", "1900", "0", "20"),
    fide_line("1005", "Oakridge, Erin", "FIN", "F", "", "", "", "", "1875", "0", "40", "", "", "", "", "", "", "2009"),
    fide_line("1006", "Nobody, Not", "ISL", "M", "", "", "", "", "1500", "0", "40", "", "", "", "", "", "", "2012"),
    fide_line("1007", "Pine, Pat", "ISL", "M", "", "", "", "", "1600", "0", "20", "1700", "0", "20", "", "", "", "1970"),
]


def _events(published: bool = False) -> list[ev.Event]:
    def reg(pid: str, name: str, fide_id: str | None, rating: int | None = 1500) -> ev.PlayerRegistered:
        return ev.PlayerRegistered(id=pid, name=name, rating=rating, club="Lakeside",
                                   details=ev.PlayerDetailsModel(fide_id=fide_id, categories=("local",)))
    events: list[ev.Event] = [
        ev.EventCreated(name="List Open", rounds=3, seed=0),
        reg("a", "Ann Alder", "1001"), reg("b", "Bob Birch", "1002"), reg("c", "Carl Cedar", "1003"),
        reg("e", "Erin Oakridge", None, None), reg("x", "Xan Away", "1009"), reg("p", "Pat Pine", "1007"),
    ]
    if published:
        events += [ev.RoundDrafted(round=1, source="restored", boards=(
            ev.BoardModel(board=1, first="a", second="b", result=Result.DRAW),)), ev.RoundPublished(round=1)]
    return events


def _event(published: bool = False) -> EventState:
    return fold(enumerate(_events(published), 1))


def test_reads_the_published_layout_and_reports_bad_lines() -> None:
    state = _event()
    found = scan_fide(iter(line + "\n" for line in LIST), state)
    plan = plan_update(state, found)
    report = plan.report()
    assert report[0] == "read 8 list lines; 2 players updated from the fide list"
    assert "problem: line 3: rating '21x0' is not a number" in report
    assert "problem: line 6: ID 1003 also on line 4: neither is used" in report
    assert "problem: 1 short line skipped: line 5" in report
    assert any(line.startswith("name match (not applied; --accept-names applies it): Erin Oakridge = Oakridge, "
                               "Erin, ID 1005, rating 1875 (line 7)") for line in report)
    assert "not found: Xan Away" in report
    assert [c.player for c in plan.changes] == ["a", "p"]
    events = update_events(state, plan)
    after = fold(enumerate([*_events(), *events], 1))
    alder = after.players[PlayerId("a")]
    assert alder.rating == 2210 and alder.club == "Lakeside"
    assert alder.details.title == "FM" and alder.details.federation == "NOR" and alder.details.birth == "1999"
    assert alder.details.sex == "f" and dict(alder.details.ratings) == {"fide": 2210}
    assert alder.details.categories == ("local",)
    assert after.players[PlayerId("b")].rating == 1500  # its bad line: left as it was


def test_name_matches_applied_on_request_and_the_heading_is_optional() -> None:
    events = [*_events(), ev.PlayerRegistered(id="v", name="Jan van Dijk", rating=1500)]
    state = fold(enumerate(events, 1))
    listed = [*LIST[1:], fide_line("1010", "van Dijk, Jan", "NED", "M", "", "", "", "", "1990", "0", "20")]
    found = scan_fide(iter(listed), state)  # no heading line: the remembered positions
    plan = plan_update(state, found, accept_names=True)
    assert sorted(c.player for c in plan.changes) == ["a", "e", "p", "v"]  # a surname of two words too
    after = fold(enumerate([*events, *update_events(state, plan)], 1))
    erin = after.players[PlayerId("e")]
    assert erin.details.fide_id == "1005" and erin.rating == 1875 and erin.details.birth == "2009"


def test_rapid_list_and_keep_rating() -> None:
    state = _event()
    plan = plan_update(state, scan_fide(iter(LIST), state, "rapid"), keep_rating=True)
    after = fold(enumerate([*_events(), *update_events(state, plan)], 1))
    pine = after.players[PlayerId("p")]
    assert pine.rating == 1500 and dict(pine.details.ratings) == {"fide-rapid": 1700}


def test_refused_after_round_1_unless_forced_with_a_reason() -> None:
    state = _event(published=True)
    plan = plan_update(state, scan_fide(iter(LIST), state))
    with pytest.raises(RatingListError, match="round 1 is already published"):
        update_events(state, plan)
    events = update_events(state, plan, force=True, reason="list published late")
    assert events and all(isinstance(e, ev.PlayerEdited) and e.reason == "list published late" for e in events)


def test_a_heading_without_a_known_column_is_refused() -> None:
    with pytest.raises(RatingListError, match="line 1: the heading has no 'SRtng' column"):
        scan_fide(iter([HEADING.replace("SRtng", "Std  "), *LIST[1:]]), _event())


def test_national_list_in_csv() -> None:
    def reg(pid: str, name: str, national: str | None) -> ev.PlayerRegistered:
        return ev.PlayerRegistered(id=pid, name=name, rating=1400,
                                   details=ev.PlayerDetailsModel(national_id=national, fide_id="1001"))
    events: list[ev.Event] = [ev.EventCreated(name="Club Cup", rounds=3, seed=0), reg("a", "Ann Alder", "N-1"),
                              reg("b", "Bob Birch", "N-2"), reg("c", "Cy Cork", None)]
    state = fold(enumerate(events, 1))
    text = ["ID,Name,Rating,Birth,Sex", "N-1,\"Alder, Ann\",1650,1999,f", "N-2,\"Birch, Bob\",abc,2001,m",
            "N-9", "N-3,\"Cork, Cy\",1320,2011,m"]
    plan = plan_update(state, scan_national(iter(text), state))
    report = plan.report()
    assert "problem: line 3: rating 'abc' is not a number" in report
    assert "problem: 1 short line skipped: line 4" in report
    assert [c.player for c in plan.changes] == ["a"] and [c.player for c in plan.offers] == ["c"]
    after = fold(enumerate([*events, *update_events(state, plan)], 1))
    alder = after.players[PlayerId("a")]
    assert alder.rating == 1650 and dict(alder.details.ratings) == {"national": 1650}
    assert alder.details.fide_id == "1001" and alder.details.national_id == "N-1"


def test_cli_ratings_update(capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
    from pairings.cli import main
    from pairings.store import EventStore

    path, listed = tmp_path / "e.pairings", tmp_path / "players_list.txt"
    EventStore.create_from(path, _events(published=True)).close()
    listed.write_text("\n".join(LIST) + "\n", encoding="utf-8")
    before = path.read_bytes()
    assert main(["ratings", "update", str(path), str(listed)]) == 2
    assert "round 1 is already published" in capsys.readouterr().err and path.read_bytes() == before
    assert main(["ratings", "update", str(path), str(listed), "--force"]) == 2
    capsys.readouterr()
    assert main(["ratings", "update", str(path), str(listed), "--force", "--reason", "late list",
                 "--accept-names"]) == 0
    out = capsys.readouterr().out
    assert "3 players updated" in out and "not found: Xan Away" in out
    assert main(["log", str(path)]) == 0
    assert "(late list)" in capsys.readouterr().out


def test_the_benchmark_list_is_in_the_layout_and_every_player_is_found() -> None:
    """The bench's generated list (not timed here: speed lives in ``python -m pairings.bench``)."""
    from pairings.bench import bench_rating_list

    line = bench_rating_list(3_000, 200, seed=5)
    assert "rating list: 3,000 lines" in line and "200 players" in line and ", 200 matched," in line
