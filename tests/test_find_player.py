"""PLAYER arguments and the desk's filter ignore case and accents ("Zoe" finds Zoë): one fold for both."""

from __future__ import annotations

from pathlib import Path

import pytest

from pairings import actions
from pairings.errors import AmbiguousPlayerError, UnknownPlayerError
from pairings.state import PlayerId, Status
from pairings.store import EventStore
from pairings.text import fold
from tests.cli.conftest import run_in_process

# Invented names.
NAMES = [("Zoë Quillfeather", "Tarnside"), ("Anders Ångström", "Nordvik"), ("Søren Bjørnholt", ""),
         ("Zoe Brambling", "Tarnside")]


@pytest.fixture
def store(tmp_path: Path) -> EventStore:
    s = EventStore.create(tmp_path / "e.pairings", actions.new_event("Test Open", 3, seed=7))
    for name, club in NAMES:
        s.append(actions.add_player(s.state, name, None, club or None))
    return s


def test_fold_drops_case_and_accents() -> None:
    assert fold("Zoë") == fold("ZOE") == "zoe"
    assert fold("Ångström") == "angstrom"
    assert fold("Søren Bjørnholt") == "soren bjornholt"
    assert fold("Straße") == "strasse"


def test_find_player_ignores_accents_and_case(store: EventStore) -> None:
    state = store.state
    assert actions.find_player(state, "angstrom") == "p2"
    assert actions.find_player(state, "Quillfeather") == "p1"
    assert actions.find_player(state, "soren") == "p3"
    assert actions.find_player(state, "zoë q") == "p1"
    # "Zoe Brambling" typed exactly is that player even though the folded "zoe" is also in Zoë's name.
    assert actions.find_player(state, "Zoe Brambling") == "p4"
    with pytest.raises(AmbiguousPlayerError):
        actions.find_player(state, "zoe")
    with pytest.raises(UnknownPlayerError):
        actions.find_player(state, "nobody")


def test_the_command_line_finds_a_player_without_the_accents(store: EventStore, tmp_path: Path) -> None:
    path = store.path
    store.close()
    ran = run_in_process("player", "withdraw", path, "Angstrom")
    assert ran.code == 0, ran.err
    with EventStore.open(path) as again:
        assert again.state.players[PlayerId("p2")].status is Status.WITHDRAWN
