"""Likely duplicate registrations are refused unless --allow-duplicates (issue 15, item 8)."""

from __future__ import annotations

from pathlib import Path

from pairings.store import EventStore
from tests.cli.conftest import refused, six_players


def count(event: Path) -> int:
    with EventStore.open(event) as store:
        return len(store.state.players)


def test_player_add_refuses_the_same_folded_name(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "club.pairings")
    refused(cli, event, "player", "add", event, "--name", "Ada Quince", "--rating", "1800",
            says="Ada Quince looks like Ada Quince (p1)")
    refused(cli, event, "player", "add", event, "--name", "  ÁDA   quince ", says="likely duplicate")
    ran = cli("player", "add", event, "--name", "Ada Quince", "--allow-duplicates")
    assert ran.code == 0 and count(event) == 7, ran


def test_importing_a_roster_twice_is_refused(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = tmp_path / "club.pairings"
    assert cli("new", event, "--name", "Club", "--rounds", "3").code == 0
    roster = tmp_path / "roster.csv"
    roster.write_text("name,rating\nAda Quince,1800\nBo Rill,1700\nCy Rill,1650\nDee Marsh,1500\n", encoding="utf-8")
    ran = cli("player", "import", event, roster)
    assert ran.code == 0 and ran.out.strip() == "imported 4 players; 4 registered", ran
    line = refused(cli, event, "player", "import", event, roster, says="4 likely duplicates")
    assert "and 1 more" in line and "--allow-duplicates registers them anyway" in line
    assert cli("player", "import", event, roster, "--allow-duplicates").code == 0
    assert count(event) == 8


def test_a_roster_repeating_a_row_is_refused(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = tmp_path / "club.pairings"
    assert cli("new", event, "--name", "Club", "--rounds", "3").code == 0
    roster = tmp_path / "roster.csv"
    roster.write_text("name\nEve Tarn\nFay Orrin\neve tarn\n", encoding="utf-8")
    refused(cli, event, "player", "import", event, roster, says="eve tarn looks like Eve Tarn")
