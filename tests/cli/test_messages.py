"""The command line's wording (issue 15, items 19 and 23): exact reasons, names and rounds, not ids."""

from __future__ import annotations

from pathlib import Path

import pytest

from tests.cli.conftest import file_bytes, play_round, refused, six_players


@pytest.fixture
def event(tmp_path: Path, cli) -> Path:  # type: ignore[no-untyped-def]
    return six_players(cli, tmp_path / "club.pairings")


def test_refusals_say_what_is_wrong(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, event, "player", "absent", event, "Ada", "--round", "0", says="round 0 does not exist")
    refused(cli, event, "player", "withdraw", event, "Ada", "--round", "0", says="round 0 does not exist")
    refused(cli, event, "player", "request-bye", event, "Ada", "--round", "6", says="round 6 does not exist")
    play_round(cli, event, "1-0", "1-0", "1-0")
    refused(cli, event, "result", event, "1", "0-1", says="give --correct to change it")
    assert cli("pair", event).code == 0
    refused(cli, event, "swap", event, "p1", "Ada Quince", "--reason", "x", says="are the same player (Ada Quince)")


def test_a_repeated_forbid_writes_nothing(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    ran = cli("forbid", event, "Ada", "Bo", "--until", "3")
    assert ran.out.strip() == "Ada Quince and Bo Rill will not be paired up to round 3", ran
    refused(cli, event, "forbid", event, "Bo", "Ada", "--until", "2", says="already on the do-not-pair list")
    assert cli("forbid", event, "Bo", "Ada").code == 0  # a longer entry is new
    refused(cli, event, "forbid", event, "Ada", "Bo", says="already on the do-not-pair list")


def test_confirmations_speak_in_names_and_rounds(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("player", "request-bye", event, "p1", "--round", "2").out.strip() == \
        "Ada Quince is on a requested bye in round 2"
    assert cli("player", "absent", event, "p2").out.strip() == "Bo Rill is absent in round 1"
    assert cli("player", "cancel-bye", event, "p2").out.strip() == "Bo Rill: the bye in round 1 is cancelled"
    assert cli("player", "withdraw", event, "p3", "--round", "2").out.strip() == "Cy Rill withdrawn from round 2 on"
    assert cli("player", "reinstate", event, "p3").out.strip() == "Cy Rill is back in from round 1"
    assert cli("player", "edit", event, "p4", "--name", "Dee Marsh-Lee").out.strip() == "edited Dee Marsh-Lee"
    assert cli("player", "add", event, "--name", "Gus Penn").out.strip() == "registered Gus Penn as p7"
    play_round(cli, event, "1-0", "1-0", "1-0")
    assert cli("player", "add", event, "--name", "Hal Ives").out.strip() == \
        "registered Hal Ives as p8, plays from round 2"
    assert cli("pair", event).code == 0
    assert cli("discard", event).out.strip() == "the draft of round 2 is discarded"


def test_verify_counts_boards_and_the_bye_apart_and_says_why_it_skips_the_optimum(  # type: ignore[no-untyped-def]
    tmp_path: Path, cli
) -> None:
    event = six_players(cli, tmp_path / "odd.pairings")
    assert cli("player", "add", event, "--name", "Gus Penn", "--rating", "1200").code == 0
    assert cli("pair", event).code == 0
    assert cli("swap", event, "Ada Quince", "Bo Rill", "--reason", "club rule").code == 0
    before = file_bytes(event)
    out = cli("verify", event).out
    assert "3 legal boards and a legal pairing bye pair every player" in out, out
    assert "optimum not checked: the organiser changed this round (swap Ada Quince and Bo Rill: club rule)" in out
    assert file_bytes(event) == before


def test_unpublish_says_how_to_clear_the_results(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    play_round(cli, event, "1-0", "1-0", "1-0")
    refused(cli, event, "unpublish", event, "--reason", "wrong roster",
            says="round 1 already has results; clear them first (result EVENT BOARD clear --correct;")
    for board in ("1", "2", "3"):
        assert cli("result", event, board, "clear", "--correct").code == 0
    assert cli("unpublish", event, "--reason", "wrong roster").code == 0


def test_swapping_two_players_of_one_board_names_them(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    from pairings.store import EventStore

    assert cli("pair", event).code == 0
    with EventStore.open(event) as store:
        game = store.state.rounds[-1].games[0]
        a, b = store.state.players[game.first].name, store.state.players[game.second].name
    refused(cli, event, "swap", event, a, b, "--reason", "x", says=f"{a} and {b} already play each other")
