"""`pairings restore` names on stderr what it could not carry; `export --log` carries the history."""

from __future__ import annotations

import json
from pathlib import Path

from pairings.store import EventStore


def test_restore_says_what_it_could_not_carry_and_the_log_carries_it(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = tmp_path / "e.pairings"
    assert cli("new", event, "--name", "Heath Open", "--rounds", "3", "--system", "round-robin").code == 0
    for name in ("Ada Quince", "Bo Rill", "Cy Marsh", "Dee Fenn"):
        assert cli("player", "add", event, "--name", name).code == 0
    assert cli("forbid", event, "Ada", "Bo").code == 0
    assert cli("pair", event).code == 0

    plain = tmp_path / "plain.json"
    plain.write_text(cli("export", event).out, encoding="utf-8")
    ran = cli("restore", plain, tmp_path / "plain.pairings")
    assert ran.code == 0
    lost = [line for line in ran.err.splitlines() if line.startswith("pairings: not restored: ")]
    assert len(lost) == 2 and "--log" in lost[0] and "explanation" in lost[1]
    assert json.loads(cli("export", tmp_path / "plain.pairings").out) == json.loads(plain.read_text())

    full = tmp_path / "full.json"
    full.write_text(cli("export", event, "--log").out, encoding="utf-8")
    ran = cli("restore", full, tmp_path / "full.pairings")
    assert ran.code == 0 and "times of the logged entries" in ran.err
    with EventStore.open(event) as a, EventStore.open(tmp_path / "full.pairings") as b:
        assert [s.event for s in a.log] == [s.event for s in b.log]
        assert b.state.settings.system.value == "round_robin"
