"""Every refused command: exit status 2, one line on stderr, the event file byte-for-byte unchanged."""

from __future__ import annotations

from pathlib import Path

import pytest

from tests.cli.conftest import file_bytes


@pytest.fixture
def event(tmp_path: Path, cli) -> Path:  # type: ignore[no-untyped-def]
    path = tmp_path / "club.pairings"
    assert cli("new", path, "--name", "Thursday Rapid", "--rounds", "3", "--seed", "1").code == 0
    for name, rating in (("Ada Quince", 1800), ("Bo Rill", 1700), ("Cy Rill", 1650), ("Dee Marsh", 1500)):
        assert cli("player", "add", path, "--name", name, "--rating", str(rating)).code == 0
    return path


def refused(cli, path: Path, *args: object, says: str) -> None:  # type: ignore[no-untyped-def]
    before = file_bytes(path)
    ran = cli(*args)
    assert ran.code == 2, ran
    lines = ran.err.strip().splitlines()
    assert len(lines) == 1 and says in lines[0], ran.err
    assert file_bytes(path) == before


def test_negative_rounds(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    path = tmp_path / "x.pairings"
    refused(cli, path, "new", path, "--name", "X", "--rounds", "-3", says="rounds")
    assert not path.exists()


def test_unknown_and_ambiguous_player(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "player", "withdraw", event, "Nobody Here", says="no player")
    refused(cli, event, "player", "withdraw", event, "Rill", says="matches 2 players")


def test_result_before_any_round(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "result", event, "1", "1-0", says="no round has been published")


def test_unknown_result_code(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "result", event, "1", "2-0", says="unknown result")


def test_publish_without_draft(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "publish", event, says="no draft")


def test_unknown_option_and_missing_file(event: Path, tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "pair", event, "--fast", says="unrecognized arguments")
    missing = tmp_path / "missing.pairings"
    refused(cli, missing, "pair", missing, says="no such event file")
    assert not missing.exists()


def test_not_an_event_file(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    roster = tmp_path / "roster.csv"
    roster.write_text("name\nAda\n")
    refused(cli, roster, "pair", roster, says="not an event file")


def test_duplicate_id_and_bad_rating(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "player", "add", event, "--name", "Eve", "--id", "p1", says="already taken")
    refused(cli, event, "player", "add", event, "--name", "Eve", "--rating", "abc", says="invalid int")
    refused(cli, event, "player", "add", event, "--name", "   ", says="name is empty")


def test_roster_with_bad_rows_imports_nothing(event: Path, tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    roster = tmp_path / "roster.csv"
    roster.write_text("Name;Rating;ID\nFay Orrin;1600;f1\n;1500;\nGus Penn;strong;\nHal Ives;1400;f1\n", encoding="utf-8")
    before = file_bytes(event)
    ran = cli("player", "import", event, roster)
    assert ran.code == 2
    assert "line 3: name is missing" in ran.err
    assert "line 4: rating 'strong' is not a number" in ran.err
    assert "line 5: id 'f1' repeats line 2" in ran.err
    assert file_bytes(event) == before


def test_forfeit_codes_are_not_options(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    assert cli("publish", event).code == 0
    assert cli("result", event, "1", "-+").code == 0
    ran = cli("result", event, "2", "--")
    assert ran.code == 0 and "round complete" in ran.out, ran


def test_round_lifecycle_refusals(event: Path, cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    refused(cli, event, "result", event, "1", "1-0", says="no round has been published")
    refused(cli, event, "result", event, "1", "1-0", "--round", "1", says="not published")
    # a player registered after the draft makes it out of date: publishing it would leave them out
    assert cli("player", "add", event, "--name", "Late Comer", "--rating", "1400").code == 0
    refused(cli, event, "publish", event, says="out of date")
    assert cli("pair", event).code == 0
    assert cli("publish", event).code == 0
    refused(cli, event, "pair", event, says="not finished")
    refused(cli, event, "result", event, "9", "1-0", says="has no board 9")
    assert cli("result", event, "1", "1-0").code == 0
    refused(cli, event, "result", event, "1", "0-1", says="already has 1-0")
    refused(cli, event, "result", event, "1", "1-0", "--round", "4", says="does not exist")


def test_verify_reports_a_clean_event(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    assert cli("publish", event).code == 0
    ran = cli("verify", event)
    assert ran.code == 0, ran
    assert "hash chain: ok" in ran.out
    assert "Berge" in ran.out


@pytest.mark.parametrize("args", [
    ("log", "{nul}"), ("player", "import", "{event}", "{nul}"), ("restore", "{nul}", "{new}"),
    ("restore", "{event}", "{nul}"), ("publish-web", "{event}", "{nul}"),
    ("print", "{event}", "names", "-o", "{nul}"), ("demo", "--no-desk", "--file", "{nul}"),
])
def test_nul_byte_in_a_path(event: Path, tmp_path: Path, cli, args: tuple[str, ...]) -> None:  # type: ignore[no-untyped-def]
    filled = [a.format(nul=f"{tmp_path}/bad\x00name", event=event, new=tmp_path / "new.pairings") for a in args]
    refused(cli, event, *filled, says="a path cannot contain a NUL byte")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["club.pairings"]
