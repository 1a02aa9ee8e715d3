"""Log lines name players by name and id, and say the round ("Zoë Quillfeather (p1) asked for a bye in round 3")."""

from __future__ import annotations

from pathlib import Path

from pairings import actions
from pairings import events as ev
from pairings.logtext import describe
from pairings.state import ByeKind, PlayerId
from pairings.store import EventStore
from tests.cli.conftest import run_in_process

NAMES = {"p1": "Zoë Quillfeather", "p2": "Corvin Cole"}  # invented


def test_lines_name_the_players() -> None:
    assert describe(ev.ByeRequested(player="p1", round=3, kind=ByeKind.REQUESTED), NAMES) == (
        "Zoë Quillfeather (p1) asked for a bye in round 3")
    assert describe(ev.ByeRequested(player="p2", round=2, kind=ByeKind.ABSENCE), NAMES) == (
        "Corvin Cole (p2) announced absent in round 2")
    assert describe(ev.PlayerWithdrawn(player="p2", from_round=4, reason="ill"), NAMES) == (
        "Corvin Cole (p2) withdrawn from round 4 on (ill)")
    assert describe(ev.PairForbidden(a="p1", b="p2"), NAMES) == "do not pair Zoë Quillfeather (p1) with Corvin Cole (p2)"
    assert describe(ev.PlayerReinstated(player="p9", from_round=2), NAMES) == "player p9 back in from round 2"
    drafted = ev.RoundDrafted(round=1, boards=(ev.BoardModel(board=1, first="p1", second="p2"),),
                              byes=(ev.ByeModel(player="p3", kind=ByeKind.PAIRING, points=1.0),))
    assert describe(drafted) == "round 1 drafted (1 board, 1 bye)"


def test_the_command_line_log_names_players(tmp_path: Path) -> None:
    path = tmp_path / "e.pairings"
    with EventStore.create(path, actions.new_event("Test Open", 3, seed=7)) as store:
        store.append(actions.add_player(store.state, "Zoë Quillfeather", None, None))
        store.append(actions.announce_bye(store.state, PlayerId("p1"), ByeKind.REQUESTED))
    ran = run_in_process("log", path)
    assert ran.code == 0, ran.err
    assert "Zoë Quillfeather (p1) asked for a bye in round 1" in ran.out


def test_undo_says_whom_it_concerned(tmp_path: Path) -> None:
    path = tmp_path / "e.pairings"
    with EventStore.create(path, actions.new_event("Test Open", 3, seed=7)) as store:
        store.append(actions.add_player(store.state, "Zoë Quillfeather", None, None))
        store.append(actions.withdraw(store.state, PlayerId("p1"), None, "ill"))
    ran = run_in_process("undo", path)
    assert ran.code == 0, ran.err
    assert ran.out.strip() == "undone: Zoë Quillfeather (p1) withdrawn from round 1 on (ill)"
