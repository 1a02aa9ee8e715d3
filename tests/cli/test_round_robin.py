"""A round robin from the command line: everyone meets everyone once, by the Berger tables."""

from __future__ import annotations

import itertools
import json
from pathlib import Path

from tests.cli.conftest import file_bytes


def test_five_player_round_robin(tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    event = tmp_path / "rr.pairings"
    assert cli("new", event, "--name", "Club Championship", "--rounds", "5", "--round-robin", "--seed", "4").code == 0
    for i, name in enumerate(("Ada Quince", "Bo Rill", "Cy Marsh", "Dee Fenn", "Eli Stowe")):
        assert cli("player", "add", event, "--name", name, "--rating", str(2000 - 100 * i)).code == 0
    for _ in range(5):
        ran = cli("pair", event, "--json")
        assert ran.code == 0, ran
        draft = json.loads(ran.out)
        assert cli("publish", event).code == 0
        for game in draft["games"]:
            assert cli("result", event, str(game["board"]), "1/2-1/2").code == 0
    doc = json.loads(cli("export", event).out)
    meetings = [frozenset((g["first"], g["second"])) for r in doc["rounds"] for g in r["games"]]
    # FIDE Handbook C.05 Annex 1: an odd field plays n rounds, each player once against each other and one bye.
    assert sorted(map(sorted, meetings)) == sorted(map(sorted, itertools.combinations([f"p{i}" for i in range(1, 6)], 2)))
    byes = [y["player"] for r in doc["rounds"] for y in r["byes"]]
    assert sorted(byes) == [f"p{i}" for i in range(1, 6)]
    before = file_bytes(event)
    ran = cli("pair", event)
    assert ran.code == 2 and file_bytes(event) == before
