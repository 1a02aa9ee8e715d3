"""The arbiter-decided results 0-0, 1/2-0 and 0-1/2 (issue 15, item 17).

The Laws of Chess let the arbiter score a game so (FIDE Laws of Chess, from memory: e.g. both
players at fault, or one side's half point where the other forfeits the game by a rule breach).
Our decision: they are games played over the board (a meeting, and the sides count), scored
as the code says, with a draw's points for the half point.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from pairings.errors import ResultCodeError
from pairings.state import Result, Side
from pairings.store import EventStore
from tests.cli.conftest import play_round, six_players


@pytest.mark.parametrize(("text", "code", "first", "second"), [
    ("0-0", Result.BOTH_LOSE, "loss", "loss"),
    ("1/2-0", Result.FIRST_HALF_SECOND_LOSES, "draw", "loss"),
    ("½-0", Result.FIRST_HALF_SECOND_LOSES, "draw", "loss"),
    ("0-0.5", Result.FIRST_LOSES_SECOND_HALF, "loss", "draw"),
])
def test_the_codes_read_and_score(text: str, code: Result, first: str, second: str) -> None:
    assert Result.parse(text) is code
    assert code.played
    assert (code.outcome(Side.FIRST), code.outcome(Side.SECOND)) == (first, second)


def test_an_unknown_code_names_the_arbiter_codes() -> None:
    with pytest.raises(ResultCodeError, match="0-0, 1/2-0, 0-1/2"):
        Result.parse("1-1")


def test_entered_scored_exported_and_restored(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = six_players(cli, tmp_path / "arbiter.pairings")
    play_round(cli, event, "0-0", "1/2-0", "0-1/2")
    rows = {r["name"]: r["points"] for r in json.loads(cli("standings", event, "--format", "json").out)}
    # Round 1: Ada - Dee 0-0, Eve - Bo 1/2-0, Cy - Fay 0-1/2.
    assert rows == {"Ada Quince": 0, "Dee Marsh": 0, "Eve Tarn": 0.5, "Bo Rill": 0, "Cy Rill": 0, "Fay Orrin": 0.5}
    doc = json.loads(cli("export", event).out)
    assert [g["result"] for g in doc["rounds"][0]["games"]] == ["0-0", "1/2-0", "0-1/2"]
    sheet = cli("print", event, "pairings", "--round", "1").out
    assert "½-0" in sheet and "0-½" in sheet and "0-0" in sheet
    copy = tmp_path / "copy.json"
    copy.write_text(json.dumps(doc), encoding="utf-8")
    assert cli("restore", copy, tmp_path / "back.pairings").code == 0
    with EventStore.open(event) as a, EventStore.open(tmp_path / "back.pairings") as b:
        assert a.state.records == b.state.records
        # Played games: the two have met, and each side counts towards the side difference.
        ada = a.state.records[a.state.rounds[0].games[0].first]
        assert ada.opponents and ada.played_sides
    assert cli("pair", event).code == 0  # no rematch of the arbiter-scored games
    with EventStore.open(event) as store:
        r1 = {frozenset((g.first, g.second)) for g in store.state.rounds[0].games}
        assert not r1 & {frozenset((g.first, g.second)) for g in store.state.rounds[1].games}
