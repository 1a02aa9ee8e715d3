"""What `pair` and `publish` refuse, and what `swap` tells (issue 15, items 3, 6, 7, 18).

Decision for item 3: a bye, an absence, a withdrawal or a cancelled bye for a round already
drafted is recorded, and the draft is then *stale*: the confirmation says so, and `publish`
refuses it until the round is paired again (availability, H4, is never published broken).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from pairings.store import EventStore
from tests.cli.conftest import play_round, refused, six_players


@pytest.fixture
def event(tmp_path: Path, cli) -> Path:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "club.pairings")
    play_round(cli, event, "1-0", "1-0", "1-0")
    return event


@pytest.mark.parametrize("command", ["request-bye", "absent"])
def test_a_bye_for_a_drafted_round_makes_the_draft_stale(event: Path, cli, command: str) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    ran = cli("player", command, event, "Ada Quince")
    assert ran.code == 0
    assert "round 2" in ran.out and "the draft of round 2 is now out of date" in ran.out, ran.out
    refused(cli, event, "publish", event, says="Ada Quince is paired but has")
    assert cli("pair", event).code == 0
    assert cli("publish", event).code == 0
    with EventStore.open(event) as store:
        rnd = store.state.rounds[1]
    assert all("p1" not in (g.first, g.second) for g in rnd.games)
    assert cli("verify", event).code == 0


def test_a_cancelled_bye_makes_the_draft_stale(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("player", "request-bye", event, "Ada Quince", "--round", "2").code == 0
    assert cli("pair", event).code == 0
    ran = cli("player", "cancel-bye", event, "Ada Quince", "--round", "2")
    assert "out of date" in ran.out, ran
    refused(cli, event, "publish", event, says="Ada Quince has a requested bye in it, but none is announced")


def test_a_withdrawal_from_a_drafted_round_makes_it_stale(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    ran = cli("player", "withdraw", event, "Bo Rill")
    assert ran.out.startswith("Bo Rill withdrawn from round 2 on") and "out of date" in ran.out, ran
    refused(cli, event, "publish", event, says="Bo Rill is paired but cannot play")


def rematch_swap(cli, event: Path) -> str:  # type: ignore[no-untyped-def]
    """Round 2 is Cy-Ada, Dee-Eve, Bo-Fay; swapping Ada and Fay puts Cy against Fay again (round 1)."""
    assert cli("pair", event).code == 0
    ran = cli("swap", event, "Ada Quince", "Fay Orrin", "--reason", "travel")
    assert ran.code == 0, ran
    return str(ran.out)


def test_swap_says_its_cost_and_publish_wants_an_accepted_reason(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    out = rematch_swap(cli, event)
    # The cost against the optimum, in the engine's words (engine.compare, as the desk's override preview).
    assert "against the optimum: +1 rematch" in out
    assert "breaks a hard rule (H1: board 2: Fay Orrin and Cy Rill have met before)" in out
    refused(cli, event, "publish", event, says="breaks a hard rule the engine's pairing keeps")
    refused(cli, event, "publish", event, "--accept", says="--accept needs --reason")
    refused(cli, event, "publish", event, "--reason", "x", says="--reason goes with --accept")
    ran = cli("publish", event, "--accept", "--reason", "the players agreed")
    assert ran.out.strip() == \
        "round 2 published, breaking H1: board 2: Fay Orrin and Cy Rill have met before (accepted)", ran
    assert "round 2: hard-rule breach accepted (the players agreed): H1: board 2: Fay Orrin and Cy Rill" \
        in cli("log", event).out
    assert cli("result", event, "1", "1-0").code == 0
    ran = cli("verify", event)
    assert "breach: H1" in ran.out and "accepted the breaches when publishing: the players agreed" in ran.out
    # In the players' names, as the swap and publish lines say it (not "p6 and p3"), and "1 breach".
    assert "round 2: 1 breach\n  breach: H1: board 2: Fay Orrin and Cy Rill have met before" in ran.out
    assert ran.code == 0


def test_a_swap_that_breaks_no_hard_rule_publishes(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    ran = cli("swap", event, "Ada Quince", "Bo Rill", "--reason", "club rule")
    assert ran.code == 0 and "against the optimum:" in ran.out and "hard rule" not in ran.out, ran
    assert cli("publish", event).code == 0


def test_pair_over_an_override_needs_replace(event: Path, cli) -> None:  # type: ignore[no-untyped-def]
    rematch_swap(cli, event)
    refused(cli, event, "pair", event, says="give --replace to draft it again")
    assert cli("pair", event, "--replace").code == 0
    with EventStore.open(event) as store:
        assert store.state.rounds[-1].source == "engine"


def test_a_double_forfeit_asks_before_the_next_draft(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "ff.pairings")
    play_round(cli, event, "--", "1-0", "1-0")  # board 1: Ada Quince - Dee Marsh, neither came
    line = refused(cli, event, "pair", event, says="Ada Quince, Dee Marsh lost round 1 by double forfeit")
    assert "--keep NAME" in line and "player withdraw" in line
    refused(cli, event, "pair", event, "--keep", "Bo Rill", says="no double forfeit of theirs")
    refused(cli, event, "pair", event, "--keep", "Ada", says="Dee Marsh lost round 1")
    assert cli("player", "withdraw", event, "Dee Marsh").code == 0
    ran = cli("pair", event, "--keep", "Ada")
    assert ran.code == 0 and ran.out.startswith("Ada Quince stays in after the double forfeit of round 1\n"), ran
    assert "Ada Quince (p1) kept in the event after the double forfeit of round 1" in cli("log", event).out
    assert cli("pair", event).code == 0  # asked once: the decision is recorded
    with EventStore.open(event) as store:
        rnd = store.state.rounds[1]
    assert any("p1" in (g.first, g.second) for g in rnd.games)
    assert all("p4" not in (g.first, g.second) for g in rnd.games)


def test_an_unfinished_round_is_named_before_any_no_show(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "open.pairings")
    play_round(cli, event, "--")
    refused(cli, event, "pair", event, says="round 1 is not finished (2 boards without a result)")
