"""Player details on `player add` / `player edit`: stored, shown, cleared, and refused with one line."""

from __future__ import annotations

from pathlib import Path

import pytest

from pairings.state import PlayerDetails
from pairings.store import EventStore
from tests.cli.conftest import file_bytes


def _event(cli, tmp_path: Path) -> Path:  # type: ignore[no-untyped-def]
    event = tmp_path / "e.pairings"
    assert cli("new", event, "--name", "Heath Open", "--rounds", "5", "--seed", "3").code == 0
    return event


def _details(event: Path, pid: str = "p1") -> PlayerDetails:
    with EventStore.open(event) as store:
        return store.state.players[pid].details  # type: ignore[index]


def test_add_and_edit_with_every_detail(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path)
    ran = cli("player", "add", event, "--name", "Tamsin Greaves", "--rating", "2105", "--title", "wim",
              "--federation", "sco", "--fide-id", "4400123", "--national-id", "SC-991", "--birth", "1998-06-30",
              "--sex", "F", "--rating-list", "fide=2105", "--rating-list", "national=2150",
              "--categories", "women, u25")
    assert ran.code == 0, ran.err
    assert _details(event) == PlayerDetails(
        title="WIM", federation="SCO", fide_id="4400123", national_id="SC-991", birth="1998-06-30", sex="f",
        ratings=(("fide", 2105), ("national", 2150)), categories=("women", "u25"),
    )
    listed = cli("player", "list", event).out
    assert "WIM" in listed and "SCO" in listed

    ran = cli("player", "edit", event, "Tamsin", "--federation", "ENG", "--rating-list", "national=",
              "--title", "", "--birth", "1998")
    assert ran.code == 0, ran.err
    d = _details(event)
    assert (d.title, d.federation, d.birth, d.ratings, d.fide_id) == (None, "ENG", "1998", (("fide", 2105),), "4400123")
    assert cli("player", "edit", event, "p1", "--categories", "").code == 0
    assert _details(event).categories == ()


@pytest.mark.parametrize(
    ("args", "says"),
    [
        (["--title", "XM"], "title 'XM'"),
        (["--federation", "ENGL"], "three-letter code"),
        (["--fide-id", "12a"], "digits only"),
        (["--birth", "1998-13-01"], "a year (1987) or a date"),
        (["--birth", "1850"], "not a plausible year"),
        (["--sex", "x"], "use m or f"),
        (["--rating-list", "fide"], "must be LIST=N"),
        (["--rating-list", "fide=5000"], "outside 0-4000"),
        (["--categories", "a\x01b"], "control characters"),
    ],
)
def test_bad_details_are_refused(cli, tmp_path: Path, args: list[str], says: str) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path)
    assert cli("player", "add", event, "--name", "Tamsin Greaves").code == 0
    before = file_bytes(event)
    for command in (["player", "add", event, "--name", "Other"], ["player", "edit", event, "p1"]):
        ran = cli(*command, *args)
        assert ran.code == 2 and says in ran.err and ran.err.count("\n") == 1, ran.err
    assert file_bytes(event) == before


def test_import_warns_about_columns_it_does_not_read(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path)
    roster = tmp_path / "roster.tsv"
    roster.write_text("Name\tElo\tFed\tShirt size\nAda Quince\t1500.0\tWLS\tM\n", encoding="utf-8")
    ran = cli("player", "import", event, roster)
    assert ran.code == 0, ran.err
    assert "warning: column 4 ('Shirt size') is not read" in ran.err
    with EventStore.open(event) as store:
        (p,) = store.state.players.values()
    assert (p.rating, p.details.federation) == (1500, "WLS")
