"""Correcting a result of an earlier round after later rounds were paired on it (issue 15, item 2).

The general handling rules (FIDE Handbook C.04.2, from memory): a wrongly recorded result is
corrected, and the correction affects only the pairings yet to be made.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from pairings.engine import verify_round
from pairings.store import EventStore
from tests.cli.conftest import file_bytes, play_round, refused, six_players


@pytest.fixture
def two_rounds(tmp_path: Path, cli) -> Path:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "club.pairings")
    play_round(cli, event, "1-0", "1-0", "1-0")
    play_round(cli, event, "1-0", "1-0", "1-0")
    return event


def points(cli, event: Path) -> dict[str, float]:  # type: ignore[no-untyped-def]
    return {row["name"]: row["points"] for row in json.loads(cli("standings", event, "--format", "json").out)}


def test_an_earlier_result_is_corrected_and_the_later_round_kept(two_rounds: Path, cli) -> None:  # type: ignore[no-untyped-def]
    before = points(cli, two_rounds)
    refused(cli, two_rounds, "result", two_rounds, "2", "0-1", "--round", "1", "--correct",
            says="give --reason TEXT to correct it")
    ran = cli("result", two_rounds, "2", "0-1", "--round", "1", "--correct", "--reason", "scoresheet misread")
    assert ran.code == 0, ran
    assert "round 2 stays as paired on the old score" in ran.out
    after = points(cli, two_rounds)
    # Round 1 board 2 was Eve Tarn - Bo Rill, 1-0; now Bo Rill won it.
    assert after["Eve Tarn"] == before["Eve Tarn"] - 1 and after["Bo Rill"] == before["Bo Rill"] + 1
    with EventStore.open(two_rounds) as store:
        state = store.state
    assert len(state.rounds) == 2 and all(g.result is not None for g in state.rounds[1].games)
    assert state.rounds[1].paired_before == ("round 1 board 2: 1-0 → 0-1 (scoresheet misread)",)
    assert "corrected to 0-1 (scoresheet misread); round 2 paired on the old score" in cli("log", two_rounds).out

    # On the corrected scores round 2 is no longer the optimum; verify checks it on the scores it was paired on.
    assert verify_round(state, 2).optimal is False
    ran = cli("verify", two_rounds)
    assert ran.code == 0, ran.out
    assert "round 2: ok" in ran.out and "paired on scores since corrected" in ran.out


def test_an_earlier_result_cannot_be_cleared(two_rounds: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, two_rounds, "result", two_rounds, "2", "clear", "--round", "1", "--correct", "--reason", "x",
            says="not cleared")


def test_a_draft_made_before_a_correction_must_be_paired_again(two_rounds: Path, cli) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", two_rounds).code == 0
    ran = cli("result", two_rounds, "1", "0-1", "--round", "2", "--correct", "--reason", "wrong board")
    assert ran.code == 0 and "the draft of round 3 is now out of date" in ran.out, ran
    refused(cli, two_rounds, "publish", two_rounds, says="paired before the correction round 2 board 1")
    assert cli("pair", two_rounds).code == 0
    assert cli("publish", two_rounds).code == 0


def test_the_reason_needs_correct(two_rounds: Path, cli) -> None:  # type: ignore[no-untyped-def]
    refused(cli, two_rounds, "result", two_rounds, "2", "0-1", "--round", "1", "--reason", "x",
            says="--reason goes with --correct")


def test_correcting_the_last_round_needs_no_reason(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "one.pairings")
    play_round(cli, event, "1-0", "1-0", "1-0")
    before = file_bytes(event)
    refused(cli, event, "result", event, "1", "0-1", says="give --correct to change it")
    assert cli("result", event, "1", "0-1", "--correct").code == 0
    assert file_bytes(event) != before
