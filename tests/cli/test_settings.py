"""`pairings settings` and `pairings new` options: each setting shown, changed once, refused with the file unchanged."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from pairings.store import EventStore
from tests.cli.conftest import file_bytes


def _event(cli, tmp_path: Path, *extra: str, players: int = 4) -> Path:  # type: ignore[no-untyped-def]
    event = tmp_path / "e.pairings"
    ran = cli("new", event, "--name", "Heath Open", "--rounds", "5", "--seed", "3", *extra)
    assert ran.code == 0, ran.err
    for i in range(players):
        assert cli("player", "add", event, "--name", f"Player {chr(65 + i)}", "--rating", 1800 - 50 * i).code == 0
    return event


def _settings(event: Path):  # type: ignore[no-untyped-def]
    with EventStore.open(event) as store:
        return store.state.settings, len(store.log)


def _publish_round_one(cli, event: Path) -> None:  # type: ignore[no-untyped-def]
    assert cli("pair", event).code == 0
    assert cli("publish", event).code == 0


# option, text, the Settings field, the value it takes
CHANGES = [
    ("--name", "Heath Spring Open", "name", "Heath Spring Open"),
    ("--rounds", "7", "rounds", 7),
    ("--scoring", "3,1,0", "scoring", (3.0, 1.0, 0.0)),
    ("--bye-points", "0.5", "bye_points", 0.5),
    ("--requested-bye-points", "0", "requested_bye_points", 0.0),
    ("--requested-bye-limit", "2", "requested_bye_limit", 2),
    ("--requested-bye-last-round", "4", "requested_bye_last_round", 4),
    ("--late-entry-points", "0.5", "late_entry_points", 0.5),
    ("--tiebreaks", "sb,BH", "tiebreaks", ("SB", "BH")),
    ("--unplayed", "as-they-stand", "unplayed", "as_they_stand"),
    ("--system", "dutch", "system", "dutch"),
    ("--acceleration", "baku", "acceleration", "baku"),
    ("--max-meetings", "2", "max_meetings", 2),
    ("--final-round-exception", "yes", "final_round_side_exception", True),
    ("--forfeit-meets", "no", "forfeit_is_meeting", False),
]


def _value(settings, field: str):  # type: ignore[no-untyped-def]
    value = getattr(settings, field)
    if field == "scoring":
        return (value.win, value.draw, value.loss)
    return value


@pytest.mark.parametrize(("option", "text", "field", "value"), CHANGES, ids=[c[0] for c in CHANGES])
def test_each_setting_changes_with_one_logged_event(cli, tmp_path: Path, option: str, text: str, field: str,  # type: ignore[no-untyped-def]
                                                    value: object) -> None:
    event = _event(cli, tmp_path)
    before, length = _settings(event)
    assert _value(before, field) != value
    ran = cli("settings", event, option, text)
    assert ran.code == 0, ran.err
    after, new_length = _settings(event)
    assert _value(after, field) == value
    assert new_length == length + 1
    assert "->" in ran.out
    shown = json.loads(cli("settings", event, "--json").out)
    assert shown["name"] == after.name and shown["rounds"] == after.rounds


NEW = [c for c in CHANGES if c[0] not in ("--name", "--rounds")]  # new requires these two


@pytest.mark.parametrize(("option", "text", "field", "value"), NEW, ids=[c[0] for c in NEW])
def test_new_takes_the_same_options(cli, tmp_path: Path, option: str, text: str, field: str,  # type: ignore[no-untyped-def]
                                    value: object) -> None:
    event = _event(cli, tmp_path, option, text, players=0)
    assert _value(_settings(event)[0], field) == value


def test_settings_shown_as_text_and_json(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path, "--system", "double-round-robin")
    out = cli("settings", event).out
    assert "System:" in out and "double-round-robin" in out and "Tiebreaks:" in out
    doc = json.loads(cli("settings", event, "--json").out)
    assert doc["system"] == "double-round-robin" and doc["seed"] == 3 and doc["acceleration"] is None


@pytest.mark.parametrize(
    ("args", "says"),
    [
        (["--scoring", "1,2,0"], "draws lie between"),
        (["--bye-points", "2"], "between 0 and a win"),
        (["--rounds", "0"], "from 1 to 1000"),
        (["--system", "swiss-ish"], "use whole-round, dutch"),
        (["--tiebreaks", "nonsense"], "unknown tiebreak"),
        (["--unplayed", "ignore"], "use as-they-stand"),
        (["--final-round-exception", "maybe"], "use yes, no"),
        (["--requested-bye-last-round", "9"], "after the last round"),
        (["--name", "Heath Open"], "nothing to change"),
        (["--system", "round-robin", "--acceleration", "baku"], "not a round robin"),
    ],
)
def test_bad_values_are_refused_and_the_file_is_unchanged(cli, tmp_path: Path, args: list[str],  # type: ignore[no-untyped-def]
                                                          says: str) -> None:
    event = _event(cli, tmp_path)
    before = file_bytes(event)
    ran = cli("settings", event, *args)
    assert ran.code == 2 and says in ran.err and ran.err.count("\n") == 1
    assert file_bytes(event) == before


@pytest.mark.parametrize(
    ("args", "says"),
    [
        (["--scoring", "2,1,0"], "round 1 is published"),
        (["--bye-points", "0.5"], "round 1 is published"),
        (["--requested-bye-points", "1"], "round 1 is published"),
        (["--system", "round-robin"], "round 1 is published"),
        (["--acceleration", "baku"], "round 1 is published"),
        (["--max-meetings", "2"], "round 1 is published"),
        (["--final-round-exception", "yes"], "round 1 is published"),
        (["--forfeit-meets", "no"], "round 1 is published"),
        (["--rounds", "0"], "from 1 to 1000"),
    ],
)
def test_changes_that_would_alter_a_published_round_are_refused(cli, tmp_path: Path, args: list[str],  # type: ignore[no-untyped-def]
                                                                says: str) -> None:
    event = _event(cli, tmp_path)
    _publish_round_one(cli, event)
    before = file_bytes(event)
    ran = cli("settings", event, *args)
    assert ran.code == 2 and says in ran.err, ran.err
    assert file_bytes(event) == before


def test_fewer_rounds_than_paired_are_refused(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path)
    _publish_round_one(cli, event)
    for board in (1, 2):
        assert cli("result", event, board, "1-0").code == 0
    assert cli("pair", event).code == 0
    before = file_bytes(event)
    ran = cli("settings", event, "--rounds", "1")
    assert ran.code == 2 and "round 2 is already paired" in ran.err
    ran = cli("settings", event, "--max-meetings", "2")
    assert ran.code == 2 and "discard it first" in ran.err
    assert file_bytes(event) == before


def test_allowed_after_publication_and_the_standings_say_so(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path)
    _publish_round_one(cli, event)
    for board in (1, 2):
        assert cli("result", event, board, "1-0").code == 0
    ran = cli("settings", event, "--tiebreaks", "win", "--name", "Heath Winter Open", "--rounds", "6")
    assert ran.code == 0, ran.err
    assert "changed after round 1; standings recomputed" in ran.out
    settings, _ = _settings(event)
    assert settings.tiebreaks == ("WIN",) and settings.rounds == 6
    standings = cli("standings", event).out
    assert "Tiebreaks changed after round 1; standings recomputed." in standings
    assert "Tiebreaks changed after round 1" in cli("standings", event, "--format", "html").out
    assert "settings changed after round 1" in cli("log", event).out
    # The same setting changed again after the same round is said once (three renames printed three lines).
    for name in ("Heath Open", "Heath Winter Open"):
        assert cli("settings", event, "--name", name).code == 0
    assert cli("standings", event).out.count("Name changed after round 1.") == 1


def test_requested_bye_limits_are_enforced(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path, "--requested-bye-limit", "1", "--requested-bye-last-round", "3")
    assert cli("player", "request-bye", event, "Player A", "--round", "2").code == 0
    before = file_bytes(event)
    ran = cli("player", "request-bye", event, "Player A", "--round", "3")
    assert ran.code == 2 and "allows 1 per player" in ran.err
    ran = cli("player", "request-bye", event, "Player B", "--round", "4")
    assert ran.code == 2 and "up to round 3 only" in ran.err
    assert file_bytes(event) == before
    assert cli("player", "absent", event, "Player A", "--round", "4").code == 0  # absences are not limited
    assert cli("settings", event, "--requested-bye-limit", "none").code == 0
    assert cli("player", "request-bye", event, "Player A", "--round", "3").code == 0


def test_late_entry_points_count_in_scores_and_standings(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path, "--late-entry-points", "0.5")
    _publish_round_one(cli, event)
    for board in (1, 2):
        assert cli("result", event, board, "1-0").code == 0
    assert cli("player", "add", event, "--name", "Late Comer", "--rating", "1500").code == 0
    assert cli("pair", event).code == 0
    with EventStore.open(event) as store:
        state = store.state
    late = next(p for p in state.players.values() if p.name == "Late Comer")
    assert late.first_round == 2
    assert state.score(late.id) == 0.5
    assert state.records[late.id].score_before(2) == 0.5
    doc = json.loads(cli("standings", event, "--format", "json").out)
    assert next(r for r in doc if r["name"] == "Late Comer")["points"] == 0.5
    before = file_bytes(event)
    ran = cli("settings", event, "--late-entry-points", "0")
    assert ran.code == 2 and file_bytes(event) == before


def test_rounds_wait_for_the_draft_when_the_final_round_exception_is_on(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path, "--final-round-exception", "yes")
    assert cli("pair", event).code == 0
    before = file_bytes(event)
    ran = cli("settings", event, "--rounds", "1")
    assert ran.code == 2 and "discard it first" in ran.err
    assert file_bytes(event) == before
    assert cli("discard", event).code == 0
    doc = json.loads(cli("settings", event, "--rounds", "1", "--json").out)
    assert doc["rounds"] == 1 and doc["final_round_side_exception"] is True


def test_the_last_round_paired_with_the_final_round_exception_keeps_the_rounds(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = tmp_path / "e.pairings"
    assert cli("new", event, "--name", "Short", "--rounds", "1", "--final-round-exception", "yes").code == 0
    for name in ("Ada Quince", "Bo Rill"):
        assert cli("player", "add", event, "--name", name).code == 0
    _publish_round_one(cli, event)
    before = file_bytes(event)
    ran = cli("settings", event, "--rounds", "2")
    assert ran.code == 2 and "paired as the last round" in ran.err
    assert file_bytes(event) == before


def test_verify_checks_late_entrants_on_their_late_entry_points(cli, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    event = _event(cli, tmp_path, "--late-entry-points", "1", players=5)
    for number in (1, 2, 3):
        if number == 2:
            for name in ("Late One", "Late Two", "Late Three"):
                assert cli("player", "add", event, "--name", name, "--rating", "1400").code == 0
        assert cli("pair", event).code == 0, number
        assert cli("publish", event).code == 0
        with EventStore.open(event) as store:
            boards = len(store.state.rounds[-1].games)
        for board in range(1, boards + 1):
            assert cli("result", event, board, "0-1" if board % 2 else "1-0").code == 0
    ran = cli("verify", event)
    assert ran.code == 0, ran.out
    assert "breach" not in ran.out and "cheaper pairing" not in ran.out, ran.out
